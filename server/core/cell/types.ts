/**
 * The cell definition and the results of the cell model, in SI coherent units.
 *
 * `CellDefinition` is also the JSON body of `POST /api/v1/cell/sweep` and the `cell` section of
 * a study file; its schema (with field paths for error messages) is in ./schema.ts. Every
 * number is SI: current density A/m², potential V, area resistance Ω·m², conductivity S/m,
 * length m, pressure Pa, temperature K, molality mol/kg, activation energy J/mol.
 *
 * Sign conventions (domain.md §2): anodic current positive; the cell model reports every
 * overpotential as a positive magnitude (the cathode's η < 0 is shown as |η_c|).
 */

/** Chemistry and product names and the electrolyte molalities (mol/kg) are the chemistry module's. */
import type { ChemistryId, Composition, ProductId } from '../chemistry/types.js';

export type { ChemistryId, Composition, ProductId };

/**
 * Standard errors of a kinetic fit and the correlation between its two parameters, used by
 * the uncertainty propagation (./uncertainty.ts). Parameters:
 *  - θ1 = ln j0 (natural log of the exchange current density in A/m², at the kinetics'
 *    reference temperature), standard error `lnExchangeCurrentDensitySE` (dimensionless;
 *    0.23 ≈ a factor 10^0.1 on j0);
 *  - θ2 = the transfer coefficient of the electrode's working direction: `transferCoefficient`
 *    for a Tafel electrode; for Butler–Volmer `anodicTransferCoefficient` at the anode and
 *    `cathodicTransferCoefficient` at the cathode (the other coefficient is held fixed);
 *    standard error `transferCoefficientSE`;
 *  - `correlation` = corr(θ1, θ2) in [−1, 1]. A Tafel fit η = a + b ln j gives strongly
 *    correlated ln j0 = −a/b and α = RT/(bF), typically |ρ| > 0.9 (our observation for data
 *    that lie decades away from j0; not a published figure).
 * The pair is treated as bivariate normal (the usual asymptotic reading of a least-squares fit).
 */
export interface KineticUncertainty {
  lnExchangeCurrentDensitySE: number;
  transferCoefficientSE: number;
  correlation: number;
}

/**
 * Tafel kinetics of one electrode: |η| = (RT/(αF))·ln(j/j0) on its working branch.
 * `exchangeCurrentDensity` j0 [A/m²] is given at `referenceTemperature` [K] (default: the cell
 * temperature) and moved to the cell temperature with `activationEnergy` E_a [J/mol] when both
 * are given (Arrhenius). α is taken as temperature-independent.
 */
export interface TafelKinetics {
  model: 'tafel';
  exchangeCurrentDensity: number;
  transferCoefficient: number;
  referenceTemperature?: number;
  activationEnergy?: number;
  uncertainty?: KineticUncertainty;
}

/**
 * Butler–Volmer kinetics of one electrode reaction, j = j0[exp(α_a f η) − exp(−α_c f η)],
 * with j0 at `referenceTemperature` moved by Arrhenius as for Tafel. The anode works on the
 * anodic branch (η > 0), the cathode on the cathodic branch (η < 0).
 */
export interface ButlerVolmerKinetics {
  model: 'butler-volmer';
  exchangeCurrentDensity: number;
  anodicTransferCoefficient: number;
  cathodicTransferCoefficient: number;
  referenceTemperature?: number;
  activationEnergy?: number;
  uncertainty?: KineticUncertainty;
}

export type ElectrodeKinetics = TafelKinetics | ButlerVolmerKinetics;

export interface Electrode {
  kinetics: ElectrodeKinetics;
  /**
   * Limiting current density [A/m²] of the electrode's main reaction (reactant supply). It adds
   * the concentration overpotential (RT/(nF))·ln(1/(1 − j/j_lim)); j ≥ j_lim has no solution.
   */
  limitingCurrentDensity?: number;
  /** Electrons n in the concentration overpotential (default: the chemistry's n = 2). */
  electrons?: number;
}

export type GapElectrolyte = 'KOH' | 'NaOH' | 'NaCl';
export type VoidModel = 'bruggeman' | 'maxwell';

/**
 * An electrolyte gap (or a porous layer filled with electrolyte) between electrode and
 * membrane/separator: R = d/σ_eff. Either `conductivity` σ [S/m] is given, or `electrolyte`
 * (with `concentration` [mol/kg], default from the cell composition) selects a published
 * conductivity correlation evaluated at the cell temperature. `voidFraction` ε of gas bubbles
 * reduces σ by the Bruggeman (1 − ε)^1.5 (default) or Maxwell (1 − ε)/(1 + ε/2) relation.
 */
export interface Gap {
  thickness: number;
  conductivity?: number;
  electrolyte?: GapElectrolyte;
  concentration?: number;
  voidFraction?: number;
  voidModel?: VoidModel;
}

/** Membrane by area resistance at a reference temperature, Arrhenius in temperature. */
export interface MembraneByAreaResistance {
  /** Ω·m² at `referenceTemperature` (default: the cell temperature). */
  areaResistance: number;
  referenceTemperature?: number;
  /** Apparent activation energy of the conductivity [J/mol]; R(T) = R_ref·exp[(E_a/R)(1/T − 1/T_ref)]. */
  activationEnergy?: number;
}
/** Membrane or separator by thickness [m] and (effective) conductivity [S/m] at the cell temperature. */
export interface MembraneByConductivity {
  thickness: number;
  conductivity: number;
}
/** H⁺-form perfluorosulfonic-acid membrane by the Springer et al. (1991) conductivity model. */
export interface MembraneBySpringer {
  springer: { thickness: number; waterContent: number };
}
export type Membrane = MembraneByAreaResistance | MembraneByConductivity | MembraneBySpringer;

export interface OhmicDefinition {
  membrane?: Membrane;
  gaps?: Gap[];
  /** Lumped hardware and contact area resistance, Ω·m². */
  hardware?: number;
}

/**
 * Current-efficiency models (domain.md §7):
 *  - constant: CE = value for the main product(s);
 *  - parasitic: CE = 1 − j_p/j (a constant parasitic current density j_p [A/m²]);
 *  - competing: a side reaction at the anode (e.g. oxygen evolution beside chlorine) with its
 *    own kinetics; its equilibrium potential lies `equilibriumPotentialShift` [V] from that of
 *    the main anode reaction (E_eq,side − E_eq,main; negative when the side reaction is
 *    thermodynamically easier). Both share the anode potential: j_main(E) + j_side(E) = j.
 *  - crossover: hydrogen permeation through the membrane/separator (water electrolysis):
 *    N = P·p_H2/δ with `hydrogenPermeability` P [mol/(m·s·Pa)] and `membraneThickness` δ [m].
 */
export type CurrentEfficiencyModel =
  | { model: 'constant'; value: number }
  | { model: 'parasitic'; currentDensity: number }
  | { model: 'competing'; sideReaction: { kinetics: ElectrodeKinetics; equilibriumPotentialShift: number } }
  | { model: 'crossover'; hydrogenPermeability: number; membraneThickness: number };

export interface CellDefinition {
  chemistry: ChemistryId;
  /** Cell temperature, K. */
  temperature: number;
  /** Cell (gas outlet) pressure, Pa absolute. */
  pressure: number;
  composition?: Composition;
  /** Override of the computed reversible cell voltage, V. */
  reversiblePotential?: number;
  anode: Electrode;
  cathode: Electrode;
  ohmic: OhmicDefinition;
  currentEfficiency?: CurrentEfficiencyModel;
  /** Current densities of the sweep, A/m² (each > 0). */
  currentDensities: number[];
  /** DC-side efficiency of rectifier and transformer, 0 < η ≤ 1, for AC specific energy. */
  rectifierEfficiency?: number;
  /** Design current density, A/m²: reported as `designPoint`. */
  designCurrentDensity?: number;
  /** Current-density range [lo, hi] A/m² of the K-factor line; default [max j / 3, max j] (project choice, see sweep.ts). */
  kFactorRange?: [number, number];
}

// ---------------------------------------------------------------------------------------------
// Results

/** Voltage balance at one current density. Parts sum to `total` (V). */
export interface VoltageBreakdown {
  /** Reversible cell voltage E_rev, V. */
  reversible: number;
  /** Anode activation overpotential η_a, V (≥ 0). */
  anode: number;
  /** Cathode activation overpotential magnitude |η_c|, V (≥ 0). */
  cathode: number;
  /** Concentration overpotential of both electrodes, V (= anode + cathode parts below). */
  massTransport: number;
  massTransportAnode: number;
  massTransportCathode: number;
  /** j·R_membrane, V. */
  membrane: number;
  /** j·R of each gap, V, in the order of `ohmic.gaps`. */
  gaps: number[];
  /** j·R_hardware, V. */
  hardware: number;
  /** membrane + Σ gaps + hardware, V. */
  ohmicDrop: number;
  /** reversible + anode + cathode + massTransport + ohmicDrop, V. */
  total: number;
}

/** Current efficiency per product (0–1) and gas purity at one current density. */
export interface CurrentEfficiencyResult {
  /** Current efficiency of each product of the chemistry (Faradaic yield, 0–1). */
  byProduct: Partial<Record<ProductId, number>>;
  /** H2 in the (dry) anode oxygen, vol % (water electrolysis with the crossover model). */
  hydrogenInOxygenPercent?: number;
  /** O2 in the (dry) anode chlorine, vol % (competing anode reaction model). */
  oxygenInChlorinePercent?: number;
  /** Side-reaction current density at the anode, A/m² (competing model). */
  sideReactionCurrentDensity?: number;
  /** Equivalent current density of hydrogen crossover, A/m² (crossover model). */
  crossoverCurrentDensity?: number;
}

export interface SweepPoint {
  currentDensity: number;
  cellVoltage: number;
  anodeOverpotential: number;
  /** Magnitude |η_c|. */
  cathodeOverpotential: number;
  massTransportOverpotential: number;
  ohmicDrop: number;
  breakdown: VoltageBreakdown;
  currentEfficiency: CurrentEfficiencyResult;
  /** Production rate per unit electrode area, kg/(m²·s), per product. */
  productionRate: Partial<Record<ProductId, number>>;
  /** DC specific energy, J/kg, per main product (Cl2 and NaOH; H2 for water). */
  specificEnergy: Partial<Record<ProductId, number>>;
  /** AC specific energy = DC / rectifierEfficiency, J/kg (when rectifierEfficiency is given). */
  specificEnergyAC?: Partial<Record<ProductId, number>>;
  /** Voltage efficiency (water electrolysis): U_HHV°/U and U_LHV°/U at 25 °C, 1 bar. */
  voltageEfficiency?: { hhv: number; lhv?: number };
  /** Heat to remove per unit area, W/m²: (U − U_tn)·j; negative = heat must be supplied. */
  heatLoad: number;
}

export interface KFactorResult {
  /** Slope K of U = U0 + K·j, V/(A/m²) (×1000 for V per kA/m²). */
  value: number;
  standardError: number;
  /** U0, V. */
  intercept: number;
  interceptStandardError: number;
  rSquared: number;
  /** Current-density range used, A/m². */
  range: [number, number];
  pointsUsed: number;
}

export interface CellSweepResult {
  chemistry: ChemistryId;
  /** E_rev used, V (the override when given). */
  reversiblePotential: number;
  reversiblePotentialSource: 'thermodynamics' | 'override';
  /** U_tn at the cell temperature and pressure, V. */
  thermoneutralVoltage: number;
  lhvThermoneutralVoltage?: number;
  /** Resistances evaluated once for the sweep, Ω·m². */
  resistances: { membrane: number; gaps: number[]; hardware: number; total: number };
  /** Exchange current densities at the cell temperature, A/m². */
  exchangeCurrentDensities: { anode: number; cathode: number; sideReaction?: number };
  points: SweepPoint[];
  /** Absent when fewer than two points lie in the K-factor range (a warning says why). */
  kFactor?: KFactorResult;
  designPoint?: SweepPoint;
  warnings: string[];
}
