import { describe, expect, it } from 'vitest';
import { expectClose } from '../helpers/close.js';
import { annuityFactor, capitalRecoveryFactor, money, presentValue, roundMoney } from '../../server/core/plant/money.js';
import { InputError } from '../../server/core/errors.js';

describe('capital recovery factor, CRF = i(1+i)ⁿ/((1+i)ⁿ − 1) (standard engineering economics, (A/P, i, n))', () => {
  it('i = 8 %, n = 10 → 0.149 029 488 697 075…', () => {
    /*
     * By hand: 1.08^10 = 2.158 924 997 (1.08² = 1.1664, ^4 = 1.360 488 96, ^8 = 1.850 930 2,
     * ×1.1664 = 2.158 924 997); CRF = 0.08 × 2.158 924 997 / 1.158 924 997 = 0.149 029 49.
     * Independent computation to 50 digits (Python decimal): 0.14902948869707542747663194514253…
     * Interest tables print (A/P, 8 %, 10) = 0.14903.
     */
    const crf = capitalRecoveryFactor(0.08, 10);
    expect(crf.toSignificantDigits(20).toString()).toBe('0.14902948869707542748');
  });

  it('i = 8 %, n = 15 → 0.116 829 544 936 020… (Python decimal, 50 digits)', () => {
    expect(capitalRecoveryFactor(0.08, 15).toSignificantDigits(18).toString()).toBe('0.116829544936020044');
  });

  it('i → 0 limit is 1/n, and a tiny rate is continuous with it', () => {
    expect(capitalRecoveryFactor(0, 8).toString()).toBe('0.125');
    expectClose(capitalRecoveryFactor(1e-12, 8).toNumber(), 0.125, { rtol: 1e-11 });
  });

  it('annuity factor is 1/CRF: (P/A, 8 %, 10) = 6.710 081 4 (interest tables; Python decimal 6.71008139894144…)', () => {
    expect(annuityFactor(0.08, 10).toSignificantDigits(15).toString()).toBe('6.71008139894144');
    expect(annuityFactor(0.08, 10).times(capitalRecoveryFactor(0.08, 10)).toSignificantDigits(30).toString()).toBe('1');
  });

  it('rejects rates ≤ −1 and non-positive lives', () => {
    expect(() => capitalRecoveryFactor(-1, 10)).toThrow(InputError);
    expect(() => capitalRecoveryFactor(0.05, 0)).toThrow(InputError);
    expect(() => capitalRecoveryFactor(NaN, 5)).toThrow(InputError);
  });
});

describe('present value', () => {
  it('100 at the end of years 1–3 at 10 %: 90.909… + 82.645… + 75.131… = 248.685 199 098 422… (hand)', () => {
    // 100/1.1 = 90.909 090 909…, 100/1.21 = 82.644 628 099…, 100/1.331 = 75.131 480 090…
    expect(presentValue([100, 100, 100], 0.1).toSignificantDigits(15).toString()).toBe('248.685199098422');
  });

  it('equal payments equal payment × annuity factor', () => {
    const pv = presentValue(Array(10).fill(120000), 0.08);
    expect(pv.minus(annuityFactor(0.08, 10).times(120000)).abs().lt('1e-25')).toBe(true);
  });
});

describe('roundMoney (decimal.js; half-up by default, half-even on request)', () => {
  it('0.1 + 0.2 rounds to "0.30"; in decimal 0.1 + 0.2 is exactly 0.3', () => {
    expect(roundMoney(0.1 + 0.2, 2)).toBe('0.30');
    expect(money(0.1).plus(0.2).toString()).toBe('0.3');
    expect(money(0.1).plus(0.2).eq(0.3)).toBe(true);
  });

  it('ten additions of 0.1 are exactly 1 in decimal (in binary floating point they are 0.9999999999999999)', () => {
    let d = money(0);
    let f = 0;
    for (let k = 0; k < 10; k++) {
      d = d.plus(0.1);
      f += 0.1;
    }
    expect(d.toString()).toBe('1');
    expect(f === 1).toBe(false);
  });

  it('ties: half-up rounds 0.125 → 0.13 and 0.135 → 0.14; half-even 0.125 → 0.12 and 0.135 → 0.14', () => {
    expect(roundMoney(0.125, 2, 'half-up')).toBe('0.13');
    expect(roundMoney(0.125, 2, 'half-even')).toBe('0.12');
    expect(roundMoney(0.135, 2, 'half-up')).toBe('0.14');
    expect(roundMoney(0.135, 2, 'half-even')).toBe('0.14');
    expect(roundMoney(-0.125, 2, 'half-up')).toBe('-0.13'); // half away from zero
  });

  it('takes a number as its shortest decimal form: 2.675 → "2.68" (Number#toFixed gives "2.67")', () => {
    expect((2.675).toFixed(2)).toBe('2.67'); // binary 2.67499999… — the artefact we avoid
    expect(roundMoney(2.675, 2)).toBe('2.68');
  });

  it('large sums keep every cent; negative zero prints as 0.00', () => {
    expect(roundMoney('123456789012.345', 2)).toBe('123456789012.35');
    expect(roundMoney(-0.001, 2)).toBe('0.00');
    expect(roundMoney(1234.5, 0, 'half-even')).toBe('1234');
  });

  it('rejects NaN and Infinity', () => {
    expect(() => roundMoney(NaN)).toThrow(InputError);
    expect(() => money(Infinity)).toThrow(InputError);
  });
});
