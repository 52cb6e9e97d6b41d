import type { z } from 'zod';
import { PhysicsError } from '../core/errors.js';

/**
 * Parse a request body with a zod schema. Throws the ZodError, which the error handler maps
 * to HTTP 400 with `issues: [{path, message}]`.
 */
export function parseBody<S extends z.ZodType>(schema: S, body: unknown): z.infer<S> {
  return schema.parse(body ?? {});
}

/** Path of the first NaN/±Infinity in a JSON-like tree, or null when every number is finite. */
export function firstNonFinite(value: unknown, path = 'result'): string | null {
  if (typeof value === 'number') return Number.isFinite(value) ? null : path;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const found = firstNonFinite(value[i], `${path}[${i}]`);
      if (found) return found;
    }
  } else if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      const found = firstNonFinite(v, `${path}.${k}`);
      if (found) return found;
    }
  }
  return null;
}

/**
 * JSON-safe number check before sending results: no NaN/Infinity ever reaches a 200. Valid but
 * extreme inputs (e.g. 1e308 or 1e-320) can overflow a finite formula; that is an input problem,
 * answered as HTTP 400 (PhysicsError, path "(result)") with the place of the overflow, never a 500.
 */
export function assertFiniteTree(value: unknown, path = 'result'): void {
  const at = firstNonFinite(value, path);
  if (at !== null) {
    throw new PhysicsError('(result)', `the calculation overflowed to a non-finite number at ${at}: some input is far outside the range the models handle; check the magnitudes and units of the inputs`);
  }
}
