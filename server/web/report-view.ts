/**
 * The Report page's view-model: one printable summary of the open study for a design review.
 *
 * No physics and no new computation here. Every number comes from the functions the other
 * pages call on the same stored sections — the Cell page's evaluateCell/cellView, the Plant
 * page's computePlant/plantView, the Coatings and Costs pages' runCoatingComparison/
 * coatingsView and runCostStudy/costsView, the Safety page's studyFacts/safetyInputs/
 * safetyView (with the safety core's assessSafety) — so the report shows exactly what those
 * pages show for the study. This file picks, arranges and labels.
 *
 * Each section runs on its own: an input or physics problem in one stored section becomes that
 * section's error message (and a line under "Assumptions and sources"), never a failed page.
 */
import { describeError } from './errors.js';
import type { IssueDetail } from '../core/errors.js';
import { assessSafety, SAFETY_DISCLAIMER } from '../core/safety/index.js';
import { kelvinToCelsius } from '../core/units.js';
import { tafelSlopePerDecade } from '../core/kinetics/models.js';
import type { CellSection } from '../scenario/cell-section.js';
import type { PlantSection } from '../scenario/plant-sections.js';
import type { Dataset, SavedFit, Study } from '../scenario/schema.js';
import { CHEMISTRY_LABELS, type ElectrodeOrigin, type ElectrodeRole } from './cell-form.js';
import { cellView, evaluateCell, type BreakdownRow, type Row } from './cell-view.js';
import { coatingsView, costsView, runCoatingComparison, runCostStudy, type CoatingsView, type CostsView } from './economics-view.js';
import { celsius, fmt, inUnit } from './format.js';
import { studyReferenceLabel } from './kinetics-view.js';
import { computePlant, plantView, type TableRow } from './plant-view.js';
import { initialSafetyForm, safetyInputs, safetyView, studyFacts, type CheckView } from './safety-view.js';

// ---------------------------------------------------------------------------------------------
// Section outcomes

/** What one report section ended as: computed, or the error its stored inputs gave. */
export type SectionOutcome<T> = { state: 'shown'; view: T } | { state: 'failed'; error: { message: string; issues: IssueDetail[] } };

/**
 * Run one section's computation. Input, physics and convergence problems (any error the app
 * answers with a 4xx) become the section's error; anything else is a program fault and is
 * re-thrown to the app's error handler, as on the other pages.
 */
export function runSection<T>(compute: () => T): SectionOutcome<T> {
  try {
    return { state: 'shown', view: compute() };
  } catch (err) {
    const { status, body } = describeError(err);
    if (status >= 500) throw err;
    return { state: 'failed', error: body.error };
  }
}

/** A numbered section of the report with the page it summarises. */
export interface SectionHead {
  id: string;
  number: number;
  title: string;
  /** Link to the page of the app that shows (and edits) this part of the study. */
  href: string;
  pageLabel: string;
}

// ---------------------------------------------------------------------------------------------
// 1. Study

export interface StudyReport {
  name: string;
  paragraphs: string[];
  synthetic: boolean;
  chemistry: string;
  operating: Array<{ label: string; value: string; unit: string }>;
  generatedAt: string;
  version: string;
}

const COMPOSITION_LABELS: Record<string, string> = {
  brineNaCl: 'NaCl in the brine (anolyte)',
  causticNaOH: 'NaOH in the catholyte',
  koh: 'KOH in the electrolyte',
};

/** "2025-03-14 09:26 UTC": minutes are enough to tell two printouts apart. */
export function reportTimestamp(d: Date): string {
  return `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

function studyReport(study: Study, generatedAt: Date, version: string): StudyReport {
  const operating: StudyReport['operating'] = [
    { label: 'Temperature', value: celsius(study.operating.temperature), unit: '°C' },
    { label: 'Pressure', value: inUnit(study.operating.pressure, 'pressure', 'bar'), unit: 'bar(a)' },
  ];
  for (const [key, value] of Object.entries(study.operating.composition)) {
    if (value === undefined) continue;
    operating.push({ label: COMPOSITION_LABELS[key] ?? key, value: fmt(value, 4), unit: 'mol/kg' });
  }
  return {
    name: study.name,
    paragraphs: study.description.split(/\n\s*\n+/).map((p) => p.trim()).filter((p) => p.length > 0),
    synthetic: study.synthetic,
    chemistry: CHEMISTRY_LABELS[study.chemistry] ?? study.chemistry,
    operating,
    generatedAt: reportTimestamp(generatedAt),
    version,
  };
}

// ---------------------------------------------------------------------------------------------
// 2. Kinetics (saved fits and datasets, as stored)

export interface FitRow {
  name: string;
  electrode: string;
  model: string;
  j0: string;
  j0ci: string;
  slope: string;
  alpha: string;
  temperatureC: string;
}

export interface DatasetRow {
  name: string;
  electrode: string;
  coating: string;
  temperatureC: string;
  points: string;
  potentials: string;
}

export interface KineticsReport {
  fits: FitRow[];
  datasets: DatasetRow[];
}

/** mV per V (exact). */
const MV_PER_V = 1000;

function fitRow(f: SavedFit): FitRow {
  const p = f.parameters;
  const branch = f.electrode === 'anode' ? 'anodic' : 'cathodic';
  const alphaParam = f.model === 'tafel' ? p.transferCoefficient : p[`${branch}TransferCoefficient`];
  const slopeParam = f.model === 'tafel' ? p.tafelSlope : p[`${branch}TafelSlope`];
  const j0 = p.exchangeCurrentDensity;
  let slope = '—';
  if (slopeParam) slope = fmt(Math.abs(slopeParam.value) * MV_PER_V, 4);
  else if (alphaParam && alphaParam.value > 0) slope = `${fmt(tafelSlopePerDecade(alphaParam.value, f.temperature) * MV_PER_V, 4)} (from α)`;
  return {
    name: f.name,
    electrode: f.electrode,
    model: f.model === 'tafel' ? 'Tafel' : 'Butler–Volmer',
    j0: j0 ? fmt(j0.value, 4) : '—',
    j0ci: j0?.ci95 ? `${fmt(j0.ci95[0], 4)} … ${fmt(j0.ci95[1], 4)}` : 'not stored',
    slope,
    alpha: alphaParam ? fmt(alphaParam.value, 4) : '—',
    temperatureC: fmt(kelvinToCelsius(f.temperature), 4),
  };
}

function datasetRow(d: Dataset): DatasetRow {
  return {
    name: d.name,
    electrode: d.electrode,
    coating: d.coating,
    temperatureC: fmt(kelvinToCelsius(d.temperature), 4),
    points: String(d.points.length),
    potentials: d.potentialKind === 'electrode' ? `E vs ${studyReferenceLabel(d.reference)}` : 'η',
  };
}

// ---------------------------------------------------------------------------------------------
// 3. Cell

export interface CellReport {
  /** kA/m² text of the design point, or null when the cell has none. */
  designCurrentDensity: string | null;
  breakdown: BreakdownRow[] | null;
  design: Row[] | null;
  kFactor: Row[] | null;
  reference: Row[];
  kinetics: Array<{ electrode: string; model: string; slope: string; j0Cell: string; origin: string }>;
  chart: object;
  bandMethod?: string;
  bandNote?: string;
  warnings: string[];
}

function cellReport(section: CellSection): CellReport {
  // Exactly the Cell page's path for a stored section (server/web/cell.ts).
  const ev = evaluateCell(section, { strictBand: false });
  const origins: Partial<Record<ElectrodeRole, ElectrodeOrigin>> = {};
  for (const role of ['anode', 'cathode'] as const) {
    const p = section.provenance?.[role];
    if (p) origins[role] = { kind: p.kind, note: p.note };
  }
  const v = cellView(section, ev, origins, []);
  const out: CellReport = {
    designCurrentDensity: v.design?.currentDensity ?? null,
    breakdown: v.design?.breakdown ?? null,
    design: v.design?.rows ?? null,
    kFactor: v.kFactor,
    // E_rev and U_tn: the summary rows that do not repeat the design table or the K-factor.
    reference: v.summary.filter((r) => /E_rev|U_tn/.test(r.label)),
    kinetics: v.kinetics.map((k) => ({ electrode: k.electrode, model: k.model, slope: k.slope, j0Cell: k.j0Cell, origin: k.origin })),
    chart: v.charts.voltage,
    warnings: v.warnings,
  };
  if (v.bandMethod) out.bandMethod = v.bandMethod;
  if (v.bandNote) out.bandNote = v.bandNote;
  return out;
}

// ---------------------------------------------------------------------------------------------
// 4. Plant

export interface PlantReport {
  cellSource: string;
  designBasis: string;
  sections: Array<{ title: string; rows: TableRow[] }>;
  shunt: TableRow[] | null;
  shuntNote: string | null;
  shuntError: string | null;
  warnings: string[];
}

/**
 * Sizing-table groups the report keeps (the Plant page's own group titles); the rectifier
 * loading and the operating-point details stay on the Plant page. When none matches (the
 * page renamed its groups), every row is shown rather than none.
 */
const KEY_PLANT_GROUPS = ['Target and design point', 'Cell room as built', 'Power and heat'];

function plantReport(section: PlantSection, study: Study): PlantReport {
  const v = plantView(computePlant(section, study));
  let groups = v.sections.filter((s) => KEY_PLANT_GROUPS.includes(s));
  if (groups.length === 0) groups = v.sections;
  return {
    cellSource: v.cellSource,
    designBasis: v.designBasis,
    sections: groups.map((title) => ({ title, rows: v.rows.filter((r) => r.section === title) })),
    shunt: v.shunt ? v.shunt.summary : null,
    shuntNote: v.shuntNote,
    shuntError: v.shuntError ? v.shuntError.message : null,
    warnings: [...v.warnings, ...(v.shunt?.warnings ?? [])],
  };
}

// ---------------------------------------------------------------------------------------------
// 7. Safety

export interface SafetyChecksReport {
  checks: CheckView[];
  worst: CheckView['level'];
  worstLabel: string;
  lowestBeforeTrip: { kAm2: string; percentOfOperating: string } | null;
  hydrogenSource: string | null;
  operatingSource: string | null;
  skipped: string[];
}

export interface CautionReport {
  title: string;
  headline: string;
  figures: Array<{ label: string; value: string; source: string; confidence: string }>;
}

export interface SafetyReport {
  checks: SectionOutcome<SafetyChecksReport>;
  /** Why the plant section could not feed the checks (the Safety page shows the same note). */
  plantNote: string | null;
  cautions: CautionReport[];
  disclaimer: string;
}

/** First sentence of a caution text: the headline; the Safety page has the whole text. */
function firstSentence(text: string): string {
  const m = /^(.+?[.!?])(\s|$)/.exec(text);
  return m ? m[1] : text;
}

function safetyReport(study: Study): SafetyReport {
  const facts = studyFacts(study);
  const checks = runSection((): SafetyChecksReport => {
    // The Safety page's GET path: the form as the study fills it, checked, then assessed.
    const inputs = safetyInputs(initialSafetyForm(study, facts), facts);
    const v = safetyView(inputs, assessSafety(inputs.assessment));
    return {
      checks: v.checks,
      worst: v.worst,
      worstLabel: v.worstLabel,
      lowestBeforeTrip: v.lowestBeforeTrip,
      hydrogenSource: v.hydrogenSource,
      operatingSource: facts.operatingSource ?? null,
      skipped: v.skipped,
    };
  });
  // The hazards of the chemistry, as the safety core selects them (no checks asked).
  const cautions = assessSafety({ chemistry: facts.chemistry }).cautions.map((c) => ({
    title: c.title,
    headline: firstSentence(c.text),
    figures: c.figures.map((f) => ({ label: f.label, value: f.value, source: f.source, confidence: f.confidence })),
  }));
  return { checks, plantNote: facts.plantNote ?? null, cautions, disclaimer: SAFETY_DISCLAIMER };
}

// ---------------------------------------------------------------------------------------------
// 8. Assumptions and sources

export interface AssumptionsReport {
  warnings: Array<{ section: string; href: string; items: string[] }>;
  failures: Array<{ section: string; href: string; message: string }>;
  checkSources: Array<{ title: string; source: string }>;
  notes: string[];
}

/** Fixed notes on how the figures were made (each restates a convention of the pages). */
const GENERAL_NOTES = [
  'All results in this report are design-study estimates from the models and the inputs stored in the study; they are not measured plant data and carry the uncertainty of those models and inputs.',
  'Specific energies are DC figures unless marked AC; AC figures divide by the rectifier efficiency.',
  'Money is computed in decimal arithmetic and rounded half-up to 2 places; prices are those stored in the study, in its currency.',
  'Gas volumes are at 0 °C and 101.325 kPa as ideal gases.',
  'Local codes, standards, permits and licensed engineering practice govern every safety setting and plant design limit.',
];

// ---------------------------------------------------------------------------------------------
// The whole report

export interface ReportView {
  heads: SectionHead[];
  /** Sections the study has no input for, named so a reader knows they were not forgotten. */
  absent: Array<{ title: string; href: string; reason: string }>;
  study: { head: SectionHead; view: StudyReport };
  kinetics: { head: SectionHead; view: KineticsReport } | null;
  cell: { head: SectionHead; outcome: SectionOutcome<CellReport> } | null;
  plant: { head: SectionHead; outcome: SectionOutcome<PlantReport> } | null;
  coatings: { head: SectionHead; outcome: SectionOutcome<CoatingsView> } | null;
  costs: { head: SectionHead; outcome: SectionOutcome<CostsView> } | null;
  safety: { head: SectionHead; view: SafetyReport };
  assumptions: { head: SectionHead; view: AssumptionsReport };
}

export interface ReportOptions {
  /** Link to a page of the app with the open study (PageContext.link). */
  link: (path: string) => string;
  generatedAt: Date;
  /** The program's version (package.json). */
  version: string;
}

/** Warnings of a section outcome (none when it failed: its error is listed apart). */
function warningsOf<T>(outcome: SectionOutcome<T> | undefined, pick: (v: T) => string[]): string[] {
  return outcome && outcome.state === 'shown' ? pick(outcome.view) : [];
}

/** Build the report of a study: every section the study has inputs for, each computed on its own. */
export function buildReport(study: Study, options: ReportOptions): ReportView {
  const heads: SectionHead[] = [];
  const absent: ReportView['absent'] = [];
  const head = (id: string, title: string, path: string, pageLabel: string): SectionHead => {
    const h = { id, number: heads.length + 1, title, href: options.link(path), pageLabel };
    heads.push(h);
    return h;
  };
  const skip = (title: string, path: string, reason: string): null => {
    absent.push({ title, href: options.link(path), reason });
    return null;
  };

  const studyPart = { head: head('report-study', 'Study', '/', 'Study'), view: studyReport(study, options.generatedAt, options.version) };

  const kinetics =
    study.fits.length || study.datasets.length
      ? { head: head('report-kinetics', 'Kinetics', '/kinetics', 'Kinetics'), view: { fits: study.fits.map(fitRow), datasets: study.datasets.map(datasetRow) } }
      : skip('Kinetics', '/kinetics', 'no datasets or saved fits');

  const cell = study.cell
    ? { head: head('report-cell', 'Cell', '/cell', 'Cell'), outcome: runSection(() => cellReport(study.cell as CellSection)) }
    : skip('Cell', '/cell', 'no cell definition saved');

  const plant = study.plant
    ? { head: head('report-plant', 'Plant', '/plant', 'Plant'), outcome: runSection(() => plantReport(study.plant as PlantSection, study)) }
    : skip('Plant', '/plant', 'no plant sizing saved');

  const coatings = study.coatings
    ? { head: head('report-coatings', 'Coatings', '/coatings', 'Coatings'), outcome: runSection(() => coatingsView(runCoatingComparison(study.coatings!, study))) }
    : skip('Coatings', '/coatings', 'no coating comparison saved');

  const costs = study.costs
    ? { head: head('report-costs', 'Costs', '/costs', 'Costs'), outcome: runSection(() => costsView(runCostStudy(study.costs!, study))) }
    : skip('Costs', '/costs', 'no cost study saved');

  const safety = { head: head('report-safety', 'Safety', '/safety', 'Safety'), view: safetyReport(study) };
  const assumptionsHead = head('report-assumptions', 'Assumptions and sources', '/', 'Study');

  // Warnings of every section, in report order, each list without repeats.
  const warnings: AssumptionsReport['warnings'] = [];
  const failures: AssumptionsReport['failures'] = [];
  const collect = <T>(part: { head: SectionHead; outcome: SectionOutcome<T> } | null, pick: (v: T) => string[]) => {
    if (!part) return;
    if (part.outcome.state === 'failed') {
      failures.push({ section: part.head.title, href: part.head.href, message: part.outcome.error.message });
      return;
    }
    const items = [...new Set(warningsOf(part.outcome, pick))];
    if (items.length) warnings.push({ section: part.head.title, href: part.head.href, items });
  };
  collect(cell, (v) => [...v.warnings, ...(v.bandNote ? [v.bandNote] : [])]);
  collect(plant, (v) => [...v.warnings, ...(v.shuntError ? [`Shunt currents not computed: ${v.shuntError}`] : [])]);
  collect(coatings, (v) => [...v.warnings, ...v.fitNotes]);
  collect(costs, (v) => v.warnings);
  const safetyPart = { head: safety.head, outcome: safety.view.checks };
  collect(safetyPart, (v) => v.skipped.map((s) => `Not checked — ${s}`));
  if (safety.view.plantNote) {
    const entry = warnings.find((w) => w.section === safety.head.title);
    if (entry) entry.items.push(safety.view.plantNote);
    else warnings.push({ section: safety.head.title, href: safety.head.href, items: [safety.view.plantNote] });
  }

  const checkSources = safety.view.checks.state === 'shown' ? safety.view.checks.view.checks.map((c) => ({ title: c.title, source: c.source })) : [];
  const notes = [...GENERAL_NOTES];
  if (study.synthetic) notes.unshift('The study’s data are synthetic (invented for demonstration); the figures describe no real plant, coating or product.');

  return {
    heads,
    absent,
    study: studyPart,
    kinetics,
    cell,
    plant,
    coatings,
    costs,
    safety,
    assumptions: { head: assumptionsHead, view: { warnings, failures, checkSources, notes } },
  };
}

