/**
 * The Cell page (GET/POST /cell, works without JavaScript) and its form ↔ SI mapping.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import { fitKinetics, fitTafel } from '../../server/core/kinetics/index.js';
import { cellSectionSchema } from '../../server/scenario/cell-section.js';
import { savedFitSchema } from '../../server/scenario/schema.js';
import { parseStudyText } from '../../server/scenario/store.js';
import { alphaFromSlope, buildCell, formFromSection, kineticsFromFit, readForm } from '../../server/web/cell-form.js';
import { savedFitRecord } from '../../server/web/kinetics-view.js';
import { exampleCell } from '../../scripts/example-cell.js';
import { expectClose } from '../helpers/close.js';
import { formFields as formFieldsOf, unescapeHtml } from '../helpers/web.js';

const EXAMPLE_ID = 'example-brackwater-pilot';
const exampleStudy = parseStudyText(readFileSync(path.resolve('scenarios/brackwater-pilot.study.json'), 'utf8'));

/** Overpotentials as measured of an example dataset (E − E_eq for electrode potentials). */
function datasetPoints(id: string) {
  const d = exampleStudy.datasets.find((x) => x.id === id)!;
  const eq = d.potentialKind === 'electrode' ? d.equilibriumPotential! : 0;
  return { d, pts: d.points.map((p) => ({ currentDensity: p.currentDensity, overpotential: p.potential - eq })) };
}

let dir: string;
let app: ReturnType<typeof createApp>;

beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-cell-page-'));
  app = createApp({ studyDir: dir });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

// ---------------------------------------------------------------------------------------------
// Small HTML helpers for our own markup (no DOM library is installed).

/** The fields a browser would post from the page's cell form. */
function formFields(html: string): Record<string, string> {
  return formFieldsOf(html, 'cell-form');
}

/** Rows of the design breakdown table: label → mV. */
function breakdownMv(html: string): Record<string, number> {
  const table = /<table class="grid" id="design-breakdown"[\s\S]*?<\/table>/.exec(html)?.[0] ?? '';
  const out: Record<string, number> = {};
  for (const m of table.matchAll(/<tr><td>(?:<strong>)?([^<]+)(?:<\/strong>)?<\/td><td class="num">([-\d.]+)<\/td>/g)) out[m[1]] = Number(m[2]);
  return out;
}

function charts(html: string): Array<{ data: { datasets: Array<{ label: string; data: Array<{ x: number; y: number }> }> } }> {
  return [...html.matchAll(/<canvas class="chart"[^>]*data-chart="([^"]*)"/g)].map((m) => JSON.parse(unescapeHtml(m[1])));
}

async function postForm(fields: Record<string, string>) {
  return request(app).post('/cell').type('form').send(fields);
}

async function examplePageFields(): Promise<Record<string, string>> {
  const res = await request(app).get(`/cell?study=${EXAMPLE_ID}`);
  expect(res.status).toBe(200);
  return formFields(res.text);
}

// ---------------------------------------------------------------------------------------------

describe('Cell page', () => {
  it('opens the example with its cell filled in and computed', async () => {
    const res = await request(app).get('/cell');
    expect(res.status).toBe(200);
    const html = res.text;
    expect(html).toContain('Voltage balance at the design point, 5.5 kA/m²');
    const mv = breakdownMv(html);
    // check-values.md §9a (from memory, low confidence): ≈ 2.9–3.2 V at 5–6 kA/m².
    expect(mv['Cell voltage U']).toBeGreaterThan(2900);
    expect(mv['Cell voltage U']).toBeLessThan(3200);
    // Identity: the printed parts add up to the printed U (each rounded to 0.1 mV).
    const parts = Object.entries(mv).filter(([k]) => k !== 'Cell voltage U').map(([, v]) => v);
    expectClose(parts.reduce((a, b) => a + b, 0), mv['Cell voltage U'], { atol: 0.05 * parts.length }, 'parts sum to U');
    // Hardware 0.05 Ω·cm² × 5.5 kA/m² = 5e-6 Ω·m² × 5500 A/m² = 27.5 mV (Ohm's law).
    expectClose(mv['Hardware j·R_hw'], 27.5, { atol: 0.051 }, 'hardware drop');
    // Form filled from the study's cell.
    const f = formFields(html);
    // The example's kinetics come from Tafel fits made when the example is generated
    // (scripts/example-cell.ts); the form shows them as stored.
    const exampleKinetics = exampleCell().cell as { anode: { kinetics: { transferCoefficient: number } }; cathode: { kinetics: { exchangeCurrentDensity: number } } };
    expect(Number(f['anode.alpha'])).toBe(exampleKinetics.anode.kinetics.transferCoefficient);
    expect(Number(f['cathode.j0'])).toBe(exampleKinetics.cathode.kinetics.exchangeCurrentDensity);
    expect(f['membrane.asr']).toBe('0.55');
    expect(f['ce.model']).toBe('parasitic');
    expect(f['band']).toBe('on');
    // Charts carry whole Chart.js configurations.
    const [voltage, efficiency] = charts(html);
    const labels = voltage.data.datasets.map((d) => d.label);
    for (const l of ['Reversible voltage', 'Anode overpotential', 'Cathode overpotential', 'Membrane', 'Electrolyte gaps', 'Hardware', 'Cell voltage U', '95 % band (upper)']) {
      expect(labels).toContain(l);
    }
    expect(voltage.data.datasets.find((d) => d.label === 'Cell voltage U')!.data.length).toBe(14);
    expect(efficiency.data.datasets.map((d) => d.label).join('|')).toMatch(/Specific energy Cl₂, DC/);
    expect(html).toMatch(/kWh\/t/);
    expect(html).toContain('id="kfactor-table"');
    expect(html).toContain('Chlorine is a toxic gas');
    expect(html).toContain('licensed engineering practice govern');
    // No inline scripts (strict CSP; the page works with JavaScript off).
    expect(html).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/);
  });

  it('recomputes on POST: +0.5 Ω·cm² hardware adds 275 mV at 5.5 kA/m²', async () => {
    const fields = await examplePageFields();
    const before = breakdownMv((await postForm(fields)).text);
    const res = await postForm({ ...fields, hardware: '0.55' });
    expect(res.status).toBe(200);
    const after = breakdownMv(res.text);
    // Ohm's law: ΔU = ΔR·j = 0.5e-4 Ω·m² × 5500 A/m² = 0.275 V.
    expectClose(after['Hardware j·R_hw'], 302.5, { atol: 0.051 }, 'hardware drop');
    expectClose(after['Cell voltage U'] - before['Cell voltage U'], 275, { atol: 0.11 }, 'ΔU');
    expect(formFields(res.text).hardware).toBe('0.55');
  });

  it('takes kinetics from the study datasets, fitted on the fly', async () => {
    const fields = await examplePageFields();
    const res = await postForm({
      ...fields,
      'anode.source': 'dataset',
      'anode.dataset': 'anode-a-88c',
      'cathode.source': 'dataset',
      'cathode.dataset': 'cathode-c-88c',
    });
    expect(res.status).toBe(200);
    const html = unescapeHtml(res.text);
    expect(html).toContain('Tafel fit of dataset "Anode coating A, 88 °C"');
    expect(html).toContain('Tafel fit of dataset "Cathode C (activated Ni), 88 °C"');
    const mv = breakdownMv(res.text);
    expect(mv['Cell voltage U']).toBeGreaterThan(2900);
    expect(mv['Cell voltage U']).toBeLessThan(3200);
  });

  it('a dataset of the wrong electrode is an input problem on that field', async () => {
    const fields = await examplePageFields();
    const res = await postForm({ ...fields, 'anode.source': 'dataset', 'anode.dataset': 'cathode-c-88c' });
    expect(res.status).toBe(400);
    expect(res.text).toContain('Input problem');
    expect(unescapeHtml(res.text)).toMatch(/Anode: dataset<\/strong>: "Cathode C \(activated Ni\), 88 °C" is a cathode dataset/);
    expect(res.text).toMatch(/<select name="anode\.dataset" aria-label="[^"]*" aria-invalid="true">/);
  });

  it('form problems name the field: void fraction 1, a non-number, an empty sweep range', async () => {
    const fields = await examplePageFields();
    const res = await postForm({ ...fields, 'gap1.voidFraction': '1', temperatureC: 'warm', jMax: '0.2' });
    expect(res.status).toBe(400);
    const html = unescapeHtml(res.text);
    expect(html).toContain('Gap 1: void fraction</strong>: must be < 1');
    expect(html).toContain('Temperature</strong>: "warm" is not a number');
    expect(html).toContain('Highest current density</strong>: must be above the lowest current density');
    expect(res.text).toMatch(/name="gap1\.voidFraction" value="1" aria-label="[^"]*" aria-invalid="true"/);
    // The form keeps what was typed.
    expect(formFields(res.text).temperatureC).toBe('warm');
  });

  it('physics problems from the core are mapped back to form fields', async () => {
    const fields = await examplePageFields();
    const res = await postForm({ ...fields, 'cathode.limitingCurrent': '8', jDesign: '9', jMax: '7' });
    expect(res.status).toBe(400);
    const html = unescapeHtml(res.text);
    expect(html).toMatch(/Design current density<\/strong>: j = 9000 A\/m² is at or above the cathode limiting current density/);
    expect(html).toContain('(<code>designCurrentDensity</code>)');
    const hot = await postForm({ ...fields, temperatureC: '120' });
    expect(hot.status).toBe(400);
    expect(unescapeHtml(hot.text)).toMatch(/Temperature<\/strong>: .*outside the .* validity range/);
  });

  it('downloads the sweep as CSV', async () => {
    const fields = await examplePageFields();
    const res = await postForm({ ...fields, action: 'csv' });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="brackwater-bay-pilot-line-fictional-cell-sweep\.csv"/);
    const lines = res.text.trim().split('\r\n');
    expect(lines[0]).toMatch(/^# Cell sweep: Brackwater Bay pilot line/);
    const header = lines[1].split(',');
    expect(header[0]).toBe('current density [kA/m2]');
    expect(header).toContain('cell voltage [V]');
    expect(header).toContain('specific energy Cl2 AC [kWh/t]');
    const rows = lines.slice(2).map((l) => l.split(',').map(Number));
    expect(rows.length).toBe(14);
    expectClose(rows[0][0], 0.5, { rtol: 1e-12 }, 'first j');
    expectClose(rows[13][0], 7, { rtol: 1e-12 }, 'last j');
    // Same numbers as the JSON API for the same cell (the page and the API share the core).
    const api = await request(app).post('/api/v1/cell/sweep').send(exampleCell().cell);
    const iU = header.indexOf('cell voltage [V]');
    rows.forEach((r, i) => expectClose(r[iU], api.body.points[i].cellVoltage, { rtol: 1e-9 }, `U row ${i}`));
    for (const r of rows) expect(r.every(Number.isFinite)).toBe(true);
  });

  it('saves the cell into a copy of the read-only example (303), then into the copy itself', async () => {
    const fields = await examplePageFields();
    const res = await postForm({ ...fields, hardware: '0.07', action: 'save' });
    expect(res.status).toBe(303);
    const location = res.headers.location as string;
    const url = new URL(location, 'http://x');
    expect(url.pathname).toBe('/cell');
    expect(url.searchParams.get('saved')).toBe('copy');
    const id = url.searchParams.get('study')!;
    expect(id).not.toBe(EXAMPLE_ID);
    const saved = await request(app).get(`/api/v1/studies/${id}`);
    expect(saved.status).toBe(200);
    expectClose(saved.body.cell.ohmic.hardware, 0.07e-4, { rtol: 1e-12 }, 'saved hardware Ω·m²');
    expect(saved.body.cell.currentDensities.length).toBe(14);
    expect(saved.body.cell.uncertainty).toEqual({ samples: 2000, seed: 42 });
    // The example is unchanged.
    const example = await request(app).get(`/api/v1/studies/${EXAMPLE_ID}`);
    expectClose(example.body.cell.ohmic.hardware, 0.05e-4, { rtol: 1e-12 }, 'example hardware');
    // The copy opens with the saved cell and a notice.
    const page = await request(app).get(location);
    expect(page.status).toBe(200);
    expect(page.text).toContain('saved into a new copy');
    expect(formFields(page.text).hardware).toBe('0.07');
    // Saving a saved study keeps its id.
    const again = await postForm({ ...formFields(page.text), hardware: '0.08', action: 'save' });
    expect(again.status).toBe(303);
    const url2 = new URL(again.headers.location as string, 'http://x');
    expect(url2.searchParams.get('study')).toBe(id);
    expect(url2.searchParams.get('saved')).toBe('1');
  });

  it('a study without a cell opens with starting values fitted from its datasets', async () => {
    const { cell: _cell, ...rest } = exampleStudy;
    void _cell;
    const created = await request(app).post('/api/v1/studies').send({ ...rest, name: 'No cell yet (test)' });
    expect(created.status).toBe(201);
    const res = await request(app).get(`/cell?study=${created.body.id}`);
    expect(res.status).toBe(200);
    expect(res.text).toContain('no cell yet');
    const f = formFields(res.text);
    expect(f['anode.source']).toBe('dataset');
    expect(f['anode.dataset']).toBe('anode-a-88c'); // the anode dataset nearest the 88 °C operating temperature
    expect(f['cathode.source']).toBe('dataset');
    expect(res.text).toContain('id="design-table"');
  });

  it('uses a kinetic fit saved in the study', async () => {
    const { d, pts } = datasetPoints('anode-a-88c');
    const r = fitKinetics({ points: pts, model: 'tafel', temperature: d.temperature, window: 'auto', uncompensatedResistance: d.uncompensatedResistance ?? 0, branch: 'anodic' });
    // The record the Kinetics page saves (same function), with a fixed id for the test.
    const fit = { ...savedFitRecord(r, { name: 'Coating A at 88 °C (Tafel)', datasetId: d.id, electrode: 'anode', temperature: d.temperature }), id: 'anode-a-88c-tafel' };
    expect(fit.correlation?.names).toEqual(['lnExchangeCurrentDensity', 'transferCoefficient']);
    const created = await request(app).post('/api/v1/studies').send({ ...exampleStudy, name: 'With a saved fit (test)', fits: [fit] });
    expect(created.status).toBe(201);
    const page = await request(app).get(`/cell?study=${created.body.id}`);
    const fields = formFields(page.text);
    const res = await postForm({ ...fields, 'anode.source': 'fit', 'anode.fit': fit.id });
    expect(res.status).toBe(200);
    expect(unescapeHtml(res.text)).toContain('Saved Tafel fit "Coating A at 88 °C (Tafel)"');
    // The kinetics table shows the fit's α and a correlation for the band.
    const row = /<tr>\s*<td>Anode<\/td>[\s\S]*?<\/tr>/.exec(res.text)![0];
    const cells = [...row.matchAll(/<td class="num">([^<]*)<\/td>/g)].map((m) => m[1]);
    expectClose(Number(cells[0]), r.parameters.transferCoefficient!.value, { rtol: 5e-4 }, 'α shown (4 significant digits)');
    expect(Number(cells[cells.length - 1])).toBeLessThan(-0.9);
  });

  it('accepts a Tafel fit saved with the older (a, b) correlation, without uncertainty and with a note', async () => {
    const { d, pts } = datasetPoints('anode-a-88c');
    const t = fitTafel(pts, { temperature: d.temperature, window: 'auto', uncompensatedResistance: d.uncompensatedResistance ?? 0, branch: 'anodic' });
    const param = (p: { value: number; standardError: number | null; unit: string }) => ({ value: p.value, standardError: p.standardError ?? undefined, unit: p.unit });
    const fit = {
      id: 'anode-a-88c-old',
      name: 'Coating A at 88 °C (older record)',
      datasetId: d.id,
      electrode: 'anode',
      model: 'tafel',
      temperature: d.temperature,
      parameters: {
        exchangeCurrentDensity: param(t.parameters.exchangeCurrentDensity),
        tafelSlope: param(t.parameters.tafelSlope),
        transferCoefficient: param(t.parameters.transferCoefficient),
      },
      correlation: t.correlation, // names 'a (V)', 'b (V)'
    };
    const created = await request(app).post('/api/v1/studies').send({ ...exampleStudy, name: 'With an older saved fit (test)', fits: [fit] });
    expect(created.status).toBe(201);
    const fields = formFields((await request(app).get(`/cell?study=${created.body.id}`)).text);
    const res = await postForm({ ...fields, 'anode.source': 'fit', 'anode.fit': fit.id });
    expect(res.status).toBe(200);
    expect(unescapeHtml(res.text)).toContain('Saved Tafel fit "Coating A at 88 °C (older record)"');
    expect(unescapeHtml(res.text)).toMatch(/correlation of the line parameters \(a, b\), from which corr\(ln j0, α\) cannot be recovered/);
    const k = kineticsFromFit(fit as Parameters<typeof kineticsFromFit>[0], 'anode', d.temperature, 'older fit');
    expect(k.kinetics.uncertainty).toBeUndefined();
    expectClose((k.kinetics as { transferCoefficient: number }).transferCoefficient, t.parameters.transferCoefficient.value, { rtol: 1e-15 }, 'α still used');
  });

  it('loads starting values for another chemistry', async () => {
    const fields = await examplePageFields();
    const res = await postForm({ ...fields, chemistry: 'pem-water', action: 'defaults' });
    expect(res.status).toBe(200);
    const f = formFields(res.text);
    expect(f.chemistry).toBe('pem-water');
    expect(f['membrane.mode']).toBe('springer');
    expect(res.text).toContain('kWh/kg');
  });
});

describe('Cell form ↔ SI definition', () => {
  it('round-trips the example section through the form without change', () => {
    const section = cellSectionSchema.parse(exampleCell().cell);
    const form = formFromSection(section);
    const rebuilt = buildCell(readForm(flatten(form)), exampleStudy).section;
    compareTrees(rebuilt, section, 'section');
  });

  it('converts wt % to molality: 32 wt % NaOH = 11.766 mol/kg', () => {
    const section = cellSectionSchema.parse(exampleCell().cell);
    const form = { ...formFromSection(section), compositionUnit: 'wt%' as const, causticNaOH: '32', brineNaCl: '20' };
    const built = buildCell(form, exampleStudy).section;
    // check-values.md §4d (CRC Handbook, concentrative properties): 32 wt % NaOH → 11.766 mol/kg;
    // 20 wt % NaCl → 4.278 mol/kg.
    expectClose(built.composition!.causticNaOH!, 11.766, { rtol: 2e-4 }, 'NaOH molality');
    expectClose(built.composition!.brineNaCl!, 4.278, { rtol: 2e-4 }, 'NaCl molality');
  });

  it('turns a Tafel slope into α: 59.159 mV/decade at 25 °C is α = 1', () => {
    // check-values.md §1: ln(10)·RT/F = 59.159 mV at 298.15 K (derived from exact R and F).
    expectClose(alphaFromSlope(0.059159, 298.15), 1, { rtol: 2e-5 }, 'α');
    // domain.md §3: at 25 °C, α = 0.5 → 118 mV/decade.
    expectClose(alphaFromSlope(0.118318, 298.15), 0.5, { rtol: 2e-5 }, 'α for 118 mV/decade');
  });

  it('carries corr(ln j0, α) of a Tafel fit from the kinetics core, on the fly and through a saved fit', () => {
    // Independent route: the line's own intercept a with SE(a), SE(b) and corr(a, b) from
    // fitTafel give, by the delta method written out here (JCGM 100:2008 §5.1),
    //   Cov(ln j0, b) = −ρσaσb/b + aσb²/b²  (ln j0 = −a/b),  corr(ln j0, α) = −corr(ln j0, b).
    for (const id of ['anode-a-88c', 'cathode-c-88c', 'cathode-d-70c']) {
      const { d, pts } = datasetPoints(id);
      const branch = d.electrode === 'anode' ? 'anodic' : 'cathodic';
      const ru = d.uncompensatedResistance ?? 0;
      const t = fitTafel(pts, { temperature: d.temperature, window: 'auto', uncompensatedResistance: ru, branch });
      const b = t.parameters.tafelSlope.value / Math.LN10;
      const sb = t.parameters.tafelSlope.standardError! / Math.LN10;
      const a = t.parameters.intercept.value;
      const sa = t.parameters.intercept.standardError!;
      const rho = t.correlation.matrix[0][1];
      const sL = Math.sqrt(sa * sa / (b * b) - (2 * a * rho * sa * sb) / b ** 3 + (a * a * sb * sb) / b ** 4);
      const expected = -((-rho * sa * sb) / b + (a * sb * sb) / (b * b)) / (sL * sb);
      const sAlpha = (t.parameters.transferCoefficient.value * sb) / b; // α = RT/(bF): SE(α) = α·SE(b)/b
      // On the fly: the core result as the Cell page fits a dataset.
      const r = fitKinetics({ points: pts, model: 'tafel', temperature: d.temperature, window: 'auto', uncompensatedResistance: ru, branch });
      const live = kineticsFromFit(r, d.electrode, d.temperature, id).kinetics.uncertainty!;
      expectClose(live.correlation, expected, { rtol: 1e-9, atol: 1e-12 }, `${id} corr(ln j0, α)`);
      expectClose(live.lnExchangeCurrentDensitySE, sL, { rtol: 1e-9 }, `${id} SE ln j0`);
      expectClose(live.transferCoefficientSE, sAlpha, { rtol: 1e-9 }, `${id} SE α`);
      // Through the saved record, validated by the study schema (as a study file would be).
      const saved = savedFitSchema.parse(savedFitRecord(r, { name: id, electrode: d.electrode, temperature: d.temperature }));
      const fromSaved = kineticsFromFit(saved, d.electrode, d.temperature, id).kinetics.uncertainty!;
      expectClose(fromSaved.correlation, expected, { rtol: 1e-9, atol: 1e-12 }, `${id} saved-fit corr`);
      expectClose(fromSaved.lnExchangeCurrentDensitySE, sL, { rtol: 1e-9 }, `${id} saved-fit SE ln j0`);
      expectClose(fromSaved.transferCoefficientSE, sAlpha, { rtol: 1e-9 }, `${id} saved-fit SE α`);
    }
  });

  it('carries the working α of a saved Butler–Volmer fit (the electrode\'s own branch)', () => {
    const { d, pts } = datasetPoints('cathode-c-88c');
    const r = fitKinetics({ points: pts, model: 'butler-volmer', temperature: d.temperature, electrons: 2, uncompensatedResistance: d.uncompensatedResistance ?? 0 });
    expect(r.converged).toBe(true);
    const saved = savedFitSchema.parse(savedFitRecord(r, { name: 'BV', electrode: 'cathode', temperature: d.temperature }));
    expect(saved.correlation?.names).toEqual(['lnExchangeCurrentDensity', 'cathodicTransferCoefficient']);
    const u = kineticsFromFit(saved, 'cathode', d.temperature, 'BV').kinetics.uncertainty!;
    // Independent of the record: the fit's own parameter correlation of ln j0 and ln α_c (a
    // monotone increasing map of α_c keeps the first-order correlation) and the parameters' SEs.
    const names = r.correlation!.names;
    const corr = r.correlation!.matrix[names.indexOf('ln j0')][names.indexOf('ln α_c')];
    expectClose(u.correlation, corr, { rtol: 1e-9, atol: 1e-12 }, 'corr(ln j0, α_c)');
    const j0 = r.parameters.exchangeCurrentDensity;
    expectClose(u.lnExchangeCurrentDensitySE, j0.standardError! / j0.value, { rtol: 1e-12 }, 'SE ln j0');
    expectClose(u.transferCoefficientSE, r.parameters.cathodicTransferCoefficient!.standardError!, { rtol: 1e-12 }, 'SE α_c');
    // Saved as an anode fit, the record would describe the other branch: it is left out.
    const asAnode = savedFitRecord(r, { name: 'BV', electrode: 'anode', temperature: d.temperature });
    expect(asAnode.correlation).toBeUndefined();
    // A record naming the other electrode's α is not used for this one.
    const other = { ...saved, correlation: { names: ['lnExchangeCurrentDensity', 'anodicTransferCoefficient'], matrix: saved.correlation!.matrix } };
    const k = kineticsFromFit(other, 'cathode', d.temperature, 'BV');
    expect(k.kinetics.uncertainty).toBeUndefined();
    expect(k.warnings.join(' ')).toMatch(/transfer coefficient of the other branch/);
  });

  it('takes a saved Butler–Volmer fit with its ln j0–ln α correlation (record saved before the working-branch correlation)', () => {
    const k = kineticsFromFit(
      {
        model: 'butler-volmer',
        parameters: {
          exchangeCurrentDensity: { value: 20, standardError: 2 },
          anodicTransferCoefficient: { value: 0.5, standardError: 0.1 },
          cathodicTransferCoefficient: { value: 1.4, standardError: 0.02 },
        },
        correlation: { names: ['ln j0', 'ln α_a', 'ln α_c'], matrix: [[1, 0.3, -0.8], [0.3, 1, 0.1], [-0.8, 0.1, 1]] },
      },
      'cathode',
      361.15,
      'test fit',
    );
    expect(k.kinetics.model).toBe('butler-volmer');
    expectClose(k.kinetics.uncertainty!.lnExchangeCurrentDensitySE, 0.1, { rtol: 1e-12 }, 'SE ln j0 = SE(j0)/j0');
    expectClose(k.kinetics.uncertainty!.transferCoefficientSE, 0.02, { rtol: 1e-12 }, 'SE α_c');
    expectClose(k.kinetics.uncertainty!.correlation, -0.8, { rtol: 1e-12 }, 'corr(ln j0, α_c)');
  });
});

/** Flatten a CellForm into the posted field names (mirror of readForm). */
function flatten(form: ReturnType<typeof formFromSection>): Record<string, string> {
  const out: Record<string, string> = {
    chemistry: form.chemistry,
    temperatureC: form.temperatureC,
    pressureBar: form.pressureBar,
    compositionUnit: form.compositionUnit,
    brineNaCl: form.brineNaCl,
    causticNaOH: form.causticNaOH,
    koh: form.koh,
    reversibleOverride: form.reversibleOverride,
    'membrane.mode': form.membraneMode,
    'membrane.asr': form.membraneAsr,
    'membrane.refTempC': form.membraneRefTempC,
    'membrane.activationEnergy': form.membraneEa,
    'membrane.thickness': form.membraneThickness,
    'membrane.conductivity': form.membraneConductivity,
    'membrane.springerThickness': form.springerThickness,
    'membrane.waterContent': form.springerLambda,
    hardware: form.hardware,
    'ce.model': form.ceModel,
    'ce.value': form.ceValue,
    'ce.parasitic': form.ceParasitic,
    'ce.saved': form.ceSaved,
    jMin: form.jMin,
    jMax: form.jMax,
    jSteps: form.jSteps,
    jDesign: form.jDesign,
    rectifierEfficiency: form.rectifierEfficiency,
    bandSamples: form.bandSamples,
    bandSeed: form.bandSeed,
  };
  if (form.band) out.band = 'on';
  for (const role of ['anode', 'cathode'] as const) {
    for (const [k, v] of Object.entries(form[role])) out[`${role}.${k}`] = String(v);
  }
  form.gaps.forEach((g, i) => {
    for (const [k, v] of Object.entries(g)) out[`gap${i + 1}.${k}`] = String(v);
  });
  return out;
}

/** Deep comparison with a relative tolerance on numbers (the form prints 12 significant digits). */
function compareTrees(actual: unknown, expected: unknown, where: string): void {
  if (typeof expected === 'number') {
    expectClose(actual as number, expected, { rtol: 1e-11 }, where);
    return;
  }
  if (Array.isArray(expected)) {
    expect(Array.isArray(actual), where).toBe(true);
    expect((actual as unknown[]).length, where).toBe(expected.length);
    expected.forEach((e, i) => compareTrees((actual as unknown[])[i], e, `${where}[${i}]`));
    return;
  }
  if (expected && typeof expected === 'object') {
    const a = actual as Record<string, unknown>;
    expect(Object.keys(a).sort(), where).toEqual(Object.keys(expected).sort());
    for (const [k, v] of Object.entries(expected)) compareTrees(a[k], v, `${where}.${k}`);
    return;
  }
  expect(actual, where).toEqual(expected);
}

