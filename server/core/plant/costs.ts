/**
 * Cost per unit of product against current density, the economic current density and a
 * tornado sensitivity.
 *
 * Per kg of product at current density j (money in the user's currency):
 *   specific energy    w(j) = U(j)·z·F/(CE(j)·M)                     [J/kg]
 *   energy cost        c_E = w·p / (3.6e6 J/kWh)                       [currency/kg]
 *   production rate    m″(j) = j·CE(j)·M/(z·F)                         [kg/(m²·s)]
 *   capital cost       c_C = C·CRF / (H·3600 s/h · m″)                 [currency/kg]
 *   total              c = c_E + c_C
 * with p [currency/kWh], C [currency per m² of active area, installed], CRF(i, n) [1/yr],
 * H [operating hours per year].
 *
 * Economic current density, linear cell U = U0 + K·j, constant CE: with a = zF/(CE·M),
 *   c(j) = a·[ (p/3.6e6)·(U0 + K·j) + C·CRF/(3600·H·j) ],
 *   dc/dj = 0  ⇒  j*² = (C·CRF/(3600·H)) / ((p/3.6e6)·K) = 1000·C·CRF/(H·p·K).
 * Units: numerator currency/(m²·s), denominator (currency/J)·(Ω·m²) → A²/m⁴, so j* in A/m².
 * (The textbook form j* = √(C·CRF/(p·K·H)) holds when p is per joule and H in seconds; the
 * factor 1000 = (3.6e6 J/kWh)/(3600 s/h) converts the trade units.) CE and U0 drop out of j*.
 * Otherwise j* is found numerically: a log-spaced scan of the range, then Brent's method.
 *
 * Money: CRF, the final cost figures and their display rounding are decimal (decimal.js);
 * the optimiser itself runs in float64.
 * Source: cost balance and economic current density as in the domain primer §8 (common
 * practice in electrochemical engineering); CRF standard engineering economics.
 */
import type { Decimal } from 'decimal.js';
import { FARADAY } from '../constants.js';
import { ConvergenceError, InputError } from '../errors.js';
import { sig } from './format.js';
import { capitalRecoveryFactor, money, roundMoney } from './money.js';
import { minimizeBracketed } from './optimize1d.js';
import { type CellPerformance, type CellPoint, cellPerformanceIssues, evaluateCell, requirePositive, throwIfIssues } from './performance.js';
import { JOULES_PER_KWH, PRODUCT_SPECS, type ProductId, SECONDS_PER_HOUR } from './products.js';

/** Hours in a 365-day year (365 × 24): the cap on operating hours (our convention; leap years ignored). */
export const HOURS_PER_YEAR = 8760;
/** kg per tonne (exact). */
export const KG_PER_TONNE = 1000;

export interface CostInput {
  product: ProductId;
  cell: CellPerformance;
  /** Electricity price, currency per kWh (DC delivered; include conversion losses in the price). */
  energyPrice: number;
  /** Installed capital per m² of active area (cells, structure, rectifier share…), currency/m². */
  capitalCostPerArea: number;
  /** Operating hours per year, h/yr, (0, 8760]. */
  operatingHoursPerYear: number;
  /** Discount (interest) rate, fraction per year, > −1. */
  discountRate: number;
  /** Capital life, years, > 0. */
  lifeYears: number;
  /** Current-density range searched, A/m². */
  currentDensityRange: { min: number; max: number };
  /** Design current density, A/m² (optional; costed too when given). */
  designCurrentDensity?: number;
}

export interface CostBreakdown {
  currentDensity: number;
  cellVoltage: number;
  currentEfficiency: number;
  /** J/kg. */
  specificEnergy: number;
  /** Production per m² of active area, kg/(m²·s). */
  productionPerArea: number;
  /** currency/kg. */
  energyCost: number;
  /** currency/kg. */
  capitalCost: number;
  /** currency/kg. */
  totalCost: number;
}

/** Money figures per tonne, decimal strings rounded for display. */
export interface CostDisplay {
  energyPerTonne: string;
  capitalPerTonne: string;
  totalPerTonne: string;
  places: number;
  rounding: 'half-up';
}

export interface EconomicCurrentDensityResult {
  currentDensity: number;
  cost: CostBreakdown;
  display: CostDisplay;
  status: 'converged' | 'converged:at-lower-bound' | 'converged:at-upper-bound';
  message: string;
  iterations: number;
  evaluations: number;
  /** Closed form j* = √(1000·C·CRF/(H·p·K)) for a linear cell with K > 0; null otherwise. */
  closedForm: { currentDensity: number; insideRange: boolean } | null;
  capitalRecoveryFactor: number;
  /** The design point costed, when a design current density was given. */
  design: { cost: CostBreakdown; display: CostDisplay } | null;
  warnings: string[];
}

export type SensitivityParameter =
  | 'energyPrice'
  | 'capitalCostPerArea'
  | 'operatingHoursPerYear'
  | 'discountRate'
  | 'lifeYears'
  | 'slope'
  | 'intercept'
  | 'cellVoltage'
  | 'currentEfficiency';

export interface SensitivityRow {
  parameter: SensitivityParameter;
  label: string;
  /** Input value and total cost per tonne with the input lowered. */
  low: { value: number; totalPerTonne: number; display: string };
  high: { value: number; totalPerTonne: number; display: string };
  /** |high − low| total cost per tonne. */
  swing: number;
  note?: string;
}

export interface SensitivityResult {
  /** Current density held fixed for the tornado, A/m². */
  currentDensity: number;
  fraction: number;
  baseTotalPerTonne: number;
  baseDisplay: string;
  /** Rows sorted by swing, largest first. */
  rows: SensitivityRow[];
}

/** Scan points for the economic current density before refinement (61, our choice). */
const SCAN_POINTS = 61;

function validate(input: CostInput): void {
  const issues: { path: string; message: string }[] = [];
  if (!PRODUCT_SPECS[input.product]) issues.push({ path: 'product', message: 'must be one of Cl2, NaOH, H2, O2' });
  issues.push(...cellPerformanceIssues(input.cell, 'cell'));
  requirePositive(issues, 'energyPrice', input.energyPrice, 'per kWh');
  requirePositive(issues, 'capitalCostPerArea', input.capitalCostPerArea, 'per m²');
  requirePositive(issues, 'operatingHoursPerYear', input.operatingHoursPerYear, 'h/yr');
  if (input.operatingHoursPerYear > HOURS_PER_YEAR) issues.push({ path: 'operatingHoursPerYear', message: `must be at most ${HOURS_PER_YEAR} h/yr` });
  if (!Number.isFinite(input.discountRate) || input.discountRate <= -1) issues.push({ path: 'discountRate', message: 'must be a finite rate > −1 (fraction per year)' });
  requirePositive(issues, 'lifeYears', input.lifeYears, 'yr');
  const range = input.currentDensityRange;
  requirePositive(issues, 'currentDensityRange.min', range?.min, 'A/m²');
  requirePositive(issues, 'currentDensityRange.max', range?.max, 'A/m²');
  if (range && range.max <= range.min) issues.push({ path: 'currentDensityRange.max', message: 'must be above the minimum' });
  if (input.designCurrentDensity !== undefined) requirePositive(issues, 'designCurrentDensity', input.designCurrentDensity, 'A/m²');
  throwIfIssues('cost input is not valid', issues);
}

/** CRF as float64 for the cost kernels (computed once in decimal). */
function crfNumber(input: CostInput): number {
  return capitalRecoveryFactor(input.discountRate, input.lifeYears).toNumber();
}

/** Cost kernel (trusting, float64): see the module note. `crf` in 1/yr. */
function costAt(input: CostInput, j: number, crf: number): CostBreakdown {
  const p = PRODUCT_SPECS[input.product];
  const point: CellPoint = evaluateCell(input.cell, j, 'cell');
  const chargePerKg = (p.electronsPerMolecule * FARADAY.value) / p.molarMass; // C/kg at 100 % CE
  const specificEnergy = (point.cellVoltage * chargePerKg) / point.currentEfficiency;
  const productionPerArea = (j * point.currentEfficiency) / chargePerKg;
  const energyCost = (specificEnergy / JOULES_PER_KWH) * input.energyPrice;
  const capitalCost = (input.capitalCostPerArea * crf) / (input.operatingHoursPerYear * SECONDS_PER_HOUR * productionPerArea);
  return {
    currentDensity: j,
    cellVoltage: point.cellVoltage,
    currentEfficiency: point.currentEfficiency,
    specificEnergy,
    productionPerArea,
    energyCost,
    capitalCost,
    totalCost: energyCost + capitalCost,
  };
}

/**
 * Check of a scanned cost figure before the optimum search: a cost that overflows float64
 * over the search range would stop the search with no field named ("objective not finite");
 * instead it is an InputError on the input that drives the overflow (the inputs are far
 * outside any real plant, typically a unit slip):
 *   specific energy U·z·F/(CE·M) not finite → `cell` (cell voltage or current efficiency);
 *   energy cost w·p/3.6e6 not finite        → `energyPrice`;
 *   CRF not finite (a life of ~1e-308 yr)   → `lifeYears`;
 *   C·CRF not finite                         → `capitalCostPerArea`;
 *   otherwise the capital cost per kg       → `operatingHoursPerYear` (hours × production too small).
 */
function requireFiniteCost(input: CostInput, cost: CostBreakdown, crf: number): CostBreakdown {
  if (Number.isFinite(cost.totalCost)) return cost;
  const at = `at ${sig(cost.currentDensity)} A/m²`;
  const advice = 'some input is far outside the range of a real plant; check its unit';
  if (!Number.isFinite(cost.specificEnergy)) {
    throw new InputError('cell', `the specific energy overflows ${at} (cell voltage ${sig(cost.cellVoltage)} V, current efficiency ${sig(cost.currentEfficiency)}); ${advice}`);
  }
  if (!Number.isFinite(cost.energyCost)) {
    throw new InputError('energyPrice', `the energy cost per kg overflows ${at} with an electricity price of ${sig(input.energyPrice)} per kWh; ${advice}`);
  }
  if (!Number.isFinite(crf)) {
    throw new InputError('lifeYears', `the capital recovery factor overflows for a life of ${sig(input.lifeYears)} years; ${advice}`);
  }
  if (!Number.isFinite(input.capitalCostPerArea * crf)) {
    throw new InputError('capitalCostPerArea', `the annual capital charge per m² overflows (capital ${sig(input.capitalCostPerArea)} per m² × capital recovery factor ${sig(crf)} per year); ${advice}`);
  }
  throw new InputError('operatingHoursPerYear', `the capital cost per kg overflows ${at}: ${sig(input.operatingHoursPerYear)} h/yr produce almost nothing; ${advice}`);
}

/**
 * Cost per kg of product at current density j [A/m²]: energy, capital and total [currency/kg]
 * with the specific energy [J/kg] and production per area [kg/(m²·s)]. Validates the input.
 */
export function productionCost(input: CostInput, currentDensity: number): CostBreakdown {
  validate(input);
  if (!(currentDensity > 0) || !Number.isFinite(currentDensity)) throw new InputError('currentDensity', 'must be a finite current density > 0 A/m²');
  return costAt(input, currentDensity, crfNumber(input));
}

/**
 * Money figures per tonne in decimal, rounded half-up to `places` for display:
 * energy = w[kWh/t]·p; capital = C·CRF/(H·m″[t/(m²·h)]).
 */
export function costDisplay(input: CostInput, cost: CostBreakdown, places = 2): CostDisplay {
  const crf: Decimal = capitalRecoveryFactor(input.discountRate, input.lifeYears);
  const kWhPerTonne = money(cost.specificEnergy).times(KG_PER_TONNE).div(JOULES_PER_KWH);
  const energy = kWhPerTonne.times(money(input.energyPrice, 'energyPrice'));
  const tonnesPerAreaHour = money(cost.productionPerArea).times(SECONDS_PER_HOUR).div(KG_PER_TONNE);
  const capital = money(input.capitalCostPerArea, 'capitalCostPerArea').times(crf).div(money(input.operatingHoursPerYear).times(tonnesPerAreaHour));
  return {
    energyPerTonne: roundMoney(energy, places),
    capitalPerTonne: roundMoney(capital, places),
    totalPerTonne: roundMoney(energy.plus(capital), places),
    places,
    rounding: 'half-up',
  };
}

/**
 * Closed-form economic current density of a linear cell with constant CE:
 * j* = √(1000·C·CRF/(H·p·K)) [A/m²] (derivation in the module note); null when K = 0,
 * when j* overflows float64 (K negligible against the capital charge), or the cell is not linear.
 */
export function closedFormEconomicCurrentDensity(input: CostInput): number | null {
  validate(input);
  if (input.cell.kind !== 'linear' || input.cell.slope <= 0) return null;
  const crf = crfNumber(input);
  const capitalPerAreaSecond = (input.capitalCostPerArea * crf) / (input.operatingHoursPerYear * SECONDS_PER_HOUR); // currency/(m²·s)
  const pricePerJoule = input.energyPrice / JOULES_PER_KWH; // currency/J
  const jStar = Math.sqrt(capitalPerAreaSecond / (pricePerJoule * input.cell.slope));
  return Number.isFinite(jStar) ? jStar : null;
}

/**
 * Economic current density: minimum of total cost per kg over the given range.
 * Log-spaced scan (61 points), then Brent's method on ln j around the best scan point
 * (tolerance 1e-8 in ln j, i.e. about √ε: a smooth minimum cannot be located closer in float64). A minimum at a range end is reported as such with a warning.
 * Throws ConvergenceError when the refinement fails.
 */
export function economicCurrentDensity(input: CostInput): EconomicCurrentDensityResult {
  validate(input);
  const crf = crfNumber(input);
  const warnings: string[] = [];
  const lnMin = Math.log(input.currentDensityRange.min);
  const lnMax = Math.log(input.currentDensityRange.max);
  const total = (lnJ: number) => costAt(input, Math.exp(lnJ), crf).totalCost;
  const grid = Array.from({ length: SCAN_POINTS }, (_, k) => lnMin + ((lnMax - lnMin) * k) / (SCAN_POINTS - 1));
  const values = grid.map((lnJ) => requireFiniteCost(input, costAt(input, Math.exp(lnJ), crf), crf).totalCost);
  let best = 0;
  for (let k = 1; k < SCAN_POINTS; k++) if (values[k] < values[best]) best = k;
  const lo = grid[Math.max(0, best - 1)];
  const hi = grid[Math.min(SCAN_POINTS - 1, best + 1)];
  // atol 1e-8 in ln j: j* to about 1e-8 relative (project choice).
  const min = minimizeBracketed(total, lo, hi, { rtol: 0, atol: 1e-8 });
  if (min.status !== 'converged') throw new ConvergenceError(`economic current density: ${min.message}`, min.iterations);
  let lnJ = min.x;
  let fx = min.fx;
  // A scan end can be lower than the refined interior point only when the optimum is there.
  if (values[0] < fx) {
    lnJ = lnMin;
    fx = values[0];
  }
  if (values[SCAN_POINTS - 1] < fx) {
    lnJ = lnMax;
    fx = values[SCAN_POINTS - 1];
  }
  // An optimum within 1e-6 in ln j of a range end counts as at that end (project choice).
  const edgeTol = 1e-6;
  let status: EconomicCurrentDensityResult['status'] = 'converged';
  let message = 'minimum inside the range';
  const j = lnJ <= lnMin + edgeTol ? input.currentDensityRange.min : lnJ >= lnMax - edgeTol ? input.currentDensityRange.max : Math.exp(lnJ);
  if (lnJ <= lnMin + edgeTol) {
    status = 'converged:at-lower-bound';
    message = 'cost is lowest at the lower end of the range';
    warnings.push(`The lowest cost lies at the lower end of the range (${sig(j)} A/m²): widen the range downward to find the true economic current density.`);
  } else if (lnJ >= lnMax - edgeTol) {
    status = 'converged:at-upper-bound';
    message = 'cost is lowest at the upper end of the range';
    warnings.push(`The lowest cost lies at the upper end of the range (${sig(j)} A/m²): the cell limits (voltage, heat, gas release, membrane) set the current density, not the cost balance.`);
  }
  const cost = costAt(input, j, crf);
  const closed = closedFormEconomicCurrentDensity(input);
  const closedForm =
    closed === null ? null : { currentDensity: closed, insideRange: closed >= input.currentDensityRange.min && closed <= input.currentDensityRange.max };
  let design: EconomicCurrentDensityResult['design'] = null;
  if (input.designCurrentDensity !== undefined) {
    const dCost = costAt(input, input.designCurrentDensity, crf);
    design = { cost: dCost, display: costDisplay(input, dCost) };
    // Warn when the design point costs over 5 % more than the optimum (project choice).
    if (dCost.totalCost > cost.totalCost * 1.05) {
      warnings.push(`The design current density costs ${sig((dCost.totalCost / cost.totalCost - 1) * 100, 3)} % more per tonne than the economic one.`);
    }
  }
  return {
    currentDensity: j,
    cost,
    display: costDisplay(input, cost),
    status,
    message,
    iterations: min.iterations,
    evaluations: min.evaluations + SCAN_POINTS,
    closedForm,
    capitalRecoveryFactor: crf,
    design,
    warnings,
  };
}

const LABELS: Record<SensitivityParameter, string> = {
  energyPrice: 'electricity price',
  capitalCostPerArea: 'capital cost per m²',
  operatingHoursPerYear: 'operating hours per year',
  discountRate: 'discount rate',
  lifeYears: 'capital life',
  slope: 'K-factor (slope)',
  intercept: 'U0 (intercept)',
  cellVoltage: 'cell voltage',
  currentEfficiency: 'current efficiency',
};

/** The input with one parameter scaled by `factor`; notes any cap applied. */
function scaled(input: CostInput, parameter: SensitivityParameter, factor: number): { input: CostInput; value: number; note?: string } {
  const out: CostInput = { ...input };
  const cell = input.cell;
  switch (parameter) {
    case 'energyPrice':
    case 'capitalCostPerArea':
    case 'discountRate':
    case 'lifeYears': {
      out[parameter] = input[parameter] * factor;
      return { input: out, value: out[parameter] };
    }
    case 'operatingHoursPerYear': {
      const h = input.operatingHoursPerYear * factor;
      out.operatingHoursPerYear = Math.min(h, HOURS_PER_YEAR);
      return { input: out, value: out.operatingHoursPerYear, note: h > HOURS_PER_YEAR ? `capped at ${HOURS_PER_YEAR} h/yr` : undefined };
    }
    case 'slope':
    case 'intercept': {
      if (cell.kind !== 'linear') throw new InputError('cell', `${parameter} applies to a linear cell only`);
      out.cell = { ...cell, [parameter]: cell[parameter] * factor };
      return { input: out, value: cell[parameter] * factor };
    }
    case 'currentEfficiency': {
      if (cell.kind === 'linear') {
        const ce = Math.min(1, cell.currentEfficiency * factor);
        out.cell = { ...cell, currentEfficiency: ce };
        return { input: out, value: ce, note: cell.currentEfficiency * factor > 1 ? 'capped at 1' : undefined };
      }
      out.cell = {
        kind: 'model',
        thermoneutralVoltage: cell.thermoneutralVoltage,
        evaluate: (j: number) => {
          const r = cell.evaluate(j);
          return { ...r, currentEfficiency: Math.min(1, r.currentEfficiency * factor) };
        },
      };
      return { input: out, value: factor, note: 'factor on the model’s current efficiency, capped at 1' };
    }
    case 'cellVoltage': {
      if (cell.kind !== 'model') throw new InputError('cell', 'cellVoltage scaling applies to a cell model; use slope and intercept for a linear cell');
      out.cell = {
        kind: 'model',
        thermoneutralVoltage: cell.thermoneutralVoltage,
        evaluate: (j: number) => {
          const r = cell.evaluate(j);
          return { ...r, cellVoltage: r.cellVoltage * factor };
        },
      };
      return { input: out, value: factor, note: 'factor on the model’s cell voltage' };
    }
  }
}

/**
 * Tornado sensitivity: total cost per tonne at a fixed current density (default: the economic
 * one) with each input lowered and raised by `fraction` (default 0.2 = ±20 %) in turn:
 * price, capital, hours, rate, life and, for a linear cell, K, U0 and CE (for a cell model,
 * cell voltage and CE as factors). Hours and CE are capped at their physical limits.
 * Rows sorted by swing. Money display: decimal, half-up, 2 places.
 */
export function costSensitivity(input: CostInput, options: { currentDensity?: number; fraction?: number } = {}): SensitivityResult {
  validate(input);
  // Default ±20 % swing (project choice).
  const fraction = options.fraction ?? 0.2;
  if (!(fraction > 0 && fraction < 1)) throw new InputError('fraction', 'must be in (0, 1)');
  const j = options.currentDensity ?? economicCurrentDensity(input).currentDensity;
  if (!(j > 0) || !Number.isFinite(j)) throw new InputError('currentDensity', 'must be a finite current density > 0 A/m²');
  const base = costAt(input, j, crfNumber(input));
  const parameters: SensitivityParameter[] = ['energyPrice', 'capitalCostPerArea', 'operatingHoursPerYear', 'discountRate', 'lifeYears'];
  if (input.cell.kind === 'linear') parameters.push('slope', 'intercept', 'currentEfficiency');
  else parameters.push('cellVoltage', 'currentEfficiency');
  const rows: SensitivityRow[] = parameters.map((parameter) => {
    const side = (factor: number) => {
      const s = scaled(input, parameter, factor);
      validate(s.input);
      const c = costAt(s.input, j, crfNumber(s.input));
      return { value: s.value, totalPerTonne: c.totalCost * KG_PER_TONNE, display: costDisplay(s.input, c).totalPerTonne, note: s.note };
    };
    const low = side(1 - fraction);
    const high = side(1 + fraction);
    const note = [low.note, high.note].filter(Boolean).join('; ') || undefined;
    const row: SensitivityRow = {
      parameter,
      label: LABELS[parameter],
      low: { value: low.value, totalPerTonne: low.totalPerTonne, display: low.display },
      high: { value: high.value, totalPerTonne: high.totalPerTonne, display: high.display },
      swing: Math.abs(high.totalPerTonne - low.totalPerTonne),
    };
    if (note) row.note = note;
    return row;
  });
  rows.sort((a, b) => b.swing - a.swing);
  return {
    currentDensity: j,
    fraction,
    baseTotalPerTonne: base.totalCost * KG_PER_TONNE,
    baseDisplay: costDisplay(input, base).totalPerTonne,
    rows,
  };
}
