/**
 * Activation energy of the exchange current density from fits at several temperatures.
 *
 * Model (Arrhenius, domain.md §3): ln j0(T) = ln j0(T_ref) − (E_a/R)·(1/T − 1/T_ref).
 * Linear least squares (numerics, pivoted QR) of y = ln j0 on u = 1/T − 1/T_ref, so the
 * intercept IS ln j0(T_ref) and the slope is −E_a/R.
 *
 * Weights: when every point carries SE(j0), σ(ln j0) = SE/j0 (delta method) and w = 1/σ².
 * The covariance then uses the stated errors (known σ, normal quantile), unless the scatter
 * exceeds them (reduced χ² = Σw·e²/(n − 2) > 1), in which case it is scaled by χ²_red and
 * t_{0.975, n−2} is used (so the intervals never shrink below what the scatter shows;
 * common practice, e.g. the Birge-ratio inflation, R. T. Birge, Phys. Rev. 40 (1932) 207 —
 * citation from memory). Without SEs: ordinary least squares,
 * covariance s²(XᵀX)⁻¹, t on n − 2.
 * E_a = −R·slope with a symmetric interval; j0(T_ref) = e^{intercept} with the asymmetric
 * interval exp(intercept ± t·SE).
 * Default T_ref = 1/(weighted mean of 1/T), where intercept and slope are uncorrelated.
 * Sources: Arrhenius law; weighted least squares (common practice).
 */
import { GAS_CONSTANT } from '../constants.js';
import { InputError } from '../errors.js';
import { linearLeastSquares } from '../numerics/index.js';
import { logParameter, symmetricParameter } from './statistics.js';
import type { FittedParameter } from './types.js';

export interface ArrheniusPoint {
  /** Temperature [K]. */
  temperature: number;
  /** Exchange current density j0 [A/m²] at that temperature. */
  exchangeCurrentDensity: number;
  /** Standard error of j0 [A/m²] (give for all points or none). */
  standardError?: number;
}

export interface ArrheniusOptions {
  /** Temperature [K] at which j0 is reported (default: the weighted mean of 1/T, inverted). */
  referenceTemperature?: number;
}

export interface ArrheniusResult {
  /** Apparent activation energy E_a [J/mol]. */
  activationEnergy: FittedParameter;
  /** j0 at the reference temperature [A/m²]. */
  exchangeCurrentAtReference: FittedParameter;
  referenceTemperature: number;
  statistics: {
    points: number;
    degreesOfFreedom: number;
    rSquared: number;
    /** Residual SD of ln j0 (unweighted residuals; dimensionless). */
    residualStandardDeviation: number;
    /** Σw·e²/(n − 2) when SEs were given and n > 2. */
    reducedChiSquare?: number;
  };
  covarianceScaling: 'residual-variance' | 'known-sigma' | 'known-sigma-inflated';
  residuals: { temperature: number; lnExchangeCurrent: number; fitted: number; residual: number }[];
  /** Fitted j0(T) over the temperature range, for plotting. */
  curve: { temperature: number; exchangeCurrentDensity: number }[];
  warnings: string[];
}

/** Temperature span below which E_a is weakly determined (project choice; 10 K). */
const MIN_SPAN_K = 10;
/** Points of the plotted j0(T) curve (display resolution; project choice). */
const CURVE_POINTS = 40;

/** Fit E_a and j0(T_ref) to (T, j0 ± SE) points (see file header). */
export function fitArrhenius(points: ArrheniusPoint[], options: ArrheniusOptions = {}): ArrheniusResult {
  if (!Array.isArray(points) || points.length === 0) throw new InputError('points', 'no points given; need j0 at two or more temperatures');
  const withSe = points.filter((p) => p && p.standardError !== undefined).length;
  if (withSe !== 0 && withSe !== points.length) {
    const i = points.findIndex((p) => p.standardError === undefined);
    throw new InputError(`points[${i}].standardError`, 'give standard errors for all points or for none');
  }
  const weighted = withSe === points.length;
  points.forEach((p, i) => {
    if (!p || typeof p.temperature !== 'number' || !Number.isFinite(p.temperature) || p.temperature <= 0) {
      throw new InputError(`points[${i}].temperature`, 'must be a finite absolute temperature > 0 K', p?.temperature);
    }
    if (typeof p.exchangeCurrentDensity !== 'number' || !Number.isFinite(p.exchangeCurrentDensity) || p.exchangeCurrentDensity <= 0) {
      throw new InputError(`points[${i}].exchangeCurrentDensity`, 'must be a finite exchange current density > 0 A/m²', p.exchangeCurrentDensity);
    }
    if (weighted && (typeof p.standardError !== 'number' || !Number.isFinite(p.standardError) || p.standardError <= 0)) {
      throw new InputError(`points[${i}].standardError`, 'must be a finite standard error > 0 A/m²', p.standardError);
    }
  });
  const n = points.length;
  if (n < (weighted ? 2 : 3)) {
    throw new InputError('points', weighted ? 'need j0 at two or more temperatures' : 'need j0 at three or more temperatures when no standard errors are given (two points leave no scatter to judge the uncertainty)');
  }
  const inv = points.map((p) => 1 / p.temperature);
  const distinct = new Set(points.map((p) => p.temperature)).size;
  if (distinct < 2) throw new InputError('points', 'all points are at the same temperature; E_a needs at least two temperatures');
  const y = points.map((p) => Math.log(p.exchangeCurrentDensity));
  const w = weighted ? points.map((p) => (p.exchangeCurrentDensity / (p.standardError as number)) ** 2) : points.map(() => 1);
  let Tref = options.referenceTemperature;
  if (Tref !== undefined && (typeof Tref !== 'number' || !Number.isFinite(Tref) || Tref <= 0)) {
    throw new InputError('referenceTemperature', 'must be a finite absolute temperature > 0 K', Tref);
  }
  if (Tref === undefined) {
    let sw = 0;
    let swx = 0;
    for (let i = 0; i < n; i++) {
      sw += w[i];
      swx += w[i] * inv[i];
    }
    Tref = sw / swx;
  }
  const u = inv.map((v) => v - 1 / (Tref as number));
  const X = u.map((v) => [1, v]);
  const warnings: string[] = [];
  let fit = linearLeastSquares(X, y, weighted ? { weights: w, hasIntercept: true, sigmaMode: 'absolute' } : { hasIntercept: true });
  let scaling: ArrheniusResult['covarianceScaling'] = weighted ? 'known-sigma' : 'residual-variance';
  let dofForT = weighted ? Infinity : n - 2;
  let reducedChiSquare: number | undefined;
  if (weighted && n > 2) {
    reducedChiSquare = fit.rss / (n - 2);
    if (reducedChiSquare > 1) {
      fit = linearLeastSquares(X, y, { weights: w, hasIntercept: true, sigmaMode: 'relative' });
      scaling = 'known-sigma-inflated';
      dofForT = n - 2;
      warnings.push(`The scatter of ln j0 about the Arrhenius line is larger than the stated errors (reduced χ² = ${reducedChiSquare.toFixed(2)}); the uncertainties were scaled up by √χ² = ${Math.sqrt(reducedChiSquare).toFixed(2)}.`);
    }
  }
  for (const m of fit.warnings) warnings.push(`Least squares: ${m}`);
  const [a, b] = fit.coefficients;
  const R = GAS_CONSTANT.value;
  const activationEnergy = symmetricParameter(-R * b, fit.aliased[1] ? null : R * fit.standardErrors[1], dofForT, 'J/mol', 'apparent activation energy of j0');
  const exchangeCurrentAtReference = logParameter(a, fit.aliased[0] ? null : fit.standardErrors[0], dofForT, 'A/m²', `j0 at ${Tref.toFixed(2)} K; interval from the interval on ln j0 (asymmetric)`);
  let tMin = Infinity;
  let tMax = -Infinity;
  for (const p of points) {
    tMin = Math.min(tMin, p.temperature);
    tMax = Math.max(tMax, p.temperature);
  }
  if (tMax - tMin < MIN_SPAN_K) warnings.push(`The temperatures span only ${(tMax - tMin).toFixed(1)} K; E_a from less than ${MIN_SPAN_K} K is weakly determined.`);
  if (activationEnergy.value < 0) warnings.push('The fitted activation energy is negative (j0 falls with temperature): check the data; a change of surface state or mechanism with temperature is likely.');
  if (Tref < tMin - MIN_SPAN_K || Tref > tMax + MIN_SPAN_K) {
    warnings.push(`j0 is reported at ${Tref.toFixed(1)} K, outside the measured ${tMin.toFixed(1)}–${tMax.toFixed(1)} K: this is an extrapolation; its interval widens accordingly.`);
  }
  const residuals = points.map((p, i) => {
    const fitted = a + b * u[i];
    return { temperature: p.temperature, lnExchangeCurrent: y[i], fitted, residual: y[i] - fitted };
  });
  let rss = 0;
  for (const r of residuals) rss += r.residual * r.residual;
  const curve: ArrheniusResult['curve'] = [];
  for (let k = 0; k < CURVE_POINTS; k++) {
    const T = tMin + ((tMax - tMin) * k) / (CURVE_POINTS - 1);
    curve.push({ temperature: T, exchangeCurrentDensity: Math.exp(a + b * (1 / T - 1 / Tref)) });
  }
  return {
    activationEnergy,
    exchangeCurrentAtReference,
    referenceTemperature: Tref,
    statistics: {
      points: n,
      degreesOfFreedom: n - 2,
      rSquared: fit.rSquared,
      residualStandardDeviation: n > 2 ? Math.sqrt(rss / (n - 2)) : 0,
      ...(reducedChiSquare !== undefined ? { reducedChiSquare } : {}),
    },
    covarianceScaling: scaling,
    residuals,
    curve,
    warnings,
  };
}
