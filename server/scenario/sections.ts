/**
 * Schemas of the study sections owned by later parts of the app (cell, plant, coatings,
 * costs). Each is the same SI shape as the matching API request body.
 */
import { cellSectionSchema } from './cell-section.js';
import { plantSectionSchema } from './plant-sections.js';
import { coatingsSectionSchema, costsSectionSchema } from './economics-sections.js';

export const sectionSchemas = {
  cell: cellSectionSchema,
  plant: plantSectionSchema,
  coatings: coatingsSectionSchema,
  costs: costsSectionSchema,
};
