/** The example study's cell definition (filled by the cell page work). */
export function exampleCell(): Record<string, unknown> {
  return {};
}
