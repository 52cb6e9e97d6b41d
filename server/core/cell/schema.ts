/**
 * Validating front door of the cell model: the zod schema of `CellDefinition` (./types.ts),
 * which is also the body of `POST /api/v1/cell/sweep` and the `cell` section of a study file.
 * All numbers SI (A/m², V, Ω·m², S/m, m, Pa, K, mol/kg, J/mol).
 *
 * `parseCellDefinition` turns any unknown value into a typed definition or throws InputError
 * listing every problem with its field path (e.g. `anode.kinetics.exchangeCurrentDensity`,
 * `currentDensities[7]`). The kernels (balance.ts, efficiency.ts) trust what passes here.
 * Besides signs and finiteness, every magnitude is held to a documented plausibility bound
 * (PLAUSIBILITY_BOUNDS below: our plausibility bounds, each message naming the unit).
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

/**
 * Plausibility bounds of the cell definition — our plausibility bounds, not validity ranges
 * of any correlation (those are checked, with warnings or errors, where each correlation is
 * used). Each is far outside every real electrolyser, so a value beyond it is a unit slip
 * (kPa read as Pa, mA/cm² as A/m², mm as m, Ω·cm² as Ω·m²…) or a typing error, and is refused
 * with the field path, the bound and its unit instead of being carried into the model (where
 * 1e308 Pa or 1e308 A/m² would only overflow). Sources: orders of magnitude from the operating
 * figures of check-values.md §9 (from memory / common practice); the margins are our choice.
 */
export const PLAUSIBILITY_BOUNDS = {
  /** K: −50 °C to 400 °C, the temperature range the kinetics data pages accept (our plausibility bound). */
  temperature: { min: 223.15, max: 673.15, unit: 'K' },
  /** Pa: 100 MPa; high-pressure electrolysers run at a few MPa (our plausibility bound). */
  pressure: { max: 1e8, unit: 'Pa' },
  /**
   * A/m²: 1e12. Real exchange current densities stay below ~1e3 A/m² (check-values §9d); values
   * up to 1e12 A/m² are accepted so that an electrode without activation loss (a "reversible"
   * electrode, |η| < 1e-8 V at 1e4 A/m²) can still be modelled (our plausibility bound).
   */
  exchangeCurrentDensity: { max: 1e12, unit: 'A/m²' },
  /** A/m²: 1e6 (100 A/cm²); industrial cells run at 2e3–3e4 A/m² (our plausibility bound). */
  currentDensity: { max: 1e6, unit: 'A/m²' },
  /**
   * Dimensionless: transfer coefficients 0.01 to 10 (α ≤ n ≤ 8 for one step; α = 0.01 would be
   * a Tafel slope of several V/decade; our plausibility bound).
   */
  transferCoefficient: { min: 0.01, max: 10, unit: '(dimensionless)' },
  /** J/mol: |E_a| ≤ 1 MJ/mol; electrode-kinetic and membrane E_a are 10–100 kJ/mol (our plausibility bound). */
  activationEnergy: { max: 1e6, unit: 'J/mol' },
  /** m: 1 m; gaps and membranes are µm to mm (our plausibility bound). */
  thickness: { max: 1, unit: 'm' },
  /**
   * S/m: 1e-6 to 1e4; electrolytes and ionomers are 1–200 S/m, ultrapure water 5.5e-6 S/m
   * (from memory) (our plausibility bound; below it the ohmic drop alone would overflow).
   */
  conductivity: { min: 1e-6, max: 1e4, unit: 'S/m' },
  /** Ω·m²: 1 (= 1e4 Ω·cm²); cell area resistances are 1e-5–1e-4 Ω·m² (our plausibility bound). */
  areaResistance: { max: 1, unit: 'Ω·m²' },
  /**
   * mol/kg: 1e-6 to 100, above any saturated electrolyte in use and below any process
   * electrolyte (our plausibility bound; a vanishing molality gives a vanishing conductivity).
   */
  molality: { min: 1e-6, max: 100, unit: 'mol/kg' },
  /** V: 10; reversible cell voltages of electrolysis are 1–3 V (our plausibility bound). */
  potential: { max: 10, unit: 'V' },
  /** λ (H₂O per sulfonic group): 100; a fully hydrated PFSA membrane holds about 22 (check-values §6) (our plausibility bound). */
  waterContent: { max: 100, unit: 'H₂O per sulfonic group' },
  /** mol/(m·s·Pa): 1e-6, far above the ~1e-14 of ionomer membranes (from memory) (our plausibility bound). */
  permeability: { max: 1e-6, unit: 'mol/(m·s·Pa)' },
} as const;

type Bound = { min?: number; max: number; unit: string };

/** "1e8 Pa" style text of a bound. */
function boundText(v: number, unit: string): string {
  const text = Math.abs(v) >= 1e4 || (v !== 0 && Math.abs(v) < 1e-3) ? v.toExponential().replace('e+', 'e') : String(v);
  return unit ? `${text} ${unit}` : text;
}

/** Add the plausibility bound `b` to a number schema (|v| ≤ max when `symmetric`). */
function within<T extends z.ZodType<number>>(schema: T, b: Bound, symmetric = false): T {
  const hint = (beyond: string) => `our plausibility bound: no real electrolyser ${beyond} it; check the unit`;
  let out = schema.refine((v) => (symmetric ? Math.abs(v) : v) <= b.max, {
    message: symmetric
      ? `must be between ${boundText(-b.max, b.unit)} and ${boundText(b.max, b.unit)} (${hint('goes beyond')})`
      : `must be ≤ ${boundText(b.max, b.unit)} (${hint('exceeds')})`,
  });
  if (b.min !== undefined) {
    const min = b.min;
    out = out.refine((v) => v >= min, { message: `must be ≥ ${boundText(min, b.unit)} (${hint('goes below')})` });
  }
  return out as unknown as T;
}

const B = PLAUSIBILITY_BOUNDS;
const temperatureK = within(positive, B.temperature);
const exchangeCurrentDensity = within(positive, B.exchangeCurrentDensity);
const transferCoefficient = within(positive, B.transferCoefficient);
const activationEnergy = within(finite, B.activationEnergy, true);
const currentDensity = within(positive, B.currentDensity);
const thickness = within(nonNegative, B.thickness);
const thicknessPositive = within(positive, B.thickness);
const conductivity = within(positive, B.conductivity);
const areaResistance = within(nonNegative, B.areaResistance);
const molality = within(positive, B.molality);

const uncertaintySchema = z.object({
  lnExchangeCurrentDensitySE: nonNegative,
  transferCoefficientSE: nonNegative,
  correlation: finite.refine((v) => v >= -1 && v <= 1, 'must be in [−1, 1]'),
});

const tafelSchema = z.object({
  model: z.literal('tafel'),
  exchangeCurrentDensity,
  transferCoefficient,
  referenceTemperature: temperatureK.optional(),
  activationEnergy: activationEnergy.optional(),
  uncertainty: uncertaintySchema.optional(),
});

const butlerVolmerSchema = z.object({
  model: z.literal('butler-volmer'),
  exchangeCurrentDensity,
  anodicTransferCoefficient: transferCoefficient,
  cathodicTransferCoefficient: transferCoefficient,
  referenceTemperature: temperatureK.optional(),
  activationEnergy: activationEnergy.optional(),
  uncertainty: uncertaintySchema.optional(),
});

export const kineticsSchema = z.discriminatedUnion('model', [tafelSchema, butlerVolmerSchema]);

const electrodeSchema = z.object({
  kinetics: kineticsSchema,
  limitingCurrentDensity: currentDensity.optional(),
  // 1–8 electrons per reacting molecule (O₂ needs 4; 8 is our plausibility bound).
  electrons: z.number().int().min(1).max(8).optional(),
});

const gapSchema = z.object({
  thickness,
  conductivity: conductivity.optional(),
  electrolyte: z.enum(['KOH', 'NaOH', 'NaCl']).optional(),
  concentration: molality.optional(),
  voidFraction: finite.refine((v) => v >= 0 && v < 1, 'must be in [0, 1)').optional(),
  voidModel: z.enum(['bruggeman', 'maxwell']).optional(),
});

const membraneSchema = z.union([
  z.strictObject({
    areaResistance,
    referenceTemperature: temperatureK.optional(),
    activationEnergy: activationEnergy.optional(),
  }),
  z.strictObject({ thickness, conductivity }),
  z.strictObject({ springer: z.strictObject({ thickness, waterContent: within(positive, B.waterContent) }) }),
], {
  error: 'give one of { areaResistance [Ω·m²], referenceTemperature? [K], activationEnergy? [J/mol] }, { thickness [m], conductivity [S/m] } or { springer: { thickness [m], waterContent [λ] } }',
});

const currentEfficiencySchema = z.discriminatedUnion('model', [
  z.object({ model: z.literal('constant'), value: fraction01 }),
  z.object({ model: z.literal('parasitic'), currentDensity: within(nonNegative, B.currentDensity) }),
  z.object({
    model: z.literal('competing'),
    sideReaction: z.object({ kinetics: kineticsSchema, equilibriumPotentialShift: within(finite, B.potential, true) }),
  }),
  z.object({ model: z.literal('crossover'), hydrogenPermeability: within(nonNegative, B.permeability), membraneThickness: thicknessPositive }),
]);

export const cellDefinitionSchema = z
  .object({
    chemistry: z.enum(['chlor-alkali', 'alkaline-water', 'pem-water']),
    temperature: temperatureK,
    pressure: within(positive, B.pressure),
    composition: z
      .object({ brineNaCl: molality.optional(), causticNaOH: molality.optional(), koh: molality.optional() })
      .optional(),
    reversiblePotential: within(positive, B.potential).optional(),
    anode: electrodeSchema,
    cathode: electrodeSchema,
    ohmic: z.object({
      membrane: membraneSchema.optional(),
      // At most 20 gap layers (our plausibility bound).
      gaps: z.array(gapSchema).max(20).optional(),
      hardware: areaResistance.optional(),
    }),
    currentEfficiency: currentEfficiencySchema.optional(),
    currentDensities: z.array(currentDensity).min(1).max(MAX_SWEEP_POINTS),
    rectifierEfficiency: fraction01.optional(),
    designCurrentDensity: currentDensity.optional(),
    kFactorRange: z.tuple([currentDensity, currentDensity]).optional(),
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
