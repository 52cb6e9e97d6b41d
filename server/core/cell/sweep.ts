/**
 * Polarization sweep of a cell: voltage balance, current efficiency, production, specific
 * energy, voltage efficiency and heat load at each current density, the K-factor line and the
 * design point (domain.md §5, §7, §8).
 *
 *   production rate of product p      ṁ_p = CE_p·j·M_p/(z_p F)          [kg/(m²·s)]
 *   DC specific energy                w_p = U·z_p F/(CE_p M_p)           [J/kg]
 *   AC specific energy                w_p / η_rectifier                  [J/kg]
 *   voltage efficiency (water)        U_HHV°/U and U_LHV°/U (25 °C, 1 bar heating values)
 *   heat load                         (U − U_tn)·j                       [W/m²]
 *   K-factor                          least-squares line U = U0 + K·j over the operating range
 *
 * Sources: Faraday's law; specific energy and the K-factor as in domain.md §5 and §8 (the
 * K-factor is the chlor-alkali trade's summary, common practice). The heat load uses the
 * thermoneutral voltage of the main reaction, i.e. it treats all current as going to the main
 * reaction (side reactions' enthalpies are not separated).
 */
import { FARADAY } from '../constants.js';
import { InputError } from '../errors.js';
import { linearLeastSquares } from '../numerics/index.js';
import { prepareCell, voltageBalance, type BalanceFlags, type PreparedCell } from './balance.js';
import { currentEfficiencyAt, gasPurityWarnings } from './efficiency.js';
import type { CellDefinition, CellSweepResult, KFactorResult, ProductId, SweepPoint } from './types.js';

/**
 * Fraction of the largest swept current density where the default K-factor range starts
 * (1/3: project choice; fitting K over the linear upper part of the curve is common practice).
 */
export const K_FACTOR_DEFAULT_LOWER_FRACTION = 1 / 3;
/** Fewest points for a K-factor line with a standard error (n − 2 ≥ 1). */
export const K_FACTOR_MIN_POINTS = 3;

/** Evaluation of one point plus the flags the sweep aggregates into warnings. */
export interface EvaluatedPoint {
  point: SweepPoint;
  flags: BalanceFlags;
}

/**
 * Full result at one current density j [A/m²] of a prepared cell (balance, CE, production,
 * specific energy, efficiency, heat). `path` names j in error messages. Throws PhysicsError
 * where the models have no solution (limiting current, no net production).
 */
export function evaluatePoint(cell: PreparedCell, j: number, path: string): EvaluatedPoint {
  const bal = voltageBalance(cell, j, path);
  const ctx: Parameters<typeof currentEfficiencyAt>[1] = {
    chemistry: cell.chemistry,
    hydrogenPartialPressure: cell.hydrogenPartialPressure,
  };
  if (bal.sideCurrentDensity !== undefined) ctx.sideCurrentDensity = bal.sideCurrentDensity;
  const ce = currentEfficiencyAt(cell.definition.currentEfficiency, ctx, j, path);
  const U = bal.breakdown.total;
  const productionRate: Partial<Record<ProductId, number>> = {};
  for (const p of cell.products) {
    const eff = ce.byProduct[p.id] ?? 1;
    productionRate[p.id] = (eff * j * p.molarMass) / (p.electronsPerMolecule * FARADAY.value);
  }
  const specificEnergy: Partial<Record<ProductId, number>> = {};
  for (const id of cell.energyProducts) {
    const p = cell.products.find((q) => q.id === id);
    if (!p) continue;
    const eff = ce.byProduct[id] ?? 1;
    specificEnergy[id] = (U * p.electronsPerMolecule * FARADAY.value) / (eff * p.molarMass);
  }
  const b = bal.breakdown;
  const point: SweepPoint = {
    currentDensity: j,
    cellVoltage: U,
    anodeOverpotential: b.anode,
    cathodeOverpotential: b.cathode,
    massTransportOverpotential: b.massTransport,
    ohmicDrop: b.ohmicDrop,
    breakdown: b,
    currentEfficiency: ce,
    productionRate,
    specificEnergy,
    heatLoad: (U - cell.thermoneutralVoltage) * j,
  };
  const eta = cell.definition.rectifierEfficiency;
  if (eta !== undefined) {
    const ac: Partial<Record<ProductId, number>> = {};
    for (const [id, w] of Object.entries(specificEnergy) as [ProductId, number][]) ac[id] = w / eta;
    point.specificEnergyAC = ac;
  }
  if (cell.heatingValueVoltages) {
    point.voltageEfficiency = { hhv: cell.heatingValueVoltages.hhv / U, lhv: cell.heatingValueVoltages.lhv / U };
  }
  return { point, flags: bal.flags };
}

/**
 * K-factor line U = U0 + K·j fitted by least squares (numerics/linearLeastSquares, QR) to the
 * points with j in `range` [A/m²] (inclusive). Returns undefined, with a warning, when fewer than
 * K_FACTOR_MIN_POINTS distinct current densities fall in the range.
 * K in V/(A/m²) = Ω·m² (×1000 for the trade's V per kA/m²). Source: domain.md §5 (common practice).
 */
export function kFactorLine(points: SweepPoint[], range: [number, number], warnings: string[]): KFactorResult | undefined {
  const used = points.filter((p) => p.currentDensity >= range[0] && p.currentDensity <= range[1]);
  const distinct = new Set(used.map((p) => p.currentDensity)).size;
  if (distinct < K_FACTOR_MIN_POINTS) {
    warnings.push(
      `K-factor not computed: ${distinct} distinct current density(ies) in the range ${range[0]}–${range[1]} A/m²; at least ${K_FACTOR_MIN_POINTS} are needed`,
    );
    return undefined;
  }
  const fit = linearLeastSquares(
    used.map((p) => [1, p.currentDensity]),
    used.map((p) => p.cellVoltage),
  );
  for (const w of fit.warnings) warnings.push(`K-factor fit: ${w}`);
  return {
    value: fit.coefficients[1],
    standardError: fit.standardErrors[1],
    intercept: fit.coefficients[0],
    interceptStandardError: fit.standardErrors[0],
    rSquared: fit.rSquared,
    range: [range[0], range[1]],
    pointsUsed: used.length,
  };
}

function describeFlags(role: string, js: number[], kind: 'below' | 'near'): string {
  const lo = Math.min(...js);
  const hi = Math.max(...js);
  const where = js.length === 1 ? `j = ${lo} A/m²` : `${js.length} points, j = ${lo}–${hi} A/m²`;
  return kind === 'below'
    ? `${role}: the Tafel line was used at or below its exchange current density (${where}); its activation overpotential is set to 0 there. Use Butler–Volmer kinetics at such low current densities.`
    : `${role}: the Tafel line was used within one decade above its exchange current density (${where}), where the back reaction is not negligible (common practice); Butler–Volmer kinetics are more accurate there.`;
}

/** Collects flags over points into one warning per kind and electrode. */
function aggregateFlags(evaluated: { j: number; flags: BalanceFlags }[]): string[] {
  const out: string[] = [];
  for (const role of ['anode', 'cathode'] as const) {
    const below = evaluated.filter((e) => e.flags.tafelBelowExchange.includes(role)).map((e) => e.j);
    const near = evaluated.filter((e) => e.flags.tafelNearExchange.includes(role)).map((e) => e.j);
    if (below.length > 0) out.push(describeFlags(role, below, 'below'));
    if (near.length > 0) out.push(describeFlags(role, near, 'near'));
  }
  return out;
}

/**
 * Sweep a cell over `def.currentDensities` (see the file header). Validates the definition
 * (InputError with field paths), computes E_rev, U_tn and all resistances once, then each
 * point. Throws PhysicsError naming `currentDensities[i]` (or `designCurrentDensity`) where a
 * point has no solution, e.g. j at or above a limiting current.
 */
export function sweepCell(def: CellDefinition): CellSweepResult {
  const cell = prepareCell(def);
  return sweepPrepared(cell);
}

/** Sweep of an already prepared cell (see sweepCell). */
export function sweepPrepared(cell: PreparedCell): CellSweepResult {
  const def = cell.definition;
  const warnings = [...cell.warnings];
  const evaluated = def.currentDensities.map((j, i) => evaluatePoint(cell, j, `currentDensities[${i}]`));
  const points = evaluated.map((e) => e.point);
  const flagged = evaluated.map((e) => ({ j: e.point.currentDensity, flags: e.flags }));

  let designPoint: SweepPoint | undefined;
  if (def.designCurrentDensity !== undefined) {
    const d = evaluatePoint(cell, def.designCurrentDensity, 'designCurrentDensity');
    designPoint = d.point;
    flagged.push({ j: d.point.currentDensity, flags: d.flags });
  }
  warnings.push(...aggregateFlags(flagged));
  const purityPoints = points.map((p) => ({ currentDensity: p.currentDensity, ce: p.currentEfficiency }));
  if (designPoint) purityPoints.push({ currentDensity: designPoint.currentDensity, ce: designPoint.currentEfficiency });
  warnings.push(...gasPurityWarnings(purityPoints));

  const jMax = def.currentDensities.reduce((a, b) => (b > a ? b : a), 0);
  const range: [number, number] = def.kFactorRange ?? [K_FACTOR_DEFAULT_LOWER_FRACTION * jMax, jMax];
  const kFactor = kFactorLine(points, range, warnings);

  const result: CellSweepResult = {
    chemistry: cell.chemistry,
    reversiblePotential: cell.reversiblePotential,
    reversiblePotentialSource: cell.reversiblePotentialSource,
    thermoneutralVoltage: cell.thermoneutralVoltage,
    resistances: { ...cell.resistances, gaps: [...cell.resistances.gaps] },
    exchangeCurrentDensities: {
      anode: cell.anode.kinetics.exchangeCurrentDensity,
      cathode: cell.cathode.kinetics.exchangeCurrentDensity,
    },
    points,
    warnings: [...new Set(warnings)],
  };
  if (cell.sideReaction) result.exchangeCurrentDensities.sideReaction = cell.sideReaction.kinetics.exchangeCurrentDensity;
  if (cell.lhvThermoneutralVoltage !== undefined) result.lhvThermoneutralVoltage = cell.lhvThermoneutralVoltage;
  if (kFactor) result.kFactor = kFactor;
  if (designPoint) result.designPoint = designPoint;
  return result;
}

/**
 * The cell as a function of current density for plant calculations (sizing, costs): prepares
 * the definition once and returns `evaluate(j)` → cell voltage [V], current efficiency of
 * `product` [0–1] (default the chemistry's main product: Cl2, or H2 for water) and heat load
 * [W/m²], with the thermoneutral voltage [V]. Errors as evaluatePoint (path `currentDensity`).
 */
export function cellModelEvaluator(
  def: CellDefinition,
  product?: ProductId,
): {
  product: ProductId;
  thermoneutralVoltage: number;
  evaluate: (currentDensity: number) => { cellVoltage: number; currentEfficiency: number; heatLoadPerArea: number };
} {
  const cell = prepareCell(def);
  const id: ProductId = product ?? (cell.chemistry === 'chlor-alkali' ? 'Cl2' : 'H2');
  if (!cell.products.some((p) => p.id === id)) {
    throw new InputError('product', `${id} is not a product of ${cell.chemistry}`, id);
  }
  return {
    product: id,
    thermoneutralVoltage: cell.thermoneutralVoltage,
    evaluate(currentDensity: number) {
      if (!(Number.isFinite(currentDensity) && currentDensity > 0)) {
        throw new InputError('currentDensity', 'must be a finite number > 0 A/m²', currentDensity);
      }
      const { point } = evaluatePoint(cell, currentDensity, 'currentDensity');
      return {
        cellVoltage: point.cellVoltage,
        currentEfficiency: point.currentEfficiency.byProduct[id] ?? 1,
        heatLoadPerArea: point.heatLoad,
      };
    },
  };
}
