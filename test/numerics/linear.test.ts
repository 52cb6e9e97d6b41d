/**
 * Unit tests of linearLeastSquares: input checks, rank deficiency, covariance scaling,
 * R² conventions. Reference values are closed forms worked by hand (named beside each
 * assertion) or identities; the NIST StRD checks are in linear-strd.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../server/core/errors.js';
import { correlationMatrix, linearLeastSquares } from '../../server/core/numerics/index.js';
import { expectClose } from '../helpers/close.js';

const xs = [0, 1, 2, 3, 4, 5];
/** A small invented data set (fictional), roughly y = 1 + 2x with scatter. */
const ys = [1.1, 2.9, 5.2, 6.8, 9.1, 11.0];
const line = xs.map((x) => [1, x]);

function expectThrowsInput(fn: () => unknown, path: string): void {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    expect((err as InputError).issues[0].path).toBe(path);
    return;
  }
  throw new Error(`expected an InputError at ${path}`);
}

describe('linearLeastSquares input checks', () => {
  it('throws InputError when n < p', () => {
    expectThrowsInput(() => linearLeastSquares([[1, 2, 3], [4, 5, 6]], [1, 2]), 'X');
  });
  it('throws on non-finite values, ragged rows, length mismatch and bad weights', () => {
    expectThrowsInput(() => linearLeastSquares([[1, 0], [1, Number.NaN], [1, 2]], [1, 2, 3]), 'X[1][1]');
    expectThrowsInput(() => linearLeastSquares(line, [1, 2, Infinity, 4, 5, 6]), 'y[2]');
    expectThrowsInput(() => linearLeastSquares([[1, 0], [1], [1, 2]], [1, 2, 3]), 'X[1]');
    expectThrowsInput(() => linearLeastSquares(line, [1, 2, 3]), 'y');
    expectThrowsInput(() => linearLeastSquares(line, ys, { weights: [1, 1, 1, 0, 1, 1] }), 'weights[3]');
    expectThrowsInput(() => linearLeastSquares([], []), 'X');
  });
});

describe('linearLeastSquares values', () => {
  it('reproduces an exact line (identity: data on y = 2 + 3x)', () => {
    const fit = linearLeastSquares(line, xs.map((x) => 2 + 3 * x));
    expectClose(fit.coefficients[0], 2, { rtol: 1e-14 }, 'intercept');
    expectClose(fit.coefficients[1], 3, { rtol: 1e-14 }, 'slope');
    expectClose(fit.rss, 0, { atol: 1e-28 }, 'RSS');
    expectClose(fit.rSquared, 1, { rtol: 1e-15 }, 'R²');
  });

  it('matches the textbook closed form for a straight line', () => {
    // Hand calculation: x̄ = 2.5, ȳ = 36.1/6, Sxx = 17.5, Sxy = Σ(x − x̄)(y − ȳ) = 34.85,
    // slope = 34.85/17.5, intercept = ȳ − slope·x̄ (ordinary least squares, any statistics text).
    const fit = linearLeastSquares(line, ys);
    const slope = 34.85 / 17.5;
    expectClose(fit.coefficients[1], slope, { rtol: 1e-13 }, 'slope');
    expectClose(fit.coefficients[0], 36.1 / 6 - slope * 2.5, { rtol: 1e-13 }, 'intercept');
    // RSS = Syy − Sxy²/Sxx = 69.508333… − 1214.5225/17.5 (hand); s = √(RSS/4), SE(slope) = s/√Sxx.
    // Values from an independent computation: numpy 2.4 polyfit(x, y, 1) and the residuals.
    expectClose(fit.rss, 0.10704761904761896, { rtol: 1e-11 }, 'RSS');
    expectClose(fit.residualStandardDeviation, 0.1635906622087726, { rtol: 1e-12 }, 'residual SD');
    expectClose(fit.standardErrors[1], 0.039105647938376766, { rtol: 1e-12 }, 'SE slope');
    expect(fit.degreesOfFreedom).toBe(4);
    expect(fit.rank).toBe(2);
  });

  it('weighted mean: β = Σwy/Σw and, with σ known, var = 1/Σw', () => {
    // Closed form of the weighted mean (e.g. Bevington & Robinson, Data Reduction and Error
    // Analysis, ch. 4 — from memory): y = [1, 2, 4], w = [1, 4, 1] → 13/6, var 1/6.
    const fit = linearLeastSquares([[1], [1], [1]], [1, 2, 4], { weights: [1, 4, 1] });
    expectClose(fit.coefficients[0], 13 / 6, { rtol: 1e-15 }, 'weighted mean');
    expectClose(fit.covariance[0][0], 1 / 6, { rtol: 1e-15 }, 'variance (known σ)');
    expect(fit.covarianceScaling).toBe('known-sigma');
    // RSS = Σ w (y − 13/6)² = 49/36 + 4/36 + 121/36 = 174/36 (hand calculation).
    expectClose(fit.rss, 174 / 36, { rtol: 1e-14 }, 'weighted RSS');
  });

  it('rescaling σ leaves the relative covariance unchanged and scales the absolute one', () => {
    const w = [1, 2, 1, 0.5, 1, 3];
    const c = 9; // σ divided by 3 → weights ×9
    const wc = w.map((v) => v * c);
    const relA = linearLeastSquares(line, ys, { weights: w, sigmaMode: 'relative' });
    const relB = linearLeastSquares(line, ys, { weights: wc, sigmaMode: 'relative' });
    const absA = linearLeastSquares(line, ys, { weights: w, sigmaMode: 'absolute' });
    const absB = linearLeastSquares(line, ys, { weights: wc, sigmaMode: 'absolute' });
    expect(relA.covarianceScaling).toBe('residual-variance');
    for (let i = 0; i < 2; i++) {
      expectClose(relB.coefficients[i], relA.coefficients[i], { rtol: 1e-13 }, `β${i} unchanged`);
      for (let j = 0; j < 2; j++) {
        expectClose(relB.covariance[i][j], relA.covariance[i][j], { rtol: 1e-12 }, `relative C${i}${j}`);
        expectClose(absB.covariance[i][j], absA.covariance[i][j] / c, { rtol: 1e-12 }, `absolute C${i}${j}`);
      }
    }
    const rA = correlationMatrix(absA.covariance);
    const rB = correlationMatrix(relB.covariance);
    expectClose(rB[0][1], rA[0][1], { rtol: 1e-12 }, 'correlation unchanged');
    // Without weights the default is the scaled ('relative') covariance.
    expect(linearLeastSquares(line, ys).covarianceScaling).toBe('residual-variance');
  });

  it('rank-deficient X: warns, flags the dependent column, and returns finite numbers', () => {
    const X = xs.map((x) => [1, x, 2 * x]);
    const fit = linearLeastSquares(X, ys);
    expect(fit.rank).toBe(2);
    expect(fit.warnings.some((w) => w.includes('rank-deficient'))).toBe(true);
    expect(fit.aliased.filter(Boolean).length).toBe(1);
    for (const v of [...fit.coefficients, ...fit.standardErrors, ...fit.covariance.flat(), fit.rss, fit.rSquared]) {
      expect(Number.isFinite(v)).toBe(true);
    }
    // Identity: the fitted values equal those of the full-rank fit on [1, x].
    const ref = linearLeastSquares(line, ys);
    xs.forEach((x, i) => {
      const yhat = fit.coefficients[0] + fit.coefficients[1] * x + fit.coefficients[2] * 2 * x;
      const yref = ref.coefficients[0] + ref.coefficients[1] * x;
      expectClose(yhat, yref, { rtol: 1e-12, atol: 1e-12 }, `fitted value ${i}`);
    });
    expectClose(fit.rss, ref.rss, { rtol: 1e-10 }, 'RSS');
    expect(fit.degreesOfFreedom).toBe(4);
  });

  it('a zero column is reported as rank deficiency, not NaN', () => {
    const fit = linearLeastSquares(xs.map((x) => [1, x, 0]), ys);
    expect(fit.rank).toBe(2);
    expect(fit.aliased).toEqual([false, false, true]);
    expectClose(fit.coefficients[2], 0, { atol: 0 }, 'aliased coefficient fixed at 0');
  });

  it('n = p: exact solve with a warning that no SE can be estimated', () => {
    const fit = linearLeastSquares([[1, 0], [1, 1]], [3, 5]);
    expectClose(fit.coefficients[0], 3, { rtol: 1e-15 }, 'b0');
    expectClose(fit.coefficients[1], 2, { rtol: 1e-15 }, 'b1');
    expect(fit.degreesOfFreedom).toBe(0);
    expect(fit.warnings.some((w) => w.includes('No degrees of freedom'))).toBe(true);
    expect(fit.standardErrors.every((v) => v === 0)).toBe(true);
  });

  it('R²: centred with a constant column, uncentred without (NIST convention)', () => {
    // Through-origin fit of y = [1, 2, 2] on x = [1, 2, 3]: β = Σxy/Σx² = 11/14,
    // RSS = Σy² − (Σxy)²/Σx² = 9 − 121/14 = 5/14, uncentred R² = 1 − (5/14)/9 = 1 − 5/126.
    const fit = linearLeastSquares([[1], [2], [3]], [1, 2, 2]);
    expectClose(fit.coefficients[0], 11 / 14, { rtol: 1e-15 }, 'β');
    expectClose(fit.rSquared, 1 - 5 / 126, { rtol: 1e-14 }, 'uncentred R²');
    // Forcing the centred form: Σ(y − ȳ)² = 2/3 → R² = 1 − (5/14)/(2/3) = 1 − 15/28.
    const centred = linearLeastSquares([[1], [2], [3]], [1, 2, 2], { hasIntercept: true });
    expectClose(centred.rSquared, 1 - 15 / 28, { rtol: 1e-14 }, 'centred R²');
  });

  it('constant response with an intercept: R² reported as 1 with a warning', () => {
    const fit = linearLeastSquares(line, xs.map(() => 4));
    expectClose(fit.rSquared, 1, { atol: 0 }, 'R²');
    expect(fit.warnings.some((w) => w.includes('R² is undefined'))).toBe(true);
  });
});
