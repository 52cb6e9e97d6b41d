/**
 * The bridge between the cell model and the plant calculations (sizing, shunt currents,
 * coatings, costs): where the plant gets its cell from.
 *
 * A cell source is either
 *   - plant data: `{ "linear": { "intercept": U0 [V], "slope": K [V per A/m² = Ω·m²] } }`, the
 *     chlor-alkali trade's K-factor line U = U0 + K·j, with a constant current efficiency given
 *     beside it; or
 *   - a cell definition (the same SI shape as `POST /api/v1/cell/sweep` and the study's `cell`
 *     section), evaluated point by point with the cell core (`cellModelEvaluator`).
 *
 * `toCellPerformance` turns either into the plant core's `CellPerformance`. Error paths are
 * prefixed with the caller's `path` (e.g. `cell.anode.kinetics.exchangeCurrentDensity`), so a
 * bad field inside a nested cell definition is named exactly in the 400 answer.
 */
import { z } from 'zod';
import { InputError, PhysicsError, type IssueDetail } from '../core/errors.js';
import { cellDefinitionSchema, cellModelEvaluator } from '../core/cell/index.js';
import type { CellDefinition, ProductId } from '../core/cell/types.js';
import type { CellPerformance, PlantChemistry } from '../core/plant/index.js';
import { finite } from '../scenario/numbers.js';


/** The K-factor line of plant data, SI: U0 [V] > 0, K [V per A/m²] ≥ 0. */
export const linearCellSchema = z.strictObject({
  linear: z.strictObject({
    /** U0, V. */
    intercept: finite.refine((v) => v > 0, 'must be a voltage > 0 V'),
    /** K, V per A/m² (Ω·m²); 0.1 V per kA/m² = 1e-4 V per A/m². */
    slope: finite.refine((v) => v >= 0, 'must be a slope ≥ 0 V per A/m²'),
  }),
});

export type LinearCellSource = z.infer<typeof linearCellSchema>;
export type CellSource = LinearCellSource | CellDefinition;

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

/**
 * zod schema of a cell source: `{ linear: { intercept, slope } }` or a cell definition. The
 * branch is chosen by the presence of the key `linear`, so the issues name the fields of the
 * branch the caller meant (a plain union would only say "invalid input").
 */
export const cellSourceSchema = z.unknown().transform((raw, ctx): CellSource => {
  if (!isRecord(raw)) {
    ctx.addIssue({ code: 'custom', message: 'must be an object: { "linear": { "intercept", "slope" } } or a cell definition', input: raw });
    return z.NEVER;
  }
  const schema = 'linear' in raw ? linearCellSchema : cellDefinitionSchema;
  const parsed = schema.safeParse(raw);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) ctx.addIssue({ ...issue } as Parameters<typeof ctx.addIssue>[0]);
    return z.NEVER;
  }
  return parsed.data as CellSource;
});

/** True for the plant-data (K-factor line) source. */
export function isLinearSource(source: CellSource): source is LinearCellSource {
  return 'linear' in source;
}

/** The plant core's chemistry for a study or cell chemistry id (both water kinds → 'water'). */
export function plantChemistryOf(chemistry: 'chlor-alkali' | 'alkaline-water' | 'pem-water' | 'water'): PlantChemistry {
  return chemistry === 'chlor-alkali' ? 'chlor-alkali' : 'water';
}

function prefixed(path: string, issues: IssueDetail[]): IssueDetail[] {
  return issues.map((i) => ({ path: path ? (i.path && i.path !== '(body)' ? `${path}.${i.path}` : path) : i.path, message: i.message }));
}

/** Re-throw an InputError or PhysicsError from the cell core with paths under `path`. */
function rethrowUnder(path: string, err: unknown): never {
  if (err instanceof InputError) {
    const issues = prefixed(path, err.issues);
    throw InputError.many(`${path}: ${err.message}`, issues);
  }
  if (err instanceof PhysicsError) {
    const [first] = prefixed(path, err.issues);
    throw new PhysicsError(first?.path ?? path, first?.message ?? err.message);
  }
  throw err;
}

/**
 * The plant core's CellPerformance for a cell source.
 *
 * - Linear source: U = U0 + K·j with `currentEfficiency` (required, 0 < CE ≤ 1) held constant.
 * - Cell definition: voltage, heat load and U_tn from the cell model (cell core, prepared once);
 *   current efficiency of `product` (default the main product: Cl2, or H2 for water) from the
 *   model's own current-efficiency model, unless `currentEfficiency` is given, which then
 *   overrides it as a constant.
 * Errors: InputError/PhysicsError with paths under `path` (e.g. `cell.anode…`, or
 * `currentEfficiency` when it is missing or outside (0, 1]).
 */
export function toCellPerformance(source: CellSource, currentEfficiency: number | undefined, path: string, product?: ProductId): CellPerformance {
  if (currentEfficiency !== undefined && !(Number.isFinite(currentEfficiency) && currentEfficiency > 0 && currentEfficiency <= 1)) {
    throw new InputError('currentEfficiency', 'must be in (0, 1]', currentEfficiency);
  }
  if (isLinearSource(source)) {
    if (currentEfficiency === undefined) {
      throw new InputError('currentEfficiency', 'is required with plant data (a linear cell): a fraction in (0, 1]');
    }
    return { kind: 'linear', intercept: source.linear.intercept, slope: source.linear.slope, currentEfficiency };
  }
  let model: ReturnType<typeof cellModelEvaluator>;
  try {
    model = cellModelEvaluator(source, product);
  } catch (err) {
    rethrowUnder(path, err);
  }
  return {
    kind: 'model',
    thermoneutralVoltage: model.thermoneutralVoltage,
    evaluate(currentDensity: number) {
      try {
        const out = model.evaluate(currentDensity);
        return currentEfficiency === undefined ? out : { ...out, currentEfficiency };
      } catch (err) {
        rethrowUnder(path, err);
      }
    },
  };
}

