/**
 * Benchmark: shunt-current network of a 200-cell bipolar electrolyser with 4 electrolyte
 * circuits (invented, chlor-alkali-like resistances). Target: median < 5 ms per solve.
 * Run: npx tsx bench/shunt.ts   → prints one JSON line.
 */
import { solveShuntCurrents, type ShuntInput } from '../server/core/plant/shunt.js';

const input: ShuntInput = {
  cells: 200,
  current: 16000,
  cellVoltage: 3.0,
  cellResistance: 1e-4 / 2.7,
  circuits: [
    { name: 'anolyte inlet', channelResistance: 400, manifoldSegmentResistance: 0.5 },
    { name: 'anolyte outlet', channelResistance: 250, manifoldSegmentResistance: 0.3 },
    { name: 'catholyte inlet', channelResistance: 300, manifoldSegmentResistance: 0.4 },
    { name: 'catholyte outlet', channelResistance: 200, manifoldSegmentResistance: 0.25 },
  ],
};

const WARMUP = 20;
const RUNS = 200;
const TARGET_MS = 5;

let loss = 0;
for (let k = 0; k < WARMUP; k++) loss += solveShuntCurrents(input).currentEfficiencyLoss;
const times: number[] = [];
for (let k = 0; k < RUNS; k++) {
  const t0 = process.hrtime.bigint();
  const r = solveShuntCurrents(input);
  const t1 = process.hrtime.bigint();
  loss += r.currentEfficiencyLoss; // keep the result alive
  times.push(Number(t1 - t0) / 1e6);
}
times.sort((a, b) => a - b);
const median = RUNS % 2 ? times[(RUNS - 1) / 2] : 0.5 * (times[RUNS / 2 - 1] + times[RUNS / 2]);
const last = solveShuntCurrents(input);
console.log(
  JSON.stringify({
    bench: 'shunt',
    cells: input.cells,
    circuits: input.circuits.length,
    unknowns: last.unknowns,
    runs: RUNS,
    medianMs: Number(median.toFixed(4)),
    p90Ms: Number(times[Math.floor(0.9 * RUNS)].toFixed(4)),
    minMs: Number(times[0].toFixed(4)),
    targetMs: TARGET_MS,
    withinTarget: median < TARGET_MS,
    currentEfficiencyLoss: Number(last.currentEfficiencyLoss.toPrecision(6)),
    checksum: Number.isFinite(loss),
  }),
);
