/**
 * One-dimensional solvers for the plant layer (float64 only): a bracketed minimiser and a
 * bracketed root finder. Both return result objects with a status; neither returns a guess
 * when it fails.
 */

export interface Minimum1D {
  x: number;
  fx: number;
  iterations: number;
  evaluations: number;
  status: 'converged' | 'failed:max-iterations' | 'failed:non-finite';
  message: string;
}

/** (3 − √5)/2 ≈ 0.381 966: the golden-section step fraction. */
const GOLDEN_STEP = (3 - Math.sqrt(5)) / 2;

/**
 * Minimise f on [lo, hi] by Brent's method: golden-section steps safeguarding successive
 * parabolic interpolation. Converges to a local minimum in the bracket (the global one when f
 * is unimodal there); superlinear near a smooth minimum.
 * Tolerance: stops when the bracket around x is below 2·(rtol·|x| + atol).
 * Source: R. P. Brent, Algorithms for Minimization without Derivatives (Prentice-Hall 1973),
 * ch. 5 (the method; this code is our own).
 */
export function minimizeBracketed(
  f: (x: number) => number,
  lo: number,
  hi: number,
  options: { rtol?: number; atol?: number; maxIterations?: number } = {},
): Minimum1D {
  // Default tolerances and iteration cap: project choices. (Near a smooth minimum f is flat, so
  // x is fixed only to about √ε relative whatever rtol asks — Brent 1973 ch. 5, from memory.)
  const rtol = options.rtol ?? 1e-10;
  const atol = options.atol ?? 1e-14;
  const maxIterations = options.maxIterations ?? 200;
  let a = Math.min(lo, hi);
  let b = Math.max(lo, hi);
  let x = a + GOLDEN_STEP * (b - a);
  let w = x;
  let v = x;
  let fx = f(x);
  let evaluations = 1;
  if (!Number.isFinite(fx)) {
    return { x, fx, iterations: 0, evaluations, status: 'failed:non-finite', message: `objective not finite at ${x}` };
  }
  let fw = fx;
  let fv = fx;
  let step = 0; // last step taken
  let stepBefore = 0; // the step before that
  for (let iteration = 1; iteration <= maxIterations; iteration++) {
    const mid = 0.5 * (a + b);
    const tol1 = rtol * Math.abs(x) + atol;
    const tol2 = 2 * tol1;
    if (Math.abs(x - mid) <= tol2 - 0.5 * (b - a)) {
      return { x, fx, iterations: iteration - 1, evaluations, status: 'converged', message: 'bracket below tolerance' };
    }
    let golden = true;
    if (Math.abs(stepBefore) > tol1) {
      // Parabola through (x, fx), (w, fw), (v, fv); its vertex is x + p/q.
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      const older = stepBefore;
      stepBefore = step;
      if (Math.abs(p) < Math.abs(0.5 * q * older) && p > q * (a - x) && p < q * (b - x)) {
        step = p / q;
        const u = x + step;
        if (u - a < tol2 || b - u < tol2) step = x < mid ? tol1 : -tol1;
        golden = false;
      }
    }
    if (golden) {
      stepBefore = (x < mid ? b : a) - x;
      step = GOLDEN_STEP * stepBefore;
    }
    const u = Math.abs(step) >= tol1 ? x + step : x + (step > 0 ? tol1 : -tol1);
    const fu = f(u);
    evaluations++;
    if (!Number.isFinite(fu)) {
      return { x, fx, iterations: iteration, evaluations, status: 'failed:non-finite', message: `objective not finite at ${u}` };
    }
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, fx, iterations: maxIterations, evaluations, status: 'failed:max-iterations', message: `no convergence in ${maxIterations} iterations` };
}

export interface Root1D {
  x: number;
  fx: number;
  iterations: number;
  status: 'converged' | 'failed:max-iterations' | 'failed:no-bracket' | 'failed:non-finite';
  message: string;
}

/**
 * Root of g on [lo, hi] with g(lo)·g(hi) ≤ 0: regula falsi with the Illinois modification,
 * falling back to bisection whenever the bracket does not at least halve in two steps.
 * Stops when the bracket is below rtol·|x| + atol or g = 0 exactly.
 * Source: Dowell & Jarratt, BIT 11 (1971) 168–174 (Illinois method); bisection safeguard is
 * common practice (the "halve in two steps" rule is our choice).
 */
export function findRootBracketed(
  g: (x: number) => number,
  lo: number,
  hi: number,
  options: { rtol?: number; atol?: number; maxIterations?: number } = {},
): Root1D {
  // Default tolerances and iteration cap: project choices.
  const rtol = options.rtol ?? 1e-13;
  const atol = options.atol ?? 0;
  const maxIterations = options.maxIterations ?? 200;
  let a = lo;
  let b = hi;
  let ga = g(a);
  let gb = g(b);
  if (!Number.isFinite(ga) || !Number.isFinite(gb)) {
    return { x: NaN, fx: NaN, iterations: 0, status: 'failed:non-finite', message: 'function not finite at the bracket ends' };
  }
  if (ga === 0) return { x: a, fx: 0, iterations: 0, status: 'converged', message: 'root at lower end' };
  if (gb === 0) return { x: b, fx: 0, iterations: 0, status: 'converged', message: 'root at upper end' };
  if (Math.sign(ga) === Math.sign(gb)) {
    return { x: NaN, fx: NaN, iterations: 0, status: 'failed:no-bracket', message: 'function has the same sign at both ends' };
  }
  let side = 0; // which end was kept last time (−1 a, +1 b), for the Illinois halving
  let widthTwoStepsAgo = Math.abs(b - a);
  let widthOneStepAgo = widthTwoStepsAgo;
  for (let iteration = 1; iteration <= maxIterations; iteration++) {
    const width = Math.abs(b - a);
    let c = (a * gb - b * ga) / (gb - ga);
    const useBisection = !(c > Math.min(a, b) && c < Math.max(a, b)) || width > 0.5 * widthTwoStepsAgo;
    if (useBisection) c = 0.5 * (a + b);
    const gc = g(c);
    if (!Number.isFinite(gc)) {
      return { x: c, fx: gc, iterations: iteration, status: 'failed:non-finite', message: `function not finite at ${c}` };
    }
    widthTwoStepsAgo = widthOneStepAgo;
    widthOneStepAgo = width;
    if (gc === 0) return { x: c, fx: 0, iterations: iteration, status: 'converged', message: 'exact root' };
    if (Math.sign(gc) === Math.sign(gb)) {
      b = c;
      gb = gc;
      if (side === -1 && !useBisection) ga *= 0.5;
      side = -1;
    } else {
      a = c;
      ga = gc;
      if (side === 1 && !useBisection) gb *= 0.5;
      side = 1;
    }
    const x = Math.abs(ga) < Math.abs(gb) ? a : b;
    if (Math.abs(b - a) <= rtol * Math.abs(x) + atol) {
      return { x, fx: g(x), iterations: iteration, status: 'converged', message: 'bracket below tolerance' };
    }
  }
  const x = Math.abs(ga) < Math.abs(gb) ? a : b;
  return { x, fx: g(x), iterations: maxIterations, status: 'failed:max-iterations', message: `no convergence in ${maxIterations} iterations` };
}
