import type { z } from 'zod';

/**
 * Parse a request body with a zod schema. Throws the ZodError, which the error handler maps
 * to HTTP 400 with `issues: [{path, message}]`.
 */
export function parseBody<S extends z.ZodType>(schema: S, body: unknown): z.infer<S> {
  return schema.parse(body ?? {});
}

/** JSON-safe number check: used before sending results to make sure no NaN/Infinity leaks. */
export function assertFiniteTree(value: unknown, path = 'result'): void {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new Error(`non-finite number at ${path}`);
  } else if (Array.isArray(value)) {
    value.forEach((v, i) => assertFiniteTree(v, `${path}[${i}]`));
  } else if (value && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) assertFiniteTree(v, `${path}.${k}`);
  }
}
