/**
 * Membrane / separator area resistance (area-specific resistance, ASR [Ω·m²]) and its
 * temperature dependence, plus the Springer–Zawodzinski–Gottesfeld (1991) model of PFSA
 * membrane conductivity and water uptake.
 *
 * Three ways to state a membrane (domain §5):
 * 1. ASR at a reference temperature with an Arrhenius law:
 *      ASR(T) = ASR_ref·exp[(E_a/R)(1/T − 1/T_ref)]          (common practice)
 * 2. ASR at a reference temperature with a linear conductivity temperature coefficient α:
 *      σ(T) = σ_ref[1 + α(T − T_ref)]  ⇒  ASR(T) = ASR_ref/[1 + α(T − T_ref)]   (common practice)
 * 3. Thickness and conductivity: ASR = δ/σ.
 */
import { GAS_CONSTANT } from '../constants.js';
import { InputError, PhysicsError } from '../errors.js';
import { UNIT_TABLES } from '../units.js';
import { requireFinite, requireNonNegative, requirePositive, requireTemperature } from '../thermo/guards.js';

/**
 * ASR(T) = ASR_ref·exp[(E_a/R)(1/T − 1/T_ref)] [Ω·m²].
 * asrRef [Ω·m²] > 0, referenceTemperature and temperature [K] > 0, activationEnergy [J/mol]
 * (≥ 0 for a resistance that falls with temperature; any finite value accepted).
 * Validity: as far as the Arrhenius law holds for the material (user's data). Common practice.
 */
export function asrArrhenius(asrRef: number, referenceTemperature: number, activationEnergy: number, temperature: number): number {
  requirePositive('membrane.areaResistance', asrRef, 'Ω·m²');
  requireTemperature('membrane.referenceTemperature', referenceTemperature);
  requireFinite('membrane.activationEnergy', activationEnergy, 'J/mol');
  requireTemperature('temperature', temperature);
  const value = asrRef * Math.exp((activationEnergy / GAS_CONSTANT.value) * (1 / temperature - 1 / referenceTemperature));
  if (!Number.isFinite(value)) throw new InputError('membrane.activationEnergy', 'gives an overflowing resistance at this temperature', activationEnergy);
  return value;
}

/**
 * ASR(T) = ASR_ref/[1 + α(T − T_ref)] [Ω·m²] for a linear conductivity temperature
 * coefficient α [1/K] (e.g. 0.02 for 2 %/K). asrRef [Ω·m²] > 0, temperatures [K].
 * Throws PhysicsError when 1 + α(T − T_ref) ≤ 0 (the linear law has left its range).
 * Common practice.
 */
export function asrLinear(asrRef: number, referenceTemperature: number, temperatureCoefficient: number, temperature: number): number {
  requirePositive('membrane.areaResistance', asrRef, 'Ω·m²');
  requireTemperature('membrane.referenceTemperature', referenceTemperature);
  requireFinite('membrane.temperatureCoefficient', temperatureCoefficient, '1/K');
  requireTemperature('temperature', temperature);
  const factor = 1 + temperatureCoefficient * (temperature - referenceTemperature);
  if (factor <= 0) {
    throw new PhysicsError('membrane.temperatureCoefficient', `linear temperature law gives a non-positive conductivity factor (${factor.toFixed(3)}) at ${temperature} K`);
  }
  return asrRef / factor;
}

/** ASR = δ/σ [Ω·m²]; thickness δ [m] ≥ 0, conductivity σ [S/m] > 0. */
export function asrFromConductivity(thickness: number, conductivity: number): number {
  requireNonNegative('membrane.thickness', thickness, 'm');
  requirePositive('membrane.conductivity', conductivity, 'S/m');
  return thickness / conductivity;
}

// ---------------------------------------------------------------------------------------
// Springer, Zawodzinski & Gottesfeld, J. Electrochem. Soc. 138 (1991) 2334–2342
// ---------------------------------------------------------------------------------------

/**
 * Springer σ(λ, 303 K) = a·λ − b in S/cm: a = 0.005139, b = 0.00326; temperature factor
 * exp[1268 K·(1/303 K − 1/T)] (all source seen via secondary, check-values §6).
 */
export const SPRINGER = { a: 0.005139, b: 0.00326, activationTemperature: 1268, referenceTemperature: 303 } as const;
/**
 * Water-uptake polynomial at 30 °C, λ = c0 + c1 a + c2 a² + c3 a³ (0 < a ≤ 1), and
 * λ = 14 + 1.4 (a − 1) for 1 < a ≤ 3 (all from memory, check-values §6).
 */
export const SPRINGER_UPTAKE = { c0: 0.043, c1: 17.81, c2: -39.85, c3: 36.0, lambdaAtSaturation: 14, slopeAboveSaturation: 1.4, activityMax: 3 } as const;
/** Below λ = 1 Springer's linear conductivity law is not applicable (it crosses zero near λ = b/a ≈ 0.63; the cut at 1 is a project choice). */
const SPRINGER_LAMBDA_MIN = 1;
/** Temperature window [K] outside which a warning is given (0–100 °C, project choice; the model was built for ≈ 30–80 °C, from memory). */
const SPRINGER_T_WINDOW = [273.15, 373.15] as const;
/** S/cm → S/m (units.ts). */
const S_PER_CM_IN_S_PER_M = UNIT_TABLES.conductivity['S/cm'];

export interface MembraneConductivityResult {
  /** σ [S/m]. */
  value: number;
  warnings: string[];
  source: string;
}

/**
 * PFSA (Nafion-type, EW ≈ 1100) proton conductivity (Springer et al. 1991):
 *   σ(λ, T) = (0.005139 λ − 0.00326)·exp[1268 K·(1/303 K − 1/T)]   [S/cm] → ×100 [S/m]
 * λ = water molecules per sulfonic-acid site [–], T [K].
 * Validity: λ ≥ 1 (InputError below), model built for ≈ 30–80 °C (warning outside 273–373 K).
 * Source: Springer, Zawodzinski & Gottesfeld, J. Electrochem. Soc. 138 (1991) 2334 (formula
 * source seen via secondary, check-values §6).
 */
export function springerConductivity(lambda: number, temperature: number): MembraneConductivityResult {
  requireFinite('membrane.waterContent', lambda);
  if (lambda < SPRINGER_LAMBDA_MIN) {
    throw new InputError('membrane.waterContent', `Springer conductivity needs λ ≥ ${SPRINGER_LAMBDA_MIN} water per sulfonic site`, lambda);
  }
  requireTemperature('temperature', temperature);
  const warnings: string[] = [];
  if (temperature < SPRINGER_T_WINDOW[0] || temperature > SPRINGER_T_WINDOW[1]) {
    warnings.push('Springer membrane conductivity: temperature outside 0–100 °C; the 1991 model was built for about 30–80 °C.');
  }
  const sPerCm = (SPRINGER.a * lambda - SPRINGER.b) * Math.exp(SPRINGER.activationTemperature * (1 / SPRINGER.referenceTemperature - 1 / temperature));
  return { value: sPerCm * S_PER_CM_IN_S_PER_M, warnings, source: 'Springer, Zawodzinski & Gottesfeld, J. Electrochem. Soc. 138 (1991) 2334' };
}

/**
 * Springer et al. (1991) water uptake of the PFSA membrane at 30 °C from water-vapour
 * activity a [–]:
 *   λ = 0.043 + 17.81 a − 39.85 a² + 36.0 a³   for 0 < a ≤ 1
 *   λ = 14 + 1.4 (a − 1)                        for 1 < a ≤ 3
 * Coefficients from memory (check-values §6); checks λ(1) = 14.003, λ(0.5) = 3.486.
 * Throws InputError outside 0 < a ≤ 3. (Liquid-equilibrated membranes: λ ≈ 22, not covered.)
 */
export function springerWaterUptake(waterActivity: number): number {
  requireFinite('membrane.waterActivity', waterActivity);
  const u = SPRINGER_UPTAKE;
  if (waterActivity <= 0 || waterActivity > u.activityMax) {
    throw new InputError('membrane.waterActivity', `must be in (0, ${u.activityMax}]`, waterActivity);
  }
  const a = waterActivity;
  if (a <= 1) return u.c0 + u.c1 * a + u.c2 * a * a + u.c3 * a * a * a;
  return u.lambdaAtSaturation + u.slopeAboveSaturation * (a - 1);
}

/** ASR = δ/σ_Springer(λ, T) [Ω·m²] for a PFSA membrane of thickness δ [m]. */
export function springerAreaResistance(thickness: number, lambda: number, temperature: number): MembraneConductivityResult {
  const s = springerConductivity(lambda, temperature);
  return { value: asrFromConductivity(thickness, s.value), warnings: s.warnings, source: s.source };
}
