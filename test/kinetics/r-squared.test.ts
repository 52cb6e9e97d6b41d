/**
 * One R² per fit: the statistics, the R² warning and the automatic-window message quote the
 * same number — R² = 1 − RSS/TSS of the overpotential after subtracting a known j·R_u (the
 * iR-corrected η, domain.md §2). Regression for a fit whose statistics said R² = 0.995 while
 * a warning said "R² = 0.960" (the known iR drop was in one TSS and not in the other).
 * Data invented (synthetic, seeded).
 */
import { describe, expect, it } from 'vitest';
import { fitButlerVolmer } from '../../server/core/kinetics/butler-volmer.js';
import { fitKinetics } from '../../server/core/kinetics/fit.js';
import { expectClose } from '../helpers/close.js';
import { bvPoints, logSpaced, tafelPoints } from './synthetic.js';

/** R² by its definition, 1 − Σr²/Σ(y − ȳ)², over the used points, y = η − j·R_u. */
function rSquaredOf(residuals: { currentDensity: number; overpotential: number; residual: number | null; used: boolean }[], ru: number): number {
  const used = residuals.filter((q) => q.used);
  const y = used.map((q) => q.overpotential - q.currentDensity * ru);
  const mean = y.reduce((p, q) => p + q, 0) / y.length;
  const tss = y.reduce((p, q) => p + (q - mean) ** 2, 0);
  const rss = used.reduce((p, q) => p + (q.residual as number) ** 2, 0);
  return 1 - rss / tss;
}

const quoted = (warnings: string[]) => warnings.flatMap((w) => [...w.matchAll(/R² = (\d\.\d{4})/g)].map((m) => Number(m[1])));

describe('Tafel: the R² quoted is the R² of the statistics', () => {
  const T = 353.15;
  const ru = 2e-5;
  // A large known iR drop and 6 mV scatter: the corrected line is visibly noisy (R² < 0.99),
  // while η as measured would look straight because j·R_u spreads it.
  const pts = tafelPoints(logSpaced(2, 4, 20), 1, 0.02, { sigma: 0.006, seed: 4, ru });

  it.each(['auto', 'manual'] as const)('known R_u, %s window', (mode) => {
    const window = mode === 'auto' ? 'auto' : { minOverpotential: 0.05, maxOverpotential: 2 };
    const r = fitKinetics({ points: pts, model: 'tafel', temperature: T, window, uncompensatedResistance: ru });
    expectClose(r.statistics.rSquared, rSquaredOf(r.residuals, ru), { rtol: 1e-12 }, 'statistics R² = R² of the iR-corrected η');
    expect(r.statistics.rSquared).toBeLessThan(0.99);
    // The measured-η R² (known drop left in) would pass the rule of thumb: the two differ.
    expect(rSquaredOf(r.residuals, 0)).toBeGreaterThan(0.99);
    const values = quoted(r.warnings);
    expect(values.length).toBeGreaterThanOrEqual(mode === 'auto' ? 2 : 1);
    for (const v of values) expectClose(v, Number(r.statistics.rSquared.toFixed(4)), { atol: 0 }, 'quoted R²');
    expect(r.warnings.join(' ')).toMatch(/after subtracting the known j·R_u/);
    if (mode === 'auto') expect(r.warnings.join(' ')).toMatch(/The widest candidate, all 20 anodic point\(s\).*fails it: R² = /);
  });

  it('fitted R_u: R² of η as given', () => {
    const r = fitKinetics({ points: pts, model: 'tafel', temperature: T, window: { minOverpotential: 0.05, maxOverpotential: 2 }, uncompensatedResistance: 'fit' });
    expectClose(r.statistics.rSquared, rSquaredOf(r.residuals, 0), { rtol: 1e-12 }, 'R² of η as given');
  });
});

describe('Butler–Volmer: the same R² definition', () => {
  it('known R_u: R² of the iR-corrected η', () => {
    const T = 343.15;
    const ru = 1e-5;
    const pts = bvPoints(logSpaced(0, 3.5, 20), { exchangeCurrentDensity: 5, anodicTransferCoefficient: 1, cathodicTransferCoefficient: 1 }, T, { sigma: 0.002, seed: 9, ru });
    const r = fitButlerVolmer(pts, { temperature: T, electrons: 2, uncompensatedResistance: ru, cathodicTransferCoefficient: 1 });
    expect(r.converged).toBe(true);
    expectClose(r.statistics.rSquared, rSquaredOf(r.residuals, ru), { rtol: 1e-12 }, 'R²');
  });
});
