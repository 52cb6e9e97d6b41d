/**
 * Validating front door of the cell model: the zod schema of `CellDefinition` (./types.ts),
 * which is also the body of `POST /api/v1/cell/sweep` and the `cell` section of a study file.
 * All numbers SI (A/m², V, Ω·m², S/m, m, Pa, K, mol/kg, J/mol).
 *
 * `parseCellDefinition` turns any unknown value into a typed definition or throws InputError
 * listing every problem with its field path (e.g. `anode.kinetics.exchangeCurrentDensity`,
 * `currentDensities[7]`). The kernels (balance.ts, efficiency.ts) trust what passes here.
 */
import { z } from 'zod';
import { InputError, type IssueDetail } from '../errors.js';
import type { CellDefinition } from './types.js';

/** Largest number of current densities in one sweep (keeps a request bounded; our choice). */
export const MAX_SWEEP_POINTS = 20_000;

const finite = z.number().refine(Number.isFinite, 'must be a finite number');
const positive = finite.refine((v) => v > 0, 'must be > 0');
const nonNegative = finite.refine((v) => v >= 0, 'must be ≥ 0');
const fraction01 = finite.refine((v) => v > 0 && v <= 1, 'must be in (0, 1]');

const uncertaintySchema = z.object({
  lnExchangeCurrentDensitySE: nonNegative,
  transferCoefficientSE: nonNegative,
  correlation: finite.refine((v) => v >= -1 && v <= 1, 'must be in [−1, 1]'),
});

const tafelSchema = z.object({
  model: z.literal('tafel'),
  exchangeCurrentDensity: positive,
  transferCoefficient: positive,
  referenceTemperature: positive.optional(),
  activationEnergy: finite.optional(),
  uncertainty: uncertaintySchema.optional(),
});

const butlerVolmerSchema = z.object({
  model: z.literal('butler-volmer'),
  exchangeCurrentDensity: positive,
  anodicTransferCoefficient: positive,
  cathodicTransferCoefficient: positive,
  referenceTemperature: positive.optional(),
  activationEnergy: finite.optional(),
  uncertainty: uncertaintySchema.optional(),
});

export const kineticsSchema = z.discriminatedUnion('model', [tafelSchema, butlerVolmerSchema]);

const electrodeSchema = z.object({
  kinetics: kineticsSchema,
  limitingCurrentDensity: positive.optional(),
  electrons: z.number().int().min(1).max(8).optional(),
});

const gapSchema = z.object({
  thickness: nonNegative,
  conductivity: positive.optional(),
  electrolyte: z.enum(['KOH', 'NaOH', 'NaCl']).optional(),
  concentration: positive.optional(),
  voidFraction: finite.refine((v) => v >= 0 && v < 1, 'must be in [0, 1)').optional(),
  voidModel: z.enum(['bruggeman', 'maxwell']).optional(),
});

const membraneSchema = z.union([
  z.strictObject({
    areaResistance: nonNegative,
    referenceTemperature: positive.optional(),
    activationEnergy: finite.optional(),
  }),
  z.strictObject({ thickness: nonNegative, conductivity: positive }),
  z.strictObject({ springer: z.strictObject({ thickness: nonNegative, waterContent: positive }) }),
], {
  error: 'give one of { areaResistance [Ω·m²], referenceTemperature? [K], activationEnergy? [J/mol] }, { thickness [m], conductivity [S/m] } or { springer: { thickness [m], waterContent [λ] } }',
});

const currentEfficiencySchema = z.discriminatedUnion('model', [
  z.object({ model: z.literal('constant'), value: fraction01 }),
  z.object({ model: z.literal('parasitic'), currentDensity: nonNegative }),
  z.object({
    model: z.literal('competing'),
    sideReaction: z.object({ kinetics: kineticsSchema, equilibriumPotentialShift: finite }),
  }),
  z.object({ model: z.literal('crossover'), hydrogenPermeability: nonNegative, membraneThickness: positive }),
]);

export const cellDefinitionSchema = z
  .object({
    chemistry: z.enum(['chlor-alkali', 'alkaline-water', 'pem-water']),
    temperature: positive,
    pressure: positive,
    composition: z
      .object({ brineNaCl: positive.optional(), causticNaOH: positive.optional(), koh: positive.optional() })
      .optional(),
    reversiblePotential: positive.optional(),
    anode: electrodeSchema,
    cathode: electrodeSchema,
    ohmic: z.object({
      membrane: membraneSchema.optional(),
      gaps: z.array(gapSchema).max(20).optional(),
      hardware: nonNegative.optional(),
    }),
    currentEfficiency: currentEfficiencySchema.optional(),
    currentDensities: z.array(positive).min(1).max(MAX_SWEEP_POINTS),
    rectifierEfficiency: fraction01.optional(),
    designCurrentDensity: positive.optional(),
    kFactorRange: z.tuple([positive, positive]).optional(),
  })
  .superRefine((def, ctx) => {
    if (def.kFactorRange && !(def.kFactorRange[0] < def.kFactorRange[1])) {
      ctx.addIssue({ code: 'custom', path: ['kFactorRange'], message: 'lower bound must be below the upper bound' });
    }
    const ce = def.currentEfficiency;
    if (ce?.model === 'crossover' && def.chemistry === 'chlor-alkali') {
      ctx.addIssue({
        code: 'custom',
        path: ['currentEfficiency', 'model'],
        message: 'the hydrogen crossover model applies to water electrolysis, not chlor-alkali',
      });
    }
    if (ce?.model === 'competing' && def.chemistry !== 'chlor-alkali') {
      ctx.addIssue({
        code: 'custom',
        path: ['currentEfficiency', 'model'],
        message: 'the competing anode reaction model applies to chlor-alkali (oxygen evolution beside chlorine)',
      });
    }
    (def.ohmic.gaps ?? []).forEach((gap, i) => {
      if (gap.conductivity === undefined && gap.electrolyte === undefined) {
        ctx.addIssue({
          code: 'custom',
          path: ['ohmic', 'gaps', i],
          message: 'give either a conductivity [S/m] or an electrolyte (KOH, NaOH, NaCl) for the correlation',
        });
      }
    });
  });

/** Map zod issue paths to our dotted grammar: `ohmic.gaps[0].thickness`. */
function dottedPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const p of path) {
    if (typeof p === 'number') out += `[${p}]`;
    else out += (out === '' ? '' : '.') + String(p);
  }
  return out === '' ? '(body)' : out;
}

/**
 * Validate an unknown value as a CellDefinition. Returns the typed definition (defaults are
 * not filled in here; the model applies them). Throws InputError with one issue per problem.
 */
export function parseCellDefinition(raw: unknown): CellDefinition {
  const result = cellDefinitionSchema.safeParse(raw);
  if (!result.success) {
    const issues: IssueDetail[] = result.error.issues.map((issue) => ({
      path: dottedPath(issue.path),
      message: issue.message,
    }));
    throw InputError.many(
      `Invalid cell definition: ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`,
      issues,
    );
  }
  return result.data as CellDefinition;
}

// Compile-time check that the schema and the hand-written type agree in both directions.
type Parsed = z.infer<typeof cellDefinitionSchema>;
const _schemaMatchesType: (p: Parsed) => CellDefinition = (p) => p;
const _typeMatchesSchema: (d: CellDefinition) => Parsed = (d) => d;
void _schemaMatchesType;
void _typeMatchesSchema;
