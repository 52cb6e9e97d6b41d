/**
 * Statistics helpers of the kinetics fits: parameter objects with confidence intervals,
 * information criteria.
 */
import normalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import { studentTQuantile } from '../numerics/index.js';
import type { FitStatistics, FittedParameter } from './types.js';

/** Two-sided 95 % interval: upper-tail probability 0.975 (common practice). */
const P_UPPER_95 = 0.975;

function finitePair(lo: number, hi: number): [number, number] | null {
  return Number.isFinite(lo) && Number.isFinite(hi) ? [lo, hi] : null;
}

/**
 * t_{0.975, dof}; dof = Infinity gives the normal quantile z_{0.975} ≈ 1.95996 (known-σ case).
 * Source: Student-t quantile via numerics (stdlib-js); normal quantile from
 * @stdlib/stats-base-dists-normal-quantile.
 */
export function tQuantile95(dof: number): number {
  let t = T95_CACHE.get(dof);
  if (t === undefined) {
    // dof = ∞ (known σ): the standard normal quantile (stdlib's t quantile is not finite there).
    t = dof === Infinity ? normalQuantile(P_UPPER_95, 0, 1) : studentTQuantile(P_UPPER_95, dof);
    if (T95_CACHE.size > 1000) T95_CACHE.clear();
    T95_CACHE.set(dof, t);
  }
  return t;
}
/** Memo of t_{0.975, dof} (pure function of dof; bounded size). */
const T95_CACHE = new Map<number, number>();

/** Parameter with symmetric interval value ± t·SE (linear, or linearised, estimate). */
export function symmetricParameter(value: number, se: number | null, dof: number, unit: string, note?: string): FittedParameter {
  const out: FittedParameter = { value, standardError: null, ci95: null, unit };
  if (note) out.note = note;
  if (se !== null && Number.isFinite(se) && se >= 0 && dof > 0) {
    out.standardError = se;
    const t = tQuantile95(dof);
    out.ci95 = [value - t * se, value + t * se];
  }
  return out;
}

/**
 * Positive parameter estimated through its logarithm θ = ln v with SE(θ):
 * value e^θ, standard error e^θ·SE(θ) (delta method), and the ASYMMETRIC interval
 * [e^{θ − t·SE}, e^{θ + t·SE}] (the interval on θ mapped through exp; it stays positive).
 * Source: delta method / transformation of a confidence interval (common practice).
 */
export function logParameter(lnValue: number, seLn: number | null, dof: number, unit: string, note?: string): FittedParameter {
  const value = Math.exp(lnValue);
  const out: FittedParameter = { value, standardError: null, ci95: null, unit };
  if (note) out.note = note;
  if (seLn !== null && Number.isFinite(seLn) && seLn >= 0 && dof > 0) {
    const t = tQuantile95(dof);
    const se = value * seLn;
    out.standardError = Number.isFinite(se) ? se : null;
    out.ci95 = finitePair(Math.exp(lnValue - t * seLn), Math.exp(lnValue + t * seLn));
  }
  return out;
}

/** A user-fixed parameter: SE 0 and a degenerate interval. */
export function fixedParameter(value: number, unit: string, note = 'fixed by the user, not fitted'): FittedParameter {
  return { value, standardError: 0, ci95: [value, value], unit, fixed: true, note };
}

/** Largest lower floor on RSS used in the log-likelihood, relative to the data scale (avoids ln 0 for exact data). */
const RSS_FLOOR_RELATIVE = Number.EPSILON;

/**
 * Gaussian information criteria for least-squares fits with unknown common σ, using the
 * maximum-likelihood σ̂² = RSS/n:
 *   −2 ln L = n·[ln(2π·RSS/n) + 1],  AIC = −2 ln L + 2k,  BIC = −2 ln L + k·ln n,
 * with k = (free model parameters) + 1 (σ). The same definition is used for every model so
 * that AIC/BIC differences over the SAME points are comparable (additive constants cancel).
 * Source: H. Akaike, IEEE Trans. Autom. Control 19 (1974) 716–723; G. Schwarz, Ann. Stat. 6
 * (1978) 461–464 (journal details from memory); least-squares form e.g. Burnham & Anderson,
 * Model Selection and Multimodel Inference, 2nd ed. (2002), §2.2 (from memory).
 * `dataScale` [V] sets a floor on RSS (exact data would give ln 0).
 */
export function informationCriteria(rss: number, n: number, freeParameters: number, dataScale: number): { aic: number; bic: number } {
  const floor = n * (RSS_FLOOR_RELATIVE * Math.max(dataScale, Number.MIN_VALUE)) ** 2;
  const rssUsed = Math.max(rss, floor, Number.MIN_VALUE);
  const k = freeParameters + 1;
  const m2lnL = n * (Math.log((2 * Math.PI * rssUsed) / n) + 1);
  return { aic: m2lnL + 2 * k, bic: m2lnL + k * Math.log(n) };
}

/** Assemble FitStatistics for residuals in η. */
export function fitStatistics(residuals: number[], observed: number[], freeParameters: number): FitStatistics {
  const n = residuals.length;
  let rss = 0;
  let mean = 0;
  let scale = 0;
  for (let i = 0; i < n; i++) {
    rss += residuals[i] * residuals[i];
    mean += observed[i];
    scale = Math.max(scale, Math.abs(observed[i]));
  }
  mean /= n;
  let tss = 0;
  for (let i = 0; i < n; i++) tss += (observed[i] - mean) ** 2;
  const dof = n - freeParameters;
  const { aic, bic } = informationCriteria(rss, n, freeParameters, scale);
  return {
    points: n,
    degreesOfFreedom: dof,
    rSquared: tss > 0 ? 1 - rss / tss : rss === 0 ? 1 : 0,
    residualStandardDeviation: dof > 0 ? Math.sqrt(rss / dof) : 0,
    rss,
    aic,
    bic,
    parameters: freeParameters,
  };
}
