/**
 * Unit tests of levenbergMarquardt: input checks, recovery from non-finite residuals,
 * honest failure statuses, covariance scaling, exact-data (noise-floor) fits.
 * Reference values are closed forms worked by hand or cross-checks against the
 * independent QR linear solver; the NIST StRD checks are in nonlinear-strd.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../server/core/errors.js';
import { correlationMatrix, levenbergMarquardt, linearLeastSquares } from '../../server/core/numerics/index.js';
import { descentObserved } from '../../server/core/numerics/lm.js';
import type { NonlinearFit } from '../../server/core/numerics/index.js';
import { expectClose } from '../helpers/close.js';
import { loadNonlinearDataset, lre, strdProblem } from '../fixtures/strd-models.js';

function expectFiniteResult(fit: NonlinearFit): void {
  for (const v of [...fit.parameters, ...fit.standardErrors, ...fit.covariance.flat(), ...fit.residuals, fit.rss, fit.residualStandardDeviation, fit.gradientCosine]) {
    expect(Number.isFinite(v), `${fit.status}: ${fit.message}`).toBe(true);
  }
}

/** Invented decay data (fictional): t in s, signal in arbitrary units. */
const T = [0, 1, 2, 3, 4, 5, 6, 7];
const SIGNAL = [5.02, 3.71, 2.69, 2.05, 1.48, 1.13, 0.8, 0.62];
const decay = (sigma: number) => ({
  start: [1, 0.1],
  residuals: (p: number[]) => T.map((t, i) => (p[0] * Math.exp(-p[1] * t) - SIGNAL[i]) / sigma),
  jacobian: (p: number[]) => T.map((t) => [Math.exp(-p[1] * t) / sigma, (-p[0] * t * Math.exp(-p[1] * t)) / sigma]),
});

describe('levenbergMarquardt input checks', () => {
  it('throws InputError on a non-finite start, too few residuals, and non-finite residuals at the start', () => {
    expect(() => levenbergMarquardt({ start: [1, Number.NaN], residuals: () => [0, 0, 0] })).toThrow(InputError);
    expect(() => levenbergMarquardt({ start: [1, 2], residuals: () => [0] })).toThrow(InputError);
    expect(() => levenbergMarquardt({ start: [-1], residuals: (p) => [Math.sqrt(p[0]), 1] })).toThrow(InputError);
    expect(() => levenbergMarquardt({ start: [1], residuals: (p) => [p[0]] }, { ftol: -1 })).toThrow(InputError);
  });
});

describe('levenbergMarquardt behaviour', () => {
  it('recovers from non-finite trial residuals (steps into √p with p < 0)', () => {
    // Residuals √p − y_i for y = [2, 2.2]: minimiser √p = 2.1, p = 4.41 (closed form).
    // From p = 100 the first Gauss–Newton step lands near p ≈ −58, where √p is NaN.
    const y = [2, 2.2];
    const fit = levenbergMarquardt({
      start: [100],
      residuals: (p) => y.map((v) => Math.sqrt(p[0]) - v),
      jacobian: (p) => y.map(() => [0.5 / Math.sqrt(p[0])]),
    });
    expect(fit.converged, fit.message).toBe(true);
    expectClose(fit.parameters[0], 4.41, { rtol: 1e-10 }, 'p');
    expectFiniteResult(fit);
  });

  it('reports failed:max-evaluations honestly', () => {
    const fit = levenbergMarquardt(decay(1), { maxEvaluations: 3 });
    expect(fit.converged).toBe(false);
    expect(fit.status).toBe('failed:max-evaluations');
    expect(fit.warnings.some((w) => w.startsWith('Not converged'))).toBe(true);
    expectFiniteResult(fit);
  });

  it('reports failed:singular when no parameter affects the residuals', () => {
    const fit = levenbergMarquardt({ start: [1, 2], residuals: () => [1, 2, 3] });
    expect(fit.status).toBe('failed:singular');
    expect(fit.converged).toBe(false);
    expectFiniteResult(fit);
  });

  it('reports non-identifiable parameters (only a + b enters the model) as failed:singular', () => {
    const x = [1, 2, 3, 4];
    const y = [3.1, 5.9, 9.2, 11.8];
    const fit = levenbergMarquardt({ start: [1, 1], residuals: (p) => x.map((v, i) => (p[0] + p[1]) * v - y[i]) });
    expect(fit.converged).toBe(false);
    expect(fit.status).toBe('failed:singular');
    expect(fit.aliased.filter(Boolean).length).toBe(1);
    // The sum is still the least-squares slope through the origin: Σxy/Σx² = 89.7/30 (hand).
    expectClose(fit.parameters[0] + fit.parameters[1], 89.7 / 30, { rtol: 1e-9 }, 'a + b');
    expectFiniteResult(fit);
  });

  it('flags an analytic Jacobian that disagrees with finite differences', () => {
    const good = decay(1);
    const wrong = { ...good, jacobian: (p: number[]) => good.jacobian(p).map(([a, b]) => [a, 1.5 * b]) };
    const fit = levenbergMarquardt(wrong);
    expect(fit.converged).toBe(false);
    expect(fit.status).toBe('failed:bad-jacobian');
    expect(fit.warnings.some((w) => w.includes('p[1]'))).toBe(true);
    // The check can be switched off (the caller then owns the risk).
    const unchecked = levenbergMarquardt(wrong, { checkJacobian: false });
    expect(unchecked.status).not.toBe('failed:bad-jacobian');
  });

  it('converges on exact (noise-free) data instead of flagging rounding noise as non-stationary', () => {
    // Data generated from y = 2.5·e^(−0.35 t), rounded to float64; residuals at the
    // solution are rounding noise, so the scaled gradient is not small there.
    const t = Array.from({ length: 25 }, (_, i) => 0.4 * i);
    const y = t.map((v) => 2.5 * Math.exp(-0.35 * v));
    const fit = levenbergMarquardt({
      start: [1, 1],
      residuals: (p) => t.map((v, i) => p[0] * Math.exp(-p[1] * v) - y[i]),
    });
    expect(fit.converged, fit.message).toBe(true);
    expectClose(fit.parameters[0], 2.5, { rtol: 1e-12 }, 'amplitude');
    expectClose(fit.parameters[1], 0.35, { rtol: 1e-12 }, 'rate');
    expectFiniteResult(fit);
  });

  it('agrees with the QR linear solver on a linear model (independent code paths)', () => {
    const x = [0.5, 1, 1.5, 2, 2.5, 3, 3.5];
    const y = [1.9, 3.2, 3.9, 5.1, 6.2, 6.8, 8.1];
    const lin = linearLeastSquares(x.map((v) => [1, v]), y);
    const fit = levenbergMarquardt({ start: [0, 0], residuals: (p) => x.map((v, i) => p[0] + p[1] * v - y[i]) });
    expect(fit.converged).toBe(true);
    for (let i = 0; i < 2; i++) {
      expectClose(fit.parameters[i], lin.coefficients[i], { rtol: 1e-10 }, `p${i}`);
      expectClose(fit.standardErrors[i], lin.standardErrors[i], { rtol: 1e-7 }, `SE${i}`);
    }
    expectClose(fit.rss, lin.rss, { rtol: 1e-10 }, 'RSS');
  });

  it('rescaling σ leaves the relative covariance unchanged and scales the absolute one by σ²', () => {
    const relA = levenbergMarquardt(decay(1), { sigmaMode: 'relative' });
    const relB = levenbergMarquardt(decay(3), { sigmaMode: 'relative' });
    const absA = levenbergMarquardt(decay(1), { sigmaMode: 'absolute' });
    const absB = levenbergMarquardt(decay(3), { sigmaMode: 'absolute' });
    expect(relA.covarianceScaling).toBe('residual-variance');
    expect(absA.covarianceScaling).toBe('known-sigma');
    for (let i = 0; i < 2; i++) {
      expectClose(relB.parameters[i], relA.parameters[i], { rtol: 1e-9 }, `p${i}`);
      for (let j = 0; j < 2; j++) {
        expectClose(relB.covariance[i][j], relA.covariance[i][j], { rtol: 1e-7 }, `relative C${i}${j}`);
        expectClose(absB.covariance[i][j], 9 * absA.covariance[i][j], { rtol: 1e-7 }, `absolute C${i}${j}`);
      }
    }
    expectClose(correlationMatrix(absB.covariance)[0][1], correlationMatrix(relA.covariance)[0][1], { rtol: 1e-7 }, 'correlation');
  });

  it('forward differences also reach the certified Misra1a values (NIST StRD Misra1a, start 2)', () => {
    const ds = loadNonlinearDataset('Misra1a');
    const fit = levenbergMarquardt(strdProblem(ds, 2, false), { finiteDifference: 'forward', ftol: 1e-15, xtol: 1e-15 });
    expect(fit.converged).toBe(true);
    fit.parameters.forEach((v, j) => expect(lre(v, ds.certified.parameters[j], 11)).toBeGreaterThanOrEqual(6));
    // Forward differences carry ~√ε relative error into J, so fewer digits on the SDs.
    fit.standardErrors.forEach((v, j) => expect(lre(v, ds.certified.standardDeviations[j], 11)).toBeGreaterThanOrEqual(5));
  });
});

describe('descentObserved (stationarity probe decision)', () => {
  it('accepts a sum of squares that falls as the linear model predicts', () => {
    // φ(±αt*) = φ₀ ∓ (2α ∓ α²)P with φ₀ = 1, P = 0.1, α = 0.01 (Gauss–Newton model, exact).
    expect(descentObserved(1, 1 - (0.02 - 1e-4) * 0.1, 1 + (0.02 + 1e-4) * 0.1, 0.1, 0.01)).toBe(true);
  });
  it('rejects changes unrelated to the prediction (rounding noise) and non-finite values', () => {
    expect(descentObserved(1, 1.05, 0.97, 0.1, 0.01)).toBe(false);
    expect(descentObserved(1, 0.5, 1.5, 1e-9, 0.01)).toBe(false);
    expect(descentObserved(1, Number.NaN, 1.1, 0.1, 0.01)).toBe(false);
  });
});
