/**
 * The Levenberg–Marquardt trust-region subproblem: given the pivoted QR factor R of J,
 * Qᵀr, the scaling D and the radius Δ, find λ ≥ 0 and the step s(λ) solving
 * [J; √λ·D]·s ≈ [−r; 0] with ‖D·s‖ ≈ Δ.
 *
 * Method: Moré's safeguarded Newton iteration on φ(λ) = ‖D·s(λ)‖ − Δ with bounds
 * [parl, paru] (lmParameter), each trial solved from R by Givens rotations that fold the
 * diagonal rows √λ·D into the triangle (qrSolve), so J is not refactored per λ.
 * Units: n/a. Validity: R upper triangular n×n from a pivoted QR; zero diagonal entries
 * (rank deficiency) are handled by least-squares back substitution.
 * Sources: J. J. Moré, "The Levenberg–Marquardt algorithm: implementation and theory",
 * Springer LNM 630 (1978) 105–116, §§3–5; J. J. Moré, B. S. Garbow,
 * K. E. Hillstrom, User Guide for MINPACK-1, ANL-80-74 (1980) (lmpar, qrsolv).
 * Constants 0.1 (relative accuracy of ‖D·s‖ = Δ), 0.001·paru and 10 iterations are those
 * of Moré (1978) / MINPACK.
 */
import { scaledNorm } from './qr.js';

/** Smallest positive normal float64 (MINPACK dpmpar(2)). */
const DWARF = 2.2250738585072014e-308;
/** Max Newton iterations on λ (MINPACK lmpar uses 10). */
const LMPAR_MAX_ITER = 10;

/** Euclidean norm of the first `len` entries of v (scaled; overflow-safe). */
export function enorm(v: Float64Array, len = v.length): number {
  return scaledNorm(v, 0, len);
}

/**
 * Solve min ‖[R; √λ·D·P]·z − [qtb; 0]‖ given the n×n upper triangle R (column-major r,
 * diagonal in rdiag), then x = P·z. MINPACK qrsolv: Givens rotations eliminate the
 * diagonal rows; the rotated triangle S is left in the strict lower part of r with its
 * diagonal in sdiag (R's strict upper part is preserved). Singular S → minimum of the
 * non-singular leading block (components beyond set to 0).
 */
export function qrSolve(
  n: number,
  r: Float64Array,
  rdiag: Float64Array,
  perm: Int32Array,
  diag: Float64Array,
  qtb: Float64Array,
  x: Float64Array,
  sdiag: Float64Array,
  wa: Float64Array,
): void {
  // Copy R (upper, with diagonal) into the lower triangle (as S's starting point).
  for (let j = 0; j < n; j++) {
    for (let i = j + 1; i < n; i++) r[i + j * n] = r[j + i * n];
    r[j + j * n] = rdiag[j];
    wa[j] = qtb[j];
  }
  for (let j = 0; j < n; j++) {
    const dj = diag[perm[j]];
    if (dj !== 0) {
      for (let k = j; k < n; k++) sdiag[k] = 0;
      sdiag[j] = dj;
      let qtbpj = 0;
      for (let k = j; k < n; k++) {
        if (sdiag[k] === 0) continue;
        const rkk = r[k + k * n];
        let c: number;
        let s: number;
        if (Math.abs(rkk) < Math.abs(sdiag[k])) {
          const cot = rkk / sdiag[k];
          s = 0.5 / Math.sqrt(0.25 + 0.25 * cot * cot);
          c = s * cot;
        } else {
          const tan = sdiag[k] / rkk;
          c = 0.5 / Math.sqrt(0.25 + 0.25 * tan * tan);
          s = c * tan;
        }
        r[k + k * n] = c * rkk + s * sdiag[k];
        const t = c * wa[k] + s * qtbpj;
        qtbpj = -s * wa[k] + c * qtbpj;
        wa[k] = t;
        for (let i = k + 1; i < n; i++) {
          const rik = r[i + k * n];
          const ti = c * rik + s * sdiag[i];
          sdiag[i] = -s * rik + c * sdiag[i];
          r[i + k * n] = ti;
        }
      }
    }
    sdiag[j] = r[j + j * n];
    r[j + j * n] = rdiag[j];
  }
  let nsing = n;
  for (let j = 0; j < n; j++) {
    if (sdiag[j] === 0 && nsing === n) nsing = j;
    if (nsing < n) wa[j] = 0;
  }
  for (let j = nsing - 1; j >= 0; j--) {
    let sum = 0;
    for (let i = j + 1; i < nsing; i++) sum += r[i + j * n] * wa[i];
    wa[j] = (wa[j] - sum) / sdiag[j];
  }
  for (let j = 0; j < n; j++) x[perm[j]] = wa[j];
}

export interface LmParWork {
  wa1: Float64Array;
  wa2: Float64Array;
  sdiag: Float64Array;
  wa: Float64Array;
}

/**
 * Levenberg–Marquardt parameter λ ≥ 0 such that the step x(λ) solving
 * [J; √λ·D]·x ≈ [−r; 0] satisfies ‖D·x‖ ≈ Δ (within 10 %), or λ = 0 if the Gauss–Newton
 * step is already inside the region. Moré (1978) §5; MINPACK lmpar. Returns λ; the step
 * (for +qtb, i.e. the caller negates) is written into x.
 */
export function lmParameter(
  n: number,
  r: Float64Array,
  rdiag: Float64Array,
  perm: Int32Array,
  diag: Float64Array,
  qtb: Float64Array,
  delta: number,
  parIn: number,
  x: Float64Array,
  w: LmParWork,
): number {
  const { wa1, wa2, sdiag, wa } = w;
  let par = parIn;
  // Gauss–Newton direction (least-squares solution if R is singular).
  let nsing = n;
  for (let j = 0; j < n; j++) {
    wa1[j] = qtb[j];
    if (rdiag[j] === 0 && nsing === n) nsing = j;
    if (nsing < n) wa1[j] = 0;
  }
  for (let j = nsing - 1; j >= 0; j--) {
    wa1[j] /= rdiag[j];
    const t = wa1[j];
    for (let i = 0; i < j; i++) wa1[i] -= r[i + j * n] * t;
  }
  for (let j = 0; j < n; j++) x[perm[j]] = wa1[j];
  for (let j = 0; j < n; j++) wa2[j] = diag[j] * x[j];
  let dxnorm = enorm(wa2, n);
  let fp = dxnorm - delta;
  if (fp <= 0.1 * delta) return 0;

  // Lower bound parl from the Newton step (only when R is non-singular).
  let parl = 0;
  if (nsing >= n) {
    for (let j = 0; j < n; j++) {
      const l = perm[j];
      wa1[j] = diag[l] * (wa2[l] / dxnorm);
    }
    for (let j = 0; j < n; j++) {
      let sum = 0;
      for (let i = 0; i < j; i++) sum += r[i + j * n] * wa1[i];
      wa1[j] = (wa1[j] - sum) / rdiag[j];
    }
    const t = enorm(wa1, n);
    parl = fp / delta / t / t;
  }
  // Upper bound paru = ‖(D⁻¹Jᵀr)‖/Δ.
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let i = 0; i < j; i++) sum += r[i + j * n] * qtb[i];
    sum += rdiag[j] * qtb[j];
    wa1[j] = sum / diag[perm[j]];
  }
  const gnorm = enorm(wa1, n);
  let paru = gnorm / delta;
  if (paru === 0) paru = DWARF / Math.min(delta, 0.1);
  par = Math.max(par, parl);
  par = Math.min(par, paru);
  if (par === 0) par = gnorm / dxnorm;

  for (let iter = 1; ; iter++) {
    if (par === 0) par = Math.max(DWARF, 0.001 * paru);
    const sq = Math.sqrt(par);
    for (let j = 0; j < n; j++) wa1[j] = sq * diag[j];
    qrSolve(n, r, rdiag, perm, wa1, qtb, x, sdiag, wa);
    for (let j = 0; j < n; j++) wa2[j] = diag[j] * x[j];
    dxnorm = enorm(wa2, n);
    const prev = fp;
    fp = dxnorm - delta;
    if (Math.abs(fp) <= 0.1 * delta || (parl === 0 && fp <= prev && prev < 0) || iter === LMPAR_MAX_ITER) break;
    // Newton correction.
    for (let j = 0; j < n; j++) {
      const l = perm[j];
      wa1[j] = diag[l] * (wa2[l] / dxnorm);
    }
    for (let j = 0; j < n; j++) {
      wa1[j] /= sdiag[j];
      const t = wa1[j];
      for (let i = j + 1; i < n; i++) wa1[i] -= r[i + j * n] * t;
    }
    const t = enorm(wa1, n);
    const parc = fp / delta / t / t;
    if (fp > 0) parl = Math.max(parl, par);
    if (fp < 0) paru = Math.min(paru, par);
    par = Math.max(parl, par + parc);
  }
  return par;
}
