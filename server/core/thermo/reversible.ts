/**
 * Reversible cell voltage and thermoneutral voltage of an electrolysis reaction.
 *
 * Sign convention (check-values §2): for the electrolysis reaction as written (ΔG > 0),
 *   E_rev = ΔG/(nF) = E°(T) + (RT/(nF))·ln Q,   E°(T) = ΔG°(T)/(nF),   Q = Π a_i^ν_i
 *   U_tn  = ΔH(T)/(nF)                      (thermoneutral voltage)
 *   dE°/dT = −ΔS°(T)/(nF)
 * This is the familiar E_rev = −ΔG/(nF) written for the reverse (galvanic) reaction.
 * ΔG°, ΔH, ΔS from reaction.ts (Kirchhoff / Gibbs–Helmholtz). Activities: gases as
 * p_i/p° (ideal gas, p° = 1 bar), pure liquid water 1 (or a_w of the electrolyte), aqueous
 * "ao" salts as (γ± m/m°)².
 *
 * Gas partial pressures: the gas leaving an electrolyte is taken as saturated with water
 * vapour, so p_gas = p_total − a_w·p_sat(T) (Raoult's law with the water activity, ideal
 * vapour). This is an ASSUMPTION (thermodynamic equilibrium at the gas–liquid interface);
 * a gas that is not saturated would have a higher partial pressure.
 *
 * Units: T [K], p [Pa], E [V], ΔG/ΔH [J/mol], ΔS [J/(mol·K)].
 */
import { FARADAY, GAS_CONSTANT, P_STANDARD } from '../constants.js';
import { InputError, PhysicsError } from '../errors.js';
import { UNIT_TABLES } from '../units.js';
import { requirePositive, requireTemperature, describeTemperature } from './guards.js';
import { reactionThermo, type ReactionThermo, type Stoichiometry } from './reaction.js';
import type { SpeciesId } from './species.js';

/** Pa per bar (exact, units.ts), for messages only. */
const PA_PER_BAR = UNIT_TABLES.pressure.bar;
import { waterVapourPressure } from './water.js';

export interface ReversibleComputation {
  /** E°(T) = ΔG°(T)/(nF) [V]. */
  standardPotential: number;
  /** (RT/(nF))·ln Q [V]. */
  nernstTerm: number;
  /** E_rev = E° + Nernst term [V]. */
  reversiblePotential: number;
  /** U_tn = ΔH°(T)/(nF) [V] (standard-state enthalpy; heats of dilution not included). */
  thermoneutralVoltage: number;
  /** dE°/dT = −ΔS°(T)/(nF) [V/K]. */
  standardPotentialSlope: number;
  /** ln Q [–]. */
  lnQ: number;
  thermo: ReactionThermo;
  warnings: string[];
}

/**
 * ln Q = Σ ν_i ln a_i [–] for the given stoichiometry; species absent from `lnActivities`
 * are at unit activity (pure liquid water, standard-state gases). Throws InputError for a
 * non-finite ln a.
 */
export function lnReactionQuotient(stoichiometry: Stoichiometry, lnActivities: Readonly<Partial<Record<SpeciesId, number>>>): number {
  let lnQ = 0;
  for (const [id, nu] of Object.entries(stoichiometry) as Array<[SpeciesId, number | undefined]>) {
    if (!nu) continue;
    const lnA = lnActivities[id];
    if (lnA === undefined) continue;
    if (!Number.isFinite(lnA)) throw new InputError(`activities.${id}`, 'ln(activity) must be finite (activity > 0)', lnA);
    lnQ += nu * lnA;
  }
  return lnQ;
}

/**
 * E_rev, E°, Nernst term and U_tn of an electrolysis reaction at T [K] with the given
 * ln-activities (see lnReactionQuotient). `electrons` = n per reaction as written.
 * Throws InputError for T ≤ 0 or n ≤ 0.
 */
export function reversibleVoltage(
  stoichiometry: Stoichiometry,
  electrons: number,
  temperature: number,
  lnActivities: Readonly<Partial<Record<SpeciesId, number>>>,
): ReversibleComputation {
  requirePositive('electrons', electrons);
  requireTemperature('temperature', temperature);
  const thermo = reactionThermo(stoichiometry, temperature);
  const nF = electrons * FARADAY.value;
  const lnQ = lnReactionQuotient(stoichiometry, lnActivities);
  const standardPotential = thermo.deltaG / nF;
  const nernstTerm = ((GAS_CONSTANT.value * temperature) / nF) * lnQ;
  return {
    standardPotential,
    nernstTerm,
    reversiblePotential: standardPotential + nernstTerm,
    thermoneutralVoltage: thermo.deltaH / nF,
    standardPotentialSlope: -thermo.deltaS / nF,
    lnQ,
    thermo,
    warnings: [...thermo.warnings],
  };
}

/** U_tn = ΔH(T)/(nF) [V] of a reaction at T [K] (standard-state enthalpy). */
export function thermoneutralVoltage(stoichiometry: Stoichiometry, electrons: number, temperature: number): number {
  requirePositive('electrons', electrons);
  return reactionThermo(stoichiometry, temperature).deltaH / (electrons * FARADAY.value);
}

export interface GasPartialPressure {
  /** Partial pressure of the dry product gas [Pa]. */
  partialPressure: number;
  /** Water vapour pressure over the electrolyte a_w·p_sat [Pa]. */
  waterVapourPressure: number;
  /** Vapour pressure of pure water p_sat(T) [Pa]. */
  saturationPressure: number;
}

/**
 * Partial pressure of a product gas saturated with water vapour:
 *   p_gas = p_total − a_w·p_sat(T)
 * p_total [Pa], T [K], a_w [–]; p_sat from Wagner & Pruss (2002). Assumes the gas is in
 * equilibrium with the electrolyte (saturated) and ideal. Throws PhysicsError when
 * p_total ≤ a_w·p_sat (the electrolyte would boil: no product-gas partial pressure exists).
 */
export function saturatedGasPartialPressure(totalPressure: number, temperature: number, waterActivity: number, path = 'pressure'): GasPartialPressure {
  requirePositive(path, totalPressure, 'Pa');
  requirePositive('waterActivity', waterActivity);
  const pSat = waterVapourPressure(temperature);
  const pW = waterActivity * pSat;
  const pGas = totalPressure - pW;
  if (!(pGas > 0)) {
    throw new PhysicsError(
      path,
      `total pressure ${(totalPressure / PA_PER_BAR).toFixed(4)} bar(a) does not exceed the water vapour pressure ${(pW / PA_PER_BAR).toFixed(4)} bar over the electrolyte at ${describeTemperature(temperature)}: the electrolyte would boil and no product-gas partial pressure exists. Raise the pressure or lower the temperature.`,
    );
  }
  return { partialPressure: pGas, waterVapourPressure: pW, saturationPressure: pSat };
}

/** ln(p/p°) [–] with p° = 1 bar (IUPAC standard-state pressure). */
export function lnRelativePressure(pressure: number): number {
  return Math.log(pressure / P_STANDARD.value);
}
