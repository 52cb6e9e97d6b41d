/**
 * Plain-text number formatting for the design-basis lines a plant result carries (the only
 * text the core writes; pages do their own formatting).
 */

const formatters = new Map<number, Intl.NumberFormat>();

/** x to `digits` significant figures, grouped thousands, e.g. 41 666.67 → "41,670" (4 s.f.). */
export function sig(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return String(x);
  let f = formatters.get(digits);
  if (!f) {
    f = new Intl.NumberFormat('en-US', { maximumSignificantDigits: digits, useGrouping: true });
    formatters.set(digits, f);
  }
  return f.format(x);
}

/** A fraction as a percentage with `digits` significant figures, e.g. 0.9612 → "96.12 %". */
export function percent(fraction: number, digits = 4): string {
  return `${sig(100 * fraction, digits)} %`;
}
