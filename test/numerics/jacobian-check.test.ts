/**
 * The end-of-fit check of an analytic Jacobian in levenbergMarquardt must be fair (no false
 * alarm where finite differences themselves are poor) and still catch wrong derivatives.
 * These cases reproduce, in two-parameter form, the two situations met by the
 * Butler–Volmer fit: a parameter driven to a limit where the model no longer depends on it
 * (flat column at float64 resolution), and a model that is stiff on the scale of the
 * difference step (a pole close to the solution, like a point close to a limiting current).
 * Kept here beside the kinetics regression it belongs to.
 */
import { describe, expect, it } from 'vitest';
import { levenbergMarquardt } from '../../server/core/numerics/lm.js';
import { expectClose } from '../helpers/close.js';

describe('levenbergMarquardt Jacobian check: fair reference', () => {
  // Flat direction: y = 2x − 0.01x² while the model adds e^(−b)·x² ≥ 0, so the best fit
  // drives b → ∞ and the b-column (−e^(−b)x², exact) falls below float64 resolution.
  const x = Array.from({ length: 12 }, (_, i) => 0.5 + 0.25 * i);
  const y = x.map((v) => 2 * v - 0.01 * v * v);
  const flat = {
    start: [1, 1],
    residuals: (p: number[]) => x.map((v, i) => p[0] * v + Math.exp(-p[1]) * v * v - y[i]),
    jacobian: (p: number[]) => x.map((v) => [v, -Math.exp(-p[1]) * v * v]),
  };

  it('a correct derivative in a flat direction is "not checkable", not "bad"', () => {
    const fit = levenbergMarquardt(flat);
    expect(fit.status).not.toBe('failed:bad-jacobian');
    expect(fit.parameters[1]).toBeGreaterThan(20); // e^(−b) ran to the float64 floor
    expect(fit.warnings.some((w) => /p\[1\] could not be checked/.test(w))).toBe(true);
    // With the curvature term gone, a is the least-squares slope through the origin:
    // Σxy/Σx² (independent closed form, evaluated here from the data).
    const sxy = x.reduce((s, v, i) => s + v * y[i], 0);
    const sxx = x.reduce((s, v) => s + v * v, 0);
    expectClose(fit.parameters[0], sxy / sxx, { rtol: 1e-9 }, 'slope');
  });

  // Stiff model: residuals (a/(p − c_i) − y_i)/y_i with one pole 4e-5 below the solution
  // p = 1; the default central-difference step (ε^{1/3} ≈ 6e-6) has a relative truncation
  // error (h/(p − c))² ≈ 2.3 % there, above the 1 % tolerance of a plain comparison.
  const c = [0.5, 0.7, 0.9, 1 - 4e-5, 0.2, 0.95];
  const ys = c.map((ci) => 3 / (1 - ci));
  const stiff = {
    start: [2.5, 1.00001],
    residuals: (p: number[]) => c.map((ci, i) => (p[0] / (p[1] - ci) - ys[i]) / ys[i]),
    jacobian: (p: number[]) => c.map((ci, i) => [1 / (p[1] - ci) / ys[i], -p[0] / (p[1] - ci) ** 2 / ys[i]]),
  };

  it('a correct derivative of a stiff model passes (Richardson reference)', () => {
    const fit = levenbergMarquardt(stiff);
    expect(fit.converged, fit.message).toBe(true);
    expect(fit.warnings.filter((w) => /Jacobian/.test(w))).toHaveLength(0);
    // Exact data from a = 3, p = 1.
    expectClose(fit.parameters[0], 3, { rtol: 1e-9 }, 'a');
    expectClose(fit.parameters[1], 1, { rtol: 1e-12 }, 'p');
  });

  it('a derivative 5 % wrong on the stiff column is still flagged', () => {
    const wrong = { ...stiff, jacobian: (p: number[]) => stiff.jacobian(p).map(([a, b]) => [a, 1.05 * b]) };
    const fit = levenbergMarquardt(wrong);
    expect(fit.status).toBe('failed:bad-jacobian');
    expect(fit.warnings.some((w) => w.includes('p[1]'))).toBe(true);
  });

  it('a derivative 5 % wrong on a smooth column is flagged', () => {
    const wrong = { ...stiff, jacobian: (p: number[]) => stiff.jacobian(p).map(([a, b]) => [1.05 * a, b]) };
    const fit = levenbergMarquardt(wrong);
    expect(fit.status).toBe('failed:bad-jacobian');
    expect(fit.warnings.some((w) => w.includes('p[0]'))).toBe(true);
  });
});
