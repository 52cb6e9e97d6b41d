/**
 * Current efficiency (Faradaic yield) per product and anode-gas purity (domain.md §7).
 *
 * Models (CellDefinition.currentEfficiency):
 *  - none: every product at 100 %;
 *  - constant: CE = value for the main products (chlor-alkali: Cl2 and NaOH; water: H2 and O2),
 *    H2 at 100 % in chlor-alkali (hydrogen evolution is the only cathode reaction);
 *  - parasitic: CE = 1 − j_p/j with a constant parasitic current density j_p, applied like
 *    `constant` (the observed fall of CE at low load);
 *  - competing (chlor-alkali): a side reaction at the anode (oxygen evolution) with its own
 *    kinetics shares the anode potential with chlorine evolution: j_Cl2(E) + j_side(E) = j.
 *    CE(Cl2) = j_Cl2/j, and the anode gas carries O2: x_O2 = (j_side/4F)/(j_side/4F + j_Cl2/2F).
 *    This model describes anode-side losses only; NaOH and H2 are at 100 % (hydroxide
 *    back-migration through the membrane is not part of it);
 *  - crossover (water): hydrogen permeates the membrane/separator by Fick's law,
 *    N = P·p_H2/δ [mol/(m²·s)], with P the permeability [mol/(m·s·Pa)], δ the thickness [m]
 *    and p_H2 the cathode hydrogen partial pressure (cell pressure less the water vapour
 *    over the electrolyte, from the thermo module; the cell pressure when the override path
 *    gives none). Differential pressure is not represented. The lost
 *    hydrogen is an equivalent current j_x = 2F·N: CE(H2) = 1 − j_x/j; it ends in the anode
 *    gas, x_H2 = N/(N + j/4F) on a dry basis. O2 at 100 %.
 *
 * Source: Faraday's law and the model forms in domain.md §7; Fick's first law for permeation.
 */
import { FARADAY } from '../constants.js';
import { ConvergenceError, PhysicsError } from '../errors.js';
import { anodicCurrent, anodicOverpotentialFor, type PreparedKinetics } from './electrode.js';
import {
  ALARM_FRACTION_OF_LOWER_LIMIT,
  CAUTION_FRACTION_OF_LOWER_LIMIT,
  HYDROGEN_IN_OXYGEN_LOWER_LIMIT,
} from '../safety/checks.js';
import type { ChemistryId, CurrentEfficiencyModel, CurrentEfficiencyResult, ProductId } from './types.js';

/** Percent per mole fraction (vol % for ideal gases). */
const PERCENT = 100;
/**
 * Lower flammability limit of hydrogen in oxygen, 4.0 vol % H2 (1 atm, room temperature):
 * the safety module's figure (Zabetakis 1965; Euro Chlor GEST 91/168, check-values.md §10).
 */
export const HYDROGEN_LFL_IN_OXYGEN_PERCENT = PERCENT * HYDROGEN_IN_OXYGEN_LOWER_LIMIT.value;
/**
 * Fraction of the LFL at which water electrolysers typically trip (≈ 2 vol % H2 in O2, half
 * the LFL): the safety module's trip screen (common practice, check-values.md §10).
 */
export const TRIP_FRACTION_OF_LFL = ALARM_FRACTION_OF_LOWER_LIMIT;
/**
 * Typical alarm level of H2 in O2, ≈ 1 vol % (a quarter of the LFL): the safety module's
 * caution screen (common practice; from memory, check-values.md §10).
 */
export const HYDROGEN_IN_OXYGEN_ALARM_PERCENT = PERCENT * CAUTION_FRACTION_OF_LOWER_LIMIT * HYDROGEN_IN_OXYGEN_LOWER_LIMIT.value;

/** The caution every safety figure carries (domain.md §9). */
export const SAFETY_CAUTION =
  'design-study estimate; local codes, standards and licensed engineering practice govern';

/** Electrons per molecule used in gas-purity mole balances (Faraday's law). */
const ELECTRONS_PER_O2 = 4;
const ELECTRONS_PER_CL2 = 2;
const ELECTRONS_PER_H2 = 2;

/** Products whose CE the constant/parasitic models set, per chemistry. */
const MAIN_PRODUCTS: Record<ChemistryId, ProductId[]> = {
  'chlor-alkali': ['Cl2', 'NaOH'],
  'alkaline-water': ['H2', 'O2'],
  'pem-water': ['H2', 'O2'],
};
/** All products of each chemistry. */
export const PRODUCTS: Record<ChemistryId, ProductId[]> = {
  'chlor-alkali': ['Cl2', 'NaOH', 'H2'],
  'alkaline-water': ['H2', 'O2'],
  'pem-water': ['H2', 'O2'],
};

/** Side reaction moved to the cell temperature (see balance.ts prepareCell). */
export interface PreparedSideReaction {
  kinetics: PreparedKinetics;
  /** E_eq,side − E_eq,main [V]. */
  equilibriumPotentialShift: number;
}

/** Result of the coupled anode solve. */
export interface CompetingAnodeSolution {
  /** Overpotential of the main reaction, E − E_eq,main [V]. */
  mainOverpotential: number;
  mainCurrentDensity: number;
  sideCurrentDensity: number;
  iterations: number;
}

const COMPETING_MAX_ITERATIONS = 100;
/** Relative residual |Σj_k − j|/j treated as converged (a few hundred ulp; our choice). */
const COMPETING_RELATIVE_TOLERANCE = 1e-13;

/**
 * Solve j_main(η) + j_side(η − ΔE) = j for the main-reaction overpotential η [V] at the shared
 * anode potential, where ΔE = E_eq,side − E_eq,main [V], j [A/m²] > 0 and f = F/(RT) [1/V].
 * Both currents increase with η, so the root is unique; it is bracketed by
 *   lo = min(η_main(j/2), η_side(j/2) + ΔE) ≤ η ≤ hi = min(η_main(j), η_side(j) + ΔE)
 * (at the root each current is below j and one of them is at least j/2) and found by Newton
 * steps kept inside the bracket (bisection otherwise).
 * Throws PhysicsError (path `pathSide`) when the side reaction alone would carry more than j at
 * the main reaction's equilibrium (the main reaction would run backwards), ConvergenceError if
 * the iteration fails. Source: mixed-potential condition Σ j_k(E) = j (domain.md §7); solver ours.
 */
export function solveCompetingAnode(
  main: PreparedKinetics,
  side: PreparedSideReaction,
  currentDensity: number,
  temperatureK: number,
  f: number,
  pathSide: string,
): CompetingAnodeSolution {
  const shift = side.equilibriumPotentialShift;
  const half = 0.5 * currentDensity;
  let lo = Math.min(anodicOverpotentialFor(main, half, temperatureK), anodicOverpotentialFor(side.kinetics, half, temperatureK) + shift);
  let hi = Math.min(
    anodicOverpotentialFor(main, currentDensity, temperatureK),
    anodicOverpotentialFor(side.kinetics, currentDensity, temperatureK) + shift,
  );
  let eta = 0.5 * (lo + hi);
  for (let it = 1; it <= COMPETING_MAX_ITERATIONS; it++) {
    const m = anodicCurrent(main, eta, f);
    const s = anodicCurrent(side.kinetics, eta - shift, f);
    const residual = m.j + s.j - currentDensity;
    if (Math.abs(residual) <= COMPETING_RELATIVE_TOLERANCE * currentDensity || hi - lo <= 4 * Number.EPSILON * Math.max(1, Math.abs(eta))) {
      if (!(m.j > 0)) {
        throw new PhysicsError(
          pathSide,
          `at j = ${currentDensity} A/m² the side reaction carries all the anode current and the main reaction runs backwards (its current efficiency would be ≤ 0)`,
        );
      }
      return { mainOverpotential: eta, mainCurrentDensity: m.j, sideCurrentDensity: s.j, iterations: it };
    }
    if (residual > 0) hi = eta;
    else lo = eta;
    let next = eta - residual / (m.dj + s.dj);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    eta = next;
  }
  throw new ConvergenceError(`competing anode reactions: no convergence at j = ${currentDensity} A/m²`, COMPETING_MAX_ITERATIONS);
}

/** Inputs to the per-point CE evaluation that come from the balance or the sweep set-up. */
export interface EfficiencyContext {
  chemistry: ChemistryId;
  /** Hydrogen partial pressure at the cathode for crossover, Pa. */
  hydrogenPartialPressure: number;
  /** Side-reaction current density at the anode from the balance (competing model), A/m². */
  sideCurrentDensity?: number;
}

/**
 * Current efficiency of each product and the anode-gas purity at current density j [A/m²] > 0.
 * `path` names the current density in error messages (e.g. `currentDensities[3]`).
 * Throws PhysicsError when a model leaves no net product (parasitic j_p ≥ j; crossover
 * j_x ≥ j). See the file header for the models and sources.
 */
export function currentEfficiencyAt(
  model: CurrentEfficiencyModel | undefined,
  ctx: EfficiencyContext,
  currentDensity: number,
  path: string,
): CurrentEfficiencyResult {
  const byProduct: Partial<Record<ProductId, number>> = {};
  for (const p of PRODUCTS[ctx.chemistry]) byProduct[p] = 1;
  if (model === undefined) return { byProduct };
  switch (model.model) {
    case 'constant': {
      for (const p of MAIN_PRODUCTS[ctx.chemistry]) byProduct[p] = model.value;
      return { byProduct };
    }
    case 'parasitic': {
      const ce = 1 - model.currentDensity / currentDensity;
      if (!(ce > 0)) {
        throw new PhysicsError(
          path,
          `j = ${currentDensity} A/m² is at or below the parasitic current density ${model.currentDensity} A/m² (currentEfficiency.currentDensity): no net production`,
        );
      }
      for (const p of MAIN_PRODUCTS[ctx.chemistry]) byProduct[p] = ce;
      return { byProduct };
    }
    case 'competing': {
      const side = ctx.sideCurrentDensity ?? 0;
      const main = currentDensity - side;
      byProduct.Cl2 = main / currentDensity;
      const nO2 = side / ELECTRONS_PER_O2;
      const nCl2 = main / ELECTRONS_PER_CL2;
      return {
        byProduct,
        sideReactionCurrentDensity: side,
        oxygenInChlorinePercent: (100 * nO2) / (nO2 + nCl2),
      };
    }
    case 'crossover': {
      const flux = (model.hydrogenPermeability * ctx.hydrogenPartialPressure) / model.membraneThickness; // mol/(m²·s)
      const crossoverCurrent = ELECTRONS_PER_H2 * FARADAY.value * flux;
      const ce = 1 - crossoverCurrent / currentDensity;
      if (!(ce > 0)) {
        throw new PhysicsError(
          path,
          `j = ${currentDensity} A/m² is at or below the hydrogen crossover equivalent ${crossoverCurrent.toPrecision(4)} A/m²: no net hydrogen production`,
        );
      }
      byProduct.H2 = ce;
      const oxygenFlux = currentDensity / (ELECTRONS_PER_O2 * FARADAY.value);
      return {
        byProduct,
        crossoverCurrentDensity: crossoverCurrent,
        hydrogenInOxygenPercent: (100 * flux) / (flux + oxygenFlux),
      };
    }
  }
}

/**
 * Caution texts for the anode-gas purity of a sweep (aggregated over points, one line each).
 * Hydrogen in oxygen: a caution when any point reaches half the LFL (2 vol %; trip level) and
 * a note at the typical alarm level (1 vol %). Figures: check-values.md §10.
 */
export function gasPurityWarnings(points: { currentDensity: number; ce: CurrentEfficiencyResult }[]): string[] {
  const out: string[] = [];
  const trip = HYDROGEN_LFL_IN_OXYGEN_PERCENT * TRIP_FRACTION_OF_LFL;
  const h2 = points.filter((p) => p.ce.hydrogenInOxygenPercent !== undefined);
  if (h2.length > 0) {
    const atTrip = h2.filter((p) => (p.ce.hydrogenInOxygenPercent as number) >= trip);
    const atAlarm = h2.filter((p) => {
      const x = p.ce.hydrogenInOxygenPercent as number;
      return x >= HYDROGEN_IN_OXYGEN_ALARM_PERCENT && x < trip;
    });
    if (atTrip.length > 0) {
      const worst = Math.max(...atTrip.map((p) => p.ce.hydrogenInOxygenPercent as number));
      const jMax = Math.max(...atTrip.map((p) => p.currentDensity));
      out.push(
        `Hydrogen in the anode oxygen reaches ${worst.toFixed(2)} vol % (at or above ${trip} vol %, half the lower ` +
          `flammability limit of ${HYDROGEN_LFL_IN_OXYGEN_PERCENT} vol % H2 in O2; Zabetakis 1965, Euro Chlor GEST 91/168) ` +
          `at ${atTrip.length} point(s), up to j = ${jMax} A/m²; electrolysers typically trip here (common practice), ` +
          `which sets a minimum load. This is a ${SAFETY_CAUTION}.`,
      );
    }
    if (atAlarm.length > 0) {
      const jMax = Math.max(...atAlarm.map((p) => p.currentDensity));
      out.push(
        `Hydrogen in the anode oxygen is between ${HYDROGEN_IN_OXYGEN_ALARM_PERCENT} and ${trip} vol % at ${atAlarm.length} ` +
          `point(s), up to j = ${jMax} A/m², near the typical alarm level of about ${HYDROGEN_IN_OXYGEN_ALARM_PERCENT} vol % ` +
          `(common practice, from memory). This is a ${SAFETY_CAUTION}.`,
      );
    }
  }
  return out;
}
