/**
 * One entry point for kinetics fits (API and pages): validates the SI input, hands off to
 * the Tafel or Butler–Volmer fit, and returns one result shape.
 * Units: j [A/m²] (anodic > 0), η [V], T [K], R_u [Ω·m²], limiting currents [A/m²].
 */
import { InputError } from '../errors.js';
import { fitButlerVolmer, type ButlerVolmerFitResult } from './butler-volmer.js';
import { fitTafel, type TafelFitResult } from './tafel.js';
import type { Branch, FittedParameter, PolarizationPoint, ResidualRecord } from './types.js';
import type { WorkingBranchUncertainty } from './working-branch.js';
import { checkPoints, checkTemperature } from './validate.js';

export interface KineticsFitInput {
  points: PolarizationPoint[];
  model: 'tafel' | 'butler-volmer';
  /** K */
  temperature: number;
  electrons?: number;
  window?: { minOverpotential: number; maxOverpotential: number } | 'auto';
  uncompensatedResistance?: number | 'fit';
  anodicLimitingCurrentDensity?: number | 'fit';
  cathodicLimitingCurrentDensity?: number | 'fit';
  branch?: Branch;
  anodicTransferCoefficient?: number;
  cathodicTransferCoefficient?: number;
  tieTransferCoefficients?: boolean;
}

/** A type alias (not an interface) so that it is assignable to Record<string, FittedParameter | undefined>. */
export type KineticsParameters = {
  exchangeCurrentDensity: FittedParameter;
  /** V/decade (Tafel: the fitted branch; Butler–Volmer: the main branch). */
  tafelSlope: FittedParameter;
  /** Tafel model: α of the fitted branch. */
  transferCoefficient?: FittedParameter;
  /** Butler–Volmer model. */
  anodicTransferCoefficient?: FittedParameter;
  cathodicTransferCoefficient?: FittedParameter;
  anodicTafelSlope?: FittedParameter;
  cathodicTafelSlope?: FittedParameter;
  uncompensatedResistance?: FittedParameter;
  anodicLimitingCurrentDensity?: FittedParameter;
  cathodicLimitingCurrentDensity?: FittedParameter;
  singleStepSymmetryReading?: FittedParameter;
};

export interface KineticsFitResult {
  model: 'tafel' | 'butler-volmer';
  /** Tafel: the fitted branch. */
  branch?: Branch;
  parameters: KineticsParameters;
  statistics: { points: number; degreesOfFreedom: number; rSquared: number; residualStandardDeviation: number; aic: number; bic: number };
  window: { minOverpotential: number; maxOverpotential: number; rule: string };
  correlation?: { names: string[]; matrix: number[][] };
  /**
   * Uncertainty of the working branch for the cell model: ln j0 and the transfer
   * coefficient of the branch (Tafel: the fitted branch; Butler–Volmer: the main branch,
   * i.e. the `branch` option or the one with more fitted points — α_a when anodic, α_c when
   * cathodic), each with its standard error, and corr(ln j0, α), by the delta method from the
   * fit covariance (working-branch.ts; covariance scaled by s² = RSS/(n − p)). It maps onto
   * core/cell KineticUncertainty. Absent when the fit does not determine the pair
   * (rank-deficient or not converged). A held α has SE 0 and correlation 0.
   */
  workingBranchUncertainty?: WorkingBranchUncertainty;
  residuals: ResidualRecord[];
  curve: PolarizationPoint[];
  converged: boolean;
  status: string;
  warnings: string[];
}

/**
 * Fit a Tafel line or the Butler–Volmer law to polarization data (SI input, see
 * KineticsFitInput). Throws InputError with a field path for: no points, more than 100 000
 * points, non-finite values, zero current in the Tafel model, non-positive temperature,
 * an empty window, fewer points than parameters (+1 for a residual); PhysicsError when data
 * exceed a given limiting current.
 */
export function fitKinetics(input: KineticsFitInput): KineticsFitResult {
  if (input === null || typeof input !== 'object') throw new InputError('', 'the request must be an object');
  const model = input.model;
  if (model !== 'tafel' && model !== 'butler-volmer') throw new InputError('model', "must be 'tafel' or 'butler-volmer'", model);
  checkTemperature(input.temperature);
  checkPoints(input.points, { rejectZeroCurrent: model === 'tafel' });
  if (input.window !== undefined && input.window !== 'auto' && (input.window === null || typeof input.window !== 'object')) {
    throw new InputError('window', "must be 'auto' or {minOverpotential, maxOverpotential}", input.window);
  }
  if (model === 'tafel') {
    const warnings: string[] = [];
    const ignored: string[] = [];
    if (input.anodicLimitingCurrentDensity !== undefined) ignored.push('anodic limiting current density');
    if (input.cathodicLimitingCurrentDensity !== undefined) ignored.push('cathodic limiting current density');
    if (input.anodicTransferCoefficient !== undefined) ignored.push('fixed anodic transfer coefficient');
    if (input.cathodicTransferCoefficient !== undefined) ignored.push('fixed cathodic transfer coefficient');
    if (input.tieTransferCoefficients) ignored.push('tie of the transfer coefficients');
    if (ignored.length > 0) warnings.push(`The Tafel model ignores: ${ignored.join(', ')} (they apply to Butler–Volmer).`);
    const r = fitTafel(input.points, {
      temperature: input.temperature,
      branch: input.branch,
      window: input.window,
      uncompensatedResistance: input.uncompensatedResistance,
      electrons: input.electrons,
    });
    const p = r.parameters;
    const parameters: KineticsParameters = {
      exchangeCurrentDensity: p.exchangeCurrentDensity,
      tafelSlope: p.tafelSlope,
      transferCoefficient: p.transferCoefficient,
    };
    if (p.uncompensatedResistance) parameters.uncompensatedResistance = p.uncompensatedResistance;
    if (p.singleStepSymmetryReading) parameters.singleStepSymmetryReading = p.singleStepSymmetryReading;
    return {
      model,
      branch: r.branch,
      parameters,
      ...sharedFields(r),
      warnings: [...warnings, ...r.warnings],
    };
  }
  const r = fitButlerVolmer(input.points, {
    temperature: input.temperature,
    electrons: input.electrons,
    window: input.window,
    branch: input.branch,
    uncompensatedResistance: input.uncompensatedResistance,
    anodicLimitingCurrentDensity: input.anodicLimitingCurrentDensity,
    cathodicLimitingCurrentDensity: input.cathodicLimitingCurrentDensity,
    anodicTransferCoefficient: input.anodicTransferCoefficient,
    cathodicTransferCoefficient: input.cathodicTransferCoefficient,
    tieTransferCoefficients: input.tieTransferCoefficients,
  });
  return {
    model,
    parameters: { ...r.parameters },
    ...sharedFields(r),
    warnings: r.warnings,
  };
}

function pickStats(s: { points: number; degreesOfFreedom: number; rSquared: number; residualStandardDeviation: number; aic: number; bic: number }) {
  return {
    points: s.points,
    degreesOfFreedom: s.degreesOfFreedom,
    rSquared: s.rSquared,
    residualStandardDeviation: s.residualStandardDeviation,
    aic: s.aic,
    bic: s.bic,
  };
}

/** The result fields both models report in the same way. */
function sharedFields(r: TafelFitResult | ButlerVolmerFitResult) {
  return {
    statistics: pickStats(r.statistics),
    window: { minOverpotential: r.window.minOverpotential, maxOverpotential: r.window.maxOverpotential, rule: r.window.rule },
    correlation: r.correlation,
    ...(r.workingBranchUncertainty ? { workingBranchUncertainty: r.workingBranchUncertainty } : {}),
    residuals: r.residuals,
    curve: r.curve,
    converged: r.converged,
    status: r.status,
  };
}
