/**
 * Registry of the electrolysis chemistries. To add one: write a module exporting a
 * `Chemistry` (see types.ts and the existing modules) and list it in CHEMISTRIES below —
 * nothing else changes.
 */
import { FARADAY } from '../constants.js';
import { InputError } from '../errors.js';
import { ALKALINE_WATER } from './alkaline-water.js';
import { CHLOR_ALKALI } from './chlor-alkali.js';
import { PEM_WATER } from './pem-water.js';
import type { Chemistry, Product } from './types.js';

export type {
  Chemistry,
  ChemistryId,
  Composition,
  CompositionKey,
  OperatingConditions,
  Product,
  ProductId,
  ReversibleResult,
} from './types.js';

export const CHEMISTRIES: readonly Chemistry[] = Object.freeze([CHLOR_ALKALI, ALKALINE_WATER, PEM_WATER]);

/** The chemistry with this id; InputError('chemistry', …) for an unknown id. */
export function getChemistry(id: string): Chemistry {
  const found = CHEMISTRIES.find((c) => c.id === id);
  if (!found) {
    throw new InputError('chemistry', `unknown chemistry "${String(id)}"; known: ${CHEMISTRIES.map((c) => c.id).join(', ')}`, id);
  }
  return found;
}

/**
 * Electrochemical equivalent: kg of product per A·s (coulomb) at 100 % current efficiency,
 *   k = M/(z·F)  [kg/C],
 * M [kg/mol] the product's molar mass, z electrons per molecule, F the Faraday constant.
 * Multiply by 3.6e6 for kg per kA·h. Source: Faraday's law (domain §8).
 */
export function electrochemicalEquivalent(product: Product): number {
  if (!(product.molarMass > 0) || !(product.electronsPerMolecule > 0)) {
    throw new InputError('product', 'molar mass and electrons per molecule must be > 0', product);
  }
  return product.molarMass / (product.electronsPerMolecule * FARADAY.value);
}
