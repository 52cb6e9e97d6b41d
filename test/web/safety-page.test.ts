/**
 * The Safety page: computed checks of the open study with hand-checked values, the caution
 * texts with sources and the governing-practice statement, recompute, 400s that keep values,
 * save (303 to the copy), and a water-electrolysis study.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import type { Study } from '../../server/scenario/schema.js';
import type { PlantSection } from '../../server/scenario/plant-sections.js';
import { linearCell } from '../cell/cells.js';
import { expectClose } from '../helpers/close.js';

const EXAMPLE = 'example-brackwater-pilot';
let dir: string;
let app: ReturnType<typeof createApp>;
let example: Study;

beforeAll(async () => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-safety-page-'));
  app = createApp({ studyDir: dir });
  example = (await request(app).get(`/api/v1/studies/${EXAMPLE}`)).body as Study;
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** The check section of a rendered page by its id suffix, e.g. "hydrogen-in-chlorine-minimum-load". */
function checkSection(html: string, id: string): { level: string; value: number } {
  const m = html.match(new RegExp(`data-level="(ok|caution|alarm)" id="check-${id}">[\\s\\S]*?<th>Value</th><td class="num">([^<]+)</td>`));
  if (!m) throw new Error(`check ${id} not found`);
  return { level: m[1], value: Number(m[2]) };
}

/** The example's form as the page fills it, with changes. */
function exampleForm(patch: Record<string, string> = {}): Record<string, string> {
  return {
    study: EXAMPLE,
    operatingCurrentDensity: '5.499',
    hydrogenSource: 'given',
    hydrogenInAnodeGas: '0.15',
    minimumLoad: '30',
    temperature: '88',
    pressure: '1.2',
    boilingPointElevation: '0',
    limitingCurrentDensity: '30',
    busbarCurrent: '14.85',
    busbarDistance: '1',
    ...patch,
  };
}

/*
 * Hand calculations for the example (0.15 vol % H2 in the cell chlorine at the operating point,
 * minimum load 30 %, crossover flux taken constant so x = f/(f + c·j)):
 *   x_min = x/(x + (1 − x)·λ) with λ = j_min/j_op = 0.3:
 *         = 0.0015/(0.0015 + 0.9985 × 0.3) = 0.0049826 → 0.498 vol %.
 *   Lower explosion limit of H2 in Cl2 near 88 °C, ≈ 1 bar: 3.0 vol % (GEST 91/168 via
 *   check-values §10); trip screen ½ of it = 1.5 vol %, alarm screen ¼ = 0.75 vol %.
 *   Trip reached when x = 0.015: j/j_op = x(1 − x_t)/((1 − x)·x_t) = 0.0015 × 0.985/(0.9985 × 0.015)
 *         = 0.098648 → 0.098648 × 5.499 kA/m² = 0.5425 kA/m².
 *   Busbar field B = μ0·I/(2π·d) = 2e-7 T·m/A × 14 850 A / 1 m = 2.970 mT (Ampère's law).
 */
describe('Safety page', () => {
  it('shows the computed checks of the example with hand-checked values', async () => {
    const res = await request(app).get('/safety');
    expect(res.status).toBe(200);
    const op = checkSection(res.text, 'hydrogen-in-chlorine-operating-point');
    expectClose(op.value, 0.15, { rtol: 1e-9 }, 'H2 at the operating point, vol %');
    expect(op.level).toBe('ok');
    const min = checkSection(res.text, 'hydrogen-in-chlorine-minimum-load');
    expectClose(min.value, 0.49826, { rtol: 2e-3 }, 'H2 at minimum load, vol % (3 significant digits shown)');
    expect(min.level).toBe('ok');
    expect(checkSection(res.text, 'temperature-boiling-margin').level).toBe('ok');
    expect(checkSection(res.text, 'limiting-current').level).toBe('ok');
    const field = checkSection(res.text, 'magnetic-field');
    expectClose(field.value, 2.97, { rtol: 2e-3 }, 'busbar field mT');
    expect(field.level).toBe('caution');
    const trip = res.text.match(/trip screen below <strong>([0-9.]+) kA\/m²<\/strong>/);
    expect(trip).not.toBeNull();
    expectClose(Number(trip![1]), 0.5425, { rtol: 2e-3 }, 'lowest current density before trip');
  });

  it('shows the cautions with their sources and the governing-practice statement', async () => {
    const res = await request(app).get('/safety');
    for (const text of ['Chlorine is a toxic gas', 'Hydrogen and chlorine form explosive mixtures', 'Caustic soda and potash destroy tissue', 'High DC currents', 'Pressurised gas']) {
      expect(res.text).toContain(text);
    }
    expect(res.text).toContain('OSHA 29 CFR 1910.1000');
    expect(res.text).toContain('Zabetakis');
    expect(res.text).toContain('Euro Chlor GEST 91/168');
    expect(res.text).toContain('licensed engineering practice govern');
    expect(res.text).not.toMatch(/NaN|Infinity/);
  });

  it('recomputes on POST: low minimum loads raise the hydrogen share', async () => {
    // 5 % load: x = 0.0015/(0.0015 + 0.9985 × 0.05) = 0.029156 → 2.92 vol % ≥ 1.5 → alarm.
    const low = await request(app).post('/safety').type('form').send(exampleForm({ minimumLoad: '5' }));
    expect(low.status).toBe(200);
    const a = checkSection(low.text, 'hydrogen-in-chlorine-minimum-load');
    expectClose(a.value, 2.9156, { rtol: 2e-3 }, 'H2 at 5 % load');
    expect(a.level).toBe('alarm');
    // 15 % load: x = 0.0015/(0.0015 + 0.9985 × 0.15) = 0.009916 → 0.992 vol %, between 0.75 and 1.5 → caution.
    const mid = await request(app).post('/safety').type('form').send(exampleForm({ minimumLoad: '15' }));
    const c = checkSection(mid.text, 'hydrogen-in-chlorine-minimum-load');
    expectClose(c.value, 0.9916, { rtol: 2e-3 }, 'H2 at 15 % load');
    expect(c.level).toBe('caution');
  });

  it.each([
    ['zero minimum load', { minimumLoad: '0' }, 'minimumLoad'],
    ['minimum load above 100 %', { minimumLoad: '150' }, 'minimumLoad'],
    ['text for the H2 content', { hydrogenInAnodeGas: 'low' }, 'hydrogenInAnodeGas'],
    ['pressure beyond the water saturation line (220.64 bar)', { pressure: '500' }, 'pressure'],
    ['negative distance', { busbarDistance: '-1' }, 'busbarDistance'],
  ])('keeps the values on a 400 and names the field: %s', async (_name, patch, field) => {
    const res = await request(app).post('/safety').type('form').send(exampleForm(patch));
    expect(res.status).toBe(400);
    expect(res.text).toContain(`<code>${field}</code>`);
    const [key, value] = Object.entries(patch)[0];
    expect(res.text).toContain(`name="${key}" value="${value}"`);
    expect(res.text).toContain('Chlorine is a toxic gas'); // cautions stay on the page
  });

  it('saves the safety inputs into a copy of the study (303)', async () => {
    const res = await request(app).post('/safety').type('form').send(exampleForm({ minimumLoad: '25', action: 'save' }));
    expect(res.status).toBe(303);
    const id = new URL(res.headers.location as string, 'http://x').searchParams.get('study') as string;
    expect(id).not.toBe(EXAMPLE);
    const saved = (await request(app).get(`/api/v1/studies/${id}`)).body as Study;
    expectClose((saved.plant as PlantSection).safety!.minimumLoad!, 0.25, { rtol: 1e-12 }, 'saved minimum load');
    const page = await request(app).get(res.headers.location as string);
    expect(page.text).toContain('Safety inputs saved');
    expect(page.text).toContain('name="minimumLoad" value="25"');
  });

  it('checks hydrogen in oxygen for a water electrolyser, without the chlorine cautions', async () => {
    const water = { ...example, name: 'Water study', chemistry: 'alkaline-water', operating: { temperature: 353.15, pressure: 1.5e5, composition: { koh: 7.6 } }, cell: undefined, plant: undefined, coatings: undefined, costs: undefined };
    const created = await request(app).post('/api/v1/studies').send(water);
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const get = await request(app).get(`/safety?study=${created.body.id}`);
    expect(get.status).toBe(200);
    expect(get.text).not.toContain('Chlorine is a toxic gas');
    expect(get.text).toContain('Hydrogen is flammable');
    // 0.5 vol % H2 in O2 at 4 kA/m², minimum load 15 %: x = 0.005/(0.005 + 0.995 × 0.15) = 0.032407
    // → 3.24 vol %, above the 2 vol % trip screen (½ of the 4 vol % lower limit, check-values §10).
    const res = await request(app)
      .post('/safety')
      .type('form')
      .send({ study: created.body.id, operatingCurrentDensity: '4', hydrogenSource: 'given', hydrogenInAnodeGas: '0.5', minimumLoad: '15', temperature: '80', pressure: '1.5', boilingPointElevation: '0', limitingCurrentDensity: '', busbarCurrent: '', busbarDistance: '1' });
    expect(res.status).toBe(200);
    const min = checkSection(res.text, 'hydrogen-in-oxygen-minimum-load');
    expectClose(min.value, 3.2407, { rtol: 2e-3 }, 'H2 in O2 at minimum load');
    expect(min.level).toBe('alarm');
    expect(res.text).toContain('Not checked');
  });

  it("takes the hydrogen content from a water cell model's crossover", async () => {
    const cell = {
      ...linearCell('alkaline-water', 1.2, 1e-4, [1000, 4000]),
      pressure: 1.5e5,
      composition: { koh: 7.6 },
      currentEfficiency: { model: 'crossover', hydrogenPermeability: 1e-13, membraneThickness: 5e-4 },
      designCurrentDensity: 4000,
    };
    const water = { ...example, name: 'Water with crossover', chemistry: 'alkaline-water', operating: { temperature: 353.15, pressure: 1.5e5, composition: { koh: 7.6 } }, cell, plant: undefined, coatings: undefined, costs: undefined };
    const created = await request(app).post('/api/v1/studies').send(water);
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const res = await request(app).get(`/safety?study=${created.body.id}`);
    expect(res.status).toBe(200);
    expect(res.text).toContain('value="cell-model" checked');
    const op = checkSection(res.text, 'hydrogen-in-oxygen-operating-point');
    const min = checkSection(res.text, 'hydrogen-in-oxygen-minimum-load');
    expect(op.value).toBeGreaterThan(0);
    // Constant crossover: the share grows as load falls (x_min > x_op).
    expect(min.value).toBeGreaterThan(op.value);
  });

  it('the Plant page carries the caution panel linking here', async () => {
    const res = await request(app).get('/plant');
    expect(res.text).toContain('aria-label="Safety caution"');
    expect(res.text).toContain(`/safety?study=${EXAMPLE}`);
  });
});
