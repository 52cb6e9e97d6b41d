import { z } from 'zod';

/** The study's coating comparison and cost-study inputs (same shapes as the plant compare/cost APIs). */
export const coatingsSectionSchema = z.record(z.string(), z.unknown());
export const costsSectionSchema = z.record(z.string(), z.unknown());
