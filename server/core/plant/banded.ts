/**
 * Symmetric positive-definite banded matrices: storage, assembly and Cholesky solve.
 *
 * Storage: row i keeps A[i][i−d] for d = 0..b (b = half-bandwidth) at data[i·(b+1) + d];
 * entries outside the band are zero. Cholesky A = L·Lᵀ overwrites a copy of the band in the
 * same layout. Cost O(n·b²) to factor and O(n·b) per solve; no pivoting is needed for a
 * symmetric positive-definite matrix (a grounded conductance matrix of a connected network is
 * one). Source: Golub & Van Loan, Matrix Computations, 4th ed. (2013), §4.3 (band Cholesky);
 * this code is our own.
 */

export class SymmetricBandMatrix {
  readonly data: Float64Array;
  constructor(
    readonly size: number,
    readonly halfBandwidth: number,
  ) {
    this.data = new Float64Array(size * (halfBandwidth + 1));
  }

  private index(i: number, j: number): number {
    // Caller guarantees |i − j| ≤ b; store the lower triangle.
    return i >= j ? i * (this.halfBandwidth + 1) + (i - j) : j * (this.halfBandwidth + 1) + (j - i);
  }

  get(i: number, j: number): number {
    if (Math.abs(i - j) > this.halfBandwidth) return 0;
    return this.data[this.index(i, j)];
  }

  /** A[i][j] += v (and A[j][i], the same storage). Throws when outside the band. */
  add(i: number, j: number, v: number): void {
    if (Math.abs(i - j) > this.halfBandwidth) throw new RangeError(`entry (${i}, ${j}) outside half-bandwidth ${this.halfBandwidth}`);
    this.data[this.index(i, j)] += v;
  }

  /** y = A·x. */
  multiply(x: ArrayLike<number>, y: Float64Array = new Float64Array(this.size)): Float64Array {
    const b = this.halfBandwidth;
    const w = b + 1;
    y.fill(0);
    for (let i = 0; i < this.size; i++) {
      const row = i * w;
      y[i] += this.data[row] * x[i];
      const jStart = Math.max(0, i - b);
      for (let j = jStart; j < i; j++) {
        const a = this.data[row + (i - j)];
        y[i] += a * x[j];
        y[j] += a * x[i];
      }
    }
    return y;
  }
}

export interface BandCholesky {
  readonly size: number;
  readonly halfBandwidth: number;
  /** L in band storage. */
  readonly factor: Float64Array;
}

/**
 * Cholesky factor of a symmetric positive-definite band matrix. Returns null when a pivot is
 * not positive (the matrix is not positive definite, e.g. a floating network).
 */
export function bandCholesky(a: SymmetricBandMatrix): BandCholesky | null {
  const n = a.size;
  const b = a.halfBandwidth;
  const w = b + 1;
  const L = new Float64Array(a.data);
  for (let i = 0; i < n; i++) {
    const rowI = i * w;
    const jStart = Math.max(0, i - b);
    for (let j = jStart; j <= i; j++) {
      const rowJ = j * w;
      let s = L[rowI + (i - j)];
      const kStart = Math.max(jStart, j - b);
      for (let k = kStart; k < j; k++) s -= L[rowI + (i - k)] * L[rowJ + (j - k)];
      if (j === i) {
        if (!(s > 0)) return null;
        L[rowI] = Math.sqrt(s);
      } else {
        L[rowI + (i - j)] = s / L[rowJ];
      }
    }
  }
  return { size: n, halfBandwidth: b, factor: L };
}

/** Solve L·Lᵀ·x = rhs in place of a copy; returns x. */
export function bandCholeskySolve(chol: BandCholesky, rhs: ArrayLike<number>): Float64Array {
  const n = chol.size;
  const b = chol.halfBandwidth;
  const w = b + 1;
  const L = chol.factor;
  const x = Float64Array.from(rhs);
  // Forward: L·y = rhs.
  for (let i = 0; i < n; i++) {
    const row = i * w;
    let s = x[i];
    for (let k = Math.max(0, i - b); k < i; k++) s -= L[row + (i - k)] * x[k];
    x[i] = s / L[row];
  }
  // Backward: Lᵀ·x = y.
  for (let i = n - 1; i >= 0; i--) {
    let s = x[i];
    const kEnd = Math.min(n - 1, i + b);
    for (let k = i + 1; k <= kEnd; k++) s -= L[k * w + (k - i)] * x[k];
    x[i] = s / L[i * w];
  }
  return x;
}
