/**
 * Forward electrode-kinetics models: Butler–Volmer with optional limiting currents, its
 * inversion η(j), Tafel line, Arrhenius temperature dependence of j0, and the charge-transfer
 * resistance. Pure functions, SI units (A/m², V, K, J/mol, Ω·m²). Sign convention: anodic
 * current and overpotential positive (IUPAC; domain.md §2).
 */
import { faradayOverRT, GAS_CONSTANT } from '../constants.js';
import { InputError, PhysicsError, ConvergenceError } from '../errors.js';
import { branchEval, lnRatioToLimit, makeKernels, newBranchEval, solveBranch } from './bv-kernel.js';

export interface ButlerVolmerParams {
  exchangeCurrentDensity: number; // j0, A/m² (>0)
  anodicTransferCoefficient: number; // α_a (dimensionless, >0)
  cathodicTransferCoefficient: number; // α_c (>0)
  anodicLimitingCurrentDensity?: number; // A/m², >0, absent = none
  cathodicLimitingCurrentDensity?: number; // A/m², magnitude >0, absent = none
}

function requirePositive(value: number, path: string, what: string): void {
  if (!(typeof value === 'number' && Number.isFinite(value) && value > 0)) {
    throw new InputError(path, `${what} must be a finite number > 0`, value);
  }
}

function requireFinite(value: number, path: string, what: string): void {
  if (!(typeof value === 'number' && Number.isFinite(value))) {
    throw new InputError(path, `${what} must be a finite number`, value);
  }
}

function checkParams(p: ButlerVolmerParams, temperatureK: number): void {
  requirePositive(p.exchangeCurrentDensity, 'exchangeCurrentDensity', 'exchange current density [A/m²]');
  requirePositive(p.anodicTransferCoefficient, 'anodicTransferCoefficient', 'anodic transfer coefficient');
  requirePositive(p.cathodicTransferCoefficient, 'cathodicTransferCoefficient', 'cathodic transfer coefficient');
  if (p.anodicLimitingCurrentDensity !== undefined) {
    requirePositive(p.anodicLimitingCurrentDensity, 'anodicLimitingCurrentDensity', 'anodic limiting current density [A/m²]');
  }
  if (p.cathodicLimitingCurrentDensity !== undefined) {
    requirePositive(
      p.cathodicLimitingCurrentDensity,
      'cathodicLimitingCurrentDensity',
      'cathodic limiting current density magnitude [A/m²]',
    );
  }
  requirePositive(temperatureK, 'temperature', 'temperature [K]');
}

function kernelsOf(p: ButlerVolmerParams, temperatureK: number) {
  const f = faradayOverRT(temperatureK);
  return makeKernels(
    Math.log(p.exchangeCurrentDensity),
    p.anodicTransferCoefficient * f,
    p.cathodicTransferCoefficient * f,
    p.anodicLimitingCurrentDensity === undefined ? Infinity : Math.log(p.anodicLimitingCurrentDensity),
    p.cathodicLimitingCurrentDensity === undefined ? Infinity : Math.log(p.cathodicLimitingCurrentDensity),
  );
}

/** Largest ln|j| that exp() turns into a finite double (ln(Number.MAX_VALUE) ≈ 709.78). */
const LN_MAX_DOUBLE = Math.log(Number.MAX_VALUE);

/**
 * Butler–Volmer current density with optional limiting currents (domain.md §3):
 *
 *   j = [exp(α_a f η) − exp(−α_c f η)] / [1/j0 + exp(α_a f η)/j_lim,a + exp(−α_c f η)/|j_lim,c|],
 *   f = F/(RT).
 *
 * Without limiting currents this is j0[exp(α_a f η) − exp(−α_c f η)].
 * Arguments: overpotential η [V] (anodic > 0), kinetic parameters (j0 [A/m²], α_a, α_c,
 * limiting current densities [A/m²] as magnitudes), temperature [K]. Result j [A/m²], anodic
 * positive. Evaluated in log space (no overflow inside; see bv-kernel.ts).
 * Validity: one rate-determining step, uniform surface, limiting currents from a
 * Nernst-layer picture (common practice). Throws PhysicsError when |j| exceeds the largest
 * double (only for unbounded branches at extreme η), InputError for invalid parameters.
 * Source: Butler–Volmer equation; limiting-current closed form as in domain.md §3.
 */
export function butlerVolmerCurrentDensity(overpotential: number, p: ButlerVolmerParams, temperatureK: number): number {
  checkParams(p, temperatureK);
  requireFinite(overpotential, 'overpotential', 'overpotential [V]');
  if (overpotential === 0) return 0;
  const k = kernelsOf(p, temperatureK);
  const ev = newBranchEval();
  const anodic = overpotential > 0;
  branchEval(anodic ? k.anodic : k.cathodic, Math.abs(overpotential), ev);
  if (!(ev.lnCurrent < LN_MAX_DOUBLE)) {
    throw new PhysicsError(
      'overpotential',
      `current density at η = ${overpotential} V overflows (ln|j| = ${ev.lnCurrent.toFixed(1)}); the overpotential is outside any physical range for these parameters`,
    );
  }
  // Near a limiting current, j = j_lim·exp(ln(j/j_lim)): more accurate, and never above j_lim.
  const limit = anodic ? p.anodicLimitingCurrentDensity : p.cathodicLimitingCurrentDensity;
  const magnitude = limit !== undefined && ev.lnCurrentOverLimit > -1 ? limit * Math.exp(ev.lnCurrentOverLimit) : Math.exp(ev.lnCurrent);
  return anodic ? magnitude : -magnitude;
}

/**
 * Inverse of butlerVolmerCurrentDensity: the overpotential η [V] that carries current
 * density j [A/m²] (anodic positive). j(η) is strictly increasing, so the root is unique; it
 * is found by safeguarded Newton on ln|j|(|η|), which is concave (monotone convergence,
 * typically 3–8 iterations; see bv-kernel.ts). Accuracy: j(η(j)) = j to ~1e-14 relative.
 * Throws PhysicsError when |j| ≥ the limiting current of its branch (no finite η exists),
 * InputError for invalid parameters, ConvergenceError if the solve fails (not expected).
 * Source: as butlerVolmerCurrentDensity; numerical method our own (Newton with bracket).
 */
export function butlerVolmerOverpotential(currentDensity: number, p: ButlerVolmerParams, temperatureK: number): number {
  checkParams(p, temperatureK);
  requireFinite(currentDensity, 'currentDensity', 'current density [A/m²]');
  if (currentDensity === 0) return 0;
  const anodic = currentDensity > 0;
  const limit = anodic ? p.anodicLimitingCurrentDensity : p.cathodicLimitingCurrentDensity;
  const magnitude = Math.abs(currentDensity);
  if (limit !== undefined && magnitude >= limit) {
    throw new PhysicsError(
      'currentDensity',
      `|j| = ${magnitude} A/m² is at or above the ${anodic ? 'anodic' : 'cathodic'} limiting current density ${limit} A/m²; no overpotential can carry it`,
    );
  }
  const k = kernelsOf(p, temperatureK);
  const lnTarget = Math.log(magnitude);
  const lnOverLimit = limit === undefined ? lnTarget : lnRatioToLimit(magnitude, limit);
  const x = solveBranch(anodic ? k.anodic : k.cathodic, lnTarget, lnOverLimit, NaN, newBranchEval());
  if (!Number.isFinite(x)) {
    throw new ConvergenceError(`overpotential solve for j = ${currentDensity} A/m² did not converge`);
  }
  return anodic ? x : -x;
}

/**
 * Tafel line: η = b·ln(|j|/j0)·sign(j), b = RT/(αF) [V] (per e-fold; per decade b·ln 10).
 * Arguments: j [A/m²] (≠ 0; sign selects the branch), j0 [A/m²] > 0, α > 0 (the transfer
 * coefficient of that branch), T [K]. Result η [V]. Valid in the high-field region
 * (|η| ≳ 4RT/F, back reaction negligible) and below mass-transport limitation.
 * Source: Tafel equation; b = RT/(αF) per IUPAC 2014 (Guidelli et al., Pure Appl. Chem. 86, 259).
 */
export function tafelOverpotential(
  currentDensity: number,
  exchangeCurrentDensity: number,
  transferCoefficient: number,
  temperatureK: number,
): number {
  requireFinite(currentDensity, 'currentDensity', 'current density [A/m²]');
  if (currentDensity === 0) throw new InputError('currentDensity', 'the Tafel line is undefined at zero current density');
  requirePositive(exchangeCurrentDensity, 'exchangeCurrentDensity', 'exchange current density [A/m²]');
  requirePositive(transferCoefficient, 'transferCoefficient', 'transfer coefficient');
  requirePositive(temperatureK, 'temperature', 'temperature [K]');
  const b = 1 / (transferCoefficient * faradayOverRT(temperatureK));
  const eta = b * Math.log(Math.abs(currentDensity) / exchangeCurrentDensity);
  return currentDensity > 0 ? eta : -eta;
}

/**
 * Tafel slope per decade of current: b₁₀ = ln(10)·RT/(αF) [V/decade].
 * At 298.15 K: α = 0.5 → 0.1183, α = 1 → 0.05916, α = 2 → 0.02958 V/decade
 * (check-values.md §9d, derived from CODATA 2018 R and F).
 * Arguments: α > 0, T [K] > 0. Source: IUPAC 2014 (Guidelli et al.), derived relation.
 */
export function tafelSlopePerDecade(transferCoefficient: number, temperatureK: number): number {
  requirePositive(transferCoefficient, 'transferCoefficient', 'transfer coefficient');
  requirePositive(temperatureK, 'temperature', 'temperature [K]');
  return Math.LN10 / (transferCoefficient * faradayOverRT(temperatureK));
}

/**
 * Transfer coefficient from a Tafel slope per decade (inverse of tafelSlopePerDecade):
 * α = ln(10)·RT/(F·b₁₀). b₁₀ [V/decade] > 0, T [K] > 0 → α [-].
 * Source: IUPAC 2014 (Guidelli et al.), derived relation; domain.md §3.
 */
export function transferCoefficientFromTafelSlope(slopePerDecade: number, temperatureK: number): number {
  requirePositive(slopePerDecade, 'tafelSlope', 'Tafel slope [V/decade]');
  requirePositive(temperatureK, 'temperature', 'temperature [K]');
  return Math.LN10 / (slopePerDecade * faradayOverRT(temperatureK));
}

/**
 * Arrhenius temperature dependence of the exchange current density:
 *   j0(T) = j0_ref · exp[−(E_a/R)(1/T − 1/T_ref)].
 * Arguments: j0_ref [A/m²] > 0 at T_ref [K] > 0, apparent activation energy E_a [J/mol]
 * (any finite sign; normally > 0), T [K] > 0. Result j0 [A/m²].
 * Validity: E_a constant over the range (no change of mechanism). Source: Arrhenius law;
 * form as in domain.md §3.
 */
export function exchangeCurrentAtTemperature(
  j0Ref: number,
  referenceTemperatureK: number,
  activationEnergy: number,
  temperatureK: number,
): number {
  requirePositive(j0Ref, 'exchangeCurrentDensity', 'reference exchange current density [A/m²]');
  requirePositive(referenceTemperatureK, 'referenceTemperature', 'reference temperature [K]');
  requireFinite(activationEnergy, 'activationEnergy', 'activation energy [J/mol]');
  requirePositive(temperatureK, 'temperature', 'temperature [K]');
  const lnRatio = -(activationEnergy / GAS_CONSTANT.value) * (1 / temperatureK - 1 / referenceTemperatureK);
  const value = j0Ref * Math.exp(lnRatio);
  if (!(Number.isFinite(value) && value > 0)) {
    throw new PhysicsError('temperature', `j0 at ${temperatureK} K under- or overflows (ln ratio ${lnRatio.toFixed(1)})`);
  }
  return value;
}

/**
 * Charge-transfer resistance at equilibrium (low-field limit of Butler–Volmer):
 *   R_ct = RT/(F·j0·(α_a + α_c)) [Ω·m²].
 * Limiting currents are not included (kinetic resistance only; with them the low-field slope
 * dη/dj is R_ct·(1 + j0/j_lim,a + j0/|j_lim,c|)). Valid for |η| ≪ RT/F.
 * Source: linearisation of Butler–Volmer at η = 0 (domain.md §3).
 */
export function chargeTransferResistance(p: ButlerVolmerParams, temperatureK: number): number {
  checkParams(p, temperatureK);
  const f = faradayOverRT(temperatureK);
  return 1 / (f * p.exchangeCurrentDensity * (p.anodicTransferCoefficient + p.cathodicTransferCoefficient));
}
