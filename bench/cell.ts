/**
 * Benchmark of the cell model. Prints one JSON object per line (nothing else on stdout):
 *   {"case","n","medianMs","minMs","repeats","targetMs","withinTarget", ...}
 *
 * Cases (targets from the cell model's brief):
 *  - sweep-1000-bv: sweepCell over 1 000 current densities, Butler–Volmer anode and cathode,
 *    gaps with correlations and bubbles, parasitic CE (target < 10 ms median);
 *  - band-2000x100-bv: voltageBand with 2 000 Monte Carlo samples over 100 current densities,
 *    uncertain (ln j0, α) on both electrodes (target < 300 ms median);
 *  - band-2000x100-tafel and band-500x20-competing: the same for Tafel electrodes and for the
 *    competing-anode CE model (full balance per sample; no target, for information).
 * The cells are invented demonstration values (clearly fictional), not plant data.
 * Run: npx tsx bench/cell.ts
 */
import { sweepCell } from '../server/core/cell/sweep.js';
import { voltageBand } from '../server/core/cell/uncertainty.js';
import type { CellDefinition } from '../server/core/cell/types.js';
import { median, round, timedRuns } from './timing.js';

/** Repeat each case for at least this long (ms) and at least MIN_REPEATS times. */
const MIN_TIME_MS = 1500;
const MIN_REPEATS = 5;
const MAX_REPEATS = 2000;

function linspace(lo: number, hi: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => lo + ((hi - lo) * i) / (n - 1));
}

/** Invented alkaline cell (80 °C, ~30 wt % KOH) with Butler–Volmer electrodes. */
function alkalineBV(n: number): CellDefinition {
  return {
    chemistry: 'alkaline-water',
    temperature: 353.15,
    pressure: 1.5e5,
    composition: { koh: 7.6 },
    anode: {
      kinetics: {
        model: 'butler-volmer', exchangeCurrentDensity: 1e-3, anodicTransferCoefficient: 1.2, cathodicTransferCoefficient: 0.8,
        referenceTemperature: 298.15, activationEnergy: 50e3,
        uncertainty: { lnExchangeCurrentDensitySE: 0.4, transferCoefficientSE: 0.05, correlation: 0.95 },
      },
    },
    cathode: {
      kinetics: {
        model: 'butler-volmer', exchangeCurrentDensity: 0.5, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.6,
        referenceTemperature: 298.15, activationEnergy: 30e3,
        uncertainty: { lnExchangeCurrentDensitySE: 0.3, transferCoefficientSE: 0.03, correlation: 0.9 },
      },
      limitingCurrentDensity: 5e4,
    },
    ohmic: {
      membrane: { areaResistance: 0.2e-4, referenceTemperature: 353.15 },
      gaps: [
        { thickness: 1e-3, electrolyte: 'KOH', voidFraction: 0.2 },
        { thickness: 1e-3, electrolyte: 'KOH', voidFraction: 0.1, voidModel: 'maxwell' },
      ],
      hardware: 0.02e-4,
    },
    currentEfficiency: { model: 'parasitic', currentDensity: 10 },
    currentDensities: linspace(200, 10_000, n),
    rectifierEfficiency: 0.96,
  };
}

function alkalineTafel(n: number): CellDefinition {
  const d = alkalineBV(n);
  d.anode.kinetics = { model: 'tafel', exchangeCurrentDensity: 1e-3, transferCoefficient: 1.2, uncertainty: { lnExchangeCurrentDensitySE: 0.4, transferCoefficientSE: 0.05, correlation: 0.95 } };
  d.cathode.kinetics = { model: 'tafel', exchangeCurrentDensity: 0.5, transferCoefficient: 0.6, uncertainty: { lnExchangeCurrentDensitySE: 0.3, transferCoefficientSE: 0.03, correlation: 0.9 } };
  return d;
}

/** Invented chlor-alkali cell (88 °C) with an oxygen side reaction at the anode. */
function chlorAlkaliCompeting(n: number): CellDefinition {
  return {
    chemistry: 'chlor-alkali',
    temperature: 361.15,
    pressure: 1.2e5,
    composition: { brineNaCl: 3.6, causticNaOH: 11.8 },
    anode: {
      kinetics: {
        model: 'butler-volmer', exchangeCurrentDensity: 20, anodicTransferCoefficient: 1.5, cathodicTransferCoefficient: 0.5,
        uncertainty: { lnExchangeCurrentDensitySE: 0.3, transferCoefficientSE: 0.05, correlation: 0.9 },
      },
    },
    cathode: { kinetics: { model: 'tafel', exchangeCurrentDensity: 5, transferCoefficient: 1.0 } },
    ohmic: { membrane: { areaResistance: 0.5e-4 }, hardware: 0.05e-4 },
    currentEfficiency: {
      model: 'competing',
      sideReaction: { kinetics: { model: 'tafel', exchangeCurrentDensity: 1e-4, transferCoefficient: 0.9 }, equilibriumPotentialShift: -0.13 },
    },
    currentDensities: linspace(1000, 7000, n),
  };
}

function run(name: string, n: number, targetMs: number | null, fn: () => unknown, extra: Record<string, unknown> = {}): void {
  fn(); // warm-up (JIT)
  const times = timedRuns(fn, { minRuns: MIN_REPEATS, minMs: MIN_TIME_MS, maxRuns: MAX_REPEATS });
  const med = median(times);
  process.stdout.write(
    JSON.stringify({
      case: name,
      n,
      medianMs: round(med, 3),
      minMs: round(Math.min(...times), 3),
      repeats: times.length,
      targetMs,
      withinTarget: targetMs === null ? null : med < targetMs,
      ...extra,
    }) + '\n',
  );
}

const sweepDef = alkalineBV(1000);
run('sweep-1000-bv', 1000, 10, () => sweepCell(sweepDef));

const bandDef = alkalineBV(100);
run('band-2000x100-bv', 100, 300, () => voltageBand(bandDef, { samples: 2000, seed: 42 }), { samples: 2000 });

const tafelDef = alkalineTafel(100);
run('band-2000x100-tafel', 100, null, () => voltageBand(tafelDef, { samples: 2000, seed: 42 }), { samples: 2000 });

const competingDef = chlorAlkaliCompeting(20);
run('band-500x20-competing', 20, null, () => voltageBand(competingDef, { samples: 500, seed: 42 }), { samples: 500 });
