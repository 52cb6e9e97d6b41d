/**
 * Front-door checks for the kinetics fits: each failure names the field path and the reason
 * (InputError). Kernels behind these checks trust their input.
 */
import { InputError } from '../errors.js';
import type { PolarizationPoint } from './types.js';

/** Largest number of points a fit accepts (keeps a request bounded in time and memory). Project choice. */
export const MAX_POINTS = 100_000;

export interface PointCheckOptions {
  /** Reject j = 0 (log models: Tafel). */
  rejectZeroCurrent: boolean;
  /** Path prefix, default "points". */
  path?: string;
}

/** Check the point list: non-empty array, ≤ MAX_POINTS, finite numbers, optional j ≠ 0. */
export function checkPoints(points: unknown, options: PointCheckOptions): asserts points is PolarizationPoint[] {
  const base = options.path ?? 'points';
  if (!Array.isArray(points)) throw new InputError(base, 'must be a list of {currentDensity, overpotential} points');
  if (points.length === 0) throw new InputError(base, 'no points given; a fit needs data');
  if (points.length > MAX_POINTS) {
    throw new InputError(base, `has ${points.length} points; at most ${MAX_POINTS} are accepted (thin the record first)`, points.length);
  }
  for (let i = 0; i < points.length; i++) {
    const p = points[i] as Partial<PolarizationPoint> | null;
    if (p === null || typeof p !== 'object') throw new InputError(`${base}[${i}]`, 'must be an object {currentDensity, overpotential}');
    if (typeof p.currentDensity !== 'number' || !Number.isFinite(p.currentDensity)) {
      throw new InputError(`${base}[${i}].currentDensity`, 'must be a finite number in A/m²', p.currentDensity);
    }
    if (typeof p.overpotential !== 'number' || !Number.isFinite(p.overpotential)) {
      throw new InputError(`${base}[${i}].overpotential`, 'must be a finite number in V', p.overpotential);
    }
    if (options.rejectZeroCurrent && p.currentDensity === 0) {
      throw new InputError(`${base}[${i}].currentDensity`, 'is zero; the Tafel model uses ln|j| and cannot take j = 0 (remove the point)', 0);
    }
  }
}

/** Temperature must be finite and > 0 K. */
export function checkTemperature(temperature: unknown, path = 'temperature'): asserts temperature is number {
  if (typeof temperature !== 'number' || !Number.isFinite(temperature) || temperature <= 0) {
    throw new InputError(path, 'must be a finite absolute temperature > 0 K', temperature);
  }
}

/** Manual |η| window: 0 ≤ min < max, finite. */
export function checkWindow(window: unknown, path = 'window'): { minOverpotential: number; maxOverpotential: number } {
  const w = window as { minOverpotential?: unknown; maxOverpotential?: unknown } | null;
  if (w === null || typeof w !== 'object') throw new InputError(path, "must be 'auto' or {minOverpotential, maxOverpotential} in V");
  const lo = w.minOverpotential;
  const hi = w.maxOverpotential;
  if (typeof lo !== 'number' || !Number.isFinite(lo) || lo < 0) {
    throw new InputError(`${path}.minOverpotential`, 'must be a finite |η| ≥ 0 V', lo);
  }
  if (typeof hi !== 'number' || !(hi > lo)) throw new InputError(`${path}.maxOverpotential`, 'must be a |η| in V greater than minOverpotential', hi);
  return { minOverpotential: lo, maxOverpotential: hi };
}
