import { describe, expect, it } from 'vitest';
import { expectClose } from '../helpers/close.js';
import {
  closedFormEconomicCurrentDensity,
  costSensitivity,
  economicCurrentDensity,
  productionCost,
  type CostInput,
} from '../../server/core/plant/costs.js';
import { InputError } from '../../server/core/errors.js';

/** An invented chlor-alkali cost study (prices clearly fictional). */
function study(): CostInput {
  return {
    product: 'Cl2',
    cell: { kind: 'linear', intercept: 2.35, slope: 1e-4, currentEfficiency: 0.96 },
    energyPrice: 0.06, // per kWh
    capitalCostPerArea: 25000, // per m²
    operatingHoursPerYear: 8000,
    discountRate: 0.08,
    lifeYears: 15,
    currentDensityRange: { min: 1000, max: 10000 },
    designCurrentDensity: 6000,
  };
}

describe('productionCost — hand calculation at 6 kA/m²', () => {
  /*
   * U = 2.35 + 1e-4·6000 = 2.95 V, CE = 0.96.
   * Energy: 756.0 kA·h per t Cl₂ (check-values §8) → 2.95 × 756.0 / 0.96 = 2323.1 kWh/t
   *         × 0.06 per kWh = 139.39 per t.
   * Capital: 6 kA/m² × 0.96 × 1.32269 kg/kA·h = 7.6187 kg/(m²·h);
   *          CRF(8 %, 15) = 0.116 829 545 (Python decimal);
   *          25 000 × 0.116 829 545 / (8000 h × 7.6187e-3 t/(m²·h)) = 47.92 per t.
   */
  const c = productionCost(study(), 6000);
  it('energy and capital per tonne', () => {
    expectClose(c.energyCost * 1000, (2.95 * 756.0 * 0.06) / 0.96, { rtol: 1e-4 }, 'energy per t');
    const tonnesPerAreaHour = (6 * 0.96 * 1.32269) / 1000;
    expectClose(c.capitalCost * 1000, (25000 * 0.116829545) / (8000 * tonnesPerAreaHour), { rtol: 1e-5 }, 'capital per t');
    expectClose(c.totalCost, c.energyCost + c.capitalCost, { rtol: 1e-15 }, 'sum');
  });
});

describe('economic current density', () => {
  it('numeric optimum equals the closed form j* = √(1000·C·CRF/(H·p·K)) for a linear cell', () => {
    /*
     * Hand value: 1000 × 25 000 × 0.116 829 544 936 / (8000 × 0.06 × 1e-4) = 60 848 721.3 (A/m²)²
     * → j* = 7800.559 A/m² (Python decimal: 7800.5590389948…).
     */
    const r = economicCurrentDensity(study());
    expect(r.status).toBe('converged');
    expectClose(r.closedForm!.currentDensity, 7800.5590389948, { rtol: 1e-12 }, 'closed form vs hand');
    // Brent on a flat minimum locates x to about √ε: 1e-7 relative is the honest tolerance.
    expectClose(r.currentDensity, r.closedForm!.currentDensity, { rtol: 1e-7 }, 'numeric vs closed form');
    expect(r.closedForm!.insideRange).toBe(true);
  });

  it('at the optimum the marginal energy and capital costs balance (dc/dj = 0 ⇒ c_E,var = c_C)', () => {
    // For the linear cell, c_E = a·p·U0/3.6e6 + a·p·K·j/3.6e6 and c_C ∝ 1/j; at j* the j-dependent
    // energy part equals the capital part (the classic equal-cost rule).
    const input = study();
    const r = economicCurrentDensity(input);
    const fixedEnergyShare = productionCost({ ...input, cell: { ...input.cell, slope: 0 } as CostInput['cell'] }, r.currentDensity).energyCost;
    expectClose(r.cost.energyCost - fixedEnergyShare, r.cost.capitalCost, { rtol: 1e-6 }, 'equal-cost rule');
  });

  it('display figures are decimal strings, half-up to the cent', () => {
    const r = economicCurrentDensity(study());
    expect(r.display.totalPerTonne).toMatch(/^\d+\.\d{2}$/);
    expect(r.display.rounding).toBe('half-up');
    // Design point (6000 A/m²) shown beside it: 139.39 + 47.92 = 187.31 per t (hand above).
    expect(r.design!.display.energyPerTonne).toBe('139.39');
    expect(r.design!.display.capitalPerTonne).toBe('47.92');
    expect(r.design!.display.totalPerTonne).toBe('187.31');
  });

  it('reports a range-end optimum with a warning', () => {
    const r = economicCurrentDensity({ ...study(), currentDensityRange: { min: 1000, max: 5000 } });
    expect(r.status).toBe('converged:at-upper-bound');
    expectClose(r.currentDensity, 5000, { rtol: 1e-12 });
    expect(r.warnings.join(' ')).toMatch(/upper end/);
    const low = economicCurrentDensity({ ...study(), currentDensityRange: { min: 9000, max: 20000 } });
    expect(low.status).toBe('converged:at-lower-bound');
  });

  it('a cell model with CE = 1 − j_p/j moves the optimum up and is a true local minimum', () => {
    const jp = 150; // A/m², invented parasitic current density
    const input: CostInput = {
      ...study(),
      cell: { kind: 'model', evaluate: (j) => ({ cellVoltage: 2.35 + 1e-4 * j, currentEfficiency: 1 - jp / j }), thermoneutralVoltage: 2.3111 },
    };
    const r = economicCurrentDensity(input);
    expect(r.closedForm).toBeNull();
    expect(r.status).toBe('converged');
    const jStar = r.currentDensity;
    const cost = (j: number) => productionCost(input, j).totalCost;
    expect(cost(jStar)).toBeLessThanOrEqual(cost(jStar * 1.001));
    expect(cost(jStar)).toBeLessThanOrEqual(cost(jStar * 0.999));
    expect(jStar).toBeGreaterThan(7800.56);
  });

  it('closed form is null for K = 0 (cost falls monotonically with j)', () => {
    const input = { ...study(), cell: { kind: 'linear' as const, intercept: 2.9, slope: 0, currentEfficiency: 0.96 } };
    expect(closedFormEconomicCurrentDensity(input)).toBeNull();
    expect(economicCurrentDensity(input).status).toBe('converged:at-upper-bound');
  });
});

describe('cost sensitivity (tornado, ±20 %)', () => {
  const input = study();
  const s = costSensitivity(input, { currentDensity: 6000 });
  const base = productionCost(input, 6000);

  it('rows are sorted by swing and cover the eight inputs of a linear cell', () => {
    expect(s.rows.map((r) => r.parameter).sort()).toEqual(
      ['capitalCostPerArea', 'currentEfficiency', 'discountRate', 'energyPrice', 'intercept', 'lifeYears', 'operatingHoursPerYear', 'slope'].sort(),
    );
    for (let k = 1; k < s.rows.length; k++) expect(s.rows[k - 1].swing).toBeGreaterThanOrEqual(s.rows[k].swing);
    expectClose(s.baseTotalPerTonne, base.totalCost * 1000, { rtol: 1e-14 });
  });

  it('cost is linear in price and capital: ±20 % moves it by ±20 % of that part', () => {
    const price = s.rows.find((r) => r.parameter === 'energyPrice')!;
    expectClose(price.high.totalPerTonne - s.baseTotalPerTonne, 0.2 * base.energyCost * 1000, { rtol: 1e-10 });
    expectClose(s.baseTotalPerTonne - price.low.totalPerTonne, 0.2 * base.energyCost * 1000, { rtol: 1e-10 });
    const capex = s.rows.find((r) => r.parameter === 'capitalCostPerArea')!;
    expectClose(capex.swing, 0.4 * base.capitalCost * 1000, { rtol: 1e-10 });
  });

  it('hours and current efficiency are capped at their physical limits, with a note', () => {
    const hours = s.rows.find((r) => r.parameter === 'operatingHoursPerYear')!;
    expectClose(hours.high.value, 8760, { atol: 1e-9 });
    expect(hours.note).toMatch(/capped/);
    const ce = s.rows.find((r) => r.parameter === 'currentEfficiency')!;
    expectClose(ce.high.value, 1, { atol: 1e-15 });
    expect(ce.note).toMatch(/capped/);
  });

  it('a cell model gets cell-voltage and CE factors instead of K and U0', () => {
    const model: CostInput = {
      ...input,
      cell: { kind: 'model', evaluate: (j) => ({ cellVoltage: 2.35 + 1e-4 * j, currentEfficiency: 0.96 }), thermoneutralVoltage: 2.3111 },
    };
    const m = costSensitivity(model, { currentDensity: 6000 });
    const params = m.rows.map((r) => r.parameter);
    expect(params).toContain('cellVoltage');
    expect(params).not.toContain('slope');
    const volt = m.rows.find((r) => r.parameter === 'cellVoltage')!;
    expectClose(volt.swing, 0.4 * base.energyCost * 1000, { rtol: 1e-10 });
  });
});

describe('cost input validation', () => {
  it('names each bad field', () => {
    try {
      economicCurrentDensity({ ...study(), energyPrice: -1, operatingHoursPerYear: 9000, currentDensityRange: { min: 5000, max: 4000 } });
      throw new Error('expected an InputError');
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      const paths = (e as InputError).issues.map((i) => i.path);
      expect(paths).toEqual(expect.arrayContaining(['energyPrice', 'operatingHoursPerYear', 'currentDensityRange.max']));
    }
  });
});
