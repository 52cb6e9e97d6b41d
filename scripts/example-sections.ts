/** Cell, plant, coating and cost sections of the example study. */
import { exampleCell } from './example-cell.js';
import { exampleEconomicsSections } from './example-economics.js';
import { examplePlantSections } from './example-plant.js';
import type { Dataset } from '../server/scenario/schema.js';

export function buildExampleSections(datasets: Dataset[]): Record<string, unknown> {
  return { ...exampleCell(datasets), ...examplePlantSections(), ...exampleEconomicsSections() };
}
