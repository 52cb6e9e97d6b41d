import { describe, expect, it } from 'vitest';
import { InputError } from '../../server/core/errors.js';
import { fitKinetics, type KineticsFitInput } from '../../server/core/kinetics/fit.js';
import { expectClose } from '../helpers/close.js';
import { bvPoints, logSpaced, tafelPoints } from './synthetic.js';

const T = 298.15;

function pathOf(input: unknown): string | undefined {
  try {
    fitKinetics(input as KineticsFitInput);
  } catch (e) {
    if (e instanceof InputError) return e.issues[0].path;
    throw e;
  }
  return undefined;
}

describe('fitKinetics', () => {
  const tafelData = tafelPoints(logSpaced(1, 3, 12), 1e-2, 0.05, { sigma: 0.001, seed: 1 });

  it('Tafel: result shape with parameter objects {value, standardError, ci95, unit}', () => {
    const r = fitKinetics({ points: tafelData, model: 'tafel', temperature: T, window: { minOverpotential: 0, maxOverpotential: 5 }, electrons: 2 });
    expect(r.model).toBe('tafel');
    for (const key of ['exchangeCurrentDensity', 'tafelSlope', 'transferCoefficient', 'singleStepSymmetryReading'] as const) {
      const p = r.parameters[key];
      expect(p).toBeDefined();
      expect(typeof p?.value).toBe('number');
      expect(p?.ci95).toHaveLength(2);
      expect(typeof p?.unit).toBe('string');
    }
    expect(r.parameters.tafelSlope.unit).toBe('V/decade');
    expectClose(r.parameters.tafelSlope.value, 0.05 * Math.LN10, { rtol: 0.02 });
    expect(r.statistics.points).toBe(12);
    expect(r.residuals).toHaveLength(12);
    expect(r.curve.length).toBeGreaterThan(10);
    expect(r.converged).toBe(true);
    expect(JSON.stringify(r)).not.toMatch(/NaN|Infinity/);
  });

  it('Butler–Volmer: α_a and α_c, limiting current, JSON-safe result', () => {
    const p = { exchangeCurrentDensity: 0.2, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5, anodicLimitingCurrentDensity: 800 };
    const pts = bvPoints([-30, -10, -3, ...logSpaced(-1, Math.log10(760), 30)], p, T, { sigma: 0.0005, seed: 2 });
    const r = fitKinetics({ points: pts, model: 'butler-volmer', temperature: T, anodicLimitingCurrentDensity: 'fit' });
    expect(r.converged).toBe(true);
    expect(r.parameters.anodicTransferCoefficient).toBeDefined();
    expect(r.parameters.cathodicTransferCoefficient).toBeDefined();
    expectClose(r.parameters.anodicLimitingCurrentDensity?.value as number, 800, { rtol: 0.05 });
    expect(r.correlation?.names.length).toBe(4);
    expect(JSON.stringify(r)).not.toMatch(/NaN|Infinity/);
  });

  it('warns that Butler–Volmer-only options are ignored by the Tafel model', () => {
    const r = fitKinetics({ points: tafelData, model: 'tafel', temperature: T, window: { minOverpotential: 0, maxOverpotential: 5 }, anodicLimitingCurrentDensity: 'fit' });
    expect(r.warnings[0]).toMatch(/ignores/);
  });

  it('InputError paths for the documented cases', () => {
    const base = { model: 'tafel', temperature: T, window: { minOverpotential: 0, maxOverpotential: 5 } };
    expect(pathOf({ ...base, points: [] })).toBe('points');
    const many = Array.from({ length: 100_001 }, (_, k) => ({ currentDensity: 1 + k, overpotential: 0.1 }));
    expect(pathOf({ ...base, points: many })).toBe('points');
    const withZero = tafelData.map((p, k) => (k === 3 ? { ...p, currentDensity: 0 } : p));
    expect(pathOf({ ...base, points: withZero })).toBe('points[3].currentDensity');
    expect(pathOf({ ...base, points: tafelData, temperature: 0 })).toBe('temperature');
    expect(pathOf({ ...base, points: tafelData, temperature: -10 })).toBe('temperature');
    expect(pathOf({ ...base, points: tafelData, window: { minOverpotential: 3, maxOverpotential: 4 } })).toBe('window');
    expect(pathOf({ ...base, points: tafelData.slice(0, 2) })).toBe('window');
    expect(pathOf({ ...base, model: 'butler-volmer', points: tafelData.slice(0, 3) })).toBe('points');
    expect(pathOf({ ...base, model: 'marcus', points: tafelData })).toBe('model');
    expect(pathOf({ ...base, points: [{ currentDensity: 'x', overpotential: 0.1 }] })).toBe('points[0].currentDensity');
  });
});
