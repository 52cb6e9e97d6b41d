/**
 * Double-double ("compensated") arithmetic for accurate residuals and dot products.
 *
 * Method: a value is held as an unevaluated sum hi + lo of two float64 numbers with
 * |lo| ≤ ulp(hi)/2, which gives about 106 bits (≈ 32 decimal digits) of significand.
 * The building blocks are error-free transformations:
 * - TwoSum (Knuth): s = fl(a + b) and e with a + b = s + e exactly.
 * - TwoProduct (Dekker): p = fl(a·b) and e with a·b = p + e exactly, using Veltkamp's
 *   split of each factor into two 26-bit halves (splitter 2^27 + 1).
 * Units: n/a (pure arithmetic). Validity: finite inputs with |a|,|b| < 2^996 (the split
 * overflows above that) and products not in the subnormal range (the low part of a
 * product is then inexact, so the result degrades gracefully to float64 accuracy).
 * Sources: D. E. Knuth, The Art of Computer Programming vol. 2, §4.2.2 (TwoSum);
 * T. J. Dekker, "A floating-point technique for extending the available precision",
 * Numer. Math. 18 (1971) 224–242 (split and TwoProduct); T. Ogita, S. M. Rump,
 * S. Oishi, "Accurate sum and dot product", SIAM J. Sci. Comput. 26 (2005) 1955–1988
 * (compensated dot product built from these pieces).
 */

/** Veltkamp splitter 2^27 + 1 for IEEE-754 binary64 (53-bit significand). Dekker (1971). */
const SPLITTER = 134217729;

/** A double-double accumulator (hi + lo). Mutable so inner loops do not allocate. */
export interface DoubleDouble {
  hi: number;
  lo: number;
}

/** A fresh accumulator holding zero. */
export function ddZero(): DoubleDouble {
  return { hi: 0, lo: 0 };
}

/**
 * TwoSum: returns s = fl(a + b) and writes the exact rounding error into out.lo,
 * so that a + b = out.hi + out.lo exactly. Knuth, TAOCP vol. 2, §4.2.2, Theorem B.
 */
export function twoSum(a: number, b: number, out: DoubleDouble): DoubleDouble {
  const s = a + b;
  const bb = s - a;
  const e = a - (s - bb) + (b - bb);
  out.hi = s;
  out.lo = e;
  return out;
}

/**
 * TwoProduct: p = fl(a·b) and the exact error e with a·b = p + e (Dekker 1971).
 * Written without fused multiply-add, which JavaScript does not expose.
 */
export function twoProduct(a: number, b: number, out: DoubleDouble): DoubleDouble {
  const p = a * b;
  let t = SPLITTER * a;
  const ahi = t - (t - a);
  const alo = a - ahi;
  t = SPLITTER * b;
  const bhi = t - (t - b);
  const blo = b - bhi;
  const e = alo * blo - (p - ahi * bhi - alo * bhi - ahi * blo);
  out.hi = p;
  out.lo = e;
  return out;
}

/** Scratch for the exact product in ddAddProduct (single-threaded JS: no sharing hazard). */
const PRODUCT: DoubleDouble = { hi: 0, lo: 0 };

/**
 * acc ← acc + (x + xlo), where x + xlo is a double-double with |xlo| ≤ ulp(x)/2: TwoSum of
 * the high parts, low parts accumulated, then renormalised with FastTwoSum (|s| ≥ |lo| holds
 * under the usual double-double assumptions; Hida, Li & Bailey 2001).
 */
function ddAddPair(acc: DoubleDouble, x: number, xlo: number): void {
  const s = acc.hi + x;
  const bb = s - acc.hi;
  const se = acc.hi - (s - bb) + (x - bb);
  const lo = acc.lo + xlo + se;
  const hi = s + lo;
  acc.lo = lo - (hi - s);
  acc.hi = hi;
}

/**
 * acc ← acc + a·b in double-double arithmetic (compensated multiply-add).
 * The product is formed exactly with TwoProduct, then added with TwoSum; the low parts
 * are accumulated and renormalised (Ogita–Rump–Oishi "Dot2" accuracy).
 */
export function ddAddProduct(acc: DoubleDouble, a: number, b: number): void {
  twoProduct(a, b, PRODUCT);
  ddAddPair(acc, PRODUCT.hi, PRODUCT.lo);
}

/** acc ← acc + a in double-double arithmetic. */
export function ddAdd(acc: DoubleDouble, a: number): void {
  ddAddPair(acc, a, 0);
}

/** The double-double value rounded to the nearest float64. */
export function ddToNumber(acc: DoubleDouble): number {
  return acc.hi + acc.lo;
}

/**
 * Compensated dot product Σ a_i·b_i with double-double accumulation, rounded to float64.
 * The result is as accurate as if computed in twice the working precision and then
 * rounded (Ogita, Rump & Oishi 2005, Dot2).
 */
export function dotDD(a: ArrayLike<number>, b: ArrayLike<number>, n = a.length): number {
  const acc = ddZero();
  for (let i = 0; i < n; i++) ddAddProduct(acc, a[i], b[i]);
  return ddToNumber(acc);
}

/** Compensated sum of squares Σ a_i² (double-double accumulation), rounded to float64. */
export function sumSquaresDD(a: ArrayLike<number>, n = a.length): number {
  const acc = ddZero();
  for (let i = 0; i < n; i++) ddAddProduct(acc, a[i], a[i]);
  return ddToNumber(acc);
}
