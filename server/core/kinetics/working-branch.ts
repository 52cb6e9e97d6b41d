/**
 * Working-branch uncertainty of a kinetic fit: the pair (ln j0, α) of the branch an
 * electrode works on (α_a for an anode, α_c for a cathode), with standard errors and their
 * correlation, in the form the cell model's uncertainty propagation takes
 * (core/cell/types.ts KineticUncertainty).
 *
 * Method: first-order propagation of the fit covariance (delta method): for q = g(θ),
 * Cov(q) ≈ G·Σ·Gᵀ with G = ∂g/∂θ at the estimate θ̂ (JCGM 100:2008, GUM §5.1.2; the
 * linearised covariance of a least-squares fit transforms this way under any smooth
 * reparametrisation). The result is the usual asymptotic (bivariate normal) reading; for
 * strongly nonlinear maps and large SEs it is approximate, like every linearised interval.
 * Units: ln j0 of j0 in A/m² (dimensionless), α dimensionless.
 * Source: delta method (common practice); JCGM 100:2008 §5.1.
 */
import { faradayOverRT } from '../constants.js';
import type { Branch } from './types.js';

/**
 * (ln j0, α) of the working branch with standard errors and correlation.
 * - `branch`: whose transfer coefficient is given (α_a for 'anodic', α_c for 'cathodic');
 *   Tafel: the fitted branch; Butler–Volmer: the main branch (the `branch` option, else the
 *   one with more fitted points).
 * - `lnExchangeCurrentDensity`: ln of j0 [A/m²]; `lnExchangeCurrentDensitySE` its SE
 *   (0.23 ≈ a factor 10^0.1 on j0).
 * - `transferCoefficient`, `transferCoefficientSE`: α of the branch and its SE (0 when α was
 *   held fixed by the user, a tie or a hold: it then carries no variance).
 * - `correlation`: corr(ln j0, α) in [−1, 1] (0 when either SE is 0).
 * Covariance scaling: as the fit's (s² = RSS/(n − p), σ estimated from the scatter).
 */
export interface WorkingBranchUncertainty {
  branch: Branch;
  lnExchangeCurrentDensity: number;
  lnExchangeCurrentDensitySE: number;
  transferCoefficient: number;
  transferCoefficientSE: number;
  correlation: number;
}

/**
 * Names of a saved correlation record that holds corr(ln j0, α) of the working branch:
 * [WORKING_BRANCH_LN_J0, key of the transfer-coefficient parameter] — 'transferCoefficient'
 * for a Tafel fit, 'anodicTransferCoefficient' / 'cathodicTransferCoefficient' for
 * Butler–Volmer. The standard errors are those of the saved parameters
 * (SE(ln j0) = SE(j0)/j0 by the delta method, as the fits report SE(j0)).
 */
export const WORKING_BRANCH_LN_J0 = 'lnExchangeCurrentDensity';

/**
 * Key of the working branch's transfer coefficient among a fit's parameters
 * (KineticsParameters): 'transferCoefficient' for a Tafel fit (α of its fitted branch);
 * 'anodicTransferCoefficient' or 'cathodicTransferCoefficient' for Butler–Volmer.
 */
export function workingTransferCoefficientKey(
  model: 'tafel' | 'butler-volmer',
  branch: Branch,
): 'transferCoefficient' | 'anodicTransferCoefficient' | 'cathodicTransferCoefficient' {
  if (model === 'tafel') return 'transferCoefficient';
  return branch === 'anodic' ? 'anodicTransferCoefficient' : 'cathodicTransferCoefficient';
}

/**
 * Assemble the pair from ln j0, α and the 2×2 covariance of (ln j0, α):
 * SE = √Var, correlation = Cov/(SE_L·SE_α) clamped to [−1, 1] (round-off can step just
 * outside), 0 when a variance is 0. Returns undefined when a value is not finite or a
 * variance is negative (not determined).
 */
export function pairFromCovariance(
  branch: Branch,
  lnJ0: number,
  varLnJ0: number,
  alpha: number,
  varAlpha: number,
  covLnJ0Alpha: number,
): WorkingBranchUncertainty | undefined {
  if (![lnJ0, varLnJ0, alpha, varAlpha, covLnJ0Alpha].every(Number.isFinite)) return undefined;
  if (!(varLnJ0 >= 0 && varAlpha >= 0 && alpha > 0)) return undefined;
  const seL = Math.sqrt(varLnJ0);
  const seA = Math.sqrt(varAlpha);
  const denominator = seL * seA;
  const correlation = denominator > 0 ? Math.max(-1, Math.min(1, covLnJ0Alpha / denominator)) : 0;
  if (!Number.isFinite(correlation)) return undefined;
  return {
    branch,
    lnExchangeCurrentDensity: lnJ0,
    lnExchangeCurrentDensitySE: seL,
    transferCoefficient: alpha,
    transferCoefficientSE: seA,
    correlation,
  };
}

/**
 * Working-branch pair of a Tafel line s·η = a + b·ln|j| (+ R_u·|j|): intercept a [V],
 * slope b [V per e-fold] > 0, `cov` the covariance of the line whose leading 2×2 block is
 * that of (a, b) (a fitted R_u column beyond it is marginalised by taking the block),
 * temperature T [K]. With f = F/(RT):
 *   ln j0 = −a/b,   ∂/∂(a, b) = (−1/b, a/b²);
 *   α = 1/(f·b),    ∂/∂(a, b) = (0, −1/(f·b²));
 *   Var(ln j0) = σa²/b² − 2a·σab/b³ + a²σb²/b⁴,
 *   Var(α) = σb²/(f²b⁴),
 *   Cov(ln j0, α) = σab/(f·b³) − a·σb²/(f·b⁴).
 * Returns undefined when b ≤ 0 or the covariance is not finite.
 * Source: Tafel line and α = RT/(bF) as in domain.md §3; delta method (see file header).
 */
export function tafelWorkingBranchUncertainty(
  a: number,
  b: number,
  cov: number[][],
  temperatureK: number,
  branch: Branch,
): WorkingBranchUncertainty | undefined {
  if (!(b > 0) || !Number.isFinite(a)) return undefined;
  const f = faradayOverRT(temperatureK);
  const vA = cov[0]?.[0];
  const vB = cov[1]?.[1];
  const cAB = cov[0]?.[1];
  if (![vA, vB, cAB].every((v) => typeof v === 'number' && Number.isFinite(v))) return undefined;
  const gL0 = -1 / b;
  const gL1 = a / (b * b);
  const gA1 = -1 / (f * b * b);
  const varL = gL0 * gL0 * vA + 2 * gL0 * gL1 * cAB + gL1 * gL1 * vB;
  const varAlpha = gA1 * gA1 * vB;
  const covLA = gL0 * gA1 * cAB + gL1 * gA1 * vB;
  // Round-off can make a tiny Var(ln j0) negative (perfectly correlated a and b).
  return pairFromCovariance(branch, -a / b, Math.max(varL, 0), 1 / (f * b), varAlpha, covLA);
}
