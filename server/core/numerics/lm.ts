/**
 * Nonlinear least squares min ½‖r(p)‖² by a trust-region Levenberg–Marquardt method.
 *
 * Method (Moré 1978, as in MINPACK-1 lmder/lmdif, re-implemented here):
 * - At each outer iteration the Jacobian J (analytic, or central / forward finite
 *   differences) is factored J·P = Q·R by pivoted Householder QR (qr.ts).
 * - Parameters are scaled by D = diag(d_j), d_j = the largest Euclidean norm column j of
 *   J has had so far (MINPACK "mode 1"), so the method is invariant to parameter units.
 * - The step solves min ‖J·s + r‖ subject to ‖D·s‖ ≤ Δ: the Levenberg–Marquardt parameter
 *   λ is found by Moré's safeguarded Newton iteration on ‖D·s(λ)‖ = Δ, each trial solving
 *   [J; √λ·D]·s ≈ [−r; 0] from R with Givens rotations (lm-subproblem.ts).
 * - The ratio ρ of actual to predicted reduction updates the radius Δ and λ; a step is
 *   accepted when ρ ≥ 10⁻⁴.
 * - Stopping: relative cost reduction (actual and predicted) ≤ ftol → 'converged:ftol';
 *   Δ ≤ xtol·‖D·x‖ → 'converged:xtol'; scaled gradient cosine ≤ gtol → 'converged:gtol';
 *   the same tests at machine precision (ε) count as converged at the float64 limit.
 * - Non-finite trial residuals are treated as a failed step (ρ < 0) so Δ shrinks by 10;
 *   if the radius collapses while trials are still non-finite → 'failed:non-finite'.
 * - Honesty checks at the returned point, where the Jacobian is re-evaluated:
 *   (a) an analytic Jacobian is compared with Richardson-extrapolated central differences,
 *   allowing for their own estimated error → 'failed:bad-jacobian' on clear disagreement
 *   (a flat column that finite differences cannot resolve earns a warning instead);
 *   (b) if the scaled gradient is not small, the sum of squares is
 *   probed along the scaled steepest-descent direction: a decrease as predicted by the
 *   linearisation → 'failed:not-stationary', otherwise the gradient is rounding noise (a
 *   warning says so); (c) a rank-deficient J → 'failed:singular' (not identifiable).
 * - Covariance C = s²·(JᵀJ)⁻¹ (s² = RSS/(n − p)) at the solution from R⁻¹ of the pivoted,
 *   power-of-two column-scaled QR of J — JᵀJ is never formed. sigmaMode 'absolute' drops
 *   the s² factor (residuals already divided by known σ).
 * Units: n/a (parameters and residuals in the caller's units).
 * Validity: n ≥ p residuals, smooth r(p); the result is a local minimum nearest (in the
 * algorithm's sense) to the start; the covariance is the usual linearised estimate.
 * Sources: J. J. Moré, "The Levenberg–Marquardt algorithm: implementation and theory",
 * in Numerical Analysis (Dundee 1977), Springer LNM 630, Springer (1978)
 * 105–116; J. J. Moré, B. S. Garbow, K. E. Hillstrom, User Guide for MINPACK-1,
 * Argonne ANL-80-74 (1980); J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed.,
 * Springer (2006): LM as a trust-region method (ch. 10) and finite-difference step sizes
 * ε^{1/2} forward, ε^{1/3} central (§8.1) — section numbers from memory.
 */
import { InputError } from '../errors.js';
import { inverseGram, pivotedQR, scaledNorm, applyQt } from './qr.js';
import { enorm, lmParameter, type LmParWork } from './lm-subproblem.js';
import type { NonlinearFit, NonlinearOptions, NonlinearProblem, NonlinearStatus } from './types.js';

const EPSILON = Number.EPSILON;

/** Default tolerances (chosen for this project: tight, cheap for small problems). */
export const LM_DEFAULTS = {
  ftol: 1e-12,
  xtol: 1e-12,
  gtol: 1e-12,
  /** MINPACK factor: initial Δ = factor·‖D·x₀‖ (Moré et al. 1980 recommend 100). */
  initialStepBound: 100,
} as const;

/** Trust-region constants of Moré (1978) / MINPACK lmder. */
const ACCEPT_RATIO = 1e-4;
const SHRINK_RATIO = 0.25;
const EXPAND_RATIO = 0.75;
/**
 * Scaled-gradient cosine above which the returned point is probed for descent
 * (probeDescent), with max(gtol, this, 10·√max(ftol, xtol)) as the trigger. Project
 * choice: converged NIST StRD runs end at ≤ 2e-8, except where the residuals are at
 * rounding-noise level (Lanczos1, ~3e-4), which the probe then recognises as noise.
 */
const STATIONARY_COSINE = 1e-4;

/** Finite-difference step factors: ε^{1/3} central, ε^{1/2} forward (Nocedal & Wright §8.1; section number from memory). */
const CENTRAL_STEP = Math.cbrt(EPSILON);
/**
 * Safety factor on the finite-difference relative error (ε^{2/3} central, ε^{1/2} forward)
 * used as the rank tolerance of a differenced Jacobian (project choice; on NIST StRD the
 * smallest |R_kk|/|R_00| of the column-scaled J at the solution is 4e-5, Bennett5).
 */
const FD_RANK_FACTOR = 10;
/**
 * Relative column difference above which an analytic Jacobian is judged wrong (project
 * choice: central differences are good to ~1e-8 relative on smooth, well-scaled models,
 * so 1e-2 only fires on real derivative errors).
 */
const JACOBIAN_CHECK_RTOL = 1e-2;
/**
 * Multiple of the estimated error of the finite-difference reference added to the
 * tolerance of the Jacobian check (project choice: the estimate, see
 * compareWithFiniteDifferences, over-states the truncation error of the reference and is of
 * the size of its rounding noise, so a factor 2 covers both with margin while a real
 * derivative error, which all the differences share, still stands out).
 */
const JACOBIAN_CHECK_FD_ERROR_FACTOR = 2;
/**
 * Step fractions α of the linear-model optimum tried by the stationarity probe, largest
 * first (project choice: small enough that the linearisation holds, several so that a
 * nearby kink or wall does not hide a real descent).
 */
const PROBE_FRACTIONS = [1e-2, 1e-4, 1e-6] as const;

/**
 * Stationarity probe decision. Along a direction d with linear-model optimum t* and
 * predicted reduction P (Gauss–Newton model), φ(±α·t*) = φ₀ ∓ 2αP + O(α²), so the
 * antisymmetric part (φ₋ − φ₊)/2 ≈ 2αP while curvature cancels. Returns true ("real
 * descent") when φ₊ < φ₀ and (φ₋ − φ₊)/2 lies within a factor 2 of 2αP; rounding noise in
 * the residuals gives values unrelated to 2αP. Non-finite inputs → false.
 * φ values are sums of squares (residual units²); α dimensionless.
 */
export function descentObserved(phi0: number, phiPlus: number, phiMinus: number, predicted: number, alpha: number): boolean {
  if (![phi0, phiPlus, phiMinus, predicted, alpha].every(Number.isFinite) || predicted <= 0) return false;
  const anti = (phiMinus - phiPlus) / 2;
  const expected = 2 * alpha * predicted;
  return phiPlus < phi0 && anti >= 0.5 * expected && anti <= 2 * expected;
}
const FORWARD_STEP = Math.sqrt(EPSILON);
/**
 * For a parameter that is exactly 0, the difference step is taken relative to
 * 1e-3·|start value| (or 1 when that is 0 too): project choice, so a parameter passing
 * through zero keeps a step on the scale the caller gave it.
 */
const ZERO_PARAMETER_STEP_FRACTION = 1e-3;

function fail(path: string, message: string, value?: unknown): never {
  throw new InputError(path, message, value);
}

function checkTol(name: string, v: number | undefined, dflt: number): number {
  if (v === undefined) return dflt;
  if (typeof v !== 'number' || !Number.isFinite(v) || v < 0 || v >= 1) fail(`options.${name}`, 'must be a number in [0, 1)', v);
  return v;
}

/**
 * Fit parameters p minimising ½Σ r_i(p)² by trust-region Levenberg–Marquardt.
 * See the module doc for the method, stopping tests, honesty checks and covariance.
 * Throws InputError for a malformed problem or options, or when the residuals at the
 * start are not finite; every other failure is reported through `status` and `converged`.
 */
export function levenbergMarquardt(problem: NonlinearProblem, options: NonlinearOptions = {}): NonlinearFit {
  if (!problem || typeof problem.residuals !== 'function') fail('problem.residuals', 'must be a function');
  if (problem.jacobian !== undefined && typeof problem.jacobian !== 'function') fail('problem.jacobian', 'must be a function when given');
  const start = problem.start;
  if (!Array.isArray(start) || start.length === 0) fail('problem.start', 'must be a non-empty array of numbers');
  start.forEach((v, j) => {
    if (typeof v !== 'number' || !Number.isFinite(v)) fail(`problem.start[${j}]`, 'must be a finite number', v);
  });
  const ftol = checkTol('ftol', options.ftol, LM_DEFAULTS.ftol);
  const xtol = checkTol('xtol', options.xtol, LM_DEFAULTS.xtol);
  const gtol = checkTol('gtol', options.gtol, LM_DEFAULTS.gtol);
  const fdMode = options.finiteDifference ?? 'central';
  if (fdMode !== 'central' && fdMode !== 'forward') fail('options.finiteDifference', "must be 'central' or 'forward'", fdMode);
  const sigmaMode = options.sigmaMode ?? 'relative';
  if (sigmaMode !== 'relative' && sigmaMode !== 'absolute') fail('options.sigmaMode', "must be 'relative' or 'absolute'", sigmaMode);
  const factor = options.initialStepBound ?? LM_DEFAULTS.initialStepBound;
  if (!Number.isFinite(factor) || factor <= 0) fail('options.initialStepBound', 'must be a number > 0', factor);

  const n = start.length;
  const analytic = problem.jacobian;
  const perJacobian = analytic ? 0 : fdMode === 'central' ? 2 * n : n;
  // Default budget: MINPACK lmder1's maxfev = 100·(n + 1) (Moré et al. 1980; from memory), times
  // the residual calls one Jacobian costs here (project choice).
  const maxEvaluations = options.maxEvaluations ?? 100 * (n + 1) * (1 + perJacobian);
  if (!Number.isInteger(maxEvaluations) || maxEvaluations < 1) fail('options.maxEvaluations', 'must be a positive integer', maxEvaluations);

  let evaluations = 0;
  let jacobianEvaluations = 0;
  let m = -1;
  const xArr = start.slice();

  /** Evaluate residuals at x into out; returns false when any value is not finite. */
  const evaluate = (x: number[], out: Float64Array | null): Float64Array | false => {
    evaluations++;
    const res = problem.residuals(x.slice()); // a copy: the caller may keep or mutate it
    if (!Array.isArray(res) && !ArrayBuffer.isView(res as unknown)) fail('problem.residuals', 'must return an array of numbers');
    if (m >= 0 && res.length !== m) fail('problem.residuals', `returned ${res.length} values; expected ${m} as at the start`);
    const o = out ?? new Float64Array(res.length);
    let ok = true;
    for (let i = 0; i < res.length; i++) {
      const v = res[i];
      o[i] = v;
      if (!Number.isFinite(v)) ok = false;
    }
    return ok ? o : false;
  };

  const f0 = evaluate(xArr, null);
  if (f0 === false) fail('problem.start', 'residuals are not finite at the starting point');
  m = f0.length;
  if (m < n) fail('problem.residuals', `returned ${m} residuals for ${n} parameters; need at least as many residuals as parameters`);

  const fvec = f0;
  const wa4 = new Float64Array(m);
  const fPlus = new Float64Array(m);
  const fMinus = new Float64Array(m);
  const fjac = new Float64Array(m * n);
  const x = Float64Array.from(start);
  const xTrial = new Array<number>(n);
  const xWork = new Array<number>(n);

  /**
   * Finite-difference Jacobian at xv into out (column-major m×n); false on non-finite.
   * Central differences: h_j = ε^{1/3}·max(|x_j|, typical_j), typical_j = |x_j|, else
   * 1e-3·|x0_j|, else 1; forward: ε^{1/2} instead. One-sided fallback when one of the two
   * central points gives non-finite residuals.
   */
  const fdJacobianMode = (xv: Float64Array, fv: Float64Array, out: Float64Array, mode: 'central' | 'forward'): boolean => {
    for (let j = 0; j < n; j++) xWork[j] = xv[j];
    for (let j = 0; j < n; j++) {
      const xj = xv[j];
      const typical = Math.abs(xj) > 0 ? Math.abs(xj) : Math.abs(start[j]) > 0 ? Math.abs(start[j]) * ZERO_PARAMETER_STEP_FRACTION : 1;
      const base = mode === 'central' ? CENTRAL_STEP : FORWARD_STEP;
      let h = base * Math.max(Math.abs(xj), typical);
      const xp = xj + h;
      h = xp - xj; // exactly representable step
      xWork[j] = xj + h;
      const fp = evaluate(xWork, fPlus);
      if (mode === 'central') {
        xWork[j] = xj - h;
        const fm = evaluate(xWork, fMinus);
        xWork[j] = xj;
        if (fp && fm) {
          for (let i = 0; i < m; i++) out[i + j * m] = (fp[i] - fm[i]) / (2 * h);
        } else if (fp) {
          for (let i = 0; i < m; i++) out[i + j * m] = (fp[i] - fv[i]) / h;
        } else if (fm) {
          for (let i = 0; i < m; i++) out[i + j * m] = (fv[i] - fm[i]) / h;
        } else return false;
      } else {
        xWork[j] = xj;
        if (fp) {
          for (let i = 0; i < m; i++) out[i + j * m] = (fp[i] - fv[i]) / h;
        } else {
          xWork[j] = xj - h;
          const fm = evaluate(xWork, fMinus);
          xWork[j] = xj;
          if (!fm) return false;
          for (let i = 0; i < m; i++) out[i + j * m] = (fv[i] - fm[i]) / h;
        }
      }
    }
    return true;
  };

  const fdJacobian = (xv: Float64Array, fv: Float64Array, out: Float64Array): boolean => fdJacobianMode(xv, fv, out, fdMode);

  /**
   * Difference quotient of column j at xv with step mult·h_j (h_j as in fdJacobianMode, the
   * step made exactly representable) into out[0..m): central when the residuals are finite on
   * both sides, else one-sided from fv (the residuals at xv) on the finite side. Returns the
   * kind used, or false when neither side is finite.
   */
  const differenceColumn = (xv: Float64Array, fv: Float64Array, j: number, mult: number, out: Float64Array): 'central' | 'one-sided' | false => {
    for (let k = 0; k < n; k++) xWork[k] = xv[k];
    const xj = xv[j];
    const typical = Math.abs(xj) > 0 ? Math.abs(xj) : Math.abs(start[j]) > 0 ? Math.abs(start[j]) * ZERO_PARAMETER_STEP_FRACTION : 1;
    const h = xj + mult * CENTRAL_STEP * Math.max(Math.abs(xj), typical) - xj;
    xWork[j] = xj + h;
    const fp = evaluate(xWork, fPlus);
    xWork[j] = xj - h;
    const fm = evaluate(xWork, fMinus);
    xWork[j] = xj;
    if (fp && fm) {
      for (let i = 0; i < m; i++) out[i] = (fp[i] - fm[i]) / (2 * h);
      return 'central';
    }
    if (fp) for (let i = 0; i < m; i++) out[i] = (fp[i] - fv[i]) / h;
    else if (fm) for (let i = 0; i < m; i++) out[i] = (fv[i] - fm[i]) / h;
    else return false;
    return 'one-sided';
  };

  /**
   * Compare the analytic Jacobian (in fjac, at xv) with central differences, fairly: the
   * reference is only as good as the differences themselves, so its own error is estimated
   * and allowed for.
   * - Central differences D(h), D(h/2), D(h/4) per column (h as in fdJacobianMode; the
   *   smaller steps matter where the model is stiff on the scale of h, e.g. near a pole or a
   *   wall, and cost only a factor 4 in rounding noise, ~ε^{2/3}·4 relative).
   * - Reference: R₁ = (4·D(h/4) − D(h/2))/3, the Richardson extrapolation of the two finest
   *   (truncation O(h⁴) instead of O(h²)).
   * - Error estimate E = ‖R₁ − R₂‖ with R₂ = (4·D(h/2) − D(h))/3: for a smooth model this is
   *   ≈ 15× the truncation error of R₁ (so it over-states it), and where rounding dominates
   *   (a flat direction, residuals at the float64 floor) R₁ and R₂ carry independent noise
   *   of R₁'s own size.
   * - Column j is flagged when ‖J_a − R₁‖ > JACOBIAN_CHECK_RTOL·max(‖J_a‖, ‖R₁‖) +
   *   JACOBIAN_CHECK_FD_ERROR_FACTOR·E. A wrong derivative differs from all the differences
   *   alike and is still caught.
   * - A column where no residual changes at all (to the last bit) under any of the steps
   *   cannot be checked: the direction is flat at float64 resolution (e.g. a parameter driven
   *   to a limit where the model no longer depends on it). It is returned in `unresolved`,
   *   not as a disagreement.
   * Fallbacks when residuals are not finite on one side of a step (a parameter at the edge
   *   of the model's domain): one-sided differences; Richardson is then not used, the
   *   reference is the finest difference and E = ‖D(h/2) − D(h/4)‖ (≈ its O(h) truncation
   *   error). When not even D(h/2) is available, the reference is D(h) with no error
   *   allowance; when no difference is finite the column is skipped.
   * Source: Richardson extrapolation of central differences and the step-halving error
   * estimate are textbook numerical analysis (e.g. Nocedal & Wright §8.1, from memory);
   * their use as a fair reference for this check is our own choice.
   */
  const compareWithFiniteDifferences = (xv: Float64Array, fv: Float64Array): { bad: { index: number; relDiff: number }[]; unresolved: number[] } => {
    const bad: { index: number; relDiff: number }[] = [];
    const unresolved: number[] = [];
    const d1 = new Float64Array(m); // D(h)
    const d2 = new Float64Array(m); // D(h/2)
    const d4 = new Float64Array(m); // D(h/4)
    const ref = new Float64Array(m);
    const diff = new Float64Array(m);
    const est = new Float64Array(m);
    for (let j = 0; j < n; j++) {
      const k1 = differenceColumn(xv, fv, j, 1, d1);
      if (!k1) continue;
      const k2 = differenceColumn(xv, fv, j, 0.5, d2);
      const k4 = k2 ? differenceColumn(xv, fv, j, 0.25, d4) : false;
      const richardson = k1 === 'central' && k2 === 'central' && k4 === 'central';
      let allZero = true;
      for (let i = 0; i < m; i++) {
        if (d1[i] !== 0 || (k2 && d2[i] !== 0) || (k4 && d4[i] !== 0)) allZero = false;
        let fine: number;
        let error: number;
        if (richardson) {
          const coarse = (4 * d2[i] - d1[i]) / 3;
          fine = (4 * d4[i] - d2[i]) / 3;
          error = fine - coarse;
        } else if (k4) {
          fine = d4[i];
          error = d2[i] - d4[i];
        } else if (k2) {
          fine = d2[i];
          error = d1[i] - d2[i];
        } else {
          fine = d1[i];
          error = 0;
        }
        ref[i] = fine;
        est[i] = error;
        diff[i] = fjac[i + j * m] - fine;
      }
      const normA = scaledNorm(fjac, j * m, m);
      if (allZero) {
        if (normA > 0) unresolved.push(j);
        continue;
      }
      const scale = Math.max(normA, scaledNorm(ref, 0, m));
      const d = scaledNorm(diff, 0, m);
      const tol = JACOBIAN_CHECK_RTOL * scale + JACOBIAN_CHECK_FD_ERROR_FACTOR * scaledNorm(est, 0, m);
      if (scale > 0 && d > tol) bad.push({ index: j, relDiff: d / scale });
    }
    return { bad, unresolved };
  };

  /**
   * Probe for descent at a point whose scaled gradient is not small. Direction: scaled
   * steepest descent d = −D⁻²Jᵀr; linear-model optimum t* = −rᵀJd/‖Jd‖², predicted
   * reduction P = (rᵀJd)²/‖Jd‖². The sums of squares at x ± α·t*·d for each α in
   * PROBE_FRACTIONS are judged by descentObserved: 'descent' if any shows the predicted
   * linear decrease, otherwise the gradient is rounding noise in the residuals ('noise').
   */
  const probeDescent = (xv: Float64Array, fv: Float64Array, fn: number, d: Float64Array): 'descent' | 'noise' => {
    const dir = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      let g = 0;
      for (let i = 0; i < m; i++) g += fjac[i + j * m] * fv[i];
      dir[j] = -g / (d[j] * d[j]);
    }
    const jd = new Float64Array(m);
    for (let j = 0; j < n; j++) for (let i = 0; i < m; i++) jd[i] += fjac[i + j * m] * dir[j];
    let c = 0;
    for (let i = 0; i < m; i++) c += fv[i] * jd[i];
    const jd2 = enorm(jd) ** 2;
    if (!(jd2 > 0) || !(c < 0)) return 'noise';
    const tStar = -c / jd2;
    const predicted = (c * c) / jd2;
    const rss0 = fn * fn;
    const phi = (t: number): number => {
      for (let j = 0; j < n; j++) xWork[j] = xv[j] + t * dir[j];
      const r = evaluate(xWork, fPlus);
      return r ? enorm(r) ** 2 : Number.NaN;
    };
    for (const alpha of PROBE_FRACTIONS) {
      const phiPlus = phi(alpha * tStar);
      const phiMinus = phi(-alpha * tStar);
      if (descentObserved(rss0, phiPlus, phiMinus, predicted, alpha)) return 'descent';
    }
    return 'noise';
  };

  /**
   * Jacobian at xv into fjac (column-major m×n): the analytic one when given (shape
   * checked), else finite differences (fdJacobian). Returns false on non-finite entries.
   */
  const jacobianAt = (xv: Float64Array, fv: Float64Array): boolean => {
    for (let j = 0; j < n; j++) xWork[j] = xv[j];
    if (analytic) {
      jacobianEvaluations++;
      const J = analytic(xWork.slice());
      if (!Array.isArray(J) || J.length !== m) fail('problem.jacobian', `must return ${m} rows`);
      for (let i = 0; i < m; i++) {
        const row = J[i];
        if (!row || row.length !== n) fail(`problem.jacobian`, `row ${i} must have ${n} entries`);
        for (let j = 0; j < n; j++) {
          const v = row[j];
          if (!Number.isFinite(v)) return false;
          fjac[i + j * m] = v;
        }
      }
      return true;
    }
    return fdJacobian(xv, fv, fjac);
  };

  const diag = new Float64Array(n);
  const acnorm = new Float64Array(n);
  const qtf = new Float64Array(n);
  const qtfFull = new Float64Array(m);
  const rmat = new Float64Array(n * n);
  const rdiag = new Float64Array(n);
  const step = new Float64Array(n);
  const wa3 = new Float64Array(n);
  const work: LmParWork = { wa1: new Float64Array(n), wa2: new Float64Array(n), sdiag: new Float64Array(n), wa: new Float64Array(n) };

  let fnorm = enorm(fvec, m);
  let par = 0;
  let iterations = 0;
  let delta = 0;
  let xnorm = 0;
  let status: NonlinearStatus | null = null;
  let message = '';
  let lastTrialNonFinite = false;
  let precisionLimited = false;
  const warnings: string[] = [];

  outer: for (let iter = 1; ; iter++) {
    if (!jacobianAt(x, fvec)) {
      status = 'failed:non-finite';
      message = 'The Jacobian is not finite at the current parameters.';
      break;
    }
    // Column norms and pivoted QR of J.
    for (let j = 0; j < n; j++) acnorm[j] = scaledNorm(fjac, j * m, m);
    if (iter === 1 && acnorm.every((v) => v === 0)) {
      status = 'failed:singular';
      message = 'The Jacobian is zero at the start: the residuals do not depend on any parameter there.';
      break;
    }
    const qr = pivotedQR(fjac, m, n, { rankTolerance: 0 });
    for (let j = 0; j < n; j++) {
      rdiag[j] = qr.rdiag[j];
      for (let i = 0; i < n; i++) rmat[i + j * n] = i < j ? fjac[i + j * m] : 0;
    }
    qtfFull.set(fvec);
    applyQt(qr, qtfFull);
    for (let j = 0; j < n; j++) qtf[j] = qtfFull[j];
    const perm = qr.perm;

    if (iter === 1) {
      for (let j = 0; j < n; j++) diag[j] = acnorm[j] === 0 ? 1 : acnorm[j];
      for (let j = 0; j < n; j++) wa3[j] = diag[j] * x[j];
      xnorm = enorm(wa3, n);
      delta = factor * xnorm;
      if (delta === 0) delta = factor;
    }
    // Scaled gradient (cosine) test.
    let gnorm = 0;
    if (fnorm !== 0) {
      for (let j = 0; j < n; j++) {
        const l = perm[j];
        if (acnorm[l] === 0) continue;
        let sum = 0;
        for (let i = 0; i < j; i++) sum += rmat[i + j * n] * (qtf[i] / fnorm);
        sum += rdiag[j] * (qtf[j] / fnorm);
        gnorm = Math.max(gnorm, Math.abs(sum / acnorm[l]));
      }
    }
    if (gnorm <= gtol) {
      status = 'converged:gtol';
      message = `Scaled gradient ${gnorm.toExponential(2)} ≤ gtol ${gtol}.`;
      break;
    }
    for (let j = 0; j < n; j++) diag[j] = Math.max(diag[j], acnorm[j]);

    // Inner loop: trial steps until one is accepted.
    for (;;) {
      par = lmParameter(n, rmat, rdiag, perm, diag, qtf, delta, par, step, work);
      for (let j = 0; j < n; j++) {
        step[j] = -step[j];
        xTrial[j] = x[j] + step[j];
        wa3[j] = diag[j] * step[j];
      }
      const pnorm = enorm(wa3, n);
      if (iter === 1) delta = Math.min(delta, pnorm);
      const ft = evaluate(xTrial, wa4);
      lastTrialNonFinite = ft === false;
      const fnorm1 = ft === false ? Infinity : enorm(wa4, m);
      let actred = -1;
      if (0.1 * fnorm1 < fnorm) actred = 1 - (fnorm1 / fnorm) * (fnorm1 / fnorm);
      // Predicted reduction from the linear model: ‖J·s‖² / ‖r‖² + 2λ‖D·s‖²/‖r‖².
      for (let j = 0; j < n; j++) {
        wa3[j] = 0;
        const t = step[perm[j]];
        for (let i = 0; i < j; i++) wa3[i] += rmat[i + j * n] * t;
        wa3[j] += rdiag[j] * t;
      }
      const temp1 = enorm(wa3, n) / fnorm;
      const temp2 = (Math.sqrt(par) * pnorm) / fnorm;
      const prered = temp1 * temp1 + (temp2 * temp2) / 0.5;
      const dirder = -(temp1 * temp1 + temp2 * temp2);
      const ratio = prered !== 0 ? actred / prered : 0;
      // Radius update as in MINPACK lmder (Moré 1978): the factors 0.1 and 0.5 below are
      // MINPACK's own constants.
      if (ratio <= SHRINK_RATIO) {
        let t = actred >= 0 ? 0.5 : (0.5 * dirder) / (dirder + 0.5 * actred);
        if (0.1 * fnorm1 >= fnorm || t < 0.1 || !Number.isFinite(t)) t = 0.1;
        delta = t * Math.min(delta, pnorm / 0.1);
        par /= t;
      } else if (par === 0 || ratio >= EXPAND_RATIO) {
        delta = pnorm / 0.5;
        par *= 0.5;
      }
      if (ratio >= ACCEPT_RATIO) {
        for (let j = 0; j < n; j++) {
          x[j] = xTrial[j];
          wa3[j] = diag[j] * x[j];
        }
        fvec.set(wa4);
        xnorm = enorm(wa3, n);
        fnorm = fnorm1;
        iterations++;
      }
      // Convergence tests.
      const ftolHit = Math.abs(actred) <= ftol && prered <= ftol && 0.5 * ratio <= 1;
      const xtolHit = delta <= xtol * xnorm;
      if (ftolHit) {
        status = 'converged:ftol';
        message = `Relative reduction of the sum of squares ≤ ftol ${ftol}.`;
        break outer;
      }
      if (xtolHit) {
        status = lastTrialNonFinite ? 'failed:non-finite' : 'converged:xtol';
        message = lastTrialNonFinite
          ? 'Residuals were not finite near the current parameters and the step could not be shrunk further.'
          : `Relative step size ≤ xtol ${xtol}.`;
        break outer;
      }
      if (evaluations >= maxEvaluations) {
        status = 'failed:max-evaluations';
        message = `Stopped after ${evaluations} residual evaluations (maxEvaluations ${maxEvaluations}) without meeting a tolerance.`;
        break outer;
      }
      if (Math.abs(actred) <= EPSILON && prered <= EPSILON && 0.5 * ratio <= 1) {
        status = 'converged:ftol';
        precisionLimited = true;
        message = 'No further reduction of the sum of squares is possible in float64 (ftol reached at machine precision).';
        break outer;
      }
      if (delta <= EPSILON * xnorm) {
        status = lastTrialNonFinite ? 'failed:non-finite' : 'converged:xtol';
        precisionLimited = !lastTrialNonFinite;
        message = lastTrialNonFinite
          ? 'Residuals were not finite near the current parameters and the step could not be shrunk further.'
          : 'No further change of the parameters is possible in float64 (xtol reached at machine precision).';
        break outer;
      }
      if (gnorm <= EPSILON) {
        status = 'converged:gtol';
        precisionLimited = true;
        message = 'The scaled gradient is at machine precision.';
        break outer;
      }
      if (ratio >= ACCEPT_RATIO) break;
    }
  }
  if (status === null) throw new Error('unreachable: LM loop ended without a status');
  if (precisionLimited) warnings.push('Stopped at the limit of float64 precision rather than at the requested tolerance.');

  // Final Jacobian at the returned point: honesty checks and covariance.
  const xFinal = Array.from(x);
  const jacOk = jacobianAt(x, fvec);
  const rss = fnorm * fnorm;
  const dof = m - n;
  const s2 = dof > 0 ? rss / dof : 0;
  const covariance: number[][] = [];
  for (let i = 0; i < n; i++) covariance.push(new Array<number>(n).fill(0));
  const aliased = new Array<boolean>(n).fill(false);
  let rank = n;
  let gradientCosine = 1;
  let converged = status.startsWith('converged');
  if (jacOk) {
    gradientCosine = 0;
    for (let j = 0; j < n; j++) {
      const cn = scaledNorm(fjac, j * m, m);
      acnorm[j] = cn;
      if (cn === 0 || fnorm === 0) continue;
      let dot = 0;
      for (let i = 0; i < m; i++) dot += fjac[i + j * m] * fvec[i];
      gradientCosine = Math.max(gradientCosine, Math.abs(dot) / (cn * fnorm));
    }
    // 1. Analytic Jacobian against central differences (a wrong derivative silently
    //    corrupts the covariance and can stall the iteration).
    if (analytic && (options.checkJacobian ?? true)) {
      const { bad, unresolved } = compareWithFiniteDifferences(x, fvec);
      if (unresolved.length > 0) {
        const list = unresolved.map((j) => `p[${j}]`).join(', ');
        warnings.push(
          `The analytic derivative for ${list} could not be checked: the residuals do not change at float64 resolution under finite-difference steps (a flat direction: the parameter has (almost) no effect at the solution).`,
        );
      }
      if (bad.length > 0) {
        const list = bad.map((b) => `p[${b.index}] (relative difference ${b.relDiff.toExponential(1)})`).join(', ');
        warnings.push(`The analytic Jacobian disagrees with central finite differences for ${list}.`);
        if (converged) {
          converged = false;
          status = 'failed:bad-jacobian';
          message = `The analytic Jacobian disagrees with central finite differences for ${list}; the solution and its covariance cannot be trusted.`;
        }
      }
    }
    // 2. Stationarity: a not-small scaled gradient is tested by probing the sum of squares
    //    along the scaled steepest-descent direction (see probeDescent).
    const cosLimit = Math.max(gtol, STATIONARY_COSINE, 10 * Math.sqrt(Math.max(ftol, xtol)));
    if (converged && gradientCosine > cosLimit) {
      const probe = probeDescent(x, fvec, fnorm, diag);
      if (probe === 'descent') {
        converged = false;
        status = 'failed:not-stationary';
        message = `The steps stalled (${message}) but the sum of squares still decreases along the gradient at the returned point (scaled gradient ${gradientCosine.toExponential(2)}): it is not a minimum.`;
      } else {
        warnings.push(
          `The scaled gradient at the solution (${gradientCosine.toExponential(2)}) is at the rounding-noise level of the residuals: no further decrease of the cost could be found, so the fit is as close as the model evaluation and float64 parameters allow; when the residuals are tiny, the RSS and standard errors may carry fewer significant digits.`,
        );
      }
    }
    // 3. Covariance: power-of-two column scaling, pivoted QR. Rank tolerance: max(m, n)·ε
    //    for an analytic Jacobian; for finite differences 10× their relative error
    //    (ε^{2/3} central, ε^{1/2} forward), below which a column's independence from the
    //    others is within the differencing noise.
    const scale = new Float64Array(n);
    for (let j = 0; j < n; j++) {
      scale[j] = acnorm[j] > 0 ? Math.pow(2, -Math.round(Math.log2(acnorm[j]))) : 1;
      for (let i = 0; i < m; i++) fjac[i + j * m] *= scale[j];
    }
    const rankTolerance = analytic
      ? Math.max(m, n) * EPSILON
      : FD_RANK_FACTOR * (fdMode === 'central' ? CENTRAL_STEP * CENTRAL_STEP : FORWARD_STEP);
    const qr = pivotedQR(fjac, m, n, { rankTolerance });
    rank = qr.rank;
    const gram = inverseGram(qr);
    const k = sigmaMode === 'relative' ? s2 : 1;
    for (let a = 0; a < rank; a++) {
      for (let b = 0; b < rank; b++) {
        const i = qr.perm[a];
        const j = qr.perm[b];
        covariance[i][j] = k * scale[i] * scale[j] * gram[a * rank + b];
      }
    }
    for (let a = rank; a < n; a++) aliased[qr.perm[a]] = true;
  } else {
    warnings.push('The Jacobian could not be evaluated (non-finite) at the returned parameters; no covariance is available.');
    for (let j = 0; j < n; j++) aliased[j] = true;
    if (converged) {
      converged = false;
      status = 'failed:non-finite';
      message = 'The Jacobian is not finite at the returned parameters.';
    }
  }
  if (converged && rank < n) {
    status = 'failed:singular';
    const names = aliased.map((v, j) => (v ? `p[${j}]` : '')).filter(Boolean).join(', ');
    message = `The Jacobian at the solution is rank-deficient (rank ${rank} < ${n}): ${names} cannot be determined from these data.`;
    converged = false;
  }
  if (rank < n) {
    warnings.push('Covariance rows of parameters that are not identifiable are set to 0 (their standard errors are undefined).');
  }
  if (dof === 0) warnings.push('No degrees of freedom left (n = p): s and standard errors cannot be estimated and are reported as 0.');
  if (!converged) warnings.push(`Not converged: ${message}`);

  const standardErrors = covariance.map((row, j) => Math.sqrt(Math.max(0, row[j])));
  const covFinite = covariance.every((row) => row.every(Number.isFinite));
  if (!covFinite) {
    for (const row of covariance) row.fill(0);
    standardErrors.fill(0);
    warnings.push('The covariance overflowed (Jacobian nearly singular); standard errors are not available.');
    if (converged) {
      converged = false;
      status = 'failed:singular';
      message = 'The covariance matrix is not finite: the Jacobian is nearly singular at the solution.';
    }
  }
  return {
    parameters: xFinal,
    covariance,
    standardErrors,
    residuals: Array.from(fvec),
    rss,
    residualStandardDeviation: Math.sqrt(s2),
    degreesOfFreedom: dof,
    converged,
    status,
    message,
    iterations,
    evaluations,
    jacobianEvaluations,
    gradientCosine: Number.isFinite(gradientCosine) ? gradientCosine : 1,
    aliased,
    covarianceScaling: sigmaMode === 'relative' ? 'residual-variance' : 'known-sigma',
    warnings,
  };
}
