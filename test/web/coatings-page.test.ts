/**
 * The Coatings page (GET/POST /coatings), driven in-process with supertest.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import { expectClose } from '../helpers/close.js';
import { chlorAlkaliCell } from '../cell/cells.js';

const EXAMPLE = 'example-brackwater-pilot';
let dir: string;
let app: ReturnType<typeof createApp>;
beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-coatings-page-'));
  app = createApp({ studyDir: dir });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Two plant-data options in the page's units (invented numbers). */
function form(over: Record<string, string> = {}): Record<string, string> {
  const option = (k: number, name: string, u0: string, price: string) => ({
    [`opt${k}_name`]: name,
    [`opt${k}_kind`]: 'linear',
    [`opt${k}_anode`]: 'keep',
    [`opt${k}_cathode`]: 'keep',
    [`opt${k}_u0`]: u0,
    [`opt${k}_kFactor`]: '0.1',
    [`opt${k}_ce`]: '95',
    [`opt${k}_price`]: price,
    [`opt${k}_rise`]: '0',
    [`opt${k}_life`]: '5',
  });
  return {
    study: EXAMPLE,
    count: '2',
    product: 'Cl2',
    jDesign: '5',
    sizeMode: 'area',
    area: '100',
    cells: '',
    cellArea: '',
    production: '',
    price: '50',
    hours: '8000',
    rate: '10',
    currency: '',
    baseline: '0',
    ...option(0, 'Old coating', '2.5', '0'),
    ...option(1, 'New coating', '2.4', '300'),
    action: 'compute',
    ...over,
  };
}

/** Cells of the comparison table row of an option, as text. */
function rowCells(html: string, name: string): string[] {
  const table = /<table class="grid" id="coatings-table">([\s\S]*?)<\/table>/.exec(html)![1];
  const rows = table.split('<tr').filter((r) => r.includes(`>${name}`));
  if (!rows.length) throw new Error(`no row ${name}`);
  return [...rows[0].matchAll(/<td class="num[^"]*">([^<]*)<\/td>/g)].map((m) => m[1].replace(/\u202f/g, '').trim());
}

describe('Coatings page', () => {
  it('opens the example study filled and computed', async () => {
    const res = await request(app).get(`/coatings?study=${EXAMPLE}`);
    expect(res.status).toBe(200);
    expect(res.text).toContain('<h1>Coatings</h1>');
    expect(res.text).toContain('id="coatings-table"');
    expect(res.text).toContain('Anode B + plain Ni D');
    expect(res.text).toContain('Anode A + activated Ni C');
    expect(res.text).toContain('id="npv-chart"');
    expect(res.text).toContain('id="voltage-chart"');
    expect(res.text).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/);
  });

  it('recomputes on POST: NPV and payback of a constant saving as worked by hand', async () => {
    const res = await request(app).post('/coatings').type('form').send(form());
    expect(res.status).toBe(200);
    // Equal CE ⇒ equal current 5 kA/m² × 100 m² = 5e5 A; 0.1 V less saves 0.1 × 5e5 A × 8000 h
    // = 4e5 kWh = 400 MWh a year, × 0.05 per kWh = 20 000 a year. NPV over 5 yr at 10 %:
    // 20 000 × (1 − 1.1^−5)/0.1 − 300 × 100 = 45 815.74 (hand, Python decimal); payback 1.5 yr.
    const cells = rowCells(res.text, 'New coating');
    // Columns: U start, U avg, w, MWh/yr, ΔMWh/yr, energy cost, saving, capital, payback, NPV, life.
    expect(cells[4]).toBe('-400');
    expect(cells[6]).toBe('20000.00');
    expect(cells[7]).toBe('30000.00');
    expect(cells[8]).toBe('1.5');
    expect(cells[9]).toBe('45815.74');
    // Baseline annual energy: 3.0 V × 5e5 A × 8000 h = 12 000 MWh.
    expectClose(Number(rowCells(res.text, 'Old coating')[3]), 12000, { rtol: 1e-9 }, 'MWh/yr');
  });

  it('downloads the comparison as CSV', async () => {
    const res = await request(app).post('/coatings').type('form').send(form({ action: 'csv' }));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="coatings-.*\.csv"/);
    expect(res.text).toContain('NPV vs baseline');
    expect(res.text).toContain('New coating,,');
    expect(res.text).toContain('45815.74');
  });

  it('keeps a formula-like option name harmless in the CSV', async () => {
    const res = await request(app).post('/coatings').type('form').send(form({ action: 'csv', opt1_name: '=HYPERLINK("x")' }));
    expect(res.status).toBe(200);
    expect(res.text).toContain(`"'=HYPERLINK(""x"")"`);
  });

  it('saves to a copy of the example study (303)', async () => {
    const res = await request(app).post('/coatings').type('form').send(form({ action: 'save', opt1_rise: '5' }));
    expect(res.status).toBe(303);
    const id = new URL(res.headers.location as string, 'http://x').searchParams.get('study')!;
    expect(id).not.toBe(EXAMPLE);
    const saved = await request(app).get(`/api/v1/studies/${id}`);
    expect(saved.body.coatings.options).toHaveLength(2);
    expectClose(saved.body.coatings.options[1].voltageRisePerYear, 0.005, { rtol: 1e-15 }, 'mV/yr → V/yr');
    expectClose(saved.body.coatings.electricityPrice, 0.05, { rtol: 1e-15 }, 'per MWh → per kWh');
    const page = await request(app).get(res.headers.location as string);
    expect(page.status).toBe(200);
    expect(page.text).toContain('Coating comparison saved');
    expect(page.text).toContain('New coating');
  });

  it('answers 400 naming the option field, with the values kept', async () => {
    const res = await request(app).post('/coatings').type('form').send(form({ opt1_life: '0', opt0_price: '-1' }));
    expect(res.status).toBe(400);
    expect(res.text).toContain('Option 2 · coating life (years)');
    expect(res.text).toContain('Option 1 · coating price (per m²)');
    expect(res.text).toMatch(/name="opt1_life" value="0"[^>]*aria-invalid="true"/);
    expect(res.text).toMatch(/name="opt1_name" maxlength="80" value="New coating"/);
  });

  it('adds option columns (2 → 3) without computing', async () => {
    const res = await request(app).post('/coatings').type('form').send(form({ action: 'resize', resize: '3' }));
    expect(res.status).toBe(200);
    expect(res.text).toContain('name="opt2_name"');
    expect(res.text).toContain('name="count" value="3"');
    expect(res.text).not.toContain('id="coatings-table"');
  });

  it('offers the study’s datasets as electrode swaps and fits them on the fly', async () => {
    const example = await request(app).get(`/api/v1/studies/${EXAMPLE}`);
    const study = { ...example.body, name: 'Coatings with a cell (test)', cell: chlorAlkaliCell([1000, 6000]) };
    delete study.coatings;
    const created = await request(app).post('/api/v1/studies').send(study);
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    const page = await request(app).get(`/coatings?study=${id}`);
    expect(page.status).toBe(200);
    expect(page.text).toContain('value="dataset:cathode-c-88c" selected');
    expect(page.text).not.toContain('id="coatings-table"');
    const body = form({
      study: id,
      opt0_kind: 'swap',
      opt0_cathode: 'dataset:cathode-d-88c',
      opt1_kind: 'swap',
      opt1_cathode: 'dataset:cathode-c-88c',
    });
    const res = await request(app).post('/coatings').type('form').send(body);
    expect(res.status).toBe(200);
    expect(res.text).toContain('id="kinetics-used"');
    expect(res.text).toContain('Tafel fit of “Cathode C (activated Ni), 88 °C”');
    // Activated nickel (lower overpotential) beats plain nickel: positive NPV.
    const npv = Number(rowCells(res.text, 'New coating')[9]);
    expect(npv).toBeGreaterThan(0);
  });
});
