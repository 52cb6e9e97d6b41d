/**
 * The Costs page (GET/POST /costs), driven in-process with supertest.
 * Expected numbers are worked out here from the inputs (closed form with the textbook CRF).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import { expectClose } from '../helpers/close.js';

const EXAMPLE = 'example-brackwater-pilot';
let dir: string;
let app: ReturnType<typeof createApp>;
beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-costs-page-'));
  app = createApp({ studyDir: dir });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Form fields in the page's units (invented numbers). */
function form(over: Record<string, string> = {}): Record<string, string> {
  return {
    study: EXAMPLE,
    product: 'Cl2',
    cellMode: 'linear',
    u0: '2.35',
    kFactor: '0.1',
    ce: '96',
    price: '60',
    hours: '8000',
    capital: '9000',
    rate: '8',
    life: '10',
    jFrom: '1.5',
    jTo: '8',
    jPoints: '27',
    design: '',
    sensitivity: '20',
    currency: '',
    action: 'compute',
    ...over,
  };
}

/** The number shown in the summary row with this id. */
function summaryValue(html: string, id: string): number {
  const m = new RegExp(`<tr id="${id}"><th>[^<]*</th><td class="num">([^<]+)</td>`).exec(html);
  if (!m) throw new Error(`no summary row ${id}`);
  return Number(m[1].replace(/\u202f/g, ''));
}

/**
 * j* = √(C·CRF/(p·K·H)) in SI with CRF = i(1+i)^n/((1+i)^n − 1) (textbook capital recovery
 * factor), p in per J (per MWh ÷ 3.6e9), K in Ω·m² (V per kA/m² ÷ 1000), H in s/yr.
 */
function closedForm(priceMWh: number, C: number, i: number, n: number, kPerKA: number, hours: number): number {
  const g = (1 + i) ** n;
  const crf = (i * g) / (g - 1);
  return Math.sqrt((C * crf) / ((priceMWh / 3.6e9) * (kPerKA / 1000) * (hours * 3600)));
}

describe('Costs page', () => {
  it('opens the example study filled and computed', async () => {
    const res = await request(app).get(`/costs?study=${EXAMPLE}`);
    expect(res.status).toBe(200);
    expect(res.text).toContain('<h1>Costs</h1>');
    expect(res.text).toMatch(/name="price" value="60"/);
    // Example: 60 per MWh, 9000 per m², 8 %, 10 yr, K 0.10 V per kA/m², 8000 h.
    const jStar = closedForm(60, 9000, 0.08, 10, 0.1, 8000) / 1000; // kA/m²
    expectClose(summaryValue(res.text, 'economic-current-density'), jStar, { rtol: 1e-3 }, 'economic j on the page (4 s.f.)');
    expect(res.text).toContain('id="closed-form-value"');
    expect(res.text).toContain('data-chart=');
    expect(res.text).toContain('id="tornado-table"');
    expect(res.text).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/);
  });

  it('recomputes on POST with new inputs', async () => {
    const res = await request(app).post('/costs').type('form').send(form({ price: '90' }));
    expect(res.status).toBe(200);
    const jStar = closedForm(90, 9000, 0.08, 10, 0.1, 8000) / 1000;
    expectClose(summaryValue(res.text, 'economic-current-density'), jStar, { rtol: 1e-3 }, 'j* at 90 per MWh');
    expect(res.text).toMatch(/name="price" value="90"/);
  });

  it('shows money per tonne rounded half-up to cents', async () => {
    const res = await request(app).post('/costs').type('form').send(form());
    const total = /<tr id="optimum-total"><th>[^<]*<\/th><td class="num">([^<]+)<\/td>/.exec(res.text)![1];
    expect(total).toMatch(/^\d+\.\d{2}$/);
  });

  it('downloads the cost table as CSV', async () => {
    const res = await request(app).post('/costs').type('form').send(form({ action: 'csv' }));
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="costs-.*\.csv"/);
    expect(res.text).toContain('Current density (kA/m²),Cell voltage (V)');
    expect(res.text).toContain('electricity price');
    const rows = res.text.split('\r\n').filter((l) => /^\d/.test(l));
    expect(rows.length).toBeGreaterThanOrEqual(27);
  });

  it('saves to a copy of the example study (303) and reopens it filled', async () => {
    const res = await request(app).post('/costs').type('form').send(form({ action: 'save', price: '75', currency: 'EUR' }));
    expect(res.status).toBe(303);
    const location = res.headers.location as string;
    const id = new URL(location, 'http://x').searchParams.get('study')!;
    expect(id).not.toBe(EXAMPLE);
    const saved = await request(app).get(`/api/v1/studies/${id}`);
    expectClose(saved.body.costs.electricityPrice, 0.075, { rtol: 1e-15 }, 'saved price per kWh');
    expect(saved.body.costs.currency).toBe('EUR');
    expect(saved.body.costs.currentDensities).toHaveLength(27);
    const page = await request(app).get(location);
    expect(page.status).toBe(200);
    expect(page.text).toContain('Cost study saved');
    expect(page.text).toMatch(/name="price" value="75"/);
    expect(page.text).toContain('EUR/t');
    // The example itself is unchanged.
    const example = await request(app).get(`/api/v1/studies/${EXAMPLE}`);
    expectClose(example.body.costs.electricityPrice, 0.06, { rtol: 1e-15 }, 'example untouched');
  });

  it('answers 400 with the field named and the values kept', async () => {
    const res = await request(app).post('/costs').type('form').send(form({ price: '-5', life: '0' }));
    expect(res.status).toBe(400);
    expect(res.text).toContain('class="errorbox"');
    expect(res.text).toContain('Electricity price (per MWh)');
    expect(res.text).toContain('Capital life (years)');
    expect(res.text).toMatch(/name="price" value="-5" aria-invalid="true"/);
    expect(res.text).toMatch(/name="capital" value="9000"/);
    expect(res.text).not.toContain('id="cost-results"');
  });

  it('answers 400 for a current efficiency above 100 %', async () => {
    const res = await request(app).post('/costs').type('form').send(form({ ce: '120' }));
    expect(res.status).toBe(400);
    expect(res.text).toContain('Current efficiency (%)');
  });

  it('refuses the study cell when the study has none, naming the field', async () => {
    const example = await request(app).get(`/api/v1/studies/${EXAMPLE}`);
    const study = { ...example.body, name: 'No cell here (test)' };
    delete study.cell;
    delete study.costs;
    const created = await request(app).post('/api/v1/studies').send(study);
    const id = created.body.id as string;
    const page = await request(app).get(`/costs?study=${id}`);
    expect(page.status).toBe(200);
    expect(page.text).not.toContain('id="cost-results"');
    const res = await request(app).post('/costs').type('form').send(form({ study: id, cellMode: 'study' }));
    expect(res.status).toBe(400);
    expect(res.text).toContain('this study has no cell definition');
  });
});
