/**
 * Benchmark of levenbergMarquardt on the 27 NIST StRD nonlinear datasets, both starts.
 * Prints one JSON object per line (nothing else on stdout):
 *   {"dataset","difficulty","start","converged","status","minLRE","sdLRE","rssLRE","evaluations","msPerFit","residuals"}
 * minLRE / sdLRE: smallest log relative error over the parameters / their standard
 * deviations; rssLRE for the residual sum of squares; all capped at 11 (NIST prints 11
 * significant digits). LREs are reported as computed even when converged is false.
 * msPerFit: median wall time of repeated fits (analytic Jacobians, ftol = xtol = 1e-15).
 * residuals: 'double-double' for Lanczos1–3, whose residuals strdProblem evaluates in
 * double-double arithmetic from the printed data (test/fixtures/dd-exp.ts; Lanczos1's
 * residuals ~1e-13 are below what a float64 model evaluation resolves), 'float64' for the
 * rest. The double-double model costs ~1 µs per exponential, so msPerFit of Lanczos1–3
 * mostly measures the fixture, not the solver.
 * Run: npm run --silent bench:strd
 */
import { performance } from 'node:perf_hooks';
import { levenbergMarquardt } from '../server/core/numerics/index.js';
import { loadNonlinearDataset, lre, STRD_MODELS, STRD_NONLINEAR_NAMES, strdProblem } from '../test/fixtures/strd-models.js';
import { median, round, timedRuns } from './timing.js';

const CAP = 11;
const OPTIONS = { ftol: 1e-15, xtol: 1e-15, gtol: 1e-15, maxEvaluations: 10_000 };
/** Repeat each fit for at least this long (ms) and at least MIN_REPEATS times. */
const MIN_TIME_MS = 40;
const MIN_REPEATS = 5;
const MAX_REPEATS = 1000;

// Warm-up so the first datasets are not timed while the JIT compiles the solver.
{
  const warm = strdProblem(loadNonlinearDataset('Misra1a'), 2);
  for (let k = 0; k < 200; k++) levenbergMarquardt(warm, OPTIONS);
}

for (const name of STRD_NONLINEAR_NAMES) {
  const ds = loadNonlinearDataset(name);
  for (const start of [1, 2] as const) {
    const problem = strdProblem(ds, start);
    const fit = levenbergMarquardt(problem, OPTIONS);
    const times = timedRuns(() => levenbergMarquardt(problem, OPTIONS), { minRuns: MIN_REPEATS, minMs: MIN_TIME_MS, maxRuns: MAX_REPEATS });
    const c = ds.certified;
    const minLRE = Math.min(...fit.parameters.map((v, j) => lre(v, c.parameters[j], CAP)));
    const sdLRE = Math.min(...fit.standardErrors.map((v, j) => lre(v, c.standardDeviations[j], CAP)));
    const rssLRE = lre(fit.rss, c.rss, CAP);
    process.stdout.write(
      JSON.stringify({
        dataset: name,
        difficulty: ds.difficulty,
        start,
        converged: fit.converged,
        status: fit.status,
        minLRE: round(minLRE, 1),
        sdLRE: round(sdLRE, 1),
        rssLRE: round(rssLRE, 1),
        evaluations: fit.evaluations,
        msPerFit: round(median(times), 3),
        residuals: STRD_MODELS[name].fExtended ? 'double-double' : 'float64',
      }) + '\n',
    );
  }
}

// Speed check on stderr (stdout stays one JSON object per dataset and start): a 200-point,
// 5-parameter fit on invented, noise-free-plus-ripple data, analytic Jacobian.
{
  const n = 200;
  const xs = Array.from({ length: n }, (_, i) => (i * 5) / n);
  const truth = [0.3, 2, 1.3, 0.05, -0.01];
  const model = (b: number[], x: number) => b[0] + b[1] * Math.exp(-b[2] * x) + b[3] * x + b[4] * x * x;
  const ys = xs.map((x, i) => model(truth, x) + 1e-3 * Math.sin(7 * i));
  const problem = {
    start: [0, 1, 1, 0, 0],
    residuals: (b: number[]) => xs.map((x, i) => model(b, x) - ys[i]),
    jacobian: (b: number[]) =>
      xs.map((x) => {
        const e = Math.exp(-b[2] * x);
        return [1, e, -b[1] * x * e, x, x * x];
      }),
  };
  const times: number[] = [];
  let iterations = 0;
  for (let k = 0; k < 50; k++) {
    const a = performance.now();
    const fit = levenbergMarquardt(problem, OPTIONS);
    times.push(performance.now() - a);
    iterations = fit.jacobianEvaluations;
  }
  const ms = median(times);
  process.stderr.write(`speed: 200×5 fit ${ms.toFixed(3)} ms, ${iterations} Jacobian evaluations, ${(ms / iterations).toFixed(3)} ms per iteration\n`);
}
