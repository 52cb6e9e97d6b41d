import { z } from 'zod';

/** The study's cell definition (same SI shape as POST /api/v1/cell/sweep). */
export const cellSectionSchema = z.record(z.string(), z.unknown());
