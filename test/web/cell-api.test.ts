/**
 * POST /api/v1/cell/sweep: happy paths for the three chemistries (with external check values
 * where one exists), the uncertainty band, and clear 400 answers for bad input.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import { exampleCell } from '../../scripts/example-cell.js';
import type { CellDefinition } from '../../server/core/cell/types.js';
import { linearCell as idealLinearCell } from '../cell/cells.js';
import { expectClose } from '../helpers/close.js';

let dir: string;
let app: ReturnType<typeof createApp>;

beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-cell-api-'));
  app = createApp({ studyDir: dir });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** kWh/t and kWh/kg in J/kg (exact: 1 kWh = 3.6e6 J). */
const KWH_PER_T = 3.6e3;
const KWH_PER_KG = 3.6e6;

/** A "linear" cell U = E_rev + R·j (ideal electrodes, see test/cell/cells.ts) with extra fields. */
function linearCell(chemistry: CellDefinition['chemistry'], reversible: number, resistance: number, currentDensities: number[], extra: Record<string, unknown> = {}) {
  return { ...idealLinearCell(chemistry, reversible, resistance, currentDensities), ...extra };
}

function exampleDefinition(): Record<string, unknown> {
  return structuredClone(exampleCell().cell);
}

/** Every number in a tree is finite and no null stands where JSON dropped a NaN. */
function assertCleanJson(value: unknown, where = 'body'): void {
  if (value === null) throw new Error(`null at ${where}`);
  if (typeof value === 'number') expect(Number.isFinite(value), where).toBe(true);
  else if (Array.isArray(value)) value.forEach((v, i) => assertCleanJson(v, `${where}[${i}]`));
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) assertCleanJson(v, `${where}.${k}`);
}

async function sweep(body: unknown) {
  return request(app).post('/api/v1/cell/sweep').set('Content-Type', 'application/json').send(JSON.stringify(body));
}

describe('POST /api/v1/cell/sweep — happy paths', () => {
  it('chlor-alkali: specific energy at 3.0 V and 96 % CE matches the Faraday check value', async () => {
    // U = 2.5 V + 1e-4 Ω·m² × 5000 A/m² = 3.0 V (ideal electrodes).
    const res = await sweep(linearCell('chlor-alkali', 2.5, 1e-4, [2000, 3500, 5000], { currentEfficiency: { model: 'constant', value: 0.96 } }));
    expect(res.status).toBe(200);
    assertCleanJson(res.body);
    const p = res.body.points[2];
    expectClose(p.cellVoltage, 3.0, { atol: 1e-7 }, 'U at 5 kA/m²');
    // check-values.md §8 (derived from Faraday's law, IUPAC atomic weights): 3.0 V at 96 % CE →
    // 2363 kWh/t Cl2 and 2094 kWh/t NaOH.
    expectClose(p.specificEnergy.Cl2 / KWH_PER_T, 2363, { rtol: 3e-4 }, 'kWh/t Cl2');
    expectClose(p.specificEnergy.NaOH / KWH_PER_T, 2094, { rtol: 3e-4 }, 'kWh/t NaOH');
    // Identity: a straight U(j) gives K = R exactly, U0 = E_rev, R² = 1.
    expectClose(res.body.kFactor.value, 1e-4, { rtol: 1e-6 }, 'K');
    expectClose(res.body.kFactor.intercept, 2.5, { atol: 1e-6 }, 'U0');
    expectClose(res.body.kFactor.rSquared, 1, { atol: 1e-9 }, 'R²');
    for (const key of ['reversiblePotential', 'thermoneutralVoltage', 'points', 'kFactor', 'warnings']) expect(res.body).toHaveProperty(key);
    for (const key of ['currentDensity', 'cellVoltage', 'anodeOverpotential', 'cathodeOverpotential', 'massTransportOverpotential', 'ohmicDrop', 'currentEfficiency', 'specificEnergy']) {
      expect(p).toHaveProperty(key);
    }
  });

  it('chlor-alkali: the example cell lands in the industrial range and its breakdown sums to U', async () => {
    const res = await sweep(exampleDefinition());
    expect(res.status).toBe(200);
    assertCleanJson(res.body);
    const d = res.body.designPoint;
    expectClose(d.currentDensity, 5500, { rtol: 1e-12 }, 'design j');
    // check-values.md §9a (from memory, low confidence): ≈ 2.9–3.2 V at 5–6 kA/m² for zero-gap cells;
    // K ≈ 0.08–0.12 V per kA/m².
    expect(d.cellVoltage).toBeGreaterThan(2.9);
    expect(d.cellVoltage).toBeLessThan(3.2);
    const kPerKA = res.body.kFactor.value * 1000;
    expect(kPerKA).toBeGreaterThan(0.08);
    expect(kPerKA).toBeLessThan(0.12);
    for (const p of res.body.points) {
      const b = p.breakdown;
      const sum = b.reversible + b.anode + b.cathode + b.massTransport + b.membrane + b.gaps.reduce((s: number, g: number) => s + g, 0) + b.hardware;
      expectClose(sum, p.cellVoltage, { rtol: 1e-12 }, `breakdown sum at ${p.currentDensity}`);
    }
    // The request asked for the band: one band point per current density plus the design point.
    const band = res.body.uncertainty;
    expect(band.points.length).toBe(res.body.points.length + 1);
    for (const bp of band.points) {
      expect(bp.monteCarlo.lower).toBeLessThan(bp.nominal);
      expect(bp.monteCarlo.upper).toBeGreaterThan(bp.nominal);
    }
  });

  it('the band is reproducible with a seed', async () => {
    const def = { ...exampleDefinition(), uncertainty: { samples: 500, seed: 7 } };
    const a = await sweep(def);
    const b = await sweep(def);
    expect(a.status).toBe(200);
    expect(a.body.uncertainty.samples).toBe(500);
    expect(a.body.uncertainty.points).toEqual(b.body.uncertainty.points);
  });

  it('alkaline water: 1.8 V gives 47.86 kWh/kg H2 and 82.3 % HHV voltage efficiency', async () => {
    // U = 1.6 V + 0.5e-4 Ω·m² × 4000 A/m² = 1.8 V; CE 1.
    const res = await sweep(linearCell('alkaline-water', 1.6, 0.5e-4, [1000, 2500, 4000], { currentEfficiency: { model: 'constant', value: 1 } }));
    expect(res.status).toBe(200);
    assertCleanJson(res.body);
    const p = res.body.points[2];
    expectClose(p.cellVoltage, 1.8, { atol: 1e-7 }, 'U');
    // check-values.md §8 (derived): 1.8 V → 47.86 kWh/kg H2; voltage efficiency (HHV) 1.4812/U = 82.3 %, LHV 69.6 %.
    expectClose(p.specificEnergy.H2 / KWH_PER_KG, 47.86, { rtol: 3e-4 }, 'kWh/kg H2');
    expectClose(p.voltageEfficiency.hhv, 0.823, { atol: 6e-4 }, 'HHV voltage efficiency');
    expectClose(p.voltageEfficiency.lhv, 0.696, { atol: 6e-4 }, 'LHV voltage efficiency');
  });

  it('alkaline water from thermodynamics: E_rev plausible, parts sum to U', async () => {
    const def = {
      chemistry: 'alkaline-water',
      temperature: 353.15,
      pressure: 1.5e5,
      composition: { koh: 7.639 },
      anode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 1e-2, transferCoefficient: 1.2 } },
      cathode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 1, transferCoefficient: 0.6 } },
      ohmic: { membrane: { areaResistance: 0.25e-4 }, gaps: [{ thickness: 1e-3, electrolyte: 'KOH', voidFraction: 0.2 }], hardware: 0.05e-4 },
      currentDensities: [1000, 2000, 4000, 6000],
      designCurrentDensity: 4000,
    };
    const res = await sweep(def);
    expect(res.status).toBe(200);
    assertCleanJson(res.body);
    // check-values.md §2c: E_rev(80 °C, unit activities) = 1.1831 V; 30 wt % KOH lowers a_w and
    // raises E_rev by some mV, gas saturation lowers it: expect within ±50 mV.
    expectClose(res.body.reversiblePotential, 1.1831, { atol: 0.05 }, 'E_rev 80 °C');
    const d = res.body.designPoint;
    const b = d.breakdown;
    expectClose(b.reversible + b.anode + b.cathode + b.massTransport + b.ohmicDrop, d.cellVoltage, { rtol: 1e-12 }, 'sum');
  });

  it('PEM water: E_rev at 25 °C with dry gases at 1 bar is the standard 1.2288 V; 2.0 V → 53.18 kWh/kg', async () => {
    // Total pressure = 1 bar + p_sat(25 °C) so that the water-saturated gases sit at 1 bar each.
    // p_sat(25 °C) ≈ 3169.9 Pa (IAPWS-IF97, from memory).
    const pSat25 = 3169.9;
    const res = await sweep({
      chemistry: 'pem-water',
      temperature: 298.15,
      pressure: 1e5 + pSat25,
      anode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 1e-3, transferCoefficient: 1.5 } },
      cathode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 10, transferCoefficient: 1 } },
      ohmic: { membrane: { springer: { thickness: 127e-6, waterContent: 22 } }, hardware: 0.1e-4 },
      currentDensities: [5000, 10000, 20000],
    });
    expect(res.status).toBe(200);
    assertCleanJson(res.body);
    // check-values.md §2b: E°_rev (liquid water, 25 °C) = 1.22883 V (NBS-82, derived).
    expectClose(res.body.reversiblePotential, 1.22883, { atol: 5e-4 }, 'E_rev 25 °C');
    // check-values.md §2b: U_tn = 1.48121 V.
    expectClose(res.body.thermoneutralVoltage, 1.48121, { atol: 1e-3 }, 'U_tn 25 °C');

    const lin = await sweep(linearCell('pem-water', 1.5, 0.25e-4, [10000, 15000, 20000]));
    expect(lin.status).toBe(200);
    // check-values.md §8 (derived): 2.0 V → 53.18 kWh/kg H2 at 100 % Faradaic efficiency.
    expectClose(lin.body.points[2].specificEnergy.H2 / KWH_PER_KG, 53.18, { rtol: 3e-4 }, 'kWh/kg H2 at 2.0 V');
  });
});

describe('POST /api/v1/cell/sweep — bad input is a clear 400', () => {
  async function expect400(body: unknown, pathPattern: RegExp, messagePattern?: RegExp) {
    const res = await sweep(body);
    expect(res.status, JSON.stringify(res.body)).toBe(400);
    const issues = res.body.error.issues as Array<{ path: string; message: string }>;
    const hit = issues.find((i) => pathPattern.test(i.path));
    expect(hit, `issues: ${JSON.stringify(issues)}`).toBeDefined();
    if (messagePattern) expect(hit!.message).toMatch(messagePattern);
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.(ts|js):\d+/);
    return res;
  }

  it('current density at or above the limiting current', async () => {
    const def = exampleDefinition() as { anode: Record<string, unknown> };
    def.anode.limitingCurrentDensity = 6000;
    // The sweep is 0.5, 1.0, …, 7.0 kA/m²: index 11 is the first at or above 6 kA/m².
    await expect400(def, /^currentDensities\[11\]$/, /limiting current/);
  });

  it('design current density above the limiting current', async () => {
    const def = exampleDefinition() as { cathode: Record<string, unknown>; currentDensities: number[]; designCurrentDensity: number };
    def.cathode.limitingCurrentDensity = 8000;
    def.designCurrentDensity = 9000;
    await expect400(def, /^designCurrentDensity$/, /limiting current/);
  });

  it('negative conductivity', async () => {
    const def = exampleDefinition() as { ohmic: { gaps: Array<Record<string, unknown>> } };
    def.ohmic.gaps[1].conductivity = -5;
    await expect400(def, /^ohmic\.gaps\[1\]\.conductivity$/);
  });

  it('void fraction of 1 or more', async () => {
    const def = exampleDefinition() as { ohmic: { gaps: Array<Record<string, unknown>> } };
    def.ohmic.gaps[0].voidFraction = 1;
    await expect400(def, /^ohmic\.gaps\[0\]\.voidFraction$/);
  });

  it('unknown chemistry', async () => {
    await expect400({ ...exampleDefinition(), chemistry: 'chloralkali' }, /^chemistry$/);
  });

  it('missing composition', async () => {
    const def = exampleDefinition();
    delete def.composition;
    await expect400(def, /^composition\.brineNaCl$/);
    await expect400(linearCell('alkaline-water', 1.5, 1e-5, [1000], { composition: {} }), /^composition\.koh$/);
  });

  it('temperature outside the range of the thermodynamic data', async () => {
    await expect400({ ...exampleDefinition(), temperature: 400 }, /^temperature$/, /outside/);
  });

  it('wrong types and a non-object body', async () => {
    await expect400({ ...exampleDefinition(), temperature: 'hot' }, /^temperature$/);
    await expect400([1, 2, 3], /^\(body\)$/);
    const res = await request(app).post('/api/v1/cell/sweep').set('Content-Type', 'application/json').send('{"chemistry": ');
    expect(res.status).toBe(400);
  });

  it('negative exchange current density and an empty sweep', async () => {
    const def = exampleDefinition() as { anode: { kinetics: Record<string, unknown> }; currentDensities: number[] };
    def.anode.kinetics.exchangeCurrentDensity = -1;
    await expect400(def, /^anode\.kinetics\.exchangeCurrentDensity$/);
    await expect400({ ...exampleDefinition(), currentDensities: [] }, /^currentDensities$/);
    await expect400({ ...exampleDefinition(), currentDensities: [1000, -5] }, /^currentDensities\[1\]$/);
  });

  it('a band asked for without any kinetic uncertainty', async () => {
    await expect400(linearCell('chlor-alkali', 2.5, 1e-4, [1000, 2000, 3000], { uncertainty: { samples: 100, seed: 1 } }), /uncertainty/);
  });

  it('bad band options', async () => {
    await expect400({ ...exampleDefinition(), uncertainty: { samples: 1, seed: 1 } }, /^uncertainty\.samples$/);
    await expect400({ ...exampleDefinition(), uncertainty: { samples: 100, seed: 0.5 } }, /^uncertainty\.seed$/);
    // Work bound: 100 000 samples × 2001 points is refused before any computation.
    const many = Array.from({ length: 2000 }, (_, i) => 10 * (i + 1));
    await expect400({ ...exampleDefinition(), currentDensities: many, uncertainty: { samples: 100_000, seed: 1 } }, /^uncertainty\.samples$/, /exceeds/);
  });
});
