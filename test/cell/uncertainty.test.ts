import { describe, expect, it } from 'vitest';
import { faradayOverRT } from '../../server/core/constants.js';
import { InputError } from '../../server/core/errors.js';
import { sweepCell } from '../../server/core/cell/sweep.js';
import { voltageBand } from '../../server/core/cell/uncertainty.js';
import type { CellDefinition, KineticUncertainty } from '../../server/core/cell/types.js';
import { expectClose } from '../helpers/close.js';
import { alkalineCell, allFinite, chlorAlkaliCell, idealElectrode, linspace } from './cells.js';

const T = 353.15;

/** PEM cell with a Tafel anode carrying `u`, an ideal cathode and one resistance (invented values). */
function tafelAnodeCell(u: KineticUncertainty, js: number[]): CellDefinition {
  return {
    chemistry: 'pem-water',
    temperature: T,
    pressure: 1e5,
    reversiblePotential: 1.2,
    anode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 1e-3, transferCoefficient: 1, uncertainty: u } },
    cathode: idealElectrode(),
    ohmic: { hardware: 0.1e-4 },
    currentDensities: js,
  };
}

/** Alkaline cell with uncertain Butler–Volmer kinetics on both electrodes (invented values). */
function uncertainAlkaline(js: number[]): CellDefinition {
  const d = alkalineCell(js);
  d.anode.kinetics.uncertainty = { lnExchangeCurrentDensitySE: 0.4, transferCoefficientSE: 0.04, correlation: 0.95 };
  d.cathode.kinetics.uncertainty = { lnExchangeCurrentDensitySE: 0.3, transferCoefficientSE: 0.02, correlation: 0.9 };
  return d;
}

describe('delta method', () => {
  it('matches the analytic first-order variance of a Tafel electrode (independent derivation)', () => {
    const u = { lnExchangeCurrentDensitySE: 0.5, transferCoefficientSE: 0.04, correlation: 0.9 };
    const js = [100, 1000, 10_000];
    const band = voltageBand(tafelAnodeCell(u, js), { samples: 50, seed: 1 });
    const f = faradayOverRT(T);
    band.points.forEach((p, i) => {
      // η = (ln j − ln j0)/(α f): ∂η/∂ln j0 = −1/(α f), ∂η/∂α = −η/α (α = 1 here).
      const eta = Math.log(js[i] / 1e-3) / f;
      const g1 = -1 / f;
      const g2 = -eta;
      const variance = g1 ** 2 * 0.25 + g2 ** 2 * 0.04 ** 2 + 2 * 0.9 * g1 * g2 * 0.5 * 0.04;
      expectClose(p.delta.standardDeviation, Math.sqrt(variance), { rtol: 1e-6 }, `σ at ${js[i]}`);
      expectClose(p.delta.upper - p.nominal, 1.959963984540054 * Math.sqrt(variance), { rtol: 1e-6 }, 'z_0.975 (R: qnorm(0.975))');
    });
  });

  it('a positive correlation between ln j0 and α widens the band of a Tafel electrode (same-sign sensitivities)', () => {
    const pos = voltageBand(tafelAnodeCell({ lnExchangeCurrentDensitySE: 0.5, transferCoefficientSE: 0.04, correlation: 0.9 }, [1000]), { samples: 50 });
    const neg = voltageBand(tafelAnodeCell({ lnExchangeCurrentDensitySE: 0.5, transferCoefficientSE: 0.04, correlation: -0.9 }, [1000]), { samples: 50 });
    expect(pos.points[0].delta.standardDeviation).toBeGreaterThan(neg.points[0].delta.standardDeviation);
  });
});

describe('Monte Carlo band', () => {
  it('agrees with the delta method within a few per cent (Tafel and Butler–Volmer electrodes)', () => {
    const cases = [
      voltageBand(tafelAnodeCell({ lnExchangeCurrentDensitySE: 0.5, transferCoefficientSE: 0.03, correlation: 0.9 }, [100, 1000, 10_000]), { samples: 4000, seed: 7 }),
      voltageBand(uncertainAlkaline(linspace(1000, 20_000, 5)), { samples: 4000, seed: 7 }),
    ];
    for (const band of cases) {
      for (const p of band.points) {
        // With 4000 draws the sample SD has a relative standard error of about 1/√(2·4000) ≈ 1.1 %.
        expectClose(p.monteCarlo.standardDeviation, p.delta.standardDeviation, { rtol: 0.05 }, `SD at ${p.currentDensity}`);
        const halfMC = 0.5 * (p.monteCarlo.upper - p.monteCarlo.lower);
        const halfDelta = 0.5 * (p.delta.upper - p.delta.lower);
        expectClose(halfMC, halfDelta, { rtol: 0.06 }, `half-width at ${p.currentDensity}`);
        expectClose(p.monteCarlo.mean, p.nominal, { atol: 0.1 * p.delta.standardDeviation }, `mean at ${p.currentDensity}`);
        expect(p.monteCarlo.lower).toBeLessThan(p.nominal);
        expect(p.monteCarlo.upper).toBeGreaterThan(p.nominal);
      }
    }
  });

  it('the per-sample fast path reproduces the full balance (vanishing standard errors)', () => {
    const def = alkalineCell(linspace(200, 40_000, 9));
    def.anode.kinetics.uncertainty = { lnExchangeCurrentDensitySE: 1e-9, transferCoefficientSE: 1e-10, correlation: 0.5 };
    def.cathode.kinetics.uncertainty = { lnExchangeCurrentDensitySE: 1e-9, transferCoefficientSE: 1e-10, correlation: 0.5 };
    const band = voltageBand(def, { samples: 20, seed: 3 });
    const sweep = sweepCell(def);
    band.points.forEach((p, i) => {
      expectClose(p.monteCarlo.mean, sweep.points[i].cellVoltage, { atol: 1e-8 }, `U at ${p.currentDensity}`);
      expectClose(p.monteCarlo.lower, sweep.points[i].cellVoltage, { atol: 1e-8 }, 'lower');
    });
  });

  it('is reproducible with the same seed and changes with another seed', () => {
    const def = uncertainAlkaline(linspace(1000, 10_000, 4));
    const a = voltageBand(def, { samples: 300, seed: 123 });
    const b = voltageBand(def, { samples: 300, seed: 123 });
    expect(a).toEqual(b); // bit-for-bit: same generator state, same arithmetic
    const c = voltageBand(def, { samples: 300, seed: 124 });
    expect(c.points[0].monteCarlo.mean).not.toEqual(a.points[0].monteCarlo.mean);
    expect(allFinite(a)).toBe(true);
  });

  it('nominal values are the sweep’s, and the specific-energy band is the voltage band × zF/(CE·M) for a constant CE', () => {
    const def: CellDefinition = { ...chlorAlkaliCell([2000, 6000]) };
    def.anode.kinetics.uncertainty = { lnExchangeCurrentDensitySE: 0.3, transferCoefficientSE: 0.1, correlation: 0.8 };
    const band = voltageBand(def, { samples: 500, seed: 42 });
    const sweep = sweepCell(def);
    band.points.forEach((p, i) => {
      expectClose(p.nominal, sweep.points[i].cellVoltage, { rtol: 1e-14 }, 'nominal U');
      const perVolt = sweep.points[i].specificEnergy.Cl2! / sweep.points[i].cellVoltage;
      expectClose(p.specificEnergy.nominal, sweep.points[i].specificEnergy.Cl2!, { rtol: 1e-14 }, 'nominal w');
      expectClose(p.specificEnergy.monteCarlo.upper, p.monteCarlo.upper * perVolt, { rtol: 1e-12 }, 'w upper');
      expectClose(p.specificEnergy.delta.standardDeviation, p.delta.standardDeviation * perVolt, { rtol: 1e-6 }, 'w σ');
    });
    expect(band.mainProduct).toBe('Cl2');
  });

  it('propagates side-reaction kinetics into the chlorine specific energy (competing CE model)', () => {
    const def: CellDefinition = {
      ...chlorAlkaliCell([1000, 4000]),
      anode: { kinetics: { model: 'butler-volmer', exchangeCurrentDensity: 100, anodicTransferCoefficient: 2, cathodicTransferCoefficient: 0.5 } },
      currentEfficiency: {
        model: 'competing',
        sideReaction: {
          kinetics: {
            model: 'butler-volmer', exchangeCurrentDensity: 2e-3, anodicTransferCoefficient: 1, cathodicTransferCoefficient: 0.5,
            uncertainty: { lnExchangeCurrentDensitySE: 0.5, transferCoefficientSE: 0.05, correlation: 0.9 },
          },
          equilibriumPotentialShift: -0.13,
        },
      },
    };
    const band = voltageBand(def, { samples: 400, seed: 9 });
    expect(band.parameters.map((p) => p.path)).toContain('currentEfficiency.sideReaction.kinetics');
    for (const p of band.points) {
      // The side reaction moves CE more than U: the relative energy band is wider than the voltage band.
      const relU = p.delta.standardDeviation / p.nominal;
      const relW = p.specificEnergy.delta.standardDeviation / p.specificEnergy.nominal;
      expect(relW).toBeGreaterThan(relU);
      // The side current is exponential in ln j0 and α, so the energy distribution is skewed to
      // high values: the Monte Carlo band reaches further up than down, and beyond the symmetric
      // delta-method band (which is why the Monte Carlo band is the primary result).
      const up = p.specificEnergy.monteCarlo.upper - p.specificEnergy.nominal;
      const down = p.specificEnergy.nominal - p.specificEnergy.monteCarlo.lower;
      expect(up).toBeGreaterThan(down);
      expect(p.specificEnergy.monteCarlo.upper).toBeGreaterThan(p.specificEnergy.delta.upper);
    }
  });
});

describe('options and inputs', () => {
  it('needs at least one uncertain kinetics and a valid seed and sample count', () => {
    expect(() => voltageBand(alkalineCell([1000]))).toThrow(InputError);
    const def = uncertainAlkaline([1000]);
    expect(() => voltageBand(def, { seed: 0 })).toThrow(/seed/);
    expect(() => voltageBand(def, { seed: 1.5 })).toThrow(/seed/);
    expect(() => voltageBand(def, { samples: 1 })).toThrow(/samples/);
    const own = voltageBand(def, { samples: 20, currentDensities: [500, 5000] });
    expect(own.points.map((p) => p.currentDensity)).toEqual([500, 5000]);
  });
});
