/**
 * Schemas of the study sections owned by later parts of the app (cell, plant, coatings,
 * costs). Each is the same SI shape as the matching API request body.
 */
import { z } from 'zod';

export const sectionSchemas = {
  cell: z.record(z.string(), z.unknown()),
  plant: z.record(z.string(), z.unknown()),
  coatings: z.record(z.string(), z.unknown()),
  costs: z.record(z.string(), z.unknown()),
};
