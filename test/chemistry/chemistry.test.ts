import { describe, it, expect } from 'vitest';
import { expectClose } from '../helpers/close.js';
import { CHEMISTRIES, electrochemicalEquivalent, getChemistry, type Chemistry, type ProductId } from '../../server/core/chemistry/index.js';
import { waterVapourPressure } from '../../server/core/thermo/water.js';
import { InputError, PhysicsError } from '../../server/core/errors.js';

const KAH = 3.6e6; // C per kA·h (exact)

function product(chem: Chemistry, id: ProductId) {
  const p = chem.products.find((x) => x.id === id);
  if (!p) throw new Error(`no product ${id}`);
  return p;
}

describe('registry', () => {
  it('lists the three chemistries and finds each by id', () => {
    expect(CHEMISTRIES.map((c) => c.id)).toEqual(['chlor-alkali', 'alkaline-water', 'pem-water']);
    for (const c of CHEMISTRIES) expect(getChemistry(c.id)).toBe(c);
  });
  it('unknown id → InputError on path "chemistry"', () => {
    try {
      getChemistry('mercury-cell');
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).issues[0].path).toBe('chemistry');
    }
  });
  it('main products and electrons', () => {
    expect(getChemistry('chlor-alkali').mainProduct).toBe('Cl2');
    expect(getChemistry('pem-water').mainProduct).toBe('H2');
    for (const c of CHEMISTRIES) expect(c.electrons).toBe(2);
  });
});

describe('electrochemical equivalents vs check-values §8 (derived from IUPAC abridged atomic weights and F)', () => {
  // Tolerance: half a unit in the last printed digit of each value.
  const cases: Array<[string, ProductId, number, number]> = [
    ['chlor-alkali', 'Cl2', 1.32269, 5e-6],
    ['chlor-alkali', 'NaOH', 1.49234, 5e-6],
    ['alkaline-water', 'H2', 0.03761, 5e-7],
    ['pem-water', 'O2', 0.29847, 5e-6],
  ];
  for (const [chem, id, kgPerKAh, atol] of cases) {
    it(`${id}: ${kgPerKAh} kg per kA·h`, () => {
      expectClose(electrochemicalEquivalent(product(getChemistry(chem), id)) * KAH, kgPerKAh, { atol }, id);
    });
  }
  it('H2 of chlor-alkali equals H2 of water electrolysis (same product record)', () => {
    expectClose(electrochemicalEquivalent(product(getChemistry('chlor-alkali'), 'H2')), electrochemicalEquivalent(product(getChemistry('pem-water'), 'H2')), { rtol: 0 }, 'H2');
  });
});

describe('water electrolysis reversible voltages', () => {
  const pem = getChemistry('pem-water');
  const alk = getChemistry('alkaline-water');
  it('at 25 °C: E° = 1.229 V, U_tn = 1.481 V (HHV), 1.253 V (LHV) — check-values §2b (NBS-82, derived)', () => {
    const r = pem.reversible({ temperature: 298.15, pressure: 101325, composition: {} });
    expectClose(r.details.E0, 1.22883, { atol: 1e-5 }, 'E°');
    expectClose(r.thermoneutralVoltage, 1.48121, { atol: 1e-5 }, 'U_tn');
    expectClose(r.lhvThermoneutralVoltage as number, 1.25313, { atol: 1e-5 }, 'U_LHV');
  });
  it('with dry-gas partial pressures of exactly 1 bar (p = 1 bar + p_sat) E_rev = E° (identity)', () => {
    for (const T of [298.15, 333.15, 353.15]) {
      const r = pem.reversible({ temperature: T, pressure: 1e5 + waterVapourPressure(T), composition: {} });
      expectClose(r.reversiblePotential, r.details.E0, { atol: 1e-12 }, `E at ${T}`);
    }
  });
  it('pressure dependence: ∂E/∂ln p → 1.5·RT/2F at high pressure (30 bar vs 10 bar at 60 °C; Nernst, ideal gas)', () => {
    const T = 333.15;
    const ps = waterVapourPressure(T);
    const e10 = pem.reversible({ temperature: T, pressure: 10e5, composition: {} }).reversiblePotential;
    const e30 = pem.reversible({ temperature: T, pressure: 30e5, composition: {} }).reversiblePotential;
    const expected = 1.5 * ((8.314462618 * T) / (2 * 96485.33212)) * Math.log((30e5 - ps) / (10e5 - ps));
    expectClose(e30 - e10, expected, { rtol: 1e-9 }, 'ΔE');
  });
  it('KOH at 0 mol/kg equals PEM (a_w = 1) — limit', () => {
    const c = { temperature: 343.15, pressure: 5e5 };
    expectClose(alk.reversible({ ...c, composition: { koh: 0 } }).reversiblePotential, pem.reversible({ ...c, composition: {} }).reversiblePotential, { atol: 1e-15 }, 'a_w = 1');
  });
  it('30 wt % KOH (7.64 mol/kg) at 80 °C: finite E_rev a few mV above PEM, with warnings naming the Pitzer extrapolation', () => {
    const c = { temperature: 353.15, pressure: 1e5 };
    const r = alk.reversible({ ...c, composition: { koh: 7.64 } });
    const p = pem.reversible({ ...c, composition: {} });
    expect(r.reversiblePotential - p.reversiblePotential).toBeGreaterThan(0);
    expect(r.reversiblePotential - p.reversiblePotential).toBeLessThan(0.03);
    expect(r.warnings.some((w) => /beyond the Pitzer fit range/.test(w))).toBe(true);
    expect(r.warnings.some((w) => /only 25 °C Pitzer parameters/.test(w))).toBe(true);
    expect(r.details.waterActivity).toBeLessThan(1);
  });
  it('dE°/dT = −ΔS/(nF) numerically at the chemistry level (identity)', () => {
    const h = 0.01;
    for (const T of [298.15, 343.15]) {
      const at = (t: number) => pem.reversible({ temperature: t, pressure: 3e5, composition: {} }).details.E0;
      const r = pem.reversible({ temperature: T, pressure: 3e5, composition: {} });
      expectClose((at(T + h) - at(T - h)) / (2 * h), r.details.dE0dT, { rtol: 1e-6 }, `dE°/dT at ${T}`);
      expectClose(r.details.dE0dT, -r.details.deltaS0 / r.details.nF, { rtol: 1e-14 }, 'definition');
    }
  });
  it('pressure at or below the vapour pressure → PhysicsError; T outside range or missing KOH → InputError', () => {
    expect(() => pem.reversible({ temperature: 373.15, pressure: 1e5, composition: {} })).toThrow(PhysicsError);
    expect(() => pem.reversible({ temperature: 500, pressure: 50e5, composition: {} })).toThrow(InputError);
    expect(() => alk.reversible({ temperature: 353.15, pressure: 1e5, composition: {} })).toThrow(InputError);
  });
});

describe('chlor-alkali reversible voltage', () => {
  const ca = getChemistry('chlor-alkali');
  it('at 25 °C: E° = 2.188 V and U_tn = 2.311 V (check-values §2b, NBS-82 derived)', () => {
    const r = ca.reversible({ temperature: 298.15, pressure: 101325, composition: { brineNaCl: 1, causticNaOH: 1 } });
    expectClose(r.details.E0, 2.188, { atol: 1e-4 }, 'E°');
    expectClose(r.thermoneutralVoltage, 2.3111, { atol: 1e-4 }, 'U_tn');
  });
  it('Nernst term = gas part + activity part (bookkeeping identity) and uses catholyte a_w', () => {
    const r = ca.reversible({ temperature: 323.15, pressure: 1.5e5, composition: { brineNaCl: 4, causticNaOH: 2 } });
    expectClose(r.details.nernstTerm, r.details.gasNernstTerm + r.details.activityNernstTerm, { rtol: 1e-12 }, 'split');
    expectClose(r.reversiblePotential, r.details.E0 + r.details.nernstTerm, { rtol: 1e-14 }, 'E = E° + Nernst');
    expectClose(r.details.partialPressureH2, 1.5e5 - r.details.waterActivityCatholyte * r.details.saturationPressure, { rtol: 1e-14 }, 'p_H2');
  });
  it('raising the caustic strength raises E_rev; raising the brine strength lowers it (Nernst direction)', () => {
    const base = { temperature: 298.15, pressure: 2e5 };
    const e = (nacl: number, naoh: number) => ca.reversible({ ...base, composition: { brineNaCl: nacl, causticNaOH: naoh } }).reversiblePotential;
    expect(e(4, 2)).toBeGreaterThan(e(4, 1));
    expect(e(5, 1)).toBeLessThan(e(3, 1));
  });
  it('plant conditions (3.6 mol/kg brine, 32 wt % NaOH ≈ 11.8 mol/kg, 90 °C): finite answer with explicit extrapolation warnings and an uncertainty indication', () => {
    const r = ca.reversible({ temperature: 363.15, pressure: 1.2e5, composition: { brineNaCl: 3.6, causticNaOH: 11.8 } });
    expect(Number.isFinite(r.reversiblePotential)).toBe(true);
    expect(r.reversiblePotential).toBeGreaterThan(2.0);
    expect(r.reversiblePotential).toBeLessThan(2.6);
    expect(r.warnings.some((w) => /NaOH activity: 11\.80 mol\/kg is beyond the Pitzer fit range/.test(w))).toBe(true);
    expect(r.warnings.some((w) => /held at 25 °C/.test(w))).toBe(true);
    expect(Math.abs(r.details.activityNernstSpread)).toBeGreaterThan(0.005);
  });
  it('missing or zero composition → InputError with the field path; T above 100 °C → InputError', () => {
    const run = (composition: object, temperature = 353.15) => () => ca.reversible({ temperature, pressure: 2e5, composition });
    expect(run({ causticNaOH: 11 })).toThrow(/composition\.brineNaCl/);
    expect(run({ brineNaCl: 4 })).toThrow(/composition\.causticNaOH/);
    expect(run({ brineNaCl: 4, causticNaOH: 0 })).toThrow(InputError);
    expect(run({ brineNaCl: 4, causticNaOH: 11 }, 393.15)).toThrow(InputError);
  });
  it('E_rev < U_tn in every chemistry at 60 °C (electrolysis absorbs heat at the reversible voltage)', () => {
    for (const c of CHEMISTRIES) {
      const r = c.reversible({ temperature: 333.15, pressure: 3e5, composition: { brineNaCl: 4, causticNaOH: 2, koh: 5 } });
      expect(r.reversiblePotential).toBeLessThan(r.thermoneutralVoltage);
    }
  });
});
