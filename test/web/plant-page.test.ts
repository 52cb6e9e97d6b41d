/**
 * The Plant page: renders the example's plant, recomputes on POST, keeps values on a 400,
 * answers CSV downloads as attachments, and saves to a study (303 to the copy).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import type { Study } from '../../server/scenario/schema.js';
import type { PlantSection } from '../../server/scenario/plant-sections.js';
import { formFromSection, type PlantForm } from '../../server/web/plant-view.js';
import { linearCell } from '../cell/cells.js';
import { expectClose } from '../helpers/close.js';

const EXAMPLE = 'example-brackwater-pilot';
let dir: string;
let app: ReturnType<typeof createApp>;
let example: Study;

beforeAll(async () => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-plant-page-'));
  app = createApp({ studyDir: dir });
  example = (await request(app).get(`/api/v1/studies/${EXAMPLE}`)).body as Study;
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** The posted fields of a form (flat names, as the page's <form> sends them). */
function fields(form: PlantForm, study = EXAMPLE, patch: Record<string, string> = {}): Record<string, string> {
  const out: Record<string, string> = {
    study,
    product: form.product,
    productionRate: form.productionRate,
    rateUnit: form.rateUnit,
    currentDensity: form.currentDensity,
    cellArea: form.cellArea,
    cellSource: form.cellSource,
    intercept: form.intercept,
    kFactor: form.kFactor,
    currentEfficiency: form.currentEfficiency,
    rectifierVoltage: form.rectifierVoltage,
    rectifierCurrent: form.rectifierCurrent,
    rectifierEfficiency: form.rectifierEfficiency,
    shuntCells: form.shuntCells,
  };
  for (const [id, v] of Object.entries(form.coProductCe)) out[`coCe_${id}`] = v ?? '';
  form.circuits.forEach((c, i) => {
    out[`circuit${i}Name`] = c.name;
    out[`circuit${i}Mode`] = c.mode;
    out[`circuit${i}ChannelR`] = c.channelResistance;
    out[`circuit${i}ManifoldR`] = c.manifoldResistance;
    out[`circuit${i}Conductivity`] = c.conductivity;
    out[`circuit${i}ChannelLength`] = c.channelLength;
    out[`circuit${i}ChannelArea`] = c.channelArea;
    out[`circuit${i}ManifoldLength`] = c.manifoldLength;
    out[`circuit${i}ManifoldArea`] = c.manifoldArea;
  });
  return { ...out, ...patch };
}

function exampleFields(patch: Record<string, string> = {}): Record<string, string> {
  return fields(formFromSection(example.plant as PlantSection, example.chemistry), EXAMPLE, patch);
}

/** The number shown in the sizing table row labelled `label` (or starting with it, when `prefix`). */
function tableValue(html: string, label: string, prefix = false): number {
  const escaped = label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  const m = html.match(new RegExp(`<td>${escaped}${prefix ? '[^<]*' : ''}</td><td class="num">([^<]+)</td>`));
  if (!m) throw new Error(`row "${label}" not found`);
  return Number(m[1].replace(/,/g, ''));
}

/*
 * Hand calculation for the example (300 t/day Cl2, CE 96 %, 5.5 kA/m², 2.7 m² cells):
 * 300 t/d = 12 500 kg/h; / 1.32269 kg/kA·h (check-values §8) = 9450.5 kA at CE 1; / 0.96 =
 * 9844.3 kA; / 5.5 kA/m² = 1789.9 m²; / 2.7 m² = 662.9 → 663 cells. At 150 t/d: 331.45 → 332.
 * Specific energy at about 2.90 V and 96 %: 2284 kWh/t Cl2 (check-values §8 specific-energy check).
 */
describe('Plant page', () => {
  it('renders the example study filled and computed', async () => {
    const res = await request(app).get('/plant');
    expect(res.status).toBe(200);
    expect(res.text).toContain('id="sizing-table"');
    expect(tableValue(res.text, 'Cells')).toBe(663);
    expectClose(tableValue(res.text, 'Total current needed at design'), 9844.3, { rtol: 2e-5 }, 'total current kA');
    expectClose(tableValue(res.text, 'Specific energy, DC', true), 2284, { rtol: 1e-3 }, 'kWh/t Cl2 at ≈2.9 V, 96 %');
    expect(res.text).toContain('id="design-basis"');
    expect(res.text).toMatch(/Target: 300 t\/d chlorine/);
    expect(res.text).toContain('id="shunt-chart"');
    expect(res.text).toContain('catholyte outlet');
    expect(res.text).toContain('Current-efficiency loss');
    expect(res.text).toContain('licensed engineering practice govern');
    expect(res.text).not.toMatch(/NaN|Infinity/);
    expect(res.text).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/);
  });

  it('recomputes on POST (150 t/day → 332 cells)', async () => {
    const res = await request(app).post('/plant').type('form').send(exampleFields({ productionRate: '150' }));
    expect(res.status).toBe(200);
    expect(tableValue(res.text, 'Cells')).toBe(332);
    expect(res.text).toContain('id="shunt-chart"');
  });

  it('takes the production target in t/year (365 days) and kg/day', async () => {
    const perYear = await request(app).post('/plant').type('form').send(exampleFields({ productionRate: String(300 * 365), rateUnit: 't/year' }));
    expect(perYear.status).toBe(200);
    expect(tableValue(perYear.text, 'Cells')).toBe(663);
    const perDay = await request(app).post('/plant').type('form').send(exampleFields({ productionRate: '300000', rateUnit: 'kg/day' }));
    expect(tableValue(perDay.text, 'Cells')).toBe(663);
  });

  it.each([
    ['zero rate', { productionRate: '0' }, 'productionRate'],
    ['text for a number', { productionRate: 'abc' }, 'productionRate'],
    ['a decimal comma', { currentDensity: '5,5' }, 'currentDensity'],
    ['CE above 100 %', { currentEfficiency: '120' }, 'currentEfficiency'],
    ['rectifier below one cell (14.85 kA)', { rectifierCurrent: '10' }, 'rectifierCurrent'],
    ['rectifier voltage below one cell', { rectifierVoltage: '2' }, 'rectifierVoltage'],
    ['one cell for the shunts', { shuntCells: '1' }, 'shuntCells'],
  ])('keeps the values on a 400 and names the field: %s', async (_name, patch, field) => {
    const res = await request(app).post('/plant').type('form').send(exampleFields(patch));
    expect(res.status).toBe(400);
    expect(res.text).toContain('class="errorbox"');
    expect(res.text).toContain(`<code>${field}</code>`);
    const [key, value] = Object.entries(patch)[0];
    expect(res.text).toContain(`name="${key}" value="${value}"`);
    expect(res.text).toContain('value="catholyte outlet"');
    expect(res.text).toContain('aria-invalid="true"');
  });

  it('a shunt input problem is a 400 that still shows the sizing', async () => {
    const res = await request(app).post('/plant').type('form').send(exampleFields({ circuit0Mode: 'resistance', circuit0ChannelR: '', circuit0ManifoldR: '0.2' }));
    expect(res.status).toBe(400);
    expect(res.text).toContain('<code>circuit0ChannelR</code>');
  });

  it('downloads the sizing table as CSV', async () => {
    const res = await request(app).post('/plant').type('form').send(exampleFields({ action: 'csv' }));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename=".*plant-sizing\.csv"$/);
    expect(res.text).toContain('section,quantity,value,unit');
    expect(res.text).toContain('Cell room as built,Cells,663,cells');
    expect(res.text).toMatch(/Products,chlorine \(Cl₂\) \(target\) mass flow,12500,kg\/h/);
  });

  it('downloads the shunt profile as CSV, one row per cell', async () => {
    const res = await request(app).post('/plant').type('form').send(exampleFields({ action: 'csv-shunt' }));
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename=".*shunt-currents\.csv"$/);
    const lines = res.text.trim().split(/\r\n/);
    expect(lines[1]).toBe('cell,anolyte inlet channel current (A),anolyte outlet channel current (A),catholyte inlet channel current (A),catholyte outlet channel current (A),bypass current (A),cell current (A)');
    expect(lines.length).toBe(2 + 133); // comment, header, 133 cells of the largest electrolyser
    // Antisymmetry of the channel currents about the centre (row 1 vs row 133).
    const first = lines[2].split(',').map(Number);
    const last = lines[lines.length - 1].split(',').map(Number);
    for (let c = 1; c <= 4; c++) expectClose(first[c], -last[c], { rtol: 1e-6 }, `circuit ${c} ends`);
  });

  it('defuses spreadsheet formulas in circuit names in the CSV', async () => {
    const res = await request(app).post('/plant').type('form').send(exampleFields({ circuit0Name: '=SUM(A1)', action: 'csv-shunt' }));
    expect(res.status).toBe(200);
    expect(res.text).toContain("'=SUM(A1) channel current (A)");
    expect(res.text).not.toMatch(/(^|,)=SUM/m);
  });

  it('saves to a copy of the example (303) and opens it filled', async () => {
    const res = await request(app).post('/plant').type('form').send(exampleFields({ productionRate: '150', action: 'save' }));
    expect(res.status).toBe(303);
    const location = res.headers.location as string;
    const id = new URL(location, 'http://x').searchParams.get('study') as string;
    expect(id).not.toBe(EXAMPLE);
    const saved = (await request(app).get(`/api/v1/studies/${id}`)).body as Study;
    expectClose((saved.plant as PlantSection).productionRate, 150_000 / 86_400, { rtol: 1e-12 }, 'saved kg/s');
    expect((saved.plant as PlantSection).shunt?.circuits.length).toBe(4);
    const page = await request(app).get(location);
    expect(page.status).toBe(200);
    expect(page.text).toContain('Plant inputs saved');
    expect(tableValue(page.text, 'Cells')).toBe(332);
    // Saving a saved study keeps its id.
    const again = await request(app).post('/plant').type('form').send({ ...exampleFields({ productionRate: '200', action: 'save' }), study: id });
    expect(again.status).toBe(303);
    expect(again.headers.location).toContain(`study=${id}`);
    // The example itself is unchanged.
    const ex = (await request(app).get(`/api/v1/studies/${EXAMPLE}`)).body as Study;
    expectClose((ex.plant as PlantSection).productionRate, 300_000 / 86_400, { rtol: 1e-12 }, 'example kg/s');
  });

  it('opens a study without a plant section with starting values and no results', async () => {
    const bare = { ...example, name: 'Bare study', plant: undefined };
    const created = await request(app).post('/api/v1/studies').send(bare);
    expect(created.status).toBe(201);
    const res = await request(app).get(`/plant?study=${created.body.id}`);
    expect(res.status).toBe(200);
    expect(res.text).toContain('name="productionRate"');
    expect(res.text).not.toContain('id="sizing-table"');
  });

  it("asks for a cell definition when the study's cell model is chosen but missing", async () => {
    const created = await request(app).post('/api/v1/studies').send({ ...example, name: 'No cell', cell: undefined });
    expect(created.status).toBe(201);
    const res = await request(app).post('/plant').type('form').send({ ...exampleFields({ cellSource: 'study-cell' }), study: created.body.id });
    expect(res.status).toBe(400);
    expect(res.text).toContain('<code>cellSource</code>');
  });

  it("sizes the example with its own cell model when chosen", async () => {
    const res = await request(app).post('/plant').type('form').send(exampleFields({ cellSource: 'study-cell', currentEfficiency: '' }));
    expect(res.status).toBe(200);
    expect(res.text).toContain('id="sizing-table"');
    expect(res.text).toContain('cell model (Cell page)');
    expect(res.text).toContain('id="shunt-chart"');
  });

  it("uses the study's cell model, with dU/dj from the model for the shunt network", async () => {
    // A cell definition equal to U = 2.35 V + 1e-4 Ω·m²·j (ideal electrodes, E_rev set to
    // 2.35 V, one hardware resistance; invented). Its slope gives the cell resistance
    // r = 1e-4 Ω·m² / 2.7 m² = 37.04 µΩ (hand), the same as the plant-data line.
    const cell = {
      ...linearCell('chlor-alkali', 2.35, 1e-4, [1000, 3000, 5500]),
      temperature: 361.15,
      pressure: 1.2e5,
      currentEfficiency: { model: 'constant', value: 0.96 },
    };
    const plant = { ...(example.plant as PlantSection), cellSource: 'study-cell' };
    const created = await request(app).post('/api/v1/studies').send({ ...example, name: 'With a cell', cell, plant });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const res = await request(app).get(`/plant?study=${created.body.id}`);
    expect(res.status).toBe(200);
    expect(tableValue(res.text, 'Cells')).toBe(663);
    const m = res.text.match(/<th>Cell resistance dU\/dI<\/th><td class="num">([^<]+)<\/td>/);
    expect(m).not.toBeNull();
    expectClose(Number(m![1]), 1e-4 / 2.7 / 1e-6, { rtol: 1e-3 }, 'cell resistance µΩ');
  });
});
