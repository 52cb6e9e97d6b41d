/**
 * Plain-text number formatting for the design-basis lines a plant result carries (the only
 * text the core writes; pages do their own formatting).
 */

const formatters = new Map<number, Intl.NumberFormat>();

/** Outside [SCIENTIFIC_BELOW, SCIENTIFIC_FROM) a non-zero |x| is written as m·10^e (our choice). */
const SCIENTIFIC_FROM = 1e15;
const SCIENTIFIC_BELOW = 1e-6;

/**
 * x to `digits` significant figures, grouped thousands, e.g. 41 666.67 → "41,670" (4 s.f.);
 * very large or very small magnitudes in exponent form, e.g. 3.2e10 → "32,000,000,000" but
 * 3.2e20 → "3.2e20" and 1e-300 → "1e-300" (no 300-digit strings in messages).
 */
export function sig(x: number, digits = 4): string {
  if (!Number.isFinite(x)) return String(x);
  const size = Math.abs(x);
  if (size !== 0 && (size >= SCIENTIFIC_FROM || size < SCIENTIFIC_BELOW)) {
    return sci(x, digits);
  }
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

/** x in exponent form to `digits` significant figures, trailing zeros dropped: 3.2e10 → "3.2e10". */
export function sci(x: number, digits = 2): string {
  if (!Number.isFinite(x)) return String(x);
  return Number(x.toPrecision(digits)).toExponential().replace('e+', 'e');
}
