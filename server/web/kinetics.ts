/**
 * Kinetics: the JSON API (`POST /api/v1/kinetics/fit`, `POST /api/v1/kinetics/arrhenius`)
 * and the Kinetics page (`GET /kinetics`, `POST /kinetics`). Thin handlers: validate at the
 * door, call the core, map the result to a view-model or JSON.
 */
import { Router, type Request, type Response } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { ConvergenceError, InputError, PhysicsError, type IssueDetail } from '../core/errors.js';
import { celsiusToKelvin, kelvinToCelsius } from '../core/units.js';
import { fitKinetics, type KineticsFitInput, type KineticsFitResult } from '../core/kinetics/fit.js';
import { compareTafelButlerVolmer, type ModelComparison } from '../core/kinetics/compare.js';
import { fitArrhenius, type ArrheniusResult } from '../core/kinetics/arrhenius.js';
import { AUTO_WINDOW_RULE } from '../core/kinetics/window.js';
import { MAX_POINTS } from '../core/kinetics/validate.js';
import type { Study } from '../scenario/schema.js';
import type { StudyStore } from '../scenario/store.js';
import { describeError } from './errors.js';
import { pageContext, type PageContext } from './page.js';
import { firstNonFinite } from './validate.js';
import { fmt } from './format.js';
import {
  buildCharts,
  correlationView,
  CURRENT_UNITS,
  describeDataset,
  downloadName,
  FIELD_LABELS,
  initialForm,
  parameterRows,
  POTENTIAL_UNITS,
  MAX_TEMPERATURE_C,
  MIN_TEMPERATURE_C,
  numberText,
  prepareFit,
  readForm,
  referenceOptions,
  resultCsv,
  savedFitRecord,
  statisticsRows,
  studyReferenceLabel,
  seriesView,
  comparisonView,
  decodeDataFile,
  savedFitsView,
  type FitResultLike,
  type KineticsForm,
  type PreparedFit,
  type SeriesView,
} from './kinetics-view.js';

// ---------------------------------------------------------------------------------------
// JSON API schemas
// ---------------------------------------------------------------------------------------

const numberMessage = (what: string) => ({
  error: (issue: { input: unknown }) =>
    issue.input === undefined
      ? `${what} is required`
      : `${what} must be a finite number (got ${issue.input === null ? 'null' : typeof issue.input === 'number' ? String(issue.input) : typeof issue.input})`,
});

/**
 * Temperatures the API accepts, K: the Kinetics page's range (MIN_TEMPERATURE_C to
 * MAX_TEMPERATURE_C in ./kinetics-view.ts, liquid electrolytes; project choice), so 1e6 K or a
 * temperature typed in °C below −50 is refused with the reason instead of fitted.
 */
const MIN_TEMPERATURE_K = celsiusToKelvin(MIN_TEMPERATURE_C);
const MAX_TEMPERATURE_K = celsiusToKelvin(MAX_TEMPERATURE_C);
const temperatureRange = `must be an absolute temperature from ${MIN_TEMPERATURE_K.toFixed(2)} to ${MAX_TEMPERATURE_K.toFixed(2)} K (${MIN_TEMPERATURE_C} to ${MAX_TEMPERATURE_C} °C)`;
const temperatureSchema = (what: string) => z.number(numberMessage(what)).min(MIN_TEMPERATURE_K, temperatureRange).max(MAX_TEMPERATURE_K, temperatureRange);

const pointSchema = z.object({
  currentDensity: z.number(numberMessage('current density [A/m²]')),
  overpotential: z.number(numberMessage('overpotential [V]')),
});

const windowSchema = z.union([
  z.literal('auto'),
  z.strictObject({
    minOverpotential: z.number(numberMessage('minOverpotential [V]')).min(0, 'must be ≥ 0 V (a bound on |η|)'),
    maxOverpotential: z.number(numberMessage('maxOverpotential [V]')).positive('must be > 0 V (a bound on |η|)'),
  }),
], { error: "must be 'auto' or {minOverpotential, maxOverpotential} in V (bounds on |η| as measured)" });

const limitSchema = z.union([z.literal('fit'), z.number().positive()], { error: "must be a limiting current density magnitude > 0 A/m² or 'fit'" });

/** Body of POST /api/v1/kinetics/fit (SI units). */
export const fitRequestSchema = z
  .strictObject({
    points: z
      .array(pointSchema, { error: 'must be a list of {currentDensity, overpotential} points' })
      .min(1, 'no points given; a fit needs data')
      .max(MAX_POINTS, `at most ${MAX_POINTS} points are accepted; thin the record first`),
    model: z.enum(['tafel', 'butler-volmer'], { error: "must be 'tafel' or 'butler-volmer'" }),
    temperature: temperatureSchema('temperature [K]'),
    electrons: z.number(numberMessage('electrons')).int('must be a whole number').min(1).max(8).optional(),
    window: windowSchema.optional(),
    uncompensatedResistance: z.union([z.literal('fit'), z.number().min(0)], { error: "must be an area resistance ≥ 0 Ω·m² or 'fit'" }).optional(),
    anodicLimitingCurrentDensity: limitSchema.optional(),
    cathodicLimitingCurrentDensity: limitSchema.optional(),
    branch: z.enum(['anodic', 'cathodic'], { error: "must be 'anodic' or 'cathodic'" }).optional(),
    anodicTransferCoefficient: z.number().positive().optional(),
    cathodicTransferCoefficient: z.number().positive().optional(),
    tieTransferCoefficients: z.boolean().optional(),
  })
  .superRefine((body, ctx) => {
    if (body.window && body.window !== 'auto' && !(body.window.maxOverpotential > body.window.minOverpotential)) {
      ctx.addIssue({ code: 'custom', path: ['window', 'maxOverpotential'], message: 'must be greater than minOverpotential' });
    }
    if (body.model === 'tafel') {
      const i = body.points.findIndex((p) => p.currentDensity === 0);
      if (i >= 0) {
        ctx.addIssue({ code: 'custom', path: ['points', i, 'currentDensity'], message: 'is zero; the Tafel model uses log|j| and cannot take j = 0 (remove the point or fit Butler–Volmer)' });
      }
    }
    if (body.tieTransferCoefficients && body.electrons === undefined) {
      ctx.addIssue({ code: 'custom', path: ['electrons'], message: 'is needed to tie α_a + α_c = n' });
    }
    const p = parameterCount(body);
    if (body.points.length > 0 && body.points.length < p + 1) {
      ctx.addIssue({
        code: 'custom',
        path: ['points'],
        message: `${body.points.length} point(s) cannot determine ${p} parameter(s) with uncertainties; at least ${p + 1} are needed`,
      });
    }
  });

/** Free parameters of the requested model (for the "fewer points than parameters" check). */
function parameterCount(
  b: Pick<KineticsFitInput, 'model' | 'uncompensatedResistance' | 'anodicLimitingCurrentDensity' | 'cathodicLimitingCurrentDensity' | 'tieTransferCoefficients' | 'anodicTransferCoefficient' | 'cathodicTransferCoefficient'>,
): number {
  const ru = b.uncompensatedResistance === 'fit' ? 1 : 0;
  if (b.model === 'tafel') return 2 + ru;
  let alphas = b.tieTransferCoefficients ? 1 : 2;
  if (!b.tieTransferCoefficients) {
    if (b.anodicTransferCoefficient !== undefined) alphas--;
    if (b.cathodicTransferCoefficient !== undefined) alphas--;
  }
  const limits = (b.anodicLimitingCurrentDensity === 'fit' ? 1 : 0) + (b.cathodicLimitingCurrentDensity === 'fit' ? 1 : 0);
  return 1 + alphas + ru + limits;
}

/** Body of POST /api/v1/kinetics/arrhenius (SI units). */
export const arrheniusRequestSchema = z.strictObject({
  fits: z
    .array(
      z.object({
        temperature: temperatureSchema('temperature [K]'),
        exchangeCurrentDensity: z.number(numberMessage('exchange current density [A/m²]')).positive('must be > 0 A/m²'),
        standardError: z.number(numberMessage('standard error [A/m²]')).positive('must be > 0 A/m²').optional(),
      }),
      { error: 'must be a list of {temperature, exchangeCurrentDensity, standardError?}' },
    )
    .min(2, 'need j0 at two or more temperatures')
    .max(1000, 'at most 1000 fits'),
  referenceTemperature: temperatureSchema('reference temperature [K]').optional(),
});

/** Refuse to answer 200 with NaN/Infinity anywhere in the body. */
function finiteOrFail<T>(value: T, what: string): T {
  const at = firstNonFinite(value);
  if (at !== null) throw new ConvergenceError(`${what} produced a non-finite number (at ${at}); no result is returned`);
  return value;
}

/** Rename issue paths of a core error (e.g. `points[2]` → `fits[2]`). */
function renamePaths(err: unknown, from: string, to: string): unknown {
  if (err instanceof InputError) {
    const issues: IssueDetail[] = err.issues.map((i) => ({ ...i, path: i.path.startsWith(from) ? to + i.path.slice(from.length) : i.path }));
    return InputError.many(err.message.startsWith(from) ? to + err.message.slice(from.length) : err.message, issues);
  }
  return err;
}

// ---------------------------------------------------------------------------------------
// Page helpers
// ---------------------------------------------------------------------------------------

/** Largest uploaded data file (bytes). */
const MAX_UPLOAD_BYTES = 4 * 1024 * 1024;
/** Largest text field (the paste box), bytes: above the upload so an uploaded file can be pasted back. */
const MAX_FIELD_BYTES = 5 * 1024 * 1024;
/** Largest file text copied back into the paste box after an upload (characters). */
const MAX_PASTE_BACK = MAX_UPLOAD_BYTES;
/** Points above which the side-by-side Tafel/Butler–Volmer comparison is skipped (keeps a page request quick). */
const MAX_COMPARE_POINTS = 20_000;

const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fieldSize: MAX_FIELD_BYTES, fields: 60 },
});

/** Run multer and turn its errors into InputErrors the page can show. */
function uploadFile(req: Request, res: Response): Promise<void> {
  return new Promise((resolve, reject) => {
    upload.single('dataFile')(req, res, (err: unknown) => {
      if (!err) return resolve();
      if (err instanceof multer.MulterError) {
        const reason =
          err.code === 'LIMIT_FILE_SIZE'
            ? `the file is larger than ${MAX_UPLOAD_BYTES / (1024 * 1024)} MB`
            : err.code === 'LIMIT_FIELD_VALUE'
              ? `the pasted table is larger than ${MAX_FIELD_BYTES / (1024 * 1024)} MB`
              : err.code === 'LIMIT_UNEXPECTED_FILE'
                ? 'only one data file (field "dataFile") is accepted'
                : err.message;
        return reject(new InputError(err.code === 'LIMIT_FIELD_VALUE' ? FIELD_LABELS.data : FIELD_LABELS.dataFile, reason));
      }
      reject(err);
    });
  });
}

interface FitOutcome {
  prepared: PreparedFit;
  result: KineticsFitResult;
}

function runFit(form: KineticsForm, study: Study, fileText: string | undefined): FitOutcome {
  const prepared = prepareFit(form, study, fileText);
  try {
    const result = fitKinetics(prepared.input);
    finiteOrFail(result, 'the fit');
    return { prepared, result };
  } catch (err) {
    throw translateCoreError(err, prepared);
  }
}

/** Map core field paths (points[i]…, window, uncompensatedResistance…) to form labels and data lines. */
function translateCoreError(err: unknown, prepared: PreparedFit): unknown {
  if (!(err instanceof InputError) && !(err instanceof PhysicsError)) return err;
  const e = err;
  const map = (path: string): string => {
    const m = /^points\[(\d+)\](?:\.(\w+))?/.exec(path);
    if (m) {
      const i = Number(m[1]);
      const line = prepared.origin.lines?.[i];
      const where = line !== undefined ? `${prepared.origin.kind === 'file' ? 'file' : 'data'} line ${line}` : `point ${i + 1} of ${prepared.origin.label}`;
      return m[2] ? `${where} (${m[2] === 'currentDensity' ? 'current density' : 'potential'})` : where;
    }
    const labels: Record<string, string> = {
      points: 'Data',
      window: FIELD_LABELS.windowMode,
      'window.minOverpotential': FIELD_LABELS.windowMin,
      'window.maxOverpotential': FIELD_LABELS.windowMax,
      uncompensatedResistance: FIELD_LABELS.ru,
      anodicLimitingCurrentDensity: FIELD_LABELS.anodicLimit,
      cathodicLimitingCurrentDensity: FIELD_LABELS.cathodicLimit,
      temperature: FIELD_LABELS.temperatureC,
      electrons: FIELD_LABELS.electrons,
      branch: FIELD_LABELS.branch,
      model: FIELD_LABELS.model,
    };
    return labels[path] ?? path;
  };
  const issues = e.issues.map((i) => ({ path: map(i.path), message: i.message }));
  return InputError.many('The fit could not be done with these data and options:', issues);
}

function asView(result: KineticsFitResult, automatic: boolean): FitResultLike {
  return { ...result, window: { ...result.window, automatic } };
}

function modelLabel(result: KineticsFitResult): string {
  if (result.model !== 'tafel') return 'Butler–Volmer';
  return result.branch ? `Tafel line, ${result.branch} branch` : 'Tafel line';
}

function compareFor(prepared: PreparedFit, result: KineticsFitResult): { comparison: ModelComparison | null; note: string | null } {
  const input = prepared.input;
  if (input.points.length > MAX_COMPARE_POINTS) return { comparison: null, note: `The comparison with the other model is skipped above ${MAX_COMPARE_POINTS} points.` };
  try {
    const comparison = compareTafelButlerVolmer(input.points, {
      temperature: input.temperature,
      branch: result.model === 'tafel' ? result.branch : input.branch,
      basis: result.model === 'tafel' ? 'tafel-window' : 'branch',
      window: input.window,
      uncompensatedResistance: input.uncompensatedResistance,
      anodicLimitingCurrentDensity: input.anodicLimitingCurrentDensity,
      cathodicLimitingCurrentDensity: input.cathodicLimitingCurrentDensity,
      tieTransferCoefficients: input.tieTransferCoefficients,
      electrons: input.electrons,
    });
    return { comparison: finiteOrFail(comparison, 'the comparison'), note: null };
  } catch (err) {
    const { status, body } = describeError(err);
    if (status >= 500) throw err;
    return { comparison: null, note: `Tafel and Butler–Volmer could not be compared on these data: ${body.error.message}` };
  }
}

interface PageState {
  form: KineticsForm;
  invalid?: string[];
  error?: unknown;
  notice?: string | null;
  outcome?: FitOutcome | null;
  series?: SeriesView | null;
  highlightFit?: string;
}

function renderPage(req: Request, res: Response, ctx: PageContext, state: PageState, status = 200): void {
  const { form } = state;
  const study = ctx.study;
  let fit: Record<string, unknown> | null = null;
  if (state.outcome) {
    const { prepared, result } = state.outcome;
    const view = asView(result, prepared.input.window === 'auto');
    const { comparison, note } = compareFor(prepared, result);
    const origin = prepared.origin;
    const t = origin.table;
    fit = {
      modelLabel: modelLabel(result),
      notConverged: !result.converged,
      status: result.status,
      originText: `${origin.label}: ${prepared.input.points.length} points at ${fmt(kelvinToCelsius(prepared.input.temperature), 4)} °C${origin.electrode ? `, ${origin.electrode}` : ''}${origin.coating ? ` (${origin.coating})` : ''}.`,
      tableNote: t
        ? `Read ${t.rows} rows in ${t.columns} columns separated by ${t.delimiter === '\t' ? 'tabs' : t.delimiter === ';' ? 'semicolons' : t.delimiter === ',' ? 'commas' : 'spaces'}${t.decimalComma ? ' (decimal comma accepted)' : ''}${t.header ? `; header row on line ${t.headerLine}: “${t.header.join(' | ')}”` : '; no header row'}.`
        : null,
      parameters: parameterRows(view),
      statistics: statisticsRows(view, prepared.input.points.length),
      warnings: [...prepared.warnings, ...result.warnings, ...(note ? [note] : [])],
      comparison: comparison ? comparisonView(comparison) : null,
      correlation: correlationView(view),
      charts: buildCharts(view, form.currentUnit),
      windowRule: result.window.rule,
      saveName: form.fitName || `${origin.label}, ${result.model === 'tafel' ? 'Tafel' : 'Butler–Volmer'} fit`,
    };
    fit.thinned = (fit.charts as { thinned: boolean }).thinned;
  }
  res.status(status).render('kinetics', {
    ...ctx,
    form,
    invalid: state.invalid ?? [],
    error: state.error ? describeError(state.error).body.error : null,
    notice: state.notice ?? null,
    fit,
    series: state.series ?? null,
    datasets: study.datasets.map((d) => ({
      id: d.id,
      name: d.name,
      electrode: d.electrode,
      coating: d.coating,
      temperatureC: fmt(kelvinToCelsius(d.temperature), 4),
      points: d.points.length,
      potentials: d.potentialKind === 'electrode' ? `E vs ${studyReferenceLabel(d.reference)}` : 'η',
      href: ctx.link('/kinetics', { dataset: d.id }),
    })),
    savedFits: savedFitsView(study, state.highlightFit),
    references: referenceOptions(),
    currentUnits: CURRENT_UNITS.map((u) => ({ id: u, label: u.replace('m2', 'm²').replace('cm2', 'cm²') })),
    potentialUnits: POTENTIAL_UNITS,
    autoWindowRule: AUTO_WINDOW_RULE,
    maxUploadMB: MAX_UPLOAD_BYTES / (1024 * 1024),
  });
}

function sendAttachment(res: Response, body: string, type: string, filename: string): void {
  res.setHeader('Content-Type', `${type}; charset=utf-8`);
  res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
  res.send(body);
}

/** Temperature series for a study dataset: its siblings (same electrode and coating) fitted alike. */
function runSeries(form: KineticsForm, study: Study, datasetId: string): SeriesView | null {
  const base = study.datasets.find((d) => d.id === datasetId);
  if (!base) return null;
  const siblings = study.datasets.filter((d) => d.electrode === base.electrode && d.coating === base.coating);
  if (new Set(siblings.map((d) => d.temperature)).size < 2) return null;
  const rows = siblings
    .slice()
    .sort((a, b) => a.temperature - b.temperature)
    .map((d) => {
      const f = describeDataset(form, d, { keepFitOptions: true });
      try {
        const { result } = runFit(f, study, undefined);
        if (!result.converged) return { dataset: d, result: null, error: `did not converge (${result.status}); left out of the Arrhenius fit` };
        return { dataset: d, result, error: null as string | null };
      } catch (err) {
        const { status, body } = describeError(err);
        if (status >= 500) throw err;
        return { dataset: d, result: null, error: body.error.message };
      }
    });
  let arrhenius: ArrheniusResult | null = null;
  let arrheniusError: string | null = null;
  const ok = rows.filter((r) => r.result !== null);
  const refC = form.referenceTemperatureC.trim();
  let referenceTemperature: number | undefined;
  if (refC !== '') {
    const v = Number(refC.replace(',', '.'));
    if (!Number.isFinite(v) || v < MIN_TEMPERATURE_C || v > MAX_TEMPERATURE_C) {
      arrheniusError = `${FIELD_LABELS.referenceTemperatureC}: "${refC}" is not a temperature between ${MIN_TEMPERATURE_C} and ${MAX_TEMPERATURE_C} °C`;
    } else {
      referenceTemperature = celsiusToKelvin(v);
    }
  }
  if (!arrheniusError) {
    try {
      const pts = ok.map((r) => {
        const j0 = r.result!.parameters.exchangeCurrentDensity;
        return { temperature: r.dataset.temperature, exchangeCurrentDensity: j0.value, ...(j0.standardError ? { standardError: j0.standardError } : {}) };
      });
      const allSe = pts.every((p) => 'standardError' in p);
      arrhenius = finiteOrFail(fitArrhenius(allSe ? pts : pts.map(({ temperature, exchangeCurrentDensity }) => ({ temperature, exchangeCurrentDensity })), { referenceTemperature }), 'the Arrhenius fit');
    } catch (err) {
      const { status, body } = describeError(err);
      if (status >= 500) throw err;
      arrheniusError = body.error.issues.length ? body.error.issues.map((i) => i.message).join('; ') : body.error.message;
    }
  }
  return seriesView(base, rows, arrhenius, arrheniusError, form);
}

// ---------------------------------------------------------------------------------------
// Router
// ---------------------------------------------------------------------------------------

export function kineticsRouter(store: StudyStore): Router {
  const r = Router();

  r.post('/api/v1/kinetics/fit', (req, res) => {
    const body = fitRequestSchema.parse(req.body ?? {});
    const result = fitKinetics(body);
    res.json(finiteOrFail(result, 'the fit'));
  });

  r.post('/api/v1/kinetics/arrhenius', (req, res) => {
    const body = arrheniusRequestSchema.parse(req.body ?? {});
    let result: ArrheniusResult;
    try {
      result = fitArrhenius(body.fits, { referenceTemperature: body.referenceTemperature });
    } catch (err) {
      throw renamePaths(err, 'points', 'fits');
    }
    res.json(finiteOrFail(result, 'the Arrhenius fit'));
  });

  r.get('/kinetics', (req, res) => {
    const ctx = pageContext(req, store, 'Kinetics', '/kinetics');
    const datasetId = typeof req.query.dataset === 'string' ? req.query.dataset : undefined;
    let form: KineticsForm;
    let error: unknown = null;
    try {
      form = initialForm(ctx.study, datasetId);
    } catch (err) {
      form = initialForm(ctx.study);
      error = err;
    }
    const saved = typeof req.query.saved === 'string' ? req.query.saved : undefined;
    const savedFit = saved ? ctx.study.fits.find((f) => f.id === saved) : undefined;
    renderPage(req, res, ctx, {
      form,
      error,
      notice: savedFit ? `Fit “${savedFit.name}” saved in the study “${ctx.study.name}”.` : null,
      highlightFit: savedFit?.id,
    }, error ? 400 : 200);
  });

  r.post('/kinetics', async (req, res) => {
    let form: KineticsForm | null = null;
    let ctx: PageContext | null = null;
    try {
      await uploadFile(req, res);
      form = readForm(req.body);
      ctx = pageContext(req, store, 'Kinetics', '/kinetics');
      const study = ctx.study;
      if (req.body?.referenceTemperatureC === undefined) {
        // First fit from a fresh page: report a temperature series at the operating temperature.
        form.referenceTemperatureC = numberText(kelvinToCelsius(study.operating.temperature));
      }
      const action = typeof req.body?.action === 'string' ? req.body.action : 'fit';
      let notice: string | null = null;
      if (form.source === 'dataset' && form.dataset && form.dataset !== form.describedDataset) {
        const wanted = form.dataset;
        const d = study.datasets.find((x) => x.id === wanted);
        if (d) {
          // The name box still holds the previous dataset's fit name: start afresh.
          form = { ...describeDataset(form, d, { keepFitOptions: true }), fitName: action === 'fit' ? '' : form.fitName };
          notice = `Measurement details (temperature, potentials, R_u) were taken from the dataset “${d.name}”.`;
        }
      }
      const fileText = req.file ? decodeDataFile(req.file.buffer) : undefined;
      const outcome = runFit(form, study, fileText);
      if (form.source === 'file' && fileText !== undefined && fileText.length <= MAX_PASTE_BACK) {
        // Keep the uploaded table in the paste box so downloads and saving work without re-uploading.
        form = { ...form, source: 'paste', data: fileText };
        notice = [notice, 'The uploaded file was read into the paste box, so the buttons below work without uploading it again.'].filter(Boolean).join(' ');
      }
      const title = form.fitName || `${outcome.prepared.origin.label} ${outcome.result.model} fit`;
      if (action === 'csv') {
        return sendAttachment(res, resultCsv(asView(outcome.result, outcome.prepared.input.window === 'auto'), form.currentUnit, title), 'text/csv', downloadName(title, 'csv'));
      }
      if (action === 'json') {
        const doc = {
          format: 'kinetic-fit',
          title,
          units: 'SI: A/m², V, Ω·m², K',
          source: { kind: outcome.prepared.origin.kind, label: outcome.prepared.origin.label, datasetId: outcome.prepared.origin.datasetId },
          input: { ...outcome.prepared.input, points: undefined, pointCount: outcome.prepared.input.points.length },
          conversionWarnings: outcome.prepared.warnings,
          result: outcome.result,
        };
        return sendAttachment(res, JSON.stringify(finiteOrFail(doc, 'the result'), null, 2) + '\n', 'application/json', downloadName(title, 'json'));
      }
      if (action === 'save') {
        const name = form.fitName.trim();
        if (!name) throw new InputError(FIELD_LABELS.fitName, 'give the fit a name');
        if (!outcome.result.converged) {
          throw new InputError('Save fit to study', `the fit did not converge (${outcome.result.status}); an unconverged fit is not saved. Change the model options and fit again.`);
        }
        const record = savedFitRecord(asView(outcome.result, outcome.prepared.input.window === 'auto'), {
          name,
          datasetId: outcome.prepared.origin.datasetId,
          electrode: outcome.prepared.origin.electrode,
          temperature: outcome.prepared.input.temperature,
        });
        const updated: Study = { ...study, fits: [...study.fits, record] };
        const id = store.save(updated, ctx.isExample ? undefined : ctx.studyId);
        const params = new URLSearchParams({ study: id, saved: record.id });
        if (outcome.prepared.origin.datasetId) params.set('dataset', outcome.prepared.origin.datasetId);
        return res.redirect(303, `/kinetics?${params.toString()}`);
      }
      const series = outcome.prepared.origin.datasetId ? runSeries(form, study, outcome.prepared.origin.datasetId) : null;
      renderPage(req, res, ctx, { form, notice, outcome, series });
    } catch (err) {
      const { status } = describeError(err);
      if (status >= 500) throw err;
      if (!ctx) {
        try {
          ctx = pageContext(req, store, 'Kinetics', '/kinetics');
        } catch {
          if (req.body) req.body.study = undefined;
          ctx = pageContext(req, store, 'Kinetics', '/kinetics');
        }
      }
      const fields = (err as { fields?: string[] }).fields ?? [];
      // After a failed upload the body holds the fields read so far. A fit these data and
      // options cannot give (422 for the API) is an input problem on the page: 400.
      renderPage(req, res, ctx, { form: form ?? readForm(req.body), error: err, invalid: fields }, status === 422 ? 400 : status);
    }
  });

  return r;
}
