/**
 * Kinetics page: the form model (strings as typed, so a re-rendered form keeps them), its
 * translation into the core's SI fit input, and the view-models of a fit result (tables in
 * engineers' units, Chart.js configurations, CSV/JSON downloads, the saved-fit record).
 *
 * No physics here: unit conversion goes through core/units.ts, reference-electrode
 * conversion through core/kinetics/reference-electrodes.ts, fitting through the core.
 */
import { randomBytes } from 'node:crypto';
import { Decimal } from 'decimal.js';
import { InputError, type IssueDetail } from '../core/errors.js';
import { celsiusToKelvin, kelvinToCelsius, toSI, UNIT_TABLES } from '../core/units.js';
import {
  REFERENCE_ELECTRODES,
  referencePotentialVsShe,
  type ReferenceElectrodeId,
  type ReferenceSpec,
} from '../core/kinetics/reference-electrodes.js';
import type { KineticsFitInput } from '../core/kinetics/fit.js';
import { WORKING_BRANCH_LN_J0, workingTransferCoefficientKey, type WorkingBranchUncertainty } from '../core/kinetics/working-branch.js';
import type { Dataset, SavedFit, Study } from '../scenario/schema.js';
import { fmt } from './format.js';
import { parsePolarizationTable, type ParsedTable } from './table-parse.js';

// ---------------------------------------------------------------------------------------
// Form model
// ---------------------------------------------------------------------------------------

export type DataSource = 'dataset' | 'paste' | 'file';
export type LimitMode = 'none' | 'fit' | 'value';

/** Every field of the kinetics form, as text (what the browser sends back). */
export interface KineticsForm {
  source: DataSource;
  dataset: string;
  /** Dataset whose measurement description the fields below hold (hidden field). */
  describedDataset: string;
  data: string;
  currentColumn: string;
  potentialColumn: string;
  currentUnit: string;
  potentialUnit: string;
  potentialKind: 'overpotential' | 'electrode';
  reference: string;
  referenceCustom: string;
  pH: string;
  equilibriumPotential: string;
  equilibriumVs: 'same' | 'she' | 'rhe';
  temperatureC: string;
  electrons: string;
  model: 'tafel' | 'butler-volmer';
  branch: 'auto' | 'anodic' | 'cathodic';
  windowMode: 'auto' | 'manual';
  windowMin: string;
  windowMax: string;
  irMode: 'none' | 'known' | 'fit';
  ru: string;
  anodicLimitMode: LimitMode;
  anodicLimit: string;
  cathodicLimitMode: LimitMode;
  cathodicLimit: string;
  tie: boolean;
  fitName: string;
  referenceTemperatureC: string;
}

/** Field labels used in error messages and next to the inputs. */
export const FIELD_LABELS: Record<string, string> = {
  source: 'Data source',
  dataset: 'Dataset',
  data: 'Pasted data',
  dataFile: 'CSV file',
  currentColumn: 'Current density column',
  potentialColumn: 'Potential column',
  currentUnit: 'Current density unit',
  potentialUnit: 'Potential unit',
  potentialKind: 'The potentials are',
  reference: 'Reference electrode',
  referenceCustom: 'Custom reference potential (V vs SHE)',
  pH: 'pH',
  equilibriumPotential: 'Equilibrium potential (V)',
  equilibriumVs: 'Equilibrium potential given vs',
  temperatureC: 'Temperature (°C)',
  electrons: 'Electrons n',
  model: 'Model',
  branch: 'Branch',
  windowMode: 'Tafel window',
  windowMin: 'Window lower |η| (mV)',
  windowMax: 'Window upper |η| (mV)',
  irMode: 'iR correction',
  ru: 'Uncompensated resistance R_u (Ω·cm²)',
  anodicLimitMode: 'Anodic limiting current',
  anodicLimit: 'Anodic limiting current (kA/m²)',
  cathodicLimitMode: 'Cathodic limiting current',
  cathodicLimit: 'Cathodic limiting current (kA/m²)',
  tie: 'Tie α_a + α_c = n',
  fitName: 'Name of the saved fit',
  referenceTemperatureC: 'Reference temperature (°C)',
};

export const CURRENT_UNITS = ['A/m2', 'kA/m2', 'mA/cm2', 'A/cm2'] as const;
export const POTENTIAL_UNITS = ['V', 'mV'] as const;

/** Short names for the reference-electrode list (the core's full names go in the tooltip). */
const REFERENCE_SHORT: Record<string, string> = {
  she: 'SHE',
  rhe: 'RHE in the test solution',
  sce: 'SCE, saturated calomel',
  nce: 'Calomel, 1 M KCl',
  'ag-agcl-sat-kcl': 'Ag/AgCl, saturated KCl',
  'ag-agcl-3m-kcl': 'Ag/AgCl, 3 M KCl',
  'ag-agcl-1m-kcl': 'Ag/AgCl, 1 M KCl',
  'hg-hgo-1m-naoh': 'Hg/HgO, 1 mol/kg NaOH',
  'hg-hgo-0.1m-naoh': 'Hg/HgO, 0.1 M NaOH',
  'hg-hg2so4-1m-h2so4': 'Hg/Hg₂SO₄, 1 M H₂SO₄',
};

/** Reference electrodes offered on the form: the core's table plus a calibrated custom value. */
export function referenceOptions(): Array<{ id: string; name: string; detail: string; title: string }> {
  const list: Array<{ id: string; name: string; detail: string; title: string }> = Object.values(REFERENCE_ELECTRODES).map((r) => ({
    id: r.id,
    name: REFERENCE_SHORT[r.id] ?? r.name,
    detail: r.id === 'rhe' ? 'needs pH' : `${r.potentialVsShe >= 0 ? '+' : ''}${r.potentialVsShe} V`,
    title: `${r.name}. ${r.source}${r.note ? `. Note: ${r.note}` : ''}`,
  }));
  list.push({ id: 'custom', name: 'Custom (calibrated)', detail: 'V vs SHE below', title: 'A reference you calibrated yourself: enter its potential vs SHE.' });
  return list;
}

/** Short label of a study-file reference name (for the dataset list). */
export function studyReferenceLabel(studyRef: string | undefined): string {
  if (!studyRef) return 'a reference';
  const id = STUDY_REFERENCE_TO_CORE[studyRef];
  return id ? REFERENCE_SHORT[id] ?? studyRef : studyRef;
}

/** Study file reference names → core reference ids. */
const STUDY_REFERENCE_TO_CORE: Record<string, ReferenceElectrodeId> = {
  SHE: 'she',
  RHE: 'rhe',
  SCE: 'sce',
  'AgAgCl-satKCl': 'ag-agcl-sat-kcl',
  'HgHgO-1MNaOH': 'hg-hgo-1m-naoh',
};

const DEFAULT_FORM: KineticsForm = {
  source: 'paste',
  dataset: '',
  describedDataset: '',
  data: '',
  currentColumn: '1',
  potentialColumn: '2',
  currentUnit: 'mA/cm2',
  potentialUnit: 'mV',
  potentialKind: 'overpotential',
  reference: 'ag-agcl-sat-kcl',
  referenceCustom: '',
  pH: '',
  equilibriumPotential: '',
  equilibriumVs: 'same',
  temperatureC: '25',
  electrons: '',
  model: 'tafel',
  branch: 'auto',
  windowMode: 'auto',
  windowMin: '',
  windowMax: '',
  irMode: 'none',
  ru: '',
  anodicLimitMode: 'none',
  anodicLimit: '',
  cathodicLimitMode: 'none',
  cathodicLimit: '',
  tie: false,
  fitName: '',
  referenceTemperatureC: '',
};

/** Shortest decimal text of a number (exact decimal rounding to 12 significant digits). */
export function numberText(v: number | undefined): string {
  if (v === undefined || !Number.isFinite(v)) return '';
  return new Decimal(v).toSignificantDigits(12).toString();
}

/**
 * Fill the measurement-description fields (temperature, potential kind, reference, E_eq, pH,
 * n, R_u) from a stored dataset (its points are SI). With `keepFitOptions` the fit choices
 * on the form (model, window, iR mode, limits, branch) stay as they are; a known R_u is then
 * taken from the dataset when it has one.
 */
export function describeDataset(form: KineticsForm, d: Dataset, opts: { keepFitOptions?: boolean } = {}): KineticsForm {
  const hasRu = d.uncompensatedResistance !== undefined && d.uncompensatedResistance > 0;
  const ruText = hasRu ? numberText(d.uncompensatedResistance! / UNIT_TABLES.areaResistance['ohm*cm2']) : '';
  const out: KineticsForm = {
    ...form,
    source: 'dataset',
    dataset: d.id,
    describedDataset: d.id,
    potentialKind: d.potentialKind,
    reference: d.reference ? STUDY_REFERENCE_TO_CORE[d.reference] ?? 'she' : form.reference,
    pH: d.pH !== undefined ? numberText(d.pH) : '',
    equilibriumPotential: d.equilibriumPotential !== undefined ? numberText(d.equilibriumPotential) : '',
    equilibriumVs: 'same',
    temperatureC: numberText(kelvinToCelsius(d.temperature)),
    electrons: d.electrons !== undefined ? String(d.electrons) : form.electrons,
  };
  if (opts.keepFitOptions) {
    if (form.irMode === 'known' && hasRu) out.ru = ruText;
  } else {
    out.irMode = hasRu ? 'known' : 'none';
    out.ru = ruText;
    out.branch = 'auto';
  }
  return out;
}

/** The form shown on GET: the requested (or first) dataset of the study, else an empty paste form. */
export function initialForm(study: Study, datasetId?: string): KineticsForm {
  const d = (datasetId && study.datasets.find((x) => x.id === datasetId)) || study.datasets[0];
  if (datasetId && !study.datasets.some((x) => x.id === datasetId)) {
    throw new InputError('dataset', `the study has no dataset "${datasetId}"`);
  }
  // j0 of a temperature series is reported at the study's operating temperature by default.
  const base: KineticsForm = { ...DEFAULT_FORM, referenceTemperatureC: numberText(kelvinToCelsius(study.operating.temperature)) };
  return d ? describeDataset({ ...base, currentUnit: 'A/m2', potentialUnit: 'mV' }, d) : base;
}

function pick<T extends string>(value: unknown, allowed: readonly T[], fallback: T): T {
  return typeof value === 'string' && (allowed as readonly string[]).includes(value) ? (value as T) : fallback;
}

function text(value: unknown, max = 200): string {
  return typeof value === 'string' ? value.slice(0, max) : '';
}

/** Longest text kept for a number field (project choice: far longer than any number typed). */
const MAX_NUMBER_TEXT = 40;

/**
 * The text of a number field as typed, for showing back. Text longer than MAX_NUMBER_TEXT is
 * cut and marked with "…" so that it can never be read (or shown back) as a different number —
 * a plain cut would turn "1e300" into "1e30" — and the number check then refuses it.
 */
function typedNumber(value: unknown): string {
  if (typeof value !== 'string') return '';
  return value.length > MAX_NUMBER_TEXT ? `${value.slice(0, MAX_NUMBER_TEXT)}…` : value;
}

/** Read the posted body into a form model (never throws: validation comes later). */
export function readForm(body: Record<string, unknown> | undefined): KineticsForm {
  const b = body ?? {};
  return {
    source: pick(b.source, ['dataset', 'paste', 'file'] as const, 'paste'),
    dataset: text(b.dataset, 64),
    describedDataset: text(b.describedDataset, 64),
    data: typeof b.data === 'string' ? b.data : '',
    currentColumn: typedNumber(b.currentColumn) || '1',
    potentialColumn: typedNumber(b.potentialColumn) || '2',
    currentUnit: pick(b.currentUnit, CURRENT_UNITS, 'A/m2'),
    potentialUnit: pick(b.potentialUnit, POTENTIAL_UNITS, 'V'),
    potentialKind: pick(b.potentialKind, ['overpotential', 'electrode'] as const, 'overpotential'),
    reference: text(b.reference, 40),
    referenceCustom: typedNumber(b.referenceCustom),
    pH: typedNumber(b.pH),
    equilibriumPotential: typedNumber(b.equilibriumPotential),
    equilibriumVs: pick(b.equilibriumVs, ['same', 'she', 'rhe'] as const, 'same'),
    temperatureC: typedNumber(b.temperatureC),
    electrons: typedNumber(b.electrons),
    model: pick(b.model, ['tafel', 'butler-volmer'] as const, 'tafel'),
    branch: pick(b.branch, ['auto', 'anodic', 'cathodic'] as const, 'auto'),
    windowMode: pick(b.windowMode, ['auto', 'manual'] as const, 'auto'),
    windowMin: typedNumber(b.windowMin),
    windowMax: typedNumber(b.windowMax),
    irMode: pick(b.irMode, ['none', 'known', 'fit'] as const, 'none'),
    ru: typedNumber(b.ru),
    anodicLimitMode: pick(b.anodicLimitMode, ['none', 'fit', 'value'] as const, 'none'),
    anodicLimit: typedNumber(b.anodicLimit),
    cathodicLimitMode: pick(b.cathodicLimitMode, ['none', 'fit', 'value'] as const, 'none'),
    cathodicLimit: typedNumber(b.cathodicLimit),
    tie: b.tie === '1' || b.tie === 'on' || b.tie === 'true',
    fitName: text(b.fitName, 200),
    referenceTemperatureC: typedNumber(b.referenceTemperatureC),
  };
}

/** Collects field problems so the page can name all of them at once. */
export class IssueList {
  readonly issues: IssueDetail[] = [];
  readonly fields = new Set<string>();

  add(field: string, message: string): void {
    this.issues.push({ path: FIELD_LABELS[field] ?? field, message });
    this.fields.add(field);
  }

  /**
   * A number typed in a field (decimal comma accepted). Returns undefined (and records an
   * issue) when it is missing or malformed; `optional` fields may be empty.
   */
  number(form: KineticsForm, field: keyof KineticsForm, opts: { optional?: boolean; min?: number; minExclusive?: boolean; max?: number; integer?: boolean } = {}): number | undefined {
    const raw = String(form[field] ?? '').trim().replace(/\u2212/g, '-').replace(',', '.');
    if (raw === '') {
      if (!opts.optional) this.add(field, 'is required');
      return undefined;
    }
    if (raw.length > MAX_NUMBER_TEXT) {
      this.add(field, `is too long to be a number (more than ${MAX_NUMBER_TEXT} characters)`);
      return undefined;
    }
    if (!/^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/.test(raw)) {
      this.add(field, `"${raw.length > 30 ? `${raw.slice(0, 30)}…` : raw}" is not a number`);
      return undefined;
    }
    const v = Number(raw);
    if (!Number.isFinite(v)) {
      this.add(field, 'is out of range');
      return undefined;
    }
    if (opts.integer && !Number.isInteger(v)) {
      this.add(field, 'must be a whole number');
      return undefined;
    }
    if (opts.min !== undefined && (opts.minExclusive ? v <= opts.min : v < opts.min)) {
      this.add(field, `must be ${opts.minExclusive ? 'greater than' : 'at least'} ${opts.min}`);
      return undefined;
    }
    if (opts.max !== undefined && v > opts.max) {
      this.add(field, `must be at most ${opts.max}`);
      return undefined;
    }
    return v;
  }

  throwIfAny(): void {
    if (this.issues.length) {
      const err = InputError.many(`Please correct ${this.issues.length === 1 ? 'this field' : 'these fields'}: ${this.issues.map((i) => i.path).join(', ')}.`, this.issues);
      (err as InputError & { fields?: string[] }).fields = [...this.fields];
      throw err;
    }
  }
}

/** Lowest temperature accepted on the form, °C (liquid electrolytes; project choice). */
export const MIN_TEMPERATURE_C = -50;
/** Highest temperature accepted on the form, °C (above any aqueous electrolyser; project choice). */
export const MAX_TEMPERATURE_C = 400;
/**
 * Largest magnitude accepted for a reference or equilibrium potential on the form, V
 * (aqueous electrode potentials lie within a few volts of SHE; project choice to catch mV typed as V).
 */
const MAX_POTENTIAL_V = 5;
/** pH range accepted for the RHE scale (the core's own check is the same; common practice). */
const PH_RANGE: [number, number] = [-2, 16];
/** Most columns a pasted table may name for current density or potential (project choice). */
const MAX_COLUMN = 50;
/** Most electrons n accepted for the overall electrode reaction (as the study schema). */
const MAX_ELECTRONS = 8;

/** Where the data came from, for the page and the JSON download. */
export interface DataOrigin {
  kind: DataSource;
  label: string;
  datasetId?: string;
  electrode?: 'anode' | 'cathode';
  coating?: string;
  /** Parsed table facts for pasted/uploaded data. */
  table?: Pick<ParsedTable, 'delimiter' | 'decimalComma' | 'header' | 'headerLine' | 'columns'> & { rows: number };
  /** 1-based source line of each point (pasted/uploaded data). */
  lines?: number[];
}

/** The SI fit input the page derives from the form: the core's own input type. */
export type FitRequestSI = KineticsFitInput;

export interface PreparedFit {
  input: FitRequestSI;
  origin: DataOrigin;
  /** Warnings from the conversion (reference electrode table temperature, etc.). */
  warnings: string[];
  /** Potential offset added to the data to get η as measured (electrode potentials) [V]. */
  potentialOffset: number;
}

function referenceSpec(issues: IssueList, form: KineticsForm, id: string, field: 'reference' | 'equilibriumVs'): ReferenceSpec | undefined {
  if (id === 'custom') {
    const v = issues.number(form, 'referenceCustom', { min: -MAX_POTENTIAL_V, max: MAX_POTENTIAL_V });
    return v === undefined ? undefined : { id: 'custom', potentialVsShe: v, label: 'custom reference' };
  }
  if (id === 'rhe') {
    const pH = issues.number(form, 'pH', { min: PH_RANGE[0], max: PH_RANGE[1] });
    return pH === undefined ? undefined : { id: 'rhe', pH };
  }
  if (!(id in REFERENCE_ELECTRODES)) {
    issues.add(field, `unknown reference electrode "${id}"`);
    return undefined;
  }
  return { id: id as Exclude<ReferenceElectrodeId, 'rhe'> };
}

/** Byte-order marks of UTF-16 text (Unicode Standard §23.8: U+FEFF as FF FE or FE FF). */
const UTF16LE_BOM = [0xff, 0xfe] as const;
const UTF16BE_BOM = [0xfe, 0xff] as const;
/** What to do with a UTF-16 file that cannot be decoded here (project wording). */
const UTF16_ADVICE = 'save it as UTF-8 CSV (or UTF-16 with a byte-order mark), or paste the table';

/**
 * Text of an uploaded data file from its bytes: UTF-16 with a byte-order mark (FF FE little-
 * endian, FE FF big-endian) is decoded as such, everything else as UTF-8 (a UTF-8 byte-order
 * mark is dropped; bytes that are not UTF-8 become U+FFFD, as before). A file with NUL bytes
 * and no UTF-16 byte-order mark (UTF-16 without BOM, or a binary file) is refused with an
 * InputError on the file field rather than read as garbage.
 * Source: WHATWG Encoding Standard decoders via TextDecoder (Node 20).
 */
export function decodeDataFile(bytes: Uint8Array): string {
  const starts = (bom: readonly number[]) => bytes.length >= 2 && bytes[0] === bom[0] && bytes[1] === bom[1];
  if (starts(UTF16LE_BOM)) return new TextDecoder('utf-16le').decode(bytes);
  if (starts(UTF16BE_BOM)) return new TextDecoder('utf-16be').decode(bytes);
  if (bytes.includes(0)) {
    throw new InputError(FIELD_LABELS.dataFile, `the file holds NUL bytes: UTF-16 text without a byte-order mark, or not a text file, cannot be read reliably; ${UTF16_ADVICE}`);
  }
  return new TextDecoder('utf-8').decode(bytes);
}

/**
 * True when data text is UTF-16 read as UTF-8 (a UTF-16 byte-order mark decodes to U+FFFD
 * U+FFFD, and every ASCII character of UTF-16 carries a NUL): such text must not be parsed.
 */
function looksLikeMisreadUtf16(textIn: string): boolean {
  return textIn.includes('\u0000') || textIn.startsWith('\uFFFD\uFFFD');
}

/**
 * Translate the form (and an uploaded file's text) into the core's SI fit input.
 * Throws InputError naming form fields (labels) or data lines.
 */
export function prepareFit(form: KineticsForm, study: Study, fileText: string | undefined): PreparedFit {
  const issues = new IssueList();
  const warnings: string[] = [];
  const temperatureC = issues.number(form, 'temperatureC', { min: MIN_TEMPERATURE_C, max: MAX_TEMPERATURE_C });
  const electrons = issues.number(form, 'electrons', { optional: true, min: 1, max: MAX_ELECTRONS, integer: true });
  const T = temperatureC === undefined ? undefined : celsiusToKelvin(temperatureC);

  // Window, iR and limits.
  let window: FitRequestSI['window'] = 'auto';
  if (form.windowMode === 'manual') {
    const lo = issues.number(form, 'windowMin', { min: 0 });
    const hi = issues.number(form, 'windowMax', { min: 0, minExclusive: true });
    if (lo !== undefined && hi !== undefined) {
      if (hi <= lo) issues.add('windowMax', 'must be greater than the lower bound');
      else window = { minOverpotential: toSI(lo, 'potential', 'mV'), maxOverpotential: toSI(hi, 'potential', 'mV') };
    }
  }
  let ru: FitRequestSI['uncompensatedResistance'];
  if (form.irMode === 'known') {
    const v = issues.number(form, 'ru', { min: 0 });
    if (v !== undefined) ru = toSI(v, 'areaResistance', 'ohm*cm2');
  } else if (form.irMode === 'fit') {
    ru = 'fit';
  }
  const limit = (mode: LimitMode, field: 'anodicLimit' | 'cathodicLimit'): number | 'fit' | undefined => {
    if (form.model !== 'butler-volmer' || mode === 'none') return undefined;
    if (mode === 'fit') return 'fit';
    const v = issues.number(form, field, { min: 0, minExclusive: true });
    return v === undefined ? undefined : toSI(v, 'currentDensity', 'kA/m2');
  };
  const anodicLimit = limit(form.anodicLimitMode, 'anodicLimit');
  const cathodicLimit = limit(form.cathodicLimitMode, 'cathodicLimit');
  if (form.model === 'butler-volmer' && form.tie && electrons === undefined && !issues.fields.has('electrons')) {
    issues.add('electrons', 'is needed to tie α_a + α_c = n');
  }

  // Data.
  let currents: number[] = [];
  let potentials: number[] = [];
  let origin: DataOrigin;
  const currentColumn = issues.number(form, 'currentColumn', { min: 1, max: MAX_COLUMN, integer: true });
  const potentialColumn = issues.number(form, 'potentialColumn', { min: 1, max: MAX_COLUMN, integer: true });
  if (form.source === 'dataset') {
    const d = study.datasets.find((x) => x.id === form.dataset);
    if (!d) {
      issues.add('dataset', form.dataset ? `the study has no dataset "${form.dataset}"` : 'choose a dataset');
      issues.throwIfAny();
      throw new Error('unreachable');
    }
    currents = d.points.map((p) => p.currentDensity);
    potentials = d.points.map((p) => p.potential);
    origin = { kind: 'dataset', label: d.name, datasetId: d.id, electrode: d.electrode, coating: d.coating };
  } else {
    const textIn = form.source === 'file' ? fileText : form.data;
    const field = form.source === 'file' ? 'dataFile' : 'data';
    let table: ReturnType<typeof parsePolarizationTable> | null = null;
    if (!textIn || !textIn.trim()) {
      issues.add(field, form.source === 'file' ? 'choose a CSV file to upload' : 'paste a table of current density and potential');
    } else if (looksLikeMisreadUtf16(textIn)) {
      issues.add(field, `the ${form.source === 'file' ? 'file' : 'pasted text'} looks like UTF-16 text read as UTF-8 (it holds NUL characters), which would be read as garbage; ${UTF16_ADVICE}`);
    } else if (currentColumn !== undefined && potentialColumn !== undefined) {
      try {
        table = parsePolarizationTable(textIn, { currentColumn, potentialColumn }, { source: form.source === 'file' ? 'file' : 'data' });
      } catch (err) {
        if (!(err instanceof InputError)) throw err;
        // Table problems are listed with the field problems (path: "data line 7" etc.).
        for (const i of err.issues) {
          issues.issues.push({ path: FIELD_LABELS[i.path] ?? i.path, message: i.message });
          issues.fields.add(i.path === 'potentialColumn' ? 'potentialColumn' : field);
        }
      }
    }
    if (table) {
      currents = table.currentDensity.map((v) => toSI(v, 'currentDensity', form.currentUnit, 'currentUnit'));
      potentials = table.potential.map((v) => toSI(v, 'potential', form.potentialUnit, 'potentialUnit'));
      const { delimiter, decimalComma, header, headerLine, columns } = table.table;
      origin = {
        kind: form.source,
        label: form.source === 'file' ? 'Uploaded file' : 'Pasted table',
        table: { delimiter, decimalComma, header, headerLine, columns, rows: table.table.rows.length },
        lines: table.table.lines,
      };
    } else {
      origin = { kind: form.source, label: form.source === 'file' ? 'Uploaded file' : 'Pasted table' };
    }
  }

  // Potentials → overpotential as measured (before any iR correction).
  let offset = 0;
  if (form.potentialKind === 'electrode') {
    const refE = referenceSpec(issues, form, form.reference, 'reference');
    const eq = issues.number(form, 'equilibriumPotential', { min: -MAX_POTENTIAL_V, max: MAX_POTENTIAL_V });
    let refEq: ReferenceSpec | undefined;
    if (form.equilibriumVs === 'same') refEq = refE;
    else if (form.equilibriumVs === 'she') refEq = { id: 'she' };
    else refEq = form.reference === 'rhe' ? refE : referenceSpec(issues, form, 'rhe', 'equilibriumVs');
    issues.throwIfAny();
    const a = referencePotentialVsShe(refE!, T!, 'reference');
    const b = referencePotentialVsShe(refEq!, T!, 'equilibriumVs');
    if (form.equilibriumVs !== 'same') warnings.push(...a.warnings, ...b.warnings);
    offset = a.value - (eq! + b.value);
  }
  issues.throwIfAny();

  const input: FitRequestSI = {
    points: currents.map((j, i) => ({ currentDensity: j, overpotential: potentials[i] + offset })),
    model: form.model,
    temperature: T!,
    window,
  };
  if (electrons !== undefined) input.electrons = electrons;
  if (ru !== undefined) input.uncompensatedResistance = ru;
  if (anodicLimit !== undefined) input.anodicLimitingCurrentDensity = anodicLimit;
  if (cathodicLimit !== undefined) input.cathodicLimitingCurrentDensity = cathodicLimit;
  if (form.branch !== 'auto') input.branch = form.branch;
  if (form.model === 'butler-volmer' && form.tie) input.tieTransferCoefficients = true;
  return { input, origin, warnings: [...new Set(warnings)], potentialOffset: offset };
}

// ---------------------------------------------------------------------------------------
// Result view-model
// ---------------------------------------------------------------------------------------

/** A fitted parameter as the core returns it (SI). */
export interface ParameterSI {
  value: number;
  standardError: number | null;
  ci95: [number, number] | null;
  unit: string;
  fixed?: boolean;
  note?: string;
}

/** The parts of a core fit result the page reads (Tafel and Butler–Volmer share them). */
export interface FitResultLike {
  model: 'tafel' | 'butler-volmer';
  branch?: 'anodic' | 'cathodic';
  parameters: object;
  statistics: {
    points: number;
    degreesOfFreedom: number;
    rSquared: number;
    residualStandardDeviation: number;
    aic: number;
    bic: number;
    parameters?: number;
  };
  window: { minOverpotential: number; maxOverpotential: number; rule: string; automatic?: boolean; decades?: number; lowFieldLimit?: number };
  correlation?: { names: string[]; matrix: number[][] };
  /** The core's (ln j0, α) uncertainty of the working branch (KineticsFitResult). */
  workingBranchUncertainty?: WorkingBranchUncertainty;
  residuals: Array<{ currentDensity: number; overpotential: number; fitted: number | null; residual: number | null; used: boolean }>;
  curve: Array<{ currentDensity: number; overpotential: number }>;
  converged: boolean;
  status: string;
  message?: string;
  warnings: string[];
}

interface ParameterDisplay {
  label: string;
  symbol: string;
  /** Display unit label. */
  unit: string;
  /** SI value per display unit (exact decimal factor from core/units.ts). */
  factor: number;
}

const MV = UNIT_TABLES.potential.mV;
const OHM_CM2 = UNIT_TABLES.areaResistance['ohm*cm2'];
const KA_M2 = UNIT_TABLES.currentDensity['kA/m2'];

/** Display order and engineers' units of the known parameters. */
const PARAMETER_DISPLAY: Array<[string, ParameterDisplay]> = [
  ['tafelSlope', { label: 'Tafel slope', symbol: 'b', unit: 'mV/decade', factor: MV }],
  ['anodicTafelSlope', { label: 'Anodic Tafel slope', symbol: 'b_a', unit: 'mV/decade', factor: MV }],
  ['cathodicTafelSlope', { label: 'Cathodic Tafel slope', symbol: 'b_c', unit: 'mV/decade', factor: MV }],
  ['exchangeCurrentDensity', { label: 'Exchange current density', symbol: 'j0', unit: 'A/m²', factor: 1 }],
  ['transferCoefficient', { label: 'Transfer coefficient', symbol: 'α', unit: '', factor: 1 }],
  ['anodicTransferCoefficient', { label: 'Anodic transfer coefficient', symbol: 'α_a', unit: '', factor: 1 }],
  ['cathodicTransferCoefficient', { label: 'Cathodic transfer coefficient', symbol: 'α_c', unit: '', factor: 1 }],
  ['singleStepSymmetryReading', { label: 'Single-step reading', symbol: '(1 − β)', unit: '', factor: 1 }],
  ['uncompensatedResistance', { label: 'Uncompensated resistance', symbol: 'R_u', unit: 'Ω·cm²', factor: OHM_CM2 }],
  ['anodicLimitingCurrentDensity', { label: 'Anodic limiting current density', symbol: 'j_lim,a', unit: 'kA/m²', factor: KA_M2 }],
  ['cathodicLimitingCurrentDensity', { label: 'Cathodic limiting current density', symbol: 'j_lim,c', unit: 'kA/m²', factor: KA_M2 }],
  ['intercept', { label: 'Intercept (|η| at |j| = 1 A/m²)', symbol: 'a', unit: 'mV', factor: MV }],
];

export interface ParameterRow {
  key: string;
  label: string;
  symbol: string;
  value: string;
  standardError: string;
  ci95: string;
  unit: string;
  note: string;
  fixed: boolean;
}

/** Divide an SI value by a display factor with exact decimal arithmetic, for display. */
function scaled(v: number, factor: number): number {
  return factor === 1 ? v : new Decimal(v).div(factor).toNumber();
}

function isParameter(v: unknown): v is ParameterSI {
  return !!v && typeof v === 'object' && typeof (v as ParameterSI).value === 'number';
}

/** The parameters of a result as [key, parameter] pairs in display order (unknown keys last). */
export function parameterEntries(result: FitResultLike): Array<[string, ParameterSI]> {
  const params = result.parameters as Record<string, unknown>;
  const known = PARAMETER_DISPLAY.map(([k]) => k);
  const keys = [...known.filter((k) => k in params), ...Object.keys(params).filter((k) => !known.includes(k))];
  return keys.filter((k) => isParameter(params[k])).map((k) => [k, params[k] as ParameterSI]);
}

/** Is this single-step reading β (cathodic) rather than (1 − β) (anodic)? */
function readingIsBeta(result: FitResultLike, p: ParameterSI): boolean {
  if (p.note && /β = α_c/.test(p.note)) return true;
  if (p.note && /\(1 − β\)/.test(p.note)) return false;
  return result.branch === 'cathodic';
}

/** Parameter table in engineers' units. */
export function parameterRows(result: FitResultLike): ParameterRow[] {
  return parameterEntries(result).map(([key, p]) => {
    const known = PARAMETER_DISPLAY.find(([k]) => k === key)?.[1];
    const d: ParameterDisplay = known ? { ...known } : { label: key, symbol: '', unit: p.unit, factor: 1 };
    if (key === 'transferCoefficient' && result.branch) {
      d.label = `Transfer coefficient (${result.branch})`;
      d.symbol = result.branch === 'anodic' ? 'α_a' : 'α_c';
    }
    if (key === 'singleStepSymmetryReading') {
      const beta = readingIsBeta(result, p);
      d.label = 'Single-step symmetry reading (derived)';
      d.symbol = beta ? 'β' : '(1 − β)';
    }
    const se = p.standardError;
    return {
      key,
      label: d.label,
      symbol: d.symbol,
      value: fmt(scaled(p.value, d.factor), 4),
      standardError: p.fixed ? 'given' : se === null || se === undefined ? 'not determined' : fmt(scaled(se, d.factor), 2),
      ci95: p.fixed ? '' : p.ci95 ? `${fmt(scaled(p.ci95[0], d.factor), 4)}\u00a0…\u00a0${fmt(scaled(p.ci95[1], d.factor), 4)}` : 'not determined',
      unit: d.unit,
      note: p.note ?? '',
      fixed: !!p.fixed,
    };
  });
}

export interface KeyValueRow {
  label: string;
  value: string;
  hint?: string;
}

/** Fit statistics and window in engineers' units. */
export function statisticsRows(result: FitResultLike, totalPoints: number): KeyValueRow[] {
  const s = result.statistics;
  const w = result.window;
  const rows: KeyValueRow[] = [
    { label: 'Points fitted', value: `${s.points} of ${totalPoints}` },
    { label: 'Degrees of freedom', value: String(s.degreesOfFreedom) },
    { label: 'R² (in η)', value: fmt(s.rSquared, 5), hint: 'common rule of thumb: at least 0.99 for a straight Tafel line' },
    { label: 'Residual standard deviation', value: `${fmt(scaled(s.residualStandardDeviation, MV), 3)} mV` },
    { label: 'AIC / BIC', value: `${fmt(s.aic, 5)} / ${fmt(s.bic, 5)}`, hint: 'lower is better; compare only fits of the same points' },
    {
      label: 'Fitted |η| range',
      value: `${fmt(scaled(w.minOverpotential, MV), 4)} … ${fmt(scaled(w.maxOverpotential, MV), 4)} mV${w.automatic ? (result.model === 'tafel' ? ' (automatic window)' : ' (all points)') : ' (manual window)'}`,
      hint: '|η| as measured, before any iR correction',
    },
  ];
  if (w.decades !== undefined) rows.push({ label: 'Current range fitted', value: `${fmt(w.decades, 3)} decades` });
  if (w.lowFieldLimit !== undefined && w.automatic) rows.push({ label: 'Low-field limit used', value: `${fmt(scaled(w.lowFieldLimit, MV), 3)} mV` });
  rows.push({ label: 'Solver', value: `${result.converged ? 'converged' : 'NOT converged'} (${result.status})${result.message ? ': ' + result.message : ''}` });
  return rows;
}

export interface CorrelationView {
  names: string[];
  rows: Array<{ name: string; cells: Array<{ text: string; strong: boolean }> }>;
}

/** |r| above which a correlation is highlighted as strong (project choice). */
const STRONG_CORRELATION = 0.95;

export function correlationView(result: FitResultLike): CorrelationView | null {
  const c = result.correlation;
  if (!c || !c.names.length) return null;
  return {
    names: c.names,
    rows: c.names.map((name, i) => ({
      name,
      cells: c.matrix[i].map((r, k) => ({ text: Number.isFinite(r) ? new Decimal(r).toDecimalPlaces(3).toFixed(3) : '—', strong: i !== k && Math.abs(r) > STRONG_CORRELATION })),
    })),
  };
}

// ---------------------------------------------------------------------------------------
// Charts (whole Chart.js configurations; public/js/charts.js only draws them)
// ---------------------------------------------------------------------------------------

/** Most points drawn per series; longer records are thinned evenly for the chart only. */
export const MAX_CHART_POINTS = 2000;

const COLOURS = {
  used: '#1f5f8b',
  excluded: '#9aa5b1',
  line: '#b5462f',
  band: 'rgba(31, 95, 139, 0.10)',
  bandEdge: 'rgba(31, 95, 139, 0.35)',
  zero: '#5b6676',
};

function thin<T>(list: T[]): T[] {
  if (list.length <= MAX_CHART_POINTS) return list;
  const step = list.length / MAX_CHART_POINTS;
  const out: T[] = [];
  for (let i = 0; i < MAX_CHART_POINTS; i++) out.push(list[Math.floor(i * step)]);
  return out;
}

/** Round a plotted coordinate to 6 significant digits (keeps the JSON small; display only). */
function r6(v: number): number {
  return Number(v.toPrecision(6));
}

function axis(title: string, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return { type: 'linear', title: { display: true, text: title }, ...extra };
}

export interface ChartSet {
  tafel: object;
  curve: object;
  residuals: object;
  thinned: boolean;
}

/**
 * Tafel plot (η in mV against log10|j|), model curve over the data (η against j) and
 * residual plot, in the display current-density unit.
 */
export function buildCharts(result: FitResultLike, currentUnit: string): ChartSet {
  const jf = (UNIT_TABLES.currentDensity as Record<string, number>)[currentUnit] ?? 1;
  const unitText = currentUnit.replace('m2', 'm²').replace('cm2', 'cm²');
  const logj = (j: number) => r6(Math.log10(Math.abs(j) / jf));
  const mv = (v: number) => r6(v / MV);
  const usedPts = result.residuals.filter((p) => p.used && p.currentDensity !== 0);
  const otherPts = result.residuals.filter((p) => !p.used && p.currentDensity !== 0);
  const thinned = usedPts.length > MAX_CHART_POINTS || otherPts.length > MAX_CHART_POINTS || result.residuals.length > MAX_CHART_POINTS;
  const curve = result.curve.filter((p) => p.currentDensity !== 0);

  const xs = [...result.residuals.filter((p) => p.currentDensity !== 0).map((p) => logj(p.currentDensity)), ...curve.map((p) => logj(p.currentDensity))];
  let lo = Infinity;
  let hi = -Infinity;
  for (const x of xs) {
    if (x < lo) lo = x;
    if (x > hi) hi = x;
  }
  const xmin = Math.floor(lo * 2) / 2;
  const xmax = Math.ceil(hi * 2) / 2;
  // Decade labels (1eN) need at least two integer ticks in range; otherwise print log10 values.
  const decades = Math.floor(xmax) - Math.ceil(xmin) >= 1;
  const logAxis = () =>
    decades
      ? axis(`|j| / ${unitText} (log scale)`, { decadeTicks: true, min: xmin, max: xmax, ticks: { stepSize: 0.5 } })
      : axis(`log10 (|j| / ${unitText})`, { min: xmin, max: xmax });

  const point = (p: { currentDensity: number; overpotential: number }) => ({ x: logj(p.currentDensity), y: mv(p.overpotential) });
  const datasets: object[] = [];
  // Window band(s): |η| between the bounds, on each branch that has fitted points.
  const showBand = result.model === 'tafel' || !result.window.automatic;
  if (showBand && usedPts.length) {
    const signs = new Set(usedPts.map((p) => Math.sign(p.currentDensity)));
    for (const s of signs) {
      const lo = mv(s * result.window.minOverpotential);
      const hi = mv(s * result.window.maxOverpotential);
      datasets.push({
        type: 'line',
        label: s > 0 ? 'Fitted window (anodic)' : 'Fitted window (cathodic)',
        data: [{ x: xmin, y: lo }, { x: xmax, y: lo }, { x: xmax, y: hi }, { x: xmin, y: hi }, { x: xmin, y: lo }],
        fill: 'shape',
        backgroundColor: COLOURS.band,
        borderColor: COLOURS.bandEdge,
        borderWidth: 1,
        borderDash: [4, 4],
        pointRadius: 0,
        showLine: true,
        tension: 0,
        order: 3,
      });
    }
  }
  datasets.push({
    label: 'Points fitted',
    data: thin(usedPts).map(point),
    backgroundColor: COLOURS.used,
    borderColor: COLOURS.used,
    pointRadius: 3.5,
    pointStyle: 'circle',
    order: 1,
  });
  if (otherPts.length) {
    datasets.push({
      label: 'Points left out',
      data: thin(otherPts).map(point),
      backgroundColor: 'rgba(255,255,255,0)',
      borderColor: COLOURS.excluded,
      borderWidth: 1.5,
      pointRadius: 3.5,
      pointStyle: 'rectRot',
      order: 2,
    });
  }
  // One line per branch, joined into one series with a gap (null) between branches.
  const segments = splitBySign(curve);
  const joined: Array<{ x: number; y: number | null }> = [];
  segments.forEach((seg, i) => {
    if (i > 0) joined.push({ x: joined[joined.length - 1].x, y: null });
    joined.push(...seg.map(point));
  });
  datasets.push({
    type: 'line',
    label: 'Fitted model',
    data: joined,
    borderColor: COLOURS.line,
    backgroundColor: COLOURS.line,
    borderWidth: 2,
    pointRadius: 0,
    showLine: true,
    spanGaps: false,
    fill: false,
    tension: 0,
    order: 0,
  });
  const tafel = {
    type: 'scatter',
    data: { datasets },
    options: {
      plugins: {
        title: { display: true, text: 'Tafel plot' },
        legend: { position: 'bottom' },
      },
      scales: {
        x: logAxis(),
        y: axis('η as measured / mV'),
      },
    },
  };

  // Model curve over the data, linear current axis.
  const lin = (p: { currentDensity: number; overpotential: number }) => ({ x: r6(p.currentDensity / jf), y: mv(p.overpotential) });
  const curveSets: object[] = [
    { label: 'Points fitted', data: thin(usedPts).map(lin), backgroundColor: COLOURS.used, borderColor: COLOURS.used, pointRadius: 3, order: 1 },
  ];
  if (otherPts.length) {
    curveSets.push({ label: 'Points left out', data: thin(otherPts).map(lin), backgroundColor: 'rgba(255,255,255,0)', borderColor: COLOURS.excluded, borderWidth: 1.5, pointRadius: 3, pointStyle: 'rectRot', order: 2 });
  }
  curveSets.push({ type: 'line', label: 'Fitted model', data: thin(curve).map(lin), borderColor: COLOURS.line, backgroundColor: COLOURS.line, borderWidth: 2, pointRadius: 0, showLine: true, fill: false, tension: 0, order: 0 });
  const curveChart = {
    type: 'scatter',
    data: { datasets: curveSets },
    options: {
      plugins: { title: { display: true, text: 'Polarization curve and fitted model' }, legend: { position: 'bottom' } },
      scales: { x: axis(`j / ${unitText}`), y: axis('η as measured / mV') },
    },
  };

  // Residuals.
  const withResidual = result.residuals.filter((p) => p.residual !== null && p.currentDensity !== 0);
  const res = (p: { currentDensity: number; residual: number | null }) => ({ x: logj(p.currentDensity), y: mv(p.residual as number) });
  const resUsed = withResidual.filter((p) => p.used);
  const resOther = withResidual.filter((p) => !p.used);
  const resSets: object[] = [
    { type: 'line', label: 'zero line', data: [{ x: xmin, y: 0 }, { x: xmax, y: 0 }], borderColor: COLOURS.zero, borderWidth: 1, pointRadius: 0, showLine: true, fill: false, order: 3 },
    { label: 'Points fitted', data: thin(resUsed).map(res), backgroundColor: COLOURS.used, borderColor: COLOURS.used, pointRadius: 3, order: 1 },
  ];
  if (resOther.length) {
    resSets.push({ label: 'Points left out', data: thin(resOther).map(res), backgroundColor: 'rgba(255,255,255,0)', borderColor: COLOURS.excluded, borderWidth: 1.5, pointRadius: 3, pointStyle: 'rectRot', order: 2 });
  }
  const residuals = {
    type: 'scatter',
    data: { datasets: resSets },
    options: {
      plugins: { title: { display: true, text: 'Residuals (measured − model)' }, legend: { position: 'bottom' } },
      scales: {
        x: logAxis(),
        y: axis('residual / mV'),
      },
    },
  };
  return { tafel, curve: curveChart, residuals, thinned };
}

/** Split a model curve into runs of one sign of j (so anodic and cathodic lines are not joined). */
function splitBySign<T extends { currentDensity: number }>(curve: T[]): T[][] {
  const out: T[][] = [];
  let run: T[] = [];
  let sign = 0;
  for (const p of curve) {
    const s = Math.sign(p.currentDensity);
    if (run.length && s !== sign) {
      out.push(run);
      run = [];
    }
    sign = s;
    run.push(p);
  }
  if (run.length) out.push(run);
  return out.map((seg) => thin(seg));
}

// ---------------------------------------------------------------------------------------
// Downloads and the saved-fit record
// ---------------------------------------------------------------------------------------

/** Plain decimal text for a CSV cell: exact decimal of value/factor to 10 significant digits. */
function csvNumber(v: number | null | undefined, factor = 1): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '';
  return new Decimal(v).div(factor).toSignificantDigits(10).toString();
}

function csvText(s: string): string {
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/**
 * CSV download: a parameter block and a point block, in the units the page shows
 * (stated in each header). Comma-separated, decimal point, one header row per block.
 */
export function resultCsv(result: FitResultLike, currentUnit: string, title: string): string {
  const jf = (UNIT_TABLES.currentDensity as Record<string, number>)[currentUnit] ?? 1;
  const unitText = currentUnit.replace('m2', 'm²').replace('cm2', 'cm²');
  const lines: string[] = [];
  lines.push(`# ${csvText(title)}`);
  lines.push(`# model: ${result.model}${result.branch ? `, ${result.branch} branch` : ''}`);
  lines.push('parameter,symbol,value,standard error,95% low,95% high,unit,fixed');
  for (const [key, p] of parameterEntries(result)) {
    const d = PARAMETER_DISPLAY.find(([k]) => k === key)?.[1] ?? { label: key, symbol: '', unit: p.unit, factor: 1 };
    lines.push(
      [csvText(d.label), csvText(d.symbol), csvNumber(p.value, d.factor), csvNumber(p.standardError, d.factor), csvNumber(p.ci95?.[0], d.factor), csvNumber(p.ci95?.[1], d.factor), csvText(d.unit), p.fixed ? 'yes' : 'no'].join(','),
    );
  }
  lines.push('');
  lines.push(`current density (${unitText}),eta as measured (mV),model eta (mV),residual (mV),used in fit`);
  for (const r of result.residuals) {
    lines.push([csvNumber(r.currentDensity, jf), csvNumber(r.overpotential, MV), csvNumber(r.fitted, MV), csvNumber(r.residual, MV), r.used ? 'yes' : 'no'].join(','));
  }
  return lines.join('\r\n') + '\r\n';
}

/** File name for downloads from a free-text title. */
export function downloadName(title: string, ext: string): string {
  const slug = title.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'kinetic-fit';
  return `${slug}.${ext}`;
}

/** Parameters in the study-file shape (SI; undetermined uncertainties are left out). */
export function savedParameters(result: FitResultLike): SavedFit['parameters'] {
  const out: SavedFit['parameters'] = {};
  for (const [key, p] of parameterEntries(result)) {
    const entry: SavedFit['parameters'][string] = { value: p.value, unit: p.unit };
    if (p.standardError !== null && Number.isFinite(p.standardError)) entry.standardError = p.standardError;
    if (p.ci95 && Number.isFinite(p.ci95[0]) && Number.isFinite(p.ci95[1])) entry.ci95 = [p.ci95[0], p.ci95[1]];
    out[key] = entry;
  }
  return out;
}

/**
 * The saved-fit record written into a study. Its `correlation` is the one the cell model
 * needs: corr(ln j0, α) of the electrode's working branch, from the kinetics core
 * (KineticsFitResult.workingBranchUncertainty), as a 2×2 matrix named
 * [lnExchangeCurrentDensity, key of that α among the parameters] — 'transferCoefficient' for a
 * Tafel fit, 'anodicTransferCoefficient' / 'cathodicTransferCoefficient' for Butler–Volmer.
 * The standard errors stay with the saved parameters (SE(ln j0) = SE(j0)/j0). The record is
 * left out when the core did not determine the pair, or when it belongs to the other branch
 * (a Butler–Volmer fit whose main branch is not the electrode's); the full parameter
 * correlation matrix stays on the page and in the JSON download.
 */
export function savedFitRecord(result: FitResultLike, opts: { name: string; datasetId?: string; electrode?: 'anode' | 'cathode'; temperature: number }): SavedFit {
  const slug = opts.name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 40) || 'fit';
  const electrode: 'anode' | 'cathode' =
    opts.electrode ?? (result.branch === 'cathodic' || (!result.branch && mainBranchIsCathodic(result)) ? 'cathode' : 'anode');
  const fit: SavedFit = {
    id: `${slug}-${randomBytes(3).toString('hex')}`,
    name: opts.name,
    electrode,
    model: result.model,
    temperature: opts.temperature,
    parameters: savedParameters(result),
    createdAt: new Date().toISOString(),
  };
  if (opts.datasetId) fit.datasetId = opts.datasetId;
  const u = result.workingBranchUncertainty;
  const working = electrode === 'anode' ? 'anodic' : 'cathodic';
  if (u && u.branch === working && Number.isFinite(u.correlation)) {
    fit.correlation = {
      names: [WORKING_BRANCH_LN_J0, workingTransferCoefficientKey(result.model, working)],
      matrix: [
        [1, u.correlation],
        [u.correlation, 1],
      ],
    };
  }
  return fit;
}

function mainBranchIsCathodic(result: FitResultLike): boolean {
  let a = 0;
  let c = 0;
  for (const r of result.residuals) {
    if (!r.used) continue;
    if (r.currentDensity > 0) a++;
    else if (r.currentDensity < 0) c++;
  }
  return c > a;
}

// ---------------------------------------------------------------------------------------
// Model comparison, temperature series, saved fits
// ---------------------------------------------------------------------------------------

/** The parts of the core's Tafel/Butler–Volmer comparison the page shows. */
export interface ComparisonLike {
  verdict: string;
  warnings: string[];
  tafel: { points: number; residualStandardDeviation: number; aic: number };
  butlerVolmer: { points: number; residualStandardDeviation: number; aic: number };
  tafelFit: { parameters: object };
  butlerVolmerFit: { parameters: object };
}

function param(params: object, key: string): ParameterSI | undefined {
  const v = (params as Record<string, unknown>)[key];
  return isParameter(v) ? v : undefined;
}

export function comparisonView(c: ComparisonLike): { paragraphs: string[]; rows: Array<Record<string, string>> } {
  const row = (model: string, s: { points: number; residualStandardDeviation: number; aic: number }, params: object) => ({
    model,
    points: String(s.points),
    slope: fmt(scaled(param(params, 'tafelSlope')?.value ?? NaN, MV), 4),
    j0: fmt(param(params, 'exchangeCurrentDensity')?.value, 4),
    s: fmt(scaled(s.residualStandardDeviation, MV), 3),
    aic: fmt(s.aic, 5),
  });
  return {
    paragraphs: [c.verdict, ...c.warnings.filter((w) => !/^(Tafel|Butler–Volmer): /.test(w))],
    rows: [row('Tafel line', c.tafel, c.tafelFit.parameters), row('Butler–Volmer', c.butlerVolmer, c.butlerVolmerFit.parameters)],
  };
}

export interface SeriesRowInput {
  dataset: Dataset;
  result: FitResultLike | null;
  error: string | null;
}

export interface ArrheniusLike {
  activationEnergy: ParameterSI;
  exchangeCurrentAtReference: ParameterSI;
  referenceTemperature: number;
  statistics: { points: number; degreesOfFreedom: number };
  covarianceScaling: string;
  curve: Array<{ temperature: number; exchangeCurrentDensity: number }>;
  warnings: string[];
}

export interface SeriesView {
  title: string;
  rows: Array<{ name: string; temperatureC: string; slope: string; j0: string; j0ci: string; points: string; error: string | null; current: boolean }>;
  activationEnergy: { value: string; se: string; ci: string } | null;
  reference: { temperatureC: string; j0: string; ci: string } | null;
  scaling: string;
  warnings: string[];
  error: string | null;
  chart: object | null;
  referenceTemperatureC: string;
}

const KJ_MOL = UNIT_TABLES.energyPerMol['kJ/mol'];

export function seriesView(base: Dataset, rows: SeriesRowInput[], arr: ArrheniusLike | null, error: string | null, form: KineticsForm): SeriesView {
  const out: SeriesView = {
    title: base.coating || (base.electrode === 'anode' ? 'anode' : 'cathode'),
    rows: rows.map((r) => {
      const j0 = r.result ? param(r.result.parameters, 'exchangeCurrentDensity') : undefined;
      const slope = r.result ? param(r.result.parameters, 'tafelSlope') : undefined;
      return {
        name: r.dataset.name,
        temperatureC: fmt(kelvinToCelsius(r.dataset.temperature), 4),
        slope: slope ? fmt(scaled(slope.value, MV), 4) : '—',
        j0: j0 ? fmt(j0.value, 4) : '—',
        j0ci: j0?.ci95 ? `${fmt(j0.ci95[0], 3)} … ${fmt(j0.ci95[1], 3)}` : '—',
        points: r.result ? String(r.result.statistics.points) : '—',
        error: r.error,
        current: r.dataset.id === form.dataset,
      };
    }),
    activationEnergy: null,
    reference: null,
    scaling: '',
    warnings: [],
    error,
    chart: null,
    referenceTemperatureC: form.referenceTemperatureC,
  };
  if (arr) {
    const ea = arr.activationEnergy;
    out.activationEnergy = {
      value: fmt(scaled(ea.value, KJ_MOL), 3),
      se: ea.standardError === null ? 'not determined' : fmt(scaled(ea.standardError, KJ_MOL), 2),
      ci: ea.ci95 ? `${fmt(scaled(ea.ci95[0], KJ_MOL), 3)} … ${fmt(scaled(ea.ci95[1], KJ_MOL), 3)}` : 'not determined',
    };
    const j = arr.exchangeCurrentAtReference;
    out.reference = {
      temperatureC: fmt(kelvinToCelsius(arr.referenceTemperature), 4),
      j0: fmt(j.value, 4),
      ci: j.ci95 ? `${fmt(j.ci95[0], 3)} … ${fmt(j.ci95[1], 3)}` : 'not determined',
    };
    out.scaling =
      arr.covarianceScaling === 'known-sigma'
        ? 'weighted by the standard errors of the individual fits (taken as known)'
        : arr.covarianceScaling === 'known-sigma-inflated'
          ? 'weighted by the standard errors of the individual fits, scaled up because the scatter exceeds them'
          : 'unweighted; uncertainty from the scatter about the line';
    // With two temperatures and known standard errors the covariance comes from those errors,
    // not from the residual scatter; the generic least-squares note that the residual SD
    // "cannot be estimated and is reported as 0" does not describe the intervals shown.
    out.warnings = arr.covarianceScaling === 'known-sigma' ? arr.warnings.filter((w) => !/No degrees of freedom left/.test(w)) : arr.warnings;
    const pts = rows
      .filter((r) => r.result && param(r.result.parameters, 'exchangeCurrentDensity'))
      .map((r) => ({ x: r6(1000 / r.dataset.temperature), y: r6(Math.log(param(r.result!.parameters, 'exchangeCurrentDensity')!.value)) }));
    out.chart = {
      type: 'scatter',
      data: {
        datasets: [
          { label: 'j0 of each fit', data: pts, backgroundColor: COLOURS.used, borderColor: COLOURS.used, pointRadius: 4, order: 1 },
          {
            type: 'line',
            label: 'Arrhenius line',
            data: arr.curve.map((c) => ({ x: r6(1000 / c.temperature), y: r6(Math.log(c.exchangeCurrentDensity)) })),
            borderColor: COLOURS.line,
            backgroundColor: COLOURS.line,
            borderWidth: 2,
            pointRadius: 0,
            showLine: true,
            fill: false,
            order: 0,
          },
        ],
      },
      options: {
        plugins: { title: { display: true, text: 'Arrhenius plot of j0' }, legend: { position: 'bottom' } },
        scales: { x: axis('1000 K / T'), y: axis('ln (j0 / A·m⁻²)') },
      },
    };
  }
  return out;
}

export function savedFitsView(study: Study, highlight?: string): Array<Record<string, string | boolean>> {
  return study.fits.map((f) => {
    const slope = f.parameters.tafelSlope;
    const j0 = f.parameters.exchangeCurrentDensity;
    return {
      name: f.name,
      electrode: f.electrode,
      model: f.model === 'tafel' ? 'Tafel' : 'Butler–Volmer',
      temperatureC: fmt(kelvinToCelsius(f.temperature), 4),
      slope: slope ? fmt(scaled(slope.value, MV), 4) : '—',
      j0: j0 ? fmt(j0.value, 4) : '—',
      createdAt: f.createdAt ? f.createdAt.slice(0, 10) : '',
      highlight: f.id === highlight,
    };
  });
}
