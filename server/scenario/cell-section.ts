/**
 * The study's `cell` section: the cell definition in SI units, exactly the body of
 * `POST /api/v1/cell/sweep` (core schema server/core/cell/schema.ts), plus two optional
 * additions used by the Cell page and the API:
 *
 *  - `uncertainty: { samples, seed }` — compute the 95 % band of the cell voltage by Monte Carlo
 *    from the kinetics' standard errors (server/core/cell/uncertainty.ts). In a request it asks
 *    for the band; in a study it means "show the band" when the page opens.
 *  - `provenance: { anode?, cathode? }` — where each electrode's kinetics came from (a dataset
 *    fitted on the fly, a saved fit, or entered by hand) with a short note for people. The
 *    numbers in the definition are authoritative; the note only tells their origin.
 *
 * Validation errors carry dotted field paths (`ohmic.gaps[0].voidFraction`), see
 * server/web/errors.ts.
 */
import { z } from 'zod';
import { cellDefinitionSchema } from '../core/cell/schema.js';
import { DEFAULT_SAMPLES, DEFAULT_SEED, MAX_SAMPLES } from '../core/cell/uncertainty.js';

/** Largest seed of the Mersenne-Twister generator used by the band (unsigned 32-bit). */
export const MAX_BAND_SEED = 4294967295;
/** Fewest Monte Carlo samples accepted (a quantile needs at least two values). */
export const MIN_BAND_SAMPLES = 2;

export const bandSettingsSchema = z.object({
  samples: z
    .number()
    .int('must be a whole number')
    .min(MIN_BAND_SAMPLES, `must be at least ${MIN_BAND_SAMPLES}`)
    .max(MAX_SAMPLES, `must be at most ${MAX_SAMPLES}`)
    .default(DEFAULT_SAMPLES),
  seed: z.number().int('must be a whole number').min(1, 'must be ≥ 1').max(MAX_BAND_SEED, `must be ≤ ${MAX_BAND_SEED}`).default(DEFAULT_SEED),
});

export const kineticsProvenanceSchema = z.object({
  kind: z.enum(['dataset', 'fit', 'manual']),
  /** Dataset or saved-fit id (for kind dataset / fit). */
  id: z.string().max(64).optional(),
  /** Plain-language origin, e.g. "Tafel fit of dataset ‘Anode coating A, 88 °C’, automatic window". */
  note: z.string().max(1000).default(''),
});

/**
 * Largest Monte Carlo work of one band, samples × (current densities + design point): bounds
 * the time of one request (≈ 1–3 s on one core; our choice).
 */
export const MAX_BAND_WORK = 20_000_000;

export const cellSectionSchema = cellDefinitionSchema
  .safeExtend({
    uncertainty: bandSettingsSchema.optional(),
    provenance: z
      .object({ anode: kineticsProvenanceSchema.optional(), cathode: kineticsProvenanceSchema.optional() })
      .optional(),
  })
  .superRefine((section, ctx) => {
    const u = section.uncertainty;
    if (!u) return;
    const points = section.currentDensities.length + (section.designCurrentDensity === undefined ? 0 : 1);
    if (u.samples * points > MAX_BAND_WORK) {
      ctx.addIssue({
        code: 'custom',
        path: ['uncertainty', 'samples'],
        message: `samples × current densities = ${u.samples} × ${points} exceeds ${MAX_BAND_WORK}; use fewer samples or fewer current densities`,
      });
    }
  });

export type CellSection = z.infer<typeof cellSectionSchema>;
export type BandSettings = z.infer<typeof bandSettingsSchema>;
export type KineticsProvenance = z.infer<typeof kineticsProvenanceSchema>;
