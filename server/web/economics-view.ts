/**
 * Coatings and Costs: from the SI request (API body or study section) to the plant core and
 * back, plus the page forms (engineers' units), view-models, chart configurations and CSV.
 *
 * No physics here beyond unit conversion and wiring: cost balance, economic current density,
 * tornado and coating comparison are the plant core's (server/core/plant/); kinetics fits are
 * the kinetics core's; the cell comes through the shared bridge ./cell-source.ts.
 */
import { Decimal } from 'decimal.js';
import Papa from 'papaparse';
import { ZodError } from 'zod';
import { InputError, PhysicsError, type IssueDetail } from '../core/errors.js';
import {
  CHEMISTRY_SPECS,
  JOULES_PER_KWH,
  KG_PER_TONNE,
  PRODUCT_SPECS,
  SECONDS_PER_HOUR,
  closedFormEconomicCurrentDensity,
  compareCoatings,
  costSensitivity,
  economicCurrentDensity,
  electrochemicalEquivalent,
  evaluateCell,
  money,
  productionCost,
  roundMoney,
  type CellPerformance,
  type CostBreakdown,
  type CostInput,
  type ProductId,
} from '../core/plant/index.js';
import { fitKinetics, tafelSlopePerDecade } from '../core/kinetics/index.js';
import type { CellDefinition, ChemistryId, ElectrodeKinetics } from '../core/cell/types.js';
import { kelvinToCelsius } from '../core/units.js';
import {
  MAX_COATING_OPTIONS,
  MIN_COATING_OPTIONS,
  coatingsRequestSchema,
  costRequestSchema,
  type CoatingOptionRequest,
  type CoatingsRequest,
  type CostRequest,
  type ElectrodeSwap,
  type PlantSize,
} from '../scenario/economics-sections.js';
import type { Dataset, SavedFit, Study } from '../scenario/schema.js';
import { cellSourceSchema, isLinearSource, plantChemistryOf, toCellPerformance, type CellSource } from './cell-source.js';
import { zodIssues } from './errors.js';
import { assertFiniteTree } from './validate.js';

// =============================================================================================
// Shared pieces
// =============================================================================================

/** MWh per kWh, exact: the page takes electricity in currency per MWh, the core per kWh. */
const KWH_PER_MWH = 1000;
/** Percent per unit fraction, exact. */
const PERCENT = 100;
/** A/m² per kA/m², exact. */
const A_PER_KA = 1000;
/** mV per V, exact. */
const MV_PER_V = 1000;
/** Joules per MWh, exact (1 MWh = 3.6e9 J). */
const JOULES_PER_MWH = JOULES_PER_KWH * KWH_PER_MWH;
/** Temperature gap between a kinetic dataset and the cell above which we warn, K (project choice). */
const TEMPERATURE_WARN_K = 1;

function dec(x: number | string): Decimal {
  return new Decimal(x);
}

/** Re-throw a core error with its paths under `path`. */
function rethrowUnder(path: string, err: unknown): never {
  const prefix = (p: string) => (p && p !== '(body)' ? `${path}.${p}` : path);
  if (err instanceof PhysicsError) throw new PhysicsError(prefix(err.issues[0]?.path ?? ''), err.issues[0]?.message ?? err.message);
  if (err instanceof InputError) {
    const issues = err.issues.map((i) => ({ path: prefix(i.path), message: i.message }));
    throw InputError.many(`${path}: ${err.message}`, issues);
  }
  throw err;
}

/** The chemistry of a request: the cell definition's, else the request's, else the study's. */
function resolveChemistry(requested: ChemistryId | undefined, source: CellSource | undefined, study: Study | undefined): ChemistryId | undefined {
  if (source && !isLinearSource(source)) {
    if (requested && requested !== source.chemistry) {
      throw new InputError('chemistry', `is ${requested} but the cell definition is ${source.chemistry}`);
    }
    return source.chemistry;
  }
  return requested ?? study?.chemistry;
}

/** Products a chemistry makes (plant core's table). */
export function productsOf(chemistry: ChemistryId | undefined): ProductId[] {
  if (!chemistry) return ['Cl2', 'NaOH', 'H2', 'O2'];
  return [...CHEMISTRY_SPECS[plantChemistryOf(chemistry)].products];
}

function checkProduct(product: ProductId, chemistry: ChemistryId | undefined): void {
  const allowed = productsOf(chemistry);
  if (!allowed.includes(product)) throw new InputError('product', `${product} is not a product of ${chemistry}; choose one of ${allowed.join(', ')}`);
}

/** The study's cell section as a cell source, or undefined when it has none. */
export function studyCellSource(study: Study | undefined): CellSource | undefined {
  const raw = study?.cell;
  if (raw === undefined || raw === null || (typeof raw === 'object' && Object.keys(raw).length === 0)) return undefined;
  const parsed = cellSourceSchema.safeParse(raw);
  if (!parsed.success) {
    const issues = zodIssues(parsed.error).map((i) => ({ path: `cell.${i.path}`, message: i.message }));
    throw InputError.many(`The study's cell definition is not valid; fix it on the Cell page (${issues.map((i) => `${i.path}: ${i.message}`).join('; ')})`, issues);
  }
  return parsed.data;
}

/** Mass basis of money and energy on pages: per tonne, except hydrogen per kg (trade habit). */
export interface MassBasis {
  /** kg in one basis unit. */
  kg: number;
  /** 't' or 'kg'. */
  unit: 't' | 'kg';
}
export function massBasisOf(product: ProductId): MassBasis {
  return product === 'H2' ? { kg: 1, unit: 'kg' } : { kg: KG_PER_TONNE, unit: 't' };
}

/** Money per kg → rounded display per basis (decimal, half-up, 2 places). */
function moneyPerBasis(perKg: number, basis: MassBasis): string {
  return roundMoney(money(perKg).times(basis.kg), 2);
}

/** Narrow no-break space: groups thousands on pages (SI style, no locale comma/point clash). */
const GROUP = '\u202f';

/** Group the integer digits of a rounded decimal string in threes: "-4317670.80" → "-4 317 670.80". */
export function grouped(text: string): string {
  const m = /^(-?)(\d+)(\.\d+)?$/.exec(text);
  if (!m) return text;
  return `${m[1]}${m[2].replace(/\B(?=(\d{3})+(?!\d))/g, GROUP)}${m[3] ?? ''}`;
}

/** J/kg → kWh per basis unit. */
function energyPerBasis(jPerKg: number, basis: MassBasis): number {
  return dec(jPerKg).times(basis.kg).div(JOULES_PER_KWH).toNumber();
}

/** Formula-safe CSV (cells starting with = + @ or a non-numeric '-' are prefixed with '). */
export function toCsv(blocks: Array<Array<Array<string | number>>>): string {
  return (
    blocks
      .map((rows) => Papa.unparse(rows, { newline: '\r\n', escapeFormulae: /^(?:[=+@\t\r]|-(?![\d.]))/ }))
      .join('\r\n\r\n') + '\r\n'
  );
}

/** File name for a download from a study name. */
export function downloadName(prefix: string, studyName: string): string {
  const slug = studyName.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 50) || 'study';
  return `${prefix}-${slug}.csv`;
}

// =============================================================================================
// Cost study: POST /api/v1/plant/cost
// =============================================================================================

export interface CostPointOut {
  /** A/m². */
  currentDensity: number;
  /** V. */
  cellVoltage: number;
  /** 0–1. */
  currentEfficiency: number;
  /** J/kg. */
  specificEnergy: number;
  /** currency/kg. */
  energyCost: number;
  capitalCost: number;
  totalCost: number;
}

export interface CostDisplayOut {
  energyPerTonne: string;
  capitalPerTonne: string;
  totalPerTonne: string;
}

export interface ClosedFormOut {
  /** j* = √(C·CRF/(p·K·H)), A/m². */
  economicCurrentDensity: number;
  formula: string;
  /** The inputs in one consistent (SI) set of units. */
  inputs: {
    C: { value: number; unit: string; meaning: string };
    CRF: { value: number; unit: string; meaning: string };
    p: { value: number; unit: string; meaning: string };
    K: { value: number; unit: string; meaning: string };
    H: { value: number; unit: string; meaning: string };
  };
  insideSearchRange: boolean;
  /** (closed form − numeric)/numeric. */
  relativeDifference: number;
}

export interface SensitivityRowOut {
  parameter: string;
  label: string;
  low: { value: number; totalPerTonne: number; display: string };
  high: { value: number; totalPerTonne: number; display: string };
  swing: number;
  note?: string;
}

export interface CostResponse {
  product: ProductId;
  chemistry: ChemistryId | null;
  cell: { kind: 'linear' | 'model'; origin: 'request' | 'study' };
  currency: string;
  capitalRecoveryFactor: number;
  economicCurrentDensity: number;
  optimum: CostPointOut & { status: string; message: string; display: CostDisplayOut };
  closedForm: ClosedFormOut | null;
  closedFormNote: string;
  design: (CostPointOut & { display: CostDisplayOut; extraCostFraction: number }) | null;
  searchRange: { min: number; max: number };
  points: CostPointOut[];
  sensitivity: SensitivityRowOut[];
  sensitivityBasis: { currentDensity: number; basis: 'design' | 'economic'; fraction: number; baseTotalPerTonne: number; baseDisplay: string };
  units: Record<string, string>;
  warnings: string[];
}

function pointOut(c: CostBreakdown): CostPointOut {
  return {
    currentDensity: c.currentDensity,
    cellVoltage: c.cellVoltage,
    currentEfficiency: c.currentEfficiency,
    specificEnergy: c.specificEnergy,
    energyCost: c.energyCost,
    capitalCost: c.capitalCost,
    totalCost: c.totalCost,
  };
}

function displayOut(d: { energyPerTonne: string; capitalPerTonne: string; totalPerTonne: string }): CostDisplayOut {
  return { energyPerTonne: d.energyPerTonne, capitalPerTonne: d.capitalPerTonne, totalPerTonne: d.totalPerTonne };
}

/** Default ±fraction of the tornado (±20 %, from the page design). */
export const DEFAULT_SENSITIVITY_FRACTION = 0.2;

/**
 * Run a validated cost request: cost per kg at each current density, the economic current
 * density (numeric; closed form beside it for a linear cell) and the tornado at ±fraction.
 * The cell defaults to the study's cell definition. Throws InputError/PhysicsError with paths.
 */
/** The cost core names its inputs in its own words; answer with the request's field names. */
const COST_PATHS: Record<string, string> = {
  energyPrice: 'electricityPrice',
  lifeYears: 'lifetime',
  operatingHoursPerYear: 'operatingHours',
  currentDensityRange: 'currentDensities',
  designCurrentDensity: 'designCurrentDensity',
};

function withRequestPaths<T>(run: () => T): T {
  try {
    return run();
  } catch (err) {
    if (err instanceof InputError || err instanceof PhysicsError) {
      const fix = (p: string) => p.replace(/^[A-Za-z]+/, (head) => COST_PATHS[head] ?? head);
      const issues = err.issues.map((i) => ({ path: fix(i.path), message: i.message }));
      const message = err.message.replace(/^[A-Za-z]+/, (head) => COST_PATHS[head] ?? head);
      if (err instanceof PhysicsError) throw new PhysicsError(issues[0]?.path ?? 'cell', issues[0]?.message ?? message);
      throw InputError.many(message, issues);
    }
    throw err;
  }
}

export function runCostStudy(request: CostRequest, study?: Study): CostResponse {
  const fromStudy = request.cell === undefined;
  const source = request.cell ?? studyCellSource(study);
  if (!source) {
    throw new InputError('cell', 'is required: plant data { "linear": { "intercept", "slope" } } with a currentEfficiency, or a cell definition (or open a study that has one)');
  }
  const chemistry = resolveChemistry(request.chemistry, source, study);
  checkProduct(request.product, chemistry);
  const performance = toCellPerformance(source, request.currentEfficiency, 'cell', request.product);
  const lo = Math.min(...request.currentDensities);
  const hi = Math.max(...request.currentDensities);
  const searchRange = request.searchRange ?? { min: lo, max: hi };
  const input: CostInput = {
    product: request.product,
    cell: performance,
    energyPrice: request.electricityPrice,
    capitalCostPerArea: request.capitalCostPerArea,
    operatingHoursPerYear: request.operatingHours,
    discountRate: request.discountRate,
    lifeYears: request.lifetime,
    currentDensityRange: searchRange,
  };
  if (request.designCurrentDensity !== undefined) input.designCurrentDensity = request.designCurrentDensity;

  const eco = withRequestPaths(() => economicCurrentDensity(input));
  const warnings = [...eco.warnings];
  const points = request.currentDensities.map((j, k) => {
    try {
      return pointOut(productionCost(input, j));
    } catch (err) {
      rethrowUnder(`currentDensities[${k}]`, err);
    }
  });

  let closedForm: ClosedFormOut | null = null;
  let closedFormNote: string;
  const value = performance.kind === 'linear' && performance.slope > 0 ? closedFormEconomicCurrentDensity(input) : null;
  if (performance.kind === 'linear' && value !== null && Number.isFinite(value) && value > 0) {
    closedForm = {
      economicCurrentDensity: value,
      formula: 'j* = √(C·CRF / (p·K·H))',
      inputs: {
        C: { value: request.capitalCostPerArea, unit: 'currency/m²', meaning: 'installed capital per m² of active area' },
        CRF: { value: eco.capitalRecoveryFactor, unit: '1/yr', meaning: `capital recovery factor at ${dec(request.discountRate).times(PERCENT).toString()} % over ${request.lifetime} yr` },
        p: { value: dec(request.electricityPrice).div(JOULES_PER_KWH).toNumber(), unit: 'currency/J', meaning: 'electricity price (per kWh ÷ 3.6e6 J/kWh)' },
        K: { value: performance.slope, unit: 'Ω·m² (V per A/m²)', meaning: 'K-factor, slope of the cell line' },
        H: { value: dec(request.operatingHours).times(SECONDS_PER_HOUR).toNumber(), unit: 's/yr', meaning: 'operating time per year (h/yr × 3600 s/h)' },
      },
      insideSearchRange: value >= searchRange.min && value <= searchRange.max,
      relativeDifference: (value - eco.currentDensity) / eco.currentDensity,
    };
    closedFormNote = 'Linear cell with constant current efficiency: U0 and CE drop out, and the numeric optimum should match the closed form.';
    if (!closedForm.insideSearchRange) warnings.push('The closed-form economic current density lies outside the searched range.');
  } else if (performance.kind === 'linear' && performance.slope > 0) {
    // A K-factor so near 0 (or prices so extreme) that √(C·CRF/(p·K·H)) leaves the float range.
    closedFormNote = 'The closed form j* = √(C·CRF/(p·K·H)) is out of numeric range for these inputs (K-factor near 0); the optimum is found numerically only.';
  } else if (performance.kind === 'linear') {
    closedFormNote = 'K = 0: with no resistive rise the cost falls with current density without limit; no closed form.';
  } else {
    closedFormNote = 'The closed form applies to a linear cell (U = U0 + K·j, constant CE); for the cell model the optimum is found numerically only.';
  }

  let design: CostResponse['design'] = null;
  if (eco.design) {
    design = { ...pointOut(eco.design.cost), display: displayOut(eco.design.display), extraCostFraction: eco.design.cost.totalCost / eco.cost.totalCost - 1 };
  }

  const fraction = request.sensitivityFraction ?? DEFAULT_SENSITIVITY_FRACTION;
  const basisJ = request.designCurrentDensity ?? eco.currentDensity;
  const tornado = withRequestPaths(() => costSensitivity(input, { currentDensity: basisJ, fraction }));

  const response: CostResponse = {
    product: request.product,
    chemistry: chemistry ?? null,
    cell: { kind: performance.kind, origin: fromStudy ? 'study' : 'request' },
    currency: request.currency ?? '',
    capitalRecoveryFactor: eco.capitalRecoveryFactor,
    economicCurrentDensity: eco.currentDensity,
    optimum: { ...pointOut(eco.cost), status: eco.status, message: eco.message, display: displayOut(eco.display) },
    closedForm,
    closedFormNote,
    design,
    searchRange,
    points,
    sensitivity: tornado.rows.map((r) => {
      const row: SensitivityRowOut = { parameter: r.parameter, label: r.label, low: r.low, high: r.high, swing: r.swing };
      if (r.note) row.note = r.note;
      return row;
    }),
    sensitivityBasis: {
      currentDensity: tornado.currentDensity,
      basis: request.designCurrentDensity !== undefined ? 'design' : 'economic',
      fraction: tornado.fraction,
      baseTotalPerTonne: tornado.baseTotalPerTonne,
      baseDisplay: tornado.baseDisplay,
    },
    units: {
      currentDensity: 'A/m²',
      cellVoltage: 'V',
      currentEfficiency: '1',
      specificEnergy: 'J/kg',
      energyCost: 'currency/kg',
      capitalCost: 'currency/kg',
      totalCost: 'currency/kg',
      totalPerTonne: 'currency/t',
      capitalRecoveryFactor: '1/yr',
    },
    warnings: [...new Set(warnings)],
  };
  assertFiniteTree(response, 'cost');
  return response;
}

// =============================================================================================
// Coating comparison: POST /api/v1/plant/compare
// =============================================================================================

/** Kinetics an electrode of an option ends up with, for the page and the API. */
export interface KineticsUsed {
  origin: 'entered' | 'fit' | 'dataset';
  label: string;
  model: 'tafel' | 'butler-volmer';
  /** A/m², at `referenceTemperature` (or the cell temperature). */
  exchangeCurrentDensity: number;
  /** α of the working branch. */
  transferCoefficient: number;
  /** V/decade at the cell temperature, from α. */
  tafelSlope: number;
  referenceTemperature?: number;
  rSquared?: number;
  pointsUsed?: number;
  /** Notes of the fit (window, R², decades), also listed in the response's warnings. */
  warnings?: string[];
}

export interface CoatingOptionOut {
  name: string;
  source: string;
  isBaseline: boolean;
  /** V at the design point, start of life. */
  cellVoltage: number;
  currentEfficiency: number;
  /** J/kg at the start of life. */
  specificEnergy: number;
  averageCellVoltage: number;
  averageSpecificEnergy: number;
  /** J/yr, life average. */
  annualEnergy: number;
  /** J/yr, this option minus the baseline (< 0: uses less). */
  annualEnergyDifference: number;
  annualEnergyCost: number;
  annualSavingVsBaseline: number;
  coatingCapital: number;
  extraCapital: number;
  simplePaybackYears: number | null;
  equivalentAnnualCost: number;
  npvVsBaseline: number;
  lifeYears: number;
  voltageRisePerYear: number;
  pricePerArea: number;
  display: Record<string, string>;
  notes: string[];
  kinetics: { anode?: KineticsUsed; cathode?: KineticsUsed };
}

export interface CompareResponse {
  product: ProductId;
  chemistry: ChemistryId | null;
  currency: string;
  /** A/m². */
  currentDensity: number;
  /** m². */
  activeArea: number;
  plantSizeBasis: 'activeArea' | 'cells' | 'productionRate';
  /** kg/yr, held equal for every option. */
  annualProduction: number;
  baseline: number;
  options: CoatingOptionOut[];
  units: Record<string, string>;
  warnings: string[];
}

/** Working state of one comparison (memoised dataset fits). */
interface CompareContext {
  study: Study | undefined;
  cellTemperature: number | undefined;
  fits: Map<string, { kinetics: ElectrodeKinetics; used: KineticsUsed; warnings: string[] }>;
  warnings: string[];
}

/** Overpotential points of a study dataset (as measured, before iR correction). */
function datasetOverpotentials(d: Dataset, path: string): Array<{ currentDensity: number; overpotential: number }> {
  if (d.potentialKind === 'electrode') {
    if (d.equilibriumPotential === undefined) {
      throw new InputError(path, `dataset "${d.name}" gives electrode potentials without an equilibrium potential; fit it on the Kinetics page and save the fit`);
    }
    const eq = d.equilibriumPotential;
    return d.points.map((p) => ({ currentDensity: p.currentDensity, overpotential: p.potential - eq }));
  }
  return d.points.map((p) => ({ currentDensity: p.currentDensity, overpotential: p.potential }));
}

/**
 * Fit a study dataset on the fly: Tafel line on the electrode's working branch, automatic
 * window, the dataset's known R_u subtracted; j0 referred to the dataset temperature.
 */
function kineticsFromDataset(ctx: CompareContext, id: string, electrode: 'anode' | 'cathode', path: string) {
  const memo = ctx.fits.get(`dataset:${id}`);
  if (memo) return memo;
  const d = ctx.study?.datasets.find((x) => x.id === id);
  if (!d) throw new InputError(path, `the study has no dataset "${id}"`);
  if (d.electrode !== electrode) throw new InputError(path, `dataset "${d.name}" is ${d.electrode} data; choose ${electrode} data`);
  let fit;
  try {
    fit = fitKinetics({
      model: 'tafel',
      points: datasetOverpotentials(d, path),
      temperature: d.temperature,
      window: 'auto',
      uncompensatedResistance: d.uncompensatedResistance,
      electrons: d.electrons,
      branch: electrode === 'anode' ? 'anodic' : 'cathodic',
    });
  } catch (err) {
    rethrowUnder(path, err);
  }
  const alpha = fit.parameters.transferCoefficient?.value;
  const j0 = fit.parameters.exchangeCurrentDensity.value;
  if (alpha === undefined || !(alpha > 0) || !(j0 > 0)) throw new PhysicsError(path, `the Tafel fit of "${d.name}" gave no usable transfer coefficient`);
  const warnings = fit.warnings.map((w) => `${d.name}: ${w}`);
  if (ctx.cellTemperature !== undefined && Math.abs(ctx.cellTemperature - d.temperature) > TEMPERATURE_WARN_K) {
    warnings.push(
      `${d.name} was measured at ${kelvinToCelsius(d.temperature).toFixed(1)} °C but the cell runs at ${kelvinToCelsius(ctx.cellTemperature).toFixed(1)} °C; j0 is used as measured (no activation energy given). Save a fit with Arrhenius data on the Kinetics page for a temperature correction.`,
    );
  }
  const kinetics: ElectrodeKinetics = { model: 'tafel', exchangeCurrentDensity: j0, transferCoefficient: alpha, referenceTemperature: d.temperature };
  const used: KineticsUsed = {
    origin: 'dataset',
    label: `Tafel fit of “${d.name}”`,
    model: 'tafel',
    exchangeCurrentDensity: j0,
    transferCoefficient: alpha,
    tafelSlope: tafelSlopePerDecade(alpha, ctx.cellTemperature ?? d.temperature),
    referenceTemperature: d.temperature,
    rSquared: fit.statistics.rSquared,
    pointsUsed: fit.statistics.points,
    warnings,
  };
  const out = { kinetics, used, warnings };
  ctx.fits.set(`dataset:${id}`, out);
  return out;
}

function kineticsFromSavedFit(ctx: CompareContext, id: string, electrode: 'anode' | 'cathode', path: string) {
  const f: SavedFit | undefined = ctx.study?.fits.find((x) => x.id === id);
  if (!f) throw new InputError(path, `the study has no saved fit "${id}"`);
  if (f.electrode !== electrode) throw new InputError(path, `saved fit "${f.name}" is a ${f.electrode} fit; choose an ${electrode} fit`);
  const value = (name: string): number | undefined => f.parameters[name]?.value;
  const need = (name: string): number => {
    const v = value(name);
    if (v === undefined || !Number.isFinite(v) || v <= 0) throw new InputError(path, `saved fit "${f.name}" has no positive ${name}`);
    return v;
  };
  const j0 = need('exchangeCurrentDensity');
  let kinetics: ElectrodeKinetics;
  let alpha: number;
  if (f.model === 'tafel') {
    alpha = need('transferCoefficient');
    kinetics = { model: 'tafel', exchangeCurrentDensity: j0, transferCoefficient: alpha, referenceTemperature: f.temperature };
  } else {
    const aa = need('anodicTransferCoefficient');
    const ac = need('cathodicTransferCoefficient');
    alpha = electrode === 'anode' ? aa : ac;
    kinetics = { model: 'butler-volmer', exchangeCurrentDensity: j0, anodicTransferCoefficient: aa, cathodicTransferCoefficient: ac, referenceTemperature: f.temperature };
  }
  const limitRaw = value(electrode === 'anode' ? 'anodicLimitingCurrentDensity' : 'cathodicLimitingCurrentDensity');
  const warnings: string[] = [];
  if (ctx.cellTemperature !== undefined && Math.abs(ctx.cellTemperature - f.temperature) > TEMPERATURE_WARN_K) {
    warnings.push(`Saved fit “${f.name}” is at ${kelvinToCelsius(f.temperature).toFixed(1)} °C, the cell at ${kelvinToCelsius(ctx.cellTemperature).toFixed(1)} °C; j0 is used as fitted.`);
  }
  const used: KineticsUsed = {
    origin: 'fit',
    label: `saved fit “${f.name}”`,
    model: f.model,
    exchangeCurrentDensity: j0,
    transferCoefficient: alpha,
    tafelSlope: tafelSlopePerDecade(alpha, ctx.cellTemperature ?? f.temperature),
    referenceTemperature: f.temperature,
    warnings,
  };
  return { kinetics, used, warnings, limitingCurrentDensity: limitRaw !== undefined && Number.isFinite(limitRaw) && limitRaw !== 0 ? Math.abs(limitRaw) : undefined };
}

function kineticsFromEntered(ctx: CompareContext, kinetics: ElectrodeKinetics, electrode: 'anode' | 'cathode'): KineticsUsed {
  const alpha = kinetics.model === 'tafel' ? kinetics.transferCoefficient : electrode === 'anode' ? kinetics.anodicTransferCoefficient : kinetics.cathodicTransferCoefficient;
  const T = ctx.cellTemperature ?? kinetics.referenceTemperature;
  const used: KineticsUsed = {
    origin: 'entered',
    label: 'entered parameters',
    model: kinetics.model,
    exchangeCurrentDensity: kinetics.exchangeCurrentDensity,
    transferCoefficient: alpha,
    tafelSlope: T === undefined ? Number.NaN : tafelSlopePerDecade(alpha, T),
  };
  if (kinetics.referenceTemperature !== undefined) used.referenceTemperature = kinetics.referenceTemperature;
  return used;
}

/** The base cell with one electrode's kinetics replaced. */
function applySwap(ctx: CompareContext, def: CellDefinition, electrode: 'anode' | 'cathode', swap: ElectrodeSwap, path: string): KineticsUsed {
  const current = def[electrode];
  if ('kinetics' in swap) {
    def[electrode] = { ...current, kinetics: swap.kinetics, ...(swap.limitingCurrentDensity !== undefined ? { limitingCurrentDensity: swap.limitingCurrentDensity } : {}) };
    return kineticsFromEntered(ctx, swap.kinetics, electrode);
  }
  if ('fit' in swap) {
    const r = kineticsFromSavedFit(ctx, swap.fit, electrode, `${path}.fit`);
    ctx.warnings.push(...r.warnings);
    def[electrode] = { ...current, kinetics: r.kinetics, ...(r.limitingCurrentDensity !== undefined ? { limitingCurrentDensity: r.limitingCurrentDensity } : {}) };
    return r.used;
  }
  const r = kineticsFromDataset(ctx, swap.dataset, electrode, `${path}.dataset`);
  ctx.warnings.push(...r.warnings);
  def[electrode] = { ...current, kinetics: r.kinetics };
  return r.used;
}

function describeSource(source: CellSource): string {
  if (isLinearSource(source)) {
    return `plant data: U0 ${dec(source.linear.intercept).toSignificantDigits(6).toString()} V, K ${dec(source.linear.slope).times(A_PER_KA).toSignificantDigits(6).toString()} V per kA/m²`;
  }
  return 'cell definition';
}

function optionPerformance(
  ctx: CompareContext,
  request: CoatingsRequest,
  option: CoatingOptionRequest,
  k: number,
  base: CellSource | undefined,
): { performance: CellPerformance; source: string; kinetics: CoatingOptionOut['kinetics'] } {
  const path = `options[${k}]`;
  const ce = option.currentEfficiency ?? request.currentEfficiency;
  const perf = (src: CellSource, where: string) => {
    if (isLinearSource(src) && ce === undefined) {
      throw new InputError(`${path}.currentEfficiency`, 'is required with plant data (a linear cell): a fraction in (0, 1]');
    }
    return toCellPerformance(src, ce, where, request.product);
  };
  if (option.cell) {
    return { performance: perf(option.cell, `${path}.cell`), source: describeSource(option.cell), kinetics: {} };
  }
  if (!base) {
    throw new InputError(`${path}`, 'needs a cell: give the option its own cell (plant data or a cell definition), or a base cell (request "cell" or the study\'s cell definition) for electrode swaps');
  }
  if (!option.anode && !option.cathode) {
    return { performance: perf(base, 'cell'), source: isLinearSource(base) ? describeSource(base) : 'base cell as defined', kinetics: {} };
  }
  if (isLinearSource(base)) {
    throw new InputError(`${path}.${option.anode ? 'anode' : 'cathode'}`, 'an electrode swap needs a cell definition as the base cell, not plant data (U0, K)');
  }
  const def: CellDefinition = structuredClone(base);
  const kinetics: CoatingOptionOut['kinetics'] = {};
  const parts: string[] = [];
  if (option.anode) {
    kinetics.anode = applySwap(ctx, def, 'anode', option.anode, `${path}.anode`);
    parts.push(`anode: ${kinetics.anode.label}`);
  }
  if (option.cathode) {
    kinetics.cathode = applySwap(ctx, def, 'cathode', option.cathode, `${path}.cathode`);
    parts.push(`cathode: ${kinetics.cathode.label}`);
  }
  return { performance: perf(def, path), source: `base cell with ${parts.join('; ')}`, kinetics };
}

function activeAreaFor(plant: PlantSize, product: ProductId, j: number, baseline: CellPerformance): { area: number; basis: CompareResponse['plantSizeBasis'] } {
  if ('activeArea' in plant) return { area: plant.activeArea, basis: 'activeArea' };
  if ('cells' in plant) return { area: plant.cells * plant.cellArea, basis: 'cells' };
  // Faraday's law: area = ṁ / (j·CE·M/(zF)), with the baseline's CE at the design point.
  const ce = evaluateCell(baseline, j, `options`).currentEfficiency;
  const kgPerCoulomb = electrochemicalEquivalent(PRODUCT_SPECS[product]);
  return { area: plant.productionRate / (j * ce * kgPerCoulomb), basis: 'productionRate' };
}

/**
 * Run a validated coating comparison (2–6 options) with the plant core's compareCoatings.
 * Each option's cell: its own cell source, or electrode swaps on the base cell (request
 * `cell`, else the study's cell definition), or the base cell unchanged.
 */
export function runCoatingComparison(request: CoatingsRequest, study?: Study): CompareResponse {
  const base = request.cell ?? studyCellSource(study);
  const chemistry = resolveChemistry(request.chemistry, base, study);
  checkProduct(request.product, chemistry);
  request.options.forEach((o, k) => {
    if (o.cell && !isLinearSource(o.cell) && chemistry && o.cell.chemistry !== chemistry) {
      throw new InputError(`options[${k}].cell.chemistry`, `is ${o.cell.chemistry}, but the comparison is for ${chemistry}`);
    }
  });
  const ctx: CompareContext = {
    study,
    cellTemperature: base && !isLinearSource(base) ? base.temperature : undefined,
    fits: new Map(),
    warnings: [],
  };
  const prepared = request.options.map((o, k) => optionPerformance(ctx, request, o, k, base));
  const baselineIndex = request.baseline ?? 0;
  const j = request.currentDensity;
  const { area, basis } = activeAreaFor(request.plant, request.product, j, prepared[baselineIndex].performance);
  let result;
  try {
    result = compareCoatings({
      product: request.product,
      currentDensity: j,
      activeArea: area,
      energyPrice: request.electricityPrice,
      operatingHoursPerYear: request.operatingHours,
      discountRate: request.discountRate,
      baselineIndex,
      options: request.options.map((o, k) => ({
        name: o.name,
        performance: prepared[k].performance,
        pricePerArea: o.pricePerArea,
        voltageRisePerYear: o.voltageRisePerYear,
        lifeYears: o.lifeYears,
      })),
    });
  } catch (err) {
    // The core names options as `options.2.…`; keep our bracket grammar.
    if (err instanceof InputError || err instanceof PhysicsError) {
      const fix = (p: string) => p.replace(/^options\.(\d+)/, 'options[$1]');
      if (err instanceof PhysicsError) throw new PhysicsError(fix(err.issues[0]?.path ?? 'options'), err.issues[0]?.message ?? err.message);
      throw InputError.many(err.message, err.issues.map((i) => ({ path: fix(i.path), message: i.message })));
    }
    throw err;
  }
  const baseRow = result.rows[baselineIndex];
  const options: CoatingOptionOut[] = result.rows.map((row, k) => ({
    name: row.name,
    source: prepared[k].source,
    isBaseline: row.isBaseline,
    cellVoltage: row.cellVoltage,
    currentEfficiency: row.currentEfficiency,
    specificEnergy: row.specificEnergy,
    averageCellVoltage: row.averageCellVoltage,
    averageSpecificEnergy: row.averageSpecificEnergy,
    annualEnergy: row.annualEnergy,
    annualEnergyDifference: row.annualEnergy - baseRow.annualEnergy,
    annualEnergyCost: row.annualEnergyCost,
    annualSavingVsBaseline: row.annualSavingVsBaseline,
    coatingCapital: row.coatingCapital,
    extraCapital: row.extraCapital,
    simplePaybackYears: row.simplePaybackYears,
    equivalentAnnualCost: row.equivalentAnnualCost,
    npvVsBaseline: row.npvVsBaseline,
    lifeYears: row.lifeYears,
    voltageRisePerYear: request.options[k].voltageRisePerYear,
    pricePerArea: request.options[k].pricePerArea,
    display: { ...row.display },
    notes: row.notes,
    kinetics: prepared[k].kinetics,
  }));
  // Entered kinetics without a cell temperature have no slope to show: drop NaN before JSON.
  for (const o of options) {
    for (const e of ['anode', 'cathode'] as const) {
      const used = o.kinetics[e];
      if (used && !Number.isFinite(used.tafelSlope)) delete (used as Partial<KineticsUsed>).tafelSlope;
    }
  }
  const response: CompareResponse = {
    product: request.product,
    chemistry: chemistry ?? null,
    currency: request.currency ?? '',
    currentDensity: j,
    activeArea: area,
    plantSizeBasis: basis,
    annualProduction: result.annualProduction,
    baseline: baselineIndex,
    options,
    units: {
      currentDensity: 'A/m²',
      activeArea: 'm²',
      annualProduction: 'kg/yr',
      cellVoltage: 'V',
      specificEnergy: 'J/kg',
      annualEnergy: 'J/yr',
      money: 'currency (as the prices given)',
      annualEnergyCost: 'currency/yr',
      simplePaybackYears: 'yr',
      voltageRisePerYear: 'V/yr',
      tafelSlope: 'V/decade',
      exchangeCurrentDensity: 'A/m²',
    },
    warnings: [...new Set([...ctx.warnings, ...result.warnings])],
  };
  assertFiniteTree(response, 'compare');
  return response;
}

/** Parse + run (API entry points). */
export function costFromBody(body: unknown, study?: Study): CostResponse {
  return runCostStudy(costRequestSchema.parse(body ?? {}), study);
}
export function compareFromBody(body: unknown, study?: Study): CompareResponse {
  return runCoatingComparison(coatingsRequestSchema.parse(body ?? {}), study);
}

// =============================================================================================
// Page forms: strings in engineers' units ↔ SI requests
// =============================================================================================

/** An input problem on a page form: `issues[].path` is the field's label, `fields` the form names. */
export class FormError extends InputError {
  constructor(
    readonly fields: string[],
    issues: IssueDetail[],
  ) {
    super(issues[0]?.path ?? '(form)', issues[0]?.message ?? 'invalid input');
    this.name = 'FormError';
    this.message = `Please correct ${issues.length === 1 ? 'one field' : `${issues.length} fields`}.`;
    (this as { issues: IssueDetail[] }).issues = issues;
  }
}

interface NumberRule {
  min?: number;
  max?: number;
  /** Exclusive lower bound. */
  above?: number;
  integer?: boolean;
  optional?: boolean;
}

const NUMBER_PATTERN = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?$/i;

/** Collects form problems; numbers accept a decimal comma when no point is present. */
class FormIssues {
  readonly issues: IssueDetail[] = [];
  readonly fields: string[] = [];
  constructor(private readonly labels: (field: string) => string) {}

  add(field: string, message: string): void {
    this.issues.push({ path: this.labels(field), message });
    this.fields.push(field);
  }

  number(raw: string | undefined, field: string, rule: NumberRule = {}): number | undefined {
    const text = (raw ?? '').trim().replace(/\u2212/g, '-').replace(/\s+/g, '');
    if (text === '') {
      if (!rule.optional) this.add(field, 'is required');
      return undefined;
    }
    const normal = text.includes('.') ? text : text.replace(',', '.');
    if (!NUMBER_PATTERN.test(normal)) {
      this.add(field, `"${raw}" is not a number`);
      return undefined;
    }
    const v = Number(normal);
    if (!Number.isFinite(v)) return this.fail(field, 'must be a finite number');
    if (rule.integer && !Number.isInteger(v)) return this.fail(field, 'must be a whole number');
    if (rule.above !== undefined && !(v > rule.above)) return this.fail(field, `must be greater than ${rule.above}`);
    if (rule.min !== undefined && v < rule.min) return this.fail(field, `must be at least ${rule.min}`);
    if (rule.max !== undefined && v > rule.max) return this.fail(field, `must be at most ${rule.max}`);
    return v;
  }

  private fail(field: string, message: string): undefined {
    this.add(field, message);
    return undefined;
  }

  throwIfAny(): void {
    if (this.issues.length) throw new FormError(this.fields, this.issues);
  }
}

/** Decimal product/quotient for unit conversion of form numbers (no binary artefacts). */
function scale(v: number, factor: number | string): number {
  return dec(v).times(factor).toNumber();
}
function unscale(v: number, divisor: number | string): number {
  return dec(v).div(divisor).toNumber();
}

/** A number for a form field: up to 7 significant digits, no exponent for ordinary sizes. */
export function formNumber(v: number | undefined): string {
  if (v === undefined || !Number.isFinite(v)) return '';
  if (v === 0) return '0';
  const d = dec(v).toSignificantDigits(7);
  const abs = Math.abs(v);
  return abs >= 1e-6 && abs < 1e12 ? d.toFixed() : d.toExponential().replace('e+', 'e');
}

function str(body: Record<string, unknown> | undefined, key: string, max = 200): string {
  const v = body?.[key];
  return typeof v === 'string' ? v.slice(0, max) : '';
}

// ---------------------------------------------------------------------------------------------
// Costs form
// ---------------------------------------------------------------------------------------------

export interface CostsForm {
  product: string;
  /** 'study' (the study's cell definition) or 'linear' (plant data). */
  cellMode: string;
  /** U0, V. */
  u0: string;
  /** K, V per kA/m². */
  kFactor: string;
  /** %, for plant data. */
  ce: string;
  /** Electricity, currency per MWh. */
  price: string;
  /** h/yr. */
  hours: string;
  /** Installed capital, currency per m². */
  capital: string;
  /** %/yr. */
  rate: string;
  /** years. */
  life: string;
  /** kA/m². */
  jFrom: string;
  jTo: string;
  jPoints: string;
  /** kA/m², optional. */
  design: string;
  /** ± %. */
  sensitivity: string;
  currency: string;
}

export const COSTS_LABELS: Record<keyof CostsForm, string> = {
  product: 'Product',
  cellMode: 'Cell',
  u0: 'U0 (V)',
  kFactor: 'K-factor (V per kA/m²)',
  ce: 'Current efficiency (%)',
  price: 'Electricity price (per MWh)',
  hours: 'Operating hours (h/yr)',
  capital: 'Installed cost (per m² of active area)',
  rate: 'Discount rate (%/yr)',
  life: 'Capital life (years)',
  jFrom: 'Current density from (kA/m²)',
  jTo: 'Current density to (kA/m²)',
  jPoints: 'Number of points',
  design: 'Design current density (kA/m²)',
  sensitivity: 'Tornado step (± %)',
  currency: 'Currency label',
};

const COSTS_KEYS = Object.keys(COSTS_LABELS) as Array<keyof CostsForm>;
/** Most points of the cost curve on the page (project choice: smooth curve, small page). */
export const MAX_PAGE_POINTS = 200;
/** Default number of points of the cost curve. */
const DEFAULT_PAGE_POINTS = 36;

export function readCostsForm(body: Record<string, unknown> | undefined): CostsForm {
  const form = {} as CostsForm;
  for (const k of COSTS_KEYS) form[k] = str(body, k).trim();
  return form;
}

/** Map API paths (costs request) to form labels. */
function costsPathLabel(path: string): string {
  const map: Record<string, keyof CostsForm> = {
    electricityPrice: 'price',
    capitalCostPerArea: 'capital',
    operatingHours: 'hours',
    discountRate: 'rate',
    lifetime: 'life',
    currentDensities: 'jFrom',
    designCurrentDensity: 'design',
    currentEfficiency: 'ce',
    sensitivityFraction: 'sensitivity',
    'cell.linear.intercept': 'u0',
    'cell.linear.slope': 'kFactor',
    product: 'product',
    currency: 'currency',
  };
  const key = map[path] ?? map[path.replace(/\[\d+\]$/, '')];
  return key ? COSTS_LABELS[key] : path;
}

/** Linear grid from..to with n points (n ≥ 2), A/m². */
function grid(from: number, to: number, n: number): number[] {
  return Array.from({ length: n }, (_, k) => (k === n - 1 ? to : from + ((to - from) * k) / (n - 1)));
}

/**
 * Form (engineers' units) → cost request (SI). Throws FormError naming fields.
 * `hasStudyCell`: whether 'study' is a valid cell choice.
 */
export function costsRequestFromForm(form: CostsForm, hasStudyCell: boolean): CostRequest {
  const f = new FormIssues((k) => COSTS_LABELS[k as keyof CostsForm] ?? k);
  const product = form.product as ProductId;
  if (!(product in PRODUCT_SPECS)) f.add('product', 'choose a product');
  let cell: CostRequest['cell'];
  let currentEfficiency: number | undefined;
  if (form.cellMode === 'linear') {
    const u0 = f.number(form.u0, 'u0', { above: 0, max: 100 });
    const k = f.number(form.kFactor, 'kFactor', { min: 0, max: 100 });
    const ce = f.number(form.ce, 'ce', { above: 0, max: 100 });
    if (u0 !== undefined && k !== undefined) cell = { linear: { intercept: u0, slope: unscale(k, A_PER_KA) } };
    if (ce !== undefined) currentEfficiency = unscale(ce, PERCENT);
  } else if (form.cellMode !== 'study' || !hasStudyCell) {
    f.add('cellMode', hasStudyCell ? 'choose the study’s cell or plant data' : 'this study has no cell definition: enter plant data (U0, K, CE) or build the cell on the Cell page');
  }
  const price = f.number(form.price, 'price', { above: 0 });
  const hours = f.number(form.hours, 'hours', { above: 0, max: 8760 });
  const capital = f.number(form.capital, 'capital', { above: 0 });
  const rate = f.number(form.rate, 'rate', { min: 0, max: 100 });
  const life = f.number(form.life, 'life', { above: 0, max: 60 });
  const jFrom = f.number(form.jFrom, 'jFrom', { above: 0 });
  const jTo = f.number(form.jTo, 'jTo', { above: 0 });
  const n = f.number(form.jPoints, 'jPoints', { min: 2, max: MAX_PAGE_POINTS, integer: true });
  const design = f.number(form.design, 'design', { above: 0, optional: true });
  const sens = f.number(form.sensitivity, 'sensitivity', { above: 0, max: 90, optional: true });
  if (jFrom !== undefined && jTo !== undefined && !(jTo > jFrom)) f.add('jTo', 'must be above the lower current density');
  if (form.currency.length > 12 || /[<>&"']/.test(form.currency)) f.add('currency', 'at most 12 characters, no < > & " \'');
  f.throwIfAny();
  const request: CostRequest = {
    product,
    electricityPrice: unscale(price!, KWH_PER_MWH),
    capitalCostPerArea: capital!,
    operatingHours: hours!,
    discountRate: unscale(rate!, PERCENT),
    lifetime: life!,
    currentDensities: grid(scale(jFrom!, A_PER_KA), scale(jTo!, A_PER_KA), n!),
  };
  if (cell) request.cell = cell;
  if (currentEfficiency !== undefined) request.currentEfficiency = currentEfficiency;
  if (design !== undefined) request.designCurrentDensity = scale(design, A_PER_KA);
  if (sens !== undefined) request.sensitivityFraction = unscale(sens, PERCENT);
  if (form.currency) request.currency = form.currency;
  return parseWithLabels(costRequestSchema, request, costsPathLabel);
}

/** Parse an SI request built from a form; zod issues are re-labelled for people. */
function parseWithLabels<T>(schema: { parse: (v: unknown) => T }, value: unknown, label: (path: string) => string): T {
  try {
    return schema.parse(value);
  } catch (err) {
    if (err instanceof ZodError) {
      const issues = zodIssues(err).map((i) => ({ path: label(i.path), message: i.message }));
      throw new FormError([], issues);
    }
    throw err;
  }
}

/** Cost request (SI) → form strings. */
export function costsFormFromRequest(r: CostRequest, hasStudyCell: boolean): CostsForm {
  const lo = Math.min(...r.currentDensities);
  const hi = Math.max(...r.currentDensities);
  const linear = r.cell && isLinearSource(r.cell) ? r.cell : undefined;
  return {
    product: r.product,
    cellMode: linear || !hasStudyCell ? 'linear' : 'study',
    u0: linear ? formNumber(linear.linear.intercept) : '',
    kFactor: linear ? formNumber(scale(linear.linear.slope, A_PER_KA)) : '',
    ce: r.currentEfficiency !== undefined ? formNumber(scale(r.currentEfficiency, PERCENT)) : '',
    price: formNumber(scale(r.electricityPrice, KWH_PER_MWH)),
    hours: formNumber(r.operatingHours),
    capital: formNumber(r.capitalCostPerArea),
    rate: formNumber(scale(r.discountRate, PERCENT)),
    life: formNumber(r.lifetime),
    jFrom: formNumber(unscale(lo, A_PER_KA)),
    jTo: formNumber(unscale(hi, A_PER_KA)),
    jPoints: String(Math.max(2, Math.min(MAX_PAGE_POINTS, r.currentDensities.length))),
    design: r.designCurrentDensity !== undefined ? formNumber(unscale(r.designCurrentDensity, A_PER_KA)) : '',
    sensitivity: formNumber(scale(r.sensitivityFraction ?? DEFAULT_SENSITIVITY_FRACTION, PERCENT)),
    currency: r.currency ?? '',
  };
}

/** The form a study opens with when it has no costs section (money left for the user to fill). */
export function defaultCostsForm(study: Study, hasStudyCell: boolean): CostsForm {
  const cell = (() => {
    try {
      return studyCellSource(study);
    } catch {
      return undefined;
    }
  })();
  const js = cell && !isLinearSource(cell) ? cell.currentDensities : [];
  const lo = js.length ? Math.min(...js) : 1000;
  const hi = js.length ? Math.max(...js) : 8000;
  return {
    product: productsOf(study.chemistry)[0],
    cellMode: hasStudyCell ? 'study' : 'linear',
    u0: '',
    kFactor: '',
    ce: '',
    price: '',
    hours: '8000',
    capital: '',
    rate: '',
    life: '',
    jFrom: formNumber(unscale(lo, A_PER_KA)),
    jTo: formNumber(unscale(hi > lo ? hi : lo * 8, A_PER_KA)),
    jPoints: String(DEFAULT_PAGE_POINTS),
    design: cell && !isLinearSource(cell) && cell.designCurrentDensity ? formNumber(unscale(cell.designCurrentDensity, A_PER_KA)) : '',
    sensitivity: '20',
    currency: '',
  };
}

// ---------------------------------------------------------------------------------------------
// Costs view-model
// ---------------------------------------------------------------------------------------------

/** Chart colours of our own (colour-blind-friendly pairs). */
const COLOURS = {
  energy: '#c26a00',
  capital: '#6b7a8f',
  total: '#1f5f8b',
  optimum: '#2e7d32',
  design: '#8e24aa',
  low: '#7fa7c9',
  high: '#d9825b',
  positive: '#2e7d32',
  negative: '#c0392b',
  series: ['#1f5f8b', '#c26a00', '#2e7d32', '#8e24aa', '#c0392b', '#00838f'],
};

export interface CostsView {
  basis: MassBasis;
  moneyUnit: string;
  productName: string;
  summary: Array<{ label: string; value: string; unit: string; id?: string }>;
  closedForm: null | { value: string; formula: string; inputs: Array<{ symbol: string; value: string; unit: string; meaning: string }>; agreement: string; inside: boolean };
  closedFormNote: string;
  points: Array<{ j: string; u: string; ce: string; w: string; energy: string; capital: string; total: string; isOptimum: boolean }>;
  tornado: Array<{ label: string; low: string; lowCost: string; high: string; highCost: string; swing: string; note: string }>;
  tornadoTitle: string;
  costChart: unknown;
  tornadoChart: unknown;
  warnings: string[];
}

function sigText(v: number, sig = 4): string {
  return formNumber(Number(dec(v).toSignificantDigits(sig).toString()));
}

/** Value of a tornado input in the page's units. */
function tornadoValue(parameter: string, v: number): string {
  switch (parameter) {
    case 'energyPrice':
      return `${sigText(scale(v, KWH_PER_MWH), 4)} per MWh`;
    case 'capitalCostPerArea':
      return `${sigText(v, 5)} per m²`;
    case 'operatingHoursPerYear':
      return `${sigText(v, 4)} h/yr`;
    case 'discountRate':
      return `${sigText(scale(v, PERCENT), 4)} %`;
    case 'lifeYears':
      return `${sigText(v, 4)} yr`;
    case 'slope':
      return `${sigText(scale(v, A_PER_KA), 4)} V per kA/m²`;
    case 'intercept':
      return `${sigText(v, 4)} V`;
    case 'currentEfficiency':
      return v <= 1 ? `${sigText(scale(v, PERCENT), 4)} %` : `× ${sigText(v, 3)}`;
    case 'cellVoltage':
      return `× ${sigText(v, 3)}`;
    default:
      return sigText(v);
  }
}

function productLabel(product: ProductId): string {
  return { Cl2: 'Cl₂', NaOH: 'NaOH (100 %)', H2: 'H₂', O2: 'O₂' }[product];
}

export function costsView(r: CostResponse): CostsView {
  const basis = massBasisOf(r.product);
  const cur = r.currency ? `${r.currency}/${basis.unit}` : `per ${basis.unit}`;
  const perBasis = (perKg: number) => moneyPerBasis(perKg, basis);
  const kA = (j: number) => sigText(unscale(j, A_PER_KA), 4);
  const kWh = (w: number) => sigText(energyPerBasis(w, basis), 5);
  const optDisplay = basis.unit === 't' ? r.optimum.display : { energyPerTonne: perBasis(r.optimum.energyCost), capitalPerTonne: perBasis(r.optimum.capitalCost), totalPerTonne: perBasis(r.optimum.totalCost) };
  const summary: CostsView['summary'] = [
    { label: 'Economic current density (numeric optimum)', value: kA(r.economicCurrentDensity), unit: 'kA/m²', id: 'economic-current-density' },
    { label: 'Cell voltage there', value: sigText(r.optimum.cellVoltage, 4), unit: 'V' },
    { label: 'Current efficiency there', value: sigText(scale(r.optimum.currentEfficiency, PERCENT), 4), unit: '%' },
    { label: 'Specific energy (DC) there', value: kWh(r.optimum.specificEnergy), unit: `kWh/${basis.unit}` },
    { label: 'Energy cost', value: optDisplay.energyPerTonne, unit: cur },
    { label: 'Capital cost', value: optDisplay.capitalPerTonne, unit: cur },
    { label: 'Total cost at the optimum', value: optDisplay.totalPerTonne, unit: cur, id: 'optimum-total' },
    { label: 'Capital recovery factor', value: sigText(r.capitalRecoveryFactor, 6), unit: '1/yr' },
  ];
  if (r.design) {
    const d = basis.unit === 't' ? r.design.display.totalPerTonne : perBasis(r.design.totalCost);
    summary.push(
      { label: 'Design current density', value: kA(r.design.currentDensity), unit: 'kA/m²' },
      { label: 'Total cost at the design point', value: d, unit: cur, id: 'design-total' },
      { label: 'Design point vs optimum', value: `${r.design.extraCostFraction >= 0 ? '+' : ''}${sigText(scale(r.design.extraCostFraction, PERCENT), 3)}`, unit: '%' },
    );
  }
  let closedForm: CostsView['closedForm'] = null;
  if (r.closedForm) {
    const c = r.closedForm;
    closedForm = {
      value: kA(c.economicCurrentDensity),
      formula: c.formula,
      inputs: (Object.keys(c.inputs) as Array<keyof ClosedFormOut['inputs']>).map((s) => ({ symbol: s, value: sigText(c.inputs[s].value, 6), unit: c.inputs[s].unit, meaning: c.inputs[s].meaning })),
      agreement: `${sigText(Math.abs(scale(c.relativeDifference, PERCENT)), 2)} %`,
      inside: c.insideSearchRange,
    };
  }
  // The grid point nearest the optimum is marked in the table.
  let nearest = 0;
  r.points.forEach((p, k) => {
    if (Math.abs(p.currentDensity - r.economicCurrentDensity) < Math.abs(r.points[nearest].currentDensity - r.economicCurrentDensity)) nearest = k;
  });
  const points = r.points.map((p, k) => ({
    j: kA(p.currentDensity),
    u: sigText(p.cellVoltage, 4),
    ce: sigText(scale(p.currentEfficiency, PERCENT), 4),
    w: kWh(p.specificEnergy),
    energy: perBasis(p.energyCost),
    capital: perBasis(p.capitalCost),
    total: perBasis(p.totalCost),
    isOptimum: k === nearest,
  }));
  const perBasisNumber = (perTonne: number) => (perTonne / KG_PER_TONNE) * basis.kg;
  const tornado = r.sensitivity.map((row) => ({
    label: row.label,
    low: tornadoValue(row.parameter, row.low.value),
    lowCost: basis.unit === 't' ? row.low.display : roundMoney(money(perBasisNumber(row.low.totalPerTonne))),
    high: tornadoValue(row.parameter, row.high.value),
    highCost: basis.unit === 't' ? row.high.display : roundMoney(money(perBasisNumber(row.high.totalPerTonne))),
    swing: roundMoney(money(perBasisNumber(row.swing))),
    note: row.note ?? '',
  }));
  const pct = sigText(scale(r.sensitivityBasis.fraction, PERCENT), 3);
  const baseCost = basis.unit === 't' ? r.sensitivityBasis.baseDisplay : roundMoney(money(perBasisNumber(r.sensitivityBasis.baseTotalPerTonne)));
  const tornadoTitle = `Total cost per ${basis.unit} at ${kA(r.sensitivityBasis.currentDensity)} kA/m² (${r.sensitivityBasis.basis === 'design' ? 'design point' : 'economic current density'}; base ${baseCost} ${cur}), each input −${pct} % and +${pct} %`;

  const yTitle = `Cost (${cur})`;
  const series = (key: 'energyCost' | 'capitalCost' | 'totalCost') => r.points.map((p) => ({ x: unscale(p.currentDensity, A_PER_KA), y: p[key] * basis.kg }));
  const ymax = Math.max(...r.points.map((p) => p.totalCost * basis.kg));
  const xOpt = unscale(r.economicCurrentDensity, A_PER_KA);
  const datasets: unknown[] = [
    { label: 'Total', data: series('totalCost'), showLine: true, pointRadius: 0, borderColor: COLOURS.total, backgroundColor: COLOURS.total, borderWidth: 3 },
    { label: 'Energy', data: series('energyCost'), showLine: true, pointRadius: 0, borderColor: COLOURS.energy, backgroundColor: COLOURS.energy, borderWidth: 2 },
    { label: 'Capital', data: series('capitalCost'), showLine: true, pointRadius: 0, borderColor: COLOURS.capital, backgroundColor: COLOURS.capital, borderWidth: 2, borderDash: [6, 4] },
    {
      label: `Economic current density ${kA(r.economicCurrentDensity)} kA/m²`,
      data: [{ x: xOpt, y: 0 }, { x: xOpt, y: ymax }],
      showLine: true,
      pointRadius: 0,
      borderColor: COLOURS.optimum,
      backgroundColor: COLOURS.optimum,
      borderWidth: 1.5,
      borderDash: [3, 3],
    },
    { label: 'Optimum', data: [{ x: xOpt, y: r.optimum.totalCost * basis.kg }], pointRadius: 6, pointHoverRadius: 7, borderColor: COLOURS.optimum, backgroundColor: COLOURS.optimum },
  ];
  if (r.design) {
    datasets.push({ label: 'Design point', data: [{ x: unscale(r.design.currentDensity, A_PER_KA), y: r.design.totalCost * basis.kg }], pointRadius: 7, pointStyle: 'triangle', borderColor: COLOURS.design, backgroundColor: COLOURS.design });
  }
  const costChart = {
    type: 'scatter',
    data: { datasets },
    options: {
      plugins: {
        title: { display: true, text: `Cost per ${basis.unit} of ${productLabel(r.product)} against current density` },
        legend: { position: 'bottom' },
      },
      scales: {
        x: { type: 'linear', title: { display: true, text: 'Current density (kA/m²)' } },
        y: { type: 'linear', min: 0, title: { display: true, text: yTitle } },
      },
    },
  };
  const base = r.sensitivityBasis.baseTotalPerTonne;
  const toBasis = (perTonne: number) => perBasisNumber(perTonne);
  const tornadoChart = {
    type: 'bar',
    data: {
      labels: r.sensitivity.map((row) => row.label),
      datasets: [
        { label: `input −${pct} %`, data: r.sensitivity.map((row) => [toBasis(base), toBasis(row.low.totalPerTonne)]), backgroundColor: COLOURS.low, borderColor: COLOURS.low, grouped: false, barPercentage: 0.7 },
        { label: `input +${pct} %`, data: r.sensitivity.map((row) => [toBasis(base), toBasis(row.high.totalPerTonne)]), backgroundColor: COLOURS.high, borderColor: COLOURS.high, grouped: false, barPercentage: 0.7 },
      ],
    },
    options: {
      indexAxis: 'y',
      plugins: { title: { display: true, text: `Tornado: total cost per ${basis.unit}, each input ±${pct} % (base ${baseCost})` }, legend: { position: 'bottom' } },
      scales: { x: { type: 'linear', beginAtZero: false, grace: '5%', title: { display: true, text: `Total cost (${cur})` } } },
    },
  };
  return {
    basis,
    moneyUnit: cur,
    productName: productLabel(r.product),
    summary,
    closedForm,
    closedFormNote: r.closedFormNote,
    points,
    tornado,
    tornadoTitle,
    costChart,
    tornadoChart,
    warnings: r.warnings,
  };
}

export function costsCsv(r: CostResponse, studyName: string): string {
  const basis = massBasisOf(r.product);
  const cur = r.currency ? `${r.currency}/${basis.unit}` : `per ${basis.unit}`;
  const v = costsView(r);
  const head = [
    ['Cost study', studyName],
    ['Product', r.product],
    ['Economic current density (kA/m²)', v.summary[0].value],
    ['Closed form (kA/m²)', v.closedForm ? v.closedForm.value : 'n/a'],
    ['Total cost at the optimum', `${v.summary.find((s) => s.id === 'optimum-total')?.value ?? ''}`],
    ['Money unit', cur],
    ['Rounding', 'decimal, half-up, 2 places'],
  ];
  const table = [
    ['Current density (kA/m²)', 'Cell voltage (V)', 'Current efficiency (%)', `Specific energy (kWh/${basis.unit})`, `Energy cost (${cur})`, `Capital cost (${cur})`, `Total cost (${cur})`],
    ...v.points.map((p) => [p.j, p.u, p.ce, p.w, p.energy, p.capital, p.total]),
  ];
  const tornado = [
    ['Input', 'Low value', `Total cost, low (${cur})`, 'High value', `Total cost, high (${cur})`, `Swing (${cur})`, 'Note'],
    ...v.tornado.map((t) => [t.label, t.low, t.lowCost, t.high, t.highCost, t.swing, t.note]),
  ];
  return toCsv([head, table, tornado]);
}

// ---------------------------------------------------------------------------------------------
// Coatings form
// ---------------------------------------------------------------------------------------------

export interface CoatingOptionForm {
  name: string;
  /** 'swap' (electrode swaps on the study's cell) or 'linear' (plant data). */
  kind: string;
  /** 'keep' | 'dataset:<id>' | 'fit:<id>' | 'entered'. */
  anode: string;
  /** mV/decade at the cell temperature. */
  anodeSlope: string;
  /** A/m². */
  anodeJ0: string;
  cathode: string;
  cathodeSlope: string;
  cathodeJ0: string;
  /** V. */
  u0: string;
  /** V per kA/m². */
  kFactor: string;
  /** %. */
  ce: string;
  /** currency per m². */
  price: string;
  /** mV/yr. */
  rise: string;
  /** years. */
  life: string;
}

export interface CoatingsForm {
  product: string;
  /** kA/m². */
  jDesign: string;
  /** 'area' | 'cells' | 'production'. */
  sizeMode: string;
  /** m². */
  area: string;
  cells: string;
  /** m² per cell. */
  cellArea: string;
  /** t/day of the product. */
  production: string;
  /** per MWh. */
  price: string;
  hours: string;
  /** %. */
  rate: string;
  currency: string;
  baseline: string;
  options: CoatingOptionForm[];
}

const OPTION_KEYS: Array<keyof CoatingOptionForm> = ['name', 'kind', 'anode', 'anodeSlope', 'anodeJ0', 'cathode', 'cathodeSlope', 'cathodeJ0', 'u0', 'kFactor', 'ce', 'price', 'rise', 'life'];

export const OPTION_LABELS: Record<keyof CoatingOptionForm, string> = {
  name: 'name',
  kind: 'cell',
  anode: 'anode',
  anodeSlope: 'anode Tafel slope (mV/decade)',
  anodeJ0: 'anode exchange current density (A/m²)',
  cathode: 'cathode',
  cathodeSlope: 'cathode Tafel slope (mV/decade)',
  cathodeJ0: 'cathode exchange current density (A/m²)',
  u0: 'U0 (V)',
  kFactor: 'K-factor (V per kA/m²)',
  ce: 'current efficiency (%)',
  price: 'coating price (per m²)',
  rise: 'voltage rise (mV/yr)',
  life: 'coating life (years)',
};

export const COATINGS_LABELS: Record<Exclude<keyof CoatingsForm, 'options'>, string> = {
  product: 'Product',
  jDesign: 'Design current density (kA/m²)',
  sizeMode: 'Plant size',
  area: 'Total active area (m²)',
  cells: 'Number of cells',
  cellArea: 'Active area per cell (m²)',
  production: 'Production (t/day)',
  price: 'Electricity price (per MWh)',
  hours: 'Operating hours (h/yr)',
  rate: 'Discount rate (%/yr)',
  currency: 'Currency label',
  baseline: 'Baseline option',
};

function coatingsFieldLabel(field: string): string {
  const m = /^opt(\d+)_(\w+)$/.exec(field);
  if (m) return `Option ${Number(m[1]) + 1} · ${OPTION_LABELS[m[2] as keyof CoatingOptionForm] ?? m[2]}`;
  return COATINGS_LABELS[field as keyof typeof COATINGS_LABELS] ?? field;
}

/** Map API paths (compare request) to page labels. */
function coatingsPathLabel(path: string): string {
  const m = /^options\[(\d+)\](?:\.(.*))?$/.exec(path);
  if (m) {
    const rest = m[2] ?? '';
    const map: Record<string, keyof CoatingOptionForm> = {
      name: 'name',
      pricePerArea: 'price',
      voltageRisePerYear: 'rise',
      lifeYears: 'life',
      currentEfficiency: 'ce',
      'cell.linear.intercept': 'u0',
      'cell.linear.slope': 'kFactor',
    };
    const key = map[rest] ?? (rest.startsWith('anode') ? 'anode' : rest.startsWith('cathode') ? 'cathode' : undefined);
    return `Option ${Number(m[1]) + 1}${key ? ` · ${OPTION_LABELS[key]}` : rest ? ` · ${rest}` : ''}`;
  }
  const top: Record<string, string> = {
    currentDensity: COATINGS_LABELS.jDesign,
    electricityPrice: COATINGS_LABELS.price,
    operatingHours: COATINGS_LABELS.hours,
    discountRate: COATINGS_LABELS.rate,
    'plant.activeArea': COATINGS_LABELS.area,
    'plant.cells': COATINGS_LABELS.cells,
    'plant.cellArea': COATINGS_LABELS.cellArea,
    'plant.productionRate': COATINGS_LABELS.production,
    baseline: COATINGS_LABELS.baseline,
    options: 'Options',
    product: 'Product',
    cell: 'The study’s cell definition',
  };
  return top[path] ?? (path.startsWith('cell.') ? `The study’s cell definition (${path.slice(5)})` : path);
}

/** Re-label errors of a computation for the page (API paths → field labels). */
export function relabel(err: unknown, page: 'costs' | 'coatings'): unknown {
  if (err instanceof FormError) return err;
  const label = page === 'costs' ? costsPathLabel : coatingsPathLabel;
  if (err instanceof InputError || err instanceof PhysicsError) {
    const issues = err.issues.map((i) => ({ path: label(i.path), message: i.message }));
    const out = new FormError([], issues);
    out.message = err instanceof PhysicsError ? 'No physical solution for these inputs.' : out.message;
    return out;
  }
  return err;
}

export function readCoatingsForm(body: Record<string, unknown> | undefined): CoatingsForm {
  const top = (k: string) => str(body, k).trim();
  const count = Math.max(MIN_COATING_OPTIONS, Math.min(MAX_COATING_OPTIONS, Number.parseInt(top('count'), 10) || MIN_COATING_OPTIONS));
  const options: CoatingOptionForm[] = [];
  for (let k = 0; k < count; k++) {
    const o = {} as CoatingOptionForm;
    for (const key of OPTION_KEYS) o[key] = str(body, `opt${k}_${key}`).trim();
    options.push(o);
  }
  return {
    product: top('product'),
    jDesign: top('jDesign'),
    sizeMode: top('sizeMode') || 'area',
    area: top('area'),
    cells: top('cells'),
    cellArea: top('cellArea'),
    production: top('production'),
    price: top('price'),
    hours: top('hours'),
    rate: top('rate'),
    currency: top('currency'),
    baseline: top('baseline') || '0',
    options,
  };
}

/** Resize the option list (2–6), new options copying the last one's money inputs. */
export function resizeOptions(form: CoatingsForm, count: number): CoatingsForm {
  const n = Math.max(MIN_COATING_OPTIONS, Math.min(MAX_COATING_OPTIONS, Math.trunc(count) || MIN_COATING_OPTIONS));
  const options = form.options.slice(0, n);
  while (options.length < n) {
    const last = options[options.length - 1];
    options.push({ ...(last ?? blankOption()), name: `Option ${options.length + 1}` });
  }
  const baseline = Number(form.baseline) < n ? form.baseline : '0';
  return { ...form, options, baseline };
}

function blankOption(): CoatingOptionForm {
  return { name: '', kind: 'swap', anode: 'keep', anodeSlope: '', anodeJ0: '', cathode: 'keep', cathodeSlope: '', cathodeJ0: '', u0: '', kFactor: '', ce: '', price: '0', rise: '0', life: '5' };
}

/** Temperature of the study's cell definition (K), when it has one. */
function cellTemperatureOf(study: Study): number | undefined {
  try {
    const c = studyCellSource(study);
    return c && !isLinearSource(c) ? c.temperature : undefined;
  } catch {
    return undefined;
  }
}

function swapFromForm(f: FormIssues, k: number, electrode: 'anode' | 'cathode', o: CoatingOptionForm, T: number | undefined): ElectrodeSwap | undefined {
  const choice = o[electrode];
  if (choice === '' || choice === 'keep') return undefined;
  if (choice.startsWith('dataset:')) return { dataset: choice.slice('dataset:'.length) };
  if (choice.startsWith('fit:')) return { fit: choice.slice('fit:'.length) };
  if (choice === 'entered') {
    const slopeField = electrode === 'anode' ? 'anodeSlope' : 'cathodeSlope';
    const j0Field = electrode === 'anode' ? 'anodeJ0' : 'cathodeJ0';
    const slope = f.number(o[slopeField], `opt${k}_${slopeField}`, { above: 0, max: 2000 });
    const j0 = f.number(o[j0Field], `opt${k}_${j0Field}`, { above: 0 });
    if (T === undefined) {
      f.add(`opt${k}_${electrode}`, 'entered kinetics need the study’s cell definition (its temperature and the rest of the cell)');
      return undefined;
    }
    if (slope === undefined || j0 === undefined) return undefined;
    // α from the slope at the cell temperature: b = ln10·RT/(αF) ⇒ α = b(α = 1)/b.
    const alpha = tafelSlopePerDecade(1, T) / unscale(slope, MV_PER_V);
    return { kinetics: { model: 'tafel', exchangeCurrentDensity: j0, transferCoefficient: alpha, referenceTemperature: T } };
  }
  f.add(`opt${k}_${electrode}`, `unknown choice "${choice}"`);
  return undefined;
}

/** Coatings form (engineers' units) → compare request (SI). Throws FormError naming fields. */
export function coatingsRequestFromForm(form: CoatingsForm, study: Study): CoatingsRequest {
  const f = new FormIssues(coatingsFieldLabel);
  const product = form.product as ProductId;
  if (!(product in PRODUCT_SPECS)) f.add('product', 'choose a product');
  const jDesign = f.number(form.jDesign, 'jDesign', { above: 0, max: 100 });
  const price = f.number(form.price, 'price', { above: 0 });
  const hours = f.number(form.hours, 'hours', { above: 0, max: 8760 });
  const rate = f.number(form.rate, 'rate', { min: 0, max: 100 });
  let plant: PlantSize | undefined;
  if (form.sizeMode === 'area') {
    const a = f.number(form.area, 'area', { above: 0 });
    if (a !== undefined) plant = { activeArea: a };
  } else if (form.sizeMode === 'cells') {
    const n = f.number(form.cells, 'cells', { min: 1, integer: true });
    const a = f.number(form.cellArea, 'cellArea', { above: 0 });
    if (n !== undefined && a !== undefined) plant = { cells: n, cellArea: a };
  } else if (form.sizeMode === 'production') {
    const t = f.number(form.production, 'production', { above: 0 });
    if (t !== undefined) plant = { productionRate: unscale(scale(t, KG_PER_TONNE), 86400) };
  } else {
    f.add('sizeMode', 'choose how the plant size is given');
  }
  const baseline = f.number(form.baseline, 'baseline', { min: 0, max: form.options.length - 1, integer: true });
  if (form.currency.length > 12 || /[<>&"']/.test(form.currency)) f.add('currency', 'at most 12 characters, no < > & " \'');
  const T = cellTemperatureOf(study);
  const options: CoatingOptionRequest[] = [];
  form.options.forEach((o, k) => {
    const name = o.name.trim();
    if (!name) f.add(`opt${k}_name`, 'must not be empty');
    const priceArea = f.number(o.price, `opt${k}_price`, { min: 0 });
    const rise = f.number(o.rise, `opt${k}_rise`, { min: 0, max: 1000 });
    const life = f.number(o.life, `opt${k}_life`, { min: 1, max: 60, integer: true });
    const out: Partial<CoatingOptionRequest> = { name };
    if (o.kind === 'linear') {
      const u0 = f.number(o.u0, `opt${k}_u0`, { above: 0, max: 100 });
      const kf = f.number(o.kFactor, `opt${k}_kFactor`, { min: 0, max: 100 });
      const ce = f.number(o.ce, `opt${k}_ce`, { above: 0, max: 100 });
      if (u0 !== undefined && kf !== undefined) out.cell = { linear: { intercept: u0, slope: unscale(kf, A_PER_KA) } };
      if (ce !== undefined) out.currentEfficiency = unscale(ce, PERCENT);
    } else if (o.kind === 'swap' || o.kind === '') {
      if (T === undefined) {
        f.add(`opt${k}_kind`, 'the study has no cell definition to swap electrodes on: choose plant data, or build the cell on the Cell page');
      } else {
        const anode = swapFromForm(f, k, 'anode', o, T);
        const cathode = swapFromForm(f, k, 'cathode', o, T);
        if (anode) out.anode = anode;
        if (cathode) out.cathode = cathode;
      }
    } else {
      f.add(`opt${k}_kind`, `unknown choice "${o.kind}"`);
    }
    if (priceArea !== undefined) out.pricePerArea = priceArea;
    if (rise !== undefined) out.voltageRisePerYear = unscale(rise, MV_PER_V);
    if (life !== undefined) out.lifeYears = life;
    options.push(out as CoatingOptionRequest);
  });
  f.throwIfAny();
  const request: CoatingsRequest = {
    product,
    currentDensity: scale(jDesign!, A_PER_KA),
    plant: plant!,
    electricityPrice: unscale(price!, KWH_PER_MWH),
    operatingHours: hours!,
    discountRate: unscale(rate!, PERCENT),
    baseline: baseline!,
    options,
  };
  if (form.currency) request.currency = form.currency;
  return parseWithLabels(coatingsRequestSchema, request, coatingsPathLabel);
}

function swapToForm(swap: ElectrodeSwap | undefined, T: number | undefined): { choice: string; slope: string; j0: string } {
  if (!swap) return { choice: 'keep', slope: '', j0: '' };
  if ('dataset' in swap) return { choice: `dataset:${swap.dataset}`, slope: '', j0: '' };
  if ('fit' in swap) return { choice: `fit:${swap.fit}`, slope: '', j0: '' };
  const kin = swap.kinetics;
  const alpha = kin.model === 'tafel' ? kin.transferCoefficient : kin.anodicTransferCoefficient;
  const temperature = T ?? kin.referenceTemperature;
  const slope = temperature === undefined ? '' : formNumber(Number(dec(scale(tafelSlopePerDecade(alpha, temperature), MV_PER_V)).toSignificantDigits(6)));
  return { choice: 'entered', slope, j0: formNumber(kin.exchangeCurrentDensity) };
}

/** Compare request (SI) → form strings. */
export function coatingsFormFromRequest(r: CoatingsRequest, study: Study): CoatingsForm {
  const T = cellTemperatureOf(study);
  const plant = r.plant;
  const form: CoatingsForm = {
    product: r.product,
    jDesign: formNumber(unscale(r.currentDensity, A_PER_KA)),
    sizeMode: 'activeArea' in plant ? 'area' : 'cells' in plant ? 'cells' : 'production',
    area: 'activeArea' in plant ? formNumber(plant.activeArea) : '',
    cells: 'cells' in plant ? String(plant.cells) : '',
    cellArea: 'cells' in plant ? formNumber(plant.cellArea) : '',
    production: 'productionRate' in plant ? formNumber(Number(dec(plant.productionRate).times(86400).div(KG_PER_TONNE).toSignificantDigits(7))) : '',
    price: formNumber(scale(r.electricityPrice, KWH_PER_MWH)),
    hours: formNumber(r.operatingHours),
    rate: formNumber(scale(r.discountRate, PERCENT)),
    currency: r.currency ?? '',
    baseline: String(r.baseline ?? 0),
    options: r.options.map((o) => {
      const linear = o.cell && isLinearSource(o.cell) ? o.cell : undefined;
      const a = swapToForm(o.anode, T);
      const c = swapToForm(o.cathode, T);
      return {
        name: o.name,
        kind: linear ? 'linear' : 'swap',
        anode: a.choice,
        anodeSlope: a.slope,
        anodeJ0: a.j0,
        cathode: c.choice,
        cathodeSlope: c.slope,
        cathodeJ0: c.j0,
        u0: linear ? formNumber(linear.linear.intercept) : '',
        kFactor: linear ? formNumber(scale(linear.linear.slope, A_PER_KA)) : '',
        ce: o.currentEfficiency !== undefined ? formNumber(scale(o.currentEfficiency, PERCENT)) : '',
        price: formNumber(o.pricePerArea),
        rise: formNumber(scale(o.voltageRisePerYear, MV_PER_V)),
        life: String(o.lifeYears),
      };
    }),
  };
  return form;
}

/** Text cut to `max` characters with an ellipsis. */
function shorten(text: string, max: number): string {
  return text.length <= max ? text : `${text.slice(0, max - 1)}…`;
}

/** Short name of a dataset's coating: the text before the first colon, else the dataset name. */
function coatingShortName(d: Dataset): string {
  const head = d.coating.split(':')[0]?.trim();
  return head || d.name;
}

/**
 * The datasets a study offers per electrode and coating: the one measured nearest the cell
 * temperature for each distinct coating.
 */
export function datasetsByCoating(study: Study, electrode: 'anode' | 'cathode'): Dataset[] {
  const T = cellTemperatureOf(study) ?? study.operating.temperature;
  const best = new Map<string, Dataset>();
  for (const d of study.datasets) {
    if (d.electrode !== electrode) continue;
    const key = d.coating || d.id;
    const prev = best.get(key);
    if (!prev || Math.abs(d.temperature - T) < Math.abs(prev.temperature - T)) best.set(key, d);
  }
  return [...best.values()];
}

/**
 * The form a study opens with when it has no coatings section: every anode coating × cathode
 * coating of its datasets (up to 6) as electrode swaps on its cell, money left to fill.
 */
export function defaultCoatingsForm(study: Study): CoatingsForm {
  const hasCell = cellTemperatureOf(study) !== undefined;
  const anodes = datasetsByCoating(study, 'anode');
  const cathodes = datasetsByCoating(study, 'cathode');
  const options: CoatingOptionForm[] = [];
  if (hasCell) {
    const aList = anodes.length ? anodes : [undefined];
    const cList = cathodes.length ? cathodes : [undefined];
    for (const a of aList) {
      for (const c of cList) {
        if (options.length >= MAX_COATING_OPTIONS) break;
        const name = [a ? coatingShortName(a) : 'study anode', c ? coatingShortName(c) : 'study cathode'].join(' + ');
        options.push({ ...blankOption(), name, anode: a ? `dataset:${a.id}` : 'keep', cathode: c ? `dataset:${c.id}` : 'keep' });
      }
    }
  }
  while (options.length < MIN_COATING_OPTIONS) options.push({ ...blankOption(), name: `Option ${options.length + 1}`, kind: hasCell ? 'swap' : 'linear' });
  return {
    product: productsOf(study.chemistry)[0],
    jDesign: '',
    sizeMode: 'area',
    area: '',
    cells: '',
    cellArea: '',
    production: '',
    price: '',
    hours: '8000',
    rate: '',
    currency: '',
    baseline: '0',
    options,
  };
}

/** Choices of the anode/cathode selects: keep, each dataset, each saved fit, entered. */
export function electrodeChoices(study: Study, electrode: 'anode' | 'cathode'): Array<{ value: string; label: string }> {
  const out: Array<{ value: string; label: string }> = [{ value: 'keep', label: 'as in the study’s cell' }];
  for (const d of study.datasets.filter((x) => x.electrode === electrode)) {
    out.push({ value: `dataset:${d.id}`, label: `fit: ${shorten(coatingShortName(d), 24)}, ${kelvinToCelsius(d.temperature).toFixed(0)} °C` });
  }
  for (const fit of study.fits.filter((x) => x.electrode === electrode)) out.push({ value: `fit:${fit.id}`, label: `saved: ${shorten(fit.name, 28)}` });
  out.push({ value: 'entered', label: 'entered (below)' });
  return out;
}

// ---------------------------------------------------------------------------------------------
// Coatings view-model
// ---------------------------------------------------------------------------------------------

export interface CoatingsView {
  basis: MassBasis;
  currency: string;
  productName: string;
  design: Array<{ label: string; value: string; unit: string }>;
  rows: Array<{
    name: string;
    isBaseline: boolean;
    source: string;
    u: string;
    uAvg: string;
    ce: string;
    w: string;
    energy: string;
    energyDiff: string;
    cost: string;
    saving: string;
    capital: string;
    extra: string;
    payback: string;
    npv: string;
    npvSign: 'positive' | 'negative' | 'zero';
    life: string;
    rise: string;
    notes: string[];
  }>;
  kinetics: Array<{ option: string; electrode: string; label: string; slope: string; j0: string; alpha: string; r2: string }>;
  /** Notes of the on-the-fly fits, once per fit. */
  fitNotes: string[];
  npvChart: unknown;
  voltageChart: unknown;
  /** Warnings other than the fit notes. */
  warnings: string[];
}

export function coatingsView(r: CompareResponse, options: { group?: boolean } = {}): CoatingsView {
  const g = options.group === false ? (t: string) => t : grouped;
  const basis = massBasisOf(r.product);
  const money$ = r.currency ? ` ${r.currency}` : '';
  const mwh = (j: number) => sigText(unscale(j, JOULES_PER_MWH), 5);
  const base = r.options[r.baseline];
  const rows: CoatingsView['rows'] = r.options.map((o) => ({
    name: o.name,
    isBaseline: o.isBaseline,
    source: o.source,
    u: sigText(o.cellVoltage, 4),
    uAvg: sigText(o.averageCellVoltage, 4),
    ce: sigText(scale(o.currentEfficiency, PERCENT), 4),
    w: sigText(energyPerBasis(o.specificEnergy, basis), 5),
    energy: mwh(o.annualEnergy),
    energyDiff: o.isBaseline ? '—' : `${o.annualEnergyDifference > 0 ? '+' : ''}${mwh(o.annualEnergyDifference)}`,
    cost: g(o.display.annualEnergyCost),
    saving: o.isBaseline ? '—' : g(o.display.annualSavingVsBaseline),
    capital: g(o.display.coatingCapital),
    extra: o.isBaseline ? '—' : g(o.display.extraCapital),
    payback: o.isBaseline ? '—' : o.simplePaybackYears === null ? 'never' : o.display.simplePaybackYears,
    npv: o.isBaseline ? '0.00' : g(o.display.npvVsBaseline),
    npvSign: o.isBaseline || o.npvVsBaseline === 0 ? 'zero' : o.npvVsBaseline > 0 ? 'positive' : 'negative',
    life: String(o.lifeYears),
    rise: sigText(scale(o.voltageRisePerYear, MV_PER_V), 4),
    notes: o.notes,
  }));
  const kinetics: CoatingsView['kinetics'] = [];
  const fitNotes = new Set<string>();
  for (const o of r.options) {
    for (const e of ['anode', 'cathode'] as const) {
      const k = o.kinetics[e];
      if (!k) continue;
      for (const w of k.warnings ?? []) fitNotes.add(w);
      // One row per distinct kinetics, listing the options that use it.
      const same = kinetics.find((row) => row.electrode === e && row.label === k.label && row.j0 === sigText(k.exchangeCurrentDensity, 4));
      if (same) {
        same.option += `, ${o.name}`;
        continue;
      }
      kinetics.push({
        option: o.name,
        electrode: e,
        label: k.label,
        slope: k.tafelSlope !== undefined && Number.isFinite(k.tafelSlope) ? sigText(scale(k.tafelSlope, MV_PER_V), 4) : '—',
        j0: sigText(k.exchangeCurrentDensity, 4),
        alpha: sigText(k.transferCoefficient, 4),
        r2: k.rSquared !== undefined ? formNumber(Number(dec(k.rSquared).toDecimalPlaces(5))) : '—',
      });
    }
  }
  const design = [
    { label: 'Design current density', value: sigText(unscale(r.currentDensity, A_PER_KA), 4), unit: 'kA/m²' },
    { label: 'Total active area', value: sigText(r.activeArea, 5), unit: 'm²' },
    { label: `Production held for every option (${productLabel(r.product)})`, value: sigText(unscale(r.annualProduction, KG_PER_TONNE), 5), unit: 't/yr' },
    { label: 'Baseline', value: base.name, unit: '' },
  ];
  // The baseline is 0 against itself by definition: the bars show the other options.
  const others = r.options.filter((o) => !o.isBaseline);
  const npvChart = {
    type: 'bar',
    data: {
      labels: others.map((o) => o.name),
      datasets: [
        {
          label: `NPV vs the baseline over the coating life${money$}`,
          data: others.map((o) => o.npvVsBaseline),
          backgroundColor: others.map((o) => (o.npvVsBaseline >= 0 ? COLOURS.positive : COLOURS.negative)),
        },
        {
          label: `Annual energy-cost saving vs the baseline${money$}/yr`,
          data: others.map((o) => o.annualSavingVsBaseline),
          backgroundColor: COLOURS.low,
        },
      ],
    },
    options: {
      plugins: { title: { display: true, text: `NPV and annual saving against “${base.name}”` }, legend: { position: 'bottom' } },
      scales: { y: { title: { display: true, text: `Money${money$}` } } },
    },
  };
  const voltageChart = {
    type: 'scatter',
    data: {
      datasets: r.options.map((o, k) => ({
        label: o.name,
        data: Array.from({ length: o.lifeYears + 1 }, (_, t) => ({ x: t, y: o.cellVoltage + o.voltageRisePerYear * t })),
        showLine: true,
        pointRadius: 2,
        borderColor: COLOURS.series[k % COLOURS.series.length],
        backgroundColor: COLOURS.series[k % COLOURS.series.length],
        borderWidth: o.isBaseline ? 3 : 2,
        borderDash: o.isBaseline ? [6, 4] : [],
      })),
    },
    options: {
      plugins: { title: { display: true, text: `Cell voltage over the coating life at ${sigText(unscale(r.currentDensity, A_PER_KA), 4)} kA/m²` }, legend: { position: 'bottom' } },
      scales: {
        x: { type: 'linear', min: 0, title: { display: true, text: 'Years in service' } },
        y: { type: 'linear', title: { display: true, text: 'Cell voltage (V)' } },
      },
    },
  };
  return {
    basis,
    currency: r.currency,
    productName: productLabel(r.product),
    design,
    rows,
    kinetics,
    fitNotes: [...fitNotes],
    npvChart,
    voltageChart,
    warnings: r.warnings.filter((w) => !fitNotes.has(w)),
  };
}

export function coatingsCsv(r: CompareResponse, studyName: string): string {
  const v = coatingsView(r, { group: false });
  const cur = r.currency || 'currency';
  const head = [['Coating comparison', studyName], ...v.design.map((d) => [d.label, d.value, d.unit]), ['Money rounding', 'decimal, half-up, 2 places']];
  const table = [
    [
      'Option',
      'Baseline',
      'Cell voltage, start (V)',
      'Cell voltage, life average (V)',
      'Current efficiency (%)',
      `Specific energy, start (kWh/${v.basis.unit})`,
      'Annual energy, life average (MWh/yr)',
      'Annual energy vs baseline (MWh/yr)',
      `Annual energy cost (${cur}/yr)`,
      `Annual saving vs baseline (${cur}/yr)`,
      `Coating capital (${cur})`,
      `Extra capital vs baseline (${cur})`,
      'Simple payback (yr)',
      `NPV vs baseline (${cur})`,
      'Life (yr)',
      'Voltage rise (mV/yr)',
      'Cell source',
      'Notes',
    ],
    ...v.rows.map((row) => [row.name, row.isBaseline ? 'yes' : '', row.u, row.uAvg, row.ce, row.w, row.energy, row.energyDiff, row.cost, row.saving, row.capital, row.extra, row.payback, row.npv, row.life, row.rise, row.source, row.notes.join('; ')]),
  ];
  const blocks: Array<Array<Array<string | number>>> = [head, table];
  if (v.kinetics.length) {
    blocks.push([['Electrode', 'Kinetics', 'Used by', 'Tafel slope (mV/decade)', 'j0 (A/m²)', 'alpha', 'R²'], ...v.kinetics.map((k) => [k.electrode, k.label, k.option, k.slope, k.j0, k.alpha, k.r2])]);
  }
  return toCsv(blocks);
}

