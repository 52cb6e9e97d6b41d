/**
 * Tafel line vs Butler–Volmer on the SAME points, by residual SD, AIC and BIC.
 *
 * Both models are fitted by least squares in η to one identical point set, and their
 * information criteria use one Gaussian likelihood definition (statistics.ts:
 * −2 ln L = n[ln(2π·RSS/n) + 1], k = free parameters + 1), so differences are meaningful.
 * Verdict thresholds on ΔAIC = AIC_Tafel − AIC_BV follow the usual reading of AIC
 * differences (Burnham & Anderson, Model Selection and Multimodel Inference, 2nd ed. 2002,
 * §2.6: Δ ≤ 2 substantial support for both, 4–7 considerably less, > 10 essentially none —
 * from memory); BIC is reported beside it (Kass & Raftery, JASA 90 (1995) 773: > 6 strong,
 * > 10 very strong — from memory).
 */
import { InputError } from '../errors.js';
import { fitButlerVolmer } from './butler-volmer.js';
import type { ButlerVolmerFitOptions, ButlerVolmerFitResult } from './butler-volmer.js';
import { chooseBranch, fitTafel } from './tafel.js';
import type { TafelFitResult } from './tafel.js';
import type { Branch, PolarizationPoint } from './types.js';
import { checkPoints, checkTemperature } from './validate.js';

export interface CompareOptions {
  temperature: number;
  branch?: Branch;
  /**
   * Which points both models see: 'branch' (default) = every point of the branch with
   * |η| > 0 on the branch's side; 'tafel-window' = the points of the Tafel window
   * (`window`, default automatic).
   */
  basis?: 'branch' | 'tafel-window';
  window?: { minOverpotential: number; maxOverpotential: number } | 'auto';
  uncompensatedResistance?: number | 'fit';
  anodicLimitingCurrentDensity?: number | 'fit';
  cathodicLimitingCurrentDensity?: number | 'fit';
  anodicTransferCoefficient?: number;
  cathodicTransferCoefficient?: number;
  tieTransferCoefficients?: boolean;
  electrons?: number;
}

export interface ModelSummary {
  points: number;
  parameters: number;
  degreesOfFreedom: number;
  /** [V] */
  residualStandardDeviation: number;
  rss: number;
  aic: number;
  bic: number;
  converged: boolean;
}

export interface ModelComparison {
  branch: Branch;
  basis: 'branch' | 'tafel-window';
  points: number;
  tafel: ModelSummary;
  butlerVolmer: ModelSummary;
  /** AIC_Tafel − AIC_BV: positive favours Butler–Volmer. */
  deltaAic: number;
  /** BIC_Tafel − BIC_BV. */
  deltaBic: number;
  preferred: 'tafel' | 'butler-volmer' | 'either';
  verdict: string;
  warnings: string[];
  tafelFit: TafelFitResult;
  butlerVolmerFit: ButlerVolmerFitResult;
}

/** ΔAIC thresholds (Burnham & Anderson 2002, from memory). */
const AIC_NEGLIGIBLE = 2;
const AIC_STRONG = 10;

function summary(s: { points: number; parameters: number; degreesOfFreedom: number; residualStandardDeviation: number; rss: number; aic: number; bic: number }, converged: boolean): ModelSummary {
  return {
    points: s.points,
    parameters: s.parameters,
    degreesOfFreedom: s.degreesOfFreedom,
    residualStandardDeviation: s.residualStandardDeviation,
    rss: s.rss,
    aic: s.aic,
    bic: s.bic,
    converged,
  };
}

/** Fit both models to the same points and compare them (see file header). */
export function compareTafelButlerVolmer(points: PolarizationPoint[], options: CompareOptions): ModelComparison {
  checkPoints(points, { rejectZeroCurrent: false });
  checkTemperature(options.temperature);
  const warnings: string[] = [];
  const branch = chooseBranch(points, options.branch, warnings);
  const s = branch === 'anodic' ? 1 : -1;
  const basis = options.basis ?? 'branch';
  if (basis !== 'branch' && basis !== 'tafel-window') throw new InputError('basis', "must be 'branch' or 'tafel-window'", basis);
  const onBranch = points.filter((p) => Math.sign(p.currentDensity) === s && s * p.overpotential > 0);
  if (onBranch.length === 0) throw new InputError('points', `no ${branch} points with |η| > 0 to compare on`);

  let set: PolarizationPoint[];
  let tafel: TafelFitResult;
  const tafelCommon = { temperature: options.temperature, branch, uncompensatedResistance: options.uncompensatedResistance, electrons: options.electrons };
  if (basis === 'tafel-window') {
    tafel = fitTafel(onBranch, { ...tafelCommon, window: options.window ?? 'auto' });
    set = onBranch.filter((_, i) => tafel.residuals[i].used);
  } else {
    set = onBranch;
    tafel = fitTafel(set, { ...tafelCommon, window: { minOverpotential: 0, maxOverpotential: Infinity } });
  }
  const bvOptions: ButlerVolmerFitOptions = {
    temperature: options.temperature,
    electrons: options.electrons,
    uncompensatedResistance: options.uncompensatedResistance,
    anodicLimitingCurrentDensity: branch === 'anodic' ? options.anodicLimitingCurrentDensity : undefined,
    cathodicLimitingCurrentDensity: branch === 'cathodic' ? options.cathodicLimitingCurrentDensity : undefined,
    anodicTransferCoefficient: options.anodicTransferCoefficient,
    cathodicTransferCoefficient: options.cathodicTransferCoefficient,
    tieTransferCoefficients: options.tieTransferCoefficients,
  };
  const bv = fitButlerVolmer(set, bvOptions);
  if (tafel.statistics.points !== bv.statistics.points) {
    // Both fits must see the same points; this guards the comparison itself.
    throw new InputError('points', `internal mismatch: Tafel used ${tafel.statistics.points} points, Butler–Volmer ${bv.statistics.points}`);
  }
  const T = summary(tafel.statistics, tafel.converged);
  const B = summary(bv.statistics, bv.converged);
  const deltaAic = T.aic - B.aic;
  const deltaBic = T.bic - B.bic;
  const mV = (v: number) => `${(v * 1000).toFixed(2)} mV`;
  const basisText = basis === 'branch' ? `all ${set.length} ${branch} points` : `the ${set.length} points of the Tafel window`;
  let preferred: ModelComparison['preferred'];
  let verdict: string;
  if (!bv.converged) {
    preferred = 'tafel';
    verdict = `The Butler–Volmer fit did not converge on ${basisText}, so only the Tafel line (residual SD ${mV(T.residualStandardDeviation)}) can be used.`;
  } else if (deltaAic > AIC_STRONG) {
    preferred = 'butler-volmer';
    verdict = `On ${basisText}, Butler–Volmer describes the data clearly better (ΔAIC = ${deltaAic.toFixed(1)}, ΔBIC = ${deltaBic.toFixed(1)}; residual SD ${mV(B.residualStandardDeviation)} vs ${mV(T.residualStandardDeviation)} for the Tafel line). The straight line misses real curvature (low-field or mass transport); use the Butler–Volmer parameters.`;
  } else if (deltaAic > AIC_NEGLIGIBLE) {
    preferred = 'butler-volmer';
    verdict = `On ${basisText}, Butler–Volmer fits somewhat better (ΔAIC = ${deltaAic.toFixed(1)}, ΔBIC = ${deltaBic.toFixed(1)}; residual SD ${mV(B.residualStandardDeviation)} vs ${mV(T.residualStandardDeviation)}). The evidence is moderate: both descriptions are usable, Butler–Volmer is the safer one.`;
  } else if (deltaAic >= -AIC_NEGLIGIBLE) {
    preferred = 'either';
    verdict = `On ${basisText}, both models fit about equally well (ΔAIC = ${deltaAic.toFixed(1)}, ΔBIC = ${deltaBic.toFixed(1)}; residual SD ${mV(T.residualStandardDeviation)} Tafel, ${mV(B.residualStandardDeviation)} Butler–Volmer). The simpler Tafel line is enough for these data.`;
  } else {
    preferred = 'tafel';
    verdict = `On ${basisText}, the Tafel line is preferred (ΔAIC = ${deltaAic.toFixed(1)}, ΔBIC = ${deltaBic.toFixed(1)}): the extra Butler–Volmer parameters do not improve the fit enough to pay for themselves.`;
  }
  // The same 2-unit threshold is used for |ΔBIC| (project choice).
  if (Math.sign(deltaAic) !== Math.sign(deltaBic) && Math.abs(deltaBic) > AIC_NEGLIGIBLE) {
    warnings.push(`AIC and BIC disagree (ΔAIC = ${deltaAic.toFixed(1)}, ΔBIC = ${deltaBic.toFixed(1)}); BIC penalises extra parameters more strongly for many points. Treat the choice as open.`);
  }
  for (const w of bv.warnings) warnings.push(`Butler–Volmer: ${w}`);
  for (const w of tafel.warnings) warnings.push(`Tafel: ${w}`);
  return { branch, basis, points: set.length, tafel: T, butlerVolmer: B, deltaAic, deltaBic, preferred, verdict, warnings: [...new Set(warnings)], tafelFit: tafel, butlerVolmerFit: bv };
}
