/** Cell, plant, coating and cost sections of the example study (filled as those parts land). */
export function buildExampleSections(): Record<string, unknown> {
  return {};
}
