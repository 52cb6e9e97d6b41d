/**
 * POST /api/v1/plant/cost and POST /api/v1/plant/compare (supertest, in-process app).
 * Expected values are computed here independently from the inputs (textbook formulas worked
 * out by hand below), never by calling the code under test.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.js';
import { FARADAY, GAS_CONSTANT } from '../../server/core/constants.js';
import { roundMoney } from '../../server/core/plant/index.js';
import { grouped } from '../../server/web/economics-view.js';
import { expectClose } from '../helpers/close.js';
import { chlorAlkaliCell } from '../cell/cells.js';

let dir: string;
let app: ReturnType<typeof createApp>;
beforeAll(() => {
  dir = mkdtempSync(path.join(os.tmpdir(), 'studies-econ-api-'));
  app = createApp({ studyDir: dir });
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** An invented chlor-alkali cost case (fictional numbers). */
function costBody(over: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    product: 'Cl2',
    cell: { linear: { intercept: 2.35, slope: 1.0e-4 } }, // U0 2.35 V, K 0.10 V per kA/m²
    currentEfficiency: 0.96,
    electricityPrice: 0.06, // per kWh
    capitalCostPerArea: 9000, // per m²
    operatingHours: 8000,
    discountRate: 0.08,
    lifetime: 10,
    currentDensities: [1500, 2500, 3500, 4500, 5500, 6500, 8000],
    ...over,
  };
}

/**
 * Capital recovery factor at i = 8 %, n = 10 yr, by the textbook formula
 * CRF = i(1+i)^n/((1+i)^n − 1), worked by hand with exact decimal arithmetic (Python
 * decimal, 40 digits): (1.08)^10 = 2.15892499727278669824 (exact), so
 * CRF = 0.08 × 2.15892499727278669824 / 1.15892499727278669824 = 0.14902948869707542747…
 */
const CRF_8PCT_10YR = 0.14902948869707542747;

/**
 * Closed-form economic current density with every input in SI (consistent units):
 * C = 9000 per m², CRF above [1/yr], p = 0.06 per kWh / 3.6e6 J/kWh [per J],
 * K = 1e-4 Ω·m², H = 8000 h × 3600 s/h [s/yr]:
 * j* = √(C·CRF/(p·K·H)) = 5286.1166399069972… A/m² (Python decimal, 40 digits).
 */
const J_STAR = 5286.1166399069972330;

describe('POST /api/v1/plant/cost', () => {
  it('finds the economic current density of a linear cell at the closed form', async () => {
    const res = await request(app).post('/api/v1/plant/cost').send(costBody());
    expect(res.status).toBe(200);
    expectClose(res.body.capitalRecoveryFactor, CRF_8PCT_10YR, { rtol: 1e-13 }, 'CRF (textbook formula, by hand)');
    // Also recompute here from the formula in float64 as a second, independent route.
    const C = 9000;
    const pJ = 0.06 / 3.6e6;
    const K = 1e-4;
    const Hs = 8000 * 3600;
    const jHand = Math.sqrt((C * CRF_8PCT_10YR) / (pJ * K * Hs));
    expectClose(jHand, J_STAR, { rtol: 1e-13 }, 'float64 hand computation vs decimal');
    // Numeric optimum: Brent on ln j to 1e-8 ⇒ relative error ~1e-8; allow 1e-6.
    expectClose(res.body.economicCurrentDensity, J_STAR, { rtol: 1e-6 }, 'numeric economic current density');
    expectClose(res.body.closedForm.economicCurrentDensity, J_STAR, { rtol: 1e-12 }, 'closed form reported');
    // The closed form's inputs are reported in one consistent set of units.
    const inp = res.body.closedForm.inputs;
    expectClose(inp.p.value, pJ, { rtol: 1e-15 }, 'p per J');
    expect(inp.p.unit).toBe('currency/J');
    expectClose(inp.H.value, Hs, { rtol: 0, atol: 0 }, 'H in s/yr');
    expect(inp.H.unit).toBe('s/yr');
    expect(inp.K.unit).toMatch(/Ω·m²/);
    expect(res.body.closedForm.insideSearchRange).toBe(true);
    expect(res.body.optimum.status).toBe('converged');
    expect(res.body.points).toHaveLength(7);
    expect(res.body.warnings).toEqual([]);
  });

  it('costs energy per tonne as the Faraday check values give', async () => {
    // check-values.md §8 (derived): 2.9 V at 96 % CE → 2284 kWh per t Cl2. With U0 2.35 V and
    // K = 1e-4 Ω·m², j = 5500 A/m² gives U = 2.35 + 0.55 = 2.9 V. Energy cost = 2.284 kWh/kg ×
    // 0.06 per kWh = 0.13704 per kg (4 significant figures in the source: rtol 5e-4).
    const res = await request(app).post('/api/v1/plant/cost').send(costBody({ currentDensities: [5500, 6000] }));
    expect(res.status).toBe(200);
    const p = res.body.points[0];
    expectClose(p.cellVoltage, 2.9, { rtol: 1e-12 }, 'U at 5.5 kA/m²');
    expectClose(p.specificEnergy / 3.6e6, 2.284, { rtol: 5e-4 }, 'kWh/kg Cl2 at 2.9 V, 96 % (check-values §8)');
    expectClose(p.energyCost, 2.284 * 0.06, { rtol: 5e-4 }, 'energy cost per kg');
    // Capital per kg = C·CRF / (H · production per m² per hour). Production at 5.5 kA/m², 96 %:
    // 1.32269 kg/kAh (check-values §8) × 5.5 kA × 0.96 = 6.98380 kg per m² per hour.
    const perM2Hour = 1.32269 * 5.5 * 0.96;
    expectClose(p.capitalCost, (9000 * CRF_8PCT_10YR) / (8000 * perM2Hour), { rtol: 1e-5 }, 'capital per kg');
    expectClose(p.totalCost, p.energyCost + p.capitalCost, { rtol: 1e-15 }, 'total = energy + capital');
  });

  it('gives one tornado row per input, moving the cost the way each input should', async () => {
    const res = await request(app).post('/api/v1/plant/cost').send(costBody());
    expect(res.status).toBe(200);
    const rows = res.body.sensitivity as Array<{ parameter: string; low: { value: number; totalPerTonne: number }; high: { value: number; totalPerTonne: number }; swing: number }>;
    const names = rows.map((r) => r.parameter).sort();
    expect(names).toEqual(['capitalCostPerArea', 'currentEfficiency', 'discountRate', 'energyPrice', 'intercept', 'lifeYears', 'operatingHoursPerYear', 'slope']);
    const base = res.body.sensitivityBasis.baseTotalPerTonne as number;
    expect(res.body.sensitivityBasis.fraction).toBe(0.2);
    expectClose(res.body.sensitivityBasis.currentDensity, J_STAR, { rtol: 1e-6 }, 'tornado at the optimum');
    // Cost rises with price, capital, rate, K and U0; falls with hours, life and CE.
    const rising = new Set(['energyPrice', 'capitalCostPerArea', 'discountRate', 'slope', 'intercept']);
    for (const r of rows) {
      if (rising.has(r.parameter)) {
        expect(r.low.totalPerTonne, r.parameter).toBeLessThan(base);
        expect(r.high.totalPerTonne, r.parameter).toBeGreaterThan(base);
      } else {
        expect(r.low.totalPerTonne, r.parameter).toBeGreaterThan(base);
        expect(r.high.totalPerTonne, r.parameter).toBeLessThan(base);
      }
    }
    // Energy cost is linear in price: ±20 % of price moves the total by ±20 % of the energy part.
    const price = rows.find((r) => r.parameter === 'energyPrice')!;
    const energyPerTonne = res.body.optimum.energyCost * 1000;
    expectClose(price.high.totalPerTonne - base, 0.2 * energyPerTonne, { rtol: 1e-9 }, 'price +20 %');
    expectClose(base - price.low.totalPerTonne, 0.2 * energyPerTonne, { rtol: 1e-9 }, 'price −20 %');
    // Sorted by swing, largest first.
    for (let k = 1; k < rows.length; k++) expect(rows[k - 1].swing).toBeGreaterThanOrEqual(rows[k].swing);
  });

  it('takes the tornado at the design current density when one is given', async () => {
    const res = await request(app).post('/api/v1/plant/cost').send(costBody({ designCurrentDensity: 6000 }));
    expect(res.status).toBe(200);
    expect(res.body.sensitivityBasis.basis).toBe('design');
    expectClose(res.body.sensitivityBasis.currentDensity, 6000, { rtol: 0 }, 'design j');
    expect(res.body.design.totalCost).toBeGreaterThan(res.body.optimum.totalCost);
  });

  it('uses a study cell definition (model) when asked, without a closed form', async () => {
    const cell = chlorAlkaliCell([1000, 6000]);
    const res = await request(app).post('/api/v1/plant/cost').send(costBody({ cell, currentEfficiency: undefined }));
    expect(res.status).toBe(200);
    expect(res.body.cell.kind).toBe('model');
    expect(res.body.closedForm).toBeNull();
    expect(res.body.chemistry).toBe('chlor-alkali');
    // The cell's constant-CE model (96 %) comes through.
    expectClose(res.body.optimum.currentEfficiency, 0.96, { rtol: 1e-12 }, 'CE from the model');
    expect(res.body.economicCurrentDensity).toBeGreaterThan(1500);
    expect(res.body.economicCurrentDensity).toBeLessThan(8000);
    expect(res.body.sensitivity.map((r: { parameter: string }) => r.parameter)).toContain('cellVoltage');
  });

  it.each([
    ['currentEfficiency', { currentEfficiency: 1.2 }],
    ['currentEfficiency', { currentEfficiency: 0 }],
    ['electricityPrice', { electricityPrice: -0.05 }],
    ['capitalCostPerArea', { capitalCostPerArea: 0 }],
    ['lifetime', { lifetime: 0 }],
    ['currentDensities', { currentDensities: [] }],
    ['currentDensities', { currentDensities: [5000] }],
    ['currentDensities[1]', { currentDensities: [1000, -5] }],
    ['operatingHours', { operatingHours: 9000 }],
    ['discountRate', { discountRate: -0.1 }],
    ['cell.linear.slope', { cell: { linear: { intercept: 2.3, slope: -1e-4 } } }],
    ['cell', { cell: undefined }],
    ['product', { chemistry: 'alkaline-water' }],
    ['searchRange.max', { searchRange: { min: 5000, max: 4000 } }],
  ])('answers 400 naming %s', async (pathName, over) => {
    const res = await request(app).post('/api/v1/plant/cost').send(costBody(over));
    expect(res.status).toBe(400);
    const paths = (res.body.error.issues as Array<{ path: string }>).map((i) => i.path);
    expect(paths).toContain(pathName);
  });

  it('answers 400 when plant data come without a current efficiency', async () => {
    const body = costBody();
    delete body.currentEfficiency;
    const res = await request(app).post('/api/v1/plant/cost').send(body);
    expect(res.status).toBe(400);
    expect(res.body.error.issues[0].path).toBe('currentEfficiency');
  });
});

/** Two linear options with equal CE, no voltage rise, equal lives (invented numbers). */
function compareBody(over: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    product: 'Cl2',
    currentDensity: 5000,
    plant: { activeArea: 100 },
    electricityPrice: 0.05,
    operatingHours: 8000,
    discountRate: 0.1,
    options: [
      { name: 'old', cell: { linear: { intercept: 2.5, slope: 1e-4 } }, currentEfficiency: 0.95, pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 5 },
      { name: 'new', cell: { linear: { intercept: 2.4, slope: 1e-4 } }, currentEfficiency: 0.95, pricePerArea: 300, voltageRisePerYear: 0, lifeYears: 5 },
    ],
    ...over,
  };
}

describe('POST /api/v1/plant/compare', () => {
  it('gives the NPV of a constant annual saving as worked by hand', async () => {
    const res = await request(app).post('/api/v1/plant/compare').send(compareBody());
    expect(res.status).toBe(200);
    const [old, neu] = res.body.options;
    // Same CE ⇒ same current I = j·A = 5000 × 100 = 5e5 A for equal production.
    // Energy per year = U·I·H: the 0.1 V difference saves 0.1 V × 5e5 A × 8000 h = 4e8 Wh = 4e5 kWh,
    // S = 4e5 kWh × 0.05 per kWh = 20 000 per year.
    const S = 20000;
    expectClose(neu.annualSavingVsBaseline, S, { rtol: 1e-12 }, 'annual saving');
    expectClose(neu.annualEnergyDifference, -4e5 * 3.6e6, { rtol: 1e-12 }, 'annual energy difference, J/yr');
    // Baseline voltage 2.5 + 0.5 = 3.0 V; annual energy 3.0 V × 5e5 A × 8000 h = 1.2e10 Wh = 12 000 MWh.
    expectClose(old.annualEnergy, 1.2e10 * 3600, { rtol: 1e-12 }, 'baseline annual energy, J/yr');
    expectClose(old.cellVoltage, 3.0, { rtol: 1e-14 }, 'baseline voltage');
    // NPV = S·(1 − (1+i)^−n)/i − price·area with i = 10 %, n = 5:
    // (1 − 1.1^−5)/0.1 = 3.7907867694084482555 (Python decimal), so
    // NPV = 20 000 × 3.79078676940844826 − 300 × 100 = 45 815.735388168965.
    expectClose(neu.npvVsBaseline, 45815.735388168965, { rtol: 1e-12 }, 'NPV by hand');
    expect(neu.display.npvVsBaseline).toBe('45815.74');
    // Simple payback = extra capital / saving = 30 000 / 20 000 = 1.5 yr.
    expectClose(neu.simplePaybackYears, 1.5, { rtol: 1e-12 }, 'payback');
    expect(old.isBaseline).toBe(true);
    expect(old.simplePaybackYears).toBeNull();
    expectClose(res.body.activeArea, 100, { rtol: 0 }, 'area');
  });

  it('sizes the plant from a production rate with Faraday’s law', async () => {
    // 1 kg/s of Cl2 at 95 % CE and 5 kA/m²: 1.32269 kg/kAh (check-values §8) → 3600 kg/h ÷
    // (1.32269 × 0.95) kg/kAh = 2864.86 kA → area = 2.86486e6 A / 5000 A/m² = 572.97 m².
    const res = await request(app).post('/api/v1/plant/compare').send(compareBody({ plant: { productionRate: 1 } }));
    expect(res.status).toBe(200);
    expectClose(res.body.activeArea, 3600 / (1.32269 * 0.95) / 5, { rtol: 1e-5 }, 'area from production');
    expectClose(res.body.annualProduction, 8000 * 3600, { rtol: 1e-12 }, 'production held, kg/yr');
  });

  it('swaps electrode kinetics on a cell definition: the voltage moves by the Tafel overpotential difference', async () => {
    const cell = chlorAlkaliCell([1000, 6000]);
    const T = cell.temperature;
    const j = 6000;
    const cathodeA = { model: 'tafel', exchangeCurrentDensity: 20, transferCoefficient: 1.5 };
    const cathodeB = { model: 'tafel', exchangeCurrentDensity: 2, transferCoefficient: 0.6 };
    const body = compareBody({
      cell,
      currentDensity: j,
      options: [
        { name: 'as defined', pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 6 },
        { name: 'same cathode entered', cathode: { kinetics: cathodeA }, pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 6 },
        { name: 'plain cathode', cathode: { kinetics: cathodeB }, pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 6 },
      ],
    });
    const res = await request(app).post('/api/v1/plant/compare').send(body);
    expect(res.status).toBe(200);
    const [base, same, plain] = res.body.options;
    expectClose(same.cellVoltage, base.cellVoltage, { rtol: 1e-14 }, 'identity swap');
    // Tafel overpotential |η| = (RT/(αF))·ln(j/j0) (domain primer §3), R and F from CODATA 2018.
    const eta = (alpha: number, j0: number) => ((GAS_CONSTANT.value * T) / (alpha * FARADAY.value)) * Math.log(j / j0);
    const dEta = eta(0.6, 2) - eta(1.5, 20);
    expectClose(plain.cellVoltage - base.cellVoltage, dEta, { rtol: 1e-9 }, 'voltage difference = Δη');
    expect(plain.kinetics.cathode.origin).toBe('entered');
    // Tafel slope reported at the cell temperature: ln10·RT/(αF).
    expectClose(plain.kinetics.cathode.tafelSlope, (Math.LN10 * GAS_CONSTANT.value * T) / (0.6 * FARADAY.value), { rtol: 1e-12 }, 'slope');
  });

  it('fits the study’s datasets on the fly for an electrode swap', async () => {
    const cell = chlorAlkaliCell([1000, 6000]);
    const body = compareBody({
      cell,
      currentDensity: 6000,
      options: [
        { name: 'plain Ni', cathode: { dataset: 'cathode-d-88c' }, pricePerArea: 150, voltageRisePerYear: 0.001, lifeYears: 8 },
        { name: 'activated Ni', cathode: { dataset: 'cathode-c-88c' }, pricePerArea: 700, voltageRisePerYear: 0.006, lifeYears: 8 },
      ],
    });
    const res = await request(app).post('/api/v1/plant/compare?study=example-brackwater-pilot').send(body);
    expect(res.status).toBe(200);
    const [d, c] = res.body.options;
    // The example data were generated (scripts/make-example-study.ts) with cathode slopes of
    // 120 mV/decade (D) and 55 mV/decade (C) at 88 °C plus 1.5 mV noise: a Tafel fit of the
    // synthetic data should land within 10 % of the generating slopes (sanity band, not a reference).
    expectClose(d.kinetics.cathode.tafelSlope, 0.12, { rtol: 0.1 }, 'plain Ni slope');
    expectClose(c.kinetics.cathode.tafelSlope, 0.055, { rtol: 0.1 }, 'activated Ni slope');
    expect(d.kinetics.cathode.origin).toBe('dataset');
    expect(c.cellVoltage).toBeLessThan(d.cellVoltage);
    expect(c.npvVsBaseline).toBeGreaterThan(0);
  });

  it.each([
    ['options', { options: [compareBody().options as unknown[]][0].slice(0, 1) }],
    ['options', { options: Array.from({ length: 7 }, (_, k) => ({ name: `o${k}`, cell: { linear: { intercept: 2.4, slope: 1e-4 } }, currentEfficiency: 0.95, pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 5 })) }],
    ['options[1].pricePerArea', { options: [(compareBody().options as Record<string, unknown>[])[0], { ...(compareBody().options as Record<string, unknown>[])[1], pricePerArea: -10 }] }],
    ['options[1].lifeYears', { options: [(compareBody().options as Record<string, unknown>[])[0], { ...(compareBody().options as Record<string, unknown>[])[1], lifeYears: 0 }] }],
    ['options[0].currentEfficiency', { options: [{ ...(compareBody().options as Record<string, unknown>[])[0], currentEfficiency: 1.5 }, (compareBody().options as Record<string, unknown>[])[1]] }],
    ['electricityPrice', { electricityPrice: -1 }],
    ['currentDensity', { currentDensity: 0 }],
    ['plant.activeArea', { plant: { activeArea: -3 } }],
    ['plant', { plant: { acres: 3 } }],
    ['baseline', { baseline: 4 }],
  ])('answers 400 naming %s', async (pathName, over) => {
    const res = await request(app).post('/api/v1/plant/compare').send(compareBody(over));
    expect(res.status).toBe(400);
    const paths = (res.body.error.issues as Array<{ path: string }>).map((i) => i.path);
    expect(paths).toContain(pathName);
  });

  it('answers 400 for electrode swaps without a cell definition to swap on', async () => {
    const res = await request(app)
      .post('/api/v1/plant/compare')
      .send(compareBody({ cell: { linear: { intercept: 2.4, slope: 1e-4 } }, currentEfficiency: 0.95, options: [
        { name: 'a', pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 5 },
        { name: 'b', anode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 50, transferCoefficient: 2 } }, pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 5 },
      ] }));
    expect(res.status).toBe(400);
    expect(res.body.error.issues[0].path).toBe('options[1].anode');
  });

  it('answers 400 naming the swap when the study has no such dataset', async () => {
    const res = await request(app)
      .post('/api/v1/plant/compare?study=example-brackwater-pilot')
      .send(compareBody({ cell: chlorAlkaliCell([1000]), options: [
        { name: 'a', pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 5 },
        { name: 'b', cathode: { dataset: 'no-such-data' }, pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 5 },
      ] }));
    expect(res.status).toBe(400);
    expect(res.body.error.issues[0].path).toBe('options[1].cathode.dataset');
  });

  it('answers 400 when an anode dataset is used for the cathode', async () => {
    const res = await request(app)
      .post('/api/v1/plant/compare?study=example-brackwater-pilot')
      .send(compareBody({ cell: chlorAlkaliCell([1000]), options: [
        { name: 'a', pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 5 },
        { name: 'b', cathode: { dataset: 'anode-a-88c' }, pricePerArea: 0, voltageRisePerYear: 0, lifeYears: 5 },
      ] }));
    expect(res.status).toBe(400);
    expect(res.body.error.issues[0].message).toMatch(/anode data/);
  });
});

describe('money rounding', () => {
  it('rounds half-up in decimal where float toFixed does not', () => {
    // 2.675 is stored in binary as 2.67499999999999982236431605997495353221893310546875, so
    // Number.prototype.toFixed gives "2.67"; decimal.js reads the shortest decimal "2.675" and
    // rounds half-up to "2.68" (decimal.js docs: ROUND_HALF_UP; ECMA-262 Number.prototype.toFixed).
    expect((2.675).toFixed(2)).toBe('2.67');
    expect(roundMoney(2.675, 2)).toBe('2.68');
    expect(roundMoney(1.005, 2)).toBe('1.01');
    expect((1.005).toFixed(2)).toBe('1.00');
    expect(roundMoney(0.1 + 0.2, 2)).toBe('0.30');
    expect(roundMoney(-0.004, 2)).toBe('0.00');
  });

  it('groups thousands on pages without changing the digits', () => {
    expect(grouped('4317670.80')).toBe('4\u202f317\u202f670.80');
    expect(grouped('-540000.00')).toBe('-540\u202f000.00');
    expect(grouped('999.99')).toBe('999.99');
    expect(grouped('—')).toBe('—');
  });

  it('returns display strings rounded half-up from the same numbers the API gives', async () => {
    const res = await request(app).post('/api/v1/plant/compare').send(compareBody());
    const neu = res.body.options[1];
    expect(neu.display.annualSavingVsBaseline).toBe('20000.00');
    expect(neu.display.coatingCapital).toBe('30000.00');
    const cost = await request(app).post('/api/v1/plant/cost').send(costBody());
    const o = cost.body.optimum;
    // The display is the decimal rounding of energy + capital per tonne.
    expectClose(Number(o.display.totalPerTonne), o.totalCost * 1000, { rtol: 0, atol: 0.005 + 1e-9 }, 'display total per t');
  });
});
