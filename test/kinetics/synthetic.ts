/**
 * Synthetic polarization data for the kinetics tests: exact model values plus seeded
 * Gaussian noise on η (@stdlib/random-base-normal, factory with a seed). Invented data.
 */
import normal from '@stdlib/random-base-normal';
import { butlerVolmerOverpotential, type ButlerVolmerParams } from '../../server/core/kinetics/models.js';
import type { PolarizationPoint } from '../../server/core/kinetics/types.js';

export function noise(seed: number, sigma: number): () => number {
  const draw = normal.factory(0, sigma, { seed });
  return () => draw();
}

/** |j| log-spaced from 10^lo to 10^hi (count points), times sign. */
export function logSpaced(lo: number, hi: number, count: number, sign = 1): number[] {
  const out: number[] = [];
  for (let k = 0; k < count; k++) out.push(sign * Math.pow(10, lo + ((hi - lo) * k) / (count - 1)));
  return out;
}

/** Points on the BV law (η from the exact inversion) + j·R_u + noise. */
export function bvPoints(
  currents: number[],
  p: ButlerVolmerParams,
  temperatureK: number,
  opts: { sigma?: number; seed?: number; ru?: number } = {},
): PolarizationPoint[] {
  const e = opts.sigma ? noise(opts.seed ?? 1, opts.sigma) : () => 0;
  return currents.map((j) => ({ currentDensity: j, overpotential: butlerVolmerOverpotential(j, p, temperatureK) + j * (opts.ru ?? 0) + e() }));
}

/** Points on a pure Tafel line s·η = b·ln(|j|/j0) (+ s... j·R_u) + noise. b per e-fold [V]. */
export function tafelPoints(
  currents: number[],
  j0: number,
  bPerE: number,
  opts: { sigma?: number; seed?: number; ru?: number } = {},
): PolarizationPoint[] {
  const e = opts.sigma ? noise(opts.seed ?? 1, opts.sigma) : () => 0;
  return currents.map((j) => ({ currentDensity: j, overpotential: Math.sign(j) * bPerE * Math.log(Math.abs(j) / j0) + j * (opts.ru ?? 0) + e() }));
}
