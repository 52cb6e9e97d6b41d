import { z } from 'zod';

/** The study's plant sizing inputs (same SI shape as POST /api/v1/plant/size, plus shunt inputs). */
export const plantSectionSchema = z.record(z.string(), z.unknown());
