import { describe, expect, it } from 'vitest';
import { InputError } from '../../server/core/errors.js';
import { kFactorLineVoltage, thermodynamicVoltageEfficiency } from '../../server/core/cell/efficiency-figures.js';
import { sweepCell } from '../../server/core/cell/sweep.js';
import { expectClose } from '../helpers/close.js';
import { IDEAL_ELECTRODE_ETA_BOUND, linearCell } from './cells.js';

describe('thermodynamic voltage efficiency E_rev/U', () => {
  it('gives the hand-computed ratio', () => {
    // Hand computation: 2.188 V / 2.9 V = 0.754482758…; 1.229 V / 1.8 V = 0.682777…
    expectClose(thermodynamicVoltageEfficiency(2.188, 2.9), 0.7544827586206897, { rtol: 1e-14 }, 'chlor-alkali');
    expectClose(thermodynamicVoltageEfficiency(1.229, 1.8), 0.6827777777777778, { rtol: 1e-14 }, 'water');
  });

  it('rejects voltages that are not finite and positive', () => {
    for (const [e, u] of [[0, 2], [2, 0], [-1, 2], [2, Number.NaN], [Number.POSITIVE_INFINITY, 2]]) {
      expect(() => thermodynamicVoltageEfficiency(e, u)).toThrow(InputError);
    }
  });
});

describe('voltage on the K-factor line U0 + K·j', () => {
  it('gives the hand-computed voltage', () => {
    // U0 = 2.35 V, K = 0.1 V per kA/m² = 1e-4 Ω·m², j = 5.5 kA/m²: U = 2.35 + 0.55 = 2.90 V.
    expectClose(kFactorLineVoltage({ intercept: 2.35, value: 1e-4 }, 5500), 2.9, { rtol: 1e-14 }, 'U');
    expectClose(kFactorLineVoltage({ intercept: 2.35, value: 1e-4 }, 0), 2.35, { rtol: 0 }, 'U at j = 0 is U0');
  });

  it('reproduces a straight-line cell from the fitted sweep line (identity)', () => {
    // Ideal electrodes and a pure resistance: U = E_rev + R·j, so the fitted line is the cell itself.
    const js = [2000, 3000, 4000, 5000, 6000];
    const result = sweepCell({ ...linearCell('chlor-alkali', 2.2, 1.1e-4, js), kFactorRange: [2000, 6000] });
    const k = result.kFactor!;
    expect(k).toBeDefined();
    for (const p of result.points) {
      expectClose(kFactorLineVoltage(k, p.currentDensity), p.cellVoltage, { atol: 2 * IDEAL_ELECTRODE_ETA_BOUND }, `U at ${p.currentDensity} A/m²`);
    }
  });

  it('rejects a current density that is not finite', () => {
    expect(() => kFactorLineVoltage({ intercept: 2.35, value: 1e-4 }, Number.NaN)).toThrow(InputError);
  });
});
