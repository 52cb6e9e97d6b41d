/**
 * Concentration scales of the single-salt electrolytes (NaCl brine, NaOH and KOH solutions):
 * mass fraction w (kg salt / kg solution), molality m (mol / kg water) and molarity
 * c (mol / m³ of solution; 1 mol/L = 1000 mol/m³), with the solution density needed to
 * go between the mass-based and the volume-based scales.
 *
 *   m = w / (M (1 − w)),   w = m M / (1 + m M)           (exact definitions)
 *   c = m ρ / (1 + m M)                                   (exact, given the density ρ)
 *
 * Density: the Laliberté–Cooper model,
 *   1/ρ = w_w/ρ_w + w/ρ_app,   ρ_app = (c0 w + c1)·exp(10⁻⁶ (t + c4)²) / (w + c2 + c3 t),
 * w_w = 1 − w, t in °C, ρ_w from Kell (1975). Source: M. Laliberté, W. E. Cooper,
 * J. Chem. Eng. Data 49 (2004) 1141–1151; coefficient table as updated in M. Laliberté,
 * J. Chem. Eng. Data 54 (2009) 1725. Formula and coefficients seen in the data file and
 * code of the open-source `chemicals` package (a faithful secondary copy); not read in the
 * paper itself.
 *
 * Cross-check at 20 °C against the CRC Handbook "Concentrative properties" table
 * (check-values §4d): NaCl and NaOH agree within 0.2 %; KOH reads about 0.6 % higher than
 * the CRC values (1.2892 vs 1.2813 g/cm³ at 30 wt %). That disagreement is between the
 * sources; it is reported, not resolved.
 */
import { MOLAR_MASS, ZERO_CELSIUS_K } from '../constants.js';
import { ConvergenceError, InputError } from '../errors.js';
import { requireFinite, requireNonNegative, requireTemperature, describeTemperature } from './guards.js';
import { waterDensity } from './water.js';

export type Electrolyte = 'NaCl' | 'NaOH' | 'KOH';

/** Molar mass of each solute [kg/mol] (IUPAC abridged atomic weights via constants.ts). */
export const ELECTROLYTE_MOLAR_MASS: Readonly<Record<Electrolyte, number>> = {
  NaCl: MOLAR_MASS.NaCl,
  NaOH: MOLAR_MASS.NaOH,
  KOH: MOLAR_MASS.KOH,
};

interface LaliberteDensityCoefficients {
  c0: number;
  c1: number;
  c2: number;
  c3: number;
  /** °C */
  c4: number;
  /** Data range: temperature [°C]. */
  tMinC: number;
  tMaxC: number;
  /** Data range: maximum mass fraction. */
  wMax: number;
}

/** Laliberté (2009) density coefficients; source seen via the `chemicals` package data file. */
const LALIBERTE: Readonly<Record<Electrolyte, LaliberteDensityCoefficients>> = {
  NaCl: { c0: -0.00324112223655149, c1: 0.0636354335906616, c2: 1.01371399467365, c3: 0.0145951015210159, c4: 3317.34854426537, tMinC: 0, tMaxC: 140, wMax: 0.26589930421877 },
  NaOH: { c0: 319.020509469838, c1: 528.592358475315, c2: -0.102197896602724, c3: 0.000350420706415566, c4: 765.970470238438, tMinC: 4, tMaxC: 120, wMax: 0.502885546184013 },
  KOH: { c0: 821.119043254761, c1: 1043.20173374381, c2: 0.112873330222752, c3: 0.00124023636407386, c4: 539.630388368877, tMinC: 4, tMaxC: 95, wMax: 0.51861 },
};

/** Scale factor 10⁻⁶ in the Laliberté exponent [1/°C²]. Source: Laliberté & Cooper (2004). */
const LALIBERTE_EXP_SCALE = 1e-6;

export const DENSITY_SOURCE =
  'Laliberté & Cooper, J. Chem. Eng. Data 49 (2004) 1141; coefficients Laliberté, J. Chem. Eng. Data 54 (2009) 1725 (via the `chemicals` package data); water: Kell (1975)';

function checkSalt(salt: string): asserts salt is Electrolyte {
  if (!(salt in ELECTROLYTE_MOLAR_MASS)) throw new InputError('electrolyte', `unknown electrolyte "${salt}" (NaCl, NaOH or KOH)`, salt);
}

/** Molality m [mol/kg water] from mass fraction w ∈ [0, 1) [kg/kg solution]: m = w/(M(1 − w)). */
export function massFractionToMolality(salt: Electrolyte, massFraction: number): number {
  checkSalt(salt);
  requireFinite('massFraction', massFraction);
  if (massFraction < 0 || massFraction >= 1) throw new InputError('massFraction', 'must be in [0, 1)', massFraction);
  return massFraction / (ELECTROLYTE_MOLAR_MASS[salt] * (1 - massFraction));
}

/** Mass fraction w [kg/kg solution] from molality m [mol/kg water]: w = mM/(1 + mM). */
export function molalityToMassFraction(salt: Electrolyte, molality: number): number {
  checkSalt(salt);
  requireNonNegative('molality', molality, 'mol/kg');
  const mM = molality * ELECTROLYTE_MOLAR_MASS[salt];
  return mM / (1 + mM);
}

export interface DensityResult {
  /** Solution density [kg/m³]. */
  value: number;
  warnings: string[];
  source: string;
}

/**
 * Density of the aqueous solution ρ(w, T) [kg/m³] from mass fraction w [–] and T [K] by the
 * Laliberté–Cooper model (module doc). Validity (data range of the fit): NaCl 0–140 °C,
 * w ≤ 0.266; NaOH 4–120 °C, w ≤ 0.503; KOH 4–95 °C, w ≤ 0.519 — warnings outside.
 * Throws InputError for w ∉ [0, 1) or T outside 0–150 °C (water density range).
 */
export function solutionDensity(salt: Electrolyte, massFraction: number, temperature: number): DensityResult {
  checkSalt(salt);
  requireFinite('massFraction', massFraction);
  if (massFraction < 0 || massFraction >= 1) throw new InputError('massFraction', 'must be in [0, 1)', massFraction);
  requireTemperature('temperature', temperature);
  const k = LALIBERTE[salt];
  const warnings: string[] = [];
  const t = temperature - ZERO_CELSIUS_K.value;
  if (t < k.tMinC || t > k.tMaxC) {
    warnings.push(`${salt} density: ${describeTemperature(temperature)} is outside the ${k.tMinC}–${k.tMaxC} °C data range of the Laliberté fit; extrapolated.`);
  }
  if (massFraction > k.wMax) {
    warnings.push(`${salt} density: ${(massFraction * 100).toFixed(1)} wt % is above the ${(k.wMax * 100).toFixed(1)} wt % data range of the Laliberté fit; extrapolated.`);
  }
  const rhoWater = waterDensity(temperature);
  if (massFraction === 0) return { value: rhoWater, warnings, source: DENSITY_SOURCE };
  const ww = 1 - massFraction;
  const rhoApparent = ((k.c0 * massFraction + k.c1) * Math.exp(LALIBERTE_EXP_SCALE * (t + k.c4) ** 2)) / (massFraction + k.c2 + k.c3 * t);
  const value = 1 / (ww / rhoWater + massFraction / rhoApparent);
  if (!Number.isFinite(value) || value <= 0) {
    throw new InputError('massFraction', `${salt} density correlation has no physical value at these conditions`, massFraction);
  }
  return { value, warnings, source: DENSITY_SOURCE };
}

export interface MolarityResult {
  /** Molarity c [mol/m³] (divide by 1000 for mol/L). */
  value: number;
  /** Solution density used [kg/m³]. */
  density: number;
  /** Mass fraction [–]. */
  massFraction: number;
  warnings: string[];
}

/**
 * Molarity c = m ρ/(1 + m M) [mol/m³] from molality m [mol/kg] at T [K]; ρ from
 * solutionDensity (Laliberté–Cooper). Same validity and warnings as solutionDensity.
 */
export function molalityToMolarity(salt: Electrolyte, molality: number, temperature: number): MolarityResult {
  const w = molalityToMassFraction(salt, molality);
  const rho = solutionDensity(salt, w, temperature);
  const mM = molality * ELECTROLYTE_MOLAR_MASS[salt];
  return { value: (molality * rho.value) / (1 + mM), density: rho.value, massFraction: w, warnings: rho.warnings };
}

/** Iteration limit and tolerance of the molarity → molality inversion (fixed point on ρ). */
const INVERSION_MAX_ITERATIONS = 100;
const INVERSION_RTOL = 1e-13;

/**
 * Molality m [mol/kg] from molarity c [mol/m³] at T [K]: solves m = c/(ρ(w(m)) − c·M) by
 * fixed-point iteration on the density (ρ depends weakly on m, so it converges in a few
 * steps). Throws InputError when c·M ≥ ρ (no solution: more solute than solution mass) and
 * ConvergenceError if the iteration does not settle.
 */
export function molarityToMolality(salt: Electrolyte, molarity: number, temperature: number): MolarityResult & { molality: number } {
  checkSalt(salt);
  requireNonNegative('molarity', molarity, 'mol/m³');
  const M = ELECTROLYTE_MOLAR_MASS[salt];
  let rho = solutionDensity(salt, 0, temperature);
  let m = 0;
  for (let i = 0; i < INVERSION_MAX_ITERATIONS; i++) {
    const denom = rho.value - molarity * M;
    if (denom <= 0) throw new InputError('molarity', `${salt}: molarity too high for any solution density`, molarity);
    const next = molarity / denom;
    const w = molalityToMassFraction(salt, next);
    if (w >= 1) throw new InputError('molarity', `${salt}: molarity too high`, molarity);
    rho = solutionDensity(salt, w, temperature);
    if (Math.abs(next - m) <= INVERSION_RTOL * Math.max(next, 1e-300)) {
      return { molality: next, value: molarity, density: rho.value, massFraction: w, warnings: rho.warnings };
    }
    m = next;
  }
  throw new ConvergenceError(`${salt}: molarity → molality inversion did not converge`, INVERSION_MAX_ITERATIONS);
}
