/**
 * Coatings and Costs: pages and JSON API.
 *
 * API (JSON in/out, SI except money; see server/scenario/economics-sections.ts for the exact
 * request schemas). `?study=<id>` optionally names a study whose cell definition is used when
 * the body gives no `cell`, and whose datasets and saved fits electrode swaps may name.
 *
 *   POST /api/v1/plant/cost
 *     { product, chemistry?, cell?: { linear: { intercept V, slope V per A/m² } } | <cell definition>,
 *       currentEfficiency? (0–1; required with plant data), electricityPrice (per kWh),
 *       capitalCostPerArea (per m²), operatingHours (h/yr), discountRate (fraction/yr),
 *       lifetime (yr), currentDensities [A/m², …] (required, ≥ 1; ≥ 2 different values unless
 *       searchRange), searchRange? { min, max } A/m², designCurrentDensity? A/m²,
 *       sensitivityFraction? (default 0.2), currency? (label) }
 *   → { economicCurrentDensity A/m², optimum { currentDensity, cellVoltage, currentEfficiency,
 *       specificEnergy J/kg, energyCost, capitalCost, totalCost (per kg), status, message,
 *       display { energyPerTonne, capitalPerTonne, totalPerTonne } (decimal, half-up) },
 *       closedForm: null | { economicCurrentDensity, formula, inputs { C, CRF, p, K, H } each
 *       { value, unit } in SI, insideSearchRange, relativeDifference }, closedFormNote,
 *       capitalRecoveryFactor 1/yr, design: null | {…}, searchRange, points [{ currentDensity,
 *       cellVoltage, currentEfficiency, specificEnergy, energyCost, capitalCost, totalCost }],
 *       sensitivity [{ parameter, label, low { value, totalPerTonne, display }, high {…}, swing,
 *       note? }] (largest swing first), sensitivityBasis { currentDensity, basis, fraction,
 *       baseTotalPerTonne, baseDisplay }, units, warnings }
 *
 *   POST /api/v1/plant/compare
 *     { product, chemistry?, cell? (base cell for swaps; default the study's), currentEfficiency?,
 *       currentDensity A/m², plant: { activeArea } | { cells, cellArea } | { productionRate kg/s },
 *       electricityPrice (per kWh), operatingHours, discountRate, baseline? (index, default 0),
 *       options: 2–6 × { name, pricePerArea (per m²), voltageRisePerYear (V/yr), lifeYears (whole),
 *         and either cell (+ currentEfficiency) or anode?/cathode? swaps, each
 *         { kinetics: {…}, limitingCurrentDensity? } | { fit: id } | { dataset: id } } }
 *   → { activeArea m², annualProduction kg/yr, baseline, options [{ name, source, isBaseline,
 *       cellVoltage, currentEfficiency, specificEnergy, averageCellVoltage, annualEnergy J/yr,
 *       annualEnergyDifference, annualEnergyCost, annualSavingVsBaseline, coatingCapital,
 *       extraCapital, simplePaybackYears | null, equivalentAnnualCost, npvVsBaseline, lifeYears,
 *       display {…}, notes, kinetics { anode?, cathode? } }], units, warnings }
 *
 * Pages: GET/POST /costs and /coatings (forms in engineers' units; action=compute|csv|save,
 * and resize on /coatings). Saving writes the request into the study's `costs`/`coatings`
 * section; an example study is copied (303 to the copy).
 */
import { Router, type Request, type Response } from 'express';
import type { CoatingsRequest, CostRequest } from '../scenario/economics-sections.js';
import type { Study } from '../scenario/schema.js';
import type { StudyStore } from '../scenario/store.js';
import { describeError } from './errors.js';
import {
  COSTS_LABELS,
  COATINGS_LABELS,
  OPTION_LABELS,
  FormError,
  coatingsCsv,
  coatingsFormFromRequest,
  coatingsRequestFromForm,
  coatingsView,
  compareFromBody,
  costFromBody,
  costsCsv,
  costsFormFromRequest,
  costsRequestFromForm,
  costsView,
  defaultCoatingsForm,
  defaultCostsForm,
  downloadName,
  electrodeChoices,
  productsOf,
  readCoatingsForm,
  readCostsForm,
  relabel,
  resizeOptions,
  runCoatingComparison,
  runCostStudy,
  studyCellSource,
  type CoatingsForm,
  type CoatingsView,
  type CompareResponse,
  type CostResponse,
  type CostsForm,
  type CostsView,
} from './economics-view.js';
import { pageContext, type PageContext } from './page.js';
import { safetyPanelFor } from './safety-view.js';

function studyFromQuery(req: Request, store: StudyStore): Study | undefined {
  return typeof req.query.study === 'string' && req.query.study ? store.get(req.query.study) : undefined;
}

/** Whether the study has a usable cell definition, and the reason when it has a broken one. */
function studyCellState(study: Study): { hasCell: boolean; problem: string | null } {
  try {
    return { hasCell: studyCellSource(study) !== undefined, problem: null };
  } catch (err) {
    return { hasCell: false, problem: (err as Error).message };
  }
}

function actionOf(req: Request): string {
  const a = req.body && typeof req.body.action === 'string' ? req.body.action : 'compute';
  return ['compute', 'csv', 'save', 'resize'].includes(a) ? a : 'compute';
}

function sendCsv(res: Response, name: string, text: string): void {
  res.setHeader('Content-Type', 'text/csv; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${name}"`);
  res.send(text);
}

/**
 * Page error: 400 with the error box (a 422 "did not converge" from inputs far out of range is
 * an input problem on a page too); a 5xx is re-thrown to the app's error handler.
 */
function pageError(err: unknown, page: 'costs' | 'coatings'): { status: number; error: { message: string; issues: Array<{ path: string; message: string }> }; fields: string[] } {
  const mapped = relabel(err, page);
  const { status, body } = describeError(mapped);
  if (status >= 500) throw err;
  return { status: status === 422 ? 400 : status, error: body.error, fields: mapped instanceof FormError ? mapped.fields : [] };
}

interface PageOptions<Form, View> {
  form: Form;
  view: View | null;
  status?: number;
  error?: unknown;
  fields?: string[];
  notice?: string | null;
}

/**
 * What tells the Costs and Coatings pages apart. Both follow one flow: GET shows the study's
 * saved section computed (or the default form), POST computes, downloads CSV or saves.
 */
interface EconomicsPage<Form, Req, Result, View> {
  name: 'costs' | 'coatings';
  title: string;
  savedNotice: string;
  /** Template locals only this page uses. */
  locals: (ctx: PageContext) => Record<string, unknown>;
  saved: (study: Study) => Req | undefined;
  withSaved: (study: Study, request: Req) => Study;
  defaultForm: (study: Study, hasCell: boolean) => Form;
  formFromRequest: (request: Req, study: Study, hasCell: boolean) => Form;
  requestFromForm: (form: Form, study: Study, hasCell: boolean) => Req;
  run: (request: Req, study: Study) => Result;
  view: (result: Result) => View;
  csv: (result: Result, studyName: string) => string;
}

const COSTS_PAGE: EconomicsPage<CostsForm, CostRequest, CostResponse, CostsView> = {
  name: 'costs',
  title: 'Costs',
  savedNotice: 'Cost study saved to this study.',
  locals: () => ({ labels: COSTS_LABELS }),
  saved: (study) => study.costs,
  withSaved: (study, costs) => ({ ...study, costs }),
  defaultForm: defaultCostsForm,
  formFromRequest: (request, _study, hasCell) => costsFormFromRequest(request, hasCell),
  requestFromForm: (form, _study, hasCell) => costsRequestFromForm(form, hasCell),
  run: runCostStudy,
  view: costsView,
  csv: costsCsv,
};

const COATINGS_PAGE: EconomicsPage<CoatingsForm, CoatingsRequest, CompareResponse, CoatingsView> = {
  name: 'coatings',
  title: 'Coatings',
  savedNotice: 'Coating comparison saved to this study.',
  locals: (ctx) => ({
    labels: COATINGS_LABELS,
    optionLabels: OPTION_LABELS,
    anodeChoices: electrodeChoices(ctx.study, 'anode'),
    cathodeChoices: electrodeChoices(ctx.study, 'cathode'),
    // Coatings change the anode side reaction and the cathode of a plant handling chlorine or
    // hydrogen at high DC current: the caution panel stays in view.
    safetyPanel: safetyPanelFor(ctx.study.chemistry, ctx.link('/safety')),
  }),
  saved: (study) => study.coatings,
  withSaved: (study, coatings) => ({ ...study, coatings }),
  defaultForm: (study) => defaultCoatingsForm(study),
  formFromRequest: (request, study) => coatingsFormFromRequest(request, study),
  requestFromForm: (form, study) => coatingsRequestFromForm(form, study),
  run: runCoatingComparison,
  view: (result) => coatingsView(result),
  csv: coatingsCsv,
};

interface PageHandlers<Form, View> {
  /** Render the page with this form and view (or error). */
  render: (req: Request, res: Response, opts: PageOptions<Form, View>) => void;
  /** GET: the study's saved section, computed, or the default form. */
  show: (req: Request, res: Response) => void;
  /** POST: compute the form, then render, send CSV (action csv) or save and redirect (action save). */
  submit: (req: Request, res: Response, form: Form, action: string) => void;
}

function economicsPage<Form, Req, Result, View>(store: StudyStore, page: EconomicsPage<Form, Req, Result, View>): PageHandlers<Form, View> {
  const path = `/${page.name}`;
  const render = (req: Request, res: Response, opts: PageOptions<Form, View>): void => {
    const ctx = pageContext(req, store, page.title, path);
    const cell = studyCellState(ctx.study);
    res.status(opts.status ?? 200).render(page.name, {
      ...ctx,
      form: opts.form,
      view: opts.view,
      error: opts.error ?? null,
      invalid: opts.fields ?? [],
      notice: opts.notice ?? null,
      hasStudyCell: cell.hasCell,
      cellProblem: cell.problem,
      products: productsOf(ctx.study.chemistry),
      ...page.locals(ctx),
    });
  };

  const show = (req: Request, res: Response): void => {
    const ctx = pageContext(req, store, page.title, path);
    const { hasCell } = studyCellState(ctx.study);
    const notice = req.query.saved === '1' ? page.savedNotice : null;
    const section = page.saved(ctx.study);
    if (!section) {
      render(req, res, { form: page.defaultForm(ctx.study, hasCell), view: null, notice });
      return;
    }
    const form = page.formFromRequest(section, ctx.study, hasCell);
    try {
      render(req, res, { form, view: page.view(page.run(section, ctx.study)), notice });
    } catch (err) {
      const e = pageError(err, page.name);
      render(req, res, { form, view: null, error: e.error, fields: e.fields, notice });
    }
  };

  const submit = (req: Request, res: Response, form: Form, action: string): void => {
    const ctx = pageContext(req, store, page.title, path);
    const { hasCell } = studyCellState(ctx.study);
    try {
      const request = page.requestFromForm(form, ctx.study, hasCell);
      const result = page.run(request, ctx.study);
      if (action === 'csv') {
        sendCsv(res, downloadName(page.name, ctx.study.name), page.csv(result, ctx.study.name));
        return;
      }
      if (action === 'save') {
        const id = store.save(page.withSaved(ctx.study, request), ctx.studyId);
        res.redirect(303, `${path}?${new URLSearchParams({ study: id, saved: '1' }).toString()}`);
        return;
      }
      render(req, res, { form, view: page.view(result) });
    } catch (err) {
      const e = pageError(err, page.name);
      render(req, res, { form, view: null, status: e.status, error: e.error, fields: e.fields });
    }
  };

  return { render, show, submit };
}

/** Coatings and Costs pages and their JSON API. */
export function economicsRouter(store: StudyStore): Router {
  const r = Router();

  // ----- JSON API -----
  r.post('/api/v1/plant/cost', (req, res) => {
    res.json(costFromBody(req.body, studyFromQuery(req, store)));
  });
  r.post('/api/v1/plant/compare', (req, res) => {
    res.json(compareFromBody(req.body, studyFromQuery(req, store)));
  });

  // ----- Costs page -----
  const costs = economicsPage(store, COSTS_PAGE);
  r.get('/costs', costs.show);
  r.post('/costs', (req, res) => {
    costs.submit(req, res, readCostsForm(req.body), actionOf(req));
  });

  // ----- Coatings page -----
  const coatings = economicsPage(store, COATINGS_PAGE);
  r.get('/coatings', coatings.show);
  r.post('/coatings', (req, res) => {
    const form = readCoatingsForm(req.body);
    const action = actionOf(req);
    if (action === 'resize') {
      const resized = resizeOptions(form, Number.parseInt(typeof req.body?.resize === 'string' ? req.body.resize : '', 10));
      coatings.render(req, res, { form: resized, view: null, notice: `${resized.options.length} options: fill in the new ones and compute.` });
      return;
    }
    coatings.submit(req, res, form, action);
  });

  return r;
}
