/**
 * Linear least squares y ≈ X·β by pivoted Householder QR with extended-precision
 * iterative refinement.
 *
 * Method:
 * 1. Validate shapes and values (InputError with the offending path).
 * 2. Optional weights w_i (= 1/σ_i²): rows and responses multiplied by √w_i.
 * 3. Column equilibration by exact powers of two, D_j = 2^−round(log2‖x_j‖), so X·D is
 *    computed without rounding; pivoted Householder QR of X·D (qr.ts) gives the numerical
 *    rank (|R_kk| ≤ τ·|R_00| ends the factorisation, τ = rankTolerance).
 * 4. Solution and iterative refinement on the augmented system
 *        [ I   A ] [r]   [y]
 *        [ Aᵀ  0 ] [β] = [0]
 *    (Björck 1967): the residuals f = y − r − Aβ and g = −Aᵀr are formed in double-double
 *    arithmetic (double-double.ts), the correction is solved with the same QR factors
 *    (Rᵀh = g, d = Qᵀf, R·δz = d₁ − h, δr = Q·[h; d₂]). Refining r as well as β is what
 *    makes the refinement converge for problems with large residuals, where refining β
 *    alone stalls at the κ² error term.
 * 5. Covariance (XᵀWX)⁻¹ = D·P·R⁻¹R⁻ᵀ·Pᵀ·D from the triangular factor, never from XᵀX;
 *    scaled by s² = RSS/(n − rank) in 'relative' mode (default without weights) or left
 *    unscaled in 'absolute' mode (default with weights: the weights are taken as 1/σ² of
 *    known measurement errors).
 * 6. R² = 1 − RSS/Σw(y − ȳ_w)² when a constant column is present, else the uncentred
 *    1 − RSS/Σwy², as NIST StRD certifies it.
 * Rank deficiency: the coefficients of the dependent (pivoted-out) columns are fixed at 0,
 * flagged in `aliased`, given zero covariance rows, and a warning names them (a "basic"
 * solution, Golub & Van Loan §5.5.6).
 * Units: n/a (the caller's units; β_j has units of y/x_j).
 * Validity: finite X (n×p) and y (n), n ≥ p ≥ 1, |values| well inside float64 range.
 * Sources: Å. Björck, "Iterative refinement of linear least squares solutions I",
 * BIT 7 (1967) 257–278; Å. Björck, Numerical Methods for Least Squares Problems, SIAM
 * (1996) §1.2, §2.9; G. H. Golub and C. F. Van Loan, Matrix Computations, 4th ed. §5.3;
 * NIST StRD linear regression documentation for R² conventions
 * (https://www.itl.nist.gov/div898/strd/).
 */
import { InputError } from '../errors.js';
import { ddAdd, ddAddProduct, ddToNumber, type DoubleDouble } from './double-double.js';
import { applyQ, applyQt, inverseGram, pivotedQR, scaledNorm, solveR, solveRt } from './qr.js';
import type { LinearFit, LinearFitOptions } from './types.js';

/** IEEE-754 binary64 machine epsilon 2^−52. */
const EPSILON = Number.EPSILON;

/** Default refinement steps after the first solve (matches the LinearFitOptions contract). */
export const DEFAULT_REFINEMENT_STEPS = 2;

/**
 * Default relative rank tolerance factor: τ = max(n, p)·ε, the usual choice for
 * rank-revealing factorisations (Golub & Van Loan §5.5.8; also LAPACK xGELSY's rcond
 * advice). Applied to the column-equilibrated matrix.
 */
export function defaultRankTolerance(n: number, p: number): number {
  return Math.max(n, p) * EPSILON;
}

/** Validate X, y and weights; returns n and p. Throws InputError naming the field. */
function validate(X: number[][], y: number[], options: LinearFitOptions): { n: number; p: number } {
  if (!Array.isArray(X) || X.length === 0) throw new InputError('X', 'must be a non-empty array of rows');
  if (!Array.isArray(y)) throw new InputError('y', 'must be an array of numbers');
  const n = X.length;
  if (y.length !== n) throw new InputError('y', `has ${y.length} values but X has ${n} rows`);
  const row0 = X[0];
  if (!Array.isArray(row0) || row0.length === 0) throw new InputError('X[0]', 'must be a non-empty row');
  const p = row0.length;
  if (n < p) throw new InputError('X', `has ${n} observations but ${p} coefficients; need n ≥ p`);
  for (let i = 0; i < n; i++) {
    const row = X[i];
    if (!Array.isArray(row) || row.length !== p) throw new InputError(`X[${i}]`, `must have ${p} columns like X[0]`);
    for (let j = 0; j < p; j++) {
      if (typeof row[j] !== 'number' || !Number.isFinite(row[j])) throw new InputError(`X[${i}][${j}]`, 'must be a finite number', row[j]);
    }
    if (typeof y[i] !== 'number' || !Number.isFinite(y[i])) throw new InputError(`y[${i}]`, 'must be a finite number', y[i]);
  }
  const w = options.weights;
  if (w !== undefined) {
    if (!Array.isArray(w) || w.length !== n) throw new InputError('weights', `must have one weight per observation (${n})`);
    for (let i = 0; i < n; i++) {
      if (typeof w[i] !== 'number' || !Number.isFinite(w[i]) || w[i] <= 0) throw new InputError(`weights[${i}]`, 'must be a finite number > 0', w[i]);
    }
  }
  const steps = options.refinementSteps;
  // Upper bound 20: project choice (refinement settles in 1–3 steps when it converges at all).
  if (steps !== undefined && (!Number.isInteger(steps) || steps < 0 || steps > 20)) {
    throw new InputError('refinementSteps', 'must be an integer from 0 to 20', steps);
  }
  const tol = options.rankTolerance;
  if (tol !== undefined && (!Number.isFinite(tol) || tol < 0 || tol >= 1)) {
    throw new InputError('rankTolerance', 'must be a number in [0, 1)', tol);
  }
  if (options.sigmaMode !== undefined && options.sigmaMode !== 'relative' && options.sigmaMode !== 'absolute') {
    throw new InputError('sigmaMode', "must be 'relative' or 'absolute'", options.sigmaMode);
  }
  return { n, p };
}

/** Index of a constant non-zero column of X, or −1 (used to pick the centred R²). */
export function findInterceptColumn(X: number[][]): number {
  const n = X.length;
  const p = X[0].length;
  for (let j = 0; j < p; j++) {
    const c = X[0][j];
    if (c === 0) continue;
    let constant = true;
    for (let i = 1; i < n && constant; i++) constant = X[i][j] === c;
    if (constant) return j;
  }
  return -1;
}

/**
 * Solve the linear least-squares problem min Σ w_i (y_i − x_iᵀβ)² (w_i = 1 without weights).
 *
 * X: n×p design matrix, rows = observations; y: n responses. See the module doc for the
 * method. Returns coefficients, covariance (scaling stated in `covarianceScaling`),
 * standard errors, raw residuals y − Xβ, RSS = Σ w_i e_i², residual SD s = √(RSS/(n − rank)),
 * R², degrees of freedom n − rank, numerical rank, aliased columns and warnings.
 * Throws InputError for bad shapes, n < p, non-finite values or non-positive weights.
 */
export function linearLeastSquares(X: number[][], y: number[], options: LinearFitOptions = {}): LinearFit {
  const { n, p } = validate(X, y, options);
  const warnings: string[] = [];
  const weights = options.weights;
  const sigmaMode = options.sigmaMode ?? (weights ? 'absolute' : 'relative');
  const steps = options.refinementSteps ?? DEFAULT_REFINEMENT_STEPS;
  const rankTol = options.rankTolerance ?? defaultRankTolerance(n, p);

  // Weighted data (rows multiplied by √w_i), column-major copy of X.
  const sw = new Float64Array(n);
  for (let i = 0; i < n; i++) sw[i] = weights ? Math.sqrt(weights[i]) : 1;
  const xw = new Float64Array(n * p);
  const yw = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const row = X[i];
    for (let j = 0; j < p; j++) xw[i + j * n] = weights ? row[j] * sw[i] : row[j];
    yw[i] = weights ? y[i] * sw[i] : y[i];
  }

  // Power-of-two column equilibration (exact).
  const scale = new Float64Array(p);
  const a = new Float64Array(n * p);
  for (let j = 0; j < p; j++) {
    const norm = scaledNorm(xw, j * n, n);
    scale[j] = norm > 0 ? Math.pow(2, -Math.round(Math.log2(norm))) : 1;
    for (let i = 0; i < n; i++) a[i + j * n] = xw[i + j * n] * scale[j];
  }
  const qr = pivotedQR(a, n, p, { rankTolerance: rankTol });
  const rank = qr.rank;
  const perm = qr.perm;

  // Augmented-system solve with refinement; beta in original variables.
  const beta = new Float64Array(p);
  const r = new Float64Array(n);
  const f = new Float64Array(n);
  const g = new Float64Array(rank);
  const dz = new Float64Array(rank);
  const w = new Float64Array(n);
  const acc: DoubleDouble = { hi: 0, lo: 0 };
  let lastRelCorrection = Infinity;
  for (let it = 0; it <= steps; it++) {
    for (let i = 0; i < n; i++) {
      acc.hi = yw[i];
      acc.lo = 0;
      ddAdd(acc, -r[i]);
      for (let j = 0; j < p; j++) if (beta[j] !== 0) ddAddProduct(acc, -xw[i + j * n], beta[j]);
      f[i] = ddToNumber(acc);
    }
    for (let k = 0; k < rank; k++) {
      const j = perm[k];
      acc.hi = 0;
      acc.lo = 0;
      if (it > 0) for (let i = 0; i < n; i++) ddAddProduct(acc, -xw[i + j * n], r[i]);
      g[k] = ddToNumber(acc) * scale[j];
    }
    solveRt(qr, g); // g ← h
    w.set(f);
    applyQt(qr, w); // w ← d = Qᵀf
    for (let k = 0; k < rank; k++) dz[k] = w[k] - g[k];
    solveR(qr, dz);
    for (let k = 0; k < rank; k++) w[k] = g[k]; // w ← [h; d₂]
    applyQ(qr, w); // w ← δr
    let corr = 0;
    let size = 0;
    for (let k = 0; k < rank; k++) {
      const j = perm[k];
      const delta = dz[k] * scale[j];
      beta[j] += delta;
      corr = Math.max(corr, Math.abs(delta));
      size = Math.max(size, Math.abs(beta[j]));
    }
    for (let i = 0; i < n; i++) r[i] += w[i];
    lastRelCorrection = size > 0 ? corr / size : corr;
    if (it > 0 && lastRelCorrection <= EPSILON) break;
  }
  // Warning threshold √ε (half the float64 digits still moving): project choice.
  if (steps > 0 && lastRelCorrection > Math.sqrt(EPSILON)) {
    warnings.push(
      `Iterative refinement did not settle (last relative correction ${lastRelCorrection.toExponential(2)}); the problem is very ill-conditioned and the coefficients may have few correct digits.`,
    );
  }

  // Final residuals e = y − Xβ (double-double) and RSS = Σ w e².
  const residuals: number[] = new Array(n);
  const rssAcc: DoubleDouble = { hi: 0, lo: 0 };
  for (let i = 0; i < n; i++) {
    acc.hi = y[i];
    acc.lo = 0;
    const row = X[i];
    for (let j = 0; j < p; j++) if (beta[j] !== 0) ddAddProduct(acc, -row[j], beta[j]);
    const e = ddToNumber(acc);
    residuals[i] = e;
    const ew = e * sw[i];
    ddAddProduct(rssAcc, ew, ew);
  }
  const rss = ddToNumber(rssAcc);
  const dof = n - rank;
  const s2 = dof > 0 ? rss / dof : 0;
  const residualStandardDeviation = Math.sqrt(s2);

  // Covariance from R⁻¹ (pivoted, scaled), mapped back to original column order.
  const gram = inverseGram(qr);
  const factor = sigmaMode === 'relative' ? s2 : 1;
  const covariance: number[][] = [];
  for (let i = 0; i < p; i++) covariance.push(new Array<number>(p).fill(0));
  for (let a1 = 0; a1 < rank; a1++) {
    const i = perm[a1];
    for (let b1 = 0; b1 < rank; b1++) {
      const j = perm[b1];
      covariance[i][j] = factor * scale[i] * scale[j] * gram[a1 * rank + b1];
    }
  }
  const standardErrors = covariance.map((row, j) => Math.sqrt(Math.max(0, row[j])));
  const aliased = new Array<boolean>(p).fill(false);
  for (let k = rank; k < p; k++) aliased[perm[k]] = true;
  if (rank < p) {
    const cols = aliased.map((v, j) => (v ? j : -1)).filter((j) => j >= 0);
    warnings.push(
      `X is rank-deficient (numerical rank ${rank} < ${p} columns): column(s) ${cols.join(', ')} depend linearly on the others; their coefficients are fixed at 0 and have no standard error.`,
    );
  }
  if (dof === 0) {
    warnings.push('No degrees of freedom left (n equals the rank): the residual SD and standard errors cannot be estimated and are reported as 0.');
  }

  // R² (weighted when weights are given).
  const interceptCol = findInterceptColumn(X);
  const hasIntercept = options.hasIntercept ?? interceptCol >= 0;
  let tss = 0;
  if (hasIntercept) {
    const sumW: DoubleDouble = { hi: 0, lo: 0 };
    const sumWY: DoubleDouble = { hi: 0, lo: 0 };
    for (let i = 0; i < n; i++) {
      const wi = weights ? weights[i] : 1;
      ddAdd(sumW, wi);
      ddAddProduct(sumWY, wi, y[i]);
    }
    const mean = ddToNumber(sumWY) / ddToNumber(sumW);
    const t: DoubleDouble = { hi: 0, lo: 0 };
    for (let i = 0; i < n; i++) {
      const d = (y[i] - mean) * sw[i];
      ddAddProduct(t, d, d);
    }
    tss = ddToNumber(t);
  } else {
    const t: DoubleDouble = { hi: 0, lo: 0 };
    for (let i = 0; i < n; i++) ddAddProduct(t, yw[i], yw[i]);
    tss = ddToNumber(t);
  }
  let rSquared: number;
  if (tss > 0) {
    rSquared = 1 - rss / tss;
  } else {
    // The response is constant: an exact fit (RSS at rounding level) counts as R² = 1.
    let sumY2 = 0;
    for (let i = 0; i < n; i++) sumY2 += yw[i] * yw[i];
    // "Rounding level" (4nε)²·Σy²: a few ulp per residual summed over n points (project choice).
    const roundingLevel = (4 * n * EPSILON) ** 2 * sumY2;
    rSquared = rss <= roundingLevel ? 1 : 0;
    warnings.push('R² is undefined because the response has no variation; reported as ' + rSquared + '.');
  }

  const coefficients = Array.from(beta);
  const finite = coefficients.every(Number.isFinite) && standardErrors.every(Number.isFinite) && Number.isFinite(rss);
  if (!finite) {
    throw new InputError('X', 'values are too large or too small for a float64 least-squares solve (a result overflowed)');
  }
  return {
    coefficients,
    covariance,
    standardErrors,
    residuals,
    rss,
    residualStandardDeviation,
    rSquared,
    degreesOfFreedom: dof,
    rank,
    warnings,
    aliased,
    covarianceScaling: sigmaMode === 'relative' ? 'residual-variance' : 'known-sigma',
  };
}
