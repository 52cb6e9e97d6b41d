import { expect } from 'vitest';

export interface Tolerance {
  /** Relative tolerance on |actual − expected| / |expected|. */
  rtol?: number;
  /** Absolute tolerance on |actual − expected|. */
  atol?: number;
}

/**
 * Assert |actual − expected| ≤ atol + rtol·|expected| (numpy.isclose semantics).
 * The failure message prints inputs, the difference and the allowed tolerance.
 */
export function expectClose(actual: number, expected: number, tol: Tolerance, label = ''): void {
  const rtol = tol.rtol ?? 0;
  const atol = tol.atol ?? 0;
  const diff = Math.abs(actual - expected);
  const allowed = atol + rtol * Math.abs(expected);
  const ok = Number.isFinite(actual) && diff <= allowed;
  expect(
    ok,
    `${label ? label + ': ' : ''}actual ${actual} vs expected ${expected}; |Δ| = ${diff.toExponential(3)} > allowed ${allowed.toExponential(3)} (rtol ${rtol}, atol ${atol})`,
  ).toBe(true);
}

/**
 * Log relative error as NIST StRD defines it: −log10(|est − cert|/|cert|), or −log10(|est|)
 * when cert = 0; capped at `cap` digits and floored at 0.
 */
export function logRelativeError(estimate: number, certified: number, cap = 15): number {
  if (!Number.isFinite(estimate)) return 0;
  const err = certified === 0 ? Math.abs(estimate) : Math.abs(estimate - certified) / Math.abs(certified);
  if (err === 0) return cap;
  return Math.max(0, Math.min(cap, -Math.log10(err)));
}
