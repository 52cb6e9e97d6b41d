/**
 * The double-double exponential of test/fixtures/dd-exp.ts against an independent
 * computation: decimal.js 10.6 (Decimal.exp / Decimal.ln) at 40 significant digits.
 * Requirement: relative agreement ≤ 1e-30 (double-double carries ~32 digits) wherever the
 * result and its low part are normal float64 numbers; below that (t ≲ −630) the low part is
 * subnormal and the bound is absolute, 2^−1073 (two smallest subnormals).
 */
import { Decimal } from 'decimal.js';
import { describe, expect, it } from 'vitest';
import { ddExp, LN2_PARTS } from '../fixtures/dd-exp.js';
import { expectClose } from '../helpers/close.js';

/** Reference arithmetic: 40 significant digits (independent of float64). */
const Dec40 = Decimal.clone({ precision: 40 });
/** Required relative agreement (≈ 2^−100: a few units of the double-double rounding). */
const REL_TOL = 1e-30;
/** Absolute floor where the low part is subnormal: 2 × Number.MIN_VALUE = 2^−1073. */
const SUBNORMAL_FLOOR = 2 * Number.MIN_VALUE;

/** A float64 as a 40-digit decimal (toPrecision reads the exact binary value). */
const dec = (v: number) => new Dec40(v.toPrecision(40));

/** |ddExp(t) − e^t| compared with REL_TOL·e^t + SUBNORMAL_FLOOR, as a ratio (≤ 1 passes). */
function check(tHi: number, tLo = 0): { ratio: number; text: string } {
  const r = ddExp(tHi, tLo);
  const ref = dec(tHi).plus(dec(tLo)).exp();
  const got = dec(r.hi).plus(dec(r.lo));
  const err = got.minus(ref).abs();
  const allowed = ref.times(REL_TOL).plus(SUBNORMAL_FLOOR);
  const ratio = err.div(allowed).toNumber();
  return { ratio, text: `t = ${tHi} + ${tLo}: got ${r.hi} + ${r.lo}, e^t = ${ref.toString()}, |Δ| = ${err.toExponential(3)}` };
}

const FIXED = [
  0, 5e-324, 1e-300, 1e-20, 2 ** -30, 1e-10, 1e-5, 0.1, 0.25, 0.5, 1, 1.5, 2, Math.LN2 / 2, Math.LN2, 3 * Math.LN2, 10, 25.5, 100,
  300, 600, 700, 709, 709.78,
];

describe('ddExp against decimal.js at 40 digits', () => {
  it.each(FIXED.flatMap((t) => [t, -t]))('t = %s', (t) => {
    const { ratio, text } = check(t);
    expect(ratio, text).toBeLessThanOrEqual(1);
  });

  it('deep negative arguments (subnormal low part): −708, −720, −740, −745', () => {
    for (const t of [-708, -720, -740, -745]) {
      const { ratio, text } = check(t);
      expect(ratio, text).toBeLessThanOrEqual(1);
    }
  });

  it('arguments straddling the k·ln2 reduction boundaries (round(t/ln2) flips)', () => {
    for (const k of [-1000, -37, -3, -1, 0, 1, 2, 5, 64, 1000]) {
      const mid = (k + 0.5) * Math.LN2;
      for (const t of [mid, mid * (1 - 2 ** -52), mid * (1 + 2 ** -52)]) {
        const { ratio, text } = check(t);
        expect(ratio, text).toBeLessThanOrEqual(1);
      }
    }
  });

  it('400 double-double arguments spread over [−700, 700], with low parts', () => {
    // Deterministic spread (no RNG needed): t_j = 700·sin(1.2345·j), lo = 1e-17·t_j·cos(j).
    let worst = { ratio: 0, text: '' };
    for (let j = 1; j <= 400; j++) {
      const hi = 700 * Math.sin(1.2345 * j);
      const lo = 1e-17 * hi * Math.cos(j);
      const c = check(hi, lo);
      if (c.ratio > worst.ratio) worst = c;
    }
    expect(worst.ratio, worst.text).toBeLessThanOrEqual(1);
  });

  it('Lanczos-type arguments t = −b·x, x = 0…1.15 (NIST StRD Lanczos1 rates 1, 3, 5)', () => {
    for (const b of [1.0000000001, 3.0000000002, 5.0000000001]) {
      for (let i = 0; i < 24; i++) {
        const { ratio, text } = check(-b * (i * 0.05));
        expect(ratio, text).toBeLessThanOrEqual(1);
      }
    }
  });
});

describe('ddExp structure and range', () => {
  it('returns a normalised pair whose high part is within 1 ulp of Math.exp', () => {
    for (const t of [-700, -3.7, -1e-8, 0.3, 2.5, 42, 700]) {
      const r = ddExp(t);
      expect(r.hi + r.lo === r.hi, `t = ${t}: hi ${r.hi}, lo ${r.lo}`).toBe(true);
      // Math.exp is not correctly rounded, so allow 1 ulp either way (ulp ≤ 2^−52 relative).
      expectClose(r.hi, Math.exp(t), { rtol: 2 ** -52 }, `t = ${t}`);
    }
  });

  it('e^a·e^(−a) = 1 to double-double accuracy (identity; a ≤ 600 so e^−a keeps a normal low part)', () => {
    for (const a of [1e-9, 0.7, 13.25, 333.3, 600]) {
      const p = ddExp(a);
      const q = ddExp(-a);
      const prod = dec(p.hi).plus(dec(p.lo)).times(dec(q.hi).plus(dec(q.lo)));
      const err = prod.minus(1).abs().toNumber();
      expect(err, `a = ${a}: e^a·e^−a − 1 = ${err}`).toBeLessThanOrEqual(2 * REL_TOL);
    }
  });

  it('mirrors Math.exp outside the float64 range and on NaN', () => {
    expect(ddExp(710).hi).toBe(Infinity);
    expect(ddExp(-746).hi).toBe(0);
    expect(ddExp(-746).lo).toBe(0);
    expect(Number.isNaN(ddExp(NaN).hi)).toBe(true);
  });

  it('LN2_PARTS sum to ln 2 within 1e-49 (decimal.js ln(2) at 60 digits)', () => {
    const D60 = Decimal.clone({ precision: 60 });
    const sum = LN2_PARTS.reduce((acc, v) => acc.plus(new D60(v.toPrecision(60))), new D60(0));
    const err = sum.minus(D60.ln(2)).abs().toNumber();
    expect(err).toBeLessThan(1e-49);
  });
});
