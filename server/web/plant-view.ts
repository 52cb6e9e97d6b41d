/**
 * Plant page and plant APIs, web side: the sizing and shunt requests in SI, the page form in
 * the engineer's units (t/day, kA/m², kA, %, mm, mm²) with its conversion to the study's SI
 * `plant` section, the calls into the plant core, and the view-model (tables, charts, the
 * design-basis text, CSV). No physics here: the core sizes and solves; this file converts
 * units, picks inputs and formats.
 */
import Papa from 'papaparse';
import { Decimal } from 'decimal.js';
import { InputError, PhysicsError, type IssueDetail } from '../core/errors.js';
import { UNIT_TABLES, fromSI, toSI } from '../core/units.js';
import {
  PRODUCT_SPECS,
  cellAreaResistanceAt,
  electrochemicalEquivalent,
  electrolytePathResistance,
  evaluateCell,
  sizePlant,
  solveShuntCurrents,
  type CellPerformance,
  type PlantChemistry,
  type ProductId,
  type RectifierSpec,
  type ShuntCircuit,
  type ShuntInput,
  type ShuntResult,
  type SizingResult,
} from '../core/plant/index.js';
import type { Study } from '../scenario/schema.js';
import { MAX_SHUNT_CELLS, plantSectionSchema, type PlantProduct, type PlantSection, type ShuntCircuitInput } from '../scenario/plant-sections.js';
import { cellSourceSchema, plantChemistryOf, toCellPerformance, type CellSource } from './cell-source.js';
import { describeError, zodIssues } from './errors.js';
import { fixed, fmt } from './format.js';

// ---------------------------------------------------------------------------------------------
// Units used on the page (exact factors from core/units.ts)

const KA_M2 = UNIT_TABLES.currentDensity['kA/m2'];
const KA = UNIT_TABLES.current.kA;
const MM = UNIT_TABLES.length.mm;
/** 1 mm² = 1e-6 m² (exact by definition). */
const MM2_IN_M2 = 1e-6;
/** Percent per unit fraction (exact). */
const PERCENT = 100;
const MW = UNIT_TABLES.power.MW;
const KW = UNIT_TABLES.power.kW;
/** 1 µΩ = 1e-6 Ω (exact). */
const MICRO_OHM = 1e-6;

export type RateUnit = 't/day' | 't/year' | 'kg/day';
export const RATE_UNITS: readonly RateUnit[] = ['t/day', 't/year', 'kg/day'];
export const PRODUCT_LABELS: Record<ProductId, string> = { Cl2: 'chlorine (Cl₂)', NaOH: 'caustic soda (NaOH, 100 %)', H2: 'hydrogen (H₂)', O2: 'oxygen (O₂)' };

/** Target products offered per plant chemistry. */
export function targetProducts(chemistry: PlantChemistry): PlantProduct[] {
  return chemistry === 'chlor-alkali' ? ['Cl2', 'NaOH', 'H2'] : ['H2'];
}

/** Products made beside the target (their current efficiency may be set apart). */
export function coProductsOf(chemistry: PlantChemistry, target: ProductId): ProductId[] {
  const all: ProductId[] = chemistry === 'chlor-alkali' ? ['Cl2', 'NaOH', 'H2'] : ['H2', 'O2'];
  return all.filter((id) => id !== target);
}

// ---------------------------------------------------------------------------------------------
// Error paths: the core names its own fields; the API and the page name theirs.

/** Core sizing path → API body path. */
export const API_SIZING_PATHS: Record<string, string> = {
  'target.massRate': 'productionRate',
  'target.product': 'product',
  designCurrentDensity: 'currentDensity',
  activeAreaPerCell: 'cellArea',
  'cell.currentEfficiency': 'currentEfficiency',
  'cell.intercept': 'cell.linear.intercept',
  'cell.slope': 'cell.linear.slope',
  'cell.currentDensity': 'currentDensity',
};

/** Core sizing path → page form field. */
export const PAGE_SIZING_PATHS: Record<string, string> = {
  'target.massRate': 'productionRate',
  'target.product': 'product',
  designCurrentDensity: 'currentDensity',
  activeAreaPerCell: 'cellArea',
  'rectifier.maxVoltage': 'rectifierVoltage',
  'rectifier.maxCurrent': 'rectifierCurrent',
  'rectifier.efficiency': 'rectifierEfficiency',
  'cell.currentEfficiency': 'currentEfficiency',
  'cell.intercept': 'intercept',
  'cell.slope': 'kFactor',
  currentEfficiency: 'currentEfficiency',
  'cell.currentDensity': 'currentDensity',
  cell: 'cellSource',
};

function mapPath(path: string, map: Record<string, string>): string {
  if (map[path] !== undefined) return map[path];
  let best = '';
  for (const key of Object.keys(map)) {
    if ((path.startsWith(`${key}.`) || path.startsWith(`${key}[`)) && key.length > best.length) best = key;
  }
  return best ? map[best] + path.slice(best.length) : path;
}

/** Re-throw an InputError/PhysicsError with its issue paths renamed by `map` (longest prefix). */
export function rethrowMapped(err: unknown, map: Record<string, string>): never {
  if (err instanceof InputError) {
    const issues = err.issues.map((i) => ({ path: mapPath(i.path, map), message: i.message }));
    throw InputError.many(err.message.replace(/^[\w.[\]]+:/, (m) => `${mapPath(m.slice(0, -1), map)}:`), issues);
  }
  if (err instanceof PhysicsError) {
    const first = err.issues[0];
    throw new PhysicsError(mapPath(first?.path ?? '', map), first?.message ?? err.message);
  }
  throw err;
}

// ---------------------------------------------------------------------------------------------
// Sizing and shunt in SI (shared by the API and the page)

export interface SizingRequest {
  chemistry: PlantChemistry;
  product: PlantProduct;
  /** kg/s. */
  productionRate: number;
  /** A/m². */
  currentDensity: number;
  /** m². */
  cellArea: number;
  cell: CellSource;
  /** 0–1; required with a linear cell, overrides the model's CE otherwise. */
  currentEfficiency?: number;
  coProductCurrentEfficiency?: Partial<Record<ProductId, number>>;
  rectifier: RectifierSpec;
  /** V, optional override of U_tn for the heat load. */
  thermoneutralVoltage?: number;
}

export interface SizingRun {
  sizing: SizingResult;
  performance: CellPerformance;
}

/**
 * Most cells one sizing may give (project choice): 1e6 cells is about 25 GW of 3 m² water
 * electrolysis cells at 4 kA/m² and 2 V, beyond any plant built. The core lays out every
 * electrolyser, so without a bound one request with absurd units (say 100 kg/s at 1 A/m² on
 * 10 cm² cells) would exhaust the server's memory.
 */
export const MAX_PLANT_CELLS = 1_000_000;
/**
 * Smallest target accepted, as a fraction of what one cell makes at the design point
 * (project choice, 1e-6): below it the "plant" is one cell idling at under a millionth of its
 * design current density, which no sizing question asks.
 */
export const MIN_CELL_FRACTION = 1e-6;

/**
 * Front-door check of the plant's scale before the core lays it out: cells needed at the
 * design point, N = ṁ/(e·CE·j·A_cell) with e = M/(zF) the electrochemical equivalent (Faraday's
 * law; ṁ kg/s, e kg/C, CE fraction, j A/m², A_cell m²). Throws InputError on the target's path
 * (`target.massRate`, renamed by the caller) when N is not finite, above MAX_PLANT_CELLS or
 * below MIN_CELL_FRACTION.
 */
function checkPlantScale(req: SizingRequest, performance: CellPerformance): void {
  const chargeRate = req.productionRate / electrochemicalEquivalent(PRODUCT_SPECS[req.product]);
  const { currentEfficiency } = evaluateCell(performance, req.currentDensity, 'cell');
  const cellsExact = chargeRate / currentEfficiency / (req.currentDensity * req.cellArea);
  const at = `cells of ${req.cellArea.toPrecision(3)} m² at ${req.currentDensity.toPrecision(3)} A/m²`;
  if (!(cellsExact <= MAX_PLANT_CELLS)) {
    const count = Number.isFinite(cellsExact) ? `about ${cellsExact.toPrecision(3)}` : 'more';
    throw new InputError('target.massRate', `the target needs ${count} ${at}, above the ${MAX_PLANT_CELLS} cells a sizing handles; check the units of the production rate, current density and cell area`);
  }
  if (!(cellsExact >= MIN_CELL_FRACTION)) {
    throw new InputError('target.massRate', `the target is below a millionth of what one cell makes (${at}); check the units of the production rate, current density and cell area`);
  }
}

/**
 * Size the plant (core sizePlant) for an SI request. Errors keep the core's reason with the
 * path renamed by `paths` (API body or page form names).
 */
export function runSizing(req: SizingRequest, paths: Record<string, string>): SizingRun {
  try {
    const performance = toCellPerformance(req.cell, req.currentEfficiency, 'cell', req.product);
    checkPlantScale(req, performance);
    const sizing = sizePlant({
      chemistry: req.chemistry,
      target: { product: req.product, massRate: req.productionRate },
      designCurrentDensity: req.currentDensity,
      activeAreaPerCell: req.cellArea,
      rectifier: req.rectifier,
      cell: performance,
      ...(req.thermoneutralVoltage !== undefined ? { thermoneutralVoltage: req.thermoneutralVoltage } : {}),
      ...(req.coProductCurrentEfficiency ? { coProductCurrentEfficiency: req.coProductCurrentEfficiency } : {}),
    });
    return { sizing, performance };
  } catch (err) {
    rethrowMapped(err, paths);
  }
}

/**
 * Resistances of the electrolyte circuits, Ω: given directly, or R = L/(σ·A) from the duct
 * geometry (core electrolytePathResistance). `pathOf(i, field)` names a field for errors.
 */
export function resolveCircuits(circuits: ShuntCircuitInput[], pathOf: (index: number, field: string) => string): ShuntCircuit[] {
  return circuits.map((c, i) => {
    const name = c.name && c.name.trim() ? c.name.trim() : `circuit ${i + 1}`;
    if ('channelResistance' in c) {
      return { name, channelResistance: c.channelResistance, manifoldSegmentResistance: c.manifoldSegmentResistance };
    }
    const duct = (d: { length: number; crossSection: number }, which: 'channel' | 'manifoldSegment') => {
      try {
        return electrolytePathResistance(d.length, d.crossSection, c.conductivity);
      } catch (err) {
        if (err instanceof InputError) {
          const issues = err.issues.map((is) => ({ path: pathOf(i, is.path === 'conductivity' ? 'conductivity' : `${which}.${is.path}`), message: is.message }));
          throw InputError.many(err.message, issues);
        }
        throw err;
      }
    };
    return { name, channelResistance: duct(c.channel, 'channel'), manifoldSegmentResistance: duct(c.manifoldSegment, 'manifoldSegment') };
  });
}

// ---------------------------------------------------------------------------------------------
// The page form (strings as typed, so a 400 re-render keeps them)

export type CircuitMode = 'resistance' | 'geometry' | 'off';

export interface CircuitForm {
  name: string;
  mode: CircuitMode;
  /** Ω. */
  channelResistance: string;
  /** Ω. */
  manifoldResistance: string;
  /** S/m. */
  conductivity: string;
  /** mm. */
  channelLength: string;
  /** mm². */
  channelArea: string;
  /** mm. */
  manifoldLength: string;
  /** mm². */
  manifoldArea: string;
}

export interface PlantForm {
  product: PlantProduct;
  productionRate: string;
  rateUnit: RateUnit;
  /** kA/m². */
  currentDensity: string;
  /** m². */
  cellArea: string;
  cellSource: 'plant-data' | 'study-cell';
  /** V. */
  intercept: string;
  /** V per kA/m². */
  kFactor: string;
  /** %. */
  currentEfficiency: string;
  /** % per co-product. */
  coProductCe: Partial<Record<ProductId, string>>;
  /** V. */
  rectifierVoltage: string;
  /** kA. */
  rectifierCurrent: string;
  /** %. */
  rectifierEfficiency: string;
  /** Blank: the largest electrolyser of the sizing. */
  shuntCells: string;
  circuits: CircuitForm[];
}

/** Circuit rows shown on the form (at least this many, our choice: 4 covers anolyte/catholyte in and out). */
export const MIN_CIRCUIT_ROWS = 4;
export const MAX_CIRCUIT_ROWS = 8;

export const FIELD_LABELS: Record<string, string> = {
  product: 'Product',
  productionRate: 'Production target',
  rateUnit: 'Production unit',
  currentDensity: 'Design current density',
  cellArea: 'Active area per cell',
  cellSource: 'Cell source',
  intercept: 'Cell line intercept U0',
  kFactor: 'K-factor',
  currentEfficiency: 'Current efficiency',
  rectifierVoltage: 'Rectifier maximum voltage',
  rectifierCurrent: 'Rectifier maximum current',
  rectifierEfficiency: 'Rectifier efficiency',
  shuntCells: 'Cells in series',
};

function blankCircuit(): CircuitForm {
  return { name: '', mode: 'off', channelResistance: '', manifoldResistance: '', conductivity: '', channelLength: '', channelArea: '', manifoldLength: '', manifoldArea: '' };
}

/** Exact decimal text of an SI value shown in a display unit (value/factor, 10 significant digits, no exponent noise). */
export function fieldText(value: number | undefined, factor = 1, significantDigits = 10): string {
  if (value === undefined || !Number.isFinite(value)) return '';
  return new Decimal(value).div(factor).toSignificantDigits(significantDigits).toString();
}

/**
 * Starting values for a study with no plant section, per chemistry (our choice, inside the
 * orientation ranges of check-values §9a–9c; they are placeholders to edit, not data).
 */
export function defaultPlantForm(chemistry: Study['chemistry']): PlantForm {
  const base = {
    rateUnit: 't/day' as RateUnit,
    cellSource: 'plant-data' as const,
    coProductCe: {},
    shuntCells: '',
    circuits: Array.from({ length: MIN_CIRCUIT_ROWS }, blankCircuit),
  };
  if (chemistry === 'chlor-alkali') {
    return { ...base, product: 'Cl2', productionRate: '100', currentDensity: '5.5', cellArea: '2.7', intercept: '2.35', kFactor: '0.1', currentEfficiency: '96', rectifierVoltage: '450', rectifierCurrent: '16', rectifierEfficiency: '97' };
  }
  if (chemistry === 'alkaline-water') {
    return { ...base, product: 'H2', rateUnit: 'kg/day', productionRate: '2000', currentDensity: '4', cellArea: '2.5', intercept: '1.55', kFactor: '0.08', currentEfficiency: '99', rectifierVoltage: '400', rectifierCurrent: '12', rectifierEfficiency: '96' };
  }
  return { ...base, product: 'H2', rateUnit: 'kg/day', productionRate: '2000', currentDensity: '20', cellArea: '0.3', intercept: '1.5', kFactor: '0.015', currentEfficiency: '99', rectifierVoltage: '400', rectifierCurrent: '8', rectifierEfficiency: '96' };
}

function circuitToForm(c: ShuntCircuitInput): CircuitForm {
  const f = blankCircuit();
  f.name = c.name ?? '';
  if ('channelResistance' in c) {
    f.mode = 'resistance';
    f.channelResistance = fieldText(c.channelResistance);
    f.manifoldResistance = fieldText(c.manifoldSegmentResistance);
  } else {
    f.mode = 'geometry';
    f.conductivity = fieldText(c.conductivity);
    f.channelLength = fieldText(c.channel.length, MM);
    f.channelArea = fieldText(c.channel.crossSection, MM2_IN_M2);
    f.manifoldLength = fieldText(c.manifoldSegment.length, MM);
    f.manifoldArea = fieldText(c.manifoldSegment.crossSection, MM2_IN_M2);
  }
  return f;
}

/** The form filled from a study's plant section (SI → engineer's units). */
export function formFromSection(section: PlantSection, chemistry: Study['chemistry']): PlantForm {
  const defaults = defaultPlantForm(chemistry);
  const rateUnit: RateUnit = section.rateUnit ?? (section.product === 'H2' ? 'kg/day' : 't/day');
  const circuits = (section.shunt?.circuits ?? []).map(circuitToForm);
  while (circuits.length < MIN_CIRCUIT_ROWS) circuits.push(blankCircuit());
  const coProductCe: Partial<Record<ProductId, string>> = {};
  for (const [id, v] of Object.entries(section.coProductCurrentEfficiency ?? {})) {
    if (v !== undefined) coProductCe[id as ProductId] = fieldText(v * PERCENT);
  }
  return {
    product: section.product,
    productionRate: fieldText(fromSI(section.productionRate, 'massRate', rateUnit)),
    rateUnit,
    currentDensity: fieldText(section.currentDensity, KA_M2),
    cellArea: fieldText(section.cellArea),
    cellSource: section.cellSource,
    intercept: section.linear ? fieldText(section.linear.intercept) : defaults.intercept,
    kFactor: section.linear ? fieldText(section.linear.slope * KA_M2) : defaults.kFactor,
    currentEfficiency: section.currentEfficiency !== undefined ? fieldText(section.currentEfficiency * PERCENT) : '',
    coProductCe,
    rectifierVoltage: fieldText(section.rectifier.maxVoltage),
    rectifierCurrent: fieldText(section.rectifier.maxCurrent, KA),
    rectifierEfficiency: fieldText(section.rectifier.efficiency * PERCENT),
    shuntCells: section.shunt?.cells !== undefined ? String(section.shunt.cells) : '',
    circuits,
  };
}

function text(v: unknown, max = 40): string {
  return typeof v === 'string' ? v.trim().slice(0, max) : '';
}

function pick<T extends string>(v: unknown, allowed: readonly T[], fallback: T): T {
  return typeof v === 'string' && (allowed as readonly string[]).includes(v) ? (v as T) : fallback;
}

/** Read the posted form (urlencoded, flat names) without judging it. */
export function readPlantForm(body: Record<string, unknown> | undefined, chemistry: Study['chemistry']): PlantForm {
  const b = body ?? {};
  const defaults = defaultPlantForm(chemistry);
  const circuits: CircuitForm[] = [];
  for (let i = 0; i < MAX_CIRCUIT_ROWS; i++) {
    if (b[`circuit${i}Mode`] === undefined && b[`circuit${i}Name`] === undefined) continue;
    circuits.push({
      name: text(b[`circuit${i}Name`], 80),
      mode: pick(b[`circuit${i}Mode`], ['resistance', 'geometry', 'off'] as const, 'off'),
      channelResistance: text(b[`circuit${i}ChannelR`]),
      manifoldResistance: text(b[`circuit${i}ManifoldR`]),
      conductivity: text(b[`circuit${i}Conductivity`]),
      channelLength: text(b[`circuit${i}ChannelLength`]),
      channelArea: text(b[`circuit${i}ChannelArea`]),
      manifoldLength: text(b[`circuit${i}ManifoldLength`]),
      manifoldArea: text(b[`circuit${i}ManifoldArea`]),
    });
  }
  while (circuits.length < MIN_CIRCUIT_ROWS) circuits.push(blankCircuit());
  const coProductCe: Partial<Record<ProductId, string>> = {};
  for (const id of ['Cl2', 'NaOH', 'H2', 'O2'] as ProductId[]) {
    const v = text(b[`coCe_${id}`]);
    if (v) coProductCe[id] = v;
  }
  return {
    product: pick(b.product, targetProducts(plantChemistryOf(chemistry)), defaults.product),
    productionRate: text(b.productionRate),
    rateUnit: pick(b.rateUnit, RATE_UNITS, defaults.rateUnit),
    currentDensity: text(b.currentDensity),
    cellArea: text(b.cellArea),
    cellSource: pick(b.cellSource, ['plant-data', 'study-cell'] as const, 'plant-data'),
    intercept: text(b.intercept),
    kFactor: text(b.kFactor),
    currentEfficiency: text(b.currentEfficiency),
    coProductCe,
    rectifierVoltage: text(b.rectifierVoltage),
    rectifierCurrent: text(b.rectifierCurrent),
    rectifierEfficiency: text(b.rectifierEfficiency),
    shuntCells: text(b.shuntCells),
    circuits,
  };
}

/** Collects form issues (path = form field name, message names the field in words). */
class FormIssues {
  readonly list: IssueDetail[] = [];
  add(path: string, message: string): void {
    this.list.push({ path, message });
  }
  /**
   * Parse a number typed by a person: decimal point, optional exponent; a comma is refused
   * (ambiguous between decimal and thousands separator). Empty → undefined (or an issue when required).
   */
  number(path: string, raw: string, label: string, opts: { required?: boolean; min?: number; minExclusive?: boolean; max?: number; integer?: boolean; unit?: string } = {}): number | undefined {
    const unit = opts.unit ? ` ${opts.unit}` : '';
    if (raw === '') {
      if (opts.required) this.add(path, `${label}: enter a number${unit ? ` in${unit}` : ''}`);
      return undefined;
    }
    if (raw.includes(',')) {
      this.add(path, `${label}: "${raw}" — use a decimal point, not a comma`);
      return undefined;
    }
    const v = Number(raw.replace('−', '-'));
    if (!Number.isFinite(v) || !/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(raw.replace('−', '-'))) {
      this.add(path, `${label}: "${raw}" is not a number`);
      return undefined;
    }
    if (opts.integer && !Number.isInteger(v)) {
      this.add(path, `${label}: must be a whole number`);
      return undefined;
    }
    if (opts.min !== undefined && (opts.minExclusive ? v <= opts.min : v < opts.min)) {
      this.add(path, `${label}: must be ${opts.minExclusive ? '>' : '≥'} ${opts.min}${unit}`);
      return undefined;
    }
    if (opts.max !== undefined && v > opts.max) {
      this.add(path, `${label}: must be ≤ ${opts.max}${unit}`);
      return undefined;
    }
    return v;
  }
  throwIfAny(): void {
    if (this.list.length) throw InputError.many(`Please correct ${this.list.length === 1 ? 'one field' : `${this.list.length} fields`}: ${this.list.map((i) => i.message).join('; ')}`, this.list);
  }
}

/**
 * Convert the page form to the study's SI plant section. Throws InputError whose issue paths
 * are form field names (`productionRate`, `circuit2ChannelR`, …) and whose messages name the
 * field in words, so the page can mark the field and keep every value.
 */
export function formToSection(form: PlantForm, study: Study, previous?: PlantSection): PlantSection {
  const is = new FormIssues();
  const positive = { required: true, min: 0, minExclusive: true };
  const pct = { min: 0, minExclusive: true, max: 100, unit: '%' };
  const rate = is.number('productionRate', form.productionRate, 'Production target', { ...positive, unit: form.rateUnit });
  const j = is.number('currentDensity', form.currentDensity, 'Design current density', { ...positive, unit: 'kA/m²' });
  const area = is.number('cellArea', form.cellArea, 'Active area per cell', { ...positive, unit: 'm²' });
  const plantData = form.cellSource === 'plant-data';
  const intercept = is.number('intercept', form.intercept, 'Cell line intercept U0', { required: plantData, min: 0, minExclusive: true, unit: 'V' });
  const k = is.number('kFactor', form.kFactor, 'K-factor', { required: plantData, min: 0, unit: 'V per kA/m²' });
  const ce = is.number('currentEfficiency', form.currentEfficiency, 'Current efficiency', { ...pct, required: plantData });
  const co: Partial<Record<ProductId, number>> = {};
  const coProducts = coProductsOf(plantChemistryOf(study.chemistry), form.product);
  for (const [id, raw] of Object.entries(form.coProductCe) as [ProductId, string][]) {
    if (!coProducts.includes(id)) continue;
    const v = is.number(`coCe_${id}`, raw, `Current efficiency of ${PRODUCT_SPECS[id].name}`, pct);
    if (v !== undefined) co[id] = v / PERCENT;
  }
  const rv = is.number('rectifierVoltage', form.rectifierVoltage, 'Rectifier maximum voltage', { ...positive, unit: 'V' });
  const rc = is.number('rectifierCurrent', form.rectifierCurrent, 'Rectifier maximum current', { ...positive, unit: 'kA' });
  const re = is.number('rectifierEfficiency', form.rectifierEfficiency, 'Rectifier efficiency', { ...pct, required: true });
  const cells = is.number('shuntCells', form.shuntCells, 'Cells in series for the shunt currents', { integer: true, min: 2, max: 2000 });
  if (!plantData && study.cell === undefined) is.add('cellSource', 'Cell source: this study has no cell definition yet; build one on the Cell page, or use plant data (U0 and K-factor)');

  const circuits: ShuntCircuitInput[] = [];
  form.circuits.forEach((c, i) => {
    const row = `Circuit ${i + 1}${c.name ? ` (${c.name})` : ''}`;
    if (c.mode === 'off') return;
    const name = c.name || undefined;
    if (c.mode === 'resistance') {
      const ch = is.number(`circuit${i}ChannelR`, c.channelResistance, `${row} channel resistance`, { ...positive, unit: 'Ω' });
      const mf = is.number(`circuit${i}ManifoldR`, c.manifoldResistance, `${row} manifold segment resistance`, { ...positive, unit: 'Ω' });
      if (ch !== undefined && mf !== undefined) circuits.push({ ...(name ? { name } : {}), channelResistance: ch, manifoldSegmentResistance: mf });
      return;
    }
    const sigma = is.number(`circuit${i}Conductivity`, c.conductivity, `${row} conductivity`, { ...positive, unit: 'S/m' });
    const cl = is.number(`circuit${i}ChannelLength`, c.channelLength, `${row} channel length`, { ...positive, unit: 'mm' });
    const ca = is.number(`circuit${i}ChannelArea`, c.channelArea, `${row} channel cross-section`, { ...positive, unit: 'mm²' });
    const ml = is.number(`circuit${i}ManifoldLength`, c.manifoldLength, `${row} manifold segment length`, { ...positive, unit: 'mm' });
    const ma = is.number(`circuit${i}ManifoldArea`, c.manifoldArea, `${row} manifold cross-section`, { ...positive, unit: 'mm²' });
    if (sigma !== undefined && cl !== undefined && ca !== undefined && ml !== undefined && ma !== undefined) {
      circuits.push({
        ...(name ? { name } : {}),
        conductivity: sigma,
        channel: { length: toSI(cl, 'length', 'mm'), crossSection: ca * MM2_IN_M2 },
        manifoldSegment: { length: toSI(ml, 'length', 'mm'), crossSection: ma * MM2_IN_M2 },
      });
    }
  });
  is.throwIfAny();

  const section: Record<string, unknown> = {
    product: form.product,
    productionRate: toSI(rate as number, 'massRate', form.rateUnit),
    rateUnit: form.rateUnit,
    currentDensity: toSI(j as number, 'currentDensity', 'kA/m2'),
    cellArea: area,
    cellSource: form.cellSource,
    rectifier: { maxVoltage: rv, maxCurrent: toSI(rc as number, 'current', 'kA'), efficiency: (re as number) / PERCENT },
  };
  if (intercept !== undefined && k !== undefined) section.linear = { intercept, slope: k / KA_M2 };
  else if (previous?.linear) section.linear = previous.linear;
  if (ce !== undefined) section.currentEfficiency = ce / PERCENT;
  if (Object.keys(co).length) section.coProductCurrentEfficiency = co;
  if (circuits.length) section.shunt = { ...(cells !== undefined ? { cells } : {}), circuits };
  if (previous?.safety) section.safety = previous.safety;
  const parsed = plantSectionSchema.safeParse(section);
  if (!parsed.success) {
    const issues = zodIssues(parsed.error).map((i) => ({ path: mapPath(i.path, { 'rectifier.maxVoltage': 'rectifierVoltage', 'rectifier.maxCurrent': 'rectifierCurrent', 'rectifier.efficiency': 'rectifierEfficiency', linear: 'intercept' }), message: i.message }));
    throw InputError.many(`Invalid plant inputs: ${issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`, issues);
  }
  return parsed.data;
}

// ---------------------------------------------------------------------------------------------
// Computation for the page

export interface ShuntRun {
  input: ShuntInput;
  result: ShuntResult;
  /** dU/dj at the operating point, Ω·m². */
  cellAreaResistance: number;
  /** True when the cell count was taken from the sizing (largest electrolyser). */
  cellsFromSizing: boolean;
}

export interface PlantComputation {
  section: PlantSection;
  chemistry: PlantChemistry;
  sizing: SizingResult;
  cellSourceLabel: string;
  shunt: ShuntRun | null;
  /** Why the shunt currents were not computed (no circuits, a single cell …). */
  shuntNote: string | null;
  /** An input problem of the shunt section (the sizing still stands). */
  shuntError: { message: string; issues: IssueDetail[] } | null;
}

/** The study's cell definition as a cell source; InputError at `cellSource` when absent or unusable. */
export function studyCellSource(study: Study): CellSource {
  if (study.cell === undefined) {
    throw new InputError('cellSource', "this study has no cell definition yet: build one on the Cell page, or use plant data (U0 and K-factor)");
  }
  const parsed = cellSourceSchema.safeParse(study.cell);
  if (!parsed.success) {
    const first = zodIssues(parsed.error)[0];
    throw new InputError('cellSource', `the study's cell definition is not usable (${first ? `${first.path}: ${first.message}` : 'invalid'}); fix it on the Cell page, or use plant data`);
  }
  return parsed.data;
}

/**
 * Size the plant of a study section and solve the shunt currents of its largest electrolyser.
 * Shunt network: N cells in series (given, or the largest electrolyser), terminal current = the
 * operating cell current, cell voltage = the operating voltage, cell resistance = (dU/dj)/A_cell
 * at the operating point (K/A_cell for a linear cell, a central difference of the model otherwise).
 * Throws InputError/PhysicsError (page field paths) for sizing problems.
 */
export function computePlant(section: PlantSection, study: Study): PlantComputation {
  const chemistry = plantChemistryOf(study.chemistry);
  const plantData = section.cellSource === 'plant-data';
  let cell: CellSource;
  if (plantData) {
    if (!section.linear) throw new InputError('intercept', 'plant data need the cell line (U0 and K-factor)');
    cell = { linear: { intercept: section.linear.intercept, slope: section.linear.slope } };
  } else {
    cell = studyCellSource(study);
  }
  if (!targetProducts(chemistry).includes(section.product)) {
    throw new InputError('product', `${section.product} is not a product of ${study.chemistry}`);
  }
  const { sizing, performance } = runSizing(
    {
      chemistry,
      product: section.product,
      productionRate: section.productionRate,
      currentDensity: section.currentDensity,
      cellArea: section.cellArea,
      cell,
      currentEfficiency: section.currentEfficiency,
      coProductCurrentEfficiency: section.coProductCurrentEfficiency,
      rectifier: section.rectifier,
    },
    PAGE_SIZING_PATHS,
  );
  const cellSourceLabel = plantData ? 'plant data: U = U0 + K·j' : "the study's cell model (Cell page)";

  let shunt: ShuntRun | null = null;
  let shuntNote: string | null = null;
  let shuntError: PlantComputation['shuntError'] = null;
  const circuits = section.shunt?.circuits ?? [];
  const cells = section.shunt?.cells ?? sizing.electrolysers.cellsEach[0];
  if (circuits.length === 0) {
    shuntNote = 'No electrolyte circuits given: enter channel and manifold resistances (or geometry and conductivity) to compute the shunt currents.';
  } else if (cells < 2) {
    shuntNote = `The electrolyser has ${cells} cell; shunt currents need at least 2 cells in series.`;
  } else if (cells > MAX_SHUNT_CELLS) {
    shuntNote = `The largest electrolyser has ${cells} cells in series; shunt currents are computed for at most ${MAX_SHUNT_CELLS}: enter the cells in series to study.`;
  } else {
    try {
      const areaResistance = cellAreaResistanceAt(performance, sizing.operating.currentDensity, 'cellSource');
      if (!(areaResistance > 0)) throw new InputError('kFactor', 'K-factor: the shunt-current network needs a cell resistance > 0 (a K-factor > 0)');
      const resolved = resolveCircuits(circuits, (i, field) => formFieldOfCircuit(i, field));
      const input: ShuntInput = {
        cells,
        current: sizing.operating.cellCurrent,
        cellVoltage: sizing.operating.cellVoltage,
        cellResistance: areaResistance / section.cellArea,
        circuits: resolved,
      };
      const result = solveShuntCurrents(input);
      shunt = { input, result, cellAreaResistance: areaResistance, cellsFromSizing: section.shunt?.cells === undefined };
    } catch (err) {
      const { status, body } = describeError(err);
      if (status >= 500) throw err;
      shuntError = body.error;
    }
  }
  return { section, chemistry, sizing, cellSourceLabel, shunt, shuntNote, shuntError };
}

function formFieldOfCircuit(i: number, field: string): string {
  const names: Record<string, string> = {
    conductivity: 'Conductivity',
    'channel.length': 'ChannelLength',
    'channel.crossSection': 'ChannelArea',
    'manifoldSegment.length': 'ManifoldLength',
    'manifoldSegment.crossSection': 'ManifoldArea',
  };
  return `circuit${i}${names[field] ?? field}`;
}

// ---------------------------------------------------------------------------------------------
// View-model

export interface TableRow {
  section: string;
  label: string;
  value: string;
  unit: string;
  /** Value for the CSV, in `unit`. */
  csv: number | string | null;
}

export interface ProductRow {
  id: ProductId;
  name: string;
  isTarget: boolean;
  currentEfficiency: string;
  kgPerHour: string;
  perDay: string;
  perDayUnit: string;
  normalCubicMetresPerHour: string;
}

export interface FeedRow {
  name: string;
  kgPerHour: string;
  perDay: string;
  perDayUnit: string;
  note: string;
}

export interface ShuntView {
  summary: TableRow[];
  circuits: { name: string; channelResistance: string; manifoldResistance: string }[];
  channelChart: Record<string, unknown>;
  bypassChart: Record<string, unknown>;
  profileHeader: string[];
  profile: string[][];
  warnings: string[];
}

export interface PlantView {
  rows: TableRow[];
  sections: string[];
  products: ProductRow[];
  feeds: FeedRow[];
  designBasis: string;
  warnings: string[];
  shunt: ShuntView | null;
  shuntNote: string | null;
  shuntError: PlantComputation['shuntError'];
  specificUnit: string;
  /** Where the cell came from, in words. */
  cellSource: string;
}

/** Display unit of mass flows per day: kg/day for hydrogen, t/day otherwise. */
function perDayUnit(id: ProductId | 'NaCl' | 'H2O'): 'kg/day' | 't/day' {
  return id === 'H2' ? 'kg/day' : 't/day';
}

const SERIES_COLOURS = ['#1f5f8b', '#c0392b', '#2e8b57', '#b8860b', '#6a3d9a', '#e67e22', '#17becf', '#7f7f7f'];

function pct(fraction: number, sig = 4): string {
  return fmt(fraction * PERCENT, sig);
}

/** Channel-current and bypass charts, profile table and summary of a shunt run. */
function shuntView(run: ShuntRun): ShuntView {
  const { result, input } = run;
  const N = result.cells;
  const denseMarkers = N <= 40;
  const channelChart = {
    type: 'line',
    data: {
      datasets: input.circuits.map((c, ci) => ({
        label: c.name,
        data: result.channelCurrents[ci].map((v, k) => ({ x: k + 1, y: Number(v.toPrecision(6)) })),
        borderColor: SERIES_COLOURS[ci % SERIES_COLOURS.length],
        backgroundColor: SERIES_COLOURS[ci % SERIES_COLOURS.length],
        pointRadius: denseMarkers ? 2 : 0,
        borderWidth: 2,
      })),
    },
    options: {
      plugins: {
        title: { display: true, text: 'Channel current along the stack (positive: from the cell into the manifold)' },
        legend: { position: 'bottom' },
      },
      scales: {
        x: { type: 'linear', min: 1, max: N, title: { display: true, text: 'Cell number, counted from the positive end' } },
        y: { title: { display: true, text: 'Channel current / A' } },
      },
    },
  };
  const bypassChart = {
    type: 'line',
    data: {
      datasets: [
        {
          label: 'Current bypassing the cell',
          data: result.bypassCurrents.map((v, k) => ({ x: k + 1, y: Number(v.toPrecision(6)) })),
          borderColor: '#5b6676',
          backgroundColor: '#5b6676',
          pointRadius: denseMarkers ? 2 : 0,
          borderWidth: 2,
        },
      ],
    },
    options: {
      plugins: { title: { display: true, text: 'Bypass current along the stack (largest near the centre)' }, legend: { position: 'bottom' } },
      scales: {
        x: { type: 'linear', min: 1, max: N, title: { display: true, text: 'Cell number, counted from the positive end' } },
        y: { title: { display: true, text: 'Bypass current / A' }, beginAtZero: true },
      },
    },
  };
  const maxC = result.maxChannelCurrent;
  const summary: TableRow[] = [
    { section: 'Shunt currents', label: 'Cells in series', value: String(N), unit: run.cellsFromSizing ? '(largest electrolyser)' : '', csv: N },
    { section: 'Shunt currents', label: 'Cell current', value: fmt(fromSI(input.current, 'current', 'kA'), 5), unit: 'kA', csv: fromSI(input.current, 'current', 'kA') },
    { section: 'Shunt currents', label: 'Cell voltage (operating point)', value: fixed(input.cellVoltage, 3), unit: 'V', csv: input.cellVoltage },
    { section: 'Shunt currents', label: 'Cell resistance dU/dI', value: fmt(input.cellResistance / MICRO_OHM, 4), unit: 'µΩ', csv: input.cellResistance / MICRO_OHM },
    { section: 'Shunt currents', label: 'Current-efficiency loss', value: pct(result.currentEfficiencyLoss, 3), unit: '%', csv: result.currentEfficiencyLoss * PERCENT },
    { section: 'Shunt currents', label: 'Power lost in channels and manifolds', value: fmt(fromSI(result.shuntPower, 'power', 'kW'), 4), unit: 'kW', csv: fromSI(result.shuntPower, 'power', 'kW') },
    {
      section: 'Shunt currents',
      label: `Largest channel current (${maxC.circuitName}, cell ${maxC.cell + 1} of ${N})`,
      value: fmt(Math.abs(maxC.value), 4),
      unit: 'A',
      csv: Math.abs(maxC.value),
    },
    { section: 'Shunt currents', label: `Largest bypass current (cell ${result.maxBypassCurrent.cell + 1})`, value: fmt(result.maxBypassCurrent.value, 4), unit: 'A', csv: result.maxBypassCurrent.value },
    { section: 'Shunt currents', label: 'Stack voltage with shunts', value: fmt(result.stackVoltage, 5), unit: 'V', csv: result.stackVoltage },
  ];
  const profileHeader = ['Cell', ...input.circuits.map((c) => `${c.name} channel / A`), 'Bypass / A'];
  const profile = result.bypassCurrents.map((b, k) => [String(k + 1), ...input.circuits.map((_, ci) => fmt(result.channelCurrents[ci][k], 4)), fmt(b, 4)]);
  return {
    summary,
    circuits: input.circuits.map((c) => ({ name: c.name, channelResistance: fmt(c.channelResistance, 4), manifoldResistance: fmt(c.manifoldSegmentResistance, 4) })),
    channelChart,
    bypassChart,
    profileHeader,
    profile,
    warnings: result.warnings,
  };
}

/** Tables, charts and texts of a plant computation, in the engineer's units. */
export function plantView(c: PlantComputation): PlantView {
  const s = c.sizing;
  const rateUnit: RateUnit = c.section.rateUnit ?? (c.section.product === 'H2' ? 'kg/day' : 't/day');
  const water = c.chemistry === 'water';
  const specificUnit = water ? 'kWh/kg' : 'kWh/t';
  const kA = (a: number) => fromSI(a, 'current', 'kA');
  const kAm2 = (j: number) => fromSI(j, 'currentDensity', 'kA/m2');
  const mw = (w: number) => w / MW;
  const row = (section: string, label: string, value: number, unit: string, sig = 4): TableRow => ({ section, label, value: fmt(value, sig), unit, csv: value });
  /** Cell voltages to the millivolt, as engineers read them. */
  const volts = (section: string, label: string, value: number): TableRow => ({ section, label, value: fixed(value, 3), unit: 'V', csv: value });
  const target = PRODUCT_LABELS[s.target.product];
  const cellsEach = [...new Set(s.electrolysers.cellsEach)].join(' or ');
  const rows: TableRow[] = [
    row('Target and design point', `Production target, ${target}`, fromSI(s.target.massRate, 'massRate', rateUnit), rateUnit, 6),
    row('Target and design point', 'Design current density', kAm2(s.design.currentDensity), 'kA/m²'),
    volts('Target and design point', 'Cell voltage at design', s.design.cellVoltage),
    row('Target and design point', 'Current efficiency at design', s.design.currentEfficiency * PERCENT, '%'),
    row('Target and design point', 'Total current needed at design', kA(s.design.totalCurrent), 'kA', 5),
    row('Target and design point', 'Active area needed at design', s.design.activeArea, 'm²', 5),
    row('Target and design point', 'Cells needed (before rounding up)', s.design.cellsExact, 'cells', 6),
    { section: 'Cell room as built', label: 'Cells', value: String(s.cells.total), unit: 'cells', csv: s.cells.total },
    { section: 'Cell room as built', label: 'Electrolysers (one rectifier each)', value: String(s.electrolysers.count), unit: '', csv: s.electrolysers.count },
    { section: 'Cell room as built', label: 'Cells per electrolyser', value: cellsEach, unit: 'cells in series', csv: cellsEach },
    { section: 'Cell room as built', label: 'Largest number in series the rectifier allows', value: String(s.cells.maxInSeries), unit: 'cells', csv: s.cells.maxInSeries },
    row('Cell room as built', 'Installed active area', s.operating.activeArea, 'm²', 5),
    row('Operating point (meets the target exactly)', 'Operating current density', kAm2(s.operating.currentDensity), 'kA/m²'),
    volts('Operating point (meets the target exactly)', 'Cell voltage', s.operating.cellVoltage),
    row('Operating point (meets the target exactly)', 'Current efficiency', s.operating.currentEfficiency * PERCENT, '%'),
    row('Operating point (meets the target exactly)', 'Current per electrolyser (each cell)', kA(s.electrolysers.current), 'kA', 5),
    row('Operating point (meets the target exactly)', 'Total current of all cells', kA(s.operating.totalCurrent), 'kA', 5),
    row('Operating point (meets the target exactly)', 'Voltage of the largest electrolyser', s.electrolysers.voltage, 'V'),
    row('Rectifier', 'Voltage of the largest electrolyser at design', s.electrolysers.voltageAtDesign, 'V'),
    row('Rectifier', 'Share of the rectifier voltage used at design', s.electrolysers.rectifierVoltageUse * PERCENT, '%', 3),
    row('Rectifier', 'Share of the rectifier current used at design', s.electrolysers.rectifierCurrentUse * PERCENT, '%', 3),
    row('Power and heat', 'DC power', mw(s.power.dc), 'MW'),
    row('Power and heat', 'AC power', mw(s.power.ac), 'MW'),
    row('Power and heat', 'Rectifier and transformer loss', mw(s.power.conversionLoss), 'MW'),
    row('Power and heat', `Heat load (${s.power.heatLoadBasis}; positive = cooling duty)`, mw(s.power.heatLoad), 'MW'),
    row('Power and heat', `Thermoneutral voltage used (${s.power.thermoneutralSource})`, s.power.thermoneutralVoltage, 'V'),
    row('Power and heat', `Specific energy, DC, per ${water ? 'kg' : 't'} of ${PRODUCT_SPECS[s.target.product].name}`, fromSI(s.specificEnergy.dc, 'specificEnergy', specificUnit), specificUnit, 5),
    row('Power and heat', `Specific energy, AC, per ${water ? 'kg' : 't'} of ${PRODUCT_SPECS[s.target.product].name}`, fromSI(s.specificEnergy.ac, 'specificEnergy', specificUnit), specificUnit, 5),
  ];
  const sections = [...new Set(rows.map((r) => r.section))];
  const products: ProductRow[] = s.products.map((p) => ({
    id: p.id,
    name: PRODUCT_LABELS[p.id],
    isTarget: p.isTarget,
    currentEfficiency: pct(p.currentEfficiency),
    kgPerHour: fmt(fromSI(p.massRate, 'massRate', 'kg/h'), 5),
    perDay: fmt(fromSI(p.massRate, 'massRate', perDayUnit(p.id)), 5),
    perDayUnit: perDayUnit(p.id),
    normalCubicMetresPerHour: p.normalCubicMetresPerHour === null ? '—' : fmt(p.normalCubicMetresPerHour, 5),
  }));
  const feeds: FeedRow[] = s.feeds.map((f) => ({
    name: f.name,
    kgPerHour: fmt(fromSI(f.massRate, 'massRate', 'kg/h'), 5),
    perDay: fmt(fromSI(f.massRate, 'massRate', 't/day'), 5),
    perDayUnit: 't/day',
    note: f.note,
  }));
  const basis = [...s.designBasis];
  if (c.shunt) {
    const r = c.shunt.result;
    basis.push(
      `Shunt currents (${r.cells} cells in series, ${c.shunt.input.circuits.length} electrolyte circuit(s)): current-efficiency loss ${pct(r.currentEfficiencyLoss, 3)} %, ${fmt(r.shuntPower / KW, 4)} kW lost per electrolyser; largest channel current ${fmt(Math.abs(r.maxChannelCurrent.value), 3)} A (${r.maxChannelCurrent.circuitName}, cell ${r.maxChannelCurrent.cell + 1}).`,
    );
  }
  return {
    rows,
    sections,
    products,
    feeds,
    designBasis: basis.join('\n'),
    warnings: s.warnings,
    shunt: c.shunt ? shuntView(c.shunt) : null,
    shuntNote: c.shuntNote,
    shuntError: c.shuntError,
    specificUnit,
    cellSource: c.cellSourceLabel,
  };
}

// ---------------------------------------------------------------------------------------------
// CSV

/** Number for a CSV cell: 10 significant digits, plain decimal. */
function csvNumber(v: number): string {
  return Number.isFinite(v) ? new Decimal(v).toSignificantDigits(10).toString() : '';
}

/** Text for a CSV cell, defused against spreadsheet formula injection. */
function csvText(s: string): string {
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}

/** The sizing table, product flows and consumptions as CSV (units in their own column). */
export function sizingCsv(c: PlantComputation, view: PlantView, studyName: string): string {
  // Text cells are defused against formula injection; number cells are written as plain decimals.
  const line = (section: string, label: string, value: number | string | null, unit: string): string[] => [
    csvText(section),
    csvText(label),
    typeof value === 'number' ? csvNumber(value) : csvText(value ?? ''),
    csvText(unit),
  ];
  const data: string[][] = [['section', 'quantity', 'value', 'unit']];
  for (const r of view.rows) data.push(line(r.section, r.label, r.csv, r.unit));
  for (const p of c.sizing.products) {
    const label = `${PRODUCT_LABELS[p.id]}${p.isTarget ? ' (target)' : ''}`;
    data.push(line('Products', `${label} mass flow`, fromSI(p.massRate, 'massRate', 'kg/h'), 'kg/h'));
    if (p.normalCubicMetresPerHour !== null) data.push(line('Products', `${label} gas flow (0 °C, 101.325 kPa)`, p.normalCubicMetresPerHour, 'Nm³/h'));
    data.push(line('Products', `${label} current efficiency`, p.currentEfficiency * PERCENT, '%'));
  }
  for (const f of c.sizing.feeds) data.push(line('Consumption', f.name, fromSI(f.massRate, 'massRate', 'kg/h'), 'kg/h'));
  if (view.shunt) for (const r of view.shunt.summary) data.push(line(r.section, r.label, r.csv, r.unit));
  return `${csvText(`# Plant sizing: ${studyName}`)}\r\n${Papa.unparse(data, { newline: '\r\n' })}\r\n`;
}

/** The shunt profile (channel current per circuit and bypass current per cell) as CSV. */
export function shuntCsv(run: ShuntRun, studyName: string): string {
  const { result, input } = run;
  const header = ['cell', ...input.circuits.map((c) => `${c.name} channel current (A)`), 'bypass current (A)', 'cell current (A)'];
  const data: string[][] = [header.map(csvText)];
  for (let k = 0; k < result.cells; k++) {
    data.push([String(k + 1), ...input.circuits.map((_, ci) => csvNumber(result.channelCurrents[ci][k])), csvNumber(result.bypassCurrents[k]), csvNumber(result.cellCurrents[k])]);
  }
  return `${csvText(`# Shunt currents: ${studyName}; positive channel current flows from the cell into the manifold; cell 1 at the positive end`)}\r\n${Papa.unparse(data, { newline: '\r\n' })}\r\n`;
}

/** A file name from free text. */
export function downloadName(title: string, ext: string): string {
  const slug = title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'plant';
  return `${slug}.${ext}`;
}

