/**
 * Cell: the JSON API `POST /api/v1/cell/sweep` and the Cell page (`GET /cell`, `POST /cell`).
 * Thin handlers: parse (server/scenario/cell-section.ts, ./cell-form.ts), run the core
 * (./cell-view.ts evaluateCell → server/core/cell), map to a view-model, render.
 */
import { Router, type Request, type Response } from 'express';
import { ZodError } from 'zod';
import { InputError, type IssueDetail } from '../core/errors.js';
import { cellSectionSchema, type CellSection } from '../scenario/cell-section.js';
import type { StudyStore } from '../scenario/store.js';
import type { Study } from '../scenario/schema.js';
import { describeError, zodIssues } from './errors.js';
import { pageContext, type PageContext } from './page.js';
import {
  buildCell,
  CHEMISTRY_LABELS,
  fieldLabel,
  formFieldForPath,
  formFromSection,
  preselectDatasets,
  syncManualFields,
  readForm,
  startingForm,
  weightPercentOf,
  type CellForm,
  type ElectrodeOrigin,
  type ElectrodeRole,
} from './cell-form.js';
import { cellView, cautionsFor, evaluateCell, sweepCsv, type CellEvaluation, type CellView } from './cell-view.js';
import { SAFETY_DISCLAIMER } from '../core/safety/cautions.js';

/** Units of the API response's quantities (SI coherent). */
export const CELL_RESPONSE_UNITS = {
  currentDensity: 'A/m²',
  voltage: 'V',
  areaResistance: 'Ω·m²',
  exchangeCurrentDensity: 'A/m²',
  specificEnergy: 'J/kg',
  productionRate: 'kg/(m²·s)',
  heatLoad: 'W/m²',
  currentEfficiency: '1',
  kFactor: 'V/(A/m²) (× 1000 for V per kA/m²)',
} as const;

const ACTIONS = ['compute', 'csv', 'save', 'defaults'] as const;
type Action = (typeof ACTIONS)[number];

/** An input problem as the page shows it: the form field, its label and the reason. */
export interface PageIssue {
  field: string;
  label: string;
  message: string;
  /** The definition path the core named, when it differs from the field. */
  path?: string;
}

function pageIssues(err: unknown, form: CellForm, stage: 'form' | 'core'): { message: string; issues: PageIssue[] } {
  const { body } = describeError(err);
  const issues = body.error.issues.map((i: IssueDetail) => {
    const field = stage === 'core' ? formFieldForPath(i.path, form) : i.path;
    const out: PageIssue = { field: field ?? i.path, label: field ? fieldLabel(field) : i.path, message: i.message };
    if (stage === 'core' && field !== i.path) out.path = i.path;
    return out;
  });
  return { message: body.error.message, issues };
}

interface Outcome {
  section?: CellSection;
  /** The form to show (the posted one, with fitted kinetics copied into the by-hand fields). */
  form?: CellForm;
  evaluation?: CellEvaluation;
  view?: CellView;
  error?: { message: string; issues: PageIssue[] };
  status: number;
}

/** Build the section from the form and evaluate it; input problems become a 400 outcome. */
function computeFromForm(form: CellForm, study: Study): Outcome {
  let stage: 'form' | 'core' = 'form';
  try {
    const built = buildCell(form, study);
    stage = 'core';
    const ev = evaluateCell(built.section, { strictBand: false });
    return {
      section: built.section,
      form: syncManualFields(form, built.section),
      evaluation: ev,
      view: cellView(built.section, ev, built.origins, built.warnings),
      status: 200,
    };
  } catch (err) {
    const { status } = describeError(err);
    if (status >= 500) throw err;
    return { error: pageIssues(err, form, stage), status };
  }
}

/** Evaluate a saved section exactly as stored (the page opens with it). */
function computeFromSection(section: CellSection, form: CellForm): Outcome {
  try {
    const ev = evaluateCell(section, { strictBand: false });
    const origins: Partial<Record<ElectrodeRole, ElectrodeOrigin>> = {};
    for (const role of ['anode', 'cathode'] as const) {
      const p = section.provenance?.[role];
      if (p) origins[role] = { kind: p.kind, note: p.note };
    }
    return { section, view: cellView(section, ev, origins, []), status: 200 };
  } catch (err) {
    const { status } = describeError(err);
    if (status >= 500) throw err;
    return { error: pageIssues(err, form, 'core'), status };
  }
}

function render(res: Response, ctx: PageContext, shown: CellForm, outcome: Outcome, notice?: string): void {
  const study = ctx.study;
  const form = preselectDatasets(outcome.form ?? shown, study);
  const invalid = outcome.error ? outcome.error.issues.map((i) => i.field) : [];
  const hints: Record<string, string> = {};
  if (form.compositionUnit === 'mol/kg') {
    const pairs = [['brineNaCl', 'NaCl'], ['causticNaOH', 'NaOH'], ['koh', 'KOH']] as const;
    for (const [field, salt] of pairs) {
      const v = Number(form[field]);
      if (form[field].trim() !== '' && Number.isFinite(v) && v > 0) hints[field] = `≈ ${ctx.format.fmt(weightPercentOf(salt, v), 3)} wt %`;
    }
  }
  res.status(outcome.status).render('cell', {
    ...ctx,
    form,
    view: outcome.view ?? null,
    error: outcome.error ?? null,
    invalid,
    notice: notice ?? null,
    hints,
    chemistries: Object.entries(CHEMISTRY_LABELS).map(([id, label]) => ({ id, label })),
    datasets: {
      anode: study.datasets.filter((d) => d.electrode === 'anode').map((d) => ({ id: d.id, name: d.name, points: d.points.length })),
      cathode: study.datasets.filter((d) => d.electrode === 'cathode').map((d) => ({ id: d.id, name: d.name, points: d.points.length })),
    },
    fits: {
      anode: study.fits.filter((f) => f.electrode === 'anode').map((f) => ({ id: f.id, name: f.name, model: f.model })),
      cathode: study.fits.filter((f) => f.electrode === 'cathode').map((f) => ({ id: f.id, name: f.name, model: f.model })),
    },
    cautions: outcome.view?.cautions ?? cautionsFor(form.chemistry),
    disclaimer: SAFETY_DISCLAIMER,
  });
}

function csvFileName(studyName: string): string {
  const slug = studyName.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'cell';
  return `${slug}-cell-sweep.csv`;
}

export function cellRouter(store: StudyStore): Router {
  const r = Router();

  // JSON API: SI in, SI out.
  r.post('/api/v1/cell/sweep', (req: Request, res: Response) => {
    const section = cellSectionSchema.parse(req.body ?? {});
    const ev = evaluateCell(section, { strictBand: true });
    res.json({ ...ev.result, ...(ev.band ? { uncertainty: ev.band } : {}), units: CELL_RESPONSE_UNITS });
  });

  r.get('/cell', (req: Request, res: Response) => {
    const ctx = pageContext(req, store, 'Cell', '/cell');
    const saved = typeof req.query.saved === 'string' ? req.query.saved : '';
    const notice = saved === 'copy'
      ? 'The example is read-only, so the cell was saved into a new copy of the study (now open).'
      : saved ? 'Cell saved to the study.' : undefined;
    const section = ctx.study.cell;
    if (section) {
      const form = formFromSection(section);
      render(res, ctx, form, computeFromSection(section, form), notice);
      return;
    }
    const form = startingForm(ctx.study);
    render(res, ctx, form, computeFromForm(form, ctx.study), notice ?? 'This study has no cell yet: the form holds starting values. Change them and save the cell to the study.');
  });

  r.post('/cell', (req: Request, res: Response) => {
    const ctx = pageContext(req, store, 'Cell', '/cell');
    const raw = typeof req.body?.action === 'string' ? req.body.action : 'compute';
    const action: Action = (ACTIONS as readonly string[]).includes(raw) ? (raw as Action) : 'compute';
    let form = readForm(req.body);
    if (action === 'defaults') {
      form = startingForm(ctx.study, form.chemistry);
      render(res, ctx, form, computeFromForm(form, ctx.study), `Starting values for ${CHEMISTRY_LABELS[form.chemistry]} loaded.`);
      return;
    }
    const outcome = computeFromForm(form, ctx.study);
    if (!outcome.section || !outcome.evaluation || outcome.error) {
      render(res, ctx, form, outcome);
      return;
    }
    if (action === 'csv') {
      const ev = outcome.evaluation;
      res.setHeader('Content-Type', 'text/csv; charset=utf-8');
      res.setHeader('Content-Disposition', `attachment; filename="${csvFileName(ctx.study.name)}"`);
      res.send(sweepCsv(ev, ctx.study.name));
      return;
    }
    if (action === 'save') {
      const study: Study = { ...ctx.study, cell: outcome.section };
      let id: string;
      try {
        id = store.save(study, ctx.studyId);
      } catch (err) {
        if (!(err instanceof ZodError || err instanceof InputError)) throw err;
        const issues = err instanceof ZodError ? zodIssues(err) : err.issues;
        render(res, ctx, form, {
          status: 400,
          error: { message: 'The study could not be saved.', issues: issues.map((i) => ({ field: i.path, label: i.path, message: i.message })) },
        });
        return;
      }
      const params = new URLSearchParams({ study: id, saved: id === ctx.studyId ? '1' : 'copy' });
      res.redirect(303, `/cell?${params.toString()}#results`);
      return;
    }
    render(res, ctx, form, outcome);
  });

  return r;
}
