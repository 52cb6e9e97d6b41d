/** Cell, plant, coating and cost sections of the example study. */
import { exampleCell } from './example-cell.js';
import { exampleEconomicsSections } from './example-economics.js';
import { examplePlantSections } from './example-plant.js';

export function buildExampleSections(): Record<string, unknown> {
  return { ...exampleCell(), ...examplePlantSections(), ...exampleEconomicsSections() };
}
