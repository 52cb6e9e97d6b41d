/**
 * Benchmarks of the electrode-kinetics core. Prints one JSON object per line:
 *   {"case","msMedian","msP10","runs","load1", ...extra}
 * msP10 (10th percentile) beside the median shows how much other work on the machine
 * inflated the run; load1 is the 1-minute load average when the case finished.
 * Cases:
 *   bv-200-jlim   Butler–Volmer fit, 200 points on both branches, anodic limiting current fitted
 *                 with its 95 % profile-likelihood interval (target < 5 ms median on the 2-core
 *                 project machine)
 *   bv-24-jlim-weak  24 points, the limit 30× above the top current (weakly determined: the
 *                 profile search stops early at the open upper end)
 *   bv-200        the same data without the limiting-current parameter (its bend then misfits)
 *   tafel-auto-60 Tafel fit with the automatic window, 60 points
 *   tafel-auto-10000  automatic window on a 10 000-point record (bounded candidate search)
 *   eta-inversion one η(j) solve from a cold start (butlerVolmerOverpotential incl. checks), µs
 * Data: invented, generated from known parameters with seeded Gaussian noise.
 * Run: npm run --silent bench:kinetics
 */
import { loadavg } from 'node:os';
import { performance } from 'node:perf_hooks';
import { fitButlerVolmer } from '../server/core/kinetics/butler-volmer.js';
import { butlerVolmerOverpotential } from '../server/core/kinetics/models.js';
import { fitTafel } from '../server/core/kinetics/tafel.js';
import { bvPoints, logSpaced } from '../test/kinetics/synthetic.js';
import { median, round, timedRuns } from './timing.js';

const T = 298.15;
const MIN_TIME_MS = 1500;
const MIN_RUNS = 20;
const MAX_RUNS = 2000;
/** JIT warm-up before timing: at least this many calls and this long (a server process runs hot). */
const WARMUP_RUNS = 10;
const WARMUP_MS = 300;

function percentile10(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  return s[Math.floor(0.1 * (s.length - 1))];
}

function time(name: string, fn: () => unknown, extra: Record<string, unknown> = {}, minMs = MIN_TIME_MS): void {
  const w0 = performance.now();
  for (let k = 0; k < WARMUP_RUNS || performance.now() - w0 < WARMUP_MS; k++) fn(); // warm-up (JIT)
  const times = timedRuns(fn, { minRuns: MIN_RUNS, minMs, maxRuns: MAX_RUNS });
  process.stdout.write(
    JSON.stringify({ case: name, msMedian: round(median(times), 3), msP10: round(percentile10(times), 3), runs: times.length, load1: round(loadavg()[0], 2), ...extra }) + '\n',
  );
}

const bvTruth = { exchangeCurrentDensity: 0.5, anodicTransferCoefficient: 0.6, cathodicTransferCoefficient: 0.4, anodicLimitingCurrentDensity: 2000 };
const linspace = (a: number, b: number, n: number) => Array.from({ length: n }, (_, k) => a + ((b - a) * k) / (n - 1));
const bvData = bvPoints(linspace(-300, 1950, 200), bvTruth, T, { sigma: 0.002, seed: 3 });

{
  const r = fitButlerVolmer(bvData, { temperature: T, anodicLimitingCurrentDensity: 'fit' });
  time('bv-200-jlim', () => fitButlerVolmer(bvData, { temperature: T, anodicLimitingCurrentDensity: 'fit' }), {
    converged: r.converged,
    evaluations: r.evaluations,
    targetMs: 5,
  });
}
{
  // Weakly determined limit (30× the top current, 3 mV noise): open upper end.
  const weak = bvPoints([...logSpaced(0, 2.5, 8, -1), ...logSpaced(0.5, Math.log10(4000), 16)], { exchangeCurrentDensity: 5, anodicTransferCoefficient: 1.2, cathodicTransferCoefficient: 0.8, anodicLimitingCurrentDensity: 120_000 }, 343.15, { sigma: 0.003, seed: 2 });
  const opts = { temperature: 343.15, anodicLimitingCurrentDensity: 'fit' as const };
  const r = fitButlerVolmer(weak, opts);
  const lim = r.parameters.anodicLimitingCurrentDensity;
  time('bv-24-jlim-weak', () => fitButlerVolmer(weak, opts), { converged: r.converged, limit: lim ? (lim.ci95 ? 'bounded' : 'open upper end') : 'left out' });
}
{
  const r = fitButlerVolmer(bvData, { temperature: T });
  time('bv-200', () => fitButlerVolmer(bvData, { temperature: T }), { converged: r.converged, evaluations: r.evaluations });
}
{
  const pts = bvPoints(logSpaced(-3, Math.log10(2700), 60), { ...bvTruth, exchangeCurrentDensity: 1e-2, anodicTransferCoefficient: 0.5, anodicLimitingCurrentDensity: 3000 }, T, { sigma: 0.001, seed: 5 });
  time('tafel-auto-60', () => fitTafel(pts, { temperature: T }));
}
{
  const pts = bvPoints(logSpaced(-3, Math.log10(2700), 10_000), { ...bvTruth, exchangeCurrentDensity: 1e-2, anodicTransferCoefficient: 0.5, anodicLimitingCurrentDensity: 3000 }, T, { sigma: 0.001, seed: 6 });
  time('tafel-auto-10000', () => fitTafel(pts, { temperature: T }), {}, 3000);
}
{
  const p = { exchangeCurrentDensity: 1e-3, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.5, anodicLimitingCurrentDensity: 1e4 };
  const js = logSpaced(-6, 3.9, 1000);
  const r = { ms: 0 };
  time('eta-inversion-x1000', () => {
    let s = 0;
    for (const j of js) s += butlerVolmerOverpotential(j, p, T);
    r.ms = s;
  }, { note: 'msMedian per 1000 cold solves = µs per solve' });
}
