import { describe, expect, it } from 'vitest';
import { compareTafelButlerVolmer } from '../../server/core/kinetics/compare.js';
import { informationCriteria } from '../../server/core/kinetics/statistics.js';
import { expectClose } from '../helpers/close.js';
import { bvPoints, logSpaced, tafelPoints } from './synthetic.js';

const T = 298.15;

describe('compareTafelButlerVolmer', () => {
  it('prefers Butler–Volmer when the branch includes the low-field region', () => {
    const p = { exchangeCurrentDensity: 0.1, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5 };
    const pts = bvPoints(logSpaced(-2, 2.5, 30), p, T, { sigma: 0.001, seed: 21 });
    const c = compareTafelButlerVolmer(pts, { temperature: T });
    expect(c.tafel.points).toBe(c.butlerVolmer.points);
    expect(c.points).toBe(30);
    expect(c.deltaAic).toBeGreaterThan(10);
    expect(c.preferred).toBe('butler-volmer');
    expect(c.verdict).toMatch(/clearly better/);
    expect(c.butlerVolmer.residualStandardDeviation).toBeLessThan(c.tafel.residualStandardDeviation);
  });

  it('does not prefer Butler–Volmer on a clean Tafel window', () => {
    const pts = tafelPoints(logSpaced(1, 3, 20), 1e-3, 0.04, { sigma: 0.002, seed: 5 });
    const c = compareTafelButlerVolmer(pts, { temperature: T, basis: 'tafel-window', window: { minOverpotential: 0, maxOverpotential: 10 } });
    expect(c.preferred === 'tafel' || c.preferred === 'either').toBe(true);
    expect(c.tafel.points).toBe(c.butlerVolmer.points);
  });

  it('AIC/BIC differences use one likelihood (identity: equal RSS → ΔAIC = 2Δk, ΔBIC = Δk·ln n)', () => {
    const a = informationCriteria(0.01, 50, 2, 1);
    const b = informationCriteria(0.01, 50, 4, 1);
    expectClose(b.aic - a.aic, 4, { atol: 1e-12 });
    expectClose(b.bic - a.bic, 2 * Math.log(50), { atol: 1e-12 });
    // −2 ln L for n = 1, RSS = 1/(2π): n[ln(2π·RSS/n) + 1] = 1 → AIC = 1 + 2·(0 + 1) = 3.
    expectClose(informationCriteria(1 / (2 * Math.PI), 1, 0, 1).aic, 3, { atol: 1e-12 });
  });
});
