import { describe, expect, it } from 'vitest';
import { GAS_CONSTANT } from '../../server/core/constants.js';
import { InputError } from '../../server/core/errors.js';
import { fitArrhenius } from '../../server/core/kinetics/arrhenius.js';
import { exchangeCurrentAtTemperature } from '../../server/core/kinetics/models.js';
import { expectClose } from '../helpers/close.js';
import { noise } from './synthetic.js';

describe('fitArrhenius', () => {
  it('two points: E_a equals the two-point value worked by hand (R·ln2/(1/298.15 − 1/308.15) = 52 948.86 J/mol)', () => {
    const r = fitArrhenius([
      { temperature: 298.15, exchangeCurrentDensity: 1, standardError: 0.05 },
      { temperature: 308.15, exchangeCurrentDensity: 2, standardError: 0.1 },
    ]);
    expectClose(r.activationEnergy.value, 52948.86216572006, { rtol: 1e-10 });
    expect(r.covarianceScaling).toBe('known-sigma');
    // Known σ: SE(E_a) = R·√(σ1² + σ2²)/|Δ(1/T)| with σ = SE/j0 = 0.05 each (hand formula for two points).
    const seHand = (GAS_CONSTANT.value * Math.hypot(0.05, 0.05)) / (1 / 298.15 - 1 / 308.15);
    expectClose(r.activationEnergy.standardError as number, seHand, { rtol: 1e-9 });
  });

  it('recovers E_a and j0(T_ref) exactly from noise-free data (identity with the forward model)', () => {
    const temps = [298.15, 313.15, 333.15, 353.15, 363.15];
    const pts = temps.map((T) => ({ temperature: T, exchangeCurrentDensity: exchangeCurrentAtTemperature(0.02, 353.15, 48000, T) }));
    const r = fitArrhenius(pts, { referenceTemperature: 353.15 });
    expectClose(r.activationEnergy.value, 48000, { rtol: 1e-9 });
    expectClose(r.exchangeCurrentAtReference.value, 0.02, { rtol: 1e-10 });
    expect(r.referenceTemperature).toBe(353.15);
  });

  it('with scatter: true values inside the intervals, asymmetric j0 interval; inflation when scatter exceeds SE', () => {
    const e = noise(4, 0.1);
    const temps = [298.15, 308.15, 318.15, 328.15, 338.15, 348.15];
    const pts = temps.map((T) => ({ temperature: T, exchangeCurrentDensity: exchangeCurrentAtTemperature(0.01, 323.15, 40000, T) * Math.exp(e()) }));
    const r = fitArrhenius(pts, { referenceTemperature: 323.15 });
    const ea = r.activationEnergy.ci95 as [number, number];
    expect(ea[0] <= 40000 && 40000 <= ea[1]).toBe(true);
    const j0 = r.exchangeCurrentAtReference;
    const [lo, hi] = j0.ci95 as [number, number];
    expect(lo <= 0.01 && 0.01 <= hi).toBe(true);
    expect(hi - j0.value).toBeGreaterThan(j0.value - lo);
    // Stated errors 10× too small → reduced χ² ≫ 1 → covariance inflated, with a warning.
    const tight = fitArrhenius(pts.map((p) => ({ ...p, standardError: 0.01 * p.exchangeCurrentDensity })), { referenceTemperature: 323.15 });
    expect(tight.covarianceScaling).toBe('known-sigma-inflated');
    expect(tight.warnings.join(' ')).toMatch(/larger than the stated errors/);
  });

  it('InputError paths', () => {
    const path = (fn: () => unknown) => {
      try {
        fn();
      } catch (e) {
        return (e as InputError).issues[0].path;
      }
      return undefined;
    };
    expect(path(() => fitArrhenius([]))).toBe('points');
    expect(path(() => fitArrhenius([{ temperature: 300, exchangeCurrentDensity: 1 }, { temperature: 310, exchangeCurrentDensity: 2 }]))).toBe('points');
    expect(path(() => fitArrhenius([{ temperature: 300, exchangeCurrentDensity: 1, standardError: 0.1 }, { temperature: 310, exchangeCurrentDensity: 2 }]))).toBe('points[1].standardError');
    expect(path(() => fitArrhenius([{ temperature: -1, exchangeCurrentDensity: 1 }, { temperature: 310, exchangeCurrentDensity: 2 }, { temperature: 320, exchangeCurrentDensity: 3 }]))).toBe('points[0].temperature');
    expect(path(() => fitArrhenius([{ temperature: 300, exchangeCurrentDensity: 0 }, { temperature: 310, exchangeCurrentDensity: 2 }, { temperature: 320, exchangeCurrentDensity: 3 }]))).toBe('points[0].exchangeCurrentDensity');
  });
});
