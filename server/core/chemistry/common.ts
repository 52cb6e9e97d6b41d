/**
 * Helpers shared by the chemistry data modules: validation of operating conditions against
 * a chemistry's declared needs, and the water-splitting reversible voltage used by both
 * water chemistries.
 */
import { FARADAY, MOLAR_MASS, P_STANDARD, thermalVoltage } from '../constants.js';
import { InputError } from '../errors.js';
import { requireFinite, describeTemperature } from '../thermo/guards.js';
import { reversibleVoltage, saturatedGasPartialPressure, thermoneutralVoltage, lnRelativePressure } from '../thermo/reversible.js';
import type { Stoichiometry } from '../thermo/reaction.js';
import type { CompositionKey, OperatingConditions, Product, ReversibleResult } from './types.js';

/** Pa per bar (exact), for messages only. */
const PA_PER_BAR = 1e5;

/** Above this pressure the ideal-gas activities get a warning [Pa] (30 bar; our choice). */
export const IDEAL_GAS_WARNING_PRESSURE = 30e5;

/** Validate T [K], p [Pa] and the required composition keys; returns nothing, throws InputError. */
export function validateConditions(
  c: OperatingConditions,
  range: readonly [number, number],
  required: readonly CompositionKey[],
  chemistryName: string,
): void {
  if (!c || typeof c !== 'object') throw new InputError('conditions', 'operating conditions are required');
  requireFinite('temperature', c.temperature, 'K');
  if (c.temperature < range[0] || c.temperature > range[1]) {
    throw new InputError(
      'temperature',
      `${describeTemperature(c.temperature)} is outside the ${range[0]}–${range[1]} K validity range of the ${chemistryName} thermodynamic data`,
      c.temperature,
    );
  }
  requireFinite('pressure', c.pressure, 'Pa');
  if (c.pressure <= 0) throw new InputError('pressure', 'must be an absolute pressure > 0 Pa', c.pressure);
  const comp = c.composition ?? {};
  for (const key of required) {
    const v = comp[key];
    if (v === undefined || v === null) throw new InputError(`composition.${key}`, `is required for ${chemistryName} (mol/kg)`);
    requireFinite(`composition.${key}`, v, 'mol/kg');
    if (v < 0) throw new InputError(`composition.${key}`, 'must be ≥ 0 mol/kg', v);
  }
}

/** Overall water splitting with liquid water, H₂O(l) → H₂ + ½O₂, n = 2 (HHV basis). */
export const WATER_SPLITTING_LIQUID: Stoichiometry = { 'H2O(l)': -1, 'H2(g)': 1, 'O2(g)': 0.5 };
/** The same with water vapour, H₂O(g) → H₂ + ½O₂, n = 2 (LHV basis). */
export const WATER_SPLITTING_VAPOUR: Stoichiometry = { 'H2O(g)': -1, 'H2(g)': 1, 'O2(g)': 0.5 };
export const WATER_ELECTRONS = 2;

export const HYDROGEN: Product = { id: 'H2', name: 'Hydrogen', molarMass: MOLAR_MASS.H2, electronsPerMolecule: 2, electrode: 'cathode', gas: true };
export const OXYGEN: Product = { id: 'O2', name: 'Oxygen', molarMass: MOLAR_MASS.O2, electronsPerMolecule: 4, electrode: 'anode', gas: true };

export function idealGasWarning(pressure: number): string[] {
  if (pressure <= IDEAL_GAS_WARNING_PRESSURE) return [];
  return [
    `Gas activities use ideal-gas partial pressures; at ${(pressure / PA_PER_BAR).toFixed(1)} bar(a) fugacity corrections are neglected (for H₂ they add of order 1 mV at 30 bar, from memory).`,
  ];
}

/**
 * The thermodynamic figures every chemistry reports in `details` (V, J/mol, J/(mol·K)):
 * E°, the Nernst term, ln Q, dE°/dT, ΔG°, ΔH°, ΔS° and the mismatch between the tabulated
 * and the ΔH/ΔG-derived entropy change (see thermo/reaction.ts).
 */
export function reversibleDetails(rev: ReturnType<typeof reversibleVoltage>): Record<string, number> {
  return {
    E0: rev.standardPotential,
    nernstTerm: rev.nernstTerm,
    lnQ: rev.lnQ,
    dE0dT: rev.standardPotentialSlope,
    deltaG0: rev.thermo.deltaG,
    deltaH0: rev.thermo.deltaH,
    deltaS0: rev.thermo.deltaS,
    tableEntropyMismatch: rev.thermo.tableEntropyChange - rev.thermo.standardDeltaS,
  };
}

/**
 * Reversible and thermoneutral voltages of water electrolysis at (T, p) with water
 * activity a_w of the electrolyte:
 *   E_rev = E°(T) + (RT/2F)·ln[(p_H2/p°)(p_O2/p°)^½ / a_w]
 *   p_H2 = p_O2 = p − a_w·p_sat(T)  (both gases saturated with water vapour; one pressure)
 *   U_tn = ΔH(T)/(2F) with liquid water (HHV basis); LHV basis with water vapour.
 * Heats of dilution of the electrolyte are not included in U_tn.
 */
export function waterSplittingReversible(
  c: OperatingConditions,
  waterActivity: number,
  activityWarnings: readonly string[],
  extraDetails: Record<string, number> = {},
): ReversibleResult {
  const T = c.temperature;
  const gas = saturatedGasPartialPressure(c.pressure, T, waterActivity);
  const lnPH2 = lnRelativePressure(gas.partialPressure);
  const lnPO2 = lnRelativePressure(gas.partialPressure);
  const rev = reversibleVoltage(WATER_SPLITTING_LIQUID, WATER_ELECTRONS, T, {
    'H2(g)': lnPH2,
    'O2(g)': lnPO2,
    'H2O(l)': Math.log(waterActivity),
  });
  const lhv = thermoneutralVoltage(WATER_SPLITTING_VAPOUR, WATER_ELECTRONS, T);
  const nF = WATER_ELECTRONS * FARADAY.value;
  return {
    reversiblePotential: rev.reversiblePotential,
    thermoneutralVoltage: rev.thermoneutralVoltage,
    lhvThermoneutralVoltage: lhv,
    warnings: [...rev.warnings, ...activityWarnings, ...idealGasWarning(c.pressure)],
    details: {
      ...reversibleDetails(rev),
      thermalVoltage: thermalVoltage(T),
      nF,
      partialPressureH2: gas.partialPressure,
      partialPressureO2: gas.partialPressure,
      waterVapourPressure: gas.waterVapourPressure,
      saturationPressure: gas.saturationPressure,
      standardPressure: P_STANDARD.value,
      waterActivity,
      ...extraDetails,
    },
  };
}
