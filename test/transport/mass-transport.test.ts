import { describe, it, expect } from 'vitest';
import { expectClose } from '../helpers/close.js';
import { concentrationOverpotential, limitingCurrentDensity } from '../../server/core/transport/mass-transport.js';
import { InputError, PhysicsError } from '../../server/core/errors.js';

describe('limiting current density j_lim = nF·k_m·c', () => {
  it('n = 2, k_m = 1e-5 m/s, c = 1000 mol/m³ → 1929.7066 A/m² (hand arithmetic with F = 96 485.332 12 C/mol, CODATA 2018)', () => {
    expectClose(limitingCurrentDensity(2, 1e-5, 1000), 1929.7066424, { rtol: 1e-9 }, 'j_lim');
  });
  it('InputError for negative inputs', () => {
    expect(() => limitingCurrentDensity(2, -1e-5, 1000)).toThrow(InputError);
  });
});

describe('concentration overpotential η = (RT/nF)·ln[1/(1 − |j|/j_lim)]', () => {
  it('at j = j_lim/2, 25 °C, n = 2: (RT/2F)·ln 2 = 8.9043 mV (RT/F = 25.6926 mV, check-values §1)', () => {
    expectClose(concentrationOverpotential(500, 1000, 298.15, 2) * 1000, (25.6926 / 2) * Math.LN2, { rtol: 1e-5 }, 'η');
  });
  it('sign follows the current (cathode negative) and |η| is symmetric', () => {
    const a = concentrationOverpotential(300, 1000, 353.15, 2);
    const c = concentrationOverpotential(-300, 1000, 353.15, 2);
    expect(a).toBeGreaterThan(0);
    expectClose(c, -a, { rtol: 1e-15 }, 'symmetry');
  });
  it('small-current limit η ≈ (RT/nF)·j/j_lim (identity)', () => {
    const j = 1e-4;
    expectClose(concentrationOverpotential(j, 1000, 298.15, 2), (0.0256926 / 2) * (j / 1000), { rtol: 1e-5 }, 'linear limit');
  });
  it('|j| ≥ j_lim → PhysicsError, never NaN or Infinity', () => {
    expect(() => concentrationOverpotential(1000, 1000, 298.15, 2)).toThrow(PhysicsError);
    expect(() => concentrationOverpotential(-1500, 1000, 298.15, 2)).toThrow(PhysicsError);
    expect(() => concentrationOverpotential(100, 0, 298.15, 2)).toThrow(InputError);
    expect(Number.isFinite(concentrationOverpotential(999.999999, 1000, 298.15, 2))).toBe(true);
  });
});
