import { Decimal } from 'decimal.js';
import { describe, expect, it } from 'vitest';
import { FARADAY, GAS_CONSTANT } from '../../server/core/constants.js';
import { InputError, PhysicsError } from '../../server/core/errors.js';
import {
  butlerVolmerCurrentDensity,
  butlerVolmerOverpotential,
  chargeTransferResistance,
  exchangeCurrentAtTemperature,
  tafelOverpotential,
  tafelSlopePerDecade,
  type ButlerVolmerParams,
} from '../../server/core/kinetics/models.js';
import { expectClose } from '../helpers/close.js';

const T25 = 298.15;

/**
 * Independent reference: the closed form of domain.md §3 evaluated directly (no log-space
 * rearrangement) in 50-digit decimal arithmetic with decimal.js.
 */
function referenceCurrent(eta: number, p: ButlerVolmerParams, T: number): number {
  Decimal.set({ precision: 50 });
  const f = new Decimal(FARADAY.value).div(new Decimal(GAS_CONSTANT.value).mul(T));
  const ea = new Decimal(p.anodicTransferCoefficient).mul(f).mul(eta).exp();
  const ec = new Decimal(p.cathodicTransferCoefficient).mul(f).mul(-eta).exp();
  let den = new Decimal(1).div(p.exchangeCurrentDensity);
  if (p.anodicLimitingCurrentDensity) den = den.add(ea.div(p.anodicLimitingCurrentDensity));
  if (p.cathodicLimitingCurrentDensity) den = den.add(ec.div(p.cathodicLimitingCurrentDensity));
  return ea.sub(ec).div(den).toNumber();
}

const cases: ButlerVolmerParams[] = [
  { exchangeCurrentDensity: 1e-12, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5 },
  { exchangeCurrentDensity: 1e-3, anodicTransferCoefficient: 1.5, cathodicTransferCoefficient: 0.5, anodicLimitingCurrentDensity: 3e4 },
  { exchangeCurrentDensity: 1, anodicTransferCoefficient: 0.3, cathodicTransferCoefficient: 1.2, cathodicLimitingCurrentDensity: 500 },
  {
    exchangeCurrentDensity: 1e4,
    anodicTransferCoefficient: 2,
    cathodicTransferCoefficient: 0.7,
    anodicLimitingCurrentDensity: 1e5,
    cathodicLimitingCurrentDensity: 2e5,
  },
];

describe('Tafel slope per decade', () => {
  // check-values.md §9d "Derived Tafel slopes b = ln(10)·RT/(αF)" (derived from CODATA 2018 R, F),
  // given to 0.1 mV, hence atol 0.05 mV.
  const table: [number, number, number][] = [
    [298.15, 0.5, 118.3],
    [298.15, 1, 59.2],
    [298.15, 1.5, 39.4],
    [298.15, 2, 29.6],
    [353.15, 0.5, 140.1],
    [353.15, 1, 70.1],
    [353.15, 2, 35.0],
    [363.15, 0.5, 144.1],
    [363.15, 1, 72.1],
    [363.15, 2, 36.0],
  ];
  for (const [T, alpha, mV] of table) {
    it(`α = ${alpha} at ${T} K → ${mV} mV/decade`, () => {
      expectClose(tafelSlopePerDecade(alpha, T) * 1000, mV, { atol: 0.05 }, `α=${alpha}, T=${T}`);
    });
  }
  it('α = 1 at 25 °C equals the Nernst slope 59.159 mV (check-values §1, derived)', () => {
    expectClose(tafelSlopePerDecade(1, T25) * 1000, 59.159, { atol: 0.0005 });
  });
});

describe('butlerVolmerCurrentDensity', () => {
  it('matches a 50-digit evaluation of the closed form over |η| ≤ 3 V and j0 from 1e-12 to 1e4 A/m²', () => {
    for (const p of cases) {
      for (let k = -60; k <= 60; k++) {
        const eta = k * 0.05;
        const ref = referenceCurrent(eta, p, T25);
        if (ref === 0 || !Number.isFinite(ref)) continue;
        // Tolerance: ln|j| carries ~|ln j|·ε of rounding, so up to ~1e-13 relative at |ln j| ≈ 300.
        expectClose(butlerVolmerCurrentDensity(eta, p, T25), ref, { rtol: 2e-13 }, `η=${eta}, j0=${p.exchangeCurrentDensity}`);
      }
    }
  });

  it('is zero at η = 0, odd in η for symmetric coefficients, and never beyond the limiting currents (equal only by rounding on the plateau)', () => {
    const p: ButlerVolmerParams = { exchangeCurrentDensity: 2, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5 };
    expectClose(butlerVolmerCurrentDensity(0, p, T25), 0, { atol: 1e-300 });
    for (const eta of [1e-6, 0.01, 0.2, 1.5]) {
      expectClose(butlerVolmerCurrentDensity(-eta, p, T25), -butlerVolmerCurrentDensity(eta, p, T25), { rtol: 1e-14 });
    }
    const q = cases[3];
    expect(butlerVolmerCurrentDensity(5, q, T25)).toBeLessThanOrEqual(q.anodicLimitingCurrentDensity as number);
    expect(butlerVolmerCurrentDensity(-5, q, T25)).toBeGreaterThanOrEqual(-(q.cathodicLimitingCurrentDensity as number));
  });

  it('throws PhysicsError instead of returning Infinity on an unbounded branch at absurd η', () => {
    const p: ButlerVolmerParams = { exchangeCurrentDensity: 1e4, anodicTransferCoefficient: 2, cathodicTransferCoefficient: 2 };
    expect(() => butlerVolmerCurrentDensity(10, p, T25)).toThrow(PhysicsError);
  });

  it('rejects invalid parameters with InputError naming the field', () => {
    const bad = { exchangeCurrentDensity: -1, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5 };
    expect(() => butlerVolmerCurrentDensity(0.1, bad, T25)).toThrow(InputError);
    try {
      butlerVolmerCurrentDensity(0.1, bad, T25);
    } catch (e) {
      expect((e as InputError).issues[0].path).toBe('exchangeCurrentDensity');
    }
    expect(() => butlerVolmerCurrentDensity(0.1, cases[0], 0)).toThrow(InputError);
    expect(() => butlerVolmerCurrentDensity(Number.NaN, cases[0], T25)).toThrow(InputError);
  });
});

describe('butlerVolmerOverpotential (inversion)', () => {
  it('round trip j → η → j to 1e-12 over 1e-10…0.999·j_lim and j0 from 1e-12 to 1e4 A/m²', () => {
    for (const p of cases) {
      for (const sign of [1, -1]) {
        const lim = sign > 0 ? p.anodicLimitingCurrentDensity : p.cathodicLimitingCurrentDensity;
        const top = lim ? Math.log10(lim * 0.999999) : 6;
        for (let e = -10; e <= top; e += 0.37) {
          const j = sign * Math.pow(10, e);
          const eta = butlerVolmerOverpotential(j, p, T25);
          expect(Math.sign(eta)).toBe(sign);
          expectClose(butlerVolmerCurrentDensity(eta, p, T25), j, { rtol: 1e-12 }, `j=${j}, j0=${p.exchangeCurrentDensity}`);
        }
      }
    }
  });

  it('round trip η → j → η to 1e-12 relative (away from the limiting-current plateau)', () => {
    for (const p of cases) {
      for (let k = -40; k <= 40; k++) {
        const eta = k * 0.025;
        if (eta === 0) continue;
        const j = butlerVolmerCurrentDensity(eta, p, T25);
        const lim = j > 0 ? p.anodicLimitingCurrentDensity : p.cathodicLimitingCurrentDensity;
        if (lim && Math.abs(j) > 0.99 * lim) continue; // η is ill-conditioned on the plateau
        expectClose(butlerVolmerOverpotential(j, p, T25), eta, { rtol: 1e-12, atol: 1e-15 }, `η=${eta}`);
      }
    }
  });

  it('stays finite within a few ulp of a limiting current and throws PhysicsError at or above it', () => {
    const p = cases[1];
    const lim = p.anodicLimitingCurrentDensity as number;
    const j = lim * (1 - 4 * Number.EPSILON);
    const eta = butlerVolmerOverpotential(j, p, T25);
    expect(Number.isFinite(eta)).toBe(true);
    expectClose(butlerVolmerCurrentDensity(eta, p, T25), j, { rtol: 1e-14 });
    expect(() => butlerVolmerOverpotential(lim, p, T25)).toThrow(PhysicsError);
    expect(() => butlerVolmerOverpotential(2 * lim, p, T25)).toThrow(PhysicsError);
  });

  it('tends to the Tafel line at high |η| (identity: back reaction and limits negligible)', () => {
    const p: ButlerVolmerParams = { exchangeCurrentDensity: 1e-3, anodicTransferCoefficient: 0.6, cathodicTransferCoefficient: 0.4 };
    for (const j of [1e2, 1e3, 1e4]) {
      // exp(−(α_a+α_c)fη) < 1e-9 here, so BV and Tafel agree to ~1e-9 relative in j, ~1e-10 V in η.
      expectClose(butlerVolmerOverpotential(j, p, T25), tafelOverpotential(j, 1e-3, 0.6, T25), { atol: 1e-9 }, `anodic j=${j}`);
      expectClose(butlerVolmerOverpotential(-j, p, T25), tafelOverpotential(-j, 1e-3, 0.4, T25), { atol: 1e-9 }, `cathodic j=${-j}`);
    }
  });

  it('tends to η = j·R_ct at low field (identity)', () => {
    const p: ButlerVolmerParams = { exchangeCurrentDensity: 5, anodicTransferCoefficient: 0.7, cathodicTransferCoefficient: 0.5 };
    const rct = chargeTransferResistance(p, T25);
    for (const j of [1e-6, -1e-6, 1e-4]) {
      expectClose(butlerVolmerOverpotential(j, p, T25), j * rct, { rtol: 1e-4 }, `j=${j}`);
    }
  });
});

describe('chargeTransferResistance', () => {
  it('equals the inverse low-field slope dη/dj of the current law (numerical derivative)', () => {
    const p: ButlerVolmerParams = { exchangeCurrentDensity: 0.3, anodicTransferCoefficient: 1.1, cathodicTransferCoefficient: 0.6 };
    const h = 1e-7;
    const slope = (butlerVolmerCurrentDensity(h, p, T25) - butlerVolmerCurrentDensity(-h, p, T25)) / (2 * h);
    expectClose(chargeTransferResistance(p, T25), 1 / slope, { rtol: 1e-8 });
  });
  it('for j0 = 1 A/m², α_a + α_c = 1 at 25 °C equals RT/F = 25.6926 mV → 0.0256926 Ω·m² (check-values §1, derived)', () => {
    const p: ButlerVolmerParams = { exchangeCurrentDensity: 1, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5 };
    expectClose(chargeTransferResistance(p, T25), 0.0256926, { atol: 5e-8 });
  });
});

describe('tafelOverpotential', () => {
  it('gives one Tafel slope per decade (α = 1, 25 °C: 59.159 mV, check-values §1 derived)', () => {
    expectClose(tafelOverpotential(10, 1, 1, T25) * 1000, 59.159, { atol: 0.0005 });
    expectClose(tafelOverpotential(-10, 1, 1, T25) * 1000, -59.159, { atol: 0.0005 });
  });
  it('throws InputError for j = 0', () => {
    expect(() => tafelOverpotential(0, 1, 0.5, T25)).toThrow(InputError);
  });
});

describe('exchangeCurrentAtTemperature', () => {
  it('returns j0_ref at T_ref and inverts itself (identity)', () => {
    expectClose(exchangeCurrentAtTemperature(2.5, 298.15, 5e4, 298.15), 2.5, { rtol: 1e-15 });
    const up = exchangeCurrentAtTemperature(2.5, 298.15, 5e4, 353.15);
    expectClose(exchangeCurrentAtTemperature(up, 353.15, 5e4, 298.15), 2.5, { rtol: 1e-14 });
  });
  it('doubles between 298.15 K and 308.15 K for E_a = 52 948.86 J/mol (two-point value worked by hand: R·ln2/(1/298.15 − 1/308.15))', () => {
    expectClose(exchangeCurrentAtTemperature(1, 298.15, 52948.86216572006, 308.15), 2, { rtol: 1e-12 });
  });
});
