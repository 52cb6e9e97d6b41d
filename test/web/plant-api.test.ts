/**
 * POST /api/v1/plant/size and POST /api/v1/plant/shunt: happy paths against hand calculations,
 * identities of the shunt network, and every kind of bad input answered as a 400 with a path.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import { linearCell } from '../cell/cells.js';
import { expectClose } from '../helpers/close.js';

let dir: string;
let app: ReturnType<typeof createApp>;

beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-plant-api-'));
  app = createApp({ studyDir: dir });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Seconds per hour (exact). */
const HOUR = 3600;

/*
 * Hand calculation for the base case (Faraday's law with the electrochemical equivalents of
 * check-values §8, "derived" from IUPAC abridged atomic weights: Cl2 1.32269 kg/kA·h,
 * NaOH 1.49234 kg/kA·h, H2 0.037610 kg/kA·h):
 *
 *   target   ṁ(Cl2) = 1.32269 kg/kA·h × 1000 kA × 0.96 = 1269.7824 kg/h = 0.352717 kg/s
 *            → at CE 0.96 the plant needs exactly I = 1000 kA = 1.0e6 A.
 *   design   j = 5000 A/m², A_cell = 2.7 m² → area 1e6/5000 = 200 m² → 200/2.7 = 74.07 cells → 75 cells.
 *   operating j_op = 1e6 A / (75 × 2.7 m²) = 4938.27 A/m²; I_cell = 1e6/75 = 13 333.3 A.
 *   cell     U = 2.35 V + 1e-4 Ω·m² × j: U_design = 2.85 V, U_op = 2.35 + 0.493827 = 2.843827 V.
 *   rectifier 450 V → floor(450/2.85) = 157 cells in series ≥ 75 → 1 electrolyser of 75 cells,
 *            electrolyser voltage 75 × 2.843827 = 213.287 V at 13 333.3 A.
 *   power    DC = 1e6 A × 2.843827 V = 2.843827 MW; AC = DC/0.97 = 2.931781 MW.
 *   heat     (U − U_tn)·I with U_tn(chlor-alkali, 25 °C) = 2.3111 V (check-values §2b, derived)
 *            = 0.532727 MW.
 *   products NaOH at CE 0.96: 1.49234 × 1000 × 0.96 / 3600 = 0.397957 kg/s;
 *            H2 at CE 1 (given): 0.037610 × 1000 / 3600 = 0.0104472 kg/s.
 *   salt     one NaCl per NaOH: 0.397957 × 58.44/39.997 = 0.581459 kg/s
 *            (M from IUPAC abridged weights Na 22.990, Cl 35.45, O 15.999, H 1.008; check-values §8).
 * The equivalents carry 6 significant digits, so values are compared at rtol 2e-5.
 */
const EQ = { Cl2: 1.32269, NaOH: 1.49234, H2: 0.03761, O2: 0.29847 }; // kg per kA·h, check-values §8
const RTOL = 2e-5;

function baseBody(): Record<string, unknown> {
  return {
    chemistry: 'chlor-alkali',
    product: 'Cl2',
    productionRate: (EQ.Cl2 * 1000 * 0.96) / HOUR,
    currentDensity: 5000,
    cellArea: 2.7,
    cell: { linear: { intercept: 2.35, slope: 1e-4 } },
    currentEfficiency: 0.96,
    coProductCurrentEfficiency: { H2: 1 },
    rectifier: { maxVoltage: 450, maxCurrent: 16000, efficiency: 0.97 },
  };
}

/**
 * A cell definition whose voltage is U = 2.35 V + 1e-4 Ω·m²·j: electrodes with negligible
 * activation overpotential (Butler–Volmer, j0 = 1e12 A/m², so |η| < 1e-8 V up to 1e4 A/m²),
 * E_rev overridden to 2.35 V, one hardware resistance of 1e-4 Ω·m². Invented for the test.
 */
function lineAsCellDefinition(extra: Record<string, unknown> = {}): Record<string, unknown> {
  return { ...linearCell('chlor-alkali', 2.35, 1e-4, [1000, 3000, 5000]), temperature: 361.15, pressure: 1.2e5, ...extra };
}

async function size(body: Record<string, unknown>) {
  return request(app).post('/api/v1/plant/size').send(body);
}

async function expect400(res: request.Response, pathExpected: string): Promise<void> {
  expect(res.status, JSON.stringify(res.body)).toBe(400);
  const paths = (res.body.error.issues as { path: string; message: string }[]).map((i) => i.path);
  expect(paths, `issues: ${JSON.stringify(res.body.error.issues)}`).toContain(pathExpected);
  for (const i of res.body.error.issues) expect(i.message.length).toBeGreaterThan(3);
}

describe('POST /api/v1/plant/size', () => {
  it('sizes the base case as the hand calculation from Faraday’s law', async () => {
    const res = await size(baseBody());
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const b = res.body;
    expectClose(b.totalCurrent, 1e6, { rtol: RTOL }, 'total current A');
    expect(b.cells).toBe(75);
    expect(b.electrolysers).toBe(1);
    expect(b.cellsPerElectrolyser).toBe(75);
    expectClose(b.activeArea, 75 * 2.7, { rtol: 1e-12 }, 'installed area m²');
    expectClose(b.operatingCurrentDensity, 1e6 / (75 * 2.7), { rtol: RTOL }, 'operating j');
    expectClose(b.cellVoltage, 2.843827, { rtol: RTOL }, 'cell voltage');
    expectClose(b.electrolyserVoltage, 213.287, { rtol: RTOL }, 'electrolyser voltage');
    expectClose(b.electrolyserCurrent, 13333.33, { rtol: RTOL }, 'electrolyser current');
    expectClose(b.dcPower, 2.843827e6, { rtol: RTOL }, 'DC power');
    expectClose(b.acPower, 2.931781e6, { rtol: RTOL }, 'AC power');
    expectClose(b.heatLoad, 0.532727e6, { rtol: 1e-4 }, 'heat load'); // U_tn to 5 digits
    expectClose(b.products.Cl2, (EQ.Cl2 * 1000 * 0.96) / HOUR, { rtol: RTOL }, 'Cl2 kg/s');
    expectClose(b.products.NaOH, 0.397957, { rtol: RTOL }, 'NaOH kg/s');
    expectClose(b.products.H2, 0.0104472, { rtol: RTOL }, 'H2 kg/s');
    expectClose(b.feeds.NaCl, 0.581459, { rtol: RTOL }, 'NaCl kg/s');
    expect(b.warnings).toEqual([]);
    expect(b.designBasis.join('\n')).toMatch(/licensed engineering practice govern/);
  });

  it('splits the cells over several electrolysers when the rectifier voltage is low', async () => {
    // floor(100 V / 2.85 V) = 35 cells in series → ceil(75/35) = 3 electrolysers of 25 cells;
    // each at 25 × 2.843827 V = 71.0957 V (hand calculation).
    const res = await size({ ...baseBody(), rectifier: { maxVoltage: 100, maxCurrent: 16000, efficiency: 0.97 } });
    expect(res.status).toBe(200);
    expect(res.body.electrolysers).toBe(3);
    expect(res.body.cellsPerElectrolyser).toBe(25);
    expect(res.body.cellsPerElectrolyserList).toEqual([25, 25, 25]);
    expectClose(res.body.electrolyserVoltage, 71.0957, { rtol: RTOL }, 'electrolyser voltage');
  });

  it('sizes for caustic as the target (NaOH equivalent 1.49234 kg/kA·h)', async () => {
    // 1.49234 kg/kA·h × 500 kA × 0.95 = 708.8615 kg/h of NaOH needs I = 500 kA at CE 0.95.
    const res = await size({ ...baseBody(), product: 'NaOH', productionRate: (EQ.NaOH * 500 * 0.95) / HOUR, currentEfficiency: 0.95, coProductCurrentEfficiency: undefined });
    expect(res.status).toBe(200);
    expectClose(res.body.totalCurrent, 5e5, { rtol: RTOL }, 'total current');
    // Cl2 at the same CE: 1.32269 × 500 × 0.95 / 3600 kg/s.
    expectClose(res.body.products.Cl2, (EQ.Cl2 * 500 * 0.95) / HOUR, { rtol: RTOL }, 'Cl2 co-product');
  });

  it('sizes a water electrolyser for hydrogen (H2 0.037610, O2 0.29847 kg/kA·h)', async () => {
    // 0.037610 kg/kA·h × 1000 kA × 0.99 = 37.2339 kg/h of H2 needs 1000 kA at CE 0.99;
    // j = 4000 A/m², 2.4 m² → 250 m² / 2.4 = 104.2 → 105 cells. O2 at the same CE:
    // 0.29847 × 1000 × 0.99 / 3600 kg/s.
    const res = await size({
      chemistry: 'alkaline-water',
      product: 'H2',
      productionRate: (EQ.H2 * 1000 * 0.99) / HOUR,
      currentDensity: 4000,
      cellArea: 2.4,
      cell: { linear: { intercept: 1.55, slope: 8e-5 } },
      currentEfficiency: 0.99,
      rectifier: { maxVoltage: 400, maxCurrent: 12000, efficiency: 0.96 },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expectClose(res.body.totalCurrent, 1e6, { rtol: RTOL }, 'total current');
    expect(res.body.cells).toBe(105);
    expectClose(res.body.products.O2, (EQ.O2 * 1000 * 0.99) / HOUR, { rtol: RTOL }, 'O2 kg/s');
    // Ideal-gas normal volume of H2: 0.41815 m³ per kA·h at 0 °C, 101.325 kPa (check-values §8) × 1000 kA × 0.99.
    expectClose(res.body.gasVolumeRates.H2 * HOUR, 0.41815 * 1000 * 0.99, { rtol: 5e-5 }, 'H2 Nm³/h');
  });

  it('takes the cell from a cell definition: the line-equivalent model sizes like the line', async () => {
    const viaLine = await size(baseBody());
    const viaModel = await size({ ...baseBody(), cell: lineAsCellDefinition() });
    expect(viaModel.status, JSON.stringify(viaModel.body)).toBe(200);
    expect(viaModel.body.cells).toBe(viaLine.body.cells);
    expectClose(viaModel.body.cellVoltage, viaLine.body.cellVoltage, { atol: 1e-7 }, 'cell voltage, model vs line');
    expectClose(viaModel.body.dcPower, viaLine.body.dcPower, { rtol: 1e-7 }, 'DC power, model vs line');
  });

  it("uses the model's own current efficiency when none is given", async () => {
    const res = await size({ ...baseBody(), currentEfficiency: undefined, cell: lineAsCellDefinition({ currentEfficiency: { model: 'constant', value: 0.96 } }) });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expectClose(res.body.totalCurrent, 1e6, { rtol: RTOL }, 'total current at the model CE 0.96');
    expectClose(res.body.currentEfficiency, 0.96, { rtol: 1e-12 }, 'CE');
  });

  describe('bad input → 400 with path and reason', () => {
    it.each([
      ['zero production rate', { productionRate: 0 }, 'productionRate'],
      ['negative production rate', { productionRate: -1 }, 'productionRate'],
      ['zero current density', { currentDensity: 0 }, 'currentDensity'],
      ['negative cell area', { cellArea: -2.7 }, 'cellArea'],
      ['CE above 1', { currentEfficiency: 1.2 }, 'currentEfficiency'],
      ['CE of 0', { currentEfficiency: 0 }, 'currentEfficiency'],
      ['rectifier efficiency above 1', { rectifier: { maxVoltage: 450, maxCurrent: 16000, efficiency: 1.5 } }, 'rectifier.efficiency'],
      ['rectifier current below one cell (2.7 m² × 5000 A/m² = 13 500 A)', { rectifier: { maxVoltage: 450, maxCurrent: 10000, efficiency: 0.97 } }, 'rectifier.maxCurrent'],
      ['rectifier voltage below one cell (2.85 V)', { rectifier: { maxVoltage: 2.5, maxCurrent: 16000, efficiency: 0.97 } }, 'rectifier.maxVoltage'],
      ['unknown chemistry', { chemistry: 'molten-salt' }, 'chemistry'],
      ['product of another chemistry', { chemistry: 'pem-water' }, 'product'],
      ['unknown product', { product: 'HCl' }, 'product'],
      ['negative intercept', { cell: { linear: { intercept: -1, slope: 1e-4 } } }, 'cell.linear.intercept'],
      ['a cell that is neither', { cell: 'fast' }, 'cell'],
      ['a bad cell definition field', { cell: lineAsCellDefinition({ temperature: -5 }) }, 'cell.temperature'],
      ['a cell definition of another chemistry', { cell: lineAsCellDefinition({ chemistry: 'alkaline-water', composition: { koh: 7.6 } }) }, 'cell.chemistry'],
      ['NaN-like string', { productionRate: 'NaN' }, 'productionRate'],
    ])('%s', async (_name, patch, pathExpected) => {
      await expect400(await size({ ...baseBody(), ...patch }), pathExpected);
    });

    it.each([['productionRate'], ['currentDensity'], ['cellArea'], ['rectifier'], ['cell'], ['chemistry'], ['product']])('missing %s', async (field) => {
      const body = baseBody();
      delete body[field];
      await expect400(await size(body), field);
    });

    it('missing CE with a linear cell', async () => {
      const body = baseBody();
      delete body.currentEfficiency;
      await expect400(await size(body), 'currentEfficiency');
    });

    it('a current density at the model’s limiting current is a 400, not a 500', async () => {
      const res = await size({ ...baseBody(), cell: lineAsCellDefinition({ anode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 100, transferCoefficient: 2 }, limitingCurrentDensity: 4000 } }) });
      expect(res.status, JSON.stringify(res.body)).toBe(400);
      expect(res.body.error.issues[0].path).toBe('currentDensity');
      expect(res.body.error.issues[0].message).toMatch(/limiting current/);
    });
  });
});

/** Shunt request with one or two circuits (values invented for the tests). */
function shuntBody(extra: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    cells: 25,
    cellCurrent: 15000,
    cellVoltage: 2.9,
    cellResistance: 3.7e-5,
    circuits: [
      { name: 'anolyte', channelResistance: 250, manifoldSegmentResistance: 0.2 },
      { name: 'catholyte', channelResistance: 120, manifoldSegmentResistance: 0.1 },
    ],
    ...extra,
  };
}

describe('POST /api/v1/plant/shunt', () => {
  it('two cells, one circuit: the loop current by hand', async () => {
    // Kirchhoff by hand: the shunt loop M0 → manifold → M1 carries s; the parallel path
    // M0 → P1 → M1 (second half of cell 1, first half of cell 2) carries I − s with sources
    // U0/2 + U0/2 and resistance r. s·(2R_ch + R_m) = U0 + r·(I − s), and U0 = U − r·I, so
    // s = U/(2R_ch + R_m + r). With U = 3 V, r = 1e-3 Ω, R_ch = 10 Ω, R_m = 1 Ω, I = 100 A:
    // s = 3/21.001 = 0.1428503 A; channel currents +s (cell 1) and −s (cell 2);
    // CE loss = mean bypass / I = (s/2)/I = 7.142515e-4; power = s²·(2R_ch + R_m) = 0.4285299 W.
    const res = await request(app)
      .post('/api/v1/plant/shunt')
      .send({ cells: 2, cellCurrent: 100, cellVoltage: 3, cellResistance: 1e-3, circuits: [{ channelResistance: 10, manifoldSegmentResistance: 1 }] });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const s = 3 / 21.001;
    expectClose(res.body.channelCurrents[0][0], s, { rtol: 1e-9 }, 'channel current, cell 1');
    expectClose(res.body.channelCurrents[0][1], -s, { rtol: 1e-9 }, 'channel current, cell 2');
    expectClose(res.body.currentEfficiencyLoss, s / 2 / 100, { rtol: 1e-9 }, 'CE loss');
    expectClose(res.body.powerLoss, s * s * 21, { rtol: 1e-9 }, 'power loss');
  });

  it('channel currents are antisymmetric about the centre of the stack, bypass symmetric', async () => {
    const res = await request(app).post('/api/v1/plant/shunt').send(shuntBody());
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const cc = res.body.channelCurrents as number[][];
    expect(cc.length).toBe(2);
    for (const row of cc) {
      expect(row.length).toBe(25);
      const scale = Math.max(...row.map(Math.abs));
      expect(scale).toBeGreaterThan(0);
      for (let k = 0; k < row.length; k++) expectClose(row[k], -row[row.length - 1 - k], { atol: 1e-9 * scale }, `cell ${k + 1} vs its mirror`);
      expectClose(row[12], 0, { atol: 1e-9 * scale }, 'centre cell of an odd stack');
      expectClose(Math.abs(row[0]), scale, { rtol: 1e-12 }, 'largest channel current at the end');
    }
    const bypass = res.body.bypassCurrents as number[];
    for (let k = 0; k < bypass.length; k++) expectClose(bypass[k], bypass[bypass.length - 1 - k], { rtol: 1e-9, atol: 1e-12 }, `bypass ${k + 1}`);
    expect(res.body.maxBypassCurrent.cell).toBe(12);
    expect(res.body.currentEfficiencyLoss).toBeGreaterThan(0);
    expect(res.body.currentEfficiencyLoss).toBeLessThan(1);
    expect(res.body.powerLoss).toBeGreaterThan(0);
  });

  it('channel currents of each circuit sum to zero (Kirchhoff: what enters a manifold leaves it)', async () => {
    const res = await request(app).post('/api/v1/plant/shunt').send(shuntBody({ cells: 40 }));
    for (const row of res.body.channelCurrents as number[][]) {
      const sum = row.reduce((a, b) => a + b, 0);
      const scale = Math.max(...row.map(Math.abs));
      expectClose(sum, 0, { atol: 1e-9 * scale }, 'sum of channel currents');
    }
  });

  it('a circuit given by geometry equals one given by R = L/(σ·A)', async () => {
    // Hand: channel 1 m, 1e-4 m², σ = 50 S/m → R = 1/(50 × 1e-4) = 200 Ω;
    // manifold segment 0.05 m, 5e-3 m² → R = 0.05/(50 × 5e-3) = 0.2 Ω.
    const byR = await request(app).post('/api/v1/plant/shunt').send(shuntBody({ circuits: [{ channelResistance: 200, manifoldSegmentResistance: 0.2 }] }));
    const byGeometry = await request(app)
      .post('/api/v1/plant/shunt')
      .send(shuntBody({ circuits: [{ conductivity: 50, channel: { length: 1, crossSection: 1e-4 }, manifoldSegment: { length: 0.05, crossSection: 5e-3 } }] }));
    expect(byGeometry.status, JSON.stringify(byGeometry.body)).toBe(200);
    expectClose(byGeometry.body.circuits[0].channelResistance, 200, { rtol: 1e-12 }, 'channel R');
    expectClose(byGeometry.body.circuits[0].manifoldSegmentResistance, 0.2, { rtol: 1e-12 }, 'manifold R');
    byR.body.channelCurrents[0].forEach((v: number, k: number) => expectClose(byGeometry.body.channelCurrents[0][k], v, { rtol: 1e-9, atol: 1e-12 }, `cell ${k + 1}`));
  });

  describe('bad input → 400 with path and reason', () => {
    it.each([
      ['one cell', { cells: 1 }, 'cells'],
      ['fractional cells', { cells: 2.5 }, 'cells'],
      ['zero current', { cellCurrent: 0 }, 'cellCurrent'],
      ['negative voltage', { cellVoltage: -2.9 }, 'cellVoltage'],
      ['zero cell resistance', { cellResistance: 0 }, 'cellResistance'],
      ['no circuits', { circuits: [] }, 'circuits'],
      ['zero channel resistance', { circuits: [{ channelResistance: 0, manifoldSegmentResistance: 0.1 }] }, 'circuits[0].channelResistance'],
      ['missing manifold resistance', { circuits: [{ channelResistance: 100 }] }, 'circuits[0].manifoldSegmentResistance'],
      ['geometry without conductivity', { circuits: [{ channel: { length: 1, crossSection: 1e-4 }, manifoldSegment: { length: 0.05, crossSection: 5e-3 } }] }, 'circuits[0].conductivity'],
      ['negative duct length', { circuits: [{ conductivity: 50, channel: { length: -1, crossSection: 1e-4 }, manifoldSegment: { length: 0.05, crossSection: 5e-3 } }] }, 'circuits[0].channel.length'],
    ])('%s', async (_name, patch, pathExpected) => {
      await expect400(await request(app).post('/api/v1/plant/shunt').send(shuntBody(patch)), pathExpected);
    });

    it.each([['cells'], ['cellCurrent'], ['cellVoltage'], ['cellResistance'], ['circuits']])('missing %s', async (field) => {
      const body = shuntBody();
      delete body[field];
      await expect400(await request(app).post('/api/v1/plant/shunt').send(body), field);
    });
  });
});
