/** The example study's plant, coatings and costs sections (filled by the plant page work). */
export function examplePlantSections(): Record<string, unknown> {
  return {};
}
