/**
 * Statistics helpers: Student-t quantiles against a published table, confidence
 * intervals, correlation matrices.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../server/core/errors.js';
import { confidenceInterval95, correlationMatrix, studentTQuantile } from '../../server/core/numerics/index.js';
import { expectClose } from '../helpers/close.js';

describe('studentTQuantile', () => {
  it('matches the tabulated upper 2.5 % critical values', () => {
    // NIST/SEMATECH e-Handbook of Statistical Methods §1.3.6.7.2 (critical values of t),
    // α = 0.025 column, printed to 3 decimals → rtol 5e-4.
    expectClose(studentTQuantile(0.975, 1), 12.706, { rtol: 5e-4 }, 'ν = 1');
    expectClose(studentTQuantile(0.975, 2), 4.303, { rtol: 5e-4 }, 'ν = 2');
    expectClose(studentTQuantile(0.975, 10), 2.228, { rtol: 5e-4 }, 'ν = 10');
    expectClose(studentTQuantile(0.975, 100), 1.984, { rtol: 5e-4 }, 'ν = 100');
  });
  it('is antisymmetric about p = 0.5 (identity)', () => {
    expectClose(studentTQuantile(0.025, 7), -studentTQuantile(0.975, 7), { rtol: 1e-12 }, 'symmetry');
  });
  it('throws InputError outside its domain', () => {
    expect(() => studentTQuantile(0, 5)).toThrow(InputError);
    expect(() => studentTQuantile(1, 5)).toThrow(InputError);
    expect(() => studentTQuantile(0.5, 0)).toThrow(InputError);
    expect(() => studentTQuantile(Number.NaN, 5)).toThrow(InputError);
  });
});

describe('confidenceInterval95', () => {
  it('is value ± t(0.975, ν)·SE', () => {
    // t(0.975, 10) = 2.228 (e-Handbook table above): 10 ± 2·2.228.
    const [lo, hi] = confidenceInterval95(10, 2, 10);
    expectClose(lo, 10 - 4.456, { rtol: 1e-4 }, 'lower');
    expectClose(hi, 10 + 4.456, { rtol: 1e-4 }, 'upper');
  });
  it('rejects a negative SE or no degrees of freedom', () => {
    expect(() => confidenceInterval95(1, -1, 5)).toThrow(InputError);
    expect(() => confidenceInterval95(1, 1, 0)).toThrow(InputError);
  });
});

describe('correlationMatrix', () => {
  it('divides by the standard deviations', () => {
    // C = [[4, 2], [2, 9]] → ρ = 2/(2·3) = 1/3 (hand calculation).
    const r = correlationMatrix([
      [4, 2],
      [2, 9],
    ]);
    expectClose(r[0][1], 1 / 3, { rtol: 1e-15 }, 'ρ01');
    expectClose(r[1][0], 1 / 3, { rtol: 1e-15 }, 'ρ10');
    expectClose(r[0][0], 1, { atol: 0 }, 'ρ00');
  });
  it('gives 0 off-diagonal for a zero-variance parameter (never NaN)', () => {
    const r = correlationMatrix([
      [0, 0],
      [0, 1],
    ]);
    expect(r.flat().every(Number.isFinite)).toBe(true);
    expectClose(r[0][1], 0, { atol: 0 }, 'ρ01');
  });
  it('rejects a non-square or non-finite matrix', () => {
    expect(() => correlationMatrix([[1, 0]])).toThrow(InputError);
    expect(() => correlationMatrix([[Number.NaN]])).toThrow(InputError);
  });
});
