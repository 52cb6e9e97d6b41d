import { describe, it, expect } from 'vitest';
import { expectClose } from '../helpers/close.js';
import {
  asrArrhenius,
  asrFromConductivity,
  asrLinear,
  springerAreaResistance,
  springerConductivity,
  springerWaterUptake,
  SPRINGER,
} from '../../server/core/transport/membrane.js';
import { GAS_CONSTANT } from '../../server/core/constants.js';
import { InputError, PhysicsError } from '../../server/core/errors.js';

describe('Springer, Zawodzinski & Gottesfeld (1991) vs check-values §6 (derived)', () => {
  it('σ(λ = 22, 303.00 K) = 0.10980 S/cm (matches a secondary test quoting "Eq. 23")', () => {
    expectClose(springerConductivity(22, 303).value, 10.98, { atol: 1e-3 }, 'σ(22, 303 K)');
  });
  it('σ(λ = 22) = 0.1100 / 0.1604 / 0.1989 S/cm and σ(λ = 14) = 0.0688 / 0.1003 / 0.1244 S/cm at 303.15 / 333.15 / 353.15 K', () => {
    // 4 decimals in S/cm: tolerance 6e-5 S/cm = 6e-3 S/m.
    const cases: Array<[number, number, number]> = [
      [22, 303.15, 0.11], [22, 333.15, 0.1604], [22, 353.15, 0.1989],
      [14, 303.15, 0.0688], [14, 333.15, 0.1003], [14, 353.15, 0.1244],
    ];
    for (const [l, T, s] of cases) expectClose(springerConductivity(l, T).value, s * 100, { atol: 6e-3 }, `σ(${l}, ${T})`);
  });
  it('area resistance at 80 °C: λ = 22 → 0.0255 / 0.0638 / 0.0895 Ω·cm²; λ = 14 → 0.0408 / 0.1021 / 0.1430 Ω·cm² for 50.8 / 127 / 178 µm', () => {
    const thick = [50.8e-6, 127e-6, 178e-6];
    const r22 = [0.0255, 0.0638, 0.0895];
    const r14 = [0.0408, 0.1021, 0.143];
    thick.forEach((d, i) => {
      // 1 Ω·cm² = 1e-4 Ω·m²; table to 4 decimals → atol 6e-5 Ω·cm².
      expectClose(springerAreaResistance(d, 22, 353.15).value * 1e4, r22[i], { atol: 6e-5 }, `ASR λ=22, ${d}`);
      expectClose(springerAreaResistance(d, 14, 353.15).value * 1e4, r14[i], { atol: 6e-5 }, `ASR λ=14, ${d}`);
    });
  });
  it('water uptake λ(1) = 14.003 and λ(0.5) = 3.486 (coefficients from memory); λ(3) = 16.8 on the 1 < a ≤ 3 branch', () => {
    expectClose(springerWaterUptake(1), 14.003, { atol: 6e-4 }, 'λ(1)');
    expectClose(springerWaterUptake(0.5), 3.486, { atol: 6e-4 }, 'λ(0.5) (exact 3.4855 rounds to 3.486)');
    expectClose(springerWaterUptake(3), 16.8, { atol: 1e-12 }, 'λ(3)');
  });
  it('InputError for λ < 1 and water activity outside (0, 3]', () => {
    expect(() => springerConductivity(0.5, 333.15)).toThrow(InputError);
    expect(() => springerWaterUptake(0)).toThrow(InputError);
    expect(() => springerWaterUptake(3.5)).toThrow(InputError);
  });
});

describe('ASR temperature laws (common practice) — identities', () => {
  it('ASR(T_ref) = ASR_ref for both laws', () => {
    expectClose(asrArrhenius(2e-5, 353.15, 20e3, 353.15), 2e-5, { rtol: 1e-15 }, 'Arrhenius at T_ref');
    expectClose(asrLinear(2e-5, 353.15, 0.02, 353.15), 2e-5, { rtol: 1e-15 }, 'linear at T_ref');
  });
  it('Arrhenius with E_a = 1268 K·R reproduces Springer’s temperature ratio (independent model)', () => {
    const ratio = asrArrhenius(1, 303, SPRINGER.activationTemperature * GAS_CONSTANT.value, 353.15);
    const springerRatio = springerConductivity(14, 303).value / springerConductivity(14, 353.15).value;
    expectClose(ratio, springerRatio, { rtol: 1e-12 }, 'ratio');
  });
  it('linear law: 2 %/K over +10 K divides ASR by 1.2 (arithmetic)', () => {
    expectClose(asrLinear(1.2e-5, 343.15, 0.02, 353.15), 1e-5, { rtol: 1e-14 }, 'linear');
  });
  it('linear law leaving its range → PhysicsError; bad inputs → InputError', () => {
    expect(() => asrLinear(1e-5, 353.15, 0.02, 253.15)).toThrow(PhysicsError);
    expect(() => asrArrhenius(-1, 353.15, 1e4, 353.15)).toThrow(InputError);
    expect(() => asrFromConductivity(1e-4, 0)).toThrow(InputError);
  });
  it('ASR = δ/σ: 127 µm at 10 S/m → 1.27e-5 Ω·m² (0.127 Ω·cm²)', () => {
    expectClose(asrFromConductivity(127e-6, 10), 1.27e-5, { rtol: 1e-14 }, 'δ/σ');
  });
});
