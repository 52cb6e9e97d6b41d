/**
 * Pitzer ion-interaction model for a single 1-1 electrolyte (NaCl, NaOH, KOH in water):
 * mean ionic activity coefficient γ±, osmotic coefficient φ and water activity a_w.
 *
 * Equations (1-1 salt, I = m; Pitzer & Mayorga 1973; Pitzer 1991, ch. 3):
 *   f^γ  = −A^φ [√I/(1 + b√I) + (2/b) ln(1 + b√I)]
 *   B^γ  = 2β⁰ + (2β¹/(α²I)) [1 − (1 + α√I − α²I/2) e^(−α√I)]
 *   ln γ± = f^γ + m B^γ + m² (3/2) C^φ
 *   φ − 1 = −A^φ √I/(1 + b√I) + m (β⁰ + β¹ e^(−α√I)) + m² C^φ
 *   ln a_w = −ν m M_w φ,  ν = 2
 * with b = 1.2 kg^½ mol^−½ and α = 2.0 kg^½ mol^−½ (standard choices for 1-1 salts; from
 * memory, Pitzer 1973/1991), M_w the molar mass of water [kg/mol].
 *
 * Parameters at 25 °C: Pitzer & Mayorga, J. Phys. Chem. 77 (1973) 2300, Table I (source seen
 * via secondary transcription). Temperature: first-order expansion
 *   β(T) = β(298.15) + (∂β/∂T)·(T − 298.15)
 * with the 25 °C derivatives of Silvester & Pitzer (1977/1979; years from memory, check-values
 * §4b names 1979) as tabulated in Pitzer (1991),
 * ch. 3, Table 12 (source seen via secondary) — available for NaCl and NaOH only. KOH has
 * no temperature derivatives here: its 25 °C parameters are used unchanged and every
 * result away from 25 °C carries a warning. A^φ(T) from Møller (1988) (water.ts).
 *
 * Validity (warnings outside; the numbers are still returned, never silently):
 * - molality: NaCl ≤ 6.0, NaOH ≤ 2.5 (25 °C fit; the derivatives hold to 4.2), KOH ≤ 5.5
 *   mol/kg — the fit ranges of PM73 Table I, from memory, low confidence.
 * - temperature: the linear expansion is treated as valid for 0–50 °C (from memory: a common
 *   statement for first-order Pitzer temperature expansions); KOH only near 25 °C (15–35 °C).
 * Plant caustic (32 wt % NaOH ≈ 11.8 mol/kg, 85–90 °C) and 30 wt % KOH (≈ 7.6 mol/kg,
 * 70–90 °C) lie far outside: results there are extrapolations and are flagged as such.
 */
import { MOLAR_MASS, T_STANDARD, ZERO_CELSIUS_K } from '../constants.js';
import { InputError } from '../errors.js';
import { requireNonNegative, requireTemperature, describeTemperature } from './guards.js';
import { debyeHuckelOsmoticSlope } from './water.js';
import type { Electrolyte } from './concentration.js';

/** Pitzer b = 1.2 kg^½ mol^−½ (standard for all salts; from memory, Pitzer 1973). */
export const PITZER_B = 1.2;
/** Pitzer α₁ = 2.0 kg^½ mol^−½ (standard for 1-1 salts; from memory, Pitzer 1973). */
export const PITZER_ALPHA = 2.0;
/** Stoichiometric number ν = ν₊ + ν₋ of a 1-1 salt. */
const NU_1_1 = 2;

export interface PitzerParameters {
  salt: Electrolyte;
  beta0: number;
  beta1: number;
  cPhi: number;
  /** ∂β⁰/∂T at 25 °C [1/K], or undefined when not available. */
  dBeta0dT?: number;
  dBeta1dT?: number;
  dCphidT?: number;
  /** Maximum molality of the 25 °C fit [mol/kg]. */
  maxMolality: number;
  /** Temperature window [K] in which the (expanded) parameters are treated as valid. */
  temperatureRange: readonly [number, number];
  source: string;
  confidence: string;
}

const PM73 = 'Pitzer & Mayorga, J. Phys. Chem. 77 (1973) 2300, Table I';
const SP_DERIV = 'Pitzer (1991) ch. 3, Table 12 (after Silvester & Pitzer 1977/1979)';
/** 0–50 °C window for first-order temperature expansions [K] (from memory). */
const LINEAR_T_WINDOW: readonly [number, number] = [273.15, 323.15];
/** 15–35 °C window for 25 °C-only parameters [K] (our choice: ±10 K about 25 °C). */
const NEAR_25C_WINDOW: readonly [number, number] = [288.15, 308.15];

export const PITZER_PARAMETERS: Readonly<Record<Electrolyte, PitzerParameters>> = {
  NaCl: {
    salt: 'NaCl', beta0: 0.0765, beta1: 0.2664, cPhi: 0.00127,
    dBeta0dT: 7.159e-4, dBeta1dT: 7.005e-4, dCphidT: -10.54e-5,
    maxMolality: 6.0, temperatureRange: LINEAR_T_WINDOW,
    source: `${PM73}; temperature derivatives ${SP_DERIV}`,
    confidence: '25 °C parameters and derivatives source seen (via secondary); fit limit 6 mol/kg from memory',
  },
  NaOH: {
    salt: 'NaOH', beta0: 0.0864, beta1: 0.253, cPhi: 0.0044,
    dBeta0dT: 7.0e-4, dBeta1dT: 1.34e-4, dCphidT: -18.94e-5,
    maxMolality: 2.5, temperatureRange: LINEAR_T_WINDOW,
    source: `${PM73}; temperature derivatives ${SP_DERIV} (derivatives stated to 4.2 mol/kg)`,
    confidence: '25 °C parameters and derivatives source seen (via secondary); fit limit 2.5 mol/kg from memory, low confidence',
  },
  KOH: {
    salt: 'KOH', beta0: 0.1298, beta1: 0.32, cPhi: 0.0041,
    maxMolality: 5.5, temperatureRange: NEAR_25C_WINDOW,
    source: `${PM73}; no temperature derivatives available here (25 °C values used at all T)`,
    confidence: '25 °C parameters source seen (via secondary); fit limit 5.5 mol/kg from memory, low confidence',
  },
};

export interface ActivityResult {
  salt: Electrolyte;
  /** Molality [mol/kg]. */
  molality: number;
  /** T [K]. */
  temperature: number;
  /** Mean ionic activity coefficient γ± (molality scale) [–]. */
  meanActivityCoefficient: number;
  /** ln γ± [–]. */
  lnMeanActivityCoefficient: number;
  /** Osmotic coefficient φ [–]. */
  osmoticCoefficient: number;
  /** Water activity a_w [–]. */
  waterActivity: number;
  /** ln a_w [–]. */
  lnWaterActivity: number;
  /** A^φ used [kg^½ mol^−½]. */
  debyeHuckelSlope: number;
  /** β⁰, β¹, C^φ used (after the temperature expansion). */
  parameters: { beta0: number; beta1: number; cPhi: number };
  /** True when m and T are inside the stated validity of the parameters. */
  withinValidity: boolean;
  warnings: string[];
}

/** Below this α√I the bracket in B^γ is evaluated by its series 1 − (5/6)x (avoids 0/0). */
const SERIES_SWITCH = 1e-4;

/** g(x) = 2[1 − (1 + x − x²/2) e^(−x)]/x² so that B^γ = 2β⁰ + β¹ g(α√I). Exact limit g(0) = 2. */
function gammaBracket(x: number): number {
  if (x < SERIES_SWITCH) return 2 * (1 - (5 / 6) * x);
  return (2 * (1 - (1 + x - (x * x) / 2) * Math.exp(-x))) / (x * x);
}

/**
 * γ±, φ and a_w of a single 1-1 salt at molality m [mol/kg] and temperature T [K] by the
 * Pitzer equations in the module doc. Always returns a result; `warnings` name every
 * extrapolation (molality beyond the fit, temperature outside the parameter window) with
 * its source. Throws InputError for m < 0, non-finite input or T outside 0–300 °C (A^φ range).
 */
export function pitzerActivity(salt: Electrolyte, molality: number, temperature: number): ActivityResult {
  const p = PITZER_PARAMETERS[salt];
  if (!p) throw new InputError('electrolyte', `unknown electrolyte "${salt}" (NaCl, NaOH or KOH)`, salt);
  requireNonNegative('molality', molality, 'mol/kg');
  requireTemperature('temperature', temperature);
  const aPhi = debyeHuckelOsmoticSlope(temperature);
  const dT = temperature - T_STANDARD.value;
  const beta0 = p.beta0 + (p.dBeta0dT ?? 0) * dT;
  const beta1 = p.beta1 + (p.dBeta1dT ?? 0) * dT;
  const cPhi = p.cPhi + (p.dCphidT ?? 0) * dT;

  const warnings: string[] = [];
  let withinValidity = true;
  if (molality > p.maxMolality) {
    withinValidity = false;
    warnings.push(
      `${salt} activity: ${molality.toPrecision(4)} mol/kg is beyond the Pitzer fit range (≤ ${p.maxMolality} mol/kg at 25 °C, ${PM73}; limit from memory, low confidence). γ±, φ and a_w are extrapolations and may be badly wrong.`,
    );
  }
  const [tLo, tHi] = p.temperatureRange;
  if (temperature < tLo || temperature > tHi) {
    withinValidity = false;
    warnings.push(
      p.dBeta0dT === undefined
        ? `${salt} activity: only 25 °C Pitzer parameters are available; at ${describeTemperature(temperature)} they are used unchanged (extrapolation in temperature).`
        : `${salt} activity: Pitzer parameters extrapolated to ${describeTemperature(temperature)} with 25 °C temperature derivatives (treated as valid ${tLo - ZERO_CELSIUS_K.value}–${tHi - ZERO_CELSIUS_K.value} °C, from memory); treat γ±, φ and a_w as estimates.`,
    );
  }

  const I = molality; // ionic strength of a 1-1 salt
  const sqrtI = Math.sqrt(I);
  const x = PITZER_ALPHA * sqrtI;
  const expX = Math.exp(-x);
  const denom = 1 + PITZER_B * sqrtI;
  const fGamma = -aPhi * (sqrtI / denom + (2 / PITZER_B) * Math.log(denom));
  const bGamma = 2 * beta0 + beta1 * gammaBracket(x);
  const lnGamma = fGamma + molality * bGamma + molality * molality * 1.5 * cPhi;
  const phi = 1 - (aPhi * sqrtI) / denom + molality * (beta0 + beta1 * expX) + molality * molality * cPhi;
  const lnAw = -NU_1_1 * molality * MOLAR_MASS.H2O * phi;

  if (!Number.isFinite(lnGamma) || !Number.isFinite(lnAw)) {
    throw new InputError('molality', `${salt}: Pitzer model gives no finite value at these conditions`, molality);
  }
  if (phi <= 0) {
    withinValidity = false;
    warnings.push(`${salt} activity: osmotic coefficient φ = ${phi.toPrecision(3)} ≤ 0 — the extrapolated parameters are unphysical here.`);
  }
  return {
    salt,
    molality,
    temperature,
    meanActivityCoefficient: Math.exp(lnGamma),
    lnMeanActivityCoefficient: lnGamma,
    osmoticCoefficient: phi,
    waterActivity: Math.exp(lnAw),
    lnWaterActivity: lnAw,
    debyeHuckelSlope: aPhi,
    parameters: { beta0, beta1, cPhi },
    withinValidity,
    warnings,
  };
}
