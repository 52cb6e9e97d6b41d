/**
 * Contract of a chemistry module. A chemistry is data (reactions, products with their
 * Faraday data, validity range) plus one function computing the reversible and
 * thermoneutral voltages at operating conditions. Adding a chemistry means adding a module
 * that exports one `Chemistry` and listing it in chemistry/index.ts — no solver changes.
 */
export type ChemistryId = 'chlor-alkali' | 'alkaline-water' | 'pem-water';
export type ProductId = 'Cl2' | 'NaOH' | 'H2' | 'O2';
export type CompositionKey = 'brineNaCl' | 'causticNaOH' | 'koh';

/** Electrolyte composition, each as molality [mol/kg water]. */
export interface Composition {
  /** Anolyte (depleted brine) NaCl molality [mol/kg]. */
  brineNaCl?: number;
  /** Catholyte NaOH molality [mol/kg]. */
  causticNaOH?: number;
  /** KOH molality of an alkaline water electrolyser [mol/kg]. */
  koh?: number;
}

export interface OperatingConditions {
  /** Temperature [K]. */
  temperature: number;
  /** Absolute pressure of both gas compartments [Pa]. */
  pressure: number;
  composition: Composition;
}

export interface Product {
  id: ProductId;
  name: string;
  /** Molar mass [kg/mol]. */
  molarMass: number;
  /** Electrons transferred per molecule of product (z in Faraday's law). */
  electronsPerMolecule: number;
  electrode: 'anode' | 'cathode';
  gas: boolean;
}

export interface ReversibleResult {
  /** Reversible cell voltage E_rev [V] at the operating conditions. */
  reversiblePotential: number;
  /** Thermoneutral voltage ΔH/(nF) [V]; HHV (liquid water) basis for water electrolysis. */
  thermoneutralVoltage: number;
  /** Thermoneutral voltage on the LHV (water vapour) basis [V], water electrolysis only. */
  lhvThermoneutralVoltage?: number;
  warnings: string[];
  /** Intermediate values in SI units (E0 [V], nernstTerm [V], activities [–], pressures [Pa] …). */
  details: Record<string, number>;
}

export interface Chemistry {
  id: ChemistryId;
  name: string;
  /** Electrons n per overall reaction as written. */
  electrons: number;
  overallReaction: string;
  anodeReaction: string;
  cathodeReaction: string;
  /** All products with their Faraday data. */
  products: Product[];
  /** Cl2 for chlor-alkali, H2 for water electrolysis. */
  mainProduct: ProductId;
  requiredComposition: CompositionKey[];
  /** [K], validity of the data used by `reversible`. */
  temperatureRange: [number, number];
  /** Throws InputError for missing composition or T outside `temperatureRange`. */
  reversible(c: OperatingConditions): ReversibleResult;
}
