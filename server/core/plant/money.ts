/**
 * Money arithmetic in decimal (decimal.js), kept apart from the float64 physics.
 *
 * - Numbers enter through their shortest round-trip decimal form (JavaScript's own
 *   Number → string), so 2.675 is taken as the decimal 2.675 that the user typed, not as the
 *   binary neighbour 2.67499999999999982236431605997495353221893310546875.
 * - Sums, discounting and the capital recovery factor run in 40 significant digits (our
 *   choice: far beyond any money figure), rounding half-even inside the arithmetic (no drift in
 *   long sums).
 * - Display rounding is explicit: `roundMoney(x, places, mode)`, default half-up (commercial
 *   rounding, common practice for reported figures); half-even on request.
 */
import { Decimal } from 'decimal.js';
import { InputError } from '../errors.js';

/** Decimal constructor for money: 40 significant digits, half-even inside arithmetic. */
export const MoneyDecimal = Decimal.clone({ precision: 40, rounding: Decimal.ROUND_HALF_EVEN });
export type MoneyValue = number | string | Decimal;
export type RoundingMode = 'half-up' | 'half-even';

/** Convert to a money Decimal. Rejects NaN/Infinity with an InputError at `path`. */
export function money(x: MoneyValue, path = 'money'): Decimal {
  if (typeof x === 'number' && !Number.isFinite(x)) throw new InputError(path, 'must be a finite amount');
  const d = new MoneyDecimal(x);
  if (!d.isFinite()) throw new InputError(path, 'must be a finite amount');
  return d;
}

/**
 * Round an amount for display to `places` decimals, returned as a string (never a float, so
 * no binary artefact reappears): roundMoney(0.1 + 0.2, 2) = "0.30";
 * roundMoney(0.125, 2, 'half-up') = "0.13", roundMoney(0.125, 2, 'half-even') = "0.12".
 * Negative zero prints as "0.00". Source: decimal.js toFixed with ROUND_HALF_UP / ROUND_HALF_EVEN.
 */
export function roundMoney(x: MoneyValue, places = 2, mode: RoundingMode = 'half-up'): string {
  if (!Number.isInteger(places) || places < 0 || places > 20) throw new InputError('places', 'must be a whole number 0–20');
  const rounding = mode === 'half-even' ? Decimal.ROUND_HALF_EVEN : Decimal.ROUND_HALF_UP;
  const text = money(x).toFixed(places, rounding);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

function checkRateAndYears(rate: number, years: number): void {
  if (!Number.isFinite(rate) || rate <= -1) throw new InputError('discountRate', 'must be a finite rate > −1 (fraction per year)');
  if (!Number.isFinite(years) || years <= 0) throw new InputError('lifeYears', 'must be a finite number of years > 0');
}

/**
 * Below this |argument| ln(1+x) and e^x − 1 are summed as power series instead of through
 * ln/exp, whose results lose the leading digits to cancellation there (1e-3, our choice: the
 * series then reach the 40-digit working precision within 15 terms).
 */
const SERIES_THRESHOLD = new MoneyDecimal('1e-3');
/** Relative size of the last series term kept (1e-45, our choice: below the 40 working digits). */
const SERIES_TOLERANCE = new MoneyDecimal('1e-45');
/** Safety cap on series terms (never reached below SERIES_THRESHOLD; our choice). */
const SERIES_MAX_TERMS = 100;

/**
 * ln(1 + x) without cancellation for small |x| (x > −1): the Mercator series
 * x − x²/2 + x³/3 − … for |x| < SERIES_THRESHOLD, else ln(1 + x) in working precision.
 * Source: Taylor series of ln(1 + x) (common practice, as in C's log1p).
 */
function log1p(x: Decimal): Decimal {
  if (x.abs().gte(SERIES_THRESHOLD)) return x.plus(1).ln();
  let power = x;
  let sum = x;
  for (let k = 2; k <= SERIES_MAX_TERMS; k++) {
    power = power.times(x).neg();
    const term = power.div(k);
    sum = sum.plus(term);
    if (term.abs().lte(sum.abs().times(SERIES_TOLERANCE))) break;
  }
  return sum;
}

/**
 * e^x − 1 without cancellation for small |x|: the series x + x²/2! + x³/3! + … for
 * |x| < SERIES_THRESHOLD, else e^x − 1 in working precision.
 * Source: Taylor series of the exponential (common practice, as in C's expm1).
 */
function expm1(x: Decimal): Decimal {
  if (x.abs().gte(SERIES_THRESHOLD)) return x.exp().minus(1);
  let term = x;
  let sum = x;
  for (let k = 2; k <= SERIES_MAX_TERMS; k++) {
    term = term.times(x).div(k);
    sum = sum.plus(term);
    if (term.abs().lte(sum.abs().times(SERIES_TOLERANCE))) break;
  }
  return sum;
}

/**
 * Capital recovery factor CRF(i, n) = i(1+i)ⁿ/((1+i)ⁿ − 1) [1/yr]: the level annual payment
 * that repays 1 unit of capital over n years at rate i. Limit i → 0: 1/n.
 * i: fraction per year (> −1); n: years (> 0, need not be whole).
 * Evaluated as CRF = i / (1 − (1+i)^−n) = −i / expm1(−n·ln(1+i)), with ln(1+i) and e^x − 1
 * summed as series for small arguments (log1p, expm1 above), so that neither a tiny rate
 * (1 + i rounding to 1) nor a tiny i·n ((1+i)ⁿ rounding to 1) divides by zero: the result
 * tends smoothly to the limit 1/n (e.g. i = 1e-302 → 1/n to working precision).
 * Throws InputError ('discountRate' > −1, 'lifeYears' > 0, both finite), and on
 * 'discountRate' when the factor leaves the decimal range (a negative rate close to −1 over a
 * very long life makes (1+i)^−n overflow).
 * Source: standard engineering-economics capital recovery factor (e.g. the (A/P, i, n) factor
 * of engineering-economy texts). i = 8 %, n = 10 → 0.149 029 488…
 */
export function capitalRecoveryFactor(rate: number, years: number): Decimal {
  checkRateAndYears(rate, years);
  const n = new MoneyDecimal(years);
  if (rate === 0) return new MoneyDecimal(1).div(n);
  const i = new MoneyDecimal(rate);
  const denominator = expm1(n.times(log1p(i)).neg()).neg(); // 1 − (1+i)^−n, same sign as i
  const crf = i.div(denominator);
  if (!crf.isFinite() || crf.isZero() || crf.isNegative()) {
    throw new InputError(
      'discountRate',
      `a rate of ${rate} per year over ${years} years gives a capital recovery factor outside the range of the arithmetic; check the rate (a fraction per year, e.g. 0.08 for 8 %) and the life (years)`,
    );
  }
  return crf;
}

/**
 * Annuity (present-worth) factor (P/A, i, n) = ((1+i)ⁿ − 1)/(i(1+i)ⁿ) = 1/CRF [yr]:
 * present value of 1 unit paid at the end of each year for n years. Limit i → 0: n.
 * Source: standard engineering-economics uniform-series present-worth factor.
 */
export function annuityFactor(rate: number, years: number): Decimal {
  return new MoneyDecimal(1).div(capitalRecoveryFactor(rate, years));
}

/**
 * Present value of end-of-year amounts: PV = Σ_{t=1..N} c_t/(1+i)^t, in Decimal.
 * cashflows[0] is paid at the end of year 1. Source: standard discounting (common practice).
 */
export function presentValue(cashflows: readonly MoneyValue[], rate: number): Decimal {
  checkRateAndYears(rate, Math.max(cashflows.length, 1));
  const growth = new MoneyDecimal(rate).plus(1);
  let discount = new MoneyDecimal(1);
  let sum = new MoneyDecimal(0);
  cashflows.forEach((c, k) => {
    discount = discount.div(growth);
    sum = sum.plus(money(c, `cashflows.${k}`).times(discount));
  });
  return sum;
}
