/**
 * Working-branch uncertainty (ln j0, α of the working branch, SEs and correlation) of the
 * Tafel and Butler–Volmer fits, against independent computations:
 *  - a direct nonlinear least-squares fit of the same points in the (ln j0, α) parametrisation
 *    (numerics' Levenberg–Marquardt with finite-difference Jacobian; the model written out
 *    here: Tafel η = (ln|j| − ln j0)/(f·α) (+ R_u·j), Butler–Volmer η from the public
 *    butlerVolmerOverpotential). Its covariance s²(JᵀJ)⁻¹ is the delta-method covariance of
 *    the core's own parametrisation mapped to (ln j0, α): the linearised covariance of a
 *    least-squares fit transforms with the Jacobian of any smooth reparametrisation, so the
 *    two agree up to the finite-difference error of the independent Jacobian;
 *  - Monte Carlo of the line parameters (a, b) drawn from their fitted normal distribution
 *    (seeded), mapped through ln j0 = −a/b, α = RT/(bF): the sample SDs and correlation agree
 *    with the delta method to within sampling error and the (small) nonlinearity.
 * All data invented (synthetic, seeded).
 */
import normal from '@stdlib/random-base-normal';
import { describe, expect, it } from 'vitest';
import { fitKinetics, type KineticsFitInput } from '../../server/core/kinetics/fit.js';
import { butlerVolmerOverpotential } from '../../server/core/kinetics/models.js';
import { fitTafel } from '../../server/core/kinetics/tafel.js';
import type { PolarizationPoint } from '../../server/core/kinetics/types.js';
import { pairFromCovariance, tafelWorkingBranchUncertainty } from '../../server/core/kinetics/working-branch.js';
import { levenbergMarquardt } from '../../server/core/numerics/index.js';
import { expectClose } from '../helpers/close.js';
import { bvPoints, logSpaced, tafelPoints } from './synthetic.js';

/** CODATA 2018 exact values: R = 8.314462618 J/(mol·K), F = 96485.33212 C/mol. */
const R = 8.314462618;
const F = 96485.33212;
const fOf = (T: number) => F / (R * T);

/** SEs and correlation of parameters i, k from a covariance matrix. */
function pairOf(cov: number[][], i: number, k: number) {
  const si = Math.sqrt(cov[i][i]);
  const sk = Math.sqrt(cov[k][k]);
  return { seI: si, seK: sk, corr: cov[i][k] / (si * sk) };
}

/** Points the fit used (its residual records say which). */
function usedPoints(r: { residuals: { currentDensity: number; overpotential: number; used: boolean }[] }): PolarizationPoint[] {
  return r.residuals.filter((q) => q.used).map((q) => ({ currentDensity: q.currentDensity, overpotential: q.overpotential }));
}

describe('Tafel: working-branch uncertainty', () => {
  const T = 343.15;
  const f = fOf(T);
  const ru = 4e-6;
  // Anodic line, b = 30 mV per e-fold, j0 = 2 A/m², 2 mV noise, with an iR drop.
  const pts = tafelPoints(logSpaced(1, 3.5, 25), 2, 0.03, { sigma: 0.002, seed: 21, ru });
  const window = { minOverpotential: 0, maxOverpotential: 1 };

  for (const ruMode of ['known', 'fit'] as const) {
    it(`matches a direct least-squares fit in (ln j0, α) (R_u ${ruMode})`, () => {
      const r = fitKinetics({ points: pts, model: 'tafel', temperature: T, window, uncompensatedResistance: ruMode === 'fit' ? 'fit' : ru });
      const u = r.workingBranchUncertainty!;
      expect(u.branch).toBe('anodic');
      // Independent: η = (ln j − L)/(f α) + R_u·j, parameters (L, α[, R_u]).
      const used = usedPoints(r);
      const lineStart = [Math.log(1), 1];
      const start = ruMode === 'fit' ? [...lineStart, 0] : lineStart;
      const ind = levenbergMarquardt({
        residuals: (p) => used.map((q) => q.overpotential - ((Math.log(q.currentDensity) - p[0]) / (f * p[1]) + (ruMode === 'fit' ? p[2] : ru) * q.currentDensity)),
        start,
      });
      expect(ind.converged, ind.message).toBe(true);
      const e = pairOf(ind.covariance, 0, 1);
      expectClose(u.lnExchangeCurrentDensity, ind.parameters[0], { rtol: 1e-7, atol: 1e-9 }, 'ln j0');
      expectClose(u.transferCoefficient, ind.parameters[1], { rtol: 1e-7 }, 'α');
      expectClose(u.lnExchangeCurrentDensitySE, e.seI, { rtol: 1e-5 }, 'SE(ln j0)');
      expectClose(u.transferCoefficientSE, e.seK, { rtol: 1e-5 }, 'SE(α)');
      expectClose(u.correlation, e.corr, { rtol: 1e-5 }, 'corr(ln j0, α)');
      // A Tafel line gives strongly anti-correlated ln j0 and α (cell/types.ts).
      expect(u.correlation).toBeLessThan(-0.9);
    });
  }

  it('agrees with Monte Carlo of the line parameters (a, b)', () => {
    const t = fitTafel(pts, { temperature: T, window, uncompensatedResistance: ru });
    const u = t.workingBranchUncertainty!;
    const a = t.parameters.intercept.value;
    const sa = t.parameters.intercept.standardError!;
    const b = t.parameters.tafelSlope.value / Math.LN10;
    const sb = t.parameters.tafelSlope.standardError! / Math.LN10;
    const rho = t.correlation.matrix[0][1];
    // (a, b) = mean + Cholesky factor × standard normals (2×2 Cholesky written out).
    const z = normal.factory(0, 1, { seed: 77 });
    const N = 40_000;
    const L: number[] = [];
    const A: number[] = [];
    for (let i = 0; i < N; i++) {
      const z1 = z();
      const z2 = z();
      const ai = a + sa * z1;
      const bi = b + sb * (rho * z1 + Math.sqrt(1 - rho * rho) * z2);
      L.push(-ai / bi);
      A.push(1 / (f * bi));
    }
    const mean = (v: number[]) => v.reduce((p, q) => p + q, 0) / v.length;
    const mL = mean(L);
    const mA = mean(A);
    let sLL = 0;
    let sAA = 0;
    let sLA = 0;
    for (let i = 0; i < N; i++) {
      sLL += (L[i] - mL) ** 2;
      sAA += (A[i] - mA) ** 2;
      sLA += (L[i] - mL) * (A[i] - mA);
    }
    const sdL = Math.sqrt(sLL / (N - 1));
    const sdA = Math.sqrt(sAA / (N - 1));
    const corr = sLA / Math.sqrt(sLL * sAA);
    // Sampling error of an SD ≈ 1/√(2N) ≈ 0.35 %; of a correlation near −0.99 ≈ (1 − ρ²)/√N ≈ 1e-4.
    // The delta method is first order: with SE(b)/b ≈ 1 % the nonlinearity adds well under 1 %.
    expectClose(u.lnExchangeCurrentDensitySE, sdL, { rtol: 2e-2 }, 'SE(ln j0) vs Monte Carlo');
    expectClose(u.transferCoefficientSE, sdA, { rtol: 2e-2 }, 'SE(α) vs Monte Carlo');
    expectClose(u.correlation, corr, { atol: 2e-3 }, 'corr vs Monte Carlo');
  });

  it('is consistent with the reported parameters (identities)', () => {
    const t = fitTafel(pts, { temperature: T, window, uncompensatedResistance: ru });
    const u = t.workingBranchUncertainty!;
    const j0 = t.parameters.exchangeCurrentDensity;
    const alpha = t.parameters.transferCoefficient;
    expectClose(Math.exp(u.lnExchangeCurrentDensity), j0.value, { rtol: 1e-13 }, 'e^{ln j0} = j0');
    expectClose(u.lnExchangeCurrentDensitySE, j0.standardError! / j0.value, { rtol: 1e-13 }, 'SE(ln j0) = SE(j0)/j0');
    expectClose(u.transferCoefficient, alpha.value, { rtol: 1e-13 }, 'α');
    expectClose(u.transferCoefficientSE, alpha.standardError!, { rtol: 1e-13 }, 'SE(α)');
  });

  it('rescaling the scatter scales the SEs and leaves the correlation unchanged (invariance)', () => {
    const base = fitTafel(pts, { temperature: T, window, uncompensatedResistance: ru });
    // Same fitted line, residuals × 3: s × 3, covariance × 9.
    const tripled = base.residuals.map((q) => ({ currentDensity: q.currentDensity, overpotential: (q.fitted as number) + 3 * (q.residual as number) }));
    const r3 = fitTafel(tripled, { temperature: T, window, uncompensatedResistance: ru });
    const u = base.workingBranchUncertainty!;
    const u3 = r3.workingBranchUncertainty!;
    expectClose(u3.lnExchangeCurrentDensitySE, 3 * u.lnExchangeCurrentDensitySE, { rtol: 1e-9 }, 'SE(ln j0) × 3');
    expectClose(u3.transferCoefficientSE, 3 * u.transferCoefficientSE, { rtol: 1e-9 }, 'SE(α) × 3');
    expectClose(u3.correlation, u.correlation, { rtol: 1e-9 }, 'correlation unchanged');
  });

  it('cathodic branch: α_c of the cathodic line', () => {
    const cath = tafelPoints(logSpaced(1, 3.5, 20, -1), 5, 0.04, { sigma: 0.001, seed: 22 });
    const r = fitKinetics({ points: cath, model: 'tafel', temperature: T, window });
    const u = r.workingBranchUncertainty!;
    expect(u.branch).toBe('cathodic');
    // b = 40 mV per e-fold → α = 1/(f·b) (domain.md §3).
    expectClose(u.transferCoefficient, 1 / (f * 0.04), { rtol: 2e-2 }, 'α_c near the generating value');
    // Independent: −η = (ln|j| − L)/(f α) on the cathodic branch.
    const used = usedPoints(r);
    const ind = levenbergMarquardt({ residuals: (p) => used.map((q) => -q.overpotential - (Math.log(-q.currentDensity) - p[0]) / (f * p[1])), start: [0, 1] });
    const e = pairOf(ind.covariance, 0, 1);
    expectClose(u.lnExchangeCurrentDensitySE, e.seI, { rtol: 1e-5 }, 'SE(ln j0)');
    expectClose(u.transferCoefficientSE, e.seK, { rtol: 1e-5 }, 'SE(α_c)');
    expectClose(u.correlation, e.corr, { rtol: 1e-5 }, 'corr(ln j0, α_c)');
  });
});

describe('Butler–Volmer: working-branch uncertainty', () => {
  const T = 323.15;
  const truth = { exchangeCurrentDensity: 2, anodicTransferCoefficient: 0.62, cathodicTransferCoefficient: 0.45 };
  /** Independent fit with α linear: parameters (ln j0, then the free α's by `unpack`). */
  const direct = (points: PolarizationPoint[], start: number[], unpack: (p: number[]) => { aa: number; ac: number }) =>
    levenbergMarquardt({
      residuals: (p) => {
        const { aa, ac } = unpack(p);
        return points.map((q) => q.overpotential - butlerVolmerOverpotential(q.currentDensity, { exchangeCurrentDensity: Math.exp(p[0]), anodicTransferCoefficient: aa, cathodicTransferCoefficient: ac }, T));
      },
      start,
    });

  it('free α: (ln j0, α_a) of the main (anodic) branch matches a direct fit in (ln j0, α_a, α_c)', () => {
    const pts = bvPoints([...logSpaced(-0.5, 2, 10, -1), ...logSpaced(-0.5, 3, 20)], truth, T, { sigma: 0.001, seed: 31 });
    const r = fitKinetics({ points: pts, model: 'butler-volmer', temperature: T });
    expect(r.converged).toBe(true);
    const u = r.workingBranchUncertainty!;
    expect(u.branch).toBe('anodic');
    const ind = direct(pts, [0, 0.5, 0.5], (p) => ({ aa: p[1], ac: p[2] }));
    expect(ind.converged, ind.message).toBe(true);
    const e = pairOf(ind.covariance, 0, 1);
    expectClose(u.transferCoefficient, ind.parameters[1], { rtol: 1e-7 }, 'α_a');
    expectClose(u.lnExchangeCurrentDensitySE, e.seI, { rtol: 1e-5 }, 'SE(ln j0)');
    expectClose(u.transferCoefficientSE, e.seK, { rtol: 1e-5 }, 'SE(α_a)');
    expectClose(u.correlation, e.corr, { rtol: 1e-5, atol: 1e-7 }, 'corr(ln j0, α_a)');
    // The cathodic electrode's view: with the branch option the working α is α_c.
    const rc = fitKinetics({ points: pts, model: 'butler-volmer', temperature: T, branch: 'cathodic' });
    expect(rc.workingBranchUncertainty?.branch).toBe('cathodic');
  });

  it('tied α_a + α_c = n: the working α_c moves opposite to α_a (sign of the correlation)', () => {
    const tied = { exchangeCurrentDensity: 2, anodicTransferCoefficient: 0.55, cathodicTransferCoefficient: 0.45 };
    const pts = bvPoints([...logSpaced(-0.5, 3, 20, -1), ...logSpaced(-0.5, 2, 10)], tied, T, { sigma: 0.001, seed: 32 });
    const input: KineticsFitInput = { points: pts, model: 'butler-volmer', temperature: T, electrons: 1, tieTransferCoefficients: true };
    const r = fitKinetics(input);
    expect(r.converged).toBe(true);
    const u = r.workingBranchUncertainty!;
    expect(u.branch).toBe('cathodic');
    // Independent: parameters (ln j0, α_c), α_a = n − α_c.
    const ind = direct(pts, [0, 0.5], (p) => ({ aa: 1 - p[1], ac: p[1] }));
    expect(ind.converged, ind.message).toBe(true);
    const e = pairOf(ind.covariance, 0, 1);
    expectClose(u.transferCoefficient, ind.parameters[1], { rtol: 1e-7 }, 'α_c');
    expectClose(u.lnExchangeCurrentDensitySE, e.seI, { rtol: 1e-5 }, 'SE(ln j0)');
    expectClose(u.transferCoefficientSE, e.seK, { rtol: 1e-5 }, 'SE(α_c)');
    expectClose(u.correlation, e.corr, { rtol: 1e-5, atol: 1e-7 }, 'corr(ln j0, α_c)');
  });

  it('user-fixed working α: SE 0, correlation 0, SE(ln j0) as with α held', () => {
    const pts = bvPoints([...logSpaced(-0.5, 2, 10, -1), ...logSpaced(-0.5, 3, 20)], truth, T, { sigma: 0.001, seed: 33 });
    const r = fitKinetics({ points: pts, model: 'butler-volmer', temperature: T, anodicTransferCoefficient: 0.62 });
    const u = r.workingBranchUncertainty!;
    expect(u.branch).toBe('anodic');
    expectClose(u.transferCoefficient, 0.62, { rtol: 1e-15 }, 'α_a fixed');
    expectClose(u.transferCoefficientSE, 0, { atol: 0 }, 'SE(α_a)');
    expectClose(u.correlation, 0, { atol: 0 }, 'correlation');
    const ind = direct(pts, [0, 0.5], (p) => ({ aa: 0.62, ac: p[1] }));
    expectClose(u.lnExchangeCurrentDensitySE, Math.sqrt(ind.covariance[0][0]), { rtol: 1e-5 }, 'SE(ln j0)');
  });
});

describe('pairFromCovariance and the Tafel map: edge cases', () => {
  it('is absent for a non-finite or negative variance, and has correlation 0 when a variance is 0', () => {
    expect(pairFromCovariance('anodic', 1, Number.NaN, 0.5, 1e-4, 0)).toBeUndefined();
    expect(pairFromCovariance('anodic', 1, 0.01, 0.5, -1e-4, 0)).toBeUndefined();
    const held = pairFromCovariance('cathodic', 1, 0.01, 0.5, 0, 0)!;
    expectClose(held.correlation, 0, { atol: 0 }, 'correlation with a held α');
    expectClose(held.lnExchangeCurrentDensitySE, 0.1, { rtol: 1e-15 }, '√0.01');
  });

  it('is absent for a non-positive slope', () => {
    expect(tafelWorkingBranchUncertainty(0.1, -0.03, [[1e-6, 0], [0, 1e-8]], 298.15, 'anodic')).toBeUndefined();
  });

  it('hand delta method for a given (a, b) covariance (exact first-order propagation)', () => {
    // a = −0.15 V, b = 0.03 V, σa = 2 mV, σb = 0.4 mV, ρ = −0.95 at 298.15 K. By hand:
    // ln j0 = 5; ∂ln j0/∂a = −1/b = −33.333, ∂ln j0/∂b = a/b² = −166.67;
    // Var(ln j0) = 33.333²·4e-6 + 2·33.333·166.67·(−0.95·2e-3·4e-4) + 166.67²·1.6e-7
    //            = 4.4444e-3 − 8.4444e-3 + 4.4444e-3 = 4.4444e-4 → SE 0.021082;
    // α = 1/(f b) with f = F/(RT) = 38.9217 V⁻¹: α = 0.85642; SE(α) = α·σb/b = 0.011419;
    // Cov(ln j0, α) = (∂α/∂b)·[∂ln j0/∂a·σab + ∂ln j0/∂b·σb²], ∂α/∂b = −α/b = −28.547:
    //   = −28.547·(−33.333·(−7.6e-7) − 166.67·1.6e-7) = −28.547·(2.5333e-5 − 2.6667e-5) = 3.8063e-5;
    // corr = 3.8063e-5/(0.021082·0.011419) = 0.15811.
    const T = 298.15;
    const cov = [
      [4e-6, -0.95 * 2e-3 * 4e-4],
      [-0.95 * 2e-3 * 4e-4, 1.6e-7],
    ];
    const u = tafelWorkingBranchUncertainty(-0.15, 0.03, cov, T, 'anodic')!;
    expectClose(u.lnExchangeCurrentDensity, 5, { rtol: 1e-14 }, 'ln j0');
    expectClose(u.lnExchangeCurrentDensitySE, 0.021082, { rtol: 1e-4 }, 'SE(ln j0)');
    // rtol 1e-9: the constants above are CODATA's 10-digit roundings of the exact k·N_A and e·N_A.
    expectClose(u.transferCoefficient, 1 / (fOf(T) * 0.03), { rtol: 1e-9 }, 'α');
    expectClose(u.transferCoefficientSE, 0.011419, { rtol: 2e-4 }, 'SE(α)');
    expectClose(u.correlation, 0.15811, { rtol: 5e-4 }, 'corr');
  });
});
