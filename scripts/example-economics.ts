/** The example study's coating comparison and cost-study sections (filled by the coatings/costs work). */
export function exampleEconomicsSections(): Record<string, unknown> {
  return {};
}
