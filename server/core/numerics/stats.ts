/**
 * Small statistics helpers for fitted parameters: Student-t quantiles, 95 % confidence
 * intervals and correlation matrices.
 *
 * Units: a confidence interval has the units of the parameter; quantiles and
 * correlations are dimensionless.
 * Sources: Student-t quantile from @stdlib/stats-base-dists-t-quantile (stdlib-js);
 * interval β ± t_{0.975, ν}·SE(β) and ρ_ij = C_ij/√(C_ii·C_jj) are the textbook forms
 * (e.g. NIST/SEMATECH e-Handbook of Statistical Methods §4.4.5 and §7.2).
 */
import quantileT from '@stdlib/stats-base-dists-t-quantile';
import { InputError } from '../errors.js';

/** Two-sided 95 % interval: upper tail probability 0.975 (common practice). */
const P_UPPER_95 = 0.975;

/**
 * Quantile t_{p, ν} of Student's t distribution: P(T ≤ t) = p for ν degrees of freedom.
 * p in (0, 1), ν > 0 (non-integer allowed; ν = Infinity gives the normal quantile).
 * Throws InputError outside that range (never returns NaN).
 */
export function studentTQuantile(p: number, dof: number): number {
  if (!(typeof p === 'number' && p > 0 && p < 1)) throw new InputError('p', 'must be a probability strictly between 0 and 1', p);
  if (!(typeof dof === 'number' && dof > 0)) throw new InputError('dof', 'degrees of freedom must be > 0', dof);
  const t = quantileT(p, dof);
  if (!Number.isFinite(t)) throw new InputError('p', `t quantile is not finite for p = ${p}, dof = ${dof}`, p);
  return t;
}

/**
 * Two-sided 95 % confidence interval [value − t·SE, value + t·SE], t = t_{0.975, dof}.
 * value and standardError in the parameter's units; SE ≥ 0, dof > 0.
 * Valid for an estimate whose error is approximately normal with SE estimated on `dof`
 * degrees of freedom (for nonlinear fits this is the usual linearised approximation).
 */
export function confidenceInterval95(value: number, standardError: number, dof: number): [number, number] {
  if (!Number.isFinite(value)) throw new InputError('value', 'must be a finite number', value);
  if (!Number.isFinite(standardError) || standardError < 0) throw new InputError('standardError', 'must be a finite number ≥ 0', standardError);
  const t = studentTQuantile(P_UPPER_95, dof);
  const half = t * standardError;
  return [value - half, value + half];
}

/**
 * Correlation matrix ρ_ij = C_ij/√(C_ii·C_jj) of a covariance matrix C (square, finite,
 * non-negative diagonal). Entries are clamped to [−1, 1] against rounding. A parameter
 * with zero variance (fixed or aliased) gets ρ_ii = 1 and ρ_ij = 0, since its correlation
 * is undefined — never NaN.
 */
export function correlationMatrix(covariance: number[][]): number[][] {
  const p = covariance.length;
  const sd = new Array<number>(p);
  for (let i = 0; i < p; i++) {
    const row = covariance[i];
    if (!Array.isArray(row) || row.length !== p) throw new InputError(`covariance[${i}]`, `must have ${p} entries (square matrix)`);
    for (let j = 0; j < p; j++) {
      if (!Number.isFinite(row[j])) throw new InputError(`covariance[${i}][${j}]`, 'must be finite', row[j]);
    }
    if (row[i] < 0) throw new InputError(`covariance[${i}][${i}]`, 'variance must be ≥ 0', row[i]);
    sd[i] = Math.sqrt(row[i]);
  }
  const out: number[][] = [];
  for (let i = 0; i < p; i++) {
    const row = new Array<number>(p);
    for (let j = 0; j < p; j++) {
      if (i === j) row[j] = 1;
      else if (sd[i] === 0 || sd[j] === 0) row[j] = 0;
      else row[j] = Math.max(-1, Math.min(1, covariance[i][j] / (sd[i] * sd[j])));
    }
    out.push(row);
  }
  return out;
}
