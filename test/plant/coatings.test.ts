import { describe, expect, it } from 'vitest';
import { expectClose } from '../helpers/close.js';
import { compareCoatings, type CoatingComparisonInput } from '../../server/core/plant/coatings.js';
import { InputError } from '../../server/core/errors.js';

/** Two invented anode coatings on 1000 m² at 6 kA/m² (fictional prices). */
function pair(rate: number): CoatingComparisonInput {
  return {
    product: 'Cl2',
    currentDensity: 6000,
    activeArea: 1000,
    energyPrice: 0.05,
    operatingHoursPerYear: 8000,
    discountRate: rate,
    options: [
      { name: 'Coating A (baseline)', performance: { kind: 'point', cellVoltage: 3.0, currentEfficiency: 0.96 }, pricePerArea: 1500, voltageRisePerYear: 0, lifeYears: 10 },
      { name: 'Coating B', performance: { kind: 'point', cellVoltage: 2.95, currentEfficiency: 0.96 }, pricePerArea: 2500, voltageRisePerYear: 0, lifeYears: 10 },
    ],
  };
}

describe('compareCoatings — hand calculation', () => {
  /*
   * Current 6000 A/m² × 1000 m² = 6 MA; energy saved = 0.05 V × 6e6 A × 8000 h = 2.4e6 kWh/yr
   * → 120 000 per year at 0.05 per kWh. Extra capital (2500 − 1500) × 1000 m² = 1 000 000.
   * Simple payback 1e6 / 120 000 = 8.333 yr.
   * NPV at 0 %: −1 000 000 + 10 × 120 000 = 200 000.
   * NPV at 8 %: −1 000 000 + 120 000 × (P/A, 8 %, 10) = −1e6 + 120 000 × 6.710 081 399
   *           = −194 790.23 (Python decimal).
   */
  it('saving, payback and NPV at 0 %', () => {
    const r = compareCoatings(pair(0));
    const b = r.rows[1];
    expectClose(b.annualSavingVsBaseline, 120000, { rtol: 1e-12 }, 'saving');
    expectClose(b.extraCapital, 1e6, { rtol: 1e-15 }, 'extra capital');
    expectClose(b.simplePaybackYears!, 1e6 / 120000, { rtol: 1e-12 }, 'payback');
    expectClose(b.npvVsBaseline, 200000, { rtol: 1e-12 }, 'NPV 0 %');
    expect(b.display.simplePaybackYears).toBe('8.3');
    expect(r.rows[0].isBaseline).toBe(true);
    expect(r.rows[0].display.npvVsBaseline).toBe('0.00');
  });

  it('NPV at 8 % over 10 years', () => {
    const b = compareCoatings(pair(0.08)).rows[1];
    expectClose(b.npvVsBaseline, -194790.232127, { rtol: 1e-10 }, 'NPV 8 %');
    expect(b.display.npvVsBaseline).toBe('-194790.23');
  });

  it('specific energy at the design point: 3.0 V at 96 % → 2363 kWh/t Cl₂ (check-values §8)', () => {
    const a = compareCoatings(pair(0)).rows[0];
    expectClose(a.specificEnergy / 3600, 2363, { rtol: 3e-4 });
  });

  it('a voltage rise ρ raises the life-average voltage by ρ·n/2 and costs accordingly', () => {
    const input = pair(0);
    input.options[1] = { ...input.options[1], voltageRisePerYear: 0.01 };
    const b = compareCoatings(input).rows[1];
    expectClose(b.averageCellVoltage, 2.95 + 0.01 * 5, { rtol: 1e-14 });
    // Mean gap to the baseline: 0.05 − 0.05 = 0 V → no saving, never pays back.
    expectClose(b.annualSavingVsBaseline, 0, { atol: 1e-6 });
    expect(b.simplePaybackYears).toBeNull();
    expect(b.notes.join(' ')).toMatch(/never pays back/);
    // NPV at 0 % = −ΔK + Σ saving_t; saving_t = (0.05 − 0.01·(t − ½)) V × 6e6 A × 8000 h × 0.05 → sums to 0.
    expectClose(b.npvVsBaseline, -1e6, { rtol: 1e-9 });
  });

  it('unequal lives: equivalent annual costs, with a warning; a 2-year case by hand', () => {
    /*
     * Baseline A: K = 1 500 000, energy cost per year E_A; life 2 yr at 10 %:
     *   PV_A = 1.5e6 + E_A/1.1 + E_A/1.21;   EAC_A = PV_A × CRF(10 %, 2) = PV_A × 0.576 190 476
     * Option B, life 3 yr: PV_B = 2.5e6 + E_B(1/1.1 + 1/1.21 + 1/1.331); EAC_B = PV_B × 0.402 114 804
     * NPV_B = (EAC_A − EAC_B) × (P/A, 10 %, 3) = (EAC_A − EAC_B) × 2.486 851 991
     * E = U × 6e6 A × 8000 h / 1000 × 0.05 per kWh: E_A = 7 200 000, E_B = 7 080 000.
     */
    const input = pair(0.1);
    input.options[0] = { ...input.options[0], lifeYears: 2 };
    input.options[1] = { ...input.options[1], lifeYears: 3 };
    const r = compareCoatings(input);
    const EA = 3.0 * 6e6 * 8000 / 1000 * 0.05;
    const EB = 2.95 * 6e6 * 8000 / 1000 * 0.05;
    const eacA = (1.5e6 + EA / 1.1 + EA / 1.21) * (0.1 * 1.21 / 0.21);
    const eacB = (2.5e6 + EB * (1 / 1.1 + 1 / 1.21 + 1 / 1.331)) * (0.1 * 1.331 / 0.331);
    expectClose(r.rows[0].equivalentAnnualCost, eacA, { rtol: 1e-12 }, 'EAC A');
    expectClose(r.rows[1].equivalentAnnualCost, eacB, { rtol: 1e-12 }, 'EAC B');
    expectClose(r.rows[1].npvVsBaseline, (eacA - eacB) * (0.331 / (0.1 * 1.331)), { rtol: 1e-10 }, 'NPV B');
    expect(r.warnings.join(' ')).toMatch(/lives differ/);
  });

  it('accepts linear and model cell performance and a different baseline', () => {
    const input = pair(0.08);
    input.options.push({
      name: 'Coating C',
      performance: { kind: 'linear', intercept: 2.3, slope: 1e-4, currentEfficiency: 0.96 },
      pricePerArea: 2000,
      voltageRisePerYear: 0.005,
      lifeYears: 10,
    });
    input.baselineIndex = 2;
    const r = compareCoatings(input);
    expect(r.baselineIndex).toBe(2);
    expectClose(r.rows[2].cellVoltage, 2.9, { rtol: 1e-14 });
    expectClose(r.rows[2].npvVsBaseline, 0, { atol: 1e-9 });
  });
});

describe('compareCoatings — validation', () => {
  const paths = (input: CoatingComparisonInput) => {
    try {
      compareCoatings(input);
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      return (e as InputError).issues.map((i) => i.path);
    }
    throw new Error('expected an InputError');
  };

  it('needs 2–6 options, whole-year lives and a valid baseline', () => {
    const one = pair(0);
    one.options = one.options.slice(0, 1);
    expect(paths(one)).toContain('options');
    const seven = pair(0);
    seven.options = Array.from({ length: 7 }, () => pair(0).options[0]);
    expect(paths(seven)).toContain('options');
    const frac = pair(0);
    frac.options[1] = { ...frac.options[1], lifeYears: 7.5 };
    expect(paths(frac)).toContain('options.1.lifeYears');
    const base = pair(0);
    base.baselineIndex = 5;
    expect(paths(base)).toContain('baselineIndex');
    const neg = pair(0);
    neg.options[0] = { ...neg.options[0], voltageRisePerYear: -0.01 };
    expect(paths(neg)).toContain('options.0.voltageRisePerYear');
  });
});
