/**
 * Reference electrodes and the conversion of measured electrode potentials into
 * overpotentials.
 *
 * Potentials are those of the reference half-cell versus the standard hydrogen electrode
 * (SHE) at 25 °C, in V. The NHE/SHE distinction (≈ 0.1 mV-level, historical) is ignored.
 * Values depend on the filling solution; tabulated values with and without liquid-junction
 * potential differ by a few mV. Users with a calibrated reference should enter it as a
 * `custom` reference. Temperature coefficients of the reference half-cells are NOT applied:
 * a warning is returned away from 25 °C; the RHE scale is computed at the given temperature.
 *
 * Sign convention: η = E − E_eq − j·R_u (domain.md §2), E and E_eq on one scale.
 */
import { T_STANDARD, thermalVoltage } from '../constants.js';
import { InputError } from '../errors.js';
import { kelvinToCelsius } from '../units.js';

export type ReferenceElectrodeId =
  | 'she'
  | 'rhe'
  | 'sce'
  | 'nce'
  | 'ag-agcl-sat-kcl'
  | 'ag-agcl-3m-kcl'
  | 'ag-agcl-1m-kcl'
  | 'hg-hgo-1m-naoh'
  | 'hg-hgo-0.1m-naoh'
  | 'hg-hg2so4-1m-h2so4';

export type Confidence = 'definition' | 'source seen' | 'source seen (via secondary)' | 'from memory' | 'derived';

export interface ReferenceElectrode {
  id: ReferenceElectrodeId;
  /** Plain name for people. */
  name: string;
  /** Half-cell potential vs SHE at 25 °C [V]; for RHE the value at pH 0 (then −(RT ln10/F)·pH). */
  potentialVsShe: number;
  source: string;
  confidence: Confidence;
  /** Extra caution for the user, if any. */
  note?: string;
}

/**
 * Table of named references (25 °C, vs SHE). Sources:
 * - Bard & Faulkner, Electrochemical Methods, 2nd ed. (Wiley 2000), table inside the back
 *   cover, as reproduced in the eDAQ wiki "Reference Electrode Potentials" and the
 *   consultrsr.net "Potentials of common reference electrodes" tables (seen via those
 *   secondary copies, not in the book itself): SCE 0.2412, NCE 0.2801, Ag/AgCl sat. KCl 0.197.
 * - Int. J. Corrosion 2010, article 756950, "Reference Electrodes in Metal Corrosion",
 *   Table 2 (seen): SCE 0.2410, Ag/AgCl 1.0 M KCl 0.2360, Ag/AgCl sat. KCl 0.1970,
 *   Hg/HgO 0.1 M NaOH 0.165, Hg/Hg₂SO₄ 1.0 M H₂SO₄ 0.6739.
 * - consultrsr.net table (seen), its cited ref. 10: Ag/AgCl 3 M KCl 0.210.
 * - J. Power Sources 161(2) (2006) 1217–1224, "Hg/HgO electrode and hydrogen evolution
 *   potentials in aqueous sodium hydroxide" (abstract seen): computed Hg/HgO potential vs
 *   NHE at 25 °C of 0.1634 V (0.100 mol/kg), 0.1077 V (1.00 mol/kg), 0.0976 V (1.45 mol/kg NaOH).
 *   Note: the often quoted "0.098 V" (domain.md, from memory) matches the unit-OH⁻-activity
 *   standard value (consultrsr.net Hg/HgO page: E = 0.098 − (RT/F)·ln a_OH⁻), not 1 M NaOH;
 *   a 0.140 V entry (with liquid junction) is also tabulated there. We use 0.1077 V.
 */
export const REFERENCE_ELECTRODES: Readonly<Record<ReferenceElectrodeId, ReferenceElectrode>> = {
  she: {
    id: 'she',
    name: 'Standard hydrogen electrode (SHE)',
    potentialVsShe: 0,
    source: 'definition (IUPAC convention: E°(H⁺/H₂) = 0 at all temperatures)',
    confidence: 'definition',
  },
  rhe: {
    id: 'rhe',
    name: 'Reversible hydrogen electrode (RHE) in the test solution',
    potentialVsShe: 0,
    source: 'Nernst equation: E_RHE = −(RT ln10/F)·pH vs SHE at p(H₂) = 1 bar (derived)',
    confidence: 'derived',
    note: 'needs the solution pH; computed at the given temperature',
  },
  sce: {
    id: 'sce',
    name: 'Saturated calomel electrode (Hg/Hg₂Cl₂, sat. KCl)',
    potentialVsShe: 0.2412,
    source: 'Bard & Faulkner 2nd ed. (2000), back-cover table, via eDAQ wiki and consultrsr.net copies; 0.2410 in Int. J. Corros. 2010:756950 Table 2',
    confidence: 'source seen (via secondary)',
    note: '0.244 V is tabulated for a cell with liquid junction (Sawyer, Sobkowiak & Roberts 1995, via the same copies)',
  },
  nce: {
    id: 'nce',
    name: 'Normal calomel electrode (Hg/Hg₂Cl₂, 1 M KCl)',
    potentialVsShe: 0.2801,
    source: 'Bard & Faulkner 2nd ed. (2000), via eDAQ wiki and consultrsr.net copies; also Int. J. Corros. 2010:756950 Table 2',
    confidence: 'source seen (via secondary)',
  },
  'ag-agcl-sat-kcl': {
    id: 'ag-agcl-sat-kcl',
    name: 'Silver/silver chloride, saturated KCl',
    potentialVsShe: 0.197,
    source: 'Bard & Faulkner 2nd ed. (2000), via consultrsr.net copy; 0.1970 in Int. J. Corros. 2010:756950 Table 2',
    confidence: 'source seen (via secondary)',
  },
  'ag-agcl-3m-kcl': {
    id: 'ag-agcl-3m-kcl',
    name: 'Silver/silver chloride, 3 M KCl',
    potentialVsShe: 0.21,
    source: 'consultrsr.net "Potentials of common reference electrodes" table (its ref. 10)',
    confidence: 'source seen (via secondary)',
  },
  'ag-agcl-1m-kcl': {
    id: 'ag-agcl-1m-kcl',
    name: 'Silver/silver chloride, 1 M KCl',
    potentialVsShe: 0.236,
    source: 'Int. J. Corros. 2010:756950 ("Reference Electrodes in Metal Corrosion") Table 2',
    confidence: 'source seen',
  },
  'hg-hgo-1m-naoh': {
    id: 'hg-hgo-1m-naoh',
    name: 'Mercury/mercuric oxide, 1 mol/kg NaOH',
    potentialVsShe: 0.1077,
    source: 'J. Power Sources 161 (2006) 1217–1224, computed value for 1.00 mol/kg NaOH at 25 °C (abstract seen)',
    confidence: 'source seen',
    note: 'tabulated values for "1 M" Hg/HgO range from 0.098 V (unit OH⁻ activity) to 0.140 V (with liquid junction); calibrate against an RHE in your electrolyte and enter a custom value when it matters',
  },
  'hg-hgo-0.1m-naoh': {
    id: 'hg-hgo-0.1m-naoh',
    name: 'Mercury/mercuric oxide, 0.1 M NaOH',
    potentialVsShe: 0.165,
    source: 'Int. J. Corros. 2010:756950 Table 2; 0.1634 V computed for 0.100 mol/kg in J. Power Sources 161 (2006) 1217',
    confidence: 'source seen',
  },
  'hg-hg2so4-1m-h2so4': {
    id: 'hg-hg2so4-1m-h2so4',
    name: 'Mercury/mercurous sulfate, 1 M H₂SO₄',
    potentialVsShe: 0.6739,
    source: 'Int. J. Corros. 2010:756950 ("Reference Electrodes in Metal Corrosion") Table 2',
    confidence: 'source seen',
  },
};

/** A reference scale: a named electrode, an RHE at a pH, or a user-calibrated value. */
export type ReferenceSpec =
  | { id: Exclude<ReferenceElectrodeId, 'rhe'> }
  | { id: 'rhe'; pH: number }
  | { id: 'custom'; potentialVsShe: number; label?: string };

/** Temperature away from 25 °C beyond which the 25 °C reference table earns a warning [K] (project choice). */
const REFERENCE_TEMPERATURE_TOLERANCE_K = 5;
/** Plausible pH range for an aqueous RHE scale (project choice: −2 to 16 covers concentrated acids and bases; outside → InputError). */
const PH_MIN = -2;
const PH_MAX = 16;

export interface ReferencePotential {
  /** Potential of the reference vs SHE [V]. */
  value: number;
  warnings: string[];
}

/**
 * Potential of a reference scale vs SHE [V] at temperature T [K].
 * Named electrodes: the 25 °C table value (no temperature coefficient; warning when
 * |T − 298.15 K| > 5 K). RHE: −(RT ln10/F)·pH at T (Nernst, p(H₂) = 1 bar). Custom: as given.
 * Throws InputError (path `${path}.…`) for unknown ids, bad pH or a non-finite custom value.
 */
export function referencePotentialVsShe(ref: ReferenceSpec, temperatureK: number = T_STANDARD.value, path = 'reference'): ReferencePotential {
  if (!(Number.isFinite(temperatureK) && temperatureK > 0)) throw new InputError('temperature', 'must be a finite temperature > 0 K', temperatureK);
  const warnings: string[] = [];
  if (ref === null || typeof ref !== 'object') throw new InputError(path, 'must name a reference electrode');
  if (ref.id === 'custom') {
    if (!Number.isFinite(ref.potentialVsShe)) throw new InputError(`${path}.potentialVsShe`, 'must be a finite potential in V vs SHE', ref.potentialVsShe);
    return { value: ref.potentialVsShe, warnings };
  }
  if (ref.id === 'rhe') {
    const pH = ref.pH;
    if (!(typeof pH === 'number' && Number.isFinite(pH) && pH >= PH_MIN && pH <= PH_MAX)) {
      throw new InputError(`${path}.pH`, `must be a pH between ${PH_MIN} and ${PH_MAX}`, pH);
    }
    const nernstSlope = Math.LN10 * thermalVoltage(temperatureK);
    return { value: -nernstSlope * pH, warnings };
  }
  const entry = (REFERENCE_ELECTRODES as Record<string, ReferenceElectrode | undefined>)[ref.id];
  if (!entry) throw new InputError(`${path}.id`, `unknown reference electrode "${String(ref.id)}"`, ref.id);
  if (Math.abs(temperatureK - T_STANDARD.value) > REFERENCE_TEMPERATURE_TOLERANCE_K) {
    warnings.push(
      `The ${entry.name} potential (${entry.potentialVsShe.toFixed(4)} V vs SHE) is tabulated at 25 °C; at ${kelvinToCelsius(temperatureK).toFixed(1)} °C it shifts by up to several mV (temperature coefficient not applied). Enter a calibrated custom value if that matters.`,
    );
  }
  return { value: entry.potentialVsShe, warnings };
}

/**
 * Convert a potential between reference scales: E_to = E_from + E_ref,from − E_ref,to
 * (all vs SHE) [V]. Source: definition of a potential scale.
 */
export function convertPotential(potential: number, from: ReferenceSpec, to: ReferenceSpec, temperatureK: number = T_STANDARD.value): ReferencePotential {
  if (!Number.isFinite(potential)) throw new InputError('potential', 'must be a finite potential in V', potential);
  const a = referencePotentialVsShe(from, temperatureK, 'from');
  const b = referencePotentialVsShe(to, temperatureK, 'to');
  return { value: potential + a.value - b.value, warnings: dedupe([...a.warnings, ...b.warnings]) };
}

export interface OverpotentialInput {
  /** Measured electrode potential E [V] vs `measuredVs`. */
  measuredPotential: number;
  measuredVs: ReferenceSpec;
  /** Equilibrium (reversible) potential E_eq [V] vs `equilibriumVs`. */
  equilibriumPotential: number;
  equilibriumVs: ReferenceSpec;
  /** Temperature [K] (RHE scale and the 25 °C-table warning). Default 298.15 K. */
  temperature?: number;
  /** Current density j [A/m²], anodic positive; needed for iR correction. */
  currentDensity?: number;
  /** Uncompensated area resistance R_u [Ω·m²]; when given with j, η = E − E_eq − j·R_u. */
  uncompensatedResistance?: number;
}

export interface OverpotentialResult {
  /** η [V]. */
  overpotential: number;
  /** j·R_u subtracted [V] (0 when no correction). */
  ohmicDrop: number;
  /** E − E_eq on one scale before iR correction [V]. */
  uncorrected: number;
  warnings: string[];
}

/**
 * Overpotential from a measured potential: η = (E + E_ref,E) − (E_eq + E_ref,eq) − j·R_u [V].
 * Units: potentials V, j A/m², R_u Ω·m². Both potentials are put on the SHE scale at the
 * same temperature first. Source: domain.md §2 sign convention (IUPAC).
 */
export function overpotentialFromMeasured(input: OverpotentialInput): OverpotentialResult {
  const T = input.temperature ?? T_STANDARD.value;
  if (!Number.isFinite(input.measuredPotential)) throw new InputError('measuredPotential', 'must be a finite potential in V', input.measuredPotential);
  if (!Number.isFinite(input.equilibriumPotential)) {
    throw new InputError('equilibriumPotential', 'must be a finite potential in V', input.equilibriumPotential);
  }
  const refE = referencePotentialVsShe(input.measuredVs, T, 'measuredVs');
  const refEq = referencePotentialVsShe(input.equilibriumVs, T, 'equilibriumVs');
  const uncorrected = input.measuredPotential + refE.value - (input.equilibriumPotential + refEq.value);
  let ohmicDrop = 0;
  if (input.uncompensatedResistance !== undefined) {
    if (!Number.isFinite(input.uncompensatedResistance) || input.uncompensatedResistance < 0) {
      throw new InputError('uncompensatedResistance', 'must be a finite area resistance ≥ 0 Ω·m²', input.uncompensatedResistance);
    }
    if (input.currentDensity === undefined || !Number.isFinite(input.currentDensity)) {
      throw new InputError('currentDensity', 'is needed (finite, A/m²) to subtract the ohmic drop j·R_u', input.currentDensity);
    }
    ohmicDrop = input.currentDensity * input.uncompensatedResistance;
  }
  return {
    overpotential: uncorrected - ohmicDrop,
    ohmicDrop,
    uncorrected,
    warnings: dedupe([...refE.warnings, ...refEq.warnings]),
  };
}

function dedupe(list: string[]): string[] {
  return [...new Set(list)];
}
