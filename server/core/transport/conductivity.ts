/**
 * Electrolytic conductivity σ [S/m] of the process electrolytes from published
 * correlations, each with its validity range; every function returns
 * { value, warnings } and warns (never silently extrapolates) outside its range.
 *
 * - KOH: Gilliam, Graydon, Kirk & Thorpe, Int. J. Hydrogen Energy 32 (2007) 359–364
 *   (molarity basis, 0–12 M, 0–100 °C). Source seen via secondary (check-values §5a).
 * - NaCl: Sen & Goode, Geophysics 57 (1992) 89–96 (molality basis). Formula source seen in
 *   public code (several copies) quoting Sen & Goode / Watanabe et al. (2021; journal details
 *   not recorded here).
 * - NaOH: NO published correlation could be confirmed. A from-memory estimate is provided,
 *   flagged low confidence in every result (see naohConductivity).
 *
 * 1 S/m = 10 mS/cm = 0.01 S/cm.
 */
import { ZERO_CELSIUS_K } from '../constants.js';
import { InputError, PhysicsError } from '../errors.js';
import { UNIT_TABLES } from '../units.js';
import { molalityToMassFraction, molalityToMolarity, type Electrolyte } from '../thermo/concentration.js';
import { requireFinite, requirePositive, requireTemperature, describeTemperature } from '../thermo/guards.js';

export interface ConductivityResult {
  /** Conductivity σ [S/m]. */
  value: number;
  warnings: string[];
  /** Correlation name and citation. */
  source: string;
  /** 'source seen' | 'from memory, low confidence' (project confidence vocabulary). */
  confidence: string;
  /** Inputs as used by the correlation (SI unless the key says otherwise). */
  inputs: Record<string, number>;
}

/** S/cm → S/m (units.ts). */
const S_PER_CM_IN_S_PER_M = UNIT_TABLES.conductivity['S/cm'];
/** mol/m³ per mol/L. */
const MOL_PER_M3_PER_MOL_PER_L = 1000;

function requireConductivityInputs(molality: number, temperature: number): void {
  requirePositive('molality', molality, 'mol/kg');
  requireTemperature('temperature', temperature);
}

function positiveOrThrow(value: number, name: string, detail: string): number {
  if (!Number.isFinite(value) || value <= 0) {
    throw new PhysicsError('conductivity', `${name} gives a non-positive conductivity (${value}) at ${detail}: far outside its range`);
  }
  return value;
}

// ---------------------------------------------------------------------------------------
// KOH — Gilliam et al. (2007)
// ---------------------------------------------------------------------------------------

/**
 * Gilliam et al. (2007) coefficients; σ in S/cm, M in mol/L, T in K. Source seen via
 * secondary (two independent code copies; check-values §5a).
 */
export const GILLIAM_KOH = { A: -2.041, B: -0.0028, C: 0.005332, D: 207.2, E: 0.001043, F: -3.0e-7 } as const;
/** Gilliam validity: 0–12 mol/L, 0–100 °C (abstract, source seen; check-values §5a). */
export const GILLIAM_RANGE = { molarityMax: 12 * MOL_PER_M3_PER_MOL_PER_L, temperature: [273.15, 373.15] as const };
const GILLIAM_SOURCE = 'Gilliam, Graydon, Kirk & Thorpe, Int. J. Hydrogen Energy 32 (2007) 359–364';

/**
 * KOH conductivity from molarity (Gilliam et al. 2007):
 *   σ [S/cm] = A·M + B·M² + C·M·T + D·M/T + E·M³ + F·M²·T²
 * molarity [mol/m³] (M = molarity/1000 in mol/L), T [K] → σ [S/m].
 * Validity: 0–12 mol/L and 0–100 °C; warning outside. Throws InputError for molarity ≤ 0.
 */
export function kohConductivityFromMolarity(molarity: number, temperature: number): ConductivityResult {
  requirePositive('molarity', molarity, 'mol/m³');
  requireTemperature('temperature', temperature);
  const M = molarity / MOL_PER_M3_PER_MOL_PER_L;
  const T = temperature;
  const k = GILLIAM_KOH;
  const warnings: string[] = [];
  if (molarity > GILLIAM_RANGE.molarityMax) {
    warnings.push(`KOH conductivity: ${M.toFixed(2)} mol/L is above the 0–12 mol/L range of the Gilliam et al. (2007) correlation; extrapolated.`);
  }
  if (T < GILLIAM_RANGE.temperature[0] || T > GILLIAM_RANGE.temperature[1]) {
    warnings.push(`KOH conductivity: ${describeTemperature(T)} is outside the 0–100 °C range of the Gilliam et al. (2007) correlation; extrapolated.`);
  }
  const sPerCm = k.A * M + k.B * M * M + k.C * M * T + (k.D * M) / T + k.E * M ** 3 + k.F * M * M * T * T;
  const value = positiveOrThrow(sPerCm * S_PER_CM_IN_S_PER_M, 'the Gilliam KOH correlation', `${M.toFixed(2)} mol/L, ${describeTemperature(T)}`);
  return { value, warnings, source: GILLIAM_SOURCE, confidence: 'source seen (via secondary)', inputs: { molarity, temperature } };
}

/**
 * KOH conductivity from molality m [mol/kg] at T [K] → σ [S/m]: the molarity at T is
 * obtained with the Laliberté–Cooper density (thermo/concentration.ts), then Gilliam et al.
 * (2007) is applied. Assumption: Gilliam's molarity is taken at the solution temperature.
 * Warnings of both steps are passed on.
 */
export function kohConductivity(molality: number, temperature: number): ConductivityResult {
  requireConductivityInputs(molality, temperature);
  const c = molalityToMolarity('KOH', molality, temperature);
  const r = kohConductivityFromMolarity(c.value, temperature);
  return {
    ...r,
    warnings: [...c.warnings, ...r.warnings],
    inputs: { molality, temperature, molarity: c.value, density: c.density, massFraction: c.massFraction },
  };
}

// ---------------------------------------------------------------------------------------
// NaCl — Sen & Goode (1992)
// ---------------------------------------------------------------------------------------

/** Sen & Goode (1992) coefficients (σ in S/m, t in °C, m in mol/kg); source seen in public code. */
export const SEN_GOODE_NACL = { a1: 5.6, a2: 0.27, a3: -1.5e-4, b1: 2.36, b2: 0.099, c: 0.214 } as const;
/**
 * Stated range used for warnings: molality ≤ 5 mol/kg (data seen to 4.74 mol/kg) and
 * 20–200 °C (from memory / data seen 22–200 °C).
 */
export const SEN_GOODE_RANGE = { molalityMax: 5, temperature: [293.15, 473.15] as const };
const SEN_GOODE_SOURCE = 'Sen & Goode, Geophysics 57 (1992) 89–96 (as quoted by Watanabe et al. 2021)';

/**
 * NaCl solution conductivity (Sen & Goode 1992):
 *   σ [S/m] = (5.6 + 0.27 t − 1.5×10⁻⁴ t²)·m − (2.36 + 0.099 t)/(1 + 0.214 √m)·m^1.5
 * m [mol/kg], t = T − 273.15 K [°C], T [K] → σ [S/m].
 * Validity (warnings outside): m ≤ 5 mol/kg (fitted data to ≈ 4.7 mol/kg; saturated brine
 * ≈ 6.1 mol/kg is an extrapolation), 20–200 °C.
 */
export function naclConductivity(molality: number, temperature: number): ConductivityResult {
  requireConductivityInputs(molality, temperature);
  const t = temperature - ZERO_CELSIUS_K.value;
  const m = molality;
  const k = SEN_GOODE_NACL;
  const warnings: string[] = [];
  if (m > SEN_GOODE_RANGE.molalityMax) {
    warnings.push(`NaCl conductivity: ${m.toFixed(2)} mol/kg is above the ≈ 5 mol/kg range of the Sen & Goode (1992) correlation; extrapolated.`);
  }
  if (temperature < SEN_GOODE_RANGE.temperature[0] || temperature > SEN_GOODE_RANGE.temperature[1]) {
    warnings.push(`NaCl conductivity: ${describeTemperature(temperature)} is outside the 20–200 °C range of the Sen & Goode (1992) correlation; extrapolated.`);
  }
  const sPerM = (k.a1 + k.a2 * t + k.a3 * t * t) * m - ((k.b1 + k.b2 * t) / (1 + k.c * Math.sqrt(m))) * m ** 1.5;
  const value = positiveOrThrow(sPerM, 'the Sen & Goode NaCl correlation', `${m.toFixed(2)} mol/kg, ${describeTemperature(temperature)}`);
  return { value, warnings, source: SEN_GOODE_SOURCE, confidence: 'source seen (via secondary: public code)', inputs: { molality, temperature } };
}

// ---------------------------------------------------------------------------------------
// NaOH — from-memory estimate (no published correlation confirmed)
// ---------------------------------------------------------------------------------------

/**
 * NaOH conductivity at 18 °C vs mass fraction, S/cm — FROM MEMORY, LOW CONFIDENCE
 * (recalled Kohlrausch-type handbook values; not confirmed against a source). Shape: maximum
 * ≈ 0.35 S/cm near 15 wt %, falling steeply at higher strengths (viscosity).
 */
const NAOH_18C_TABLE: ReadonlyArray<readonly [number, number]> = [
  [0, 0],
  [0.025, 0.1087],
  [0.05, 0.1969],
  [0.1, 0.3124],
  [0.15, 0.3463],
  [0.2, 0.327],
  [0.25, 0.2717],
  [0.3, 0.2022],
  [0.4, 0.1164],
  [0.5, 0.0822],
];
/** Reference temperature of the table [K] (18 °C). */
const NAOH_T_REF = 291.15;
/**
 * Temperature factor exp[θ(w)(1/T_ref − 1/T)] with θ linear in w: θ(0) = 1780 K (≈ 2 %/K
 * near 25 °C for dilute solutions, from memory) and θ(0.32) = 2400 K, TUNED so that 32 wt %
 * at 90 °C gives ≈ 0.95 S/cm — the middle of the 0.8–1.1 S/cm order-of-magnitude range noted
 * (from memory, low confidence) in check-values §5c. Not a published value.
 */
const NAOH_THETA = { dilute: 1780, at32wt: 2400, w32: 0.32 } as const;
/** Range used for warnings: the table's extent (to 50 wt %) and 0–100 °C (project choice). */
const NAOH_RANGE = { massFractionMax: 0.5, temperature: [273.15, 373.15] as const };
export const NAOH_CONDUCTIVITY_CAVEAT =
  'NaOH conductivity: no published correlation could be confirmed; this estimate uses from-memory handbook values at 18 °C and an assumed temperature factor (low confidence; errors of ±20 % or more are possible). Use measured conductivity data for design.';

function interpolateTable(table: ReadonlyArray<readonly [number, number]>, x: number): number {
  if (x <= table[0][0]) return table[0][1];
  for (let i = 1; i < table.length; i++) {
    const [x1, y1] = table[i];
    if (x <= x1) {
      const [x0, y0] = table[i - 1];
      return y0 + ((y1 - y0) * (x - x0)) / (x1 - x0);
    }
  }
  const n = table.length;
  const [x0, y0] = table[n - 2];
  const [x1, y1] = table[n - 1];
  return y1 + ((y1 - y0) * (x - x1)) / (x1 - x0);
}

/**
 * NaOH solution conductivity, FROM MEMORY, LOW CONFIDENCE:
 *   σ(w, T) = σ₁₈(w)·exp[θ(w)·(1/291.15 K − 1/T)]
 * σ₁₈ by linear interpolation of a from-memory 18 °C table (NAOH_18C_TABLE), θ(w) linear in
 * w (NAOH_THETA). m [mol/kg] → w exactly; T [K] → σ [S/m].
 * Validity claimed: w ≤ 50 wt %, 0–100 °C; every result carries NAOH_CONDUCTIVITY_CAVEAT.
 */
export function naohConductivity(molality: number, temperature: number): ConductivityResult {
  requireConductivityInputs(molality, temperature);
  const w = molalityToMassFraction('NaOH', molality);
  const warnings = [NAOH_CONDUCTIVITY_CAVEAT];
  if (w > NAOH_RANGE.massFractionMax) warnings.push(`NaOH conductivity: ${(w * 100).toFixed(1)} wt % is above the 50 wt % end of the table; extrapolated.`);
  if (temperature < NAOH_RANGE.temperature[0] || temperature > NAOH_RANGE.temperature[1]) {
    warnings.push(`NaOH conductivity: ${describeTemperature(temperature)} is outside 0–100 °C; extrapolated.`);
  }
  const sigma18 = interpolateTable(NAOH_18C_TABLE, w) * S_PER_CM_IN_S_PER_M;
  const theta = NAOH_THETA.dilute + ((NAOH_THETA.at32wt - NAOH_THETA.dilute) * w) / NAOH_THETA.w32;
  const value = positiveOrThrow(sigma18 * Math.exp(theta * (1 / NAOH_T_REF - 1 / temperature)), 'the NaOH estimate', `${(w * 100).toFixed(1)} wt %`);
  return {
    value,
    warnings,
    source: 'Estimate: from-memory 18 °C handbook values with an assumed temperature factor (no published correlation confirmed)',
    confidence: 'from memory, low confidence',
    inputs: { molality, temperature, massFraction: w },
  };
}

/** σ [S/m] of the named electrolyte at molality m [mol/kg] and T [K] (dispatches to the above). */
export function electrolyteConductivity(electrolyte: Electrolyte, molality: number, temperature: number): ConductivityResult {
  requireFinite('molality', molality, 'mol/kg');
  switch (electrolyte) {
    case 'KOH':
      return kohConductivity(molality, temperature);
    case 'NaCl':
      return naclConductivity(molality, temperature);
    case 'NaOH':
      return naohConductivity(molality, temperature);
    default:
      throw new InputError('electrolyte', `unknown electrolyte "${String(electrolyte)}" (NaCl, NaOH or KOH)`, electrolyte);
  }
}
