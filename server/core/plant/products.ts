/**
 * Faraday data for the plant layer: the products and feeds of the two chemistries the plant
 * pages handle ('water' covers both water electrolysers). Product names and Faraday's-law
 * equivalent are the chemistry module's.
 *
 * Molar masses come from server/core/constants.ts MOLAR_MASS (IUPAC/CIAAW abridged standard
 * atomic weights, 2021). Electrons per molecule from the electrode reactions:
 *   anode   2 Cl⁻ → Cl₂ + 2 e⁻                  (z = 2)
 *   anode   2 OH⁻ → ½ O₂ + H₂O + 2 e⁻           (z = 4 per O₂)
 *   cathode 2 H₂O + 2 e⁻ → H₂ + 2 OH⁻           (z = 2)
 *   caustic one Na⁺ crosses the membrane per e⁻  (z = 1 per NaOH)
 */
import { GAS_CONSTANT, MOLAR_MASS, P_NORMAL, ZERO_CELSIUS_K } from '../constants.js';
import type { ProductId } from '../chemistry/types.js';

export type { ProductId };
/** Electrochemical equivalent M/(zF) [kg/C] (Faraday's law; chemistry module). */
export { electrochemicalEquivalent } from '../chemistry/index.js';
export type PlantChemistry = 'chlor-alkali' | 'water';

/** One electrolysis product as Faraday's law sees it. */
export interface ProductSpec {
  readonly id: ProductId;
  /** Plain name for text output. */
  readonly name: string;
  /** Molar mass, kg/mol. */
  readonly molarMass: number;
  /** Electrons transferred per molecule (or formula unit) formed. */
  readonly electronsPerMolecule: number;
  /** True for a gas (flows are also given in Nm³/h). */
  readonly gas: boolean;
  readonly electrode: 'anode' | 'cathode';
}

/** Product table. Molar masses: IUPAC/CIAAW abridged atomic weights via constants.ts. */
export const PRODUCT_SPECS: Readonly<Record<ProductId, ProductSpec>> = {
  Cl2: { id: 'Cl2', name: 'chlorine', molarMass: MOLAR_MASS.Cl2, electronsPerMolecule: 2, gas: true, electrode: 'anode' },
  NaOH: { id: 'NaOH', name: 'caustic soda (100 % NaOH)', molarMass: MOLAR_MASS.NaOH, electronsPerMolecule: 1, gas: false, electrode: 'cathode' },
  H2: { id: 'H2', name: 'hydrogen', molarMass: MOLAR_MASS.H2, electronsPerMolecule: 2, gas: true, electrode: 'cathode' },
  O2: { id: 'O2', name: 'oxygen', molarMass: MOLAR_MASS.O2, electronsPerMolecule: 4, gas: true, electrode: 'anode' },
};

export type FeedId = 'NaCl' | 'H2O';

/**
 * A feed consumed by the reaction, counted per mole of a product it is tied to
 * (stoichiometric consumption only: no purge, no losses, no water leaving with the gases).
 */
export interface FeedSpec {
  readonly id: FeedId;
  readonly name: string;
  /** kg/mol. */
  readonly molarMass: number;
  /** The product whose formation consumes the feed. */
  readonly basis: ProductId;
  /** Moles of feed per mole of the basis product. */
  readonly molesPerMoleOfBasis: number;
  /** Plain statement of the basis, for the design-basis text. */
  readonly note: string;
}

/** A named value with unit and source. */
export interface SourcedValue {
  readonly value: number;
  readonly unit: string;
  readonly source: string;
}

export interface ChemistrySpec {
  readonly id: PlantChemistry;
  readonly name: string;
  readonly products: readonly ProductId[];
  readonly feeds: readonly FeedSpec[];
  /** Thermoneutral voltage U_tn = ΔH/(nF) at 298.15 K, used for the heat load unless overridden. */
  readonly thermoneutralVoltage: SourcedValue;
}

/** The two chemistries of the plant pages. */
export const CHEMISTRY_SPECS: Readonly<Record<PlantChemistry, ChemistrySpec>> = {
  'chlor-alkali': {
    id: 'chlor-alkali',
    name: 'chlor-alkali (membrane cell): 2 NaCl + 2 H₂O → Cl₂ + H₂ + 2 NaOH',
    products: ['Cl2', 'NaOH', 'H2'],
    feeds: [
      {
        id: 'NaCl',
        name: 'salt (NaCl) decomposed',
        molarMass: MOLAR_MASS.NaCl,
        basis: 'NaOH',
        molesPerMoleOfBasis: 1,
        note: 'one NaCl per NaOH formed (Na⁺ carried through the membrane); brine purge and losses excluded',
      },
      {
        id: 'H2O',
        name: 'water consumed by the reaction',
        molarMass: MOLAR_MASS.H2O,
        basis: 'H2',
        molesPerMoleOfBasis: 2,
        note: 'two H₂O per H₂ at the cathode (2 H₂O + 2 e⁻ → H₂ + 2 OH⁻); water leaving with the caustic and the gases excluded',
      },
    ],
    thermoneutralVoltage: {
      value: 2.3111,
      unit: 'V',
      source: 'ΔH°/(2F) from NBS-82 tables, 298.15 K (check-values §2b, derived)',
      // The NaCl(ao)/NaOH(ao) ΔfH° inputs equal the ion sums, whose ion values are source seen
      // (via secondary) in check-values §2a; the NaOH(ao) entry itself is marked from memory there.
    },
  },
  water: {
    id: 'water',
    name: 'water electrolysis: H₂O → H₂ + ½ O₂',
    products: ['H2', 'O2'],
    feeds: [
      {
        id: 'H2O',
        name: 'water consumed by the reaction',
        molarMass: MOLAR_MASS.H2O,
        basis: 'H2',
        molesPerMoleOfBasis: 1,
        note: 'one H₂O per H₂; water leaving as vapour with the gases and purification losses excluded',
      },
    ],
    thermoneutralVoltage: {
      value: 1.48121,
      unit: 'V',
      source: 'ΔH°/(2F) of liquid water, HHV basis, 298.15 K (check-values §2b, derived)',
    },
  },
};

/** Seconds per hour (exact). */
export const SECONDS_PER_HOUR = 3600;
/** Joules per kilowatt-hour (exact: 1 kWh = 3.6 MJ). */
export const JOULES_PER_KWH = 3.6e6;

/**
 * Molar volume of an ideal gas at normal conditions (0 °C, 101.325 kPa), m³/mol:
 * V_m = R·T/p = 0.022 413 97 m³/mol. Ideal-gas approximation: real H₂ and O₂ differ by well
 * under 1 %, Cl₂ by roughly 1–2 % (from memory). Source: CODATA 2018 R; DIN 1343 normal conditions.
 */
export const NORMAL_MOLAR_VOLUME = (GAS_CONSTANT.value * ZERO_CELSIUS_K.value) / P_NORMAL.value;
