/**
 * Timing helpers shared by the benchmark scripts (not a benchmark itself).
 */
import { performance } from 'node:perf_hooks';

/** Median of a non-empty list. */
export function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const k = s.length >> 1;
  return s.length % 2 ? s[k] : 0.5 * (s[k - 1] + s[k]);
}

/** `v` rounded to `digits` decimals, for printing. */
export function round(v: number, digits: number): number {
  return Math.round(v * 10 ** digits) / 10 ** digits;
}

/**
 * Wall times (ms) of repeated calls of `fn`: at least `minRuns` calls and at least `minMs`
 * in all, but no more than `maxRuns` calls. Warm-up is the caller's business.
 */
export function timedRuns(fn: () => unknown, limits: { minRuns: number; minMs: number; maxRuns: number }): number[] {
  const times: number[] = [];
  const t0 = performance.now();
  while (times.length < limits.minRuns || performance.now() - t0 < limits.minMs) {
    const a = performance.now();
    fn();
    times.push(performance.now() - a);
    if (times.length >= limits.maxRuns) break;
  }
  return times;
}
