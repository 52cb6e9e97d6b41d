/**
 * Butler–Volmer fit with residuals in the measured variable η.
 *
 * Model (domain.md §3): for each point the model overpotential is
 *   η_model(j) = η_BV(j; j0, α_a, α_c, j_lim,a, j_lim,c) + j·R_u,
 * where η_BV is the exact inverse of the closed-form Butler–Volmer law with limiting
 * currents (models.ts / bv-kernel.ts). Least squares on r_i = η_i − η_model(j_i) by
 * Levenberg–Marquardt (numerics), with an analytic Jacobian from the implicit-function
 * theorem: ∂η/∂θ = −(∂ln|j|/∂θ)/(∂ln|j|/∂η) at fixed j.
 *
 * Parametrisation (positive quantities through logarithms, so the fit cannot leave the
 * physical domain):
 *   θ_0 = ln j0;  α_a = e^{θ}, α_c = e^{θ} (each when free);
 *   tied α_a + α_c = n: α_a = n/(1 + e^{−z}), α_c = n − α_a;
 *   limiting current of a branch: j_lim = j_max·(1 + e^{φ}), j_max = the largest |j| of the
 *     fitted points on that branch — the law has no solution for |j| ≥ j_lim, so the
 *     likelihood only exists above j_max; φ is the log of the relative excess;
 *   R_u unconstrained (a negative fitted value earns a warning).
 * Reported values map the parameter estimates back; standard errors by the delta method;
 * 95 % intervals are the intervals on θ (± t·SE, t = t_{0.975, n−p}) mapped through the
 * monotone transformations (asymmetric for j0 and α). A fitted limiting current gets the
 * 95 % profile-likelihood interval instead (its likelihood is strongly skewed when the
 * bending is weak, and the linearised interval then misses the true value far too often);
 * an upper end the data do not reach is reported as open (ci95 null, with a warning).
 * Covariance: s²(JᵀJ)⁻¹ with s² = RSS/(n − p) (σ estimated from the scatter).
 * Fallbacks, each announced by a warning: a fitted limit that runs beyond 100× the largest
 * |j|, or whose fit does not converge, is left out; on one-branch data a free reverse-branch
 * α that the fit drives out of the plausible range (to 0 or ∞, where the model no longer
 * depends on it) or cannot identify is held (α_a + α_c = n when n is given, else at the edge
 * of the plausible range) and the fit repeated.
 * Sources: Butler–Volmer with limiting currents as in domain.md §3; Levenberg–Marquardt
 * (Moré 1978) via numerics; delta method and interval mapping (common practice).
 */
import { faradayOverRT, thermalVoltage } from '../constants.js';
import { InputError, PhysicsError } from '../errors.js';
import { correlationMatrix, levenbergMarquardt, linearLeastSquares } from '../numerics/index.js';
import type { NonlinearFit } from '../numerics/index.js';
import { lnRatioToLimit, makeKernels, newBranchEval, solveBranch } from './bv-kernel.js';
import type { BranchEval, BranchKernel } from './bv-kernel.js';
import { fitStatistics, fixedParameter, symmetricParameter, tQuantile95 } from './statistics.js';
import type { Branch, FitStatistics, FittedParameter, PolarizationPoint, ResidualRecord } from './types.js';
import { checkPoints, checkTemperature, checkWindow } from './validate.js';
import { lowFieldLimit } from './window.js';
import { pairFromCovariance, type WorkingBranchUncertainty } from './working-branch.js';

export interface ButlerVolmerFitOptions {
  /** Temperature [K] (> 0). */
  temperature: number;
  /** Electron number n: needed to tie α_a + α_c = n; also gives the single-step reading. */
  electrons?: number;
  /** Manual |η| window in V (as given), or 'auto' / absent = all points. */
  window?: { minOverpotential: number; maxOverpotential: number } | 'auto';
  /** Restrict the fit to one branch (default: all points, both branches). */
  branch?: Branch;
  /** Known R_u [Ω·m²] or 'fit'. Default 0. */
  uncompensatedResistance?: number | 'fit';
  /** Known anodic limiting current density [A/m²] or 'fit'. Default: none. */
  anodicLimitingCurrentDensity?: number | 'fit';
  /** Known cathodic limiting current density magnitude [A/m²] or 'fit'. Default: none. */
  cathodicLimitingCurrentDensity?: number | 'fit';
  /** Fix α_a at this value. */
  anodicTransferCoefficient?: number;
  /** Fix α_c at this value. */
  cathodicTransferCoefficient?: number;
  /** Tie α_a + α_c = electrons. */
  tieTransferCoefficients?: boolean;
}

export interface ButlerVolmerParameters {
  exchangeCurrentDensity: FittedParameter;
  anodicTransferCoefficient: FittedParameter;
  cathodicTransferCoefficient: FittedParameter;
  /** Tafel slope per decade of the main branch (the one with more fitted points) [V/decade]. */
  tafelSlope: FittedParameter;
  /** Absent when the branch's α is zero at working precision (the slope is unbounded; see warnings). */
  anodicTafelSlope?: FittedParameter;
  /** Absent when the branch's α is zero at working precision (the slope is unbounded; see warnings). */
  cathodicTafelSlope?: FittedParameter;
  uncompensatedResistance?: FittedParameter;
  anodicLimitingCurrentDensity?: FittedParameter;
  cathodicLimitingCurrentDensity?: FittedParameter;
  singleStepSymmetryReading?: FittedParameter;
}

export interface ButlerVolmerFitResult {
  model: 'butler-volmer';
  parameters: ButlerVolmerParameters;
  statistics: FitStatistics;
  window: { minOverpotential: number; maxOverpotential: number; rule: string; automatic: boolean };
  correlation: { names: string[]; matrix: number[][] };
  /**
   * (ln j0, α) of the main branch (the `branch` option, else the branch with more fitted
   * points: α_a when anodic, α_c when cathodic) with standard errors and correlation, by the
   * delta method from the fit covariance (see workingBranchPair); absent when the fit did not
   * converge or ln j0 or that α is not determined.
   */
  workingBranchUncertainty?: WorkingBranchUncertainty;
  residuals: ResidualRecord[];
  curve: PolarizationPoint[];
  converged: boolean;
  status: string;
  message: string;
  iterations: number;
  evaluations: number;
  warnings: string[];
}

/** Relative SE of a positive parameter (SE of its log) above which it is "not determined" (100 %; project choice). */
const MAX_RELATIVE_SE = 1;
/** |correlation| above which two parameters are reported as not separable (0.99; project choice, set in the project brief). */
const MAX_CORRELATION = 0.99;
/** Fitted limiting current beyond this multiple of the largest measured |j| → "no sign of a limit" (project choice). */
const LIMIT_RUNAWAY_FACTOR = 100;
/**
 * Transfer coefficients outside this range are flagged as implausible (project choice;
 * reported transfer coefficients lie mostly between about 0.1 and 4 — from memory, not an
 * IUPAC figure).
 */
const ALPHA_PLAUSIBLE: [number, number] = [0.05, 5];
/** Lowest allowed φ (keeps j_lim − j_max > 0 in floating point). */
const PHI_MIN = -700;
/** Highest φ used by the model (j_lim ≤ e^40·j_max): beyond it the limit has no effect on the data. */
const PHI_MAX = 40;
/** φ above which a fitted limiting current counts as having run away (j_lim > 100·j_max). */
const PHI_RUNAWAY = Math.log(LIMIT_RUNAWAY_FACTOR - 1);
/**
 * Search range of φ = ln(j_lim/j_max − 1) for profile-likelihood interval ends: an end not
 * reached above PHI_RUNAWAY (j_lim = 100·j_max) is reported as open (no upper bound from
 * these data); below PROFILE_PHI_LOW (j_lim within 2e-9 of j_max) the lower end is taken as
 * j_max itself (project choices).
 */
const PROFILE_PHI_LOW = -20;
/**
 * Accuracy of a profile-interval end: the root search on φ stops when its last correction is
 * below this fraction of the end's distance from the estimate (0.5 % of the half-width in φ;
 * the end of a 95 % interval is itself a statistical estimate good to a few per cent, so
 * finer resolution buys nothing; project choice). The returned end is the secant estimate
 * after that correction, typically far more accurate than the tolerance.
 */
const PROFILE_RELATIVE_TOLERANCE = 5e-3;
/** Absolute floor of that tolerance in φ (for an end that lies very close to the estimate). */
const PROFILE_ABSOLUTE_TOLERANCE = 1e-9;
/** Profile fits per interval end before the search gives up (project choice; 2–4 are typical). */
const PROFILE_MAX_FITS = 16;
/**
 * Largest first trial distance from the estimate in φ (a factor e on j_lim − j_max): when the
 * linearised SE of φ is large the profile is far from quadratic and t·SE can overshoot the
 * end by a wide margin, which leaves a lopsided bracket (project choice).
 */
const PROFILE_FIRST_STEP = 1;
/** Largest growth factor of the distance from the estimate while an end is not yet bracketed (project choice). */
const PROFILE_MAX_EXPANSION = 4;
/**
 * Levenberg–Marquardt settings of one profile fit (φ held, the other parameters re-fitted
 * from a warm start on the profile trace). The profile RSS enters the end condition through
 * τ = √((RSS − RSS_min)/s²), s² = RSS_min/dof, so a relative RSS error δ moves τ by
 * ≈ δ·dof/(2t); ftol = 1e-10 keeps that far below the end tolerance even for 10⁵ points,
 * and Gauss–Newton's quadratic convergence from the warm start reaches it in 2–4 steps.
 * The analytic Jacobian was already checked against differences at the main solution, so
 * the check is skipped; few evaluations are allowed (a profile fit that needs more is
 * reported as failed and the interval falls back to the linearised one). Project choices.
 */
const PROFILE_LM_OPTIONS = { ftol: 1e-10, xtol: 1e-10, gtol: 1e-10, checkJacobian: false, maxEvaluations: 60 } as const;
/** Clamp of starting transfer coefficients (project choice). */
const ALPHA_START_RANGE: [number, number] = [0.1, 3];
/** Points per branch of the plotted model curve (display resolution; project choice). */
const CURVE_POINTS_PER_BRANCH = 50;

type Dep = { index: number; d: number }[];

interface Layout {
  names: string[];
  start: number[];
  /** Map θ → physical quantities with gradients. */
  unpack(theta: number[]): Unpacked;
}

interface Unpacked {
  lnJ0: number;
  lnJ0Dep: Dep;
  alphaA: number;
  alphaADep: Dep;
  alphaC: number;
  alphaCDep: Dep;
  lnLimA: number; // Infinity when none
  limADep: Dep;
  limAExcess: number; // j_lim,a − j_max,a (for the gap), NaN when fixed/none
  lnLimC: number;
  limCDep: Dep;
  limCExcess: number;
  limA: number; // value or Infinity
  limC: number;
  ru: number;
  ruDep: Dep;
}

const softplus = (p: number) => (p > 35 ? p : Math.log1p(Math.exp(p)));
const sigmoid = (p: number) => 1 / (1 + Math.exp(-p));

/**
 * One limiting current from the parameter vector: fitted as j_lim = j_max·(1 + e^φ) (φ clamped
 * to [PHI_MIN, PHI_MAX], so it always lies above the largest measured |j|; see the file header),
 * fixed at the given value, or none (undefined). `excess` = j_lim − j_max (NaN unless fitted).
 */
function unpackLimit(
  theta: number[],
  index: number,
  lnJMax: number,
  jMax: number,
  given: number | 'fit' | undefined,
): { ln: number; dep: Dep; excess: number; value: number } | undefined {
  if (index >= 0) {
    const phi = Math.min(PHI_MAX, Math.max(theta[index], PHI_MIN));
    const excess = jMax * Math.exp(phi);
    return { ln: lnJMax + softplus(phi), dep: [{ index, d: phi === theta[index] ? sigmoid(phi) : 0 }], excess, value: jMax + excess };
  }
  if (typeof given === 'number') return { ln: Math.log(given), dep: [], excess: NaN, value: given };
  return undefined;
}

/**
 * Fit the Butler–Volmer law (with optional limiting currents and R_u) to polarization
 * points (j [A/m²], η [V]). See the file header for model, parametrisation and statistics.
 * Throws InputError for invalid options or too few points, PhysicsError when data exceed a
 * fixed limiting current.
 */
export function fitButlerVolmer(points: PolarizationPoint[], options: ButlerVolmerFitOptions): ButlerVolmerFitResult {
  return fitButlerVolmerWith(points, options, true);
}

/**
 * fitButlerVolmer with one internal switch: `mayDropLimits` allows the fallback that refits
 * without a fitted limiting current when the fit with it does not converge (off while
 * the reverse-branch α holds are tried, so that a failing hold is not "rescued" by silently
 * changing the mass-transport model before the other hold had its chance).
 */
function fitButlerVolmerWith(points: PolarizationPoint[], options: ButlerVolmerFitOptions, mayDropLimits: boolean): ButlerVolmerFitResult {
  checkPoints(points, { rejectZeroCurrent: false });
  checkTemperature(options.temperature);
  const T = options.temperature;
  const f = faradayOverRT(T);
  const warnings: string[] = [];

  // ---- Which points.
  const win = options.window ?? 'auto';
  const automatic = win === 'auto';
  const bounds = automatic ? { minOverpotential: 0, maxOverpotential: Infinity } : checkWindow(win);
  if (options.branch !== undefined && options.branch !== 'anodic' && options.branch !== 'cathodic') {
    throw new InputError('branch', "must be 'anodic' or 'cathodic'", options.branch);
  }
  const used: number[] = [];
  for (let i = 0; i < points.length; i++) {
    const pt = points[i];
    if (options.branch === 'anodic' && !(pt.currentDensity > 0)) continue;
    if (options.branch === 'cathodic' && !(pt.currentDensity < 0)) continue;
    const m = Math.abs(pt.overpotential);
    if (m < bounds.minOverpotential || m > bounds.maxOverpotential) continue;
    used.push(i);
  }
  if (used.length === 0) throw new InputError('window', 'no point lies in the chosen window/branch (empty window)');
  const J = used.map((i) => points[i].currentDensity);
  const H = used.map((i) => points[i].overpotential);
  const n = J.length;
  let jMaxA = 0;
  let jMaxC = 0;
  let nA = 0;
  let nC = 0;
  for (const j of J) {
    if (j > 0) {
      nA++;
      jMaxA = Math.max(jMaxA, j);
    } else if (j < 0) {
      nC++;
      jMaxC = Math.max(jMaxC, -j);
    }
  }
  if (nA + nC === 0) throw new InputError('points', 'all fitted points have zero current; the kinetics cannot be fitted');

  // ---- Options → layout.
  const electrons = options.electrons;
  if (electrons !== undefined && (typeof electrons !== 'number' || !Number.isFinite(electrons) || electrons <= 0)) {
    throw new InputError('electrons', 'must be a number of electrons > 0', electrons);
  }
  const fixedAa = checkAlpha(options.anodicTransferCoefficient, 'anodicTransferCoefficient');
  const fixedAc = checkAlpha(options.cathodicTransferCoefficient, 'cathodicTransferCoefficient');
  const tie = options.tieTransferCoefficients === true;
  if (tie && electrons === undefined) throw new InputError('electrons', 'is needed to tie α_a + α_c = n');
  // Relative tolerance 1e-12 on α_a + α_c = n: rounding of user input only (project choice).
  if (tie && fixedAa !== undefined && fixedAc !== undefined && Math.abs(fixedAa + fixedAc - (electrons as number)) > 1e-12 * (electrons as number)) {
    throw new InputError('tieTransferCoefficients', `α_a + α_c = ${fixedAa + fixedAc} differs from n = ${electrons}`);
  }
  if (tie && fixedAa !== undefined && !(fixedAa < (electrons as number))) throw new InputError('anodicTransferCoefficient', `must be below n = ${electrons} when tied`, fixedAa);
  if (tie && fixedAc !== undefined && !(fixedAc < (electrons as number))) throw new InputError('cathodicTransferCoefficient', `must be below n = ${electrons} when tied`, fixedAc);
  const limA = checkLimit(options.anodicLimitingCurrentDensity, 'anodicLimitingCurrentDensity');
  const limC = checkLimit(options.cathodicLimitingCurrentDensity, 'cathodicLimitingCurrentDensity');
  if (limA === 'fit' && nA === 0) throw new InputError('anodicLimitingCurrentDensity', "cannot be fitted without anodic points (j > 0); give a value or leave it out");
  if (limC === 'fit' && nC === 0) throw new InputError('cathodicLimitingCurrentDensity', "cannot be fitted without cathodic points (j < 0); give a value or leave it out");
  for (let k = 0; k < n; k++) {
    const j = J[k];
    if (typeof limA === 'number' && j >= limA) {
      throw new PhysicsError(`points[${used[k]}].currentDensity`, `j = ${j} A/m² is at or above the given anodic limiting current density ${limA} A/m²`);
    }
    if (typeof limC === 'number' && -j >= limC) {
      throw new PhysicsError(`points[${used[k]}].currentDensity`, `|j| = ${-j} A/m² is at or above the given cathodic limiting current density ${limC} A/m²`);
    }
  }
  const ruOpt = options.uncompensatedResistance ?? 0;
  if (ruOpt !== 'fit' && (typeof ruOpt !== 'number' || !Number.isFinite(ruOpt) || ruOpt < 0)) {
    throw new InputError('uncompensatedResistance', "must be a known area resistance ≥ 0 Ω·m² or 'fit'", ruOpt);
  }

  // ---- Starting values from quick Tafel lines on each branch.
  const st = startingValues(J, H, T, typeof ruOpt === 'number' ? ruOpt : 0);
  const alphaA0 = fixedAa ?? st.alphaA;
  const alphaC0 = fixedAc ?? st.alphaC;

  const names: string[] = ['ln j0'];
  const start: number[] = [st.lnJ0];
  let alphaMode: 'free' | 'tied' | 'tied-fixed';
  let iAa = -1;
  let iAc = -1;
  let iZ = -1;
  if (tie) {
    if (fixedAa !== undefined || fixedAc !== undefined) alphaMode = 'tied-fixed';
    else {
      alphaMode = 'tied';
      // Starting share α_a/n kept in [0.05, 0.95] so the logit start is finite (project choice).
      const share = Math.min(0.95, Math.max(0.05, alphaA0 / (alphaA0 + alphaC0)));
      iZ = start.length;
      names.push('logit(α_a/n)');
      start.push(Math.log(share / (1 - share)));
    }
  } else {
    alphaMode = 'free';
    if (fixedAa === undefined) {
      iAa = start.length;
      names.push('ln α_a');
      start.push(Math.log(alphaA0));
    }
    if (fixedAc === undefined) {
      iAc = start.length;
      names.push('ln α_c');
      start.push(Math.log(alphaC0));
    }
  }
  let iLa = -1;
  let iLc = -1;
  if (limA === 'fit') {
    iLa = start.length;
    names.push('ln(j_lim,a/j_max,a − 1)');
    start.push(st.phiA(jMaxA));
  }
  if (limC === 'fit') {
    iLc = start.length;
    names.push('ln(j_lim,c/j_max,c − 1)');
    start.push(st.phiC(jMaxC));
  }
  let iRu = -1;
  if (ruOpt === 'fit') {
    iRu = start.length;
    names.push('R_u');
    start.push(0);
  }
  const nFree = start.length;
  if (n <= nFree) {
    throw new InputError('points', `${n} point(s) in the fit but ${nFree} free parameter(s); at least ${nFree + 1} are needed for a fit with uncertainties`);
  }

  const lnJMaxA = nA > 0 ? Math.log(jMaxA) : 0;
  const lnJMaxC = nC > 0 ? Math.log(jMaxC) : 0;
  const layout: Layout = {
    names,
    start,
    unpack(theta) {
      const u: Unpacked = {
        lnJ0: theta[0],
        lnJ0Dep: [{ index: 0, d: 1 }],
        alphaA: 0,
        alphaADep: [],
        alphaC: 0,
        alphaCDep: [],
        lnLimA: Infinity,
        limADep: [],
        limAExcess: NaN,
        lnLimC: Infinity,
        limCDep: [],
        limCExcess: NaN,
        limA: Infinity,
        limC: Infinity,
        ru: typeof ruOpt === 'number' ? ruOpt : 0,
        ruDep: [],
      };
      if (alphaMode === 'free') {
        if (iAa >= 0) {
          u.alphaA = Math.exp(theta[iAa]);
          u.alphaADep = [{ index: iAa, d: u.alphaA }];
        } else u.alphaA = fixedAa as number;
        if (iAc >= 0) {
          u.alphaC = Math.exp(theta[iAc]);
          u.alphaCDep = [{ index: iAc, d: u.alphaC }];
        } else u.alphaC = fixedAc as number;
      } else if (alphaMode === 'tied') {
        const nEl = electrons as number;
        const sg = sigmoid(theta[iZ]);
        u.alphaA = nEl * sg;
        u.alphaC = nEl * sigmoid(-theta[iZ]); // = n − α_a, without cancellation at large z
        const d = nEl * sg * (1 - sg);
        u.alphaADep = [{ index: iZ, d }];
        u.alphaCDep = [{ index: iZ, d: -d }];
      } else {
        const nEl = electrons as number;
        u.alphaA = fixedAa ?? nEl - (fixedAc as number);
        u.alphaC = fixedAc ?? nEl - (fixedAa as number);
      }
      const la = unpackLimit(theta, iLa, lnJMaxA, jMaxA, limA);
      if (la) ({ ln: u.lnLimA, dep: u.limADep, excess: u.limAExcess, value: u.limA } = la);
      const lc = unpackLimit(theta, iLc, lnJMaxC, jMaxC, limC);
      if (lc) ({ ln: u.lnLimC, dep: u.limCDep, excess: u.limCExcess, value: u.limC } = lc);
      if (iRu >= 0) {
        u.ru = theta[iRu];
        u.ruDep = [{ index: iRu, d: 1 }];
      }
      return u;
    },
  };

  const model = new BvResidualModel(J, H, f, layout, jMaxA, jMaxC);
  const runFit = (s0: number[]): NonlinearFit =>
    levenbergMarquardt({ residuals: (th) => model.residuals(th), jacobian: (th) => model.jacobian(th), start: s0 });
  let fit = runFit(start);
  if (!fit.converged) {
    // Second start: symmetric α = 0.5 (the textbook symmetry-factor value, check-values §11,
    // from memory; only a start) and a limiting current at twice the largest |j| (φ = 0).
    // Project choice.
    const alt = start.slice();
    if (iAa >= 0) alt[iAa] = Math.log(0.5);
    if (iAc >= 0) alt[iAc] = Math.log(0.5);
    if (iZ >= 0) alt[iZ] = 0;
    if (iLa >= 0) alt[iLa] = 0;
    if (iLc >= 0) alt[iLc] = 0;
    model.resetWarmStart();
    const fit2 = runFit(alt);
    if (fit2.converged || fit2.rss < fit.rss) fit = fit2;
  }
  for (const w of fit.warnings) warnings.push(`Fit engine: ${w}`);
  const theta = fit.parameters;
  // A fitted limiting current that ran far beyond the data is not identifiable (no bending):
  // refit without it and say so, rather than report an arbitrary huge value.
  const runawayA = iLa >= 0 && theta[iLa] > PHI_RUNAWAY;
  const runawayC = iLc >= 0 && theta[iLc] > PHI_RUNAWAY;
  if (runawayA || runawayC) {
    const again = fitButlerVolmerWith(
      points,
      {
        ...options,
        anodicLimitingCurrentDensity: runawayA ? undefined : options.anodicLimitingCurrentDensity,
        cathodicLimitingCurrentDensity: runawayC ? undefined : options.cathodicLimitingCurrentDensity,
      },
      mayDropLimits,
    );
    const which = [runawayA ? 'anodic' : '', runawayC ? 'cathodic' : ''].filter(Boolean).join(' and ');
    again.warnings.unshift(
      `The ${which} limiting current could not be fitted: the estimate ran beyond ${LIMIT_RUNAWAY_FACTOR}× the largest measured current, i.e. the data show no mass-transport bending. It was left out; the result is the fit without it (the limit, if any, lies well above the measured range).`,
    );
    return again;
  }
  // One-branch data: the reverse-branch α (α_c for anodic-only data, α_a for cathodic-only)
  // rests only on the low-field points. When the free fit drives it out of the plausible
  // range (typically to 0 or ∞, where the model stops depending on it and its column of the
  // Jacobian vanishes) or it is not identifiable, it is not determined by these data: hold
  // it by a stated assumption and refit, rather than report an arbitrary value with
  // conditional intervals.
  const reverse = reverseAlphaIndex(nA, nC, iAa, iAc);
  if (reverse !== null) {
    const k = reverse.index;
    const value = Math.exp(theta[k]);
    const outside = value < ALPHA_PLAUSIBLE[0] || value > ALPHA_PLAUSIBLE[1];
    if (outside || fit.aliased[k] || fit.status === 'failed:singular') {
      const mainAlpha = reverse.name === 'α_c' ? fixedAa ?? Math.exp(theta[iAa]) : fixedAc ?? Math.exp(theta[iAc]);
      const side = reverse.name === 'α_c' ? 'anodic' : 'cathodic';
      const why = !outside
        ? 'the free fit could not separate it from the other parameters'
        : value < ALPHA_PLAUSIBLE[0]
          ? `the free fit drove it towards 0, below the plausible range ${ALPHA_PLAUSIBLE[0]}–${ALPHA_PLAUSIBLE[1]}`
          : `the free fit drove it towards infinity, above the plausible range ${ALPHA_PLAUSIBLE[0]}–${ALPHA_PLAUSIBLE[1]}`;
      // First hold that converges wins, trying every hold with the model as asked before any
      // with a limiting current dropped; otherwise the first is reported (not converged, with
      // its warnings).
      const holds = reverseAlphaHolds(reverse.name, value, electrons, mainAlpha);
      const tries = [...holds.map((h) => ({ ...h, drop: false })), ...(mayDropLimits && (iLa >= 0 || iLc >= 0) ? holds.map((h) => ({ ...h, drop: true })) : [])];
      let chosen: { result: ButlerVolmerFitResult; text: string } | null = null;
      for (const hold of tries) {
        const again = fitButlerVolmerWith(points, { ...options, ...hold.options }, hold.drop);
        if (chosen === null || (again.converged && !chosen.result.converged)) chosen = { result: again, text: hold.text };
        if (again.converged) break;
      }
      const again = (chosen as { result: ButlerVolmerFitResult; text: string }).result;
      again.warnings.unshift(
        `${reverse.name} could not be determined from these data: all fitted points are ${side} and ${why} (the low-field points do not resolve the reverse reaction). The fit was repeated with ${(chosen as { text: string }).text}; j0 depends on this assumption, so fix ${reverse.name} instead if it is known.`,
      );
      return again;
    }
  }
  // A fit with a fitted limiting current that did not converge (typically creeping along the
  // valley where the limit and R_u trade off): the limit is not determined by these data.
  // Refit without it; keep the result only if that fit converges.
  if (mayDropLimits && !fit.converged && (iLa >= 0 || iLc >= 0)) {
    const again = fitButlerVolmerWith(
      points,
      {
        ...options,
        anodicLimitingCurrentDensity: iLa >= 0 ? undefined : options.anodicLimitingCurrentDensity,
        cathodicLimitingCurrentDensity: iLc >= 0 ? undefined : options.cathodicLimitingCurrentDensity,
      },
      true,
    );
    if (again.converged) {
      const which = [iLa >= 0 ? 'anodic' : '', iLc >= 0 ? 'cathodic' : ''].filter(Boolean).join(' and ');
      again.warnings.unshift(
        `The ${which} limiting current could not be fitted: the fit with it did not converge (${fit.status}), i.e. these data do not determine it. It was left out; the result is the fit without it. If the data do bend at high current, give the limit from a separate measurement.`,
      );
      return again;
    }
  }
  const u = layout.unpack(theta);
  const dof = fit.degreesOfFreedom;
  // Standard errors only from a converged fit with a finite covariance; an SE of exactly 0 for
  // a free parameter with scatter present means the covariance was not available.
  const se = fit.standardErrors.map((v, k) => (!fit.converged || fit.aliased[k] || (v === 0 && fit.rss > 0) ? null : v));
  const t = tQuantile95(dof);

  // ---- Parameters.
  const seOf = (k: number) => (k >= 0 ? se[k] : null);
  const params = {} as ButlerVolmerParameters;
  params.exchangeCurrentDensity = mappedParameter(theta[0], seOf(0), t, Math.exp, Math.exp(theta[0]), 'A/m²', 'interval from the interval on ln j0 (asymmetric)');
  let aa: FittedParameter;
  let ac: FittedParameter;
  if (alphaMode === 'free') {
    aa = iAa >= 0 ? mappedParameter(theta[iAa], seOf(iAa), t, Math.exp, Math.exp(theta[iAa]), '1') : fixedParameter(u.alphaA, '1');
    ac = iAc >= 0 ? mappedParameter(theta[iAc], seOf(iAc), t, Math.exp, Math.exp(theta[iAc]), '1') : fixedParameter(u.alphaC, '1');
  } else if (alphaMode === 'tied') {
    const nEl = electrons as number;
    const sg = sigmoid(theta[iZ]);
    const dA = nEl * sg * (1 - sg);
    aa = mappedParameter(theta[iZ], seOf(iZ), t, (z) => nEl * sigmoid(z), dA, '1', `tied: α_a + α_c = ${nEl}`);
    // α_c = n·σ(−z) (= n − α_a exactly, without the cancellation of n·(1 − σ(z)) at large z).
    ac = mappedParameter(theta[iZ], seOf(iZ), t, (z) => nEl * sigmoid(-z), -dA, '1', `tied: α_a + α_c = ${nEl}`);
  } else {
    aa = fixedParameter(u.alphaA, '1', fixedAa !== undefined ? undefined : `from the tie α_a = n − α_c (n = ${electrons})`);
    ac = fixedParameter(u.alphaC, '1', fixedAc !== undefined ? undefined : `from the tie α_c = n − α_a (n = ${electrons})`);
  }
  aa.note = aa.note ?? 'anodic transfer coefficient (IUPAC 2014: the reported quantity)';
  ac.note = ac.note ?? 'cathodic transfer coefficient (IUPAC 2014: the reported quantity)';
  params.anodicTransferCoefficient = aa;
  params.cathodicTransferCoefficient = ac;
  const slopeA = tafelSlopeFromTransferCoefficient(aa, f, 'anodic', warnings);
  const slopeC = tafelSlopeFromTransferCoefficient(ac, f, 'cathodic', warnings);
  if (slopeA) params.anodicTafelSlope = slopeA;
  if (slopeC) params.cathodicTafelSlope = slopeC;
  const mainBranch: Branch = options.branch ?? (nC > nA ? 'cathodic' : 'anodic');
  const mainSlope = mainBranch === 'anodic' ? slopeA : slopeC;
  if (!mainSlope) {
    throw new PhysicsError(
      'tafelSlope',
      `the fitted ${mainBranch} transfer coefficient ran to 0, so the ${mainBranch} Tafel slope is unbounded: the overpotential hardly follows the current (a mass-transport plateau?); fit a limiting current, narrow the window, or fix the transfer coefficient`,
    );
  }
  params.tafelSlope = { ...mainSlope };
  params.tafelSlope.note = options.branch ? `${mainBranch} branch (as requested)` : `${mainBranch} branch (the one with more fitted points)`;
  const profileOf = (k: number): ProfileEnds | null =>
    fit.converged && seOf(k) !== null ? profileInterval(model, theta, fit.covariance, k, fit.rss, dof, t) : null;
  if (iLa >= 0) {
    params.anodicLimitingCurrentDensity = limitParameter(theta[iLa], seOf(iLa), t, jMaxA, profileOf(iLa), 'anodic', warnings);
  } else if (typeof limA === 'number') params.anodicLimitingCurrentDensity = fixedParameter(limA, 'A/m²');
  if (iLc >= 0) {
    params.cathodicLimitingCurrentDensity = limitParameter(theta[iLc], seOf(iLc), t, jMaxC, profileOf(iLc), 'cathodic', warnings);
  } else if (typeof limC === 'number') params.cathodicLimitingCurrentDensity = fixedParameter(limC, 'A/m²', 'magnitude; fixed by the user, not fitted');
  if (iRu >= 0) params.uncompensatedResistance = symmetricParameter(theta[iRu], seOf(iRu), dof, 'Ω·m²');
  else if (typeof ruOpt === 'number' && ruOpt > 0) params.uncompensatedResistance = fixedParameter(ruOpt, 'Ω·m²', 'known value, included as j·R_u');
  if (electrons !== undefined) {
    const src = mainBranch === 'anodic' ? aa : ac;
    const reading: FittedParameter = {
      value: src.value / electrons,
      standardError: src.standardError === null ? null : src.standardError / electrons,
      ci95: src.ci95 ? [src.ci95[0] / electrons, src.ci95[1] / electrons] : null,
      unit: '1',
      note:
        mainBranch === 'anodic'
          ? `single-step reading (1 − β) = α_a/n with n = ${electrons}; meaningful only for one elementary step (IUPAC 2014: α is the reported quantity)`
          : `single-step reading β = α_c/n with n = ${electrons}; meaningful only for one elementary step (IUPAC 2014: α is the reported quantity)`,
    };
    if (src.fixed) reading.fixed = true;
    params.singleStepSymmetryReading = reading;
  }

  // ---- Working-branch (ln j0, α) pair for the cell model's uncertainty propagation.
  let working: WorkingBranchUncertainty | undefined;
  if (fit.converged && se[0] !== null) {
    const anodicMain = mainBranch === 'anodic';
    const alpha = anodicMain ? u.alphaA : u.alphaC;
    // Free α = e^θ: dα/dθ = α; tied α_a = n·σ(z), α_c = n − α_a: ±n·σ(1 − σ); held α: no variance.
    let k = -1;
    let dAlpha = 0;
    if (alphaMode === 'free') {
      k = anodicMain ? iAa : iAc;
      dAlpha = alpha;
    } else if (alphaMode === 'tied') {
      k = iZ;
      const sg = sigmoid(theta[iZ]);
      dAlpha = (anodicMain ? 1 : -1) * (electrons as number) * sg * (1 - sg);
    }
    if (k < 0 || se[k] !== null) working = workingBranchPair(mainBranch, theta[0], alpha, k, dAlpha, fit.covariance);
  }

  // ---- Residual records, statistics, curve.
  const fittedEta = model.modelEta(theta);
  const usedSet = new Map<number, number>();
  used.forEach((i, k) => usedSet.set(i, k));
  const residuals: ResidualRecord[] = points.map((pt, i) => {
    const k = usedSet.get(i);
    let fitted: number | null = k !== undefined ? fittedEta[k] : model.etaAt(pt.currentDensity, u);
    if (fitted !== null && !Number.isFinite(fitted)) fitted = null;
    return {
      currentDensity: pt.currentDensity,
      overpotential: pt.overpotential,
      fitted,
      residual: fitted === null ? null : pt.overpotential - fitted,
      used: k !== undefined,
    };
  });
  const resUsed = used.map((_, k) => H[k] - fittedEta[k]);
  // R² of the overpotential after a known j·R_u is subtracted (as for the Tafel line; see
  // FitStatistics.rSquared); residuals, RSS and the information criteria are unaffected.
  const knownRu = typeof ruOpt === 'number' ? ruOpt : 0;
  const statistics = fitStatistics(resUsed, knownRu > 0 ? H.map((h, k) => h - J[k] * knownRu) : H, nFree);
  const curve = model.curve(u, nA > 0 ? jMaxA : 0, nC > 0 ? jMaxC : 0, minAbs(J));

  // ---- Identifiability and plausibility warnings.
  const corr = safeCorrelation(fit);
  const label = (k: number) => names[k];
  fit.aliased.forEach((a, k) => {
    if (a) warnings.push(`${label(k)} cannot be determined from these data (the fit is rank-deficient in it); its value is arbitrary.`);
  });
  const logLike = new Set([0, iAa, iAc, iLa, iLc].filter((k) => k >= 0));
  for (const k of logLike) {
    const s = se[k];
    if (s !== null && s > MAX_RELATIVE_SE) {
      warnings.push(`${label(k).replace(/^ln /, '')} is poorly determined: its relative standard error exceeds ${MAX_RELATIVE_SE * 100} % (the interval spans more than a factor e^(2t·SE)).`);
    }
  }
  for (let a = 0; a < nFree; a++) {
    for (let b = a + 1; b < nFree; b++) {
      if (Math.abs(corr[a][b]) > MAX_CORRELATION) {
        warnings.push(`${label(a)} and ${label(b)} are almost fully correlated (r = ${corr[a][b].toFixed(3)}): these data cannot separate them; fix one of them or extend the data.`);
      }
    }
  }
  for (const [nm, v, free] of [
    ['α_a', u.alphaA, iAa >= 0 || iZ >= 0],
    ['α_c', u.alphaC, iAc >= 0 || iZ >= 0],
  ] as const) {
    if (free && (v < ALPHA_PLAUSIBLE[0] || v > ALPHA_PLAUSIBLE[1])) {
      warnings.push(`The fitted ${nm} = ${v.toPrecision(3)} lies outside the plausible range ${ALPHA_PLAUSIBLE[0]}–${ALPHA_PLAUSIBLE[1]}; the fit probably ran to a bound.`);
    }
  }
  if (iRu >= 0 && theta[iRu] < 0) {
    warnings.push('The fitted uncompensated resistance is negative, which is unphysical; fix R_u from impedance or current-interrupt data instead.');
  }
  const twoRT = 2 * thermalVoltage(T);
  const nearZero = H.filter((h) => Math.abs(h) < twoRT).length;
  if (nC === 0 && iAc >= 0) {
    warnings.push(`All fitted points are anodic: α_c rests only on the ${nearZero} point(s) with |η| < ${(twoRT * 1000).toFixed(0)} mV, where the reverse reaction matters; expect it to be poorly determined (fix it, or tie α_a + α_c = n).`);
  }
  if (nA === 0 && iAa >= 0) {
    warnings.push(`All fitted points are cathodic: α_a rests only on the ${nearZero} point(s) with |η| < ${(twoRT * 1000).toFixed(0)} mV, where the reverse reaction matters; expect it to be poorly determined (fix it, or tie α_a + α_c = n).`);
  }
  if (!fit.converged) warnings.push(`The fit did not converge (${fit.status}): ${fit.message} The parameters shown are the last iterate and must not be used.`);

  let etaMin = Infinity;
  let etaMax = -Infinity;
  for (const h of H) {
    etaMin = Math.min(etaMin, Math.abs(h));
    etaMax = Math.max(etaMax, Math.abs(h));
  }
  const result: ButlerVolmerFitResult = {
    model: 'butler-volmer',
    parameters: params,
    statistics,
    window: {
      minOverpotential: etaMin,
      maxOverpotential: etaMax,
      rule: automatic
        ? `All points${options.branch ? ` of the ${options.branch} branch` : ''}: the Butler–Volmer law holds at every overpotential, so no window is needed.`
        : `Manual window: points with |η| (as given) between the stated bounds${options.branch ? ` on the ${options.branch} branch` : ''}.`,
      automatic,
    },
    correlation: { names, matrix: corr },
    residuals,
    curve,
    converged: fit.converged,
    status: fit.status,
    message: fit.message,
    iterations: fit.iterations,
    evaluations: fit.evaluations,
    warnings,
  };
  if (working) result.workingBranchUncertainty = working;
  return result;
}

/**
 * Working-branch pair (ln j0, α) from the covariance Σ of the fitted vector θ (θ_0 = ln j0):
 * α depends on the single parameter θ_k with derivative dα/dθ_k = `dAlpha` (k < 0: α held,
 * no variance). Delta method: Var(α) = (dα/dθ_k)²·Σ_kk, Cov(ln j0, α) = (dα/dθ_k)·Σ_0k; for
 * the log-parametrised α = e^θ this gives SE(α) = α·SE(ln α) and leaves the correlation of
 * (ln j0, ln α) unchanged; for the tied α_c = n − α_a its sign flips.
 * Source: delta method (working-branch.ts).
 */
function workingBranchPair(branch: Branch, lnJ0: number, alpha: number, k: number, dAlpha: number, cov: number[][]): WorkingBranchUncertainty | undefined {
  const varAlpha = k >= 0 ? dAlpha * dAlpha * cov[k][k] : 0;
  const covLA = k >= 0 ? dAlpha * cov[0][k] : 0;
  return pairFromCovariance(branch, lnJ0, cov[0][0], alpha, varAlpha, covLA);
}

/** Ends of a profile-likelihood interval on φ; an end is null when the data do not bound it. */
interface ProfileEnds {
  low: number | null;
  high: number | null;
}

/**
 * One evaluated point of a profile: distance d = |φ − φ̂| ≥ 0 from the estimate along the
 * search direction, h = τ(φ) − t (negative inside the interval), and the full parameter
 * vector of the profile fit there (warm start for the next one).
 */
interface ProfilePoint {
  d: number;
  h: number;
  theta: number[];
}

/**
 * 95 % profile-likelihood interval of parameter k (θ_k = φ of a fitted limiting current):
 * the set of φ whose profile residual sum of squares RSS(φ), minimised over all other
 * parameters with φ held, stays within RSS(φ) ≤ RSS_min·(1 + t²/dof), t = t_{0.975, dof}
 * (the F-based likelihood interval for one parameter of a least-squares fit).
 *
 * Method. The end condition is written with the profile t statistic
 *   τ(φ) = √((RSS(φ) − RSS_min)/s²),  s² = RSS_min/dof,  end where τ = t,
 * which is exactly linear in φ for a linear model (τ = |φ − φ̂|/SE) and nearly linear for
 * a mildly nonlinear one, so a secant search converges in a few profile fits (typically two
 * per end). Each end is found on h(d) = τ − t in d = |φ − φ̂|: first trial at the linearised
 * end d = min(t·SE, PROFILE_FIRST_STEP); while h < 0, secant extrapolation through the last
 * two points (at most a factor PROFILE_MAX_EXPANSION further out); once bracketed, the
 * secant through the last two fits when it stays inside the bracket, else the Illinois
 * variant of regula falsi. The search stops when the last correction is below
 * PROFILE_RELATIVE_TOLERANCE of d and returns the corrected estimate. Warm starts: the
 * first trial starts the other parameters on the first-order profile trace
 * θ_i(φ) ≈ θ̂_i + (Σ_ik/Σ_kk)(φ − φ̂) from the fit covariance Σ; later trials interpolate
 * linearly between the two last profile solutions. Each profile fit is a short
 * Levenberg–Marquardt run (PROFILE_LM_OPTIONS) on the model's own kernels and per-point
 * warm-started η solves. Early stop: the upper end is open (null) as soon as τ < t at
 * φ = PHI_RUNAWAY (j_lim = 100·j_max); the lower end is open when τ < t at PROFILE_PHI_LOW.
 * Returns null when a profile fit cannot be evaluated or an end is not found within
 * PROFILE_MAX_FITS fits (the caller then uses the linearised interval).
 * Sources: profile t statistic and likelihood intervals, D. M. Bates and D. G. Watts,
 * Nonlinear Regression Analysis and Its Applications, Wiley (1988), §6.1 (profile t, profile
 * trace; from memory); secant search (textbook numerical analysis); Illinois regula falsi,
 * Dowell & Jarratt, BIT 11 (1971) 168–174 (from memory).
 */
function profileInterval(model: BvResidualModel, thetaHat: number[], covariance: number[][], k: number, rssMin: number, dof: number, t: number): ProfileEnds | null {
  const varK = covariance[k]?.[k];
  if (!(dof > 0) || !(rssMin > 0) || !(varK > 0) || !Number.isFinite(varK)) return null;
  const seK = Math.sqrt(varK);
  const s2 = rssMin / dof;
  const phiHat = thetaHat[k];
  const p = thetaHat.length;
  // First-order profile trace: ∂θ_i/∂θ_k = Σ_ik/Σ_kk along the profile.
  const trace = thetaHat.map((_, i) => (i === k ? 1 : covariance[i][k] / varK));
  if (!trace.every(Number.isFinite)) return null;
  // Buffers reused by every profile fit: the full vector (θ_k held) and the reduced start.
  const full = thetaHat.slice();
  const reducedStart = new Array<number>(p - 1).fill(0);
  const expand = (q: number[]): number[] => {
    for (let i = 0, r = 0; i < p; i++) if (i !== k) full[i] = q[r++];
    return full;
  };
  const problem = {
    residuals: (q: number[]) => model.residuals(expand(q)),
    jacobian: (q: number[]) => model.jacobian(expand(q), k),
    start: reducedStart,
  };
  const fitFrom = (phi: number, warm: number[]): { rss: number; theta: number[] } | null => {
    for (let i = 0, r = 0; i < p; i++) if (i !== k) reducedStart[r++] = warm[i];
    if (!reducedStart.every(Number.isFinite)) return null;
    full[k] = phi;
    let r: NonlinearFit;
    try {
      r = levenbergMarquardt(problem, PROFILE_LM_OPTIONS);
    } catch {
      return null; // e.g. residuals not finite at the warm start
    }
    // A rank-deficient profile fit still has a well-defined minimum RSS.
    if (!Number.isFinite(r.rss) || !(r.converged || r.status === 'failed:singular')) return null;
    const theta = expand(r.parameters).slice();
    theta[k] = phi;
    return { rss: r.rss, theta };
  };
  const pointAt = (dir: 1 | -1, d: number, warm: number[], fallback: number[]): ProfilePoint | null => {
    const phi = phiHat + dir * d;
    const r = fitFrom(phi, warm) ?? fitFrom(phi, fallback);
    if (r === null) return null;
    return { d, h: Math.sqrt(Math.max(0, r.rss - rssMin) / s2) - t, theta: r.theta };
  };
  const interpolate = (a: ProfilePoint, b: ProfilePoint, d: number): number[] => {
    const w = (d - a.d) / (b.d - a.d);
    return Number.isFinite(w) ? a.theta.map((v, i) => v + (b.theta[i] - v) * w) : b.theta;
  };
  /** φ at one end; null = open (not reached within the search range); undefined = failed. */
  const end = (dir: 1 | -1): number | null | undefined => {
    const reach = dir > 0 ? PHI_RUNAWAY - phiHat : phiHat - PROFILE_PHI_LOW;
    if (!(reach > 0)) return null;
    const centre: ProfilePoint = { d: 0, h: -t, theta: thetaHat };
    let prev = centre;
    let last = centre;
    let d = Math.min(t * seK, PROFILE_FIRST_STEP, reach);
    let fits = 0;
    // 1. Bracket: secant extrapolation outwards while τ < t.
    for (;;) {
      if (fits++ >= PROFILE_MAX_FITS) return undefined;
      const warm = last === centre ? thetaHat.map((v, i) => v + dir * d * trace[i]) : interpolate(prev, last, d);
      const pt = pointAt(dir, d, warm, last.theta);
      if (pt === null) return undefined;
      prev = last;
      last = pt;
      if (pt.h >= 0) break;
      if (pt.d >= reach) return null; // τ < t over the whole search range: open end
      const slope = (last.h - prev.h) / (last.d - prev.d);
      let next = slope > 0 ? last.d - last.h / slope : NaN;
      if (!(next > last.d)) next = PROFILE_MAX_EXPANSION * last.d;
      next = Math.min(next, PROFILE_MAX_EXPANSION * last.d, reach);
      if (next - last.d <= Math.max(PROFILE_RELATIVE_TOLERANCE * next, PROFILE_ABSOLUTE_TOLERANCE)) return phiHat + dir * next;
      d = next;
    }
    // 2. Refine inside the bracket [inside, outside] by the Illinois variant of regula falsi
    //    (the kept end's h is halved when the same end is kept twice in a row).
    let inD = prev.d;
    let inH = prev.h;
    let outD = last.d;
    let outH = last.h;
    let kept = 0;
    let estimate = inD - (inH * (outD - inD)) / (outH - inH);
    while (fits++ < PROFILE_MAX_FITS) {
      const tol = Math.max(PROFILE_RELATIVE_TOLERANCE * estimate, PROFILE_ABSOLUTE_TOLERANCE);
      if (outD - inD <= tol) return phiHat + dir * estimate;
      const pt = pointAt(dir, estimate, interpolate(prev, last, estimate), last.theta);
      if (pt === null) return undefined;
      prev = last;
      last = pt;
      if (pt.h >= 0) {
        outD = pt.d;
        outH = pt.h;
        if (kept === 1) inH /= 2;
        kept = 1;
      } else {
        inD = pt.d;
        inH = pt.h;
        if (kept === -1) outH /= 2;
        kept = -1;
      }
      // Secant through the last two fits when it stays inside the bracket, else regula falsi.
      const slope = (last.h - prev.h) / (last.d - prev.d);
      let next = slope > 0 ? last.d - last.h / slope : NaN;
      if (!(next > inD && next < outD)) next = inD - (inH * (outD - inD)) / (outH - inH);
      const done = Math.abs(next - pt.d) <= Math.max(PROFILE_RELATIVE_TOLERANCE * next, PROFILE_ABSOLUTE_TOLERANCE);
      estimate = next;
      if (done) return phiHat + dir * estimate;
    }
    return undefined;
  };
  const high = end(1);
  if (high === undefined) return null;
  const low = end(-1);
  if (low === undefined) return null;
  return { low, high };
}

/**
 * Fitted limiting current j_lim = j_max·(1 + e^φ) [A/m²]: SE by the delta method; the 95 %
 * interval from the profile likelihood when available (a weakly determined limit has a
 * very skewed likelihood that the linearised interval misrepresents), else mapped from
 * the linearised interval on φ. An open upper end gives ci95 null and a warning with the
 * lower bound the data do support; an open lower end is j_max (the limit must exceed it).
 */
function limitParameter(phi: number, se: number | null, t: number, jMax: number, profile: ProfileEnds | null, branch: Branch, warnings: string[]): FittedParameter {
  const g = (p: number) => jMax * (1 + Math.exp(p));
  const magnitude = branch === 'cathodic' ? 'magnitude; ' : '';
  if (profile === null) {
    return mappedParameter(phi, se, t, g, jMax * Math.exp(phi), 'A/m²', `${magnitude}j_lim = j_max·(1 + e^φ); interval mapped from the linearised interval on φ (asymmetric)`);
  }
  const out = mappedParameter(phi, se, t, g, jMax * Math.exp(phi), 'A/m²', `${magnitude}j_lim = j_max·(1 + e^φ); 95 % profile-likelihood interval`);
  const low = profile.low === null ? jMax : g(profile.low);
  if (profile.high === null) {
    out.ci95 = null;
    warnings.push(
      `The ${branch} limiting current has no upper bound at 95 % confidence: the data are about as well described without mass-transport bending (j_lim ≥ ${(LIMIT_RUNAWAY_FACTOR * jMax).toPrecision(3)} A/m² cannot be excluded). They support only j_lim > ${low.toPrecision(3)} A/m²; treat the value ${g(phi).toPrecision(3)} A/m² as indicative.`,
    );
  } else out.ci95 = [low, g(profile.high)];
  return out;
}

/** Index and name of the free reverse-branch transfer coefficient on one-branch data, else null. */
function reverseAlphaIndex(nA: number, nC: number, iAa: number, iAc: number): { index: number; name: 'α_a' | 'α_c' } | null {
  if (nC === 0 && nA > 0 && iAc >= 0) return { index: iAc, name: 'α_c' };
  if (nA === 0 && nC > 0 && iAa >= 0) return { index: iAa, name: 'α_a' };
  return null;
}

/**
 * How to hold an undetermined reverse-branch α on one-branch data (see fitButlerVolmer), in
 * order of preference: with n known and the main-branch α below n, the single-step relation
 * α_a + α_c = n (IUPAC 2014: valid for one rate-determining step; the relation the fit already
 * suggests to users); then α fixed at the edge of the plausible range it ran towards (for an
 * α still inside the range, at its value).
 */
function reverseAlphaHolds(
  name: 'α_a' | 'α_c',
  value: number,
  electrons: number | undefined,
  mainAlpha: number,
): { options: Partial<ButlerVolmerFitOptions>; text: string }[] {
  const holds: { options: Partial<ButlerVolmerFitOptions>; text: string }[] = [];
  if (electrons !== undefined && mainAlpha < electrons) {
    holds.push({ options: { tieTransferCoefficients: true }, text: `α_a + α_c = n = ${electrons} (the single-step relation, IUPAC 2014; it holds for one rate-determining step)` });
  }
  const edge = value < ALPHA_PLAUSIBLE[0] ? ALPHA_PLAUSIBLE[0] : value > ALPHA_PLAUSIBLE[1] ? ALPHA_PLAUSIBLE[1] : value;
  const key = name === 'α_c' ? 'cathodicTransferCoefficient' : 'anodicTransferCoefficient';
  const reason =
    electrons === undefined
      ? 'no electron number n was given to tie α_a + α_c = n'
      : mainAlpha < electrons
        ? 'the fit tied by α_a + α_c = n did not converge'
        : `the main-branch α ≥ n = ${electrons} rules out the tie α_a + α_c = n`;
  holds.push({ options: { [key]: edge }, text: `${name} held at ${edge.toPrecision(3)} (${reason})` });
  return holds;
}

function checkAlpha(v: unknown, path: string): number | undefined {
  if (v === undefined) return undefined;
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) throw new InputError(path, 'must be a transfer coefficient > 0', v);
  return v;
}

function checkLimit(v: unknown, path: string): number | 'fit' | undefined {
  if (v === undefined || v === 'fit') return v;
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) throw new InputError(path, "must be a limiting current density magnitude > 0 A/m² or 'fit'", v);
  return v;
}

function minAbs(J: number[]): number {
  let m = Infinity;
  for (const j of J) if (j !== 0) m = Math.min(m, Math.abs(j));
  return m;
}

/**
 * Parameter q = g(θ) for a monotone g: value g(θ̂), SE |g'(θ̂)|·SE(θ) (delta method), interval
 * the image of θ̂ ± t·SE (ordered). `gPrime` is g'(θ̂).
 */
function mappedParameter(
  thetaHat: number,
  seTheta: number | null,
  t: number,
  g: (th: number) => number,
  gPrime: number,
  unit: string,
  note?: string,
): FittedParameter {
  const value = g(thetaHat);
  const out: FittedParameter = { value, standardError: null, ci95: null, unit };
  if (note) out.note = note;
  if (seTheta !== null && Number.isFinite(seTheta)) {
    const seV = Math.abs(gPrime) * seTheta;
    out.standardError = Number.isFinite(seV) ? seV : null;
    const lo = g(thetaHat - t * seTheta);
    const hi = g(thetaHat + t * seTheta);
    const a = Math.min(lo, hi);
    const b = Math.max(lo, hi);
    out.ci95 = Number.isFinite(a) && Number.isFinite(b) ? [a, b] : null;
  }
  return out;
}

/**
 * Tafel slope per decade of one branch from its transfer coefficient:
 *   b = ln10/(α·f), f = F/(RT) [1/V]  →  b [V/decade]; α dimensionless (> 0).
 * Standard error by the delta method, SE(b) = b·SE(α)/α; the 95 % interval is the image of
 * α's interval under the decreasing map α ↦ ln10/(α·f), i.e. [b(α_hi), b(α_lo)].
 * Guards (never Infinity): when α's interval reaches 0 or below at working precision (α_lo ≤ 0,
 * or b(α_lo) overflows) the slope has no finite upper 95 % bound — ci95 is null and a warning
 * in `warnings` gives the one-sided statement the data support (b > b(α_hi)), as for an open
 * limiting-current interval; a non-finite SE is reported as null. When α itself is ≤ 0 at
 * working precision the slope is unbounded and null is returned (the caller omits it or
 * refuses the fit). Source: Tafel slope b = 2.303·RT/(αF) (domain.md §3); delta method and
 * interval mapping (common practice).
 */
export function tafelSlopeFromTransferCoefficient(alpha: FittedParameter, f: number, branch: Branch, warnings: string[]): FittedParameter | null {
  const value = Math.LN10 / (alpha.value * f);
  const name = branch === 'anodic' ? 'α_a' : 'α_c';
  if (!(alpha.value > 0) || !Number.isFinite(value)) {
    warnings.push(
      `The ${branch} Tafel slope is not reported: the fitted ${name} = ${alpha.value.toPrecision(3)} is zero at working precision, so the slope ln10/(α·f) is unbounded (these data do not determine ${name}).`,
    );
    return null;
  }
  if (alpha.fixed) return { value, standardError: 0, ci95: [value, value], unit: 'V/decade', fixed: true, note: 'from a fixed transfer coefficient' };
  const out: FittedParameter = { value, standardError: null, ci95: null, unit: 'V/decade' };
  if (alpha.standardError !== null) {
    const se = (value * alpha.standardError) / alpha.value;
    out.standardError = Number.isFinite(se) ? se : null;
  }
  if (alpha.ci95) {
    const [aLo, aHi] = alpha.ci95;
    const low = Math.LN10 / (aHi * f);
    const high = Math.LN10 / (aLo * f);
    if (aLo > 0 && Number.isFinite(high) && Number.isFinite(low) && low > 0) {
      out.ci95 = [low, high];
    } else {
      out.note = `no finite upper 95 % bound: the interval on ${name} reaches 0`;
      const supported = aHi > 0 && Number.isFinite(low) && low > 0 ? ` The data support only b > ${(low * 1000).toPrecision(3)} mV/decade.` : '';
      warnings.push(
        `The ${branch} Tafel slope has no finite upper bound at 95 % confidence: the interval on ${name} reaches 0 (${aLo.toPrecision(3)} to ${aHi.toPrecision(3)}).${supported} Treat the value ${(value * 1000).toPrecision(3)} mV/decade as indicative.`,
      );
    }
  }
  return out;
}

function safeCorrelation(fit: NonlinearFit): number[][] {
  try {
    return correlationMatrix(fit.covariance);
  } catch {
    return fit.covariance.map((row, i) => row.map((_, j) => (i === j ? 1 : 0)));
  }
}

interface Starts {
  lnJ0: number;
  alphaA: number;
  alphaC: number;
  phiA(jMax: number): number;
  phiC(jMax: number): number;
}

/**
 * Starting values: straight Tafel lines (η vs ln|j|) on each branch through the points above
 * the low-field limit (or the upper half of the branch when fewer than 3 are there); j0
 * from their intercepts (mean of ln j0), α from their slopes; else the low-field slope
 * R_ct⁻¹ = dj/dη gives j0 = (dj/dη)/(f·(α_a + α_c)). The limiting-current start comes from
 * the largest point: 1/j_lim = 1/j − 1/j_kinetic (series combination).
 * The heuristics here are project choices and only set the starting point: at least 3
 * high-field points per line (else the upper half of the branch), the lower 80 % of them when
 * there are 6 or more, α = 0.5 when a branch has no line, no limit start unless the top point
 * lies more than ln-ratio 1e-3 below the line, and the start φ clamped to [−3, 5].
 */
function startingValues(J: number[], H: number[], T: number, knownRu: number): Starts {
  const f = faradayOverRT(T);
  const limit = lowFieldLimit(T, 1);
  const lines: { branch: Branch; a: number; b: number }[] = [];
  for (const branch of ['anodic', 'cathodic'] as const) {
    const s = branch === 'anodic' ? 1 : -1;
    const idx: number[] = [];
    for (let i = 0; i < J.length; i++) if (Math.sign(J[i]) === s && s * (H[i] - J[i] * knownRu) > 0) idx.push(i);
    if (idx.length < 2) continue;
    idx.sort((p, q) => s * H[p] - s * H[q]);
    let sel = idx.filter((i) => s * (H[i] - J[i] * knownRu) >= limit);
    if (sel.length < 3) sel = idx.slice(Math.floor(idx.length / 2));
    // Keep the lower 80 % of the high-field points to stay clear of mass-transport bending.
    if (sel.length >= 6) sel = sel.slice(0, Math.ceil(sel.length * 0.8));
    const x = sel.map((i) => Math.log(Math.abs(J[i])));
    const y = sel.map((i) => s * (H[i] - J[i] * knownRu));
    if (Math.max(...x) - Math.min(...x) <= 0) continue;
    try {
      const fit = linearLeastSquares(
        x.map((v) => [1, v]),
        y,
        { hasIntercept: true, refinementSteps: 0 },
      );
      const [a, b] = fit.coefficients;
      if (b > 0 && Number.isFinite(a)) lines.push({ branch, a, b });
    } catch {
      // no usable line on this branch
    }
  }
  const clampAlpha = (v: number) => Math.min(ALPHA_START_RANGE[1], Math.max(ALPHA_START_RANGE[0], v));
  let alphaA = 0.5;
  let alphaC = 0.5;
  const lnJ0s: number[] = [];
  const lineOf: Partial<Record<Branch, { a: number; b: number }>> = {};
  for (const l of lines) {
    const alpha = clampAlpha(1 / (f * l.b));
    if (l.branch === 'anodic') alphaA = alpha;
    else alphaC = alpha;
    lnJ0s.push(-l.a / l.b);
    lineOf[l.branch] = l;
  }
  let lnJ0: number;
  if (lnJ0s.length > 0) lnJ0 = lnJ0s.reduce((p, q) => p + q, 0) / lnJ0s.length;
  else {
    // Low-field slope through the origin: j ≈ (j0 f (α_a+α_c)) η.
    let sxy = 0;
    let sxx = 0;
    const rt = 1 / f;
    for (let i = 0; i < J.length; i++) {
      const eta = H[i] - J[i] * knownRu;
      if (Math.abs(eta) < rt) {
        sxy += eta * J[i];
        sxx += eta * eta;
      }
    }
    const slope = sxx > 0 ? sxy / sxx : NaN;
    lnJ0 = slope > 0 ? Math.log(slope / (f * (alphaA + alphaC))) : Math.log(minAbs(J));
  }
  const phiFrom = (branch: Branch, jMax: number): number => {
    const l = lineOf[branch];
    if (!l || !(jMax > 0)) return 0;
    const s = branch === 'anodic' ? 1 : -1;
    let yTop = -Infinity;
    for (let i = 0; i < J.length; i++) if (Math.sign(J[i]) === s && Math.abs(J[i]) === jMax) yTop = s * (H[i] - J[i] * knownRu);
    const lnJk = (yTop - l.a) / l.b;
    const lnRatio = lnJk - Math.log(jMax); // ln(j_k/j)
    if (!(lnRatio > 1e-3)) return 0;
    // j_lim/j_max − 1 = 1/(1 − j/j_k) − 1 = 1/(j_k/j − 1)
    const excess = 1 / Math.expm1(lnRatio);
    return Math.min(5, Math.max(-3, Math.log(excess)));
  };
  return { lnJ0, alphaA, alphaC, phiA: (jm) => phiFrom('anodic', jm), phiC: (jm) => phiFrom('cathodic', jm) };
}

/**
 * Residuals and analytic Jacobian of the BV fit, with warm-started η solves (each point's last
 * solution moved to first order by the parameter change) and a one-entry cache (the Jacobian
 * is usually requested at the point whose residuals were just computed). Kernels and
 * per-point buffers are allocated once and reused by the main fit and its profile fits.
 */
class BvResidualModel {
  private readonly n: number;
  private readonly x: Float64Array; // last |η_BV| per point (warm start)
  private readonly lnAbsJ: Float64Array; // ln|j| per point (constant; 0 where j = 0)
  private readonly ev: BranchEval = newBranchEval();
  private cacheTheta: number[] | null = null;
  private cacheU: Unpacked | null = null;
  private cacheRes: number[] = [];
  // Per-point derivative factors at the cached θ: ∂η/∂(ln j0, α_a, α_c, ln j_lim,a, ln j_lim,c).
  private readonly dLnJ0: Float64Array;
  private readonly dAa: Float64Array;
  private readonly dAc: Float64Array;
  private readonly dLa: Float64Array;
  private readonly dLc: Float64Array;
  private readonly kern: { anodic: BranchKernel; cathodic: BranchKernel };
  /** Scratch row of the Jacobian assembly (reused). */
  private rowScratch: Float64Array = new Float64Array(0);

  constructor(
    private readonly J: number[],
    private readonly H: number[],
    private readonly f: number,
    private readonly layout: Layout,
    private readonly jMaxA: number,
    private readonly jMaxC: number,
  ) {
    this.n = J.length;
    this.x = new Float64Array(this.n).fill(NaN);
    this.lnAbsJ = Float64Array.from(J, (j) => (j === 0 ? 0 : Math.log(Math.abs(j))));
    this.dLnJ0 = new Float64Array(this.n);
    this.dAa = new Float64Array(this.n);
    this.dAc = new Float64Array(this.n);
    this.dLa = new Float64Array(this.n);
    this.dLc = new Float64Array(this.n);
    this.kern = makeKernels(0, 1, 1, Infinity, Infinity);
  }

  resetWarmStart(): void {
    this.x.fill(NaN);
    this.cacheTheta = null;
    this.cacheU = null;
  }

  residuals(theta: number[]): number[] {
    this.evaluate(theta);
    return this.cacheRes.slice();
  }

  /**
   * Jacobian ∂r_i/∂θ_k (n×p rows), assembled from the per-point factors at θ. With `skip`
   * ≥ 0 the column of that parameter is left out (n×(p − 1) rows: a profile fit holds it).
   */
  jacobian(theta: number[], skip = -1): number[][] {
    this.evaluate(theta);
    const u = this.cacheU as Unpacked;
    const p = theta.length;
    const full = this.rowScratch.length === p ? this.rowScratch : (this.rowScratch = new Float64Array(p));
    const jac: number[][] = new Array(this.n);
    for (let i = 0; i < this.n; i++) {
      full.fill(0);
      for (const e of u.lnJ0Dep) full[e.index] += this.dLnJ0[i] * e.d;
      for (const e of u.alphaADep) full[e.index] += this.dAa[i] * e.d;
      for (const e of u.alphaCDep) full[e.index] += this.dAc[i] * e.d;
      for (const e of u.limADep) full[e.index] += this.dLa[i] * e.d;
      for (const e of u.limCDep) full[e.index] += this.dLc[i] * e.d;
      for (const e of u.ruDep) full[e.index] += this.J[i] * e.d;
      const row = new Array<number>(skip >= 0 ? p - 1 : p);
      for (let c = 0, r = 0; c < p; c++) if (c !== skip) row[r++] = full[c];
      jac[i] = row;
    }
    return jac;
  }

  /** Model η at the data points. */
  modelEta(theta: number[]): number[] {
    this.evaluate(theta);
    return this.cacheRes.map((r, i) => r + this.H[i]);
  }

  private setKernels(u: Unpacked): void {
    const a = this.kern.anodic;
    const c = this.kern.cathodic;
    a.lnJ0 = u.lnJ0;
    c.lnJ0 = u.lnJ0;
    a.forwardSlope = u.alphaA * this.f;
    a.backwardSlope = u.alphaC * this.f;
    c.forwardSlope = u.alphaC * this.f;
    c.backwardSlope = u.alphaA * this.f;
    a.lnForwardLimit = u.lnLimA;
    a.lnBackwardLimit = u.lnLimC;
    c.lnForwardLimit = u.lnLimC;
    c.lnBackwardLimit = u.lnLimA;
  }

  /** ln(|j|/j_lim) without cancellation near the fitted limit (uses the stored excess). */
  private lnOverLimit(mag: number, lnMag: number, lim: number, jMax: number, excess: number): number {
    if (!Number.isFinite(lim)) return lnMag;
    if (Number.isFinite(excess) && mag >= 0.5 * lim) return Math.log1p(-((jMax - mag) + excess) / lim);
    return lnRatioToLimit(mag, lim);
  }

  private evaluate(theta: number[]): void {
    if (this.cacheTheta && sameVector(this.cacheTheta, theta)) return;
    const u = this.layout.unpack(theta);
    this.setKernels(u);
    const res = new Array<number>(this.n);
    const ev = this.ev;
    const f = this.f;
    // Warm start: each point's last solution x moved to first order by the change of the
    // physical parameters since then, x + s·Σ_q (∂η/∂q)·Δq, with the derivative factors of that
    // solution (kept below). Small parameter changes (finite differences, late LM steps,
    // profile fits) then start Newton within its stopping tolerance. Our own device.
    const last = this.cacheU;
    const change = (now: number, before: number) => (now === before ? 0 : now - before);
    const dq0 = last ? change(u.lnJ0, last.lnJ0) : NaN;
    const dqA = last ? change(u.alphaA, last.alphaA) : NaN;
    const dqC = last ? change(u.alphaC, last.alphaC) : NaN;
    const dqLa = last ? change(u.lnLimA, last.lnLimA) : NaN;
    const dqLc = last ? change(u.lnLimC, last.lnLimC) : NaN;
    const predict = Number.isFinite(dq0 + dqA + dqC + dqLa + dqLc);
    for (let i = 0; i < this.n; i++) {
      const j = this.J[i];
      if (j === 0) {
        res[i] = -this.H[i];
        this.dLnJ0[i] = this.dAa[i] = this.dAc[i] = this.dLa[i] = this.dLc[i] = 0;
        continue;
      }
      const anodic = j > 0;
      const k = anodic ? this.kern.anodic : this.kern.cathodic;
      const mag = Math.abs(j);
      const lnT = this.lnAbsJ[i];
      const lnO = anodic ? this.lnOverLimit(mag, lnT, u.limA, this.jMaxA, u.limAExcess) : this.lnOverLimit(mag, lnT, u.limC, this.jMaxC, u.limCExcess);
      const s = anodic ? 1 : -1;
      let guess = this.x[i];
      if (predict) {
        const moved = guess + s * (this.dLnJ0[i] * dq0 + this.dAa[i] * dqA + this.dAc[i] * dqC + this.dLa[i] * dqLa + this.dLc[i] * dqLc);
        if (moved > 0 && Number.isFinite(moved)) guess = moved;
      }
      let xi = solveBranch(k, lnT, lnO, guess, ev);
      if (!Number.isFinite(xi)) xi = solveBranch(k, lnT, lnO, NaN, ev);
      this.x[i] = xi;
      res[i] = s * xi + j * u.ru - this.H[i];
      // ∂ln|j|/∂q at fixed x, then ∂x/∂q = −(∂ln|j|/∂q)/(∂ln|j|/∂x); η = s·x.
      const inv = -s / ev.dLnCurrentDx;
      const p0 = ev.pZero;
      const dFwd = xi * (p0 + ev.pBackward) + ev.xOverExpm1; // per unit forward slope
      const dBwd = ev.xOverExpm1 + ev.pBackward * xi; // per unit backward slope
      this.dLnJ0[i] = inv * p0;
      this.dAa[i] = inv * (anodic ? dFwd : dBwd) * f;
      this.dAc[i] = inv * (anodic ? dBwd : dFwd) * f;
      this.dLa[i] = inv * (anodic ? ev.pForward : ev.pBackward);
      this.dLc[i] = inv * (anodic ? ev.pBackward : ev.pForward);
    }
    this.cacheTheta = theta.slice();
    this.cacheU = u;
    this.cacheRes = res;
  }

  /** Model η (incl. j·R_u) at any j, or null when |j| is at/above the branch limit. */
  etaAt(j: number, u: Unpacked): number | null {
    if (j === 0) return 0;
    this.setKernels(u);
    const anodic = j > 0;
    const lim = anodic ? u.limA : u.limC;
    const mag = Math.abs(j);
    if (mag >= lim) return null;
    const x = solveBranch(anodic ? this.kern.anodic : this.kern.cathodic, Math.log(mag), lnRatioToLimit(mag, lim), NaN, newBranchEval());
    if (!Number.isFinite(x)) return null;
    return (anodic ? x : -x) + j * u.ru;
  }

  /** Fitted curve for plotting: log-spaced |j| on each branch with data, and j = 0. */
  curve(u: Unpacked, jMaxA: number, jMaxC: number, jMinAbs: number): PolarizationPoint[] {
    const out: PolarizationPoint[] = [];
    const lo = Number.isFinite(jMinAbs) ? jMinAbs : 1;
    const branchPoints = (jMax: number, s: number) => {
      if (!(jMax > 0)) return;
      const a = Math.log(Math.min(lo, jMax));
      const b = Math.log(jMax);
      for (let k = 0; k < CURVE_POINTS_PER_BRANCH; k++) {
        const mag = Math.exp(a + ((b - a) * k) / (CURVE_POINTS_PER_BRANCH - 1));
        const eta = this.etaAt(s * mag, u);
        if (eta !== null) out.push({ currentDensity: s * mag, overpotential: eta });
      }
    };
    branchPoints(jMaxC, -1);
    out.reverse();
    out.push({ currentDensity: 0, overpotential: 0 });
    branchPoints(jMaxA, 1);
    return out;
  }
}

function sameVector(a: number[], b: number[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}
