import { describe, expect, it } from 'vitest';
import { thermalVoltage } from '../../server/core/constants.js';
import { InputError } from '../../server/core/errors.js';
import { fitTafel } from '../../server/core/kinetics/tafel.js';
import { AUTO_WINDOW_RULE } from '../../server/core/kinetics/window.js';
import { expectClose } from '../helpers/close.js';
import { bvPoints, logSpaced, tafelPoints } from './synthetic.js';

const T = 298.15;
const f = 1 / thermalVoltage(T);
const ALL = { minOverpotential: 0, maxOverpotential: Infinity };

function pathOf(fn: () => unknown): string | undefined {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputError) return e.issues[0].path;
    throw e;
  }
  return undefined;
}

describe('fitTafel on exact lines (identities)', () => {
  it('recovers slope, α and j0 from noise-free anodic data', () => {
    const alpha = 0.5;
    const b = 1 / (alpha * f);
    const pts = tafelPoints(logSpaced(1, 3, 12), 1e-2, b);
    const r = fitTafel(pts, { temperature: T, window: ALL, electrons: 1 });
    expectClose(r.parameters.tafelSlope.value, Math.LN10 * b, { rtol: 1e-10 });
    expectClose(r.parameters.transferCoefficient.value, alpha, { rtol: 1e-10 });
    expectClose(r.parameters.exchangeCurrentDensity.value, 1e-2, { rtol: 1e-9 });
    expect(r.branch).toBe('anodic');
    expect(r.parameters.singleStepSymmetryReading?.note).toMatch(/1 − β/);
    expect(r.parameters.singleStepSymmetryReading?.note).toMatch(/IUPAC 2014/);
  });

  it('cathodic branch: α_c and j0 from j < 0, η < 0; β reading', () => {
    const b = 1 / (1.2 * f);
    const pts = tafelPoints(logSpaced(0, 3, 10, -1), 0.05, b);
    const r = fitTafel(pts, { temperature: T, window: ALL, electrons: 2 });
    expect(r.branch).toBe('cathodic');
    expectClose(r.parameters.transferCoefficient.value, 1.2, { rtol: 1e-10 });
    expectClose(r.parameters.exchangeCurrentDensity.value, 0.05, { rtol: 1e-9 });
    expectClose(r.parameters.singleStepSymmetryReading?.value as number, 0.6, { rtol: 1e-10 });
    expect(r.parameters.singleStepSymmetryReading?.note).toMatch(/β = α_c\/n/);
    for (const q of r.residuals) expectClose(q.residual as number, 0, { atol: 1e-12 });
  });

  it('subtracts a known R_u, and fits R_u together with a and b', () => {
    const b = 1 / (0.8 * f);
    const ru = 2e-5; // Ω·m² (0.2 Ω·cm²)
    const pts = tafelPoints(logSpaced(1, 3.7, 15), 1e-3, b, { ru });
    const known = fitTafel(pts, { temperature: T, window: ALL, uncompensatedResistance: ru });
    expectClose(known.parameters.transferCoefficient.value, 0.8, { rtol: 1e-10 });
    expect(known.parameters.uncompensatedResistance?.fixed).toBe(true);
    const fitted = fitTafel(pts, { temperature: T, window: ALL, uncompensatedResistance: 'fit' });
    expectClose(fitted.parameters.uncompensatedResistance?.value as number, ru, { rtol: 1e-8 });
    expectClose(fitted.parameters.transferCoefficient.value, 0.8, { rtol: 1e-9 });
    expectClose(fitted.parameters.exchangeCurrentDensity.value, 1e-3, { rtol: 1e-8 });
    expect(fitted.correlation.names).toHaveLength(3);
  });
});

describe('fitTafel uncertainty', () => {
  it('seeded noise: true values inside the 95 % intervals; j0 interval asymmetric', () => {
    const b = 1 / (0.5 * f);
    const pts = tafelPoints(logSpaced(0, 3, 20), 1e-2, b, { sigma: 0.003, seed: 11 });
    const r = fitTafel(pts, { temperature: T, window: ALL });
    const p = r.parameters;
    const inside = (v: number, ci: [number, number] | null) => ci !== null && ci[0] <= v && v <= ci[1];
    expect(inside(Math.LN10 * b, p.tafelSlope.ci95)).toBe(true);
    expect(inside(0.5, p.transferCoefficient.ci95)).toBe(true);
    expect(inside(1e-2, p.exchangeCurrentDensity.ci95)).toBe(true);
    const [lo, hi] = p.exchangeCurrentDensity.ci95 as [number, number];
    expect(hi - p.exchangeCurrentDensity.value).toBeGreaterThan(p.exchangeCurrentDensity.value - lo);
    expect(r.statistics.degreesOfFreedom).toBe(18);
    // Residual SD estimates the noise σ = 3 mV (χ² with 18 dof: ±~35 % at 95 %).
    expect(r.statistics.residualStandardDeviation).toBeGreaterThan(0.0018);
    expect(r.statistics.residualStandardDeviation).toBeLessThan(0.0045);
  });

  it('95 % interval coverage over 400 seeds is 92–98 % for the Tafel slope and ln j0', () => {
    const b = 1 / (0.5 * f);
    const j0 = 1e-2;
    const currents = logSpaced(0, 3, 15);
    let slopeHits = 0;
    let j0Hits = 0;
    const seeds = 400;
    for (let seed = 1; seed <= seeds; seed++) {
      const r = fitTafel(tafelPoints(currents, j0, b, { sigma: 0.004, seed }), { temperature: T, window: ALL });
      const s = r.parameters.tafelSlope.ci95 as [number, number];
      const c = r.parameters.exchangeCurrentDensity.ci95 as [number, number];
      if (s[0] <= Math.LN10 * b && Math.LN10 * b <= s[1]) slopeHits++;
      if (c[0] <= j0 && j0 <= c[1]) j0Hits++;
    }
    // Binomial(400, 0.95): SD 1.1 %; 92–98 % is ±2.75 SD.
    expect(slopeHits / seeds).toBeGreaterThanOrEqual(0.92);
    expect(slopeHits / seeds).toBeLessThanOrEqual(0.98);
    expect(j0Hits / seeds).toBeGreaterThanOrEqual(0.92);
    expect(j0Hits / seeds).toBeLessThanOrEqual(0.98);
  });
});

describe('automatic window', () => {
  // Crafted data: BV with a limiting current, from the low-field region to near the limit.
  const p = { exchangeCurrentDensity: 1e-2, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5, anodicLimitingCurrentDensity: 3000 };
  const currents = logSpaced(-3, Math.log10(2700), 55);
  const pts = bvPoints(currents, p, T, { sigma: 0.001, seed: 5 });

  it('excludes the low-field points and the mass-transport bend, keeps ≥ 1 decade, recovers the slope', () => {
    const r = fitTafel(pts, { temperature: T, window: 'auto' });
    expect(r.status).toBe('ok');
    expect(r.window.automatic).toBe(true);
    expect(r.window.rule).toBe(AUTO_WINDOW_RULE);
    const used = r.residuals.filter((q) => q.used);
    const lowField = 4 * thermalVoltage(T); // α ≤ 1 here
    for (const q of used) {
      expect(q.overpotential).toBeGreaterThanOrEqual(lowField);
      expect(q.currentDensity).toBeLessThan(0.35 * 3000);
    }
    // The data do contain points in both excluded regions.
    expect(pts.some((q) => q.overpotential < lowField)).toBe(true);
    expect(pts.some((q) => q.currentDensity > 0.5 * 3000)).toBe(true);
    expect(r.window.decades).toBeGreaterThanOrEqual(1);
    // True 118.3 mV/decade (α = 0.5, check-values §9d); the accepted bend biases it by a few %.
    expectClose(r.parameters.tafelSlope.value, 0.1183, { rtol: 0.03 });
    expect(r.warnings.filter((w) => /bends upward/.test(w))).toHaveLength(0);
  });

  it('uses a lower low-field limit for steep slopes (α > 1: limit 4RT/(αF), floor 50 mV)', () => {
    const q = { exchangeCurrentDensity: 10, anodicTransferCoefficient: 2, cathodicTransferCoefficient: 1 };
    const r = fitTafel(bvPoints(logSpaced(0.5, 4, 30), q, T, { sigma: 0.0005, seed: 9 }), { temperature: T });
    expect(r.status).toBe('ok');
    expectClose(r.window.lowFieldLimit, 0.05, { atol: 0.003 }); // max(50 mV, 4RT/(2F) = 51.4 mV)
    expectClose(r.parameters.transferCoefficient.value, 2, { rtol: 0.03 });
  });

  it('explains in warnings when no window passes, and still fits the high-field points', () => {
    // Only half a decade of high-field current.
    const r = fitTafel(tafelPoints(logSpaced(2, 2.5, 8), 1e-2, 0.05, { sigma: 0.001, seed: 2 }), { temperature: T });
    expect(r.status).toBe('window-rule-not-met');
    expect(r.warnings.join(' ')).toMatch(/decade/);
  });

  it('throws InputError (path window) when too few points lie above the low-field limit', () => {
    const pts2 = tafelPoints(logSpaced(-2, -1, 8), 1e-2, 0.03);
    expect(pathOf(() => fitTafel(pts2, { temperature: T }))).toBe('window');
  });
});

describe('fitTafel warnings and input checks', () => {
  it('picks the larger branch when both are present and says so', () => {
    const pts = [...tafelPoints(logSpaced(1, 3, 10), 1e-2, 0.05), ...tafelPoints(logSpaced(1, 3, 6, -1), 1e-2, 0.05)];
    const r = fitTafel(pts, { temperature: T, window: ALL });
    expect(r.branch).toBe('anodic');
    expect(r.warnings.some((w) => /both anodic \(10\) and cathodic \(6\)/.test(w))).toBe(true);
    expect(r.residuals.filter((q) => q.fitted === null)).toHaveLength(6);
    const c = fitTafel(pts, { temperature: T, window: ALL, branch: 'cathodic' });
    expect(c.branch).toBe('cathodic');
  });

  it('warns on a narrow window, low-field points, few points, poor R²', () => {
    const narrow = fitTafel(tafelPoints(logSpaced(2, 2.6, 4), 1e-2, 0.05, { sigma: 0.004, seed: 3 }), { temperature: T, window: ALL });
    const text = narrow.warnings.join(' ');
    expect(text).toMatch(/decade/);
    expect(text).toMatch(/Only 4 point/);
    const noisy = fitTafel(tafelPoints(logSpaced(1, 3, 10), 1e-2, 0.05, { sigma: 0.03, seed: 3 }), { temperature: T, window: ALL });
    expect(noisy.statistics.rSquared).toBeLessThan(0.99);
    expect(noisy.warnings.join(' ')).toMatch(/R² = .* is below 0\.99/);
    const low = fitTafel(
      bvPoints(logSpaced(-2.5, 1, 15), { exchangeCurrentDensity: 1e-2, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5 }, T),
      { temperature: T, window: { minOverpotential: 0.005, maxOverpotential: 1 } },
    );
    expect(low.warnings.join(' ')).toMatch(/reverse reaction/);
  });

  it('flags upward curvature from an uncorrected ohmic drop', () => {
    const pts = tafelPoints(logSpaced(0, 3.5, 20), 1e-2, 0.03, { ru: 5e-5, sigma: 0.0005, seed: 4 });
    const r = fitTafel(pts, { temperature: T, window: ALL });
    expect(r.warnings.join(' ')).toMatch(/ohmic \(iR\) drop/);
    const fixed = fitTafel(pts, { temperature: T, window: ALL, uncompensatedResistance: 'fit' });
    expect(fixed.warnings.join(' ')).not.toMatch(/bends upward/);
  });

  it('InputError paths: zero current, empty window, too few points, bad temperature, no points', () => {
    const pts = tafelPoints(logSpaced(1, 3, 6), 1e-2, 0.05);
    expect(pathOf(() => fitTafel([...pts.slice(0, 3), { currentDensity: 0, overpotential: 0.1 }], { temperature: T }))).toBe('points[3].currentDensity');
    expect(pathOf(() => fitTafel(pts, { temperature: T, window: { minOverpotential: 2, maxOverpotential: 3 } }))).toBe('window');
    expect(pathOf(() => fitTafel(pts, { temperature: T, window: { minOverpotential: 0.3, maxOverpotential: 0.36 } }))).toBe('window');
    expect(pathOf(() => fitTafel(pts, { temperature: T, window: { minOverpotential: 0.3, maxOverpotential: 0.2 } }))).toBe('window.maxOverpotential');
    expect(pathOf(() => fitTafel(pts, { temperature: -5 }))).toBe('temperature');
    expect(pathOf(() => fitTafel([], { temperature: T }))).toBe('points');
    expect(pathOf(() => fitTafel([{ currentDensity: 1, overpotential: Number.NaN }], { temperature: T }))).toBe('points[0].overpotential');
  });

  it('AUTO_WINDOW_RULE states the thresholds in plain words', () => {
    expect(AUTO_WINDOW_RULE).toMatch(/50 mV/);
    expect(AUTO_WINDOW_RULE).toMatch(/one decade/);
    expect(AUTO_WINDOW_RULE).toMatch(/0\.99/);
  });
});
