/**
 * Butler–Volmer kernel in log space (trusting: callers validate their inputs).
 *
 * Closed form with limiting currents (domain.md §3; the "common closed form" that adds the
 * kinetic and the mass-transport resistances of each branch in series):
 *
 *   j = [exp(α_a f η) − exp(−α_c f η)] / [1/j0 + exp(α_a f η)/j_lim,a + exp(−α_c f η)/|j_lim,c|]
 *
 * with f = F/(RT). Multiplying through by j0 and writing u = ln j0 + α_a f η,
 * v = ln j0 − α_c f η, one gets for η > 0 (anodic branch, j > 0):
 *
 *   ln j = u + ln(1 − e^{−(α_a+α_c) f η}) − LSE(0, u − ln j_lim,a, v − ln |j_lim,c|)
 *
 * where LSE is log-sum-exp; the cathodic branch (η < 0) is the mirror image with the roles of
 * (α_a, j_lim,a) and (α_c, j_lim,c) swapped and η → −η. In this form nothing overflows for any
 * finite η, the term 1 − e^{−x} is taken with expm1 (no cancellation at small η) and the ratio
 * is evaluated as a difference of logs.
 *
 * The function ln j(η) on η > 0 is a sum of concave functions (linear, ln(1 − e^{−x}), and the
 * negative of a log-sum-exp of affine terms), hence concave and strictly increasing. Newton's
 * method on g(η) = ln j(η) − ln j_target therefore never overshoots from the left of the root and
 * lands on the left after one step from the right: convergence is monotone. A bracket and a
 * bisection fallback guard against the first step leaving η > 0.
 *
 * Source: closed form from domain.md §3 (common practice); log-space reformulation and the
 * concavity argument are our own derivation.
 */

/** Slopes and log-limits of one branch, in "forward"/"backward" roles. */
export interface BranchKernel {
  /** ln j0 (j0 in A/m²). */
  lnJ0: number;
  /** α_forward·f [1/V]: anodic coefficient times F/RT on the anodic branch. */
  forwardSlope: number;
  /** α_backward·f [1/V]. */
  backwardSlope: number;
  /** ln of the forward limiting current density (A/m²); +Infinity when absent. */
  lnForwardLimit: number;
  /** ln of the backward limiting current density magnitude (A/m²); +Infinity when absent. */
  lnBackwardLimit: number;
}

/** Value and derivatives of ln|j| on one branch at a positive branch overpotential x = |η|. */
export interface BranchEval {
  lnCurrent: number;
  /**
   * ln|j| − ln j_lim,fwd formed without cancellation (exactly the small tail when the forward
   * limit dominates); equals lnCurrent when there is no forward limit.
   */
  lnCurrentOverLimit: number;
  /** ∂ ln|j| / ∂x [1/V]; strictly positive. */
  dLnCurrentDx: number;
  /** Soft-max weight of the kinetic term, ∂ ln|j|/∂ ln j0 = p0 = 1 − p1 − p2 (formed without cancellation). */
  pZero: number;
  /** Soft-max weight of the forward limiting term, ∂ ln|j|/∂ ln j_lim,fwd = p1. */
  pForward: number;
  /** Soft-max weight of the backward limiting term, ∂ ln|j|/∂ ln j_lim,back = p2. */
  pBackward: number;
  /** x / expm1((α_f+α_b) f x): helper for ∂/∂slope. */
  xOverExpm1: number;
  /** Magnitude of the terms summed into lnCurrentOverLimit (sets the rounding floor). */
  scale: number;
}

/** ln|j| on a branch at x = |η| > 0 with its derivatives (see the file header). */
export function branchEval(k: BranchKernel, x: number, out: BranchEval): BranchEval {
  const s = k.forwardSlope + k.backwardSlope;
  const sx = s * x;
  const u = k.lnJ0 + k.forwardSlope * x;
  const t1 = u - k.lnForwardLimit; // −Infinity when no limit
  const t2 = k.lnJ0 - k.backwardSlope * x - k.lnBackwardLimit;
  // LSE(0, t1, t2) = m + ln(1 + rest), with the largest term factored out exactly, so that
  // u − LSE is formed without cancelling large numbers (u − m is known in closed form).
  let uMinusM: number;
  let e0: number;
  let e1: number;
  let e2: number;
  let rest: number;
  if (t1 >= t2 && t1 > 0) {
    uMinusM = k.lnForwardLimit;
    e0 = Math.exp(-t1);
    e1 = 1;
    e2 = Math.exp(t2 - t1);
    rest = e0 + e2;
  } else if (t2 > 0) {
    uMinusM = sx + k.lnBackwardLimit;
    e0 = Math.exp(-t2);
    e1 = Math.exp(t1 - t2);
    e2 = 1;
    rest = e0 + e1;
  } else {
    uMinusM = u;
    e0 = 1;
    e1 = Math.exp(t1);
    e2 = Math.exp(t2);
    rest = e1 + e2;
  }
  const sum = 1 + rest;
  const em1 = Math.expm1(sx);
  const tail = Math.log(-Math.expm1(-sx)) - Math.log1p(rest);
  out.lnCurrent = uMinusM + tail;
  if (k.lnForwardLimit === Infinity) out.lnCurrentOverLimit = out.lnCurrent;
  else out.lnCurrentOverLimit = (uMinusM === k.lnForwardLimit ? 0 : uMinusM - k.lnForwardLimit) + tail;
  out.scale = Math.abs(uMinusM - (k.lnForwardLimit === Infinity ? 0 : k.lnForwardLimit)) + Math.abs(tail);
  out.pZero = e0 / sum;
  out.pForward = e1 / sum;
  out.pBackward = e2 / sum;
  // s/expm1(s x) → 1/x at small x; at large x it vanishes.
  out.xOverExpm1 = em1 === Infinity ? 0 : x / em1;
  const sOverEm1 = em1 === Infinity ? 0 : s / em1;
  // 1 − p1 formed without cancellation when the forward-limit term dominates.
  const oneMinusPForward = e1 === 1 ? rest / sum : (e0 + e2) / sum;
  out.dLnCurrentDx = k.forwardSlope * oneMinusPForward + sOverEm1 + out.pBackward * k.backwardSlope;
  return out;
}

/** Maximum Newton iterations; monotone convergence needs far fewer (typically 3–8). A generous cap: project choice. */
const MAX_NEWTON_ITERATIONS = 200;
/**
 * Relative Newton step below which the iteration stops after taking that step. Newton on
 * the concave ln|j|(x) converges quadratically, e_{k+1} ≈ (|g''|/2g')·e_k²; with
 * |g''|/g' ≲ 1/x (low field) to ≈ α f (near a limiting current, α f x ≲ 100 in practice)
 * a step of 1e-9·x leaves a relative error ≲ 1e-16. Our own analysis.
 */
const NEWTON_RELATIVE_STEP = 1e-9;
/** Residual treated as zero: a few units of double rounding relative to the terms summed. */
const LN_ROUNDING_FLOOR = 4 * Number.EPSILON;

/**
 * Solve |j|(x) = target for x = |η| > 0 on one branch by safeguarded Newton on ln|j|.
 * The target is given as `lnTarget` = ln|j| and, when the branch has a forward limiting
 * current, as `lnTargetOverLimit` = ln(|j|/j_lim) computed by the caller without
 * cancellation (e.g. log1p(−(j_lim − |j|)/j_lim)); pass lnTarget again when there is no
 * limit. The residual is formed relative to the limit so that targets within a few ulp of
 * j_lim still have a well-defined root. `guess` (> 0) is an optional warm start (NaN = none).
 * Returns x [V] (`ev` holds the evaluation at the last iterate, within a relative 1e-9 of x,
 * good for derivatives; callers needing ln|j| at x re-evaluate), or NaN if the iteration fails, which the
 * concavity argument excludes (callers still check). Requires lnTargetOverLimit < 0 when a
 * forward limit exists.
 */
export function solveBranch(
  k: BranchKernel,
  lnTarget: number,
  lnTargetOverLimit: number,
  guess: number,
  ev: BranchEval,
): number {
  const limited = k.lnForwardLimit !== Infinity;
  const target = limited ? lnTargetOverLimit : lnTarget;
  let x = guess;
  if (!(x > 0) || !Number.isFinite(x)) {
    // Kinetic current estimate with the forward limit removed (series resistances), then
    // ln(1 + j_k/j0)/α f: right of the root at low field, near it in the Tafel region.
    let lnKin = lnTarget;
    if (limited) lnKin = lnTarget - Math.log(-Math.expm1(lnTargetOverLimit));
    const z = lnKin - k.lnJ0;
    // Above z = 30, ln(1 + e^z) = z to within e^−30 ≈ 1e-13 (negligible for a start value).
    x = (z > 30 ? z : Math.log1p(Math.exp(z))) / k.forwardSlope;
    // Fallback start: a tiny positive |η| [V]; the bracket logic then walks up (project choice).
    if (!(x > 0) || !Number.isFinite(x)) x = 1e-300;
  }
  let lo = 0;
  let hi = Infinity;
  for (let it = 0; it < MAX_NEWTON_ITERATIONS; it++) {
    branchEval(k, x, ev);
    const g = ev.lnCurrentOverLimit - target;
    // At the rounding floor of the residual no step can improve j(x).
    if (Math.abs(g) <= LN_ROUNDING_FLOOR * (ev.scale + Math.abs(target))) return x;
    if (g > 0) hi = x;
    else lo = x;
    const step = g / ev.dLnCurrentDx;
    let next = x - step;
    const small = Math.abs(step) <= NEWTON_RELATIVE_STEP * x;
    if (!(next > lo && next < hi)) {
      // A converged step may touch the bracket by rounding: accept it rather than bisect.
      if (small) return x;
      next = hi === Infinity ? 2 * x : 0.5 * (lo + hi);
    }
    if (small || (hi !== Infinity && hi - lo <= 4 * Number.EPSILON * hi)) {
      // `ev` keeps the derivatives at x, which differ from those at `next` by O(step).
      return next;
    }
    x = next;
  }
  return NaN;
}

/** Build the two branch kernels from BV parameters in SI and f = F/RT. */
export function makeKernels(
  lnJ0: number,
  anodicSlope: number,
  cathodicSlope: number,
  lnAnodicLimit: number,
  lnCathodicLimit: number,
): { anodic: BranchKernel; cathodic: BranchKernel } {
  return {
    anodic: {
      lnJ0,
      forwardSlope: anodicSlope,
      backwardSlope: cathodicSlope,
      lnForwardLimit: lnAnodicLimit,
      lnBackwardLimit: lnCathodicLimit,
    },
    cathodic: {
      lnJ0,
      forwardSlope: cathodicSlope,
      backwardSlope: anodicSlope,
      lnForwardLimit: lnCathodicLimit,
      lnBackwardLimit: lnAnodicLimit,
    },
  };
}

export function newBranchEval(): BranchEval {
  return { lnCurrent: 0, lnCurrentOverLimit: 0, pZero: 0, dLnCurrentDx: 0, pForward: 0, pBackward: 0, xOverExpm1: 0, scale: 0 };
}

/**
 * ln(m/L) for 0 < m < L without cancellation at either end: log(m) − log(L) when m is well
 * below L, log1p(−(L − m)/L) when m is close to L (L − m is then exact by Sterbenz).
 */
export function lnRatioToLimit(magnitude: number, limit: number): number {
  return magnitude < 0.5 * limit ? Math.log(magnitude) - Math.log(limit) : Math.log1p(-(limit - magnitude) / limit);
}
