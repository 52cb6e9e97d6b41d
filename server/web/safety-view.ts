/**
 * Safety page (`GET /safety`, `POST /safety` to recompute or save): the computed hazard checks
 * for the open study and the caution texts with their published sources, and the small caution
 * panel other pages include (views/partials/safety-panel.ejs).
 *
 * Inputs come from the study where it has them (operating temperature and pressure; the plant
 * section's sizing for the operating current density and the electrolyser current; the cell
 * definition's limiting currents and hydrogen-crossover model) and from a short form for the
 * rest (H₂ in the anode gas at the operating point, the minimum load, the busbar distance).
 * The checks themselves are the safety core's (server/core/safety).
 */
import { Router, type Request, type Response } from 'express';
import { InputError, type IssueDetail } from '../core/errors.js';
import { UNIT_TABLES, celsiusToKelvin, fromSI, kelvinToCelsius, toSI } from '../core/units.js';
import { PRODUCT_SPECS, type PlantChemistry } from '../core/plant/index.js';
import { sweepCell } from '../core/cell/index.js';
import type { CellDefinition } from '../core/cell/types.js';
import {
  CAUTIONS,
  SAFETY_DISCLAIMER,
  assessSafety,
  gasProductionRate,
  type SafetyAssessment,
  type SafetyAssessmentInput,
  type SafetyCheck,
} from '../core/safety/index.js';
import { crossoverFluxFromHydrogenFraction } from '../core/safety/crossover.js';
import type { Study } from '../scenario/schema.js';
import type { StudyStore } from '../scenario/store.js';
import { plantSafetySchema, type PlantSection } from '../scenario/plant-sections.js';
import { cellSourceSchema, isLinearSource, plantChemistryOf } from './cell-source.js';
import { describeError } from './errors.js';
import { fmt } from './format.js';
import { pageContext } from './page.js';
import { computePlant, fieldText } from './plant-view.js';

const KA_M2 = UNIT_TABLES.currentDensity['kA/m2'];
const KA = UNIT_TABLES.current.kA;
const BAR = UNIT_TABLES.pressure.bar;
/** Percent per unit fraction (exact). */
const PERCENT = 100;
/** 1 mT = 1e-3 T (exact). */
const MILLITESLA = 1e-3;

/**
 * Starting minimum load when the study has none, fraction of the operating current (our
 * choice): 15 % for water electrolysers, the low end of the alkaline load range in the IRENA
 * (2020) KPI table (check-values §9b, source seen); 30 % for chlor-alkali (our choice, no
 * published figure at hand).
 */
const DEFAULT_MINIMUM_LOAD: Record<PlantChemistry, number> = { water: 0.15, 'chlor-alkali': 0.3 };
/** Starting nearest working distance from the main busbar, m (our choice: 1 m, an aisle beside a busbar run). */
const DEFAULT_BUSBAR_DISTANCE = 1;
/** Significant digits of values the form takes from a computation (operating point, busbar current). */
const DERIVED_DIGITS = 4;

// ---------------------------------------------------------------------------------------------
// The caution panel other pages include

export interface SafetyPanel {
  titles: string[];
  disclaimer: string;
  href: string;
}

/** Data for views/partials/safety-panel.ejs: the caution topics of the chemistry, the disclaimer, a link to the Safety page. */
export function safetyPanelFor(chemistry: Study['chemistry'], href: string): SafetyPanel {
  const chlor = chemistry === 'chlor-alkali';
  const titles = CAUTIONS.filter((c) => chlor || (c.topic !== 'chlorine' && c.topic !== 'hydrogen-chlorine')).map((c) => c.title);
  return { titles, disclaimer: SAFETY_DISCLAIMER, href };
}

// ---------------------------------------------------------------------------------------------
// Form

export interface SafetyForm {
  /** kA/m². */
  operatingCurrentDensity: string;
  hydrogenSource: 'given' | 'cell-model';
  /** vol % at the operating point. */
  hydrogenInAnodeGas: string;
  /** % of the operating current. */
  minimumLoad: string;
  /** °C. */
  temperature: string;
  /** bar(a). */
  pressure: string;
  /** K. */
  boilingPointElevation: string;
  /** kA/m². */
  limitingCurrentDensity: string;
  /** kA. */
  busbarCurrent: string;
  /** m. */
  busbarDistance: string;
}

/** What the study offers the safety checks. */
export interface StudyFacts {
  chemistry: PlantChemistry;
  /** Operating current density from the plant sizing (else the cell's design point), A/m². */
  operatingCurrentDensity?: number;
  operatingSource?: string;
  /** Current through one electrolyser, A. */
  electrolyserCurrent?: number;
  /** Smallest limiting current density of the cell definition, A/m². */
  limitingCurrentDensity?: number;
  /** The cell definition, when it models hydrogen crossover (water electrolysis). */
  crossoverCell?: CellDefinition;
  /** Why the plant section could not be used, if so. */
  plantNote?: string;
}

/** Gather what the study says about the operating point, the cell and the busbar current. */
export function studyFacts(study: Study): StudyFacts {
  const facts: StudyFacts = { chemistry: plantChemistryOf(study.chemistry) };
  let definition: CellDefinition | undefined;
  if (study.cell !== undefined) {
    const parsed = cellSourceSchema.safeParse(study.cell);
    if (parsed.success && !isLinearSource(parsed.data)) definition = parsed.data;
  }
  if (study.plant) {
    try {
      const c = computePlant(study.plant as PlantSection, study);
      facts.operatingCurrentDensity = c.sizing.operating.currentDensity;
      facts.operatingSource = 'the plant sizing (Plant page)';
      facts.electrolyserCurrent = c.sizing.electrolysers.current;
    } catch (err) {
      facts.plantNote = `The plant section could not be sized (${describeError(err).body.error.message}).`;
    }
  }
  if (definition) {
    if (facts.operatingCurrentDensity === undefined && definition.designCurrentDensity !== undefined) {
      facts.operatingCurrentDensity = definition.designCurrentDensity;
      facts.operatingSource = "the cell definition's design point (Cell page)";
    }
    const limits = [definition.anode.limitingCurrentDensity, definition.cathode.limitingCurrentDensity].filter((v): v is number => v !== undefined);
    if (limits.length) facts.limitingCurrentDensity = Math.min(...limits);
    if (definition.currentEfficiency?.model === 'crossover') facts.crossoverCell = definition;
  }
  return facts;
}

/** The form as the study fills it. */
export function initialSafetyForm(study: Study, facts: StudyFacts): SafetyForm {
  const saved = (study.plant as PlantSection | undefined)?.safety;
  const limiting = saved?.limitingCurrentDensity ?? facts.limitingCurrentDensity;
  const hydrogenSource = saved?.hydrogenInAnodeGas === undefined && facts.crossoverCell ? 'cell-model' : 'given';
  return {
    operatingCurrentDensity: fieldText(facts.operatingCurrentDensity, KA_M2, DERIVED_DIGITS),
    hydrogenSource,
    hydrogenInAnodeGas: saved?.hydrogenInAnodeGas !== undefined ? fieldText(saved.hydrogenInAnodeGas * PERCENT) : '',
    minimumLoad: fieldText((saved?.minimumLoad ?? DEFAULT_MINIMUM_LOAD[facts.chemistry]) * PERCENT),
    temperature: fieldText(kelvinToCelsius(study.operating.temperature)),
    pressure: fieldText(study.operating.pressure, BAR),
    boilingPointElevation: saved?.boilingPointElevation !== undefined ? fieldText(saved.boilingPointElevation) : '0',
    limitingCurrentDensity: fieldText(limiting, KA_M2),
    busbarCurrent: fieldText(facts.electrolyserCurrent, KA, DERIVED_DIGITS),
    busbarDistance: fieldText(saved?.busbarDistance ?? DEFAULT_BUSBAR_DISTANCE),
  };
}

function text(v: unknown): string {
  return typeof v === 'string' ? v.trim().slice(0, 40) : '';
}

export function readSafetyForm(body: Record<string, unknown> | undefined): SafetyForm {
  const b = body ?? {};
  return {
    operatingCurrentDensity: text(b.operatingCurrentDensity),
    hydrogenSource: b.hydrogenSource === 'cell-model' ? 'cell-model' : 'given',
    hydrogenInAnodeGas: text(b.hydrogenInAnodeGas),
    minimumLoad: text(b.minimumLoad),
    temperature: text(b.temperature),
    pressure: text(b.pressure),
    boilingPointElevation: text(b.boilingPointElevation),
    limitingCurrentDensity: text(b.limitingCurrentDensity),
    busbarCurrent: text(b.busbarCurrent),
    busbarDistance: text(b.busbarDistance),
  };
}

class Issues {
  readonly list: IssueDetail[] = [];
  num(path: string, raw: string, label: string, opts: { required?: boolean; min?: number; minExclusive?: boolean; max?: number; maxExclusive?: boolean; unit?: string } = {}): number | undefined {
    const unit = opts.unit ? ` ${opts.unit}` : '';
    if (raw === '') {
      if (opts.required) this.list.push({ path, message: `${label}: enter a number${unit ? ` in${unit}` : ''}` });
      return undefined;
    }
    const clean = raw.replace('−', '-');
    if (raw.includes(',') || !/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(clean) || !Number.isFinite(Number(clean))) {
      this.list.push({ path, message: `${label}: "${raw}" is not a number (use a decimal point)` });
      return undefined;
    }
    const v = Number(clean);
    if (opts.min !== undefined && (opts.minExclusive ? v <= opts.min : v < opts.min)) {
      this.list.push({ path, message: `${label}: must be ${opts.minExclusive ? '>' : '≥'} ${opts.min}${unit}` });
      return undefined;
    }
    if (opts.max !== undefined && (opts.maxExclusive ? v >= opts.max : v > opts.max)) {
      this.list.push({ path, message: `${label}: must be ${opts.maxExclusive ? '<' : '≤'} ${opts.max}${unit}` });
      return undefined;
    }
    return v;
  }
}

/** The checked inputs in SI, with notes on what was skipped and why. */
export interface SafetyInputs {
  assessment: SafetyAssessmentInput;
  /** H₂ in the anode gas at the operating point used, mol/mol (and where it came from). */
  hydrogen?: { fraction: number; source: string };
  /** Operating and minimum-load current densities, A/m². */
  operatingCurrentDensity?: number;
  minimumCurrentDensity?: number;
  skipped: string[];
  /** Safety sub-section to save into the plant section. */
  toSave: PlantSection['safety'];
}

/**
 * H₂ fraction of the anode gas predicted by the study's cell model at j [A/m²] (the cell
 * core's crossover model reports it as vol %); InputError when the model gives none.
 */
function hydrogenFromCellModel(def: CellDefinition, currentDensity: number): number {
  const result = sweepCell({ ...def, currentDensities: [currentDensity], designCurrentDensity: undefined });
  const percent = result.points[0]?.currentEfficiency.hydrogenInOxygenPercent;
  if (percent === undefined || !Number.isFinite(percent)) {
    throw new InputError('hydrogenSource', 'the cell model gives no hydrogen-in-oxygen figure; enter the H₂ content instead');
  }
  return percent / PERCENT;
}

/**
 * Convert the form to the safety core's input (SI). The anode-gas check needs a crossover flux:
 * from the H₂ fraction x at the operating point (safety core crossoverFluxFromHydrogenFraction,
 * with the anode-gas production g by Faraday's law, core gasProductionRate). With the flux taken
 * constant, x rises as load falls (the core's anodeGasPurity). Current efficiency cancels
 * between the two steps, so g is taken at CE = 1.
 */
export function safetyInputs(form: SafetyForm, facts: StudyFacts): SafetyInputs {
  const is = new Issues();
  const j = is.num('operatingCurrentDensity', form.operatingCurrentDensity, 'Operating current density', { min: 0, minExclusive: true, unit: 'kA/m²' });
  const xPercent = form.hydrogenSource === 'given' ? is.num('hydrogenInAnodeGas', form.hydrogenInAnodeGas, 'H₂ in the anode gas', { min: 0, max: 100, maxExclusive: true, unit: 'vol %' }) : undefined;
  const minLoad = is.num('minimumLoad', form.minimumLoad, 'Minimum load', { required: true, min: 0, minExclusive: true, max: 100, unit: '%' });
  const tC = is.num('temperature', form.temperature, 'Electrolyte temperature', { required: true, min: -50, max: 400, unit: '°C' });
  const pBar = is.num('pressure', form.pressure, 'Pressure', { required: true, min: 0, minExclusive: true, unit: 'bar(a)' });
  const bpe = is.num('boilingPointElevation', form.boilingPointElevation, 'Boiling-point elevation', { min: 0, max: 100, unit: 'K' });
  const jLim = is.num('limitingCurrentDensity', form.limitingCurrentDensity, 'Limiting current density', { min: 0, minExclusive: true, unit: 'kA/m²' });
  const iBus = is.num('busbarCurrent', form.busbarCurrent, 'Busbar current', { min: 0, minExclusive: true, unit: 'kA' });
  const dBus = is.num('busbarDistance', form.busbarDistance, 'Distance from the busbar', { min: 0, minExclusive: true, unit: 'm' });
  if (form.hydrogenSource === 'cell-model' && !facts.crossoverCell) {
    is.list.push({ path: 'hydrogenSource', message: "H₂ source: the study's cell model has no hydrogen-crossover model; enter the H₂ content instead" });
  }
  if (is.list.length) throw InputError.many(`Please correct: ${is.list.map((i) => i.message).join('; ')}`, is.list);

  const assessment: SafetyAssessmentInput = { chemistry: facts.chemistry };
  const skipped: string[] = [];
  const temperature = celsiusToKelvin(tC as number);
  const pressure = toSI(pBar as number, 'pressure', 'bar');
  assessment.boiling = { temperature, pressure, ...(bpe !== undefined ? { boilingPointElevation: bpe } : {}) };
  const jSI = j !== undefined ? toSI(j, 'currentDensity', 'kA/m2') : undefined;
  const out: SafetyInputs = { assessment, skipped, toSave: {} };

  let hydrogen: SafetyInputs['hydrogen'];
  if (jSI === undefined) {
    skipped.push('Anode-gas hydrogen and limiting current: enter the operating current density (or size the plant on the Plant page).');
  } else {
    if (form.hydrogenSource === 'cell-model' && facts.crossoverCell) {
      hydrogen = { fraction: hydrogenFromCellModel(facts.crossoverCell, jSI), source: "the study's cell model (hydrogen crossover)" };
    } else if (xPercent !== undefined) {
      hydrogen = { fraction: xPercent / PERCENT, source: 'the figure entered' };
    } else {
      skipped.push('Anode-gas hydrogen: enter the H₂ content of the anode gas at the operating point (analyser reading or crossover estimate).');
    }
    if (hydrogen) {
      const anodeGas = facts.chemistry === 'water' ? PRODUCT_SPECS.O2 : PRODUCT_SPECS.Cl2;
      const production = gasProductionRate(jSI, anodeGas.electronsPerMolecule, 1);
      const flux = crossoverFluxFromHydrogenFraction(hydrogen.fraction, production);
      out.minimumCurrentDensity = jSI * ((minLoad as number) / PERCENT);
      assessment.anodeGas = {
        crossoverFlux: flux,
        operatingCurrentDensity: jSI,
        minimumCurrentDensity: out.minimumCurrentDensity,
        currentEfficiency: 1,
        temperature,
        pressure,
      };
    }
    if (jLim !== undefined) {
      assessment.limitingCurrent = { currentDensity: jSI, limitingCurrentDensity: toSI(jLim, 'currentDensity', 'kA/m2') };
    } else {
      skipped.push('Limiting current: no limiting current density in the cell definition or the form.');
    }
    out.operatingCurrentDensity = jSI;
  }
  if (iBus !== undefined && dBus !== undefined) {
    assessment.busbar = { current: toSI(iBus, 'current', 'kA'), distance: dBus };
  } else {
    skipped.push('Magnetic field: enter the busbar current and the distance from it.');
  }
  out.hydrogen = hydrogen;
  out.toSave = plantSafetySchema.parse({
    ...(form.hydrogenSource === 'given' && xPercent !== undefined ? { hydrogenInAnodeGas: xPercent / PERCENT } : {}),
    minimumLoad: (minLoad as number) / PERCENT,
    ...(jLim !== undefined ? { limitingCurrentDensity: toSI(jLim, 'currentDensity', 'kA/m2') } : {}),
    ...(bpe !== undefined ? { boilingPointElevation: bpe } : {}),
    ...(dBus !== undefined ? { busbarDistance: dBus } : {}),
  });
  return out;
}

/** Core input paths → form fields. */
const CORE_TO_FORM: Record<string, string> = {
  hydrogenFraction: 'hydrogenInAnodeGas',
  minimumCurrentDensity: 'minimumLoad',
  operatingCurrentDensity: 'operatingCurrentDensity',
  currentDensity: 'operatingCurrentDensity',
  limitingCurrentDensity: 'limitingCurrentDensity',
  temperature: 'temperature',
  pressure: 'pressure',
  boilingPointElevation: 'boilingPointElevation',
  current: 'busbarCurrent',
  distance: 'busbarDistance',
};

// ---------------------------------------------------------------------------------------------
// View

export interface CheckView {
  id: string;
  title: string;
  level: SafetyCheck['level'];
  levelLabel: string;
  message: string;
  value: string;
  caution: string;
  limit: string;
  unit: string;
  source: string;
}

const LEVEL_LABELS: Record<SafetyCheck['level'], string> = { ok: 'OK', caution: 'Caution', alarm: 'Alarm' };

/** A check's numbers in the unit people read (vol %, °C, kA/m², mT). */
function checkView(c: SafetyCheck): CheckView {
  let conv = (v: number) => fmt(v, 4);
  let unit = c.unit;
  if (c.unit === 'mol/mol') {
    conv = (v) => fmt(v * PERCENT, 3);
    unit = 'vol %';
  } else if (c.unit === 'K') {
    conv = (v) => fmt(kelvinToCelsius(v), 4);
    unit = '°C';
  } else if (c.unit === 'A/m²') {
    conv = (v) => fmt(fromSI(v, 'currentDensity', 'kA/m2'), 4);
    unit = 'kA/m²';
  } else if (c.unit === 'T') {
    conv = (v) => fmt(v / MILLITESLA, 3);
    unit = 'mT';
  }
  return { id: c.id, title: c.title, level: c.level, levelLabel: LEVEL_LABELS[c.level], message: c.message, value: conv(c.value), caution: conv(c.cautionLimit), limit: conv(c.limit), unit, source: c.source };
}

export interface SafetyView {
  checks: CheckView[];
  worst: SafetyCheck['level'];
  worstLabel: string;
  lowestBeforeTrip: { kAm2: string; percentOfOperating: string } | null;
  hydrogenSource: string | null;
  skipped: string[];
  cautions: SafetyAssessment['cautions'];
  disclaimer: string;
}

export function safetyView(inputs: SafetyInputs, a: SafetyAssessment): SafetyView {
  let lowest: SafetyView['lowestBeforeTrip'] = null;
  if (a.lowestCurrentDensityBelowTrip !== null && inputs.operatingCurrentDensity !== undefined) {
    lowest = {
      kAm2: fmt(fromSI(a.lowestCurrentDensityBelowTrip, 'currentDensity', 'kA/m2'), 3),
      percentOfOperating: fmt((a.lowestCurrentDensityBelowTrip / inputs.operatingCurrentDensity) * PERCENT, 3),
    };
  }
  return {
    checks: a.checks.map(checkView),
    worst: a.worst,
    worstLabel: LEVEL_LABELS[a.worst],
    lowestBeforeTrip: lowest,
    hydrogenSource: inputs.hydrogen?.source ?? null,
    skipped: inputs.skipped,
    cautions: a.cautions,
    disclaimer: a.disclaimer,
  };
}

// ---------------------------------------------------------------------------------------------
// Routes

interface SafetyState {
  form: SafetyForm;
  view: SafetyView | null;
  error: { message: string; issues: IssueDetail[] } | null;
  notice: string | null;
}

function compute(form: SafetyForm, facts: StudyFacts): { inputs: SafetyInputs; view: SafetyView } {
  const inputs = safetyInputs(form, facts);
  let assessment: SafetyAssessment;
  try {
    assessment = assessSafety(inputs.assessment);
  } catch (err) {
    if (err instanceof InputError) {
      const issues = err.issues.map((i) => ({ path: CORE_TO_FORM[i.path] ?? i.path, message: i.message }));
      throw InputError.many(err.message, issues);
    }
    throw err;
  }
  return { inputs, view: safetyView(inputs, assessment) };
}

/** Router of the Safety page. */
export function safetyRouter(store: StudyStore): Router {
  const r = Router();

  const render = (req: Request, res: Response, state: SafetyState, facts: StudyFacts, status = 200) => {
    const ctx = pageContext(req, store, 'Safety', '/safety');
    const fallbackCautions = CAUTIONS.filter((c) => facts.chemistry === 'chlor-alkali' || (c.topic !== 'chlorine' && c.topic !== 'hydrogen-chlorine'));
    res.status(status).render('safety', {
      ...ctx,
      form: state.form,
      view: state.view,
      error: state.error,
      notice: state.notice,
      facts,
      anodeGasName: facts.chemistry === 'water' ? 'oxygen' : 'chlorine',
      invalid: new Set((state.error?.issues ?? []).map((i) => i.path)),
      cautions: state.view?.cautions ?? fallbackCautions,
      disclaimer: SAFETY_DISCLAIMER,
      canSave: ctx.study.plant !== undefined,
    });
  };

  r.get('/safety', (req, res) => {
    const ctx = pageContext(req, store, 'Safety', '/safety');
    const facts = studyFacts(ctx.study);
    const form = initialSafetyForm(ctx.study, facts);
    const notice = req.query.saved === '1' ? 'Safety inputs saved to the study’s plant section.' : null;
    try {
      const { view } = compute(form, facts);
      render(req, res, { form, view, error: null, notice }, facts);
    } catch (err) {
      const { status, body } = describeError(err);
      if (status >= 500) throw err;
      render(req, res, { form, view: null, error: body.error, notice }, facts, status);
    }
  });

  r.post('/safety', (req, res) => {
    const ctx = pageContext(req, store, 'Safety', '/safety');
    const facts = studyFacts(ctx.study);
    const form = readSafetyForm(req.body as Record<string, unknown>);
    let result: ReturnType<typeof compute>;
    try {
      result = compute(form, facts);
    } catch (err) {
      const { status, body } = describeError(err);
      if (status >= 500) throw err;
      render(req, res, { form, view: null, error: body.error, notice: null }, facts, status);
      return;
    }
    if (req.body?.action === 'save') {
      const plant = ctx.study.plant as PlantSection | undefined;
      if (!plant) {
        const message = 'There is no plant section to save into: size the plant on the Plant page and save it first.';
        render(req, res, { form, view: result.view, error: { message, issues: [{ path: 'action', message }] }, notice: null }, facts, 400);
        return;
      }
      const id = store.save({ ...ctx.study, plant: { ...plant, safety: result.inputs.toSave } }, ctx.isExample ? undefined : ctx.studyId);
      res.redirect(303, `/safety?study=${encodeURIComponent(id)}&saved=1`);
      return;
    }
    render(req, res, { form, view: result.view, error: null, notice: null }, facts);
  });

  return r;
}
