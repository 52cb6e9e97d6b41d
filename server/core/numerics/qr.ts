/**
 * Householder QR factorisation with column pivoting, A·P = Q·R, and the triangular
 * solves built on it.
 *
 * Method: Businger–Golub column pivoting (at each step the remaining column of largest
 * 2-norm is brought forward, so |R_kk| is non-increasing and its decay reveals the
 * numerical rank). Householder reflections use the LINPACK/MINPACK storage convention:
 * the k-th reflector H_k = I − v·vᵀ/v_k with v normalised so that v_k = 1 + |a_kk|/‖a_k‖,
 * kept below and on the diagonal, R's diagonal kept separately in `rdiag`. Remaining
 * column norms are recomputed at each step (no down-dating), which costs the same order
 * as the factorisation itself (m·n²) and avoids the cancellation that down-dating suffers.
 * Units: n/a. Validity: any finite m×n matrix with m ≥ 1, n ≥ 1 (m < n allowed; the rank
 * is then at most m).
 * Sources: G. H. Golub and C. F. Van Loan, Matrix Computations, 4th ed., §5.2 and §5.4.1
 * (Householder QR, QR with column pivoting); P. Businger and G. H. Golub, "Linear least
 * squares solutions by Householder transformations", Numer. Math. 7 (1965) 269–276;
 * J. J. Moré, B. S. Garbow, K. E. Hillstrom, User Guide for MINPACK-1, ANL-80-74 (1980)
 * (storage convention of qrfac).
 *
 * Storage: matrices are column-major Float64Array, element (i, j) at index i + j·m.
 */

export interface PivotedQR {
  /** Number of rows m. */
  readonly rows: number;
  /** Number of columns n. */
  readonly cols: number;
  /** Factored matrix (column-major): R strictly above the diagonal, reflectors below/on it. */
  readonly a: Float64Array;
  /** Diagonal of R (signed), length n; entries beyond `rank` are 0. */
  readonly rdiag: Float64Array;
  /** Pivoted column k is original column perm[k]. */
  readonly perm: Int32Array;
  /** Numerical rank: the number of reflectors applied (|R_kk| > tolerance·|R_00|). */
  readonly rank: number;
}

export interface QROptions {
  /**
   * Relative rank tolerance τ: factorisation stops at step k when the largest remaining
   * column norm is ≤ τ·|R_00|. τ = 0 stops only at exact zero columns.
   */
  rankTolerance: number;
}

/**
 * Euclidean norm of a[offset .. offset+len−1], scaled to avoid overflow and underflow
 * (two passes: largest magnitude, then the sum of squares of the ratios).
 */
export function scaledNorm(a: Float64Array, offset: number, len: number): number {
  let big = 0;
  for (let i = offset; i < offset + len; i++) {
    const v = Math.abs(a[i]);
    if (v > big) big = v;
  }
  if (big === 0 || !Number.isFinite(big)) return big;
  let s = 0;
  for (let i = offset; i < offset + len; i++) {
    const v = a[i] / big;
    s += v * v;
  }
  return big * Math.sqrt(s);
}

/**
 * Factor A·P = Q·R in place. `a` (m×n, column-major) is overwritten with the factors.
 * Returns the factorisation record; the caller must not modify `a` afterwards.
 */
export function pivotedQR(a: Float64Array, m: number, n: number, options: QROptions): PivotedQR {
  const perm = new Int32Array(n);
  for (let j = 0; j < n; j++) perm[j] = j;
  const rdiag = new Float64Array(n);
  const colnorm = new Float64Array(n);
  const steps = Math.min(m, n);
  let rank = 0;
  let r00 = 0;
  for (let k = 0; k < steps; k++) {
    // Norms of the remaining parts of the columns k..n-1 (rows k..m-1).
    let best = k;
    let bestNorm = -1;
    for (let j = k; j < n; j++) {
      const nj = scaledNorm(a, k + j * m, m - k);
      colnorm[j] = nj;
      if (nj > bestNorm) {
        bestNorm = nj;
        best = j;
      }
    }
    if (bestNorm === 0 || (k > 0 && bestNorm <= options.rankTolerance * r00)) break;
    if (best !== k) {
      // Swap columns k and best (whole columns: R part above and the rest below).
      const ok = k * m;
      const ob = best * m;
      for (let i = 0; i < m; i++) {
        const t = a[ok + i];
        a[ok + i] = a[ob + i];
        a[ob + i] = t;
      }
      const tp = perm[k];
      perm[k] = perm[best];
      perm[best] = tp;
    }
    const ck = k * m;
    let ajnorm = bestNorm;
    if (a[ck + k] < 0) ajnorm = -ajnorm;
    for (let i = k; i < m; i++) a[ck + i] /= ajnorm;
    a[ck + k] += 1;
    // Apply H_k to the remaining columns.
    const vkk = a[ck + k];
    for (let j = k + 1; j < n; j++) {
      const cj = j * m;
      let s = 0;
      for (let i = k; i < m; i++) s += a[ck + i] * a[cj + i];
      const t = s / vkk;
      for (let i = k; i < m; i++) a[cj + i] -= t * a[ck + i];
    }
    rdiag[k] = -ajnorm;
    if (k === 0) r00 = Math.abs(ajnorm);
    rank = k + 1;
  }
  return { rows: m, cols: n, a, rdiag, perm, rank };
}

/** b ← Qᵀ·b (length m), in place. Uses the `rank` reflectors H_0 … H_{rank−1}. */
export function applyQt(qr: PivotedQR, b: Float64Array): void {
  const { a, rows: m, rank } = qr;
  for (let k = 0; k < rank; k++) {
    const ck = k * m;
    const vkk = a[ck + k];
    let s = 0;
    for (let i = k; i < m; i++) s += a[ck + i] * b[i];
    const t = s / vkk;
    for (let i = k; i < m; i++) b[i] -= t * a[ck + i];
  }
}

/** b ← Q·b (length m), in place: the reflectors applied in reverse order. */
export function applyQ(qr: PivotedQR, b: Float64Array): void {
  const { a, rows: m, rank } = qr;
  for (let k = rank - 1; k >= 0; k--) {
    const ck = k * m;
    const vkk = a[ck + k];
    let s = 0;
    for (let i = k; i < m; i++) s += a[ck + i] * b[i];
    const t = s / vkk;
    for (let i = k; i < m; i++) b[i] -= t * a[ck + i];
  }
}

/** Solve R₁₁·z = b for the leading rank×rank block, in place in b[0 .. rank−1] (back substitution). */
export function solveR(qr: PivotedQR, b: Float64Array): void {
  const { a, rows: m, rdiag, rank } = qr;
  for (let k = rank - 1; k >= 0; k--) {
    let s = b[k];
    for (let j = k + 1; j < rank; j++) s -= a[k + j * m] * b[j];
    b[k] = s / rdiag[k];
  }
}

/** Solve R₁₁ᵀ·h = b for the leading block, in place in b[0 .. rank−1] (forward substitution). */
export function solveRt(qr: PivotedQR, b: Float64Array): void {
  const { a, rows: m, rdiag, rank } = qr;
  for (let k = 0; k < rank; k++) {
    let s = b[k];
    const ck = k * m;
    for (let i = 0; i < k; i++) s -= a[i + ck] * b[i];
    b[k] = s / rdiag[k];
  }
}

/**
 * (R₁₁ᵀR₁₁)⁻¹ = R₁₁⁻¹R₁₁⁻ᵀ for the leading rank×rank block, as a dense row-major
 * rank×rank Float64Array, in pivoted order. R⁻¹ is formed by back substitution on the
 * identity (Golub & Van Loan §3.1), then multiplied by its transpose; (AᵀA) is never formed.
 */
export function inverseGram(qr: PivotedQR): Float64Array {
  const { a, rows: m, rdiag, rank: r } = qr;
  // Rinv upper triangular, row-major r×r.
  const rinv = new Float64Array(r * r);
  for (let j = 0; j < r; j++) {
    rinv[j * r + j] = 1 / rdiag[j];
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let k = i + 1; k <= j; k++) s += a[i + k * m] * rinv[k * r + j];
      rinv[i * r + j] = -s / rdiag[i];
    }
  }
  const g = new Float64Array(r * r);
  for (let i = 0; i < r; i++) {
    for (let j = i; j < r; j++) {
      let s = 0;
      for (let k = j; k < r; k++) s += rinv[i * r + k] * rinv[j * r + k];
      g[i * r + j] = s;
      g[j * r + i] = s;
    }
  }
  return g;
}
