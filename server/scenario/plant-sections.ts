/**
 * The study's `plant` section: sizing inputs (same SI shape as POST /api/v1/plant/size, with the
 * chemistry taken from the study), shunt-current inputs (circuits as in POST /api/v1/plant/shunt)
 * and the inputs of the safety checks. All numbers SI: kg/s, A/m², m², V, A, Ω, S/m, m, m².
 */
import { z } from 'zod';
import { finite, fraction, nonNegative, positive } from './numbers.js';


/** Products a plant can be sized for (the main product of the target). */
export const plantProductSchema = z.enum(['Cl2', 'NaOH', 'H2']);
export type PlantProduct = z.infer<typeof plantProductSchema>;

/** Rectifier limits: DC voltage V, DC current A, AC→DC efficiency 0–1. */
export const rectifierSchema = z.object({
  maxVoltage: positive,
  maxCurrent: positive,
  efficiency: fraction,
});

/** A duct of electrolyte: length m, cross-section m². */
export const ductSchema = z.object({ length: positive, crossSection: positive });

/**
 * One electrolyte circuit of a bipolar electrolyser for the shunt-current network: either its
 * resistances (Ω; channel of one cell, manifold segment between neighbouring cells), or its
 * geometry and electrolyte conductivity [S/m] from which R = L/(σ·A) is computed.
 */
const circuitByResistanceSchema = z.strictObject({
  name: z.string().max(80).optional(),
  channelResistance: positive,
  manifoldSegmentResistance: positive,
});
const circuitByGeometrySchema = z.strictObject({
  name: z.string().max(80).optional(),
  conductivity: positive,
  channel: ductSchema,
  manifoldSegment: ductSchema,
});
export type ShuntCircuitInput = z.infer<typeof circuitByResistanceSchema> | z.infer<typeof circuitByGeometrySchema>;

/**
 * The branch is chosen by the keys present (geometry when `conductivity`, `channel` or
 * `manifoldSegment` is there), so a bad field is named with its path and reason rather than a
 * bare "invalid input" of a union.
 */
export const shuntCircuitSchema = z.unknown().transform((raw, ctx): ShuntCircuitInput => {
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    ctx.addIssue({ code: 'custom', message: 'must be an object: { channelResistance, manifoldSegmentResistance } or { conductivity, channel, manifoldSegment }', input: raw });
    return z.NEVER;
  }
  const geometry = 'conductivity' in raw || 'channel' in raw || 'manifoldSegment' in raw;
  const parsed = (geometry ? circuitByGeometrySchema : circuitByResistanceSchema).safeParse(raw);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) ctx.addIssue({ ...issue } as Parameters<typeof ctx.addIssue>[0]);
    return z.NEVER;
  }
  return parsed.data;
});

/**
 * Most cells in series a shunt-current solve takes (project choice: beyond any bipolar
 * electrolyser built; bounds the banded network solve of one request in time and memory).
 */
export const MAX_SHUNT_CELLS = 2000;

export const plantShuntSchema = z.object({
  /** Cells in series in the electrolyser studied; default: the largest electrolyser of the sizing. */
  cells: z.number().int().min(2).max(MAX_SHUNT_CELLS).optional(),
  circuits: z.array(shuntCircuitSchema).min(1).max(8),
});

export const plantSafetySchema = z.object({
  /** H₂ in the anode gas (Cl₂ or O₂) at the operating point, mol/mol (= vol fraction). */
  hydrogenInAnodeGas: finite.refine((v) => v >= 0 && v < 1, 'must be in [0, 1)').optional(),
  /** Minimum load as a fraction of the operating current. */
  minimumLoad: fraction.optional(),
  /** Limiting current density of the cell, A/m² (when known from mass-transport data). */
  limitingCurrentDensity: positive.optional(),
  /** Boiling-point elevation of the electrolyte over pure water, K. */
  boilingPointElevation: nonNegative.optional(),
  /** Nearest working distance from the main busbar, m. */
  busbarDistance: positive.optional(),
});

export const plantSectionSchema = z
  .object({
    product: plantProductSchema,
    /** Production target of `product`, kg/s (NaOH as 100 %). */
    productionRate: positive,
    /** Design current density, A/m². */
    currentDensity: positive,
    /** Active area of one cell, m². */
    cellArea: positive,
    /** Where the cell comes from: plant data (the K-factor line below) or the study's cell model. */
    cellSource: z.enum(['plant-data', 'study-cell']).default('plant-data'),
    /** Plant data: U = intercept + slope·j; intercept V, slope V per A/m². */
    linear: z.object({ intercept: positive, slope: nonNegative }).optional(),
    /** Current efficiency of the target product, 0–1 (required with plant data; overrides the model's otherwise). */
    currentEfficiency: fraction.optional(),
    /** Current efficiency of the co-products, 0–1 (default: the target's). */
    coProductCurrentEfficiency: z
      .object({ Cl2: fraction.optional(), NaOH: fraction.optional(), H2: fraction.optional(), O2: fraction.optional() })
      .optional(),
    rectifier: rectifierSchema,
    /** How the page shows the production rate. */
    rateUnit: z.enum(['t/day', 't/year', 'kg/day']).optional(),
    shunt: plantShuntSchema.optional(),
    safety: plantSafetySchema.optional(),
  })
  .superRefine((s, ctx) => {
    if (s.cellSource === 'plant-data') {
      if (!s.linear) ctx.addIssue({ code: 'custom', path: ['linear'], message: 'plant data need the cell line (intercept and slope)' });
      if (s.currentEfficiency === undefined) ctx.addIssue({ code: 'custom', path: ['currentEfficiency'], message: 'plant data need a current efficiency' });
    }
  });

export type PlantSection = z.infer<typeof plantSectionSchema>;
