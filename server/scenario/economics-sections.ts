/**
 * The study's coating comparison (`coatings`) and cost study (`costs`) sections. Each has the
 * same SI shape as the body of the matching API request (POST /api/v1/plant/compare and
 * POST /api/v1/plant/cost), so a saved section can be posted as it is.
 *
 * Units: current density A/m², area m², voltage V, voltage rise V/yr, mass rate kg/s,
 * hours h/yr, rates as fractions per year, lives in years; money in the user's currency:
 * electricity per kWh, capital and coating prices per m² of active area.
 *
 * The cell is optional in a section: when absent, the study's own `cell` section (the cell
 * definition built on the Cell page) is used, so the costs follow the cell as it changes.
 */
import { z } from 'zod';
import { kineticsSchema } from '../core/cell/schema.js';
import { cellSourceSchema } from '../web/cell-source.js';
import { finite, fraction, nonNegative, positive } from './numbers.js';


/** Most operating hours in a year (365 × 24 h, exact). */
export const MAX_OPERATING_HOURS = 8760;
/** Largest discount rate accepted, fraction per year (100 %/yr; project choice: beyond any plant study). */
export const MAX_DISCOUNT_RATE = 1;
/** Longest capital or coating life accepted, years (project choice: beyond any electrolyser plant). */
export const MAX_LIFE_YEARS = 60;
/** Most current densities in one cost request (keeps a request bounded; project choice). */
export const MAX_COST_POINTS = 2000;
/** Largest voltage rise accepted, V/yr (1 V/yr would ruin any cell within a year; project choice). */
export const MAX_VOLTAGE_RISE = 1;
/** Number of coating options compared side by side (page design). */
export const MIN_COATING_OPTIONS = 2;
export const MAX_COATING_OPTIONS = 6;

export const chemistrySchema = z.enum(['chlor-alkali', 'alkaline-water', 'pem-water']);
export const productSchema = z.enum(['Cl2', 'NaOH', 'H2', 'O2']);
/** A free currency label shown beside money (e.g. "EUR"); money itself is unit-free. */
const currencySchema = z.string().trim().max(12, 'at most 12 characters').regex(/^[^<>&"']*$/, 'letters, digits and symbols other than < > & " \'');

const hoursSchema = positive.refine((v) => v <= MAX_OPERATING_HOURS, `must be at most ${MAX_OPERATING_HOURS} h/yr`);
const rateSchema = finite.refine((v) => v >= 0 && v <= MAX_DISCOUNT_RATE, `must be a fraction per year in [0, ${MAX_DISCOUNT_RATE}]`);

/**
 * Cost study (body of POST /api/v1/plant/cost). `currentDensities` are the points costed (and
 * charted); the economic current density is searched over `searchRange`, default the span of
 * `currentDensities` (which then needs two different values).
 */
export const costRequestSchema = z
  .strictObject({
    chemistry: chemistrySchema.optional(),
    product: productSchema,
    /** Plant data `{ linear: { intercept V, slope V per A/m² } }` or a cell definition; default: the study's cell. */
    cell: cellSourceSchema.optional(),
    /** Constant CE (0, 1]: required with plant data; with a cell definition it overrides the model's CE. */
    currentEfficiency: fraction.optional(),
    /** Electricity price, currency per kWh. */
    electricityPrice: positive,
    /** Installed capital per m² of active area, currency/m². */
    capitalCostPerArea: positive,
    /** Operating hours per year, (0, 8760]. */
    operatingHours: hoursSchema,
    /** Discount rate, fraction per year. */
    discountRate: rateSchema,
    /** Capital life, years > 0. */
    lifetime: positive.refine((v) => v <= MAX_LIFE_YEARS, `must be at most ${MAX_LIFE_YEARS} years`),
    /** Current densities costed, A/m². */
    currentDensities: z.array(positive).min(1, 'must list at least one current density').max(MAX_COST_POINTS),
    /** Range searched for the economic current density, A/m² (default: span of currentDensities). */
    searchRange: z.strictObject({ min: positive, max: positive }).optional(),
    /** Design current density, A/m² (costed beside the optimum). */
    designCurrentDensity: positive.optional(),
    /** Fraction each input moves in the tornado (default 0.2 = ±20 %). */
    sensitivityFraction: finite.refine((v) => v > 0 && v < 1, 'must be in (0, 1)').optional(),
    currency: currencySchema.optional(),
  })
  .superRefine((r, ctx) => {
    if (r.searchRange && !(r.searchRange.max > r.searchRange.min)) {
      ctx.addIssue({ code: 'custom', path: ['searchRange', 'max'], message: 'must be above the minimum' });
    }
    if (!r.searchRange && r.currentDensities.length > 0) {
      const lo = Math.min(...r.currentDensities);
      const hi = Math.max(...r.currentDensities);
      if (!(hi > lo)) {
        ctx.addIssue({ code: 'custom', path: ['currentDensities'], message: 'give at least two different current densities, or a searchRange, to search for the economic current density' });
      }
    }
  });

export type CostRequest = z.infer<typeof costRequestSchema>;

/** Chooses a branch by the key present, so issues name the fields of the branch meant. */
function keyedUnion<T>(branches: Array<[string, z.ZodType<T>]>, hint: string): z.ZodType<T> {
  return z.unknown().transform((raw, ctx): T => {
    if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
      ctx.addIssue({ code: 'custom', message: `must be an object: ${hint}`, input: raw });
      return z.NEVER;
    }
    const branch = branches.find(([key]) => key in raw);
    if (!branch) {
      ctx.addIssue({ code: 'custom', message: `must be ${hint}`, input: raw });
      return z.NEVER;
    }
    const parsed = branch[1].safeParse(raw);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) ctx.addIssue({ ...issue } as Parameters<typeof ctx.addIssue>[0]);
      return z.NEVER;
    }
    return parsed.data;
  }) as unknown as z.ZodType<T>;
}

const idSchema = z.string().regex(/^[A-Za-z0-9_-]{1,64}$/, 'letters, digits, _ or -, at most 64');

/**
 * New kinetics for one electrode of the study's cell (an electrode swap): entered parameters
 * (the cell definition's kinetics shape, SI), a fit saved in the study, or a polarization
 * dataset of the study fitted on the fly (Tafel line, automatic window, known R_u subtracted).
 */
export const electrodeSwapSchema = keyedUnion<ElectrodeSwap>(
  [
    ['kinetics', z.strictObject({ kinetics: kineticsSchema, limitingCurrentDensity: positive.optional() }) as z.ZodType<ElectrodeSwap>],
    ['fit', z.strictObject({ fit: idSchema }) as z.ZodType<ElectrodeSwap>],
    ['dataset', z.strictObject({ dataset: idSchema }) as z.ZodType<ElectrodeSwap>],
  ],
  '{ "kinetics": {…} }, { "fit": "<saved fit id>" } or { "dataset": "<dataset id>" }',
);

export type ElectrodeSwap =
  | { kinetics: z.infer<typeof kineticsSchema>; limitingCurrentDensity?: number }
  | { fit: string }
  | { dataset: string };

export const coatingOptionSchema = z
  .strictObject({
    name: z.string().trim().min(1, 'must not be empty').max(80, 'at most 80 characters'),
    /** Its own cell: plant data or a cell definition (excludes anode/cathode swaps). */
    cell: cellSourceSchema.optional(),
    /** Constant CE (0, 1] for a plant-data cell (or overriding a model's CE). */
    currentEfficiency: fraction.optional(),
    /** New anode kinetics on the base cell. */
    anode: electrodeSwapSchema.optional(),
    /** New cathode kinetics on the base cell. */
    cathode: electrodeSwapSchema.optional(),
    /** Installed coating price, currency per m² of active area (≥ 0). */
    pricePerArea: nonNegative,
    /** Expected rise of the cell voltage, V/yr (≥ 0). */
    voltageRisePerYear: nonNegative.refine((v) => v <= MAX_VOLTAGE_RISE, `must be at most ${MAX_VOLTAGE_RISE} V/yr`),
    /** Coating life, whole years. */
    lifeYears: z.number().int('must be a whole number of years').min(1, 'must be at least 1 year').max(MAX_LIFE_YEARS),
  })
  .superRefine((o, ctx) => {
    if (o.cell && (o.anode || o.cathode)) {
      ctx.addIssue({ code: 'custom', path: ['cell'], message: 'give either a cell of its own or electrode swaps on the base cell, not both' });
    }
  });

export type CoatingOptionRequest = z.infer<typeof coatingOptionSchema>;

/** How big the plant is: total active area, cells × area per cell, or a production rate. */
export const plantSizeSchema = keyedUnion<PlantSize>(
  [
    ['activeArea', z.strictObject({ activeArea: positive }) as z.ZodType<PlantSize>],
    ['cells', z.strictObject({ cells: z.number().int('must be a whole number').min(1, 'must be at least 1'), cellArea: positive }) as z.ZodType<PlantSize>],
    ['productionRate', z.strictObject({ productionRate: positive }) as z.ZodType<PlantSize>],
  ],
  '{ "activeArea": m² }, { "cells": N, "cellArea": m² } or { "productionRate": kg/s }',
);

export type PlantSize = { activeArea: number } | { cells: number; cellArea: number } | { productionRate: number };

/** Coating comparison (body of POST /api/v1/plant/compare). */
export const coatingsRequestSchema = z
  .strictObject({
    chemistry: chemistrySchema.optional(),
    product: productSchema,
    /** Base cell for electrode swaps (a cell definition); default: the study's cell. */
    cell: cellSourceSchema.optional(),
    currentEfficiency: fraction.optional(),
    /** Design current density, A/m². */
    currentDensity: positive,
    plant: plantSizeSchema,
    electricityPrice: positive,
    operatingHours: hoursSchema,
    discountRate: rateSchema,
    /** Index of the baseline option (default 0). */
    baseline: z.number().int('must be a whole number').min(0).max(MAX_COATING_OPTIONS - 1).optional(),
    options: z
      .array(coatingOptionSchema)
      .min(MIN_COATING_OPTIONS, `must list ${MIN_COATING_OPTIONS} to ${MAX_COATING_OPTIONS} coating options`)
      .max(MAX_COATING_OPTIONS, `must list ${MIN_COATING_OPTIONS} to ${MAX_COATING_OPTIONS} coating options`),
    currency: currencySchema.optional(),
  })
  .superRefine((r, ctx) => {
    if (r.baseline !== undefined && r.baseline >= r.options.length) {
      ctx.addIssue({ code: 'custom', path: ['baseline'], message: `must be an option index 0–${r.options.length - 1}` });
    }
  });

export type CoatingsRequest = z.infer<typeof coatingsRequestSchema>;

/** Study sections: the same shapes as the requests. */
export const coatingsSectionSchema = coatingsRequestSchema;
export const costsSectionSchema = costRequestSchema;
