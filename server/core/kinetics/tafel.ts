/**
 * Tafel fit of one polarization branch.
 *
 * Model (domain.md §3), with s = +1 on the anodic branch (j > 0) and −1 on the cathodic
 * branch (j < 0), η the overpotential as given and R_u the uncompensated area resistance:
 *
 *   s·η = a + b·ln|j| + R_u·|j|        (R_u fitted; linear in a, b, R_u)
 *   s·(η − j·R_u) = a + b·ln|j|         (R_u known and subtracted, or zero)
 *
 * b = RT/(αF) [V], Tafel slope per decade b·ln 10, transfer coefficient α = RT/(bF),
 * exchange current density j0 = exp(−a/b). Least squares in η (the measured variable) by
 * pivoted QR (numerics.linearLeastSquares); covariance scaled by s² = RSS/(n − p).
 *
 * Uncertainty: SE(a), SE(b), cov(a, b) from the fit. Tafel slope: ±t·ln10·SE(b). α: the
 * interval on b mapped through α = RT/(bF) (monotone, hence exact given the interval on b;
 * asymmetric), SE by the delta method α·SE(b)/b. ln j0 = −a/b by the delta method,
 * Var = g·Σ·gᵀ with g = (−1/b, a/b²); j0 = e^{ln j0} with the ASYMMETRIC interval
 * exp(ln j0 ± t·SE). t = t_{0.975, n−p}.
 * Sources: Tafel equation and IUPAC 2014 definition of α (Guidelli et al., Pure Appl. Chem.
 * 86 (2014) 259–262); delta method (common practice); iR term per domain.md §3.
 */
import { faradayOverRT } from '../constants.js';
import { InputError } from '../errors.js';
import { correlationMatrix } from '../numerics/index.js';
import type { LinearFit } from '../numerics/index.js';
import { fitStatistics, fixedParameter, logParameter, symmetricParameter, tQuantile95 } from './statistics.js';
import type { Branch, FitStatistics, FittedParameter, PolarizationPoint, ResidualRecord } from './types.js';
import { checkPoints, checkTemperature, checkWindow } from './validate.js';
import {
  bothBranchesWarning,
  curvatureWarning,
  fewPointsWarning,
  lowFieldWarning,
  MAX_SLOPE_RISE,
  MIN_DECADES,
  MIN_POINTS,
  MIN_R_SQUARED,
  narrowWindowWarning,
  rSquaredWarning,
} from './warnings.js';
import { AUTO_WINDOW_RULE, curvatureCheck, decadesOf, lowFieldLimit, selectAutoWindow, tafelLinearFit } from './window.js';
import { tafelWorkingBranchUncertainty, type WorkingBranchUncertainty } from './working-branch.js';

export interface TafelFitOptions {
  /** Temperature [K] (> 0). */
  temperature: number;
  /** Branch to fit; default: the branch with more points. */
  branch?: Branch;
  /** Manual |η| window in V (bounds on s·η as given) or 'auto' (default). */
  window?: { minOverpotential: number; maxOverpotential: number } | 'auto';
  /** Known R_u [Ω·m²] subtracted as j·R_u, or 'fit' to fit it with the line. Default 0. */
  uncompensatedResistance?: number | 'fit';
  /** Electron number n for the single-step reading α/n (optional). */
  electrons?: number;
}

export interface TafelWindow {
  /** Smallest and largest |η| (as given) among the fitted points [V]. */
  minOverpotential: number;
  maxOverpotential: number;
  rule: string;
  automatic: boolean;
  /** Low-field limit used by the automatic rule [V] (also used for the low-field warning). */
  lowFieldLimit: number;
  /** Decades of current spanned by the fitted points. */
  decades: number;
}

export interface TafelParameters {
  exchangeCurrentDensity: FittedParameter;
  /** Tafel slope per decade [V/decade]. */
  tafelSlope: FittedParameter;
  /** α = RT/(bF) of the fitted branch (anodic α_a or cathodic α_c). */
  transferCoefficient: FittedParameter;
  /** Intercept a = η at |j| = 1 A/m² on the branch (s·η) [V]. */
  intercept: FittedParameter;
  uncompensatedResistance?: FittedParameter;
  /** Single-step symmetry-factor reading α/n (anodic: 1 − β; cathodic: β). */
  singleStepSymmetryReading?: FittedParameter;
}

export interface TafelFitResult {
  model: 'tafel';
  branch: Branch;
  parameters: TafelParameters;
  statistics: FitStatistics;
  window: TafelWindow;
  correlation: { names: string[]; matrix: number[][] };
  /**
   * (ln j0, α) of the fitted branch with standard errors and correlation, by the delta
   * method from the (a, b) covariance (working-branch.ts); absent when the fit could not
   * separate its parameters.
   */
  workingBranchUncertainty?: WorkingBranchUncertainty;
  residuals: ResidualRecord[];
  curve: PolarizationPoint[];
  converged: boolean;
  /** 'ok' | 'window-rule-not-met' (automatic window: no window passed; all high-field points fitted). */
  status: 'ok' | 'window-rule-not-met';
  warnings: string[];
}

/** Number of points of the plotted fitted line (display resolution; project choice). */
const CURVE_POINTS = 60;

/** Choose the branch: the one requested, else the one with more points (ties: anodic). */
export function chooseBranch(points: PolarizationPoint[], requested: Branch | undefined, warnings: string[]): Branch {
  let anodic = 0;
  let cathodic = 0;
  for (const p of points) {
    if (p.currentDensity > 0) anodic++;
    else if (p.currentDensity < 0) cathodic++;
  }
  const chosen: Branch = requested ?? (cathodic > anodic ? 'cathodic' : 'anodic');
  if (anodic > 0 && cathodic > 0) warnings.push(bothBranchesWarning(chosen, anodic, cathodic, requested !== undefined));
  return chosen;
}

/**
 * Fit a Tafel line to one branch of polarization data (see the file header for the model,
 * the uncertainty propagation and sources). Points: j [A/m²] ≠ 0, η [V]. Throws InputError
 * for invalid input, an empty window or fewer than p + 1 points in it.
 */
export function fitTafel(points: PolarizationPoint[], options: TafelFitOptions): TafelFitResult {
  checkPoints(points, { rejectZeroCurrent: true });
  checkTemperature(options.temperature);
  const T = options.temperature;
  const warnings: string[] = [];
  const ru = options.uncompensatedResistance ?? 0;
  const fitRu = ru === 'fit';
  if (!fitRu && (typeof ru !== 'number' || !Number.isFinite(ru) || ru < 0)) {
    throw new InputError('uncompensatedResistance', "must be a known area resistance ≥ 0 Ω·m² or 'fit'", ru);
  }
  const knownRu = fitRu ? 0 : (ru as number);
  const electrons = options.electrons;
  if (electrons !== undefined && (typeof electrons !== 'number' || !Number.isFinite(electrons) || electrons <= 0)) {
    throw new InputError('electrons', 'must be a number of electrons > 0', electrons);
  }
  if (options.branch !== undefined && options.branch !== 'anodic' && options.branch !== 'cathodic') {
    throw new InputError('branch', "must be 'anodic' or 'cathodic'", options.branch);
  }
  const branch = chooseBranch(points, options.branch, warnings);
  const s = branch === 'anodic' ? 1 : -1;

  // Branch points sorted by |η| as given (s·η).
  const idx: number[] = [];
  for (let i = 0; i < points.length; i++) if (Math.sign(points[i].currentDensity) === s) idx.push(i);
  if (idx.length === 0) throw new InputError('points', `no ${branch} points (${branch === 'anodic' ? 'j > 0' : 'j < 0'}) to fit`);
  idx.sort((i, k) => s * points[i].overpotential - s * points[k].overpotential);
  const yAll = idx.map((i) => s * points[i].overpotential);
  const xAll = idx.map((i) => Math.log(Math.abs(points[i].currentDensity)));
  const jAll = idx.map((i) => Math.abs(points[i].currentDensity));
  const fitYAll = idx.map((_, k) => yAll[k] - jAll[k] * knownRu);
  const p = fitRu ? 3 : 2;

  // Window.
  let positions: number[];
  let automatic = false;
  let status: TafelFitResult['status'] = 'ok';
  let lowLimit = lowFieldLimit(T, 1);
  const win = options.window ?? 'auto';
  if (win === 'auto') {
    automatic = true;
    const auto = selectAutoWindow(yAll, xAll, fitRu ? jAll : null, fitYAll, T);
    lowLimit = auto.lowFieldLimit;
    positions = auto.positions;
    if (!auto.passed) {
      status = 'window-rule-not-met';
      // The reasons are those of the widest candidate window, i.e. of the points fitted
      // below (its R² is the statistics' R², unless it was tested on a strided subset).
      const subset = auto.testedPoints < auto.positions.length ? ` (tested on an evenly spaced subset of ${auto.testedPoints} of them)` : '';
      warnings.push(
        `No window met the automatic rule. The widest candidate, all ${auto.eligible} ${branch} point(s) with |η| ≥ ${(auto.lowFieldLimit * 1000).toFixed(0)} mV, fails it${subset}: ${auto.reasons.join('; ')}. These points were fitted instead; check the warnings below or set the window by hand.`,
      );
    }
    if (positions.length < p + 1) {
      throw new InputError(
        'window',
        `the automatic window holds ${positions.length} point(s) with |η| ≥ ${(auto.lowFieldLimit * 1000).toFixed(0)} mV; at least ${p + 1} are needed for a ${p}-parameter fit with uncertainties. Measure further into the Tafel region or set the window by hand.`,
      );
    }
  } else {
    const w = checkWindow(win);
    positions = [];
    for (let k = 0; k < yAll.length; k++) if (yAll[k] >= w.minOverpotential && yAll[k] <= w.maxOverpotential) positions.push(k);
    if (positions.length === 0) {
      throw new InputError('window', `no ${branch} point has |η| between ${w.minOverpotential} and ${w.maxOverpotential} V (empty window)`);
    }
    if (positions.length < p + 1) {
      throw new InputError('window', `the window holds ${positions.length} point(s); a ${p}-parameter Tafel fit with uncertainties needs at least ${p + 1}`);
    }
  }

  const x = positions.map((k) => xAll[k]);
  const y = positions.map((k) => fitYAll[k]);
  const absJ = positions.map((k) => jAll[k]);
  if (!(decadesOf(x) > 0)) throw new InputError('points', 'all fitted points have the same current density; a slope cannot be fitted');
  const fit = tafelLinearFit(x, y, fitRu ? absJ : null);
  for (const w of fit.warnings) warnings.push(`Least squares: ${w}`);
  const dof = fit.degreesOfFreedom;
  const [a, b] = fit.coefficients;
  if (!(b > 0)) {
    throw new InputError('points', `the fitted Tafel slope is not positive (b = ${b.toExponential(3)} V); the ${branch} data do not rise with |j| in this window`);
  }
  const cov = fit.covariance;
  const aliasedAny = fit.aliased.some((v) => v);

  const params = tafelParameters(a, b, cov, dof, T, branch, electrons, aliasedAny);
  if (fitRu) {
    params.uncompensatedResistance = symmetricParameter(fit.coefficients[2], fit.aliased[2] ? null : fit.standardErrors[2], dof, 'Ω·m²');
    if (fit.coefficients[2] < 0) {
      warnings.push('The fitted uncompensated resistance is negative, which is unphysical: the data bend the other way (or noise dominates). Fix R_u from impedance or current-interrupt data instead.');
    }
  } else if (knownRu > 0) {
    params.uncompensatedResistance = fixedParameter(knownRu, 'Ω·m²', 'known value, subtracted as j·R_u');
  }

  // Residuals over all points (model η for the fitted branch; null for the other).
  const used = new Set(positions.map((k) => idx[k]));
  const Ru = fitRu ? fit.coefficients[2] : knownRu;
  const modelEta = (j: number) => s * (a + b * Math.log(Math.abs(j)) + (fitRu ? Ru * Math.abs(j) : 0)) + (fitRu ? 0 : j * knownRu);
  const residuals: ResidualRecord[] = points.map((pt, i) => {
    if (Math.sign(pt.currentDensity) !== s) return { currentDensity: pt.currentDensity, overpotential: pt.overpotential, fitted: null, residual: null, used: false };
    const fitted = modelEta(pt.currentDensity);
    return { currentDensity: pt.currentDensity, overpotential: pt.overpotential, fitted, residual: pt.overpotential - fitted, used: used.has(i) };
  });

  // Statistics in η over the fitted points (residuals equal those of the linear fit up to
  // sign). R² is that of the overpotential after a KNOWN j·R_u is subtracted (the iR-corrected
  // η of domain.md §2, the variable the line describes and the window rule tests): with the
  // known drop left in, its spread would count as "explained" and inflate R². A fitted R_u is
  // part of the model, so then η as given is used.
  const etaUsed = positions.map((k) => points[idx[k]].overpotential - points[idx[k]].currentDensity * knownRu);
  const resUsed = positions.map((k) => points[idx[k]].overpotential - modelEta(points[idx[k]].currentDensity));
  const statistics = fitStatistics(resUsed, etaUsed, p);

  // Curve over the fitted |j| range.
  let xmin = Infinity;
  let xmax = -Infinity;
  for (const v of x) {
    xmin = Math.min(xmin, v);
    xmax = Math.max(xmax, v);
  }
  const curve: PolarizationPoint[] = [];
  for (let k = 0; k < CURVE_POINTS; k++) {
    const j = s * Math.exp(xmin + ((xmax - xmin) * k) / (CURVE_POINTS - 1));
    curve.push({ currentDensity: j, overpotential: modelEta(j) });
  }

  // Window summary and quality warnings.
  let etaMin = Infinity;
  let etaMax = -Infinity;
  for (const k of positions) {
    etaMin = Math.min(etaMin, yAll[k]);
    etaMax = Math.max(etaMax, yAll[k]);
  }
  const decades = decadesOf(x);
  const alphaHat = params.transferCoefficient.value;
  // Automatic: the limit the rule used; manual: the rule's limit for the fitted α.
  const lowForWarning = automatic ? lowLimit : lowFieldLimit(T, alphaHat);
  lowLimit = lowForWarning;
  let lowCount = 0;
  for (const k of positions) if (yAll[k] < lowForWarning) lowCount++;
  if (lowCount > 0) warnings.push(lowFieldWarning(lowCount, lowForWarning));
  if (decades < MIN_DECADES) warnings.push(narrowWindowWarning(decades));
  if (positions.length < MIN_POINTS) warnings.push(fewPointsWarning(positions.length));
  if (statistics.rSquared < MIN_R_SQUARED) warnings.push(rSquaredWarning(statistics.rSquared, knownRu > 0));
  const curv = curvatureCheck(x, y, fitRu ? absJ : null);
  if (curv.riseSignificant && Math.abs(curv.rise) > MAX_SLOPE_RISE) warnings.push(curvatureWarning(curv.rise, 'window'));
  else if (curv.topSignificant && Math.abs(curv.topRise) > MAX_SLOPE_RISE) warnings.push(curvatureWarning(curv.topRise, 'top'));
  if (aliasedAny) warnings.push('The fit could not separate all parameters (rank-deficient design); parameters without an uncertainty are not determined by these data.');

  const names = fitRu ? ['a (V)', 'b (V)', 'R_u (Ω·m²)'] : ['a (V)', 'b (V)'];
  const window: TafelWindow = {
    minOverpotential: etaMin,
    maxOverpotential: etaMax,
    rule: automatic ? AUTO_WINDOW_RULE : `Manual window: points of the ${branch} branch with |η| (as given) between the stated bounds.`,
    automatic,
    lowFieldLimit: lowLimit,
    decades,
  };
  const result: TafelFitResult = {
    model: 'tafel',
    branch,
    parameters: params,
    statistics,
    window,
    correlation: { names, matrix: safeCorrelation(fit) },
    residuals,
    curve,
    converged: true,
    status,
    warnings,
  };
  const working = aliasedAny ? undefined : tafelWorkingBranchUncertainty(a, b, cov, T, branch);
  if (working) result.workingBranchUncertainty = working;
  return result;
}

function safeCorrelation(fit: LinearFit): number[][] {
  try {
    return correlationMatrix(fit.covariance);
  } catch {
    return fit.covariance.map((row, i) => row.map((_, j) => (i === j ? 1 : 0)));
  }
}

/**
 * Derived Tafel parameters from intercept a [V], slope b [V per e-fold] and their
 * covariance (2×2 leading block of cov), with dof for the t-quantile. See file header.
 */
export function tafelParameters(
  a: number,
  b: number,
  cov: number[][],
  dof: number,
  temperatureK: number,
  branch: Branch,
  electrons: number | undefined,
  undetermined = false,
): TafelParameters {
  const f = faradayOverRT(temperatureK);
  const varA = cov[0][0];
  const varB = cov[1][1];
  const covAB = cov[0][1];
  const seB = undetermined ? null : Math.sqrt(varB);
  const seA = undetermined ? null : Math.sqrt(varA);
  const alpha = 1 / (f * b);
  // ln j0 = −a/b, gradient g = (−1/b, a/b²).
  const g0 = -1 / b;
  const g1 = a / (b * b);
  const varLnJ0 = g0 * g0 * varA + 2 * g0 * g1 * covAB + g1 * g1 * varB;
  const seLnJ0 = undetermined ? null : Math.sqrt(Math.max(varLnJ0, 0));

  const tafelSlope = symmetricParameter(Math.LN10 * b, seB === null ? null : Math.LN10 * seB, dof, 'V/decade');
  const transferCoefficient: FittedParameter = {
    value: alpha,
    standardError: seB === null ? null : (alpha * seB) / b,
    ci95: null,
    unit: '1',
    note: `${branch} transfer coefficient α = RT/(bF) (IUPAC 2014: the reported quantity)`,
  };
  if (seB !== null) {
    const t = tQuantile95(dof);
    const bLo = b - t * seB;
    const bHi = b + t * seB;
    // Interval on b mapped through α = 1/(f·b); unbounded above when b's interval reaches 0.
    if (bLo > 0) transferCoefficient.ci95 = [1 / (f * bHi), 1 / (f * bLo)];
  }
  const params: TafelParameters = {
    exchangeCurrentDensity: logParameter(-a / b, seLnJ0, dof, 'A/m²', 'j0 = exp(−a/b); interval from the delta-method interval on ln j0 (asymmetric)'),
    tafelSlope,
    transferCoefficient,
    intercept: symmetricParameter(a, seA, dof, 'V', '|η| at |j| = 1 A/m² on the fitted branch'),
  };
  if (electrons !== undefined) {
    const reading = symmetricParameter(alpha / electrons, transferCoefficient.standardError === null ? null : transferCoefficient.standardError / electrons, dof, '1');
    if (transferCoefficient.ci95) reading.ci95 = [transferCoefficient.ci95[0] / electrons, transferCoefficient.ci95[1] / electrons];
    else reading.ci95 = null;
    reading.note =
      branch === 'anodic'
        ? `single-step reading (1 − β) = α_a/n with n = ${electrons}; meaningful only for one elementary step transferring n electrons at once (IUPAC 2014: α is the reported quantity)`
        : `single-step reading β = α_c/n with n = ${electrons}; meaningful only for one elementary step transferring n electrons at once (IUPAC 2014: α is the reported quantity)`;
    params.singleStepSymmetryReading = reading;
  }
  return params;
}
