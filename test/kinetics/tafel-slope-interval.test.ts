/**
 * Tafel slope from a transfer coefficient, b = ln10·RT/(αF), and its 95 % interval when the
 * interval on α reaches 0 (regression: a tied Butler–Volmer fit whose α interval touched 0
 * reported an infinite upper end of the Tafel-slope interval, which the API refused as a
 * non-finite number). All data are invented (synthetic, seeded).
 */
import { describe, expect, it } from 'vitest';
import { tafelSlopeFromTransferCoefficient } from '../../server/core/kinetics/butler-volmer.js';
import { fitKinetics } from '../../server/core/kinetics/fit.js';
import type { FittedParameter } from '../../server/core/kinetics/types.js';
import { expectClose } from '../helpers/close.js';
import { bvPoints, logSpaced } from './synthetic.js';

/** CODATA 2018 exact values (independent of constants.ts): R J/(mol·K), F C/mol. */
const R = 8.314462618;
const F = 96485.33212;
const T25 = 298.15;
const f25 = F / (R * T25);

/**
 * Derived Tafel slopes at 25 °C, mV/decade (check-values §9d table "Derived Tafel slopes"):
 * α = 0.5 → 118.3, α = 1 → 59.2. Quoted to 0.1 mV: allow half a unit of the last decimal.
 */
const B_ALPHA_HALF_MV = 118.3;
const B_ALPHA_ONE_MV = 59.2;
const TABLE_ATOL_V = 0.05e-3;

const alpha = (value: number, ci95: [number, number] | null, standardError: number | null = 0.1): FittedParameter => ({
  value,
  standardError,
  ci95,
  unit: '1',
});

/** Every number reachable in `o` (names the first non-finite one). */
function firstNonFinite(o: unknown, at = 'result'): string | null {
  if (typeof o === 'number') return Number.isFinite(o) ? null : at;
  if (o && typeof o === 'object') {
    for (const [k, v] of Object.entries(o)) {
      const bad = firstNonFinite(v, `${at}.${k}`);
      if (bad) return bad;
    }
  }
  return null;
}

describe('tafelSlopeFromTransferCoefficient', () => {
  it('maps α and its interval to the published derived slopes (check-values §9d, 25 °C)', () => {
    const warnings: string[] = [];
    const b = tafelSlopeFromTransferCoefficient(alpha(0.5, [0.5, 1]), f25, 'anodic', warnings);
    expect(b).not.toBeNull();
    expectClose(b!.value, B_ALPHA_HALF_MV / 1000, { atol: TABLE_ATOL_V }, 'b(α = 0.5)');
    // The map is decreasing: the α interval [0.5, 1] becomes [b(1), b(0.5)].
    expectClose(b!.ci95![0], B_ALPHA_ONE_MV / 1000, { atol: TABLE_ATOL_V }, 'lower end b(α = 1)');
    expectClose(b!.ci95![1], B_ALPHA_HALF_MV / 1000, { atol: TABLE_ATOL_V }, 'upper end b(α = 0.5)');
    // Delta method: SE(b)/b = SE(α)/α (identity).
    expectClose(b!.standardError! / b!.value, 0.1 / 0.5, { rtol: 1e-12 }, 'relative SE');
    expect(warnings).toEqual([]);
  });

  it('an α interval reaching 0 gives an open slope interval (ci95 null) and a warning, never Infinity', () => {
    for (const lo of [0, -0.2, 5e-324]) {
      const warnings: string[] = [];
      const b = tafelSlopeFromTransferCoefficient(alpha(0.5, [lo, 1]), f25, 'cathodic', warnings);
      expect(b).not.toBeNull();
      expect(b!.ci95, `α interval from ${lo}`).toBeNull();
      expectClose(b!.value, B_ALPHA_HALF_MV / 1000, { atol: TABLE_ATOL_V }, 'value kept');
      expect(warnings.length).toBe(1);
      expect(warnings[0]).toMatch(/cathodic Tafel slope has no finite upper bound/);
      // The one-sided statement the data support: b > b(α_hi) = b(1) = 59.2 mV/decade.
      expect(warnings[0]).toMatch(/b > 59\.2 mV\/decade/);
      expect(firstNonFinite(b)).toBeNull();
    }
  });

  it('a non-finite standard error becomes null', () => {
    const b = tafelSlopeFromTransferCoefficient(alpha(1e-300, [1e-300, 1], 1e300), f25, 'anodic', []);
    expect(b!.standardError).toBeNull();
    expect(firstNonFinite(b)).toBeNull();
  });

  it('α zero at working precision: no slope (null) and a warning', () => {
    const warnings: string[] = [];
    expect(tafelSlopeFromTransferCoefficient(alpha(0, [0, 2]), f25, 'cathodic', warnings)).toBeNull();
    expect(warnings[0]).toMatch(/cathodic Tafel slope is not reported/);
  });

  it('a fixed α gives a fixed slope', () => {
    const b = tafelSlopeFromTransferCoefficient({ value: 1, standardError: 0, ci95: [1, 1], unit: '1', fixed: true }, f25, 'anodic', []);
    expectClose(b!.value, B_ALPHA_ONE_MV / 1000, { atol: TABLE_ATOL_V }, 'b(α = 1)');
    expect(b!.fixed).toBe(true);
  });
});

describe('tied Butler–Volmer fit whose α interval reaches 0 (regression)', () => {
  /*
   * Anodic-only synthetic data (invented): j0 = 5 A/m², α_a = 1.97, α_c = 0.03, n = 2, 70 °C,
   * R_u = 8e-6 Ω·m², 1 to 3162 A/m² (20 points, log-spaced), 3 mV noise, seed 5. Tied
   * α_a + α_c = 2 with R_u fitted: the logit of α_a/n is barely determined, so the linearised
   * interval on it maps to α intervals that reach 0 — the case that made the upper end of the
   * Tafel-slope interval infinite.
   */
  const T = 343.15;
  const points = bvPoints(logSpaced(0, 3.5, 20), { exchangeCurrentDensity: 5, anodicTransferCoefficient: 1.97, cathodicTransferCoefficient: 0.03 }, T, {
    sigma: 0.003,
    seed: 5,
    ru: 8e-6,
  });
  const r = fitKinetics({ points, model: 'butler-volmer', temperature: T, electrons: 2, uncompensatedResistance: 'fit', tieTransferCoefficients: true });

  it('every number in the result is finite', () => {
    expect(firstNonFinite(r)).toBeNull();
  });

  it('the slope whose α interval reaches 0 has ci95 null and a warning saying so', () => {
    const p = r.parameters;
    for (const [key, branch, a] of [
      ['anodicTafelSlope', 'anodic', p.anodicTransferCoefficient],
      ['cathodicTafelSlope', 'cathodic', p.cathodicTransferCoefficient],
    ] as const) {
      const slope = p[key];
      expect(slope, key).toBeDefined();
      if (a?.ci95 && a.ci95[0] <= 0) {
        expect(slope!.ci95, key).toBeNull();
        expect(r.warnings.some((w) => w.startsWith(`The ${branch} Tafel slope has no finite upper bound`)), key).toBe(true);
      } else {
        expect(slope!.ci95 === null || slope!.ci95.every(Number.isFinite), key).toBe(true);
      }
    }
    // This dataset does reach the guarded case (α_c's interval starts at 0).
    expect(p.cathodicTransferCoefficient!.ci95![0]).toBeLessThanOrEqual(0);
    expect(p.cathodicTafelSlope!.ci95).toBeNull();
  });

  it('the main (anodic) slope is still near the generating one', () => {
    // b = ln10·RT/(α_a F) with α_a = 1.97 at 343.15 K (domain.md §3), independent constants.
    expectClose(r.parameters.tafelSlope.value, (Math.LN10 * R * T) / (1.97 * F), { rtol: 0.05 }, 'anodic Tafel slope');
  });
});
