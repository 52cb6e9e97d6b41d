/**
 * Species records for the electrolysis reactions: standard formation enthalpy ΔfH°, standard
 * formation Gibbs energy ΔfG° and standard entropy S° at 298.15 K and 1 bar, and a heat
 * capacity model Cp(T), each with its source and a confidence mark.
 *
 * Conventions
 * - SI units: J/mol, J/(mol·K), K.
 * - Standard state p° = 1 bar; aqueous species on the molality scale (m° = 1 mol/kg,
 *   hypothetical ideal solution). Aqueous ions follow the convention that H⁺(aq) has
 *   ΔfH° = ΔfG° = S° = Cp° = 0.
 * - "ao" species (NaCl, NaOH, KOH in water) are the fully dissociated standard state: their
 *   values are the sums of the ions' values to table rounding (NBS-82 lists them so; the
 *   tabulated S° of NaOH(ao) 48.1 and KOH(ao) 91.6 sit 0.15 J/(mol·K) below the ion sums
 *   48.25 and 91.75, check-values §2a, all from memory there).
 *
 * Temperature functions (Kirchhoff and entropy integration from 298.15 K):
 *   H(T) = ΔfH°(298.15) + ∫ Cp dT,   S(T) = S°(298.15) + ∫ Cp/T dT,   G(T) = H(T) − T·S(T).
 * H uses the formation-enthalpy convention and S the absolute (third-law / H⁺-convention)
 * entropy, so G is the "Gibbs function" of the species (Cantera's convention), not ΔfG(T).
 * Reaction sums of G are nevertheless correct because elements balance.
 *
 * Heat capacity models
 * - Gases and liquid water: NIST Chemistry WebBook Shomate fits (data origin NIST-JANAF,
 *   Chase 1998, J. Phys. Chem. Ref. Data Monograph 9), used only for the temperature
 *   increments; the 298.15 K anchors are the NBS-82 values so E° and U_tn at 25 °C equal
 *   the table values exactly.
 * - Aqueous ions and "ao" salts: constant Cp° at its 298.15 K value. This is an
 *   APPROXIMATION: standard partial molar heat capacities of ions change by tens of
 *   J/(mol·K) between 25 and 100 °C. In the chlor-alkali reaction the NaCl and NaOH errors
 *   largely cancel (both carry Na⁺); our estimate (from memory, low confidence) is an error
 *   of ≲ 1 mV in E_rev and up to ~5 mV in U_tn at 90 °C — an estimate, not a measured bound.
 *
 * Sources: Wagman et al., "The NBS tables of chemical thermodynamic properties",
 * J. Phys. Chem. Ref. Data 11, Suppl. 2 (1982) — "NBS-82"; CODATA Key Values (Cox, Wagman &
 * Medvedev, 1989) for cross-checks; NIST WebBook Shomate coefficients as transcribed in the
 * project's check-values §2a and §3.
 */
import { MOLAR_MASS, ATOMIC_WEIGHT, T_STANDARD } from '../constants.js';

/** One Shomate segment: coefficients A–H as on the NIST WebBook, valid tMin–tMax [K]. */
export interface ShomateSegment {
  /** Lower end of the published fit range [K]. */
  tMin: number;
  /** Upper end of the published fit range [K]. */
  tMax: number;
  A: number;
  B: number;
  C: number;
  D: number;
  E: number;
  F: number;
  G: number;
  H: number;
}

export type HeatCapacityModel =
  | { kind: 'shomate'; segments: readonly ShomateSegment[]; note: string }
  | { kind: 'constant'; note: string };

export type SpeciesId =
  | 'H2O(l)'
  | 'H2O(g)'
  | 'H2(g)'
  | 'O2(g)'
  | 'Cl2(g)'
  | 'Na+(aq)'
  | 'Cl-(aq)'
  | 'OH-(aq)'
  | 'K+(aq)'
  | 'NaCl(aq)'
  | 'NaOH(aq)'
  | 'KOH(aq)';

export interface SpeciesRecord {
  id: SpeciesId;
  /** Display formula. */
  formula: string;
  phase: 'gas' | 'liquid' | 'aqueous';
  /** Molar mass [kg/mol]. */
  molarMass: number;
  /** ΔfH°(298.15 K) [J/mol]. */
  formationEnthalpy: number;
  /** ΔfG°(298.15 K) [J/mol]. */
  formationGibbsEnergy: number;
  /** S°(298.15 K) [J/(mol·K)] (aqueous ions: H⁺ convention). */
  entropy: number;
  /** Cp°(298.15 K) [J/(mol·K)] as tabulated (the constant value for aqueous species). */
  heatCapacity298: number;
  heatCapacityModel: HeatCapacityModel;
  /** Temperature range [K] over which the record's Cp model is trusted here. */
  temperatureRange: readonly [number, number];
  source: string;
  /** Confidence mark in the project's vocabulary (source seen / from memory / derived). */
  confidence: string;
}

const KJ = 1000; // J per kJ (exact)
/** Shomate reduced temperature t = T / 1000 K (WebBook convention). */
const SHOMATE_T_SCALE = 1000;

// ---------------------------------------------------------------------------------------
// Shomate kernels (NIST WebBook form). t = T/1000.
// Cp = A + B t + C t² + D t³ + E/t²                              [J/(mol·K)]
// H − H(298.15) = A t + B t²/2 + C t³/3 + D t⁴/4 − E/t + F − H     [kJ/mol]
// S = A ln t + B t + C t²/2 + D t³/3 − E/(2t²) + G                  [J/(mol·K)]
// ---------------------------------------------------------------------------------------

/** Shomate heat capacity Cp(T) [J/(mol·K)]; T [K]. Source: NIST Chemistry WebBook. */
export function shomateHeatCapacity(s: ShomateSegment, temperature: number): number {
  const t = temperature / SHOMATE_T_SCALE;
  return s.A + s.B * t + s.C * t * t + s.D * t * t * t + s.E / (t * t);
}

/**
 * Shomate enthalpy H(T) − H(298.15 K) [J/mol] exactly as the WebBook formula gives it (the
 * fit's own value at 298.15 K may differ from 0 by a few J/mol). T [K].
 */
export function shomateEnthalpyIncrement(s: ShomateSegment, temperature: number): number {
  const t = temperature / SHOMATE_T_SCALE;
  const kj = s.A * t + (s.B * t * t) / 2 + (s.C * t ** 3) / 3 + (s.D * t ** 4) / 4 - s.E / t + s.F - s.H;
  return kj * KJ;
}

/** Shomate absolute entropy S(T) [J/(mol·K)]; T [K]. Source: NIST Chemistry WebBook. */
export function shomateEntropy(s: ShomateSegment, temperature: number): number {
  const t = temperature / SHOMATE_T_SCALE;
  return s.A * Math.log(t) + s.B * t + (s.C * t * t) / 2 + (s.D * t ** 3) / 3 - s.E / (2 * t * t) + s.G;
}

// ---------------------------------------------------------------------------------------
// Shomate coefficient sets (check-values §3; NIST WebBook, data origin NIST-JANAF).
// Confidence: "source seen (via secondary)".
// ---------------------------------------------------------------------------------------

export const SHOMATE: Readonly<Record<'H2(g)' | 'O2(g)' | 'Cl2(g)' | 'H2O(l)' | 'H2O(g)', readonly ShomateSegment[]>> = {
  'H2(g)': [
    { tMin: 298, tMax: 1000, A: 33.066178, B: -11.363417, C: 11.432816, D: -2.772874, E: -0.158558, F: -9.980797, G: 172.707974, H: 0 },
    { tMin: 1000, tMax: 2500, A: 18.563083, B: 12.257357, C: -2.859786, D: 0.268238, E: 1.97799, F: -1.147438, G: 156.288133, H: 0 },
    { tMin: 2500, tMax: 6000, A: 43.41356, B: -4.293079, C: 1.272428, D: -0.096876, E: -20.533862, F: -38.515158, G: 162.081354, H: 0 },
  ],
  'O2(g)': [
    { tMin: 100, tMax: 700, A: 31.32234, B: -20.23531, C: 57.86644, D: -36.50624, E: -0.007374, F: -8.903471, G: 246.7945, H: 0 },
    { tMin: 700, tMax: 2000, A: 30.03235, B: 8.772972, C: -3.988133, D: 0.788313, E: -0.741599, F: -11.32468, G: 236.1663, H: 0 },
    { tMin: 2000, tMax: 6000, A: 20.91111, B: 10.72071, C: -2.020498, D: 0.146449, E: 9.245722, F: 5.337651, G: 237.6185, H: 0 },
  ],
  'Cl2(g)': [
    { tMin: 298, tMax: 1000, A: 33.0506, B: 12.2294, C: -12.0651, D: 4.38533, E: -0.159494, F: -10.8348, G: 259.029, H: 0 },
    { tMin: 1000, tMax: 3000, A: 42.6773, B: -5.00957, C: 1.904621, D: -0.165641, E: -2.09848, F: -17.2898, G: 269.84, H: 0 },
    { tMin: 3000, tMax: 6000, A: -42.5535, B: 41.6857, C: -7.12683, D: 0.387839, E: 101.144, F: 132.764, G: 264.786, H: 0 },
  ],
  'H2O(l)': [
    { tMin: 298, tMax: 500, A: -203.606, B: 1523.29, C: -3196.413, D: 2474.455, E: 3.855326, F: -256.5478, G: -488.7163, H: -285.8304 },
  ],
  'H2O(g)': [
    { tMin: 500, tMax: 1700, A: 30.092, B: 6.832514, C: 6.793435, D: -2.53448, E: 0.082139, F: -250.881, G: 223.3967, H: -241.8264 },
    { tMin: 1700, tMax: 6000, A: 41.96426, B: 8.622053, C: -1.49978, D: 0.098119, E: -11.15764, F: -272.1797, G: 219.7809, H: -241.8264 },
  ],
};

const NBS82 = 'NBS-82: Wagman et al., J. Phys. Chem. Ref. Data 11, Suppl. 2 (1982)';
const SHOMATE_NOTE = 'NIST WebBook Shomate fit (NIST-JANAF, Chase 1998) for the temperature increments; 298.15 K anchors from NBS-82';
const CONSTANT_CP_NOTE =
  'Constant Cp° = value at 298.15 K (NBS-82). Approximation: ionic partial molar heat capacities vary with temperature (estimated effect ≲ 1 mV in E_rev, up to ~5 mV in U_tn at 90 °C for chlor-alkali; from memory, low confidence).';
/** Trusted range for constant-Cp aqueous species [K]: 0–100 °C (our approximation window). */
const AQUEOUS_RANGE: readonly [number, number] = [273.15, 373.15];

const M_H2O = MOLAR_MASS.H2O;
const M_OH = ATOMIC_WEIGHT.O + ATOMIC_WEIGHT.H;

/**
 * The species table. Values in J/mol and J/(mol·K) (tables list kJ/mol: × 1000 here).
 * Confidence marks copied from check-values §2a.
 */
export const SPECIES: Readonly<Record<SpeciesId, SpeciesRecord>> = {
  'H2O(l)': {
    id: 'H2O(l)', formula: 'H₂O(l)', phase: 'liquid', molarMass: M_H2O,
    formationEnthalpy: -285.83 * KJ, formationGibbsEnergy: -237.129 * KJ, entropy: 69.91, heatCapacity298: 75.291,
    heatCapacityModel: {
      kind: 'shomate', segments: SHOMATE['H2O(l)'],
      note: `${SHOMATE_NOTE}. Fit range 298–500 K; used down to 273.15 K (short extrapolation: it gives Cp(0 °C) = 76.1 J/(mol·K), close to the accepted ≈ 76.0, from memory).`,
    },
    temperatureRange: [273.15, 500],
    source: NBS82,
    confidence: 'ΔfH°, ΔfG° source seen (via secondary); S°, Cp° from memory (CODATA 1989: S° = 69.95 ± 0.03, source seen)',
  },
  'H2O(g)': {
    id: 'H2O(g)', formula: 'H₂O(g)', phase: 'gas', molarMass: M_H2O,
    formationEnthalpy: -241.818 * KJ, formationGibbsEnergy: -228.572 * KJ, entropy: 188.825, heatCapacity298: 33.577,
    heatCapacityModel: {
      kind: 'shomate', segments: SHOMATE['H2O(g)'],
      note: `${SHOMATE_NOTE}. The WebBook fit starts at 500 K; below it we extrapolate the 500–1700 K segment down to 298.15 K. Check: at 298.15 K it returns Cp = 33.590 J/(mol·K) and S = 188.835 J/(mol·K) (CODATA 188.835), so the extrapolated ideal-gas values stay close.`,
    },
    temperatureRange: [273.15, 1700],
    source: NBS82,
    confidence: 'NBS-82 values from memory; CODATA 1989 ΔfH° = −241.826, S° = 188.835 (source seen via secondary)',
  },
  'H2(g)': {
    id: 'H2(g)', formula: 'H₂(g)', phase: 'gas', molarMass: MOLAR_MASS.H2,
    formationEnthalpy: 0, formationGibbsEnergy: 0, entropy: 130.684, heatCapacity298: 28.824,
    heatCapacityModel: { kind: 'shomate', segments: SHOMATE['H2(g)'], note: `${SHOMATE_NOTE}. Fit range from 298 K; 273.15–298 K is a short extrapolation.` },
    temperatureRange: [273.15, 6000],
    source: NBS82,
    confidence: 'S°, Cp° from memory (NBS-82); CODATA/NIST S° = 130.680 ± 0.003 source seen',
  },
  'O2(g)': {
    id: 'O2(g)', formula: 'O₂(g)', phase: 'gas', molarMass: MOLAR_MASS.O2,
    formationEnthalpy: 0, formationGibbsEnergy: 0, entropy: 205.138, heatCapacity298: 29.355,
    heatCapacityModel: { kind: 'shomate', segments: SHOMATE['O2(g)'], note: SHOMATE_NOTE },
    temperatureRange: [273.15, 6000],
    source: NBS82,
    confidence: 'S°, Cp° from memory (NBS-82); CODATA S° = 205.152 ± 0.005 source seen',
  },
  'Cl2(g)': {
    id: 'Cl2(g)', formula: 'Cl₂(g)', phase: 'gas', molarMass: MOLAR_MASS.Cl2,
    formationEnthalpy: 0, formationGibbsEnergy: 0, entropy: 223.066, heatCapacity298: 33.907,
    heatCapacityModel: { kind: 'shomate', segments: SHOMATE['Cl2(g)'], note: `${SHOMATE_NOTE}. Fit range from 298 K; 273.15–298 K is a short extrapolation.` },
    temperatureRange: [273.15, 6000],
    source: NBS82,
    confidence: 'S°, Cp° from memory (NBS-82); CODATA S° = 223.081 ± 0.010 source seen',
  },
  'Na+(aq)': {
    id: 'Na+(aq)', formula: 'Na⁺(aq)', phase: 'aqueous', molarMass: ATOMIC_WEIGHT.Na,
    formationEnthalpy: -240.12 * KJ, formationGibbsEnergy: -261.905 * KJ, entropy: 59.0, heatCapacity298: 46.4,
    heatCapacityModel: { kind: 'constant', note: CONSTANT_CP_NOTE },
    temperatureRange: AQUEOUS_RANGE,
    source: `${NBS82} (ΔfG° p. 2-299)`,
    confidence: 'ΔfH°, ΔfG°, Cp° source seen (via secondary); S° from memory',
  },
  'Cl-(aq)': {
    id: 'Cl-(aq)', formula: 'Cl⁻(aq)', phase: 'aqueous', molarMass: ATOMIC_WEIGHT.Cl,
    formationEnthalpy: -167.159 * KJ, formationGibbsEnergy: -131.228 * KJ, entropy: 56.5, heatCapacity298: -136.4,
    heatCapacityModel: { kind: 'constant', note: CONSTANT_CP_NOTE },
    temperatureRange: AQUEOUS_RANGE,
    source: `${NBS82} (ΔfG° p. 2-47)`,
    confidence: 'source seen (via secondary)',
  },
  'OH-(aq)': {
    id: 'OH-(aq)', formula: 'OH⁻(aq)', phase: 'aqueous', molarMass: M_OH,
    formationEnthalpy: -229.994 * KJ, formationGibbsEnergy: -157.244 * KJ, entropy: -10.75, heatCapacity298: -148.5,
    heatCapacityModel: { kind: 'constant', note: CONSTANT_CP_NOTE },
    temperatureRange: AQUEOUS_RANGE,
    source: `${NBS82} (ΔfG° p. 2-38)`,
    confidence: 'ΔfH°, ΔfG°, S° source seen (via secondary); Cp° from memory',
  },
  'K+(aq)': {
    id: 'K+(aq)', formula: 'K⁺(aq)', phase: 'aqueous', molarMass: ATOMIC_WEIGHT.K,
    formationEnthalpy: -252.38 * KJ, formationGibbsEnergy: -283.27 * KJ, entropy: 102.5, heatCapacity298: 21.8,
    heatCapacityModel: { kind: 'constant', note: CONSTANT_CP_NOTE },
    temperatureRange: AQUEOUS_RANGE,
    source: `${NBS82} (ΔfG° p. 2-328)`,
    confidence: 'ΔfH°, ΔfG°, Cp° source seen (via secondary); S° from memory',
  },
  'NaCl(aq)': {
    id: 'NaCl(aq)', formula: 'NaCl(aq, ao)', phase: 'aqueous', molarMass: MOLAR_MASS.NaCl,
    formationEnthalpy: -407.27 * KJ, formationGibbsEnergy: -393.133 * KJ, entropy: 115.5, heatCapacity298: -90.0,
    heatCapacityModel: { kind: 'constant', note: CONSTANT_CP_NOTE },
    temperatureRange: AQUEOUS_RANGE,
    source: `${NBS82} ("ao" = Na⁺ + Cl⁻)`,
    confidence: 'ΔfH° source seen (via secondary); ΔfG°, S°, Cp° from memory (they equal the ion sums)',
  },
  'NaOH(aq)': {
    id: 'NaOH(aq)', formula: 'NaOH(aq, ao)', phase: 'aqueous', molarMass: MOLAR_MASS.NaOH,
    formationEnthalpy: -470.114 * KJ, formationGibbsEnergy: -419.15 * KJ, entropy: 48.1, heatCapacity298: -102.1,
    heatCapacityModel: { kind: 'constant', note: CONSTANT_CP_NOTE },
    temperatureRange: AQUEOUS_RANGE,
    source: `${NBS82} ("ao" = Na⁺ + OH⁻)`,
    confidence: 'from memory (ion sums give −470.114 / −419.149 kJ/mol / 48.25 J/(mol·K))',
  },
  'KOH(aq)': {
    id: 'KOH(aq)', formula: 'KOH(aq, ao)', phase: 'aqueous', molarMass: MOLAR_MASS.KOH,
    formationEnthalpy: -482.37 * KJ, formationGibbsEnergy: -440.5 * KJ, entropy: 91.6, heatCapacity298: -126.8,
    heatCapacityModel: { kind: 'constant', note: CONSTANT_CP_NOTE },
    temperatureRange: AQUEOUS_RANGE,
    source: `${NBS82} ("ao" = K⁺ + OH⁻)`,
    confidence: 'from memory (ion sums give −482.374 / −440.514 kJ/mol / 91.75 J/(mol·K))',
  },
};

const T0 = T_STANDARD.value;

/** The Shomate segment whose (extended) interval contains T: first segment below, last above. */
function segmentIndex(segments: readonly ShomateSegment[], temperature: number): number {
  for (let i = 0; i < segments.length - 1; i++) {
    if (temperature <= segments[i].tMax) return i;
  }
  return segments.length - 1;
}

/**
 * ∫_{a}^{b} of a Shomate quantity across segments. `raw(seg, T)` is the segment's
 * antiderivative (H increment or S); the sum over the pieces makes the result continuous
 * even where neighbouring fits do not meet exactly at their boundary.
 */
function integrateShomate(
  segments: readonly ShomateSegment[],
  from: number,
  to: number,
  raw: (s: ShomateSegment, t: number) => number,
): number {
  if (from === to) return 0;
  const sign = to > from ? 1 : -1;
  const lo = Math.min(from, to);
  const hi = Math.max(from, to);
  let sum = 0;
  for (let i = 0; i < segments.length; i++) {
    const segLo = i === 0 ? -Infinity : segments[i].tMin;
    const segHi = i === segments.length - 1 ? Infinity : segments[i].tMax;
    const a = Math.max(lo, segLo);
    const b = Math.min(hi, segHi);
    if (b > a) sum += raw(segments[i], b) - raw(segments[i], a);
  }
  return sign * sum;
}

/** Cp(T) [J/(mol·K)] of a species; T [K]. Shomate where available, else constant Cp°. */
export function heatCapacity(species: SpeciesRecord, temperature: number): number {
  const m = species.heatCapacityModel;
  if (m.kind === 'constant') return species.heatCapacity298;
  return shomateHeatCapacity(m.segments[segmentIndex(m.segments, temperature)], temperature);
}

/** H(T) − H(298.15 K) = ∫ Cp dT [J/mol]; T [K]. Exactly 0 at 298.15 K. */
export function enthalpyIncrement(species: SpeciesRecord, temperature: number): number {
  const m = species.heatCapacityModel;
  if (m.kind === 'constant') return species.heatCapacity298 * (temperature - T0);
  return integrateShomate(m.segments, T0, temperature, shomateEnthalpyIncrement);
}

/** S(T) − S(298.15 K) = ∫ Cp/T dT [J/(mol·K)]; T [K]. Exactly 0 at 298.15 K. */
export function entropyIncrement(species: SpeciesRecord, temperature: number): number {
  const m = species.heatCapacityModel;
  if (m.kind === 'constant') return species.heatCapacity298 * Math.log(temperature / T0);
  return integrateShomate(m.segments, T0, temperature, shomateEntropy);
}

/** H(T) = ΔfH°(298.15) + ∫ Cp dT [J/mol] (formation-enthalpy convention); T [K]. */
export function enthalpy(species: SpeciesRecord, temperature: number): number {
  return species.formationEnthalpy + enthalpyIncrement(species, temperature);
}

/** S(T) = S°(298.15) + ∫ Cp/T dT [J/(mol·K)] (absolute / H⁺-convention entropy); T [K]. */
export function entropy(species: SpeciesRecord, temperature: number): number {
  return species.entropy + entropyIncrement(species, temperature);
}

/** G(T) = H(T) − T·S(T) [J/mol] (Gibbs function in the conventions above); T [K]. */
export function gibbsFunction(species: SpeciesRecord, temperature: number): number {
  return enthalpy(species, temperature) - temperature * entropy(species, temperature);
}
