/**
 * The Cell page's form and its mapping to and from the SI cell definition (the study's `cell`
 * section, server/scenario/cell-section.ts).
 *
 * Units on the form are the engineer's (°C, bar(a), mol/kg or wt %, mV/decade, A/m², kJ/mol,
 * Ω·cm², µm, mm, mS/cm, kA/m², %); every value is converted to SI here, once, with the exact
 * factors of server/core/units.ts. Electrode kinetics come from one of three sources:
 *  - a polarization dataset of the study, fitted on the fly with the kinetics core (Tafel line,
 *    automatic window unless bounds are given, the dataset's known R_u subtracted, electrode
 *    potentials turned into overpotentials with the dataset's equilibrium potential);
 *  - a kinetic fit saved in the study;
 *  - parameters entered by hand.
 * The kinetics core's working-branch uncertainty of a fit (standard errors of ln j0 and α and
 * their correlation, KineticsFitResult.workingBranchUncertainty) becomes the definition's
 * `kinetics.uncertainty`, which drives the Monte Carlo band.
 *
 * Errors name form fields (e.g. `anode.j0`, `gap2.voidFraction`); `formFieldForPath` maps the
 * core's definition paths (e.g. `ohmic.gaps[1].voidFraction`) back to them.
 */
import { Decimal } from 'decimal.js';
import { ZERO_CELSIUS_K } from '../core/constants.js';
import { InputError, PhysicsError, type IssueDetail } from '../core/errors.js';
import {
  fitKinetics,
  transferCoefficientFromTafelSlope,
  WORKING_BRANCH_LN_J0,
  workingTransferCoefficientKey,
  type Branch,
  type KineticsFitResult,
  type WorkingBranchUncertainty,
} from '../core/kinetics/index.js';
import { massFractionToMolality, molalityToMassFraction } from '../core/thermo/concentration.js';
import { UNIT_TABLES, type Quantity } from '../core/units.js';
import type {
  CellDefinition,
  ChemistryId,
  CurrentEfficiencyModel,
  ElectrodeKinetics,
  Gap,
  KineticUncertainty,
  Membrane,
} from '../core/cell/types.js';
import { cellDefinitionSchema } from '../core/cell/schema.js';
import { DEFAULT_SAMPLES, DEFAULT_SEED } from '../core/cell/uncertainty.js';
import { cellSectionSchema, type CellSection, type KineticsProvenance } from '../scenario/cell-section.js';
import type { Dataset, SavedFit, Study } from '../scenario/schema.js';
import { zodIssues } from './errors.js';

export type ElectrodeRole = 'anode' | 'cathode';
export type KineticsSource = 'dataset' | 'fit' | 'manual';
export type CompositionUnit = 'mol/kg' | 'wt%';
export type MembraneMode = 'asr' | 'conductivity' | 'springer' | 'none';
export type GapMode = 'conductivity' | 'electrolyte';
export type CeChoice = 'constant' | 'parasitic' | 'saved';

/** One electrode's part of the form (strings as typed; units in the comments). */
export interface ElectrodeForm {
  source: KineticsSource;
  dataset: string;
  /** Tafel window bounds, mV of |η|; both blank = automatic window. */
  windowMin: string;
  windowMax: string;
  fit: string;
  model: 'tafel' | 'butler-volmer';
  slopeMode: 'slope' | 'alpha';
  /** mV/decade at the reference temperature. */
  tafelSlope: string;
  alpha: string;
  alphaA: string;
  alphaC: string;
  /** A/m² at the reference temperature. */
  j0: string;
  /** °C; blank = the cell temperature. */
  refTempC: string;
  /** Standard error of ln j0 (dimensionless), of α, and their correlation; blank = none. */
  seLnJ0: string;
  seAlpha: string;
  correlation: string;
  /** kJ/mol; blank = j0 not moved in temperature. Applies to every source. */
  activationEnergy: string;
  /** kA/m²; blank = no mass-transport limit. */
  limitingCurrent: string;
  /** Origin of hand-entered numbers (carried from a saved cell). */
  note: string;
}

export interface GapForm {
  /** mm; blank = row unused. */
  thickness: string;
  mode: GapMode;
  /** mS/cm. */
  conductivity: string;
  electrolyte: 'NaCl' | 'NaOH' | 'KOH';
  /** mol/kg; blank = the cell composition. */
  concentration: string;
  /** 0–1. */
  voidFraction: string;
  voidModel: 'bruggeman' | 'maxwell';
}

export interface CellForm {
  chemistry: ChemistryId;
  temperatureC: string;
  pressureBar: string;
  compositionUnit: CompositionUnit;
  brineNaCl: string;
  causticNaOH: string;
  koh: string;
  /** V; blank = computed from thermodynamics. */
  reversibleOverride: string;
  anode: ElectrodeForm;
  cathode: ElectrodeForm;
  membraneMode: MembraneMode;
  /** Ω·cm² at membraneRefTempC. */
  membraneAsr: string;
  membraneRefTempC: string;
  /** kJ/mol. */
  membraneEa: string;
  /** µm and mS/cm. */
  membraneThickness: string;
  membraneConductivity: string;
  /** µm and λ (H₂O per SO₃⁻). */
  springerThickness: string;
  springerLambda: string;
  gaps: GapForm[];
  /** Ω·cm². */
  hardware: string;
  ceModel: CeChoice;
  /** % */
  ceValue: string;
  /** A/m² */
  ceParasitic: string;
  /** JSON of a current-efficiency model the form cannot edit (competing, crossover), kept as saved. */
  ceSaved: string;
  /** kA/m² and number of points. */
  jMin: string;
  jMax: string;
  jSteps: string;
  jDesign: string;
  /** % */
  rectifierEfficiency: string;
  band: boolean;
  bandSamples: string;
  bandSeed: string;
}

/** Gap rows shown at least (empty rows let the user add gaps without scripts). */
export const MIN_GAP_ROWS = 3;
/** Most gap rows read from a form (the core accepts at most 20 gaps). */
export const MAX_GAP_ROWS = 20;
/** Fewest and most points of a sweep entered on the form (page choice; the API takes up to 20 000). */
export const MIN_SWEEP_STEPS = 3;
export const MAX_SWEEP_STEPS = 400;
/** Most Monte Carlo samples the page runs per request (keeps a page answer quick; the API allows more). */
export const MAX_PAGE_SAMPLES = 20_000;

const CHEMISTRIES: readonly ChemistryId[] = ['chlor-alkali', 'alkaline-water', 'pem-water'];

export const CHEMISTRY_LABELS: Record<ChemistryId, string> = {
  'chlor-alkali': 'Chlor-alkali (membrane cell)',
  'alkaline-water': 'Alkaline water (KOH)',
  'pem-water': 'PEM water',
};

// ---------------------------------------------------------------------------------------------
// Labels of form fields, for error messages

const ELECTRODE_FIELD_LABELS: Record<keyof ElectrodeForm, string> = {
  source: 'kinetics source',
  dataset: 'dataset',
  windowMin: 'Tafel window from',
  windowMax: 'Tafel window to',
  fit: 'saved fit',
  model: 'model',
  slopeMode: 'slope or α',
  tafelSlope: 'Tafel slope',
  alpha: 'transfer coefficient α',
  alphaA: 'anodic transfer coefficient α_a',
  alphaC: 'cathodic transfer coefficient α_c',
  j0: 'exchange current density j0',
  refTempC: 'reference temperature of j0',
  seLnJ0: 'standard error of ln j0',
  seAlpha: 'standard error of α',
  correlation: 'correlation of ln j0 and α',
  activationEnergy: 'activation energy Ea',
  limitingCurrent: 'limiting current density',
  note: 'note',
};

const GAP_FIELD_LABELS: Record<keyof GapForm, string> = {
  thickness: 'thickness',
  mode: 'conductivity source',
  conductivity: 'conductivity',
  electrolyte: 'electrolyte',
  concentration: 'concentration',
  voidFraction: 'void fraction',
  voidModel: 'void model',
};

const FIELD_LABELS: Record<string, string> = {
  chemistry: 'Chemistry',
  temperatureC: 'Temperature',
  pressureBar: 'Pressure',
  compositionUnit: 'Composition unit',
  brineNaCl: 'Brine NaCl',
  causticNaOH: 'Caustic NaOH',
  koh: 'KOH',
  reversibleOverride: 'Reversible voltage override',
  'membrane.mode': 'Membrane',
  'membrane.asr': 'Membrane area resistance',
  'membrane.refTempC': 'Membrane reference temperature',
  'membrane.activationEnergy': 'Membrane activation energy',
  'membrane.thickness': 'Membrane thickness',
  'membrane.conductivity': 'Membrane conductivity',
  'membrane.springerThickness': 'Membrane thickness (Springer)',
  'membrane.waterContent': 'Membrane water content λ',
  hardware: 'Hardware resistance',
  'ce.model': 'Current efficiency model',
  'ce.value': 'Current efficiency',
  'ce.parasitic': 'Parasitic current density',
  'ce.saved': 'Saved current efficiency model',
  jMin: 'Lowest current density',
  jMax: 'Highest current density',
  jSteps: 'Number of points',
  jDesign: 'Design current density',
  rectifierEfficiency: 'Rectifier efficiency',
  bandSamples: 'Monte Carlo samples',
  bandSeed: 'Random seed',
};

/** Human label of a form field name (`anode.j0` → "Anode: exchange current density j0"). */
export function fieldLabel(field: string): string {
  const direct = FIELD_LABELS[field];
  if (direct) return direct;
  const e = /^(anode|cathode)\.(\w+)$/.exec(field);
  if (e) {
    const label = ELECTRODE_FIELD_LABELS[e[2] as keyof ElectrodeForm];
    if (label) return `${e[1] === 'anode' ? 'Anode' : 'Cathode'}: ${label}`;
  }
  const g = /^gap(\d+)\.(\w+)$/.exec(field);
  if (g) {
    const label = GAP_FIELD_LABELS[g[2] as keyof GapForm];
    if (label) return `Gap ${g[1]}: ${label}`;
  }
  return field;
}

/**
 * The form field that holds the value behind a path of the SI cell definition (the core's
 * error paths), or undefined. `form` decides between alternatives (e.g. a fitted dataset vs
 * hand-entered j0).
 */
export function formFieldForPath(path: string, form: CellForm): string | undefined {
  if (path === 'temperature') return 'temperatureC';
  if (path === 'pressure') return 'pressureBar';
  if (path === 'chemistry') return 'chemistry';
  if (path === 'reversiblePotential') return 'reversibleOverride';
  const comp = /^composition\.(brineNaCl|causticNaOH|koh)/.exec(path);
  if (comp) return comp[1];
  if (path === 'composition') return form.chemistry === 'alkaline-water' ? 'koh' : 'brineNaCl';
  const el = /^(anode|cathode)(?:\.(.*))?$/.exec(path);
  if (el) {
    const role = el[1] as ElectrodeRole;
    const rest = el[2] ?? '';
    const f = form[role];
    if (rest.startsWith('limitingCurrentDensity')) return `${role}.limitingCurrent`;
    if (rest.startsWith('kinetics.activationEnergy')) return `${role}.activationEnergy`;
    if (f.source === 'dataset') return `${role}.dataset`;
    if (f.source === 'fit') return `${role}.fit`;
    if (rest.startsWith('kinetics.exchangeCurrentDensity')) return `${role}.j0`;
    if (rest.startsWith('kinetics.referenceTemperature')) return `${role}.refTempC`;
    if (rest.startsWith('kinetics.uncertainty.lnExchangeCurrentDensitySE')) return `${role}.seLnJ0`;
    if (rest.startsWith('kinetics.uncertainty.transferCoefficientSE')) return `${role}.seAlpha`;
    if (rest.startsWith('kinetics.uncertainty')) return `${role}.correlation`;
    if (rest.startsWith('kinetics.anodicTransferCoefficient')) return `${role}.alphaA`;
    if (rest.startsWith('kinetics.cathodicTransferCoefficient')) return `${role}.alphaC`;
    if (rest.startsWith('kinetics')) return f.slopeMode === 'slope' ? `${role}.tafelSlope` : `${role}.alpha`;
    return `${role}.source`;
  }
  if (path.startsWith('ohmic.membrane')) {
    if (/springer\.waterContent/.test(path)) return 'membrane.waterContent';
    if (/springer/.test(path)) return 'membrane.springerThickness';
    if (/referenceTemperature/.test(path)) return 'membrane.refTempC';
    if (/activationEnergy/.test(path)) return 'membrane.activationEnergy';
    if (/areaResistance/.test(path)) return 'membrane.asr';
    if (/thickness/.test(path)) return 'membrane.thickness';
    if (/conductivity/.test(path)) return 'membrane.conductivity';
    return 'membrane.mode';
  }
  const gap = /^ohmic\.gaps\[(\d+)\](?:\.(\w+))?/.exec(path);
  if (gap) {
    const row = Number(gap[1]) + 1;
    const key = gap[2];
    const map: Record<string, keyof GapForm> = {
      thickness: 'thickness',
      conductivity: 'conductivity',
      electrolyte: 'electrolyte',
      concentration: 'concentration',
      voidFraction: 'voidFraction',
      voidModel: 'voidModel',
    };
    return `gap${row}.${key && map[key] ? map[key] : 'thickness'}`;
  }
  if (path === 'ohmic.hardware') return 'hardware';
  if (path.startsWith('currentEfficiency')) {
    if (form.ceModel === 'saved') return 'ce.saved';
    return form.ceModel === 'parasitic' ? 'ce.parasitic' : 'ce.value';
  }
  if (path.startsWith('currentDensities')) return 'jMax';
  if (path === 'designCurrentDensity') return 'jDesign';
  if (path === 'rectifierEfficiency') return 'rectifierEfficiency';
  if (path === 'samples' || path === 'uncertainty.samples') return 'bandSamples';
  if (path === 'seed' || path === 'uncertainty.seed') return 'bandSeed';
  return undefined;
}

// ---------------------------------------------------------------------------------------------
// Reading the posted form

function str(body: Record<string, unknown>, key: string, fallback = ''): string {
  const v = body[key];
  if (typeof v === 'string') return v.slice(0, 2000);
  if (Array.isArray(v) && typeof v[v.length - 1] === 'string') return String(v[v.length - 1]).slice(0, 2000);
  return fallback;
}

function pick<T extends string>(value: string, allowed: readonly T[], fallback: T): T {
  return (allowed as readonly string[]).includes(value) ? (value as T) : fallback;
}

function readElectrode(body: Record<string, unknown>, role: ElectrodeRole): ElectrodeForm {
  const k = (name: string) => str(body, `${role}.${name}`);
  return {
    source: pick(k('source'), ['dataset', 'fit', 'manual'] as const, 'manual'),
    dataset: k('dataset'),
    windowMin: k('windowMin'),
    windowMax: k('windowMax'),
    fit: k('fit'),
    model: pick(k('model'), ['tafel', 'butler-volmer'] as const, 'tafel'),
    slopeMode: pick(k('slopeMode'), ['slope', 'alpha'] as const, 'alpha'),
    tafelSlope: k('tafelSlope'),
    alpha: k('alpha'),
    alphaA: k('alphaA'),
    alphaC: k('alphaC'),
    j0: k('j0'),
    refTempC: k('refTempC'),
    seLnJ0: k('seLnJ0'),
    seAlpha: k('seAlpha'),
    correlation: k('correlation'),
    activationEnergy: k('activationEnergy'),
    limitingCurrent: k('limitingCurrent'),
    note: k('note'),
  };
}

function readGap(body: Record<string, unknown>, row: number): GapForm {
  const k = (name: string) => str(body, `gap${row}.${name}`);
  return {
    thickness: k('thickness'),
    mode: pick(k('mode'), ['conductivity', 'electrolyte'] as const, 'conductivity'),
    conductivity: k('conductivity'),
    electrolyte: pick(k('electrolyte'), ['NaCl', 'NaOH', 'KOH'] as const, 'NaCl'),
    concentration: k('concentration'),
    voidFraction: k('voidFraction'),
    voidModel: pick(k('voidModel'), ['bruggeman', 'maxwell'] as const, 'bruggeman'),
  };
}

/** Empty gap row (unused). */
export function emptyGap(): GapForm {
  return { thickness: '', mode: 'conductivity', conductivity: '', electrolyte: 'NaCl', concentration: '', voidFraction: '', voidModel: 'bruggeman' };
}

/** Pad the gap rows so that at least MIN_GAP_ROWS and one empty row are shown. */
export function padGaps(gaps: GapForm[]): GapForm[] {
  const used = gaps.filter((g) => g.thickness.trim() !== '');
  const rows = Math.min(MAX_GAP_ROWS, Math.max(MIN_GAP_ROWS, used.length + 1));
  const out = [...used];
  while (out.length < rows) out.push(emptyGap());
  return out;
}

/** Read the posted form (urlencoded body with flat keys such as `anode.j0`, `gap1.thickness`). */
export function readForm(body: Record<string, unknown> | undefined): CellForm {
  const b = body ?? {};
  const gaps: GapForm[] = [];
  for (let row = 1; row <= MAX_GAP_ROWS; row++) {
    if (!(`gap${row}.thickness` in b)) continue;
    gaps.push(readGap(b, row));
  }
  return {
    chemistry: pick(str(b, 'chemistry'), CHEMISTRIES, 'chlor-alkali'),
    temperatureC: str(b, 'temperatureC'),
    pressureBar: str(b, 'pressureBar'),
    compositionUnit: pick(str(b, 'compositionUnit'), ['mol/kg', 'wt%'] as const, 'mol/kg'),
    brineNaCl: str(b, 'brineNaCl'),
    causticNaOH: str(b, 'causticNaOH'),
    koh: str(b, 'koh'),
    reversibleOverride: str(b, 'reversibleOverride'),
    anode: readElectrode(b, 'anode'),
    cathode: readElectrode(b, 'cathode'),
    membraneMode: pick(str(b, 'membrane.mode'), ['asr', 'conductivity', 'springer', 'none'] as const, 'asr'),
    membraneAsr: str(b, 'membrane.asr'),
    membraneRefTempC: str(b, 'membrane.refTempC'),
    membraneEa: str(b, 'membrane.activationEnergy'),
    membraneThickness: str(b, 'membrane.thickness'),
    membraneConductivity: str(b, 'membrane.conductivity'),
    springerThickness: str(b, 'membrane.springerThickness'),
    springerLambda: str(b, 'membrane.waterContent'),
    gaps: padGaps(gaps),
    hardware: str(b, 'hardware'),
    ceModel: pick(str(b, 'ce.model'), ['constant', 'parasitic', 'saved'] as const, 'constant'),
    ceValue: str(b, 'ce.value'),
    ceParasitic: str(b, 'ce.parasitic'),
    ceSaved: str(b, 'ce.saved'),
    jMin: str(b, 'jMin'),
    jMax: str(b, 'jMax'),
    jSteps: str(b, 'jSteps'),
    jDesign: str(b, 'jDesign'),
    rectifierEfficiency: str(b, 'rectifierEfficiency'),
    band: str(b, 'band') === 'on',
    bandSamples: str(b, 'bandSamples'),
    bandSeed: str(b, 'bandSeed'),
  };
}

// ---------------------------------------------------------------------------------------------
// Numbers: parsing form text, printing SI values back into the form

interface NumberRule {
  optional?: boolean;
  min?: number;
  max?: number;
  minExclusive?: boolean;
  maxExclusive?: boolean;
  integer?: boolean;
}

/** Collects form problems with field names, then throws them together as one InputError. */
class FormIssues {
  readonly issues: IssueDetail[] = [];
  readonly fields = new Set<string>();

  add(field: string, message: string): void {
    if (this.fields.has(field)) return;
    this.fields.add(field);
    this.issues.push({ path: field, message });
  }

  /** Parse a number typed in a form field (decimal comma accepted); undefined when blank and optional. */
  number(text: string, field: string, rule: NumberRule = {}): number | undefined {
    const t = text.trim();
    if (t === '') {
      if (!rule.optional) this.add(field, 'is required');
      return undefined;
    }
    const normalised = /^[+-]?\d+,\d+$/.test(t) ? t.replace(',', '.') : t;
    const v = Number(normalised);
    if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(normalised) || !Number.isFinite(v)) {
      this.add(field, `"${t.slice(0, 40)}" is not a number`);
      return undefined;
    }
    if (rule.integer && !Number.isInteger(v)) this.add(field, 'must be a whole number');
    if (rule.min !== undefined && (rule.minExclusive ? v <= rule.min : v < rule.min)) {
      this.add(field, `must be ${rule.minExclusive ? '>' : '≥'} ${rule.min}`);
    }
    if (rule.max !== undefined && (rule.maxExclusive ? v >= rule.max : v > rule.max)) {
      this.add(field, `must be ${rule.maxExclusive ? '<' : '≤'} ${rule.max}`);
    }
    return this.fields.has(field) ? undefined : v;
  }

  throwIfAny(): void {
    if (this.issues.length === 0) return;
    const message = `Please check: ${this.issues.map((i) => `${fieldLabel(i.path)} ${i.message}`).join('; ')}`;
    throw InputError.many(message, this.issues);
  }
}

/** SI value → form text in `unit` (exact decimal division, 12 significant digits, no trailing zeros). */
export function formValue(valueSI: number | undefined, quantity: Quantity, unit: string): string {
  if (valueSI === undefined || !Number.isFinite(valueSI)) return '';
  const f = (UNIT_TABLES[quantity] as Record<string, number>)[unit];
  return plain(new Decimal(valueSI).div(f ?? 1));
}

function plain(d: Decimal | number): string {
  const x = new Decimal(d).toSignificantDigits(12);
  const abs = x.abs();
  if (x.isZero()) return '0';
  if (abs.gte(1e-6) && abs.lt(1e12)) return x.toFixed();
  return x.toString();
}

function celsiusText(kelvin: number | undefined): string {
  if (kelvin === undefined) return '';
  return plain(new Decimal(kelvin).minus(ZERO_CELSIUS_K.value));
}

function kelvin(celsius: number): number {
  return new Decimal(celsius).plus(ZERO_CELSIUS_K.value).toNumber();
}

/** SI value (via decimal arithmetic, so 0.55 Ω·cm² becomes exactly 0.55e-4 Ω·m²). */
function si(value: number, quantity: Quantity, unit: string): number {
  const f = (UNIT_TABLES[quantity] as Record<string, number>)[unit];
  return new Decimal(value).times(f).toNumber();
}

/** kJ/mol → J/mol. */
const J_PER_KJ = 1000;
/** Percent → fraction. */
const PERCENT = 100;

/** Transfer coefficient α from a Tafel slope b [V/decade] at T [K] (the kinetics core's inverse of b₁₀ = ln10·RT/(αF)). */
export const alphaFromSlope = transferCoefficientFromTafelSlope;

// ---------------------------------------------------------------------------------------------
// Kinetic fits → definition kinetics with uncertainty

/** A fitted or saved parameter (study-file shape). */
interface ParameterLike {
  value: number;
  standardError?: number | null;
}

/** Result of turning a fit into the definition's kinetics. */
export interface FitKinetics {
  kinetics: ElectrodeKinetics;
  warnings: string[];
}

/** Clamp a correlation into [−1, 1] (round-off can step just outside). */
function clampCorrelation(r: number): number {
  return Math.max(-1, Math.min(1, r));
}

function seOf(p: ParameterLike | undefined): number | undefined {
  const s = p?.standardError;
  return typeof s === 'number' && Number.isFinite(s) && s >= 0 ? s : undefined;
}

/** The working branch of an electrode: the anode works anodic, the cathode cathodic. */
function workingBranch(role: ElectrodeRole): Branch {
  return role === 'anode' ? 'anodic' : 'cathodic';
}

/**
 * The electrode's KineticUncertainty from a fit. No statistics are done here: the kinetics
 * core computes corr(ln j0, α) of the working branch (KineticsFitResult.workingBranchUncertainty,
 * delta method from the fit covariance), and this only picks it up:
 *  1. a fit result (on-the-fly fit) carrying `workingBranchUncertainty` for the electrode's
 *     working branch: its SEs and correlation as they are;
 *  2. a saved fit whose correlation record names [lnExchangeCurrentDensity, <working α key>]:
 *     the correlation from the record, SE(ln j0) = SE(j0)/j0 (the core reports SE(j0) by the
 *     delta method from SE(ln j0), so this is exact) and SE(α) of the saved parameter;
 *  3. a saved Butler–Volmer fit from before that record (names 'ln j0', 'ln α_a', 'ln α_c' or
 *     'logit(α_a/n)'): the fitted parameters map monotonically onto (ln j0, α), so their
 *     correlation is that of the pair to first order (sign flipped for a tied α_c = n − α_a);
 *     a held α carries no variance (correlation 0).
 * A saved Tafel fit from before the record (correlation of the line parameters a, b) does
 * not determine corr(ln j0, α) without SE(a), which was not saved: it adds no uncertainty and
 * the returned message says to save the fit again. Returns the uncertainty or a reason.
 */
function fitUncertainty(
  fit: KineticsFitLike,
  role: ElectrodeRole,
  j0: number,
  label: string,
): { uncertainty: KineticUncertainty } | { reason: string } {
  const missing = { reason: `${label}: the fit's standard errors or correlation are missing, so it adds no uncertainty to the band.` };
  const u = fit.workingBranchUncertainty;
  if (u && u.branch === workingBranch(role)) {
    return { uncertainty: { lnExchangeCurrentDensitySE: u.lnExchangeCurrentDensitySE, transferCoefficientSE: u.transferCoefficientSE, correlation: clampCorrelation(u.correlation) } };
  }
  const p = fit.parameters;
  const seJ0 = seOf(p.exchangeCurrentDensity);
  const lnJ0SE = seJ0 === undefined ? undefined : seJ0 / j0;
  const alphaKey = workingTransferCoefficientKey(fit.model, workingBranch(role));
  const alphaSE = seOf(p[alphaKey]);
  const names = fit.correlation?.names ?? [];
  const matrix = fit.correlation?.matrix ?? [];
  const corrAt = (i: number, k: number): number | undefined => {
    const v = matrix[i]?.[k];
    return typeof v === 'number' && Number.isFinite(v) ? v : undefined;
  };
  if (names.length === 2 && names[0] === WORKING_BRANCH_LN_J0) {
    if (names[1] !== alphaKey) {
      return { reason: `${label}: its saved correlation is for the transfer coefficient of the other branch, not the ${role}'s, so it adds no uncertainty to the band.` };
    }
    const rho = corrAt(0, 1);
    if (lnJ0SE === undefined || alphaSE === undefined || rho === undefined) return missing;
    return { uncertainty: { lnExchangeCurrentDensitySE: lnJ0SE, transferCoefficientSE: alphaSE, correlation: clampCorrelation(rho) } };
  }
  if (fit.model === 'tafel') {
    if (names.some((n) => /^a\b/.test(n)) && names.some((n) => /^b\b/.test(n))) {
      return {
        reason: `${label}: it was saved with the correlation of the line parameters (a, b), from which corr(ln j0, α) cannot be recovered, so it adds no uncertainty to the band; fit the dataset again on the Kinetics page and save the fit to carry its uncertainty.`,
      };
    }
    return missing;
  }
  // Saved Butler–Volmer fit from before the working-branch record.
  const iL = names.findIndex((n) => /ln j0/.test(n));
  const own = names.findIndex((n) => n.includes(role === 'anode' ? 'α_a' : 'α_c'));
  const other = names.findIndex((n) => n.includes(role === 'anode' ? 'α_c' : 'α_a'));
  let corr: number | undefined;
  if (iL >= 0 && own >= 0) corr = corrAt(iL, own);
  else if (iL >= 0 && other >= 0) {
    const c = corrAt(iL, other);
    corr = c === undefined ? undefined : -c;
  } else if (alphaSE === 0 || alphaSE === undefined) corr = 0;
  if (lnJ0SE === undefined || corr === undefined) return missing;
  return { uncertainty: { lnExchangeCurrentDensitySE: lnJ0SE, transferCoefficientSE: alphaSE ?? 0, correlation: clampCorrelation(corr) } };
}

/** The parts of a fit (core result or saved fit: same parameter keys) that kineticsFromFit reads. */
export interface KineticsFitLike {
  model: 'tafel' | 'butler-volmer';
  parameters: Record<string, ParameterLike | undefined>;
  correlation?: { names: string[]; matrix: number[][] } | undefined;
  /** Present on core fit results (KineticsFitResult.workingBranchUncertainty). */
  workingBranchUncertainty?: WorkingBranchUncertainty | undefined;
}

/**
 * Definition kinetics from a fit's parameters (fitKinetics result or a saved fit: same keys),
 * at the fit temperature `temperatureK` (becomes `referenceTemperature`). The working branch is
 * the electrode's (anode anodic, cathode cathodic). Uncertainty: see fitUncertainty (computed
 * by the kinetics core; read here, not re-derived).
 */
export function kineticsFromFit(fit: KineticsFitLike, role: ElectrodeRole, temperatureK: number, label: string): FitKinetics {
  const warnings: string[] = [];
  const p = fit.parameters;
  const j0 = p.exchangeCurrentDensity?.value;
  if (!(typeof j0 === 'number' && j0 > 0 && Number.isFinite(j0))) {
    throw new InputError(`${role}.${label}`, 'the fit has no positive exchange current density');
  }
  let kinetics: ElectrodeKinetics;
  if (fit.model === 'tafel') {
    const alpha = p.transferCoefficient?.value;
    if (!(typeof alpha === 'number' && alpha > 0)) throw new InputError(`${role}.${label}`, 'the fit has no positive transfer coefficient');
    kinetics = { model: 'tafel', exchangeCurrentDensity: j0, transferCoefficient: alpha, referenceTemperature: temperatureK };
  } else {
    const aa = p.anodicTransferCoefficient?.value;
    const ac = p.cathodicTransferCoefficient?.value;
    if (!(typeof aa === 'number' && aa > 0 && typeof ac === 'number' && ac > 0)) {
      throw new InputError(`${role}.${label}`, 'the Butler–Volmer fit lacks positive transfer coefficients');
    }
    kinetics = { model: 'butler-volmer', exchangeCurrentDensity: j0, anodicTransferCoefficient: aa, cathodicTransferCoefficient: ac, referenceTemperature: temperatureK };
  }
  const u = fitUncertainty(fit, role, j0, label);
  if ('uncertainty' in u) kinetics.uncertainty = u.uncertainty;
  else warnings.push(u.reason);
  return { kinetics, warnings };
}

// ---------------------------------------------------------------------------------------------
// Building the SI definition from the form

/** A short record of a fit made on the fly, for the page. */
export interface OnTheFlyFit {
  datasetId: string;
  points: number;
  /** |η| window actually fitted, V. */
  window: [number, number];
  windowRule: string;
  rSquared: number;
  /** V/decade. */
  tafelSlope: number;
  status: string;
}

export interface ElectrodeOrigin {
  kind: KineticsSource;
  /** Plain-language origin. */
  note: string;
  fit?: OnTheFlyFit;
}

export interface BuiltCell {
  section: CellSection;
  origins: Record<ElectrodeRole, ElectrodeOrigin>;
  /** Warnings from the conversion and the on-the-fly fits. */
  warnings: string[];
}

/** Default reaction electrons when a dataset does not say (both electrodes of all three chemistries: n = 2). */
const DEFAULT_ELECTRONS = 2;

/** Overpotential as measured [V] of a dataset point: E − E_eq on the dataset's own reference scale, or η as stored. */
function measuredOverpotentials(d: Dataset, role: ElectrodeRole): Array<{ currentDensity: number; overpotential: number }> {
  if (d.potentialKind === 'electrode') {
    if (d.equilibriumPotential === undefined) {
      throw new InputError(`${role}.dataset`, `dataset "${d.name}" holds electrode potentials but no equilibrium potential, so its overpotentials are unknown; add one on the Kinetics page or save a fit there`);
    }
    const eq = d.equilibriumPotential;
    // The study schema stores E_eq against the same reference as the potentials, so the scale cancels.
    return d.points.map((p) => ({ currentDensity: p.currentDensity, overpotential: p.potential - eq }));
  }
  return d.points.map((p) => ({ currentDensity: p.currentDensity, overpotential: p.potential }));
}

function fitDataset(
  issues: FormIssues,
  form: ElectrodeForm,
  role: ElectrodeRole,
  study: Study,
  warnings: string[],
): { kinetics: ElectrodeKinetics; origin: ElectrodeOrigin } | undefined {
  const field = `${role}.dataset`;
  const d = study.datasets.find((x) => x.id === form.dataset);
  if (!d) {
    issues.add(field, form.dataset ? `the study has no dataset "${form.dataset}"` : 'choose a dataset');
    return undefined;
  }
  if (d.electrode !== role) {
    issues.add(field, `"${d.name}" is a ${d.electrode} dataset; choose a ${role} dataset`);
    return undefined;
  }
  const lo = issues.number(form.windowMin, `${role}.windowMin`, { optional: true, min: 0 });
  const hi = issues.number(form.windowMax, `${role}.windowMax`, { optional: true, min: 0, minExclusive: true });
  let window: { minOverpotential: number; maxOverpotential: number } | 'auto' = 'auto';
  if (lo !== undefined || hi !== undefined) {
    if (lo === undefined || hi === undefined) {
      issues.add(lo === undefined ? `${role}.windowMin` : `${role}.windowMax`, 'give both window bounds, or leave both blank for the automatic window');
      return undefined;
    }
    if (!(hi > lo)) {
      issues.add(`${role}.windowMax`, 'must be above the lower bound');
      return undefined;
    }
    window = { minOverpotential: si(lo, 'potential', 'mV'), maxOverpotential: si(hi, 'potential', 'mV') };
  }
  let result: KineticsFitResult;
  try {
    result = fitKinetics({
      points: measuredOverpotentials(d, role),
      model: 'tafel',
      temperature: d.temperature,
      electrons: d.electrons ?? DEFAULT_ELECTRONS,
      window,
      uncompensatedResistance: d.uncompensatedResistance ?? 0,
      branch: role === 'anode' ? 'anodic' : 'cathodic',
    });
  } catch (err) {
    if (err instanceof InputError || err instanceof PhysicsError) {
      const reason = err.issues.map((i) => (i.path && i.path !== field ? `${i.path}: ${i.message}` : i.message)).join('; ');
      issues.add(field, `the Tafel fit of "${d.name}" failed: ${reason}`);
      return undefined;
    }
    throw err;
  }
  const label = `${role === 'anode' ? 'Anode' : 'Cathode'} fit of "${d.name}"`;
  for (const w of result.warnings) warnings.push(`${label}: ${w}`);
  const converted = kineticsFromFit(result, role, d.temperature, label);
  warnings.push(...converted.warnings);
  const windowText = window === 'auto' ? 'automatic window' : `window ${lo}–${hi} mV`;
  const ru = d.uncompensatedResistance ?? 0;
  return {
    kinetics: converted.kinetics,
    origin: {
      kind: 'dataset',
      note: `Tafel fit of dataset "${d.name}" (${windowText}${ru > 0 ? `, known R_u = ${formValue(ru, 'areaResistance', 'ohm*cm2')} Ω·cm² subtracted` : ''})`,
      fit: {
        datasetId: d.id,
        points: result.statistics.points,
        window: [result.window.minOverpotential, result.window.maxOverpotential],
        windowRule: result.window.rule,
        rSquared: result.statistics.rSquared,
        tafelSlope: result.parameters.tafelSlope.value,
        status: result.status,
      },
    },
  };
}

function savedFitKinetics(
  issues: FormIssues,
  form: ElectrodeForm,
  role: ElectrodeRole,
  study: Study,
  warnings: string[],
): { kinetics: ElectrodeKinetics; origin: ElectrodeOrigin } | undefined {
  const field = `${role}.fit`;
  const f: SavedFit | undefined = study.fits.find((x) => x.id === form.fit);
  if (!f) {
    issues.add(field, form.fit ? `the study has no saved fit "${form.fit}"` : 'choose a saved fit');
    return undefined;
  }
  if (f.electrode !== role) {
    issues.add(field, `"${f.name}" is a ${f.electrode} fit; choose a ${role} fit`);
    return undefined;
  }
  try {
    const converted = kineticsFromFit(f, role, f.temperature, `${role === 'anode' ? 'Anode' : 'Cathode'} saved fit "${f.name}"`);
    warnings.push(...converted.warnings);
    return { kinetics: converted.kinetics, origin: { kind: 'fit', note: `Saved ${f.model === 'tafel' ? 'Tafel' : 'Butler–Volmer'} fit "${f.name}"` } };
  } catch (err) {
    if (err instanceof InputError) {
      issues.add(field, err.issues[0]?.message ?? err.message);
      return undefined;
    }
    throw err;
  }
}

function manualKinetics(issues: FormIssues, form: ElectrodeForm, role: ElectrodeRole, cellTemperatureK: number | undefined): ElectrodeKinetics | undefined {
  const p = (k: keyof ElectrodeForm) => `${role}.${k}`;
  const j0 = issues.number(form.j0, p('j0'), { min: 0, minExclusive: true });
  const refC = issues.number(form.refTempC, p('refTempC'), { optional: true, min: -ZERO_CELSIUS_K.value, minExclusive: true });
  const refK = refC === undefined ? undefined : kelvin(refC);
  let kinetics: ElectrodeKinetics | undefined;
  if (form.model === 'butler-volmer') {
    const aa = issues.number(form.alphaA, p('alphaA'), { min: 0, minExclusive: true });
    const ac = issues.number(form.alphaC, p('alphaC'), { min: 0, minExclusive: true });
    if (j0 !== undefined && aa !== undefined && ac !== undefined) {
      kinetics = { model: 'butler-volmer', exchangeCurrentDensity: j0, anodicTransferCoefficient: aa, cathodicTransferCoefficient: ac };
    }
  } else {
    let alpha: number | undefined;
    if (form.slopeMode === 'slope') {
      const slopeMv = issues.number(form.tafelSlope, p('tafelSlope'), { min: 0, minExclusive: true });
      const T = refK ?? cellTemperatureK;
      if (slopeMv !== undefined && T !== undefined) alpha = alphaFromSlope(si(slopeMv, 'potential', 'mV'), T);
    } else {
      alpha = issues.number(form.alpha, p('alpha'), { min: 0, minExclusive: true });
    }
    if (j0 !== undefined && alpha !== undefined) kinetics = { model: 'tafel', exchangeCurrentDensity: j0, transferCoefficient: alpha };
  }
  const seL = issues.number(form.seLnJ0, p('seLnJ0'), { optional: true, min: 0 });
  const seA = issues.number(form.seAlpha, p('seAlpha'), { optional: true, min: 0 });
  const rho = issues.number(form.correlation, p('correlation'), { optional: true, min: -1, max: 1 });
  const any = [seL, seA, rho].some((v) => v !== undefined);
  if (kinetics && any) {
    if (seL === undefined || seA === undefined) {
      issues.add(seL === undefined ? p('seLnJ0') : p('seAlpha'), 'give both standard errors (and the correlation), or none');
    } else {
      kinetics.uncertainty = { lnExchangeCurrentDensitySE: seL, transferCoefficientSE: seA, correlation: rho ?? 0 };
    }
  }
  if (kinetics && refK !== undefined) kinetics.referenceTemperature = refK;
  return kinetics;
}

function buildElectrode(
  issues: FormIssues,
  form: CellForm,
  role: ElectrodeRole,
  study: Study,
  cellTemperatureK: number | undefined,
  warnings: string[],
): { electrode: CellDefinition['anode']; origin: ElectrodeOrigin } | undefined {
  const f = form[role];
  let kinetics: ElectrodeKinetics | undefined;
  let origin: ElectrodeOrigin = { kind: 'manual', note: f.note || 'Entered by hand' };
  if (f.source === 'dataset') {
    const r = fitDataset(issues, f, role, study, warnings);
    if (r) ({ kinetics, origin } = r);
  } else if (f.source === 'fit') {
    const r = savedFitKinetics(issues, f, role, study, warnings);
    if (r) ({ kinetics, origin } = r);
  } else {
    kinetics = manualKinetics(issues, f, role, cellTemperatureK);
  }
  const ea = issues.number(f.activationEnergy, `${role}.activationEnergy`, { optional: true });
  const jlim = issues.number(f.limitingCurrent, `${role}.limitingCurrent`, { optional: true, min: 0, minExclusive: true });
  if (!kinetics) return undefined;
  if (ea !== undefined) {
    kinetics.activationEnergy = ea * J_PER_KJ;
    // Arrhenius needs a reference temperature: hand-entered j0 without one is at the cell temperature.
    if (kinetics.referenceTemperature === undefined && cellTemperatureK !== undefined) kinetics.referenceTemperature = cellTemperatureK;
  }
  const electrode: CellDefinition['anode'] = { kinetics };
  if (jlim !== undefined) electrode.limitingCurrentDensity = si(jlim, 'currentDensity', 'kA/m2');
  return { electrode, origin };
}

const COMPOSITION_SALT = { brineNaCl: 'NaCl', causticNaOH: 'NaOH', koh: 'KOH' } as const;
const REQUIRED_COMPOSITION: Record<ChemistryId, Array<keyof typeof COMPOSITION_SALT>> = {
  'chlor-alkali': ['brineNaCl', 'causticNaOH'],
  'alkaline-water': ['koh'],
  'pem-water': [],
};
/** Largest mass fraction accepted on the form, wt % (below 100 % by definition). */
const MAX_WEIGHT_PERCENT = 99;

function buildComposition(issues: FormIssues, form: CellForm): CellDefinition['composition'] {
  const out: NonNullable<CellDefinition['composition']> = {};
  for (const key of REQUIRED_COMPOSITION[form.chemistry]) {
    const wt = form.compositionUnit === 'wt%';
    const v = issues.number(form[key], key, { optional: true, min: 0, minExclusive: true, max: wt ? MAX_WEIGHT_PERCENT : undefined });
    if (v === undefined) continue;
    out[key] = wt ? massFractionToMolality(COMPOSITION_SALT[key], v / PERCENT) : v;
  }
  return out;
}

function buildMembrane(issues: FormIssues, form: CellForm, cellTemperatureK: number | undefined): Membrane | undefined {
  switch (form.membraneMode) {
    case 'none':
      return undefined;
    case 'conductivity': {
      const d = issues.number(form.membraneThickness, 'membrane.thickness', { min: 0 });
      const s = issues.number(form.membraneConductivity, 'membrane.conductivity', { min: 0, minExclusive: true });
      if (d === undefined || s === undefined) return undefined;
      return { thickness: si(d, 'length', 'um'), conductivity: si(s, 'conductivity', 'mS/cm') };
    }
    case 'springer': {
      const d = issues.number(form.springerThickness, 'membrane.springerThickness', { min: 0 });
      const l = issues.number(form.springerLambda, 'membrane.waterContent', { min: 0, minExclusive: true });
      if (d === undefined || l === undefined) return undefined;
      return { springer: { thickness: si(d, 'length', 'um'), waterContent: l } };
    }
    default: {
      const r = issues.number(form.membraneAsr, 'membrane.asr', { min: 0 });
      const tC = issues.number(form.membraneRefTempC, 'membrane.refTempC', { optional: true, min: -ZERO_CELSIUS_K.value, minExclusive: true });
      const ea = issues.number(form.membraneEa, 'membrane.activationEnergy', { optional: true });
      if (r === undefined) return undefined;
      const m: Membrane = { areaResistance: si(r, 'areaResistance', 'ohm*cm2') };
      const refK = tC === undefined ? undefined : kelvin(tC);
      if (refK !== undefined) m.referenceTemperature = refK;
      if (ea !== undefined) {
        m.activationEnergy = ea * J_PER_KJ;
        if (m.referenceTemperature === undefined && cellTemperatureK !== undefined) m.referenceTemperature = cellTemperatureK;
      }
      return m;
    }
  }
}

function buildGaps(issues: FormIssues, form: CellForm): Gap[] {
  const gaps: Gap[] = [];
  form.gaps.forEach((g, i) => {
    if (g.thickness.trim() === '') return;
    const row = `gap${i + 1}`;
    const d = issues.number(g.thickness, `${row}.thickness`, { min: 0 });
    const eps = issues.number(g.voidFraction, `${row}.voidFraction`, { optional: true, min: 0, max: 1, maxExclusive: true });
    let gap: Gap | undefined;
    if (g.mode === 'electrolyte') {
      const c = issues.number(g.concentration, `${row}.concentration`, { optional: true, min: 0, minExclusive: true });
      if (d !== undefined) {
        gap = { thickness: si(d, 'length', 'mm'), electrolyte: g.electrolyte };
        if (c !== undefined) gap.concentration = c;
      }
    } else {
      const s = issues.number(g.conductivity, `${row}.conductivity`, { min: 0, minExclusive: true });
      if (d !== undefined && s !== undefined) gap = { thickness: si(d, 'length', 'mm'), conductivity: si(s, 'conductivity', 'mS/cm') };
    }
    if (!gap) return;
    if (eps !== undefined && eps > 0) {
      gap.voidFraction = eps;
      gap.voidModel = g.voidModel;
    }
    gaps.push(gap);
  });
  return gaps;
}

function buildCurrentEfficiency(issues: FormIssues, form: CellForm): CurrentEfficiencyModel | undefined {
  if (form.ceModel === 'parasitic') {
    const jp = issues.number(form.ceParasitic, 'ce.parasitic', { min: 0 });
    return jp === undefined ? undefined : { model: 'parasitic', currentDensity: jp };
  }
  if (form.ceModel === 'saved') {
    let raw: unknown;
    try {
      raw = JSON.parse(form.ceSaved);
    } catch {
      issues.add('ce.saved', 'the saved model could not be read; choose constant or parasitic');
      return undefined;
    }
    const parsed = cellDefinitionSchema.shape.currentEfficiency.safeParse(raw);
    if (!parsed.success || !parsed.data) {
      issues.add('ce.saved', 'the saved model is not valid; choose constant or parasitic');
      return undefined;
    }
    return parsed.data as CurrentEfficiencyModel;
  }
  const v = issues.number(form.ceValue, 'ce.value', { min: 0, minExclusive: true, max: PERCENT });
  return v === undefined ? undefined : { model: 'constant', value: v / PERCENT };
}

/** Evenly spaced current densities lo…hi (n points, both ends included). */
function linspace(lo: number, hi: number, n: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < n; i++) out.push(i === n - 1 ? hi : lo + ((hi - lo) * i) / (n - 1));
  return out;
}

/**
 * Turn the form into the SI cell section (fitting datasets on the fly where chosen). Throws
 * InputError whose issue paths are form field names; the core may later throw with definition
 * paths (map them with formFieldForPath).
 */
export function buildCell(form: CellForm, study: Study): BuiltCell {
  const issues = new FormIssues();
  const warnings: string[] = [];
  const tC = issues.number(form.temperatureC, 'temperatureC', { min: -ZERO_CELSIUS_K.value, minExclusive: true });
  const T = tC === undefined ? undefined : kelvin(tC);
  const pBar = issues.number(form.pressureBar, 'pressureBar', { min: 0, minExclusive: true });
  const composition = buildComposition(issues, form);
  const erev = issues.number(form.reversibleOverride, 'reversibleOverride', { optional: true, min: 0, minExclusive: true });

  const anode = buildElectrode(issues, form, 'anode', study, T, warnings);
  const cathode = buildElectrode(issues, form, 'cathode', study, T, warnings);

  const membrane = buildMembrane(issues, form, T);
  const gaps = buildGaps(issues, form);
  const hardware = issues.number(form.hardware, 'hardware', { optional: true, min: 0 });
  const ce = buildCurrentEfficiency(issues, form);

  const jMin = issues.number(form.jMin, 'jMin', { min: 0, minExclusive: true });
  const jMax = issues.number(form.jMax, 'jMax', { min: 0, minExclusive: true });
  const steps = issues.number(form.jSteps, 'jSteps', { min: MIN_SWEEP_STEPS, max: MAX_SWEEP_STEPS, integer: true });
  if (jMin !== undefined && jMax !== undefined && !(jMax > jMin)) issues.add('jMax', 'must be above the lowest current density');
  const jDesign = issues.number(form.jDesign, 'jDesign', { optional: true, min: 0, minExclusive: true });
  const rect = issues.number(form.rectifierEfficiency, 'rectifierEfficiency', { optional: true, min: 0, minExclusive: true, max: PERCENT });
  let samples: number | undefined;
  let seed: number | undefined;
  if (form.band) {
    samples = issues.number(form.bandSamples || String(DEFAULT_SAMPLES), 'bandSamples', { min: 2, max: MAX_PAGE_SAMPLES, integer: true });
    seed = issues.number(form.bandSeed || String(DEFAULT_SEED), 'bandSeed', { min: 1, max: 4294967295, integer: true });
  }
  issues.throwIfAny();

  const raw: Record<string, unknown> = {
    chemistry: form.chemistry,
    temperature: T,
    pressure: si(pBar as number, 'pressure', 'bar'),
    composition,
    anode: anode?.electrode,
    cathode: cathode?.electrode,
    ohmic: {
      ...(membrane ? { membrane } : {}),
      ...(gaps.length ? { gaps } : {}),
      ...(hardware !== undefined ? { hardware: si(hardware, 'areaResistance', 'ohm*cm2') } : {}),
    },
    currentDensities: linspace(si(jMin as number, 'currentDensity', 'kA/m2'), si(jMax as number, 'currentDensity', 'kA/m2'), steps as number),
  };
  if (erev !== undefined) raw.reversiblePotential = erev;
  if (ce) raw.currentEfficiency = ce;
  if (jDesign !== undefined) raw.designCurrentDensity = si(jDesign, 'currentDensity', 'kA/m2');
  if (rect !== undefined) raw.rectifierEfficiency = rect / PERCENT;
  if (samples !== undefined && seed !== undefined) raw.uncertainty = { samples, seed };
  const origins = { anode: anode!.origin, cathode: cathode!.origin };
  raw.provenance = {
    anode: provenanceOf(origins.anode, form.anode),
    cathode: provenanceOf(origins.cathode, form.cathode),
  };
  const parsed = cellSectionSchema.safeParse(raw);
  if (!parsed.success) {
    const mapped = zodIssues(parsed.error).map((i) => ({ path: formFieldForPath(i.path, form) ?? i.path, message: i.message }));
    throw InputError.many(`Please check: ${mapped.map((i) => `${fieldLabel(i.path)} ${i.message}`).join('; ')}`, mapped);
  }
  return { section: parsed.data, origins, warnings: [...new Set(warnings)] };
}

function provenanceOf(origin: ElectrodeOrigin, f: ElectrodeForm): KineticsProvenance {
  const p: KineticsProvenance = { kind: origin.kind, note: origin.note.slice(0, 1000) };
  if (origin.kind === 'dataset') p.id = f.dataset;
  if (origin.kind === 'fit') p.id = f.fit;
  return p;
}

// ---------------------------------------------------------------------------------------------
// Filling the form: from a saved section, or starting values

function electrodeFormFromKinetics(e: CellDefinition['anode'], provenance: KineticsProvenance | undefined): ElectrodeForm {
  const k = e.kinetics;
  const u = k.uncertainty;
  const f: ElectrodeForm = {
    ...blankElectrode(),
    source: 'manual',
    model: k.model,
    slopeMode: 'alpha',
    j0: plain(k.exchangeCurrentDensity),
    refTempC: celsiusText(k.referenceTemperature),
    activationEnergy: k.activationEnergy === undefined ? '' : plain(new Decimal(k.activationEnergy).div(J_PER_KJ)),
    limitingCurrent: formValue(e.limitingCurrentDensity, 'currentDensity', 'kA/m2'),
    seLnJ0: u ? plain(u.lnExchangeCurrentDensitySE) : '',
    seAlpha: u ? plain(u.transferCoefficientSE) : '',
    correlation: u ? plain(u.correlation) : '',
    note: provenance?.note ?? '',
  };
  if (k.model === 'tafel') f.alpha = plain(k.transferCoefficient);
  else {
    f.alphaA = plain(k.anodicTransferCoefficient);
    f.alphaC = plain(k.cathodicTransferCoefficient);
  }
  return f;
}

function blankElectrode(): ElectrodeForm {
  return {
    source: 'manual',
    dataset: '',
    windowMin: '',
    windowMax: '',
    fit: '',
    model: 'tafel',
    slopeMode: 'alpha',
    tafelSlope: '',
    alpha: '',
    alphaA: '',
    alphaC: '',
    j0: '',
    refTempC: '',
    seLnJ0: '',
    seAlpha: '',
    correlation: '',
    activationEnergy: '',
    limitingCurrent: '',
    note: '',
  };
}

/** Equal spacing check for a saved list of current densities (relative tolerance, our choice). */
const EVEN_SPACING_RTOL = 1e-9;

/**
 * The form showing a saved cell section. The numbers are taken as saved (electrodes as
 * hand-entered parameters with their origin note), so the page recomputes exactly the saved
 * cell. A current-efficiency model the form cannot edit is carried as saved.
 */
export function formFromSection(section: CellSection): CellForm {
  const js = [...section.currentDensities].sort((a, b) => a - b);
  const lo = js[0];
  const hi = js[js.length - 1];
  const steps = js.length;
  const even = steps < 2 || js.every((j, i) => Math.abs(j - (lo + ((hi - lo) * i) / (steps - 1))) <= EVEN_SPACING_RTOL * hi);
  const m = section.ohmic.membrane;
  const ce = section.currentEfficiency;
  const form: CellForm = {
    chemistry: section.chemistry,
    temperatureC: celsiusText(section.temperature),
    pressureBar: formValue(section.pressure, 'pressure', 'bar'),
    compositionUnit: 'mol/kg',
    brineNaCl: section.composition?.brineNaCl === undefined ? '' : plain(section.composition.brineNaCl),
    causticNaOH: section.composition?.causticNaOH === undefined ? '' : plain(section.composition.causticNaOH),
    koh: section.composition?.koh === undefined ? '' : plain(section.composition.koh),
    reversibleOverride: section.reversiblePotential === undefined ? '' : plain(section.reversiblePotential),
    anode: electrodeFormFromKinetics(section.anode, section.provenance?.anode),
    cathode: electrodeFormFromKinetics(section.cathode, section.provenance?.cathode),
    membraneMode: 'none',
    membraneAsr: '',
    membraneRefTempC: '',
    membraneEa: '',
    membraneThickness: '',
    membraneConductivity: '',
    springerThickness: '',
    springerLambda: '',
    gaps: [],
    hardware: formValue(section.ohmic.hardware, 'areaResistance', 'ohm*cm2'),
    ceModel: 'constant',
    ceValue: '100',
    ceParasitic: '',
    ceSaved: '',
    jMin: formValue(lo, 'currentDensity', 'kA/m2'),
    jMax: formValue(hi, 'currentDensity', 'kA/m2'),
    jSteps: String(even ? steps : Math.min(MAX_SWEEP_STEPS, Math.max(MIN_SWEEP_STEPS, steps))),
    jDesign: formValue(section.designCurrentDensity, 'currentDensity', 'kA/m2'),
    rectifierEfficiency: section.rectifierEfficiency === undefined ? '' : plain(new Decimal(section.rectifierEfficiency).times(PERCENT)),
    band: section.uncertainty !== undefined,
    bandSamples: String(section.uncertainty?.samples ?? DEFAULT_SAMPLES),
    bandSeed: String(section.uncertainty?.seed ?? DEFAULT_SEED),
  };
  if (m) {
    if ('areaResistance' in m) {
      form.membraneMode = 'asr';
      form.membraneAsr = formValue(m.areaResistance, 'areaResistance', 'ohm*cm2');
      form.membraneRefTempC = celsiusText(m.referenceTemperature);
      form.membraneEa = m.activationEnergy === undefined ? '' : plain(new Decimal(m.activationEnergy).div(J_PER_KJ));
    } else if ('springer' in m) {
      form.membraneMode = 'springer';
      form.springerThickness = formValue(m.springer.thickness, 'length', 'um');
      form.springerLambda = plain(m.springer.waterContent);
    } else {
      form.membraneMode = 'conductivity';
      form.membraneThickness = formValue(m.thickness, 'length', 'um');
      form.membraneConductivity = formValue(m.conductivity, 'conductivity', 'mS/cm');
    }
  }
  form.gaps = padGaps(
    (section.ohmic.gaps ?? []).map((g) => ({
      thickness: formValue(g.thickness, 'length', 'mm'),
      mode: g.conductivity !== undefined ? 'conductivity' : 'electrolyte',
      conductivity: formValue(g.conductivity, 'conductivity', 'mS/cm'),
      electrolyte: g.electrolyte ?? 'NaCl',
      concentration: g.concentration === undefined ? '' : plain(g.concentration),
      voidFraction: g.voidFraction === undefined ? '' : plain(g.voidFraction),
      voidModel: g.voidModel ?? 'bruggeman',
    })),
  );
  if (ce?.model === 'constant') form.ceValue = plain(new Decimal(ce.value).times(PERCENT));
  else if (ce?.model === 'parasitic') {
    form.ceModel = 'parasitic';
    form.ceParasitic = plain(ce.currentDensity);
  } else if (ce) {
    form.ceModel = 'saved';
    form.ceSaved = JSON.stringify(ce);
  }
  return form;
}

/**
 * Starting values when a study has no cell yet: the study's operating conditions, the first
 * dataset of each electrode nearest the operating temperature (fitted on the fly), and
 * generic placeholder values for the rest. The placeholders are invented round numbers inside
 * the orientation ranges of domain.md §3–5 (from memory); the page says to replace them.
 */
export function startingForm(study: Study, chemistry: ChemistryId = study.chemistry): CellForm {
  const T = study.chemistry === chemistry ? study.operating.temperature : undefined;
  const base = STARTING_VALUES[chemistry];
  const comp = study.chemistry === chemistry ? study.operating.composition : {};
  const form: CellForm = {
    ...COMMON_START_VALUES,
    ...base,
    anode: { ...blankElectrode(), ...base.anode },
    cathode: { ...blankElectrode(), ...base.cathode },
    gaps: padGaps(base.gaps.map((g) => ({ ...emptyGap(), ...g }))),
  };
  if (T !== undefined) form.temperatureC = celsiusText(T);
  if (study.chemistry === chemistry) form.pressureBar = formValue(study.operating.pressure, 'pressure', 'bar');
  for (const key of ['brineNaCl', 'causticNaOH', 'koh'] as const) {
    const v = comp[key];
    if (v !== undefined) form[key] = plain(v);
  }
  for (const role of ['anode', 'cathode'] as const) {
    const sets = study.datasets.filter((d) => d.electrode === role);
    if (sets.length === 0 || study.chemistry !== chemistry) continue;
    const target = T ?? sets[0].temperature;
    const best = [...sets].sort((a, b) => Math.abs(a.temperature - target) - Math.abs(b.temperature - target))[0];
    form[role].source = 'dataset';
    form[role].dataset = best.id;
  }
  return form;
}

/**
 * Starting form values every chemistry shares: optional fields blank, a constant current
 * efficiency, the default uncertainty band (see startingForm; invented placeholders, from memory).
 */
const COMMON_START_VALUES = {
  reversibleOverride: '',
  membraneRefTempC: '',
  membraneEa: '',
  membraneThickness: '',
  membraneConductivity: '',
  ceModel: 'constant',
  ceParasitic: '',
  ceSaved: '',
  rectifierEfficiency: '97',
  band: true,
  bandSamples: String(DEFAULT_SAMPLES),
  bandSeed: String(DEFAULT_SEED),
} as const satisfies Partial<CellForm>;

/** Starting form values per chemistry, besides COMMON_START_VALUES (invented placeholders, from memory). */
const STARTING_VALUES: Record<ChemistryId, Omit<CellForm, 'anode' | 'cathode' | 'gaps' | keyof typeof COMMON_START_VALUES> & {
  anode: Partial<ElectrodeForm>;
  cathode: Partial<ElectrodeForm>;
  gaps: Array<Partial<GapForm>>;
}> = {
  'chlor-alkali': {
    chemistry: 'chlor-alkali',
    temperatureC: '88',
    pressureBar: '1.2',
    compositionUnit: 'mol/kg',
    brineNaCl: '3.6',
    causticNaOH: '11.8',
    koh: '',
    anode: { model: 'tafel', slopeMode: 'slope', tafelSlope: '36', j0: '60' },
    cathode: { model: 'tafel', slopeMode: 'slope', tafelSlope: '55', j0: '20' },
    membraneMode: 'asr',
    membraneAsr: '0.55',
    springerThickness: '',
    springerLambda: '',
    gaps: [{ thickness: '0.3', mode: 'electrolyte', electrolyte: 'NaCl', voidFraction: '0.35' }],
    hardware: '0.05',
    ceValue: '96',
    jMin: '0.5',
    jMax: '7',
    jSteps: '14',
    jDesign: '5.5',
  },
  'alkaline-water': {
    chemistry: 'alkaline-water',
    temperatureC: '80',
    pressureBar: '1.5',
    compositionUnit: 'wt%',
    brineNaCl: '',
    causticNaOH: '',
    koh: '30',
    anode: { model: 'tafel', slopeMode: 'slope', tafelSlope: '50', j0: '0.01' },
    cathode: { model: 'tafel', slopeMode: 'slope', tafelSlope: '70', j0: '10' },
    membraneMode: 'asr',
    membraneAsr: '0.25',
    springerThickness: '',
    springerLambda: '',
    gaps: [{ thickness: '1', mode: 'electrolyte', electrolyte: 'KOH', voidFraction: '0.2' }],
    hardware: '0.05',
    ceValue: '99',
    jMin: '0.5',
    jMax: '8',
    jSteps: '16',
    jDesign: '4',
  },
  'pem-water': {
    chemistry: 'pem-water',
    temperatureC: '60',
    pressureBar: '1',
    compositionUnit: 'mol/kg',
    brineNaCl: '',
    causticNaOH: '',
    koh: '',
    anode: { model: 'tafel', slopeMode: 'slope', tafelSlope: '45', j0: '0.001' },
    cathode: { model: 'tafel', slopeMode: 'slope', tafelSlope: '60', j0: '10' },
    membraneMode: 'springer',
    membraneAsr: '',
    springerThickness: '127',
    springerLambda: '22',
    gaps: [],
    hardware: '0.1',
    ceValue: '99',
    jMin: '1',
    jMax: '30',
    jSteps: '15',
    jDesign: '20',
  },
};

/**
 * After a computation, copy the kinetics actually used by an electrode whose source is a
 * dataset or a saved fit into its "by hand" fields (with the origin as note), so that switching
 * to "By hand" starts from the fitted numbers. Ea and the limiting current are left as typed.
 */
export function syncManualFields(form: CellForm, section: CellSection): CellForm {
  const out = { ...form, anode: { ...form.anode }, cathode: { ...form.cathode } };
  for (const role of ['anode', 'cathode'] as const) {
    if (out[role].source === 'manual') continue;
    const filled = electrodeFormFromKinetics(section[role], section.provenance?.[role]);
    const f = out[role];
    out[role] = {
      ...f,
      model: filled.model,
      slopeMode: 'alpha',
      alpha: filled.alpha,
      alphaA: filled.alphaA,
      alphaC: filled.alphaC,
      j0: filled.j0,
      refTempC: filled.refTempC,
      seLnJ0: filled.seLnJ0,
      seAlpha: filled.seAlpha,
      correlation: filled.correlation,
      note: filled.note,
    };
  }
  return out;
}

/**
 * Preselect, in each electrode's dataset list, the dataset nearest the form's cell temperature
 * when none is chosen yet (only the selection; the kinetics source is not changed).
 */
export function preselectDatasets(form: CellForm, study: Study): CellForm {
  const tC = Number(form.temperatureC);
  const out = { ...form, anode: { ...form.anode }, cathode: { ...form.cathode } };
  for (const role of ['anode', 'cathode'] as const) {
    if (out[role].dataset && study.datasets.some((d) => d.id === out[role].dataset)) continue;
    const sets = study.datasets.filter((d) => d.electrode === role);
    if (sets.length === 0) continue;
    const target = Number.isFinite(tC) && form.temperatureC.trim() !== '' ? kelvin(tC) : sets[0].temperature;
    out[role].dataset = [...sets].sort((a, b) => Math.abs(a.temperature - target) - Math.abs(b.temperature - target))[0].id;
  }
  return out;
}

/** Mass fraction [wt %] of a molality, for hints next to mol/kg fields (exact relation, core thermo). */
export function weightPercentOf(salt: 'NaCl' | 'NaOH' | 'KOH', molality: number): number {
  return molalityToMassFraction(salt, molality) * PERCENT;
}
