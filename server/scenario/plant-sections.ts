import { z } from 'zod';

/** The study's plant sizing, coating comparison and cost-study inputs (same SI shapes as the plant APIs). */
export const plantSectionSchema = z.record(z.string(), z.unknown());
export const coatingsSectionSchema = z.record(z.string(), z.unknown());
export const costsSectionSchema = z.record(z.string(), z.unknown());
