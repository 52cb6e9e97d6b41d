/**
 * Plant sizing and shunt currents: `POST /api/v1/plant/size`, `POST /api/v1/plant/shunt` and
 * the Plant page (`GET/POST /plant`); the Safety page is mounted from here too
 * (./safety-view.ts). Handlers parse, call the core through ./plant-view.ts, and render.
 */
import { Router, type Request, type Response } from 'express';
import { z } from 'zod';
import { solveShuntCurrents, type ProductId } from '../core/plant/index.js';
import type { StudyStore } from '../scenario/store.js';
import type { Study } from '../scenario/schema.js';
import { MAX_SHUNT_CELLS, rectifierSchema, shuntCircuitSchema, plantProductSchema, type PlantSection } from '../scenario/plant-sections.js';
import { cellSourceSchema, isLinearSource, plantChemistryOf } from './cell-source.js';
import { describeError } from './errors.js';
import { pageContext } from './page.js';
import {
  API_SIZING_PATHS,
  FIELD_LABELS,
  PRODUCT_LABELS,
  RATE_UNITS,
  computePlant,
  coProductsOf,
  defaultPlantForm,
  downloadName,
  formFromSection,
  formToSection,
  plantView,
  readPlantForm,
  resolveCircuits,
  rethrowMapped,
  runSizing,
  shuntCsv,
  sizingCsv,
  targetProducts,
  type PlantComputation,
  type PlantForm,
} from './plant-view.js';
import { safetyPanelFor, safetyRouter } from './safety-view.js';
import { assertFiniteTree, parseBody } from './validate.js';
import { fraction, positive } from '../scenario/numbers.js';


/** Chemistries the API accepts: the study ids, and "water" for either water electrolyser. */
const apiChemistrySchema = z.enum(['chlor-alkali', 'alkaline-water', 'pem-water', 'water'], {
  error: "must be one of 'chlor-alkali', 'alkaline-water', 'pem-water', 'water'",
});

/** Body of POST /api/v1/plant/size (SI: kg/s, A/m², m², V, A, fractions). */
export const sizeRequestSchema = z
  .object({
    chemistry: apiChemistrySchema,
    product: plantProductSchema,
    productionRate: positive,
    currentDensity: positive,
    cellArea: positive,
    cell: cellSourceSchema,
    currentEfficiency: fraction.optional(),
    coProductCurrentEfficiency: z.object({ Cl2: fraction.optional(), NaOH: fraction.optional(), H2: fraction.optional(), O2: fraction.optional() }).optional(),
    rectifier: rectifierSchema,
    thermoneutralVoltage: positive.optional(),
  })
  .superRefine((b, ctx) => {
    const chem = plantChemistryOf(b.chemistry);
    if (!targetProducts(chem).includes(b.product)) {
      ctx.addIssue({ code: 'custom', path: ['product'], message: `${b.product} is not a product of ${b.chemistry}; use ${targetProducts(chem).join(', ')}` });
    }
    if (b.cell && isLinearSource(b.cell)) {
      if (b.currentEfficiency === undefined) ctx.addIssue({ code: 'custom', path: ['currentEfficiency'], message: 'is required with a linear cell: a fraction in (0, 1]' });
    } else if (b.cell && plantChemistryOf(b.cell.chemistry) !== chem) {
      ctx.addIssue({ code: 'custom', path: ['cell', 'chemistry'], message: `the cell definition is ${b.cell.chemistry}, the request ${b.chemistry}` });
    }
    for (const id of Object.keys(b.coProductCurrentEfficiency ?? {})) {
      if (!coProductsOf(chem, b.product).includes(id as ProductId)) {
        ctx.addIssue({ code: 'custom', path: ['coProductCurrentEfficiency', id], message: `is not a co-product of ${b.product} in ${b.chemistry}` });
      }
    }
  });

/** Body of POST /api/v1/plant/shunt (SI: A, V, Ω; or geometry m, m² and conductivity S/m). */
export const shuntRequestSchema = z.object({
  cells: z.number().int('must be a whole number').min(2, 'must be at least 2 (shunt paths need two cells in series)').max(MAX_SHUNT_CELLS, `must be at most ${MAX_SHUNT_CELLS}`),
  cellCurrent: positive,
  cellVoltage: positive,
  cellResistance: positive,
  circuits: z.array(shuntCircuitSchema).min(1, 'needs at least one electrolyte circuit').max(16),
});

/** Units of the sizing response fields, for people reading the JSON. */
const SIZE_UNITS = {
  totalCurrent: 'A',
  activeArea: 'm²',
  operatingCurrentDensity: 'A/m²',
  designCurrentDensity: 'A/m²',
  cellVoltage: 'V',
  designCellVoltage: 'V',
  electrolyserVoltage: 'V',
  electrolyserCurrent: 'A',
  dcPower: 'W',
  acPower: 'W',
  heatLoad: 'W',
  products: 'kg/s',
  feeds: 'kg/s',
  gasVolumeRates: 'm³/s at 0 °C, 101.325 kPa',
  specificEnergy: 'J/kg of the target product',
  currentEfficiency: 'fraction',
};

function sizeResponse(b: z.infer<typeof sizeRequestSchema>) {
  const { sizing: s } = runSizing(
    {
      chemistry: plantChemistryOf(b.chemistry),
      product: b.product,
      productionRate: b.productionRate,
      currentDensity: b.currentDensity,
      cellArea: b.cellArea,
      cell: b.cell,
      currentEfficiency: b.currentEfficiency,
      coProductCurrentEfficiency: b.coProductCurrentEfficiency,
      rectifier: b.rectifier,
      thermoneutralVoltage: b.thermoneutralVoltage,
    },
    API_SIZING_PATHS,
  );
  const products: Partial<Record<ProductId, number>> = {};
  const gasVolumeRates: Partial<Record<ProductId, number>> = {};
  const productCurrentEfficiency: Partial<Record<ProductId, number>> = {};
  for (const p of s.products) {
    products[p.id] = p.massRate;
    productCurrentEfficiency[p.id] = p.currentEfficiency;
    if (p.normalVolumeRate !== null) gasVolumeRates[p.id] = p.normalVolumeRate;
  }
  const feeds: Record<string, number> = {};
  for (const f of s.feeds) feeds[f.id] = f.massRate;
  return {
    totalCurrent: s.operating.totalCurrent,
    activeArea: s.operating.activeArea,
    cells: s.cells.total,
    electrolysers: s.electrolysers.count,
    // A loop, not Math.max(...list): a list of many electrolysers would overflow the call stack.
    cellsPerElectrolyser: s.electrolysers.cellsEach.reduce((a, b) => Math.max(a, b), 0),
    cellsPerElectrolyserList: s.electrolysers.cellsEach,
    operatingCurrentDensity: s.operating.currentDensity,
    cellVoltage: s.operating.cellVoltage,
    electrolyserVoltage: s.electrolysers.voltage,
    electrolyserCurrent: s.electrolysers.current,
    dcPower: s.power.dc,
    acPower: s.power.ac,
    heatLoad: s.power.heatLoad,
    products,
    warnings: s.warnings,
    currentEfficiency: s.operating.currentEfficiency,
    productCurrentEfficiency,
    gasVolumeRates,
    feeds,
    specificEnergy: s.specificEnergy,
    design: {
      currentDensity: s.design.currentDensity,
      cellVoltage: s.design.cellVoltage,
      currentEfficiency: s.design.currentEfficiency,
      totalCurrent: s.design.totalCurrent,
      activeArea: s.design.activeArea,
      cellsExact: s.design.cellsExact,
      maxCellsInSeries: s.cells.maxInSeries,
      electrolyserVoltage: s.electrolysers.voltageAtDesign,
      rectifierVoltageUse: s.electrolysers.rectifierVoltageUse,
      rectifierCurrentUse: s.electrolysers.rectifierCurrentUse,
    },
    thermoneutralVoltage: { value: s.power.thermoneutralVoltage, unit: 'V', source: s.power.thermoneutralSource },
    designBasis: s.designBasis,
    units: SIZE_UNITS,
  };
}

function shuntResponse(b: z.infer<typeof shuntRequestSchema>) {
  const circuits = resolveCircuits(b.circuits, (i, field) => `circuits[${i}].${field}`);
  let result;
  try {
    result = solveShuntCurrents({ cells: b.cells, current: b.cellCurrent, cellVoltage: b.cellVoltage, cellResistance: b.cellResistance, circuits });
  } catch (err) {
    // The core names `current` and `circuits.0.x`; the API body says `cellCurrent` and `circuits[0].x`.
    rethrowMapped(err, { current: 'cellCurrent' });
  }
  return {
    channelCurrents: result.channelCurrents,
    currentEfficiencyLoss: result.currentEfficiencyLoss,
    powerLoss: result.shuntPower,
    warnings: result.warnings,
    circuits: circuits.map((c) => ({ name: c.name, channelResistance: c.channelResistance, manifoldSegmentResistance: c.manifoldSegmentResistance })),
    manifoldCurrents: result.manifoldCurrents,
    bypassCurrents: result.bypassCurrents,
    cellCurrents: result.cellCurrents,
    maxChannelCurrent: result.maxChannelCurrent,
    maxBypassCurrent: result.maxBypassCurrent,
    cellSourceVoltage: result.cellSourceVoltage,
    stackVoltage: result.stackVoltage,
    rectifierPower: result.rectifierPower,
    units: {
      channelCurrents: 'A (positive: from the cell into the manifold; cell 1 at the positive end)',
      currentEfficiencyLoss: 'fraction',
      powerLoss: 'W',
      manifoldCurrents: 'A',
      bypassCurrents: 'A',
      cellCurrents: 'A',
      stackVoltage: 'V',
      rectifierPower: 'W',
      resistances: 'Ω',
    },
  };
}

// ---------------------------------------------------------------------------------------------
// Page

interface PageState {
  form: PlantForm;
  computation: PlantComputation | null;
  error: { message: string; issues: { path: string; message: string }[] } | null;
  notice: string | null;
}

function renderPlant(req: Request, res: Response, store: StudyStore, state: PageState, status = 200): void {
  const ctx = pageContext(req, store, 'Plant', '/plant');
  const chemistry = plantChemistryOf(ctx.study.chemistry);
  const view = state.computation ? plantView(state.computation) : null;
  const invalid = new Set((state.error?.issues ?? []).map((i) => i.path));
  for (const i of view?.shuntError?.issues ?? []) invalid.add(i.path);
  res.status(status).render('plant', {
    ...ctx,
    form: state.form,
    view,
    error: state.error,
    notice: state.notice,
    invalid,
    chemistry,
    products: targetProducts(chemistry).map((id) => ({ id, label: PRODUCT_LABELS[id] })),
    coProducts: coProductsOf(chemistry, state.form.product).map((id) => ({ id, label: PRODUCT_LABELS[id] })),
    rateUnits: RATE_UNITS,
    hasStudyCell: ctx.study.cell !== undefined,
    fieldLabels: FIELD_LABELS,
    safetyPanel: safetyPanelFor(ctx.study.chemistry, ctx.link('/safety')),
  });
}

function initialState(study: Study): PageState {
  const section = study.plant as PlantSection | undefined;
  if (!section) return { form: defaultPlantForm(study.chemistry), computation: null, error: null, notice: null };
  const form = formFromSection(section, study.chemistry);
  try {
    return { form, computation: computePlant(section, study), error: null, notice: null };
  } catch (err) {
    const { status, body } = describeError(err);
    if (status >= 500) throw err;
    return { form, computation: null, error: body.error, notice: null };
  }
}

/** Router: plant APIs, the Plant page and the Safety page. */
export function plantSizingRouter(store: StudyStore): Router {
  const r = Router();

  r.post('/api/v1/plant/size', (req, res) => {
    const body = parseBody(sizeRequestSchema, req.body);
    const out = sizeResponse(body);
    assertFiniteTree(out);
    res.json(out);
  });

  r.post('/api/v1/plant/shunt', (req, res) => {
    const body = parseBody(shuntRequestSchema, req.body);
    const out = shuntResponse(body);
    assertFiniteTree(out);
    res.json(out);
  });

  r.get('/plant', (req, res) => {
    const ctx = pageContext(req, store, 'Plant', '/plant');
    const state = initialState(ctx.study);
    if (req.query.saved === '1') state.notice = 'Plant inputs saved to this study.';
    renderPlant(req, res, store, state, state.error ? 400 : 200);
  });

  r.post('/plant', (req, res) => {
    const ctx = pageContext(req, store, 'Plant', '/plant');
    const study = ctx.study;
    const form = readPlantForm(req.body as Record<string, unknown>, study.chemistry);
    const action = typeof req.body?.action === 'string' ? req.body.action : 'compute';
    let computation: PlantComputation;
    try {
      const section = formToSection(form, study, study.plant as PlantSection | undefined);
      computation = computePlant(section, study);
    } catch (err) {
      const { status, body } = describeError(err);
      if (status >= 500) throw err;
      renderPlant(req, res, store, { form, computation: null, error: body.error, notice: null }, status);
      return;
    }
    if (action === 'csv') {
      const view = plantView(computation);
      res.setHeader('Content-Type', 'text/csv; charset=utf-8');
      res.setHeader('Content-Disposition', `attachment; filename="${downloadName(`${study.name} plant sizing`, 'csv')}"`);
      res.send(sizingCsv(computation, view, study.name));
      return;
    }
    if (action === 'csv-shunt') {
      if (!computation.shunt) {
        const message = computation.shuntError?.message ?? computation.shuntNote ?? 'No shunt currents to download.';
        renderPlant(req, res, store, { form, computation, error: { message, issues: computation.shuntError?.issues ?? [{ path: 'circuit0Mode', message }] }, notice: null }, 400);
        return;
      }
      res.setHeader('Content-Type', 'text/csv; charset=utf-8');
      res.setHeader('Content-Disposition', `attachment; filename="${downloadName(`${study.name} shunt currents`, 'csv')}"`);
      res.send(shuntCsv(computation.shunt, study.name));
      return;
    }
    if (computation.shuntError) {
      renderPlant(req, res, store, { form, computation, error: computation.shuntError, notice: null }, 400);
      return;
    }
    if (action === 'save') {
      const updated: Study = { ...study, plant: computation.section };
      const id = store.save(updated, ctx.isExample ? undefined : ctx.studyId);
      res.redirect(303, `/plant?study=${encodeURIComponent(id)}&saved=1`);
      return;
    }
    renderPlant(req, res, store, { form, computation, error: null, notice: null });
  });

  r.use(safetyRouter(store));
  return r;
}
