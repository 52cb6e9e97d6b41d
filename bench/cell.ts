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
 * The cells are the invented test cells of test/cell/cells.ts (clearly fictional), not plant data.
 * Run: npx tsx bench/cell.ts
 */
import { sweepCell } from '../server/core/cell/sweep.js';
import { voltageBand } from '../server/core/cell/uncertainty.js';
import type { CellDefinition } from '../server/core/cell/types.js';
import { alkalineCell, chlorAlkaliCell, linspace } from '../test/cell/cells.js';
import { median, round, timedRuns } from './timing.js';

/** Repeat each case for at least this long (ms) and at least MIN_REPEATS times. */
const MIN_TIME_MS = 1500;
const MIN_REPEATS = 5;
const MAX_REPEATS = 2000;

/**
 * The invented alkaline test cell (80 °C, 30 wt % KOH, Butler–Volmer electrodes, KOH gap with
 * bubbles) with uncertain kinetics on both electrodes, a parasitic current and a rectifier.
 */
function alkalineBV(n: number): CellDefinition {
  const d = alkalineCell(linspace(200, 10_000, n));
  d.anode.kinetics.uncertainty = { lnExchangeCurrentDensitySE: 0.4, transferCoefficientSE: 0.05, correlation: 0.95 };
  d.cathode.kinetics.uncertainty = { lnExchangeCurrentDensitySE: 0.3, transferCoefficientSE: 0.03, correlation: 0.9 };
  return { ...d, currentEfficiency: { model: 'parasitic', currentDensity: 10 }, rectifierEfficiency: 0.96 };
}

/** The same cell with Tafel electrodes. */
function alkalineTafel(n: number): CellDefinition {
  const d = alkalineBV(n);
  d.anode.kinetics = { model: 'tafel', exchangeCurrentDensity: 1e-3, transferCoefficient: 1.2, uncertainty: { lnExchangeCurrentDensitySE: 0.4, transferCoefficientSE: 0.05, correlation: 0.95 } };
  d.cathode.kinetics = { model: 'tafel', exchangeCurrentDensity: 0.5, transferCoefficient: 0.6, uncertainty: { lnExchangeCurrentDensitySE: 0.3, transferCoefficientSE: 0.03, correlation: 0.9 } };
  return d;
}

/** The invented chlor-alkali test cell (88 °C) with an oxygen side reaction at an uncertain anode. */
function chlorAlkaliCompeting(n: number): CellDefinition {
  return {
    ...chlorAlkaliCell(linspace(1000, 7000, n)),
    anode: {
      kinetics: {
        model: 'butler-volmer', exchangeCurrentDensity: 100, anodicTransferCoefficient: 2, cathodicTransferCoefficient: 0.5,
        uncertainty: { lnExchangeCurrentDensitySE: 0.3, transferCoefficientSE: 0.05, correlation: 0.9 },
      },
    },
    currentEfficiency: {
      model: 'competing',
      sideReaction: { kinetics: { model: 'tafel', exchangeCurrentDensity: 1e-4, transferCoefficient: 0.9 }, equilibriumPotentialShift: -0.13 },
    },
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
