/**
 * zod number schemas shared by the study-file sections and the API bodies (SI values).
 */
import { z } from 'zod';

export const finite = z.number().refine(Number.isFinite, 'must be a finite number');
export const positive = finite.refine((v) => v > 0, 'must be > 0');
export const nonNegative = finite.refine((v) => v >= 0, 'must be ≥ 0');
/** A fraction in (0, 1] (efficiencies, load fractions). */
export const fraction = finite.refine((v) => v > 0 && v <= 1, 'must be in (0, 1]');
