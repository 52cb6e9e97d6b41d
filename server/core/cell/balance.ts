/**
 * Cell voltage balance at one current density (domain.md §3–6):
 *
 *   U = E_rev + η_a + |η_c| + η_mt,a + η_mt,c + j·(R_membrane + Σ R_gap + R_hardware)
 *
 * with E_rev from thermodynamics (or the user's override), the activation overpotentials from
 * each electrode's kinetics at the cell temperature (anode at +j, cathode at −j, magnitudes),
 * the concentration overpotential (RT/(nF))·ln(1/(1 − j/j_lim)) of each electrode with a
 * limiting current, and area resistances evaluated at the cell temperature.
 *
 * Two tiers: `prepareCell` does everything that does not depend on j once (reversible
 * voltage, conductivities, resistances, j0 at temperature); `voltageBalance` is the per-point
 * kernel and trusts its prepared input. SI units throughout (A/m², V, Ω·m², K).
 */
import { faradayOverRT } from '../constants.js';
import { PhysicsError } from '../errors.js';
import { concentrationOverpotential as filmOverpotential } from '../transport/mass-transport.js';
import {
  activationOverpotential,
  prepareKinetics,
  TAFEL_MIN_RATIO_TO_J0,
  type ElectrodeRole,
  type PreparedKinetics,
} from './electrode.js';
import { solveCompetingAnode, type PreparedSideReaction } from './efficiency.js';
import {
  chemistryInfo,
  effectiveConductivity,
  electrolyteConductivity,
  membraneAreaResistanceAt,
  reversibleVoltages,
  springerConductivity,
  standardHeatingValueVoltages,
  type ProductInfo,
} from './properties.js';
import { parseCellDefinition } from './schema.js';
import type { CellDefinition, ChemistryId, Composition, Gap, GapElectrolyte, Membrane, ProductId, VoltageBreakdown } from './types.js';

/** An electrode with its kinetics at the cell temperature. */
export interface PreparedElectrode {
  role: ElectrodeRole;
  kinetics: PreparedKinetics;
  limitingCurrentDensity?: number;
  /** Electrons n in the concentration overpotential. */
  electrons: number;
}

/** Everything about a cell that does not depend on the current density. */
export interface PreparedCell {
  definition: CellDefinition;
  chemistry: ChemistryId;
  temperature: number;
  /** f = F/(RT), 1/V. */
  f: number;
  reversiblePotential: number;
  reversiblePotentialSource: 'thermodynamics' | 'override';
  thermoneutralVoltage: number;
  lhvThermoneutralVoltage?: number;
  /** Water: ΔH°/(2F) on HHV and LHV bases at 298.15 K, 1 bar (voltage efficiency), V. */
  heatingValueVoltages?: { hhv: number; lhv: number };
  anode: PreparedElectrode;
  cathode: PreparedElectrode;
  sideReaction?: PreparedSideReaction;
  resistances: { membrane: number; gaps: number[]; hardware: number; total: number };
  /**
   * Cathode hydrogen partial pressure used by the crossover model, Pa: the thermo module's
   * water-saturated p_H2 = p − a_w·p_sat(T) when it gives one, else the cell pressure.
   */
  hydrogenPartialPressure: number;
  /** Products of the chemistry with molar mass [kg/mol] and electrons per molecule. */
  products: ProductInfo[];
  /** Products whose specific energy is reported (Cl2 and NaOH; H2 for water). */
  energyProducts: ProductId[];
  /** Warnings raised while preparing (correlation ranges, assumptions). */
  warnings: string[];
}

/** Products whose specific energy the sweep reports, per chemistry. */
const ENERGY_PRODUCTS: Record<ChemistryId, ProductId[]> = {
  'chlor-alkali': ['Cl2', 'NaOH'],
  'alkaline-water': ['H2'],
  'pem-water': ['H2'],
};

/** Composition field that supplies the default concentration of a gap electrolyte. */
const COMPOSITION_FIELD: Record<GapElectrolyte, keyof Composition> = {
  KOH: 'koh',
  NaOH: 'causticNaOH',
  NaCl: 'brineNaCl',
};

function prepareElectrode(def: CellDefinition, role: ElectrodeRole, defaultElectrons: number, warnings: string[]): PreparedElectrode {
  const e = def[role];
  const prepared: PreparedElectrode = {
    role,
    kinetics: prepareKinetics(e.kinetics, def.temperature, `${role}.kinetics`, warnings),
    electrons: e.electrons ?? defaultElectrons,
  };
  if (e.limitingCurrentDensity !== undefined) prepared.limitingCurrentDensity = e.limitingCurrentDensity;
  return prepared;
}

/**
 * Membrane area resistance [Ω·m²] at the cell temperature T [K]:
 *  - { areaResistance, referenceTemperature?, activationEnergy? }: R(T) = R_ref·exp[(E_a/R)(1/T − 1/T_ref)]
 *    (Arrhenius conductivity; common practice), R_ref at T when no E_a is given;
 *  - { thickness, conductivity }: R = d/σ;
 *  - { springer: { thickness, waterContent } }: R = d/σ_Springer(λ, T) (Springer, Zawodzinski &
 *    Gottesfeld, J. Electrochem. Soc. 138 (1991) 2334), valid for H⁺-form PFSA membranes.
 */
function membraneResistance(membrane: Membrane | undefined, def: CellDefinition, warnings: string[]): number {
  if (membrane === undefined) return 0;
  const T = def.temperature;
  if ('areaResistance' in membrane) {
    if (membrane.activationEnergy !== undefined && membrane.referenceTemperature !== undefined) {
      return membraneAreaResistanceAt(membrane.areaResistance, membrane.referenceTemperature, membrane.activationEnergy, T, 'ohmic.membrane');
    }
    // Warn beyond 1 K between T_ref and T (project choice).
    if (membrane.referenceTemperature !== undefined && Math.abs(membrane.referenceTemperature - T) > 1) {
      warnings.push(
        `ohmic.membrane: area resistance given at ${membrane.referenceTemperature.toFixed(2)} K without an activation energy; used unchanged at ${T.toFixed(2)} K`,
      );
    }
    return membrane.areaResistance;
  }
  if ('springer' in membrane) {
    if (def.chemistry !== 'pem-water') {
      warnings.push(
        'ohmic.membrane.springer: the Springer (1991) model describes H⁺-form PFSA membranes (PEM); it is outside its basis for this chemistry',
      );
    }
    const sigma = springerConductivity(membrane.springer.waterContent, T, 'ohmic.membrane.springer', warnings);
    return membrane.springer.thickness / sigma;
  }
  return membrane.thickness / membrane.conductivity;
}

/** Gap resistance d/σ_eff [Ω·m²] with σ from the input or a correlation, then the void correction. */
function gapResistance(gap: Gap, index: number, def: CellDefinition, warnings: string[]): number {
  const path = `ohmic.gaps[${index}]`;
  let sigma: number;
  if (gap.conductivity !== undefined) {
    sigma = gap.conductivity;
  } else {
    const electrolyte = gap.electrolyte as GapElectrolyte; // schema guarantees one of the two
    const field = COMPOSITION_FIELD[electrolyte];
    const molality = gap.concentration ?? def.composition?.[field];
    if (molality === undefined) {
      throw new PhysicsError(
        `${path}.concentration`,
        `needed for the ${electrolyte} conductivity correlation (or give composition.${field}) [mol/kg]`,
      );
    }
    sigma = electrolyteConductivity(electrolyte, molality, def.temperature, path, warnings);
  }
  const epsilon = gap.voidFraction ?? 0;
  if (epsilon > 0) sigma = effectiveConductivity(sigma, epsilon, gap.voidModel ?? 'bruggeman', path, warnings);
  return gap.thickness / sigma;
}

/**
 * Validate a cell definition and compute everything that does not depend on the current
 * density: reversible and thermoneutral voltages (once), j0 at temperature, conductivities and
 * area resistances, the side reaction, products. Throws InputError (bad fields, with paths) or
 * PhysicsError (no physical value, e.g. a correlation outside its domain).
 */
export function prepareCell(input: CellDefinition | unknown): PreparedCell {
  const def = parseCellDefinition(input);
  const warnings: string[] = [];
  const info = chemistryInfo(def.chemistry);
  const thermo = reversibleVoltages(def, warnings);
  const reversiblePotential = def.reversiblePotential ?? thermo.reversiblePotential;
  const anode = prepareElectrode(def, 'anode', info.electrons, warnings);
  const cathode = prepareElectrode(def, 'cathode', info.electrons, warnings);

  let sideReaction: PreparedSideReaction | undefined;
  const ce = def.currentEfficiency;
  if (ce?.model === 'competing') {
    sideReaction = {
      kinetics: prepareKinetics(ce.sideReaction.kinetics, def.temperature, 'currentEfficiency.sideReaction.kinetics', warnings),
      equilibriumPotentialShift: ce.sideReaction.equilibriumPotentialShift,
    };
  }

  const membrane = membraneResistance(def.ohmic.membrane, def, warnings);
  const gaps = (def.ohmic.gaps ?? []).map((g, i) => gapResistance(g, i, def, warnings));
  const hardware = def.ohmic.hardware ?? 0;
  const total = membrane + gaps.reduce((a, b) => a + b, 0) + hardware;

  const prepared: PreparedCell = {
    definition: def,
    chemistry: def.chemistry,
    temperature: def.temperature,
    f: faradayOverRT(def.temperature),
    reversiblePotential,
    reversiblePotentialSource: def.reversiblePotential === undefined ? 'thermodynamics' : 'override',
    thermoneutralVoltage: thermo.thermoneutralVoltage,
    anode,
    cathode,
    resistances: { membrane, gaps, hardware, total },
    hydrogenPartialPressure: thermo.hydrogenPartialPressure ?? def.pressure,
    products: info.products,
    energyProducts: ENERGY_PRODUCTS[def.chemistry],
    warnings,
  };
  if (thermo.lhvThermoneutralVoltage !== undefined) prepared.lhvThermoneutralVoltage = thermo.lhvThermoneutralVoltage;
  if (def.chemistry !== 'chlor-alkali') prepared.heatingValueVoltages = standardHeatingValueVoltages();
  if (sideReaction) prepared.sideReaction = sideReaction;
  return prepared;
}

/** Flags a balance point raises for the sweep's aggregated warnings. */
export interface BalanceFlags {
  /** Tafel electrode used at j ≤ j0 (|η| set to 0). */
  tafelBelowExchange: ElectrodeRole[];
  /** Tafel electrode used at j0 < j < 10·j0 (back reaction not negligible). */
  tafelNearExchange: ElectrodeRole[];
}

/** Voltage balance at one current density, with the side-reaction current when modelled. */
export interface BalancePoint {
  breakdown: VoltageBreakdown;
  /** Anode side-reaction current density, A/m² (competing model). */
  sideCurrentDensity?: number;
  flags: BalanceFlags;
}

/**
 * Concentration overpotential η_mt = (RT/(nF))·ln(1/(1 − j/j_lim)) [V] of one electrode, 0
 * without a limiting current. j ≥ j_lim has no solution: PhysicsError at `path` naming the
 * electrode's limitingCurrentDensity. Source: domain.md §6 (Nernst diffusion layer).
 */
function concentrationOverpotential(e: PreparedElectrode, j: number, temperatureK: number, path: string): number {
  const jLim = e.limitingCurrentDensity;
  if (jLim === undefined) return 0;
  if (j >= jLim) {
    throw new PhysicsError(
      path,
      `j = ${j} A/m² is at or above the ${e.role} limiting current density ${e.role}.limitingCurrentDensity = ${jLim} A/m²; ` +
        'the cell cannot carry this current (mass-transport limit)',
    );
  }
  return filmOverpotential(j, jLim, temperatureK, e.electrons);
}

/**
 * Voltage balance at current density j [A/m²] > 0 (see the file header). `path` names j in
 * error messages (e.g. `currentDensities[7]`). Parts of the breakdown sum to its total.
 * Throws PhysicsError for j at or above a limiting current or when a model has no solution.
 */
export function voltageBalance(cell: PreparedCell, j: number, path = 'currentDensity'): BalancePoint {
  const T = cell.temperature;
  const flags: BalanceFlags = { tafelBelowExchange: [], tafelNearExchange: [] };
  let etaAnode: number;
  let sideCurrentDensity: number | undefined;
  if (cell.sideReaction) {
    const sol = solveCompetingAnode(cell.anode.kinetics, cell.sideReaction, j, T, cell.f, 'currentEfficiency.sideReaction');
    sideCurrentDensity = sol.sideCurrentDensity;
    etaAnode = sol.mainOverpotential;
    checkTafelRange(cell.anode.kinetics, sol.mainCurrentDensity, 'anode', flags);
    if (etaAnode < 0) {
      // Only a Tafel main reaction below its j0 gets here (Butler–Volmer gives η > 0 for j_main > 0).
      etaAnode = 0;
    }
  } else {
    const a = activationOverpotential(cell.anode.kinetics, 'anode', j, T);
    etaAnode = a.overpotential;
    checkTafelRange(cell.anode.kinetics, j, 'anode', flags);
  }
  const c = activationOverpotential(cell.cathode.kinetics, 'cathode', j, T);
  checkTafelRange(cell.cathode.kinetics, j, 'cathode', flags);
  const etaCathode = c.overpotential;

  const mtAnode = concentrationOverpotential(cell.anode, j, T, path);
  const mtCathode = concentrationOverpotential(cell.cathode, j, T, path);
  const r = cell.resistances;
  const membrane = j * r.membrane;
  const gaps = r.gaps.map((g) => j * g);
  const hardware = j * r.hardware;
  let ohmicDrop = membrane + hardware;
  for (const g of gaps) ohmicDrop += g;
  const massTransport = mtAnode + mtCathode;
  const total = cell.reversiblePotential + etaAnode + etaCathode + massTransport + ohmicDrop;
  const point: BalancePoint = {
    breakdown: {
      reversible: cell.reversiblePotential,
      anode: etaAnode,
      cathode: etaCathode,
      massTransport,
      massTransportAnode: mtAnode,
      massTransportCathode: mtCathode,
      membrane,
      gaps,
      hardware,
      ohmicDrop,
      total,
    },
    flags,
  };
  if (sideCurrentDensity !== undefined) point.sideCurrentDensity = sideCurrentDensity;
  return point;
}

function checkTafelRange(k: PreparedKinetics, j: number, role: ElectrodeRole, flags: BalanceFlags): void {
  if (k.model !== 'tafel') return;
  if (j <= k.exchangeCurrentDensity) flags.tafelBelowExchange.push(role);
  else if (j < TAFEL_MIN_RATIO_TO_J0 * k.exchangeCurrentDensity) flags.tafelNearExchange.push(role);
}
