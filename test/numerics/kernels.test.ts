/**
 * Kernels: double-double error-free transformations and the pivoted Householder QR.
 * Expected values are exact binary numbers worked by hand, or identities (A·P = Q·R,
 * QᵀQ = I).
 */
import { describe, expect, it } from 'vitest';
import { dotDD, sumSquaresDD, twoProduct, twoSum } from '../../server/core/numerics/double-double.js';
import { applyQ, applyQt, pivotedQR } from '../../server/core/numerics/qr.js';
import { expectClose } from '../helpers/close.js';

const EXACT = { rtol: 0, atol: 0 };

describe('double-double arithmetic', () => {
  it('TwoSum keeps the rounding error exactly', () => {
    const out = twoSum(1, 2 ** -60, { hi: 0, lo: 0 });
    expectClose(out.hi, 1, EXACT, 'hi');
    expectClose(out.lo, 2 ** -60, EXACT, 'lo');
  });
  it('TwoProduct (Dekker) keeps the rounding error exactly', () => {
    // (1 + 2⁻³⁰)(1 − 2⁻³⁰) = 1 − 2⁻⁶⁰, which rounds to 1 in float64; the error is −2⁻⁶⁰.
    const out = twoProduct(1 + 2 ** -30, 1 - 2 ** -30, { hi: 0, lo: 0 });
    expectClose(out.hi, 1, EXACT, 'hi');
    expectClose(out.lo, -(2 ** -60), EXACT, 'lo');
  });
  it('compensated dot product survives cancellation that float64 loses', () => {
    // 1e16 + 1 − 1e16 = 1 exactly; naive float64 summation gives 0.
    expectClose(dotDD([1e16, 1, -1e16], [1, 1, 1]), 1, EXACT, 'dot');
    expectClose(sumSquaresDD([1e8, 1]), 1e16 + 1, EXACT, 'sum of squares');
  });
});

describe('pivoted Householder QR', () => {
  const m = 5;
  const n = 3;
  // Column-major test matrix (invented values).
  const A = Float64Array.from([1, 2, 3, 4, 5, 0.5, -1, 2, 0, 1, 10, 0, -3, 2, 7]);

  it('reconstructs A·P = Q·R (identity)', () => {
    const qr = pivotedQR(Float64Array.from(A), m, n, { rankTolerance: 0 });
    expect(qr.rank).toBe(3);
    for (let k = 0; k < n; k++) {
      // Column k of R, expanded to length m, then multiplied by Q.
      const col = new Float64Array(m);
      for (let i = 0; i < k; i++) col[i] = qr.a[i + k * m];
      col[k] = qr.rdiag[k];
      applyQ(qr, col);
      const orig = qr.perm[k];
      for (let i = 0; i < m; i++) expectClose(col[i], A[i + orig * m], { rtol: 1e-13, atol: 1e-13 }, `(${i},${k})`);
    }
    // Pivoting puts the largest column first: column 2 has norm √162 (hand).
    expect(qr.perm[0]).toBe(2);
    expectClose(Math.abs(qr.rdiag[0]), Math.sqrt(162), { rtol: 1e-15 }, '|R00|');
  });

  it('Qᵀ then Q returns the vector (orthogonality identity)', () => {
    const qr = pivotedQR(Float64Array.from(A), m, n, { rankTolerance: 0 });
    const v = Float64Array.from([0.3, -1, 2, 5, 0.1]);
    const w = Float64Array.from(v);
    applyQt(qr, w);
    applyQ(qr, w);
    v.forEach((x, i) => expectClose(w[i], x, { rtol: 1e-14, atol: 1e-15 }, `v${i}`));
  });

  it('reveals the rank of a matrix with a dependent column', () => {
    const B = new Float64Array(m * n);
    for (let i = 0; i < m; i++) {
      B[i] = 1;
      B[i + m] = i;
      B[i + 2 * m] = 3 - 2 * i; // = 3·col0 − 2·col1
    }
    const qr = pivotedQR(B, m, n, { rankTolerance: 1e-12 });
    expect(qr.rank).toBe(2);
  });
});
