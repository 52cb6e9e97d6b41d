import { describe, expect, it } from 'vitest';
import { expectClose } from '../helpers/close.js';
import { sizePlant, type SizingInput } from '../../server/core/plant/sizing.js';
import { electrochemicalEquivalent, PRODUCT_SPECS, NORMAL_MOLAR_VOLUME } from '../../server/core/plant/products.js';
import { InputError } from '../../server/core/errors.js';

/**
 * Published electrochemical equivalents, kg per kA·h at 100 % CE (check-values §8, derived from
 * IUPAC abridged atomic weights), with the number of decimals quoted. A comparison is allowed
 * half a unit in the last quoted decimal (the rounding of the table), plus float slack.
 */
const KG_PER_KAH = { Cl2: 1.32269, NaOH: 1.49234, H2: 0.03761, O2: 0.29847 };
const QUOTED_DECIMALS = { Cl2: 5, NaOH: 5, H2: 6, O2: 5 };
const KAH = 3.6e6; // C per kA·h (exact)
/** Relative half-unit of the last quoted decimal of a table value. */
function tableRtol(id: keyof typeof KG_PER_KAH): number {
  return (0.5 * 10 ** -QUOTED_DECIMALS[id]) / KG_PER_KAH[id] + 1e-12;
}
/** Half-unit of the Cl₂ row (1.32269): the hand calculation below inherits it. */
const TABLE_RTOL = tableRtol('Cl2');

function chlorineBase(): SizingInput {
  return {
    chemistry: 'chlor-alkali',
    target: { product: 'Cl2', massRate: 1e6 / 86400 }, // 1000 t/d
    designCurrentDensity: 6000,
    activeAreaPerCell: 2.7,
    rectifier: { maxVoltage: 600, maxCurrent: 20000, efficiency: 0.97 },
    cell: { kind: 'linear', intercept: 2.35, slope: 1e-4, currentEfficiency: 0.96 },
  };
}

describe('electrochemical equivalents (Faraday’s law with IUPAC abridged weights)', () => {
  it.each(Object.entries(KG_PER_KAH))('%s matches the published kg/kA·h (check-values §8)', (id, published) => {
    const spec = PRODUCT_SPECS[id as keyof typeof KG_PER_KAH];
    expectClose(electrochemicalEquivalent(spec) * KAH, published, { rtol: tableRtol(id as keyof typeof KG_PER_KAH) }, id);
  });

  it('normal molar volume gives 0.41815 m³ H₂ per kA·h (check-values §8, 0 °C, 101.325 kPa)', () => {
    // 18.6557 mol H₂ per kA·h (check-values §8) × V_m.
    expectClose(18.6557 * NORMAL_MOLAR_VOLUME, 0.41815, { rtol: 1e-5 });
  });
});

describe('sizePlant — 1000 t/d chlorine, hand calculation', () => {
  /*
   * Hand calculation (check-values §8 equivalents):
   *   ṁ = 1 000 000 kg / 86 400 s = 11.574 074 kg/s = 41 666.667 kg/h
   *   I(CE = 1)    = 41 666.667 kg/h ÷ 1.32269 kg/kA·h = 31 501.46 kA
   *   I(CE = 0.96) = 31 501.46 / 0.96               = 32 814.02 kA
   *   area         = 32 814 021 A ÷ 6000 A/m²        = 5469.004 m²
   *   cells        = 5469.004 ÷ 2.7 m² = 2025.557 → 2026
   *   U(6 kA/m²)   = 2.35 + 1e-4·6000 = 2.95 V; 600 V ÷ 2.95 V = 203.39 → 203 in series
   *   electrolysers = ceil(2026/203) = 10 (6 × 203 + 4 × 202)
   *   j_op = 32 814 021 A ÷ (2026 × 2.7 m²) = 5998.70 A/m²
   */
  const r = sizePlant(chlorineBase());

  it('total current and area', () => {
    expectClose(r.design.totalCurrent, 32814.021e3, { rtol: TABLE_RTOL }, 'I');
    expectClose(r.design.activeArea, 5469.004, { rtol: TABLE_RTOL }, 'area');
    expectClose(r.design.cellsExact, 2025.557, { rtol: TABLE_RTOL }, 'cells exact');
    expect(r.cells.total).toBe(2026);
  });

  it('rectifier bounds the cells in series and sets the electrolyser count', () => {
    expect(r.cells.maxInSeries).toBe(203);
    expect(r.electrolysers.count).toBe(10);
    expect(r.electrolysers.cellsEach.filter((n) => n === 203).length).toBe(6);
    expect(r.electrolysers.cellsEach.filter((n) => n === 202).length).toBe(4);
    expect(r.electrolysers.cellsEach.reduce((a, b) => a + b, 0)).toBe(2026);
    expectClose(r.electrolysers.voltageAtDesign, 203 * 2.95, { rtol: 1e-12 });
    expectClose(r.electrolysers.rectifierCurrentUse, (2.7 * 6000) / 20000, { rtol: 1e-12 });
  });

  it('operating current density meets the target exactly with whole cells', () => {
    expectClose(r.operating.currentDensity, 32814.021e3 / (2026 * 2.7), { rtol: TABLE_RTOL }, 'j_op');
    const cl2 = r.products.find((p) => p.id === 'Cl2')!;
    expectClose(cl2.massRate, 1e6 / 86400, { rtol: 1e-12 }, 'target met');
    expect(r.operating.currentDensity).toBeLessThanOrEqual(6000);
  });

  it('co-products from the published equivalents', () => {
    const kAh = (r.operating.totalCurrent / 1e3) * 0.96; // kA·h per h of useful charge
    const naoh = r.products.find((p) => p.id === 'NaOH')!;
    const h2 = r.products.find((p) => p.id === 'H2')!;
    expectClose(naoh.massRate * 3600, kAh * KG_PER_KAH.NaOH, { rtol: tableRtol('NaOH') }, 'NaOH');
    expectClose(h2.massRate * 3600, kAh * KG_PER_KAH.H2, { rtol: tableRtol('H2') }, 'H2');
    // 0.41815 Nm³ H₂ per kA·h (check-values §8).
    expectClose(h2.normalCubicMetresPerHour!, kAh * 0.41815, { rtol: 1e-5 }, 'H2 Nm3/h');
    expect(naoh.normalCubicMetresPerHour).toBeNull();
  });

  it('salt and water consumption follow the overall reaction 2 NaCl + 2 H₂O → Cl₂ + H₂ + 2 NaOH', () => {
    const naoh = r.products.find((p) => p.id === 'NaOH')!;
    const h2 = r.products.find((p) => p.id === 'H2')!;
    const salt = r.feeds.find((f) => f.id === 'NaCl')!;
    const water = r.feeds.find((f) => f.id === 'H2O')!;
    // M(NaCl) = 22.990 + 35.45 = 58.44 g/mol; M(NaOH) = 39.997; M(H2O) = 18.015; M(H2) = 2.016 (IUPAC abridged).
    expectClose(salt.massRate, (naoh.massRate / 39.997e-3) * 58.44e-3, { rtol: 1e-12 }, 'NaCl');
    expectClose(water.massRate, ((2 * h2.massRate) / 2.016e-3) * 18.015e-3, { rtol: 1e-12 }, 'H2O');
  });

  it('power, heat load and specific energy', () => {
    const U = r.operating.cellVoltage;
    expectClose(r.power.dc, U * r.operating.totalCurrent, { rtol: 1e-12 });
    expectClose(r.power.ac, r.power.dc / 0.97, { rtol: 1e-12 });
    // U_tn = 2.3111 V (check-values §2b); heat = (U − U_tn)·I.
    expectClose(r.power.heatLoad, (U - 2.3111) * r.operating.totalCurrent, { rtol: 1e-12 });
    // 756.0 kA·h per tonne Cl₂ (check-values §8): w = U·756.0/CE kWh/t.
    expectClose(r.specificEnergy.dc / 3600, (U * 756.0) / 0.96, { rtol: 1e-4 }, 'kWh/t');
  });

  it('design basis text and the uneven-split warning', () => {
    expect(r.designBasis.length).toBeGreaterThan(8);
    expect(r.designBasis.join('\n')).toMatch(/2026 \(/);
    expect(r.designBasis.join('\n')).toMatch(/licensed engineering practice govern/);
    expect(r.designBasis.join('\n')).toMatch(/Nm³/);
    expect(r.warnings.some((w) => /do not divide evenly/.test(w))).toBe(true);
  });
});

describe('sizePlant — specific energy check values', () => {
  it('3.0 V at 96 % CE gives 2363 kWh per t Cl₂ and 2094 per t NaOH (check-values §8)', () => {
    const cell = { kind: 'linear' as const, intercept: 3.0, slope: 0, currentEfficiency: 0.96 };
    const cl2 = sizePlant({ ...chlorineBase(), cell });
    expectClose(cl2.specificEnergy.dc / 3600, 2363, { rtol: 3e-4 }, 'per t Cl2');
    const naoh = sizePlant({ ...chlorineBase(), cell, target: { product: 'NaOH', massRate: 1e6 / 86400 } });
    expectClose(naoh.specificEnergy.dc / 3600, 2094, { rtol: 3e-4 }, 'per t NaOH');
  });

  it('water electrolysis at 1.8 V, 100 %: 47.86 kWh/kg H₂, O₂ and water from the equivalents', () => {
    const r = sizePlant({
      chemistry: 'water',
      target: { product: 'H2', massRate: 1000 / 86400 }, // 1 t/d H₂
      designCurrentDensity: 4000,
      activeAreaPerCell: 2.5,
      rectifier: { maxVoltage: 500, maxCurrent: 12000, efficiency: 0.95 },
      cell: { kind: 'linear', intercept: 1.8, slope: 0, currentEfficiency: 1 },
    });
    expectClose(r.specificEnergy.dc / 3.6e6, 47.86, { rtol: 2e-4 }, 'kWh/kg (check-values §8)');
    const kAh = r.operating.totalCurrent / 1e3;
    const o2 = r.products.find((p) => p.id === 'O2')!;
    expectClose(o2.massRate * 3600, kAh * KG_PER_KAH.O2, { rtol: tableRtol('O2') }, 'O2');
    // 0.20907 Nm³ O₂ per kA·h (check-values §8).
    expectClose(o2.normalCubicMetresPerHour!, kAh * 0.20907, { rtol: 2e-5 }, 'O2 Nm3/h');
    // Water: 18.6557 mol H₂ per kA·h (check-values §8) × 18.015 g/mol, one H₂O per H₂.
    const water = r.feeds.find((f) => f.id === 'H2O')!;
    expectClose(water.massRate * 3600, kAh * 18.6557 * 18.015e-3, { rtol: 1e-5 }, 'water');
    // U_tn = 1.48121 V (check-values §2b).
    expectClose(r.power.heatLoad, (1.8 - 1.48121) * r.operating.totalCurrent, { rtol: 1e-12 });
    expect(r.products.map((p) => p.id)).toEqual(['H2', 'O2']);
  });
});

describe('sizePlant — cell model with a parasitic current density', () => {
  it('operating j meets the target where CE(j) = 1 − j_p/j (closed form j_op = I/(N·A) + j_p)', () => {
    const jp = 100; // A/m², parasitic current density (invented)
    const input: SizingInput = {
      ...chlorineBase(),
      cell: {
        kind: 'model',
        evaluate: (j) => ({ cellVoltage: 2.35 + 1e-4 * j, currentEfficiency: 1 - jp / j }),
        thermoneutralVoltage: 2.3111,
      },
    };
    const r = sizePlant(input);
    // Charge rate at 100 %: 31 501.46 kA (hand calculation above); N·A·(j − j_p) = that.
    const expected = 31501.4604e3 / (r.cells.total * 2.7) + jp;
    expectClose(r.operating.currentDensity, expected, { rtol: TABLE_RTOL }, 'j_op');
    const cl2 = r.products.find((p) => p.id === 'Cl2')!;
    expectClose(cl2.massRate, 1e6 / 86400, { rtol: 1e-9 }, 'target met');
    expectClose(r.operating.currentEfficiency, 1 - jp / r.operating.currentDensity, { rtol: 1e-12 });
  });

  it('uses the model heat load when given', () => {
    const r = sizePlant({
      ...chlorineBase(),
      cell: { kind: 'model', evaluate: (j) => ({ cellVoltage: 2.95, currentEfficiency: 0.96, heatLoadPerArea: 0.5 * j }), thermoneutralVoltage: 2.3111 },
    });
    expectClose(r.power.heatLoad, 0.5 * r.operating.currentDensity * r.operating.activeArea, { rtol: 1e-12 });
    expect(r.power.heatLoadBasis).toBe('cell model');
  });
});

describe('sizePlant — validation', () => {
  const paths = (fn: () => unknown): string[] => {
    try {
      fn();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      return (e as InputError).issues.map((i) => i.path);
    }
    throw new Error('expected an InputError');
  };

  it('rejects zero and negative production rates', () => {
    expect(paths(() => sizePlant({ ...chlorineBase(), target: { product: 'Cl2', massRate: 0 } }))).toContain('target.massRate');
    expect(paths(() => sizePlant({ ...chlorineBase(), target: { product: 'Cl2', massRate: -1 } }))).toContain('target.massRate');
  });

  it('rejects current efficiency outside (0, 1]', () => {
    for (const ce of [0, -0.1, 1.01, NaN]) {
      expect(paths(() => sizePlant({ ...chlorineBase(), cell: { kind: 'linear', intercept: 2.35, slope: 1e-4, currentEfficiency: ce } }))).toContain(
        'cell.currentEfficiency',
      );
    }
    expect(paths(() => sizePlant({ ...chlorineBase(), coProductCurrentEfficiency: { H2: 1.2 } }))).toContain('coProductCurrentEfficiency.H2');
  });

  it('rejects a rectifier too small for one cell (current or voltage)', () => {
    const small = { ...chlorineBase(), rectifier: { maxVoltage: 600, maxCurrent: 15000, efficiency: 0.97 } };
    expect(paths(() => sizePlant(small))).toEqual(['rectifier.maxCurrent']);
    expect(() => sizePlant(small)).toThrow(/rectifier too small for one cell/);
    const lowVolt = { ...chlorineBase(), rectifier: { maxVoltage: 2, maxCurrent: 20000, efficiency: 0.97 } };
    expect(paths(() => sizePlant(lowVolt))).toEqual(['rectifier.maxVoltage']);
  });

  it('rejects a product that the chemistry does not make', () => {
    expect(paths(() => sizePlant({ ...chlorineBase(), target: { product: 'O2', massRate: 1 } }))).toContain('target.product');
  });

  it('co-product efficiency override changes only that product', () => {
    const r = sizePlant({ ...chlorineBase(), coProductCurrentEfficiency: { H2: 1 } });
    const h2 = r.products.find((p) => p.id === 'H2')!;
    const naoh = r.products.find((p) => p.id === 'NaOH')!;
    expectClose(h2.currentEfficiency, 1, { atol: 1e-15 }, 'H2 CE');
    expectClose(naoh.currentEfficiency, 0.96, { atol: 1e-15 }, 'NaOH CE');
  });
});
