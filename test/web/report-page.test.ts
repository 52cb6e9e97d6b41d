/**
 * The Report page (GET /report): every section of the example study, the same figures as the
 * pages they summarise, the safety statement, no inline script, and a study whose stored
 * sections are broken still rendering (200) with each error in its own section.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import { expectClose } from '../helpers/close.js';

let dir: string;
let app: ReturnType<typeof createApp>;
let example: Record<string, unknown>;

const EXAMPLE_ID = 'example-brackwater-pilot';

beforeAll(async () => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-report-'));
  app = createApp({ studyDir: dir });
  example = (await request(app).get(`/api/v1/studies/${EXAMPLE_ID}`)).body as Record<string, unknown>;
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Save a variant of the example study and return its id. */
async function saveVariant(change: (s: Record<string, any>) => void): Promise<string> {
  const s = structuredClone(example) as Record<string, any>;
  change(s);
  const res = await request(app).post('/api/v1/studies').send(s);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.id as string;
}

/** Inner HTML of the element with this id (first match; enough for our flat tables and sections). */
function elementById(html: string, id: string): string {
  const start = html.search(new RegExp(`<(\\w+)[^>]*\\bid="${id}"`));
  expect(start, `#${id} present`).toBeGreaterThanOrEqual(0);
  const tag = /^<(\w+)/.exec(html.slice(start))![1];
  const end = html.indexOf(`</${tag}>`, start);
  return html.slice(start, end);
}

/** Text of the element with this id, tags stripped, spaces collapsed. */
function textById(html: string, id: string): string {
  return elementById(html, id).replace(/<[^>]+>/g, ' ').replace(/\s+/g, ' ').trim();
}

/** Value cell of the first row of a key–value table. */
function firstRowValue(html: string, tableId: string): string {
  const row = /<tr>[\s\S]*?<\/tr>/.exec(elementById(html, tableId))![0];
  const cell = /<td class="num">(?:<strong>)?([^<]*)/.exec(row);
  expect(cell, `value cell in the first row of #${tableId}`).not.toBeNull();
  return cell![1].trim();
}

/** The value cell of the row whose label matches, in a table. */
function rowValue(html: string, tableId: string, label: RegExp): string {
  const rows = elementById(html, tableId).match(/<tr[\s\S]*?<\/tr>/g) ?? [];
  const row = rows.find((r) => label.test(r.replace(/<[^>]+>/g, ' ')));
  expect(row, `row ${label} in #${tableId}`).toBeDefined();
  return /<td class="num">(?:<strong>)?([^<]*)/.exec(row!)![1].trim();
}

/** The report section (from its heading to the next section) as text. */
function sectionText(html: string, headingId: string): string {
  const start = html.indexOf(`id="${headingId}"`);
  expect(start, headingId).toBeGreaterThan(0);
  const next = html.indexOf('<section class="report-section"', start);
  return html.slice(start, next < 0 ? undefined : next).replace(/<[^>]+>/g, ' ').replace(/\s+/g, ' ');
}

/** A number printed with optional thin-space digit groups. */
function num(text: string): number {
  return Number(text.replace(/[\s\u202f]/g, ''));
}

describe('Report page of the example study', () => {
  let html: string;
  beforeAll(async () => {
    const res = await request(app).get(`/report?study=${EXAMPLE_ID}`);
    expect(res.status).toBe(200);
    html = res.text;
  });

  it('has every section heading, in order, and a link to each page', () => {
    const titles = ['Study', 'Kinetics', 'Cell', 'Plant', 'Coatings', 'Costs', 'Safety', 'Assumptions and sources'];
    const ids = ['report-study', 'report-kinetics', 'report-cell', 'report-plant', 'report-coatings', 'report-costs', 'report-safety', 'report-assumptions'];
    let last = -1;
    titles.forEach((title, i) => {
      const m = new RegExp(`<h2 id="${ids[i]}">${i + 1}\\. ${title}</h2>`).exec(html);
      expect(m, title).not.toBeNull();
      expect(m!.index).toBeGreaterThan(last);
      last = m!.index;
    });
    for (const page of ['kinetics', 'cell', 'plant', 'coatings', 'costs', 'safety']) {
      expect(html).toContain(`href="/${page}?study=${EXAMPLE_ID}"`);
    }
    expect(html).toContain(`href="/report?study=${EXAMPLE_ID}" class="active"`); // nav entry
    expect(html).not.toContain('Not computed');
  });

  it('names the study, its synthetic data, the date it was made and the program version', () => {
    const version = (JSON.parse(readFileSync(path.resolve('package.json'), 'utf8')) as { version: string }).version;
    expect(textById(html, 'report-version')).toBe(version);
    const study = textById(html, 'report-study-table');
    expect(study).toContain('Brackwater Bay pilot line (fictional)');
    expect(study).toContain('Chlor-alkali');
    expect(study).toMatch(/Report made \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC/);
    expect(study).toMatch(/Temperature 88\.0 °C/); // 361.15 K in the study file
    expect(textById(html, 'report-synthetic')).toMatch(/synthetic/);
    expect(textById(html, 'report-datasets')).toContain('Anode coating A, 88 °C');
  });

  it('shows the same design-point cell voltage as the Cell page, and the K-factor with U0 and R²', async () => {
    const cellPage = await request(app).get(`/cell?study=${EXAMPLE_ID}`);
    expect(cellPage.status).toBe(200);
    const onCellPage = firstRowValue(cellPage.text, 'design-table');
    const inReport = firstRowValue(html, 'report-design');
    expect(inReport).toBe(onCellPage); // the same displayed text, from the same computation
    // check-values §9a (handbook, from memory, low confidence): ≈ 2.9–3.2 V at 5–6 kA/m² for
    // modern zero-gap cells; the example's design point is 5.5 kA/m².
    expect(num(inReport)).toBeGreaterThan(2.9);
    expect(num(inReport)).toBeLessThan(3.2);
    const k = textById(html, 'report-kfactor');
    expect(k).toMatch(/K-factor [\d.]+ V per kA\/m²/);
    expect(k).toContain('Intercept U0');
    expect(k).toContain('R²');
    // check-values §9a (from memory, low confidence): K ≈ 0.08–0.12 V per kA/m² for zero-gap cells.
    const kValue = num(rowValue(html, 'report-kfactor', /K-factor/));
    expect(kValue).toBeGreaterThan(0.08);
    expect(kValue).toBeLessThan(0.12);
    // The breakdown ends with U itself (identity: the parts add to the cell voltage, in mV).
    const rows = elementById(html, 'report-breakdown').match(/<tr[^>]*>[\s\S]*?<\/tr>/g)!.slice(1);
    const mv = rows.map((r) => num(/<td class="num">([^<]*)/.exec(r)![1]));
    const total = mv.pop()!;
    expectClose(mv.reduce((a, b) => a + b, 0), total, { atol: 0.05 * mv.length }, 'breakdown sum (mV, each rounded to 0.1)');
    expectClose(total / 1000, num(inReport), { atol: 5e-4 }, 'U in the breakdown vs the design table');
    expect(html).toMatch(/<canvas class="chart" id="report-chart-voltage"[^>]*data-chart="\{/);
  });

  it('sizes the plant as the Plant page does, with Faraday’s law behind the total current', async () => {
    const total = num(rowValue(html, 'report-sizing', /Total current needed at design/));
    // check-values §8 (derived, Faraday’s law): 1.32269 kg Cl₂ per kA·h at 100 % CE, so
    // 300 t/d at 96 % CE needs 300 000 kg / 24 h / 1.32269 kg/(kA·h) / 0.96 = 9844.2 kA.
    expectClose(total, 300_000 / 24 / 1.32269 / 0.96, { rtol: 2e-5 }, 'total current (kA)');
    const plantPage = await request(app).get(`/plant?study=${EXAMPLE_ID}`);
    const loss = (page: string, id: string) => rowValue(page, id, /Current-efficiency loss/);
    expect(loss(html, 'report-shunt')).toBe(loss(plantPage.text, 'shunt-summary'));
    expect(textById(html, 'report-design-basis')).toMatch(/^Design basis/);
  });

  it('shows the coating comparison and the cost study as their pages do', async () => {
    const coatings = textById(html, 'report-coatings-table');
    for (const name of ['Anode B + plain Ni D', 'Anode B + activated Ni C', 'Anode A + plain Ni D', 'Anode A + activated Ni C']) expect(coatings).toContain(name);
    expect(coatings).toContain('baseline');
    const costsPage = await request(app).get(`/costs?study=${EXAMPLE_ID}`);
    const eco = (page: string, id: string) => /<td class="num">([^<]*)/.exec(elementById(page, id))![1];
    expect(eco(html, 'report-economic-current-density')).toBe(eco(costsPage.text, 'economic-current-density'));
    expect(eco(html, 'report-design-total')).toBe(eco(costsPage.text, 'design-total'));
    expect(textById(html, 'report-tornado')).toContain('electricity price');
  });

  it('states that local codes, standards and licensed engineering practice govern, beside the checks and figures', () => {
    const safety = sectionText(html, 'report-safety');
    expect(textById(html, 'report-disclaimer')).toContain('Local codes, standards, permits and licensed engineering practice govern');
    expect(textById(html, 'report-checks')).toMatch(/Hydrogen in chlorine at the operating point/);
    expect(elementById(html, 'report-checks')).toMatch(/data-level="(ok|caution|alarm)"/);
    // Caution headline figures carry their sources (check-values §10: H₂ in Cl₂ explosive range, Euro Chlor GEST 91/168).
    expect(safety).toContain('Euro Chlor GEST 91/168');
    const notes = textById(html, 'report-notes');
    expect(notes).toContain('design-study estimates');
  });

  it('collects the warnings of the sections under Assumptions and sources', () => {
    const a = sectionText(html, 'report-assumptions');
    expect(a).toContain('Warnings from the sections');
    expect(a).toMatch(/Cell .*Pitzer/); // the cell's activity-model warnings
    expect(a).toMatch(/Plant .*do not divide evenly/);
  });

  it('has no inline scripts or inline styles, and keeps the strict CSP', async () => {
    const res = await request(app).get('/report');
    expect(res.status).toBe(200);
    expect(res.headers['content-security-policy']).toContain("script-src 'self'");
    expect(res.text).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/);
    expect(res.text).not.toMatch(/\son[a-z]+="/i); // no inline event handlers
    expect(res.text).not.toMatch(/\sstyle="/i);
    expect(res.text).not.toMatch(/<form\b/); // nothing to submit: the report is read-only
  });
});

describe('Report page of other studies', () => {
  it('shows a broken stored section’s error in place and renders the rest (200)', async () => {
    const id = await saveVariant((s) => {
      s.name = 'Broken sections';
      // A limiting current below the sweep's current densities: no physical solution (PhysicsError).
      s.cell.anode.limitingCurrentDensity = 3000;
      // A coating option naming a dataset the study lacks (InputError).
      s.coatings.options[1].anode = { dataset: 'no-such-dataset' };
    });
    const res = await request(app).get(`/report?study=${id}`);
    expect(res.status).toBe(200);
    const cell = sectionText(res.text, 'report-cell');
    expect(cell).toContain('Not computed: Cell');
    expect(cell).toMatch(/anode limiting current density/);
    const coatings = sectionText(res.text, 'report-coatings');
    expect(coatings).toContain('Not computed: Coatings');
    expect(coatings).toContain('the study has no dataset &#34;no-such-dataset&#34;');
    // The other sections still computed.
    expect(textById(res.text, 'report-sizing')).toContain('Total current needed at design');
    expect(textById(res.text, 'report-tornado')).toContain('electricity price');
    expect(textById(res.text, 'report-checks')).toContain('limiting current');
    expect(textById(res.text, 'report-disclaimer')).toContain('licensed engineering practice govern');
    const failures = textById(res.text, 'report-failures');
    expect(failures).toMatch(/Cell\s*:/);
    expect(failures).toMatch(/Coatings\s*:/);
  });

  it('leaves out the sections a study has no input for, and names them', async () => {
    const id = await saveVariant((s) => {
      s.name = 'Bare study';
      s.description = '';
      s.synthetic = false;
      s.datasets = [];
      s.fits = [];
      delete s.cell;
      delete s.plant;
      delete s.coatings;
      delete s.costs;
    });
    const res = await request(app).get(`/report?study=${id}`);
    expect(res.status).toBe(200);
    expect(res.text).toMatch(/<h2 id="report-study">1\. Study<\/h2>/);
    expect(res.text).toMatch(/<h2 id="report-safety">2\. Safety<\/h2>/);
    expect(res.text).toMatch(/<h2 id="report-assumptions">3\. Assumptions and sources<\/h2>/);
    for (const gone of ['report-kinetics', 'report-cell', 'report-plant', 'report-coatings', 'report-costs']) expect(res.text).not.toContain(`id="${gone}"`);
    expect(res.text).not.toContain('id="report-synthetic"');
    const toc = res.text.replace(/<[^>]+>/g, ' ').replace(/\s+/g, ' ');
    expect(toc).toContain('Not in this study: Kinetics (no datasets or saved fits); Cell (no cell definition saved)');
    // The boiling-point screen needs only the operating conditions, so the safety section computes.
    expect(textById(res.text, 'report-checks')).toContain('boiling point');
    expect(textById(res.text, 'report-disclaimer')).toContain('licensed engineering practice govern');
  });

  it('lists saved fits with j0, its 95 % interval, the Tafel slope, α and the temperature', async () => {
    const id = await saveVariant((s) => {
      s.name = 'With a saved fit';
      // Invented fit record (SI): j0 in A/m², Tafel slope in V/decade, temperature in K.
      s.fits = [
        {
          id: 'anode-fit-1',
          name: 'Coating A at 88 °C, Tafel',
          datasetId: 'anode-a-88c',
          electrode: 'anode',
          model: 'tafel',
          temperature: 361.15,
          parameters: {
            exchangeCurrentDensity: { value: 11.57, standardError: 1.3, ci95: [9.21, 14.52], unit: 'A/m²' },
            tafelSlope: { value: 0.03592, standardError: 0.0007, ci95: [0.0345, 0.0373], unit: 'V/decade' },
            transferCoefficient: { value: 1.995, standardError: 0.04, ci95: [1.91, 2.08], unit: '' },
          },
        },
      ];
    });
    const res = await request(app).get(`/report?study=${id}`);
    expect(res.status).toBe(200);
    const row = textById(res.text, 'report-fits');
    expect(row).toContain('Coating A at 88 °C, Tafel anode Tafel 11.57 9.21 … 14.52 35.92 1.995 88');
  });

  it('answers an unknown study with a 400 page, not a 500', async () => {
    const res = await request(app).get('/report?study=no-such-study').set('Accept', 'text/html');
    expect(res.status).toBe(400);
    expect(res.text).toContain('no study with id');
  });
});
