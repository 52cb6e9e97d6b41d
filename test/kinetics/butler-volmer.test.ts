import { describe, expect, it } from 'vitest';
import { InputError, PhysicsError } from '../../server/core/errors.js';
import { fitButlerVolmer } from '../../server/core/kinetics/butler-volmer.js';
import type { FittedParameter } from '../../server/core/kinetics/types.js';
import { expectClose } from '../helpers/close.js';
import { bvPoints, logSpaced } from './synthetic.js';

const T = 298.15;

function linspace(a: number, b: number, n: number): number[] {
  return Array.from({ length: n }, (_, k) => a + ((b - a) * k) / (n - 1));
}
const inside = (v: number, p: FittedParameter | undefined) => !!p?.ci95 && p.ci95[0] <= v && v <= p.ci95[1];

describe('fitButlerVolmer on exact data (identities)', () => {
  it('recovers j0, α_a, α_c from both branches', () => {
    const p = { exchangeCurrentDensity: 0.8, anodicTransferCoefficient: 0.65, cathodicTransferCoefficient: 0.45 };
    const r = fitButlerVolmer(bvPoints(linspace(-400, 600, 41), p, T), { temperature: T });
    expect(r.converged).toBe(true);
    expectClose(r.parameters.exchangeCurrentDensity.value, 0.8, { rtol: 1e-6 });
    expectClose(r.parameters.anodicTransferCoefficient.value, 0.65, { rtol: 1e-6 });
    expectClose(r.parameters.cathodicTransferCoefficient.value, 0.45, { rtol: 1e-6 });
    expect(r.statistics.residualStandardDeviation).toBeLessThan(1e-9);
  });

  it('recovers a limiting current, R_u and the kinetics together', () => {
    const p = { exchangeCurrentDensity: 0.05, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5, anodicLimitingCurrentDensity: 1500 };
    const pts = bvPoints([...linspace(-60, -1, 8), ...logSpaced(-1, Math.log10(1400), 40)], p, T, { ru: 3e-5 });
    const r = fitButlerVolmer(pts, { temperature: T, anodicLimitingCurrentDensity: 'fit', uncompensatedResistance: 'fit' });
    expect(r.converged).toBe(true);
    expectClose(r.parameters.anodicLimitingCurrentDensity?.value as number, 1500, { rtol: 1e-6 });
    expectClose(r.parameters.uncompensatedResistance?.value as number, 3e-5, { rtol: 1e-5 });
    expectClose(r.parameters.exchangeCurrentDensity.value, 0.05, { rtol: 1e-6 });
  });

  it('both limiting currents, R_u and a zero-current point together (both branches)', () => {
    const p = {
      exchangeCurrentDensity: 3,
      anodicTransferCoefficient: 0.55,
      cathodicTransferCoefficient: 0.7,
      anodicLimitingCurrentDensity: 900,
      cathodicLimitingCurrentDensity: 600,
    };
    const pts = bvPoints([...logSpaced(-0.5, Math.log10(580), 25, -1), 0, ...logSpaced(-0.5, Math.log10(870), 25)], p, T, { ru: 5e-5 });
    const r = fitButlerVolmer(pts, {
      temperature: T,
      anodicLimitingCurrentDensity: 'fit',
      cathodicLimitingCurrentDensity: 'fit',
      uncompensatedResistance: 'fit',
    });
    expect(r.converged).toBe(true);
    expectClose(r.parameters.anodicLimitingCurrentDensity?.value as number, 900, { rtol: 1e-6 });
    expectClose(r.parameters.cathodicLimitingCurrentDensity?.value as number, 600, { rtol: 1e-6 });
    expectClose(r.parameters.uncompensatedResistance?.value as number, 5e-5, { rtol: 1e-5 });
    expectClose(r.parameters.cathodicTransferCoefficient.value, 0.7, { rtol: 1e-6 });
    expectClose(r.residuals[25].fitted as number, 0, { atol: 1e-15 }); // η(0) = 0 by definition
  });

  it('tied α_a + α_c = n and fixed α', () => {
    const p = { exchangeCurrentDensity: 2, anodicTransferCoefficient: 0.7, cathodicTransferCoefficient: 0.3 };
    const pts = bvPoints(linspace(-300, 300, 31), p, T);
    const tied = fitButlerVolmer(pts, { temperature: T, electrons: 1, tieTransferCoefficients: true });
    expectClose(tied.parameters.anodicTransferCoefficient.value, 0.7, { rtol: 1e-6 });
    expectClose(tied.parameters.anodicTransferCoefficient.value + tied.parameters.cathodicTransferCoefficient.value, 1, { rtol: 1e-14 });
    expect(tied.correlation.names).toEqual(['ln j0', 'logit(α_a/n)']);
    const fixed = fitButlerVolmer(pts, { temperature: T, cathodicTransferCoefficient: 0.3 });
    expect(fixed.parameters.cathodicTransferCoefficient.fixed).toBe(true);
    expectClose(fixed.parameters.anodicTransferCoefficient.value, 0.7, { rtol: 1e-6 });
    expect(fixed.statistics.degreesOfFreedom).toBe(31 - 2);
  });
});

describe('fitButlerVolmer with noise', () => {
  const truth = { exchangeCurrentDensity: 0.5, anodicTransferCoefficient: 0.6, cathodicTransferCoefficient: 0.4, anodicLimitingCurrentDensity: 2000 };
  const pts = bvPoints(linspace(-300, 1950, 200), truth, T, { sigma: 0.002, seed: 3 });
  const r = fitButlerVolmer(pts, { temperature: T, anodicLimitingCurrentDensity: 'fit' });

  it('converges and recovers every parameter inside its 95 % interval', () => {
    expect(r.converged).toBe(true);
    expect(r.status).toMatch(/^converged/);
    expect(inside(0.5, r.parameters.exchangeCurrentDensity)).toBe(true);
    expect(inside(0.6, r.parameters.anodicTransferCoefficient)).toBe(true);
    expect(inside(0.4, r.parameters.cathodicTransferCoefficient)).toBe(true);
    expect(inside(2000, r.parameters.anodicLimitingCurrentDensity)).toBe(true);
    expectClose(r.parameters.anodicLimitingCurrentDensity?.value as number, 2000, { rtol: 0.01 });
    expect(r.warnings.filter((w) => /Jacobian/.test(w))).toHaveLength(0);
  });

  it('reports a symmetric correlation matrix, AIC/BIC, residual records and a curve', () => {
    const m = r.correlation.matrix;
    expect(r.correlation.names).toHaveLength(4);
    for (let a = 0; a < 4; a++) {
      expectClose(m[a][a], 1, { atol: 1e-12 });
      for (let b = 0; b < 4; b++) expectClose(m[a][b], m[b][a], { atol: 1e-12 });
    }
    expect(Number.isFinite(r.statistics.aic)).toBe(true);
    expect(r.statistics.bic).toBeGreaterThan(r.statistics.aic); // k·ln(200) > 2k
    expect(r.residuals).toHaveLength(200);
    expect(r.residuals.every((q) => q.used && q.residual !== null)).toBe(true);
    expect(r.curve.length).toBeGreaterThan(50);
    // Limiting current and j0 intervals are asymmetric (mapped through the log).
    const j0 = r.parameters.exchangeCurrentDensity;
    const [lo, hi] = j0.ci95 as [number, number];
    expect(hi - j0.value).toBeGreaterThan(j0.value - lo);
    // Residual SD estimates the noise σ = 2 mV.
    expectClose(r.statistics.residualStandardDeviation, 0.002, { rtol: 0.15 });
  });
});

describe('identifiability warnings', () => {
  it('a limiting current without mass-transport bending is flagged as not identifiable', () => {
    const p = { exchangeCurrentDensity: 0.1, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5 };
    const pts = bvPoints([...linspace(-20, -0.5, 6), ...logSpaced(-1, 2, 25)], p, T, { sigma: 0.001, seed: 8 });
    const r = fitButlerVolmer(pts, { temperature: T, anodicLimitingCurrentDensity: 'fit' });
    expect(r.warnings[0]).toMatch(/anodic limiting current could not be fitted/);
    expect(r.parameters.anodicLimitingCurrentDensity).toBeUndefined();
    expect(r.converged).toBe(true);
    expectClose(r.parameters.exchangeCurrentDensity.value, 0.1, { rtol: 0.1 });
  });

  it('one-branch data warn that the other transfer coefficient rests on the low-field points', () => {
    const p = { exchangeCurrentDensity: 0.1, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5 };
    const r = fitButlerVolmer(bvPoints(logSpaced(-1, 2.5, 25), p, T, { sigma: 0.001, seed: 8 }), { temperature: T });
    expect(r.warnings.join(' ')).toMatch(/All fitted points are anodic/);
  });
});

describe('fitButlerVolmer input checks', () => {
  const p = { exchangeCurrentDensity: 1, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5 };
  const pts = bvPoints(linspace(-100, 100, 11), p, T);
  it('PhysicsError for data at or above a fixed limiting current', () => {
    expect(() => fitButlerVolmer(pts, { temperature: T, anodicLimitingCurrentDensity: 50 })).toThrow(PhysicsError);
  });
  it('InputError for too few points, a tie without n, a limit to fit without that branch', () => {
    expect(() => fitButlerVolmer(pts.slice(0, 3), { temperature: T })).toThrow(InputError);
    expect(() => fitButlerVolmer(pts, { temperature: T, tieTransferCoefficients: true })).toThrow(InputError);
    const anodicOnly = pts.filter((q) => q.currentDensity > 0);
    expect(() => fitButlerVolmer(anodicOnly, { temperature: T, cathodicLimitingCurrentDensity: 'fit' })).toThrow(InputError);
    expect(() => fitButlerVolmer(pts, { temperature: T, window: { minOverpotential: 5, maxOverpotential: 6 } })).toThrow(InputError);
  });
});
