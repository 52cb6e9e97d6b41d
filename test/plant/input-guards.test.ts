/**
 * Regression tests for the input guards of the plant core: a plant scale that would exhaust
 * memory or round to zero cells (sizing), a capital recovery factor at a rate or life so small
 * that (1+i)ⁿ rounds to 1 (money), cost figures that overflow (costs), and a payback that
 * overflows when the saving is subnormal (coatings). All plant data are invented.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../server/core/errors.js';
import { compareCoatings, type CoatingComparisonInput } from '../../server/core/plant/coatings.js';
import { economicCurrentDensity, type CostInput } from '../../server/core/plant/costs.js';
import { sci, sig } from '../../server/core/plant/format.js';
import { annuityFactor, capitalRecoveryFactor } from '../../server/core/plant/money.js';
import { MAX_PLANT_CELLS, MIN_CELL_FRACTION, sizePlant, type SizingInput } from '../../server/core/plant/sizing.js';
import { expectClose } from '../helpers/close.js';

/** The InputError thrown by `fn` (fails the test when none or another kind is thrown). */
function inputError(fn: () => unknown): InputError {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError');
}

/** Every number reachable in `o` is finite (no NaN/Infinity would leak into JSON). */
function allFinite(o: unknown): boolean {
  if (typeof o === 'number') return Number.isFinite(o);
  if (o && typeof o === 'object') return Object.values(o).every(allFinite);
  return true;
}

describe('sizePlant — plant scale guards (reviewer reproducers)', () => {
  /** Chlorine at 1 A/m² on 0.001 m² cells, linear cell 2.35 V + 1e-4 V per A/m², CE 0.96. */
  const tiny = (massRate: number, over: Partial<SizingInput> = {}): SizingInput => ({
    chemistry: 'chlor-alkali',
    target: { product: 'Cl2', massRate },
    designCurrentDensity: 1,
    activeAreaPerCell: 0.001,
    rectifier: { maxVoltage: 600, maxCurrent: 20000, efficiency: 0.97 },
    cell: { kind: 'linear', intercept: 2.35, slope: 1e-4, currentEfficiency: 0.96 },
    ...over,
  });

  it('100 kg/s Cl₂ at 1 A/m² on 0.001 m² cells: InputError naming the count (no heap exhaustion)', () => {
    /*
     * Hand calculation (Faraday's law, check-values §8: 1.32269 kg Cl₂ per kA·h at 100 % CE):
     *   I = 100 kg/s × 3600 s/h ÷ 1.32269 kg/kA·h ÷ 0.96 = 283 505 kA = 2.835e8 A
     *   N = I ÷ (1 A/m² × 0.001 m²) = 2.8e11 cells.
     */
    const err = inputError(() => sizePlant(tiny(100)));
    expect(err.issues.map((i) => i.path)).toEqual(['target.massRate']);
    expect(err.issues[0].message).toContain('would need 2.8e11 cells');
    expect(err.issues[0].message).toMatch(/check the units/);
  });

  it('1e-12 kg/s on a 2.7 m² cell at 6 kA/m²: InputError (below a millionth of a cell), never 0 cells or Infinity', () => {
    // One cell makes 2.7 × 6000 × 0.96 A ÷ (3.6e6 C/kA·h) × 1.32269 kg/kA·h ≈ 5.7e-3 kg/s, so
    // 1e-12 kg/s is ≈ 1.8e-10 of one cell (hand, from the check-values §8 equivalent).
    const err = inputError(() => sizePlant(tiny(1e-12, { designCurrentDensity: 6000, activeAreaPerCell: 2.7 })));
    expect(err.issues[0].path).toBe('target.massRate');
    expect(err.issues[0].message).toContain('would need only 1.8e-10 of one cell');
  });

  it('a fraction of a cell above the floor is sized as one whole cell meeting the target', () => {
    // 1e-12 kg/s on the 0.001 m² / 1 A/m² cell: N = 1e-12/100 × 2.835e11 ≈ 2.8e-3 of a cell.
    const r = sizePlant(tiny(1e-12));
    expect(r.cells.total).toBe(1);
    expect(r.electrolysers.count).toBe(1);
    expectClose(r.design.cellsExact, 2.835e-3, { rtol: 1e-3 }, 'cells needed (hand, above)');
    // One cell runs below design to meet the target exactly: j_op = N_exact × j_design.
    expectClose(r.operating.currentDensity, r.design.cellsExact * 1, { rtol: 1e-12 }, 'j_op');
    const cl2 = r.products.find((p) => p.id === 'Cl2')!;
    expectClose(cl2.massRate, 1e-12, { rtol: 1e-12 }, 'target met');
    expect(allFinite(r)).toBe(true);
  });

  it('the bounds are the web layer’s (1e6 cells, 1e-6 of a cell) and hold at their edges', () => {
    expect(MAX_PLANT_CELLS).toBe(1_000_000);
    expectClose(MIN_CELL_FRACTION, 1e-6, { rtol: 0 }, 'floor');
    // 2.835e11 cells per 100 kg/s → 1e6 cells at 100 × 1e6/2.835e11 ≈ 3.5e-4 kg/s.
    expect(sizePlant(tiny(3.4e-4)).cells.total).toBeLessThanOrEqual(MAX_PLANT_CELLS);
    expect(inputError(() => sizePlant(tiny(3.6e-4))).issues[0].path).toBe('target.massRate');
  });

  it('a non-finite count (overflow) is refused too', () => {
    const err = inputError(() => sizePlant(tiny(1e308, { designCurrentDensity: 1e-300 })));
    expect(err.issues[0].message).toContain('more than 1e308 cells');
  });
});

describe('plant text formatting of extreme magnitudes', () => {
  it('exponent form outside 1e-6…1e15, grouped digits inside (our formatting choice)', () => {
    expect(sig(41666.67)).toBe('41,670');
    expect(sig(3.2e20, 2)).toBe('3.2e20');
    expect(sig(1e-300)).toBe('1e-300');
    expect(sci(2.835e11, 2)).toBe('2.8e11');
  });
});

describe('capitalRecoveryFactor — tiny rates and lives (reviewer reproducers)', () => {
  it('discount rate 1e-302: the i → 0 limit 1/n, not a division by zero', () => {
    // (1 + 1e-302)^10 rounds to 1 in 40 digits; the limit of CRF at i → 0 is 1/n = 0.1.
    expect(capitalRecoveryFactor(1e-302, 10).toSignificantDigits(30).toString()).toBe('0.1');
  });

  it('small i·n follows the series CRF = (1/n)(1 + i(n+1)/2 + …) (Python decimal, 1000 digits)', () => {
    // Python: i=D('1e-20'); g=(1+i)**25; i*g/(g-1) → 0.0400000000000000000052000000000
    expect(capitalRecoveryFactor(1e-20, 25).toSignificantDigits(25).toString()).toBe('0.0400000000000000000052');
    // Python: i=D('1e-12'); g=(1+i)**8; i*g/(g-1) → 0.125000000000562500000000656250
    expect(capitalRecoveryFactor(1e-12, 8).toSignificantDigits(24).toString()).toBe('0.125000000000562500000001');
    // Python: i=D('0.00001'); g=(1+i)**30 → 0.0333385002497209732444412114491
    expect(capitalRecoveryFactor(1e-5, 30).toSignificantDigits(25).toString()).toBe('0.03333850024972097324444121');
  });

  it('either side of the series threshold agrees with an independent 1000-digit computation', () => {
    // Python decimal, prec 1000: i*g/(g-1), g = (1+i)**20.
    expect(capitalRecoveryFactor(0.001, 20).toSignificantDigits(25).toString()).toBe('0.05052666165820946240115169');
    expect(capitalRecoveryFactor(0.00099, 20).toSignificantDigits(25).toString()).toBe('0.05052137859956360013291604');
  });

  it('life 1e-300 years: a finite factor ≈ 1/(n·ln(1+i))·i (Python decimal: 1.03948697703421629878e300), not a division by zero', () => {
    // Python: x = D('1e-300')*D('1.08').ln(); g = x.exp(); D('0.08')*g/(g-1)
    expect(capitalRecoveryFactor(0.08, 1e-300).toSignificantDigits(21).toString()).toBe('1.03948697703421629878e+300');
  });

  it('negative rate: CRF(−50 %, 10) = 0.000488758553274682306940371 (Python decimal)', () => {
    expect(capitalRecoveryFactor(-0.5, 10).toSignificantDigits(24).toString()).toBe('0.000488758553274682306940371');
  });

  it('non-positive or non-finite life and a factor outside the decimal range are InputErrors with a field', () => {
    expect(inputError(() => capitalRecoveryFactor(0.08, 0)).issues[0].path).toBe('lifeYears');
    expect(inputError(() => capitalRecoveryFactor(0.08, -1)).issues[0].path).toBe('lifeYears');
    expect(inputError(() => capitalRecoveryFactor(0.08, Infinity)).issues[0].path).toBe('lifeYears');
    // (1 − 0.999999)^−1e30 overflows the decimal range: CRF would underflow to 0 and 1/CRF to Infinity.
    expect(inputError(() => annuityFactor(-0.999999, 1e30)).issues[0].path).toBe('discountRate');
  });
});

describe('economicCurrentDensity — overflowing cost figures (reviewer reproducer)', () => {
  const study = (over: Partial<CostInput> = {}): CostInput => ({
    product: 'Cl2',
    cell: { kind: 'linear', intercept: 2.35, slope: 1e-4, currentEfficiency: 0.96 },
    energyPrice: 0.05,
    capitalCostPerArea: 20000,
    operatingHoursPerYear: 8000,
    discountRate: 0.08,
    lifeYears: 10,
    currentDensityRange: { min: 1000, max: 10000 },
    ...over,
  });

  it('discount rate 1e-302 and life 1e-300 give finite results instead of "objective not finite"', () => {
    const atTinyRate = economicCurrentDensity(study({ discountRate: 1e-302 }));
    expectClose(atTinyRate.capitalRecoveryFactor, 0.1, { rtol: 1e-15 }, 'CRF → 1/n');
    expect(allFinite(atTinyRate)).toBe(true);
    expect(allFinite(economicCurrentDensity(study({ lifeYears: 1e-300 })))).toBe(true);
  });

  it('cost figures that overflow float64 are InputErrors on the input that drives them', () => {
    const pathOf = (over: Partial<CostInput>) => inputError(() => economicCurrentDensity(study(over))).issues.map((i) => i.path);
    expect(pathOf({ capitalCostPerArea: 1e300, lifeYears: 1e-300 })).toEqual(['capitalCostPerArea']);
    expect(pathOf({ lifeYears: 1e-320 })).toEqual(['lifeYears']); // CRF ≈ 1/n overflows float64
    expect(pathOf({ energyPrice: 1e308 })).toEqual(['energyPrice']);
    expect(pathOf({ cell: { kind: 'linear', intercept: 2.35, slope: 1e-4, currentEfficiency: 1e-302 } })).toEqual(['cell']);
  });
});

describe('compareCoatings — payback with a subnormal saving (reviewer reproducer)', () => {
  /** Two invented coatings on 1000 m² at 6 kA/m² (fictional prices), 8 %. */
  const pair = (over: Partial<CoatingComparisonInput> = {}): CoatingComparisonInput => ({
    product: 'Cl2',
    currentDensity: 6000,
    activeArea: 1000,
    energyPrice: 0.05,
    operatingHoursPerYear: 8000,
    discountRate: 0.08,
    options: [
      { name: 'Coating A (baseline)', performance: { kind: 'point', cellVoltage: 3.0, currentEfficiency: 0.96 }, pricePerArea: 1500, voltageRisePerYear: 0, lifeYears: 10 },
      { name: 'Coating B', performance: { kind: 'point', cellVoltage: 2.95, currentEfficiency: 0.96 }, pricePerArea: 2500, voltageRisePerYear: 0, lifeYears: 10 },
    ],
    ...over,
  });

  it('operatingHours 1e-320: payback null ("never pays back") with a note, every number finite', () => {
    const r = compareCoatings(pair({ operatingHoursPerYear: 1e-320 }));
    const b = r.rows[1];
    expect(b.simplePaybackYears).toBeNull();
    expect(b.display.simplePaybackYears).toBe('—');
    expect(b.notes.join(' ')).toMatch(/never pays back/);
    expect(allFinite(r)).toBe(true);
  });

  it('a payback of over 1000 years is reported as never paying back (1e-300 h/yr)', () => {
    // Saving 120 000 per year at 8000 h/yr (hand, coatings.test.ts) → 1.5e-302 per year at
    // 1e-300 h/yr; payback 1e6 / 1.5e-302 ≈ 6.7e307 years.
    const b = compareCoatings(pair({ operatingHoursPerYear: 1e-300 })).rows[1];
    expect(b.simplePaybackYears).toBeNull();
    expect(b.notes.join(' ')).toMatch(/over 1000 years/);
  });

  it('an ordinary payback is unchanged: 1e6 / 120 000 = 8.333 yr (hand, coatings.test.ts)', () => {
    expectClose(compareCoatings(pair()).rows[1].simplePaybackYears!, 1e6 / 120000, { rtol: 1e-12 }, 'payback');
  });
});
