/**
 * Shunt (stray, bypass) currents in a bipolar electrolyser with common electrolyte manifolds:
 * exact solve of the resistor network.
 *
 * Network (N cells in series, C electrolyte circuits):
 *   - bipolar plate nodes P_0 … P_N; the rectifier drives the terminal current I into P_0 and
 *     takes it out of P_N (P_N is the reference, 0 V);
 *   - cell k (P_k → P_{k+1}) is two equal halves in series joined at a mid node M_k; each half
 *     is a source U0/2 opposing the current plus a resistance r/2, with U0 = U − r·I
 *     (U the cell voltage at I with no shunts, r the cell's own resistance, Ω);
 *   - for each circuit c: a channel resistance R_ch,c from M_k to a manifold node Q_{c,k}, and a
 *     manifold segment R_m,c between Q_{c,k} and Q_{c,k+1} (N − 1 segments per circuit).
 *
 * Method: nodal analysis (Kirchhoff current law at every node, Ohm's law in every branch). The
 * nodes are numbered cell by cell (P_k, M_k, Q_{1..C,k}), which makes the grounded conductance
 * matrix symmetric positive definite with half-bandwidth C + 2; it is solved by band Cholesky in
 * O(N·(C+2)³) with one step of iterative refinement. Half-cell currents then follow from the
 * channel currents by Kirchhoff's current law (more accurate than differencing potentials across
 * the small cell resistance).
 * Source: the lumped resistor model of bipolar stacks with common manifolds (e.g. Burnett &
 * Danly, "Current bypass in electrochemical cell assemblies", AIChE Symp. Ser. 75 (1979) —
 * from memory); the nodal formulation is standard circuit theory.
 */
import { PhysicsError } from '../errors.js';
import { sig, percent } from './format.js';
import { SymmetricBandMatrix, bandCholesky, bandCholeskySolve } from './banded.js';
import { throwIfIssues } from './performance.js';

export interface ShuntCircuit {
  /** Label, e.g. "anolyte inlet". */
  name: string;
  /** Channel (feed or outlet duct) resistance of one cell, Ω. */
  channelResistance: number;
  /** Manifold resistance between two neighbouring cells, Ω. */
  manifoldSegmentResistance: number;
}

export interface ShuntInput {
  /** Number of cells in series, ≥ 2. */
  cells: number;
  /** Terminal current I from the rectifier, A (> 0). */
  current: number;
  /** Cell voltage U at current I with no shunt paths, V (> 0). */
  cellVoltage: number;
  /** Cell resistance r = dU/dI, Ω (> 0), e.g. K-factor/area (see cellResistanceFromKFactor). */
  cellResistance: number;
  /** Electrolyte circuits sharing manifolds (1 or more). */
  circuits: ShuntCircuit[];
}

export interface ShuntResult {
  cells: number;
  current: number;
  /** U0 = U − r·I, V: the source voltage of each cell. */
  cellSourceVoltage: number;
  /** channelCurrents[c][k], A: current from cell k's mid node into manifold c (negative: back into the cell). */
  channelCurrents: number[][];
  /** manifoldCurrents[c][k], A: current in manifold c from cell k's node towards cell k+1's (N − 1 per circuit). */
  manifoldCurrents: number[][];
  /** Current through the first half (anode side, entering from P_k) of each cell, A. */
  firstHalfCurrents: number[];
  /** Current through the second half of each cell, A. */
  secondHalfCurrents: number[];
  /** Mean of the two half-currents of each cell, A: the current that makes product. */
  cellCurrents: number[];
  /** I − cell current, A: current that bypasses each cell through the shunt paths. */
  bypassCurrents: number[];
  /** Mean bypass / I: the current-efficiency loss of the electrolyser (0–1). */
  currentEfficiencyLoss: number;
  /** Power dissipated in channels and manifolds, W. */
  shuntPower: number;
  /** Terminal voltage V(P_0) − V(P_N), V. */
  stackVoltage: number;
  /** Rectifier power I·V, W. */
  rectifierPower: number;
  /** The largest |channel current| and where (at a stack end). */
  maxChannelCurrent: { cell: number; circuit: number; circuitName: string; value: number };
  /** The largest bypass current and where (near the stack centre). */
  maxBypassCurrent: { cell: number; value: number };
  /** Network size: unknown node potentials. */
  unknowns: number;
  warnings: string[];
}

/** Warn when the shunt loss exceeds this fraction of the current (1 %, our choice). */
const SHUNT_LOSS_WARNING = 0.01;
/** Warn when the estimated relative rounding error of the channel currents exceeds 1e-6 (our choice). */
const STIFFNESS_WARNING = 1e-6;
/** Warn when one channel carries more than this fraction of the terminal current (1 %, our choice). */
const CHANNEL_CURRENT_WARNING = 0.01;

/**
 * Resistance of an electrolyte-filled duct, R = L/(σ·A) [Ω].
 * length L [m] > 0, crossSection A [m²] > 0, conductivity σ [S/m] > 0. Uniform duct, no gas;
 * correct σ for bubbles before calling (e.g. Bruggeman). Source: Ohm's law for a uniform conductor.
 */
export function electrolytePathResistance(length: number, crossSection: number, conductivity: number): number {
  const issues: { path: string; message: string }[] = [];
  if (!(length > 0) || !Number.isFinite(length)) issues.push({ path: 'length', message: 'must be a finite length > 0 m' });
  if (!(crossSection > 0) || !Number.isFinite(crossSection)) issues.push({ path: 'crossSection', message: 'must be a finite area > 0 m²' });
  if (!(conductivity > 0) || !Number.isFinite(conductivity)) issues.push({ path: 'conductivity', message: 'must be a finite conductivity > 0 S/m' });
  throwIfIssues('electrolyte path is not valid', issues);
  return length / (conductivity * crossSection);
}

/**
 * Cell resistance from the K-factor, r = K/A_cell [Ω]. K [Ω·m² = V per A/m²], A_cell [m²].
 * Source: definition of the linear cell line U = U0 + K·j with j = I/A.
 */
export function cellResistanceFromKFactor(kFactor: number, activeArea: number): number {
  const issues: { path: string; message: string }[] = [];
  if (!(kFactor > 0) || !Number.isFinite(kFactor)) issues.push({ path: 'kFactor', message: 'must be a finite slope > 0 Ω·m²' });
  if (!(activeArea > 0) || !Number.isFinite(activeArea)) issues.push({ path: 'activeArea', message: 'must be a finite area > 0 m²' });
  throwIfIssues('cell data are not valid', issues);
  return kFactor / activeArea;
}

function validate(input: ShuntInput): void {
  const issues: { path: string; message: string }[] = [];
  if (!Number.isInteger(input.cells) || input.cells < 2) issues.push({ path: 'cells', message: 'must be a whole number ≥ 2 (shunt paths need two cells)' });
  if (!(input.current > 0) || !Number.isFinite(input.current)) issues.push({ path: 'current', message: 'must be a finite current > 0 A' });
  if (!(input.cellVoltage > 0) || !Number.isFinite(input.cellVoltage)) issues.push({ path: 'cellVoltage', message: 'must be a finite voltage > 0 V' });
  if (!(input.cellResistance > 0) || !Number.isFinite(input.cellResistance)) issues.push({ path: 'cellResistance', message: 'must be a finite resistance > 0 Ω' });
  if (!Array.isArray(input.circuits) || input.circuits.length < 1) {
    issues.push({ path: 'circuits', message: 'needs at least one electrolyte circuit' });
  } else {
    input.circuits.forEach((c, i) => {
      if (!(c.channelResistance > 0) || !Number.isFinite(c.channelResistance)) {
        issues.push({ path: `circuits.${i}.channelResistance`, message: 'must be a finite resistance > 0 Ω' });
      }
      if (!(c.manifoldSegmentResistance > 0) || !Number.isFinite(c.manifoldSegmentResistance)) {
        issues.push({ path: `circuits.${i}.manifoldSegmentResistance`, message: 'must be a finite resistance > 0 Ω' });
      }
    });
  }
  throwIfIssues('shunt-current input is not valid', issues);
}

/**
 * Solve the shunt-current network of one bipolar electrolyser (see the module note).
 * Inputs in SI (A, V, Ω); outputs in A, V, W. Throws InputError for N < 2, non-positive
 * resistances, current or voltage; PhysicsError if the network cannot be factorised.
 */
export function solveShuntCurrents(input: ShuntInput): ShuntResult {
  validate(input);
  const N = input.cells;
  const C = input.circuits.length;
  const I = input.current;
  const r = input.cellResistance;
  const U0 = input.cellVoltage - r * I;
  const halfSource = U0 / 2;
  const gHalf = 2 / r;
  const gChannel = input.circuits.map((c) => 1 / c.channelResistance);
  const gManifold = input.circuits.map((c) => 1 / c.manifoldSegmentResistance);

  // Node numbering: block k = [P_k, M_k, Q_{0,k} … Q_{C−1,k}], k = 0 … N−1; P_N is ground.
  const block = C + 2;
  const n = N * block;
  const P = (k: number) => (k === N ? -1 : k * block);
  const M = (k: number) => k * block + 1;
  const Q = (c: number, k: number) => k * block + 2 + c;

  const A = new SymmetricBandMatrix(n, block);
  const rhs = new Float64Array(n);
  const conductance = (a: number, b: number, g: number) => {
    if (a >= 0) A.add(a, a, g);
    if (b >= 0) A.add(b, b, g);
    if (a >= 0 && b >= 0) A.add(a, b, -g);
  };
  // Branch a → b with source E opposing the current: i = g·(V_a − V_b − E).
  const sourceBranch = (a: number, b: number, g: number, E: number) => {
    conductance(a, b, g);
    if (a >= 0) rhs[a] += g * E;
    if (b >= 0) rhs[b] -= g * E;
  };
  for (let k = 0; k < N; k++) {
    sourceBranch(P(k), M(k), gHalf, halfSource);
    sourceBranch(M(k), P(k + 1), gHalf, halfSource);
    for (let c = 0; c < C; c++) {
      conductance(M(k), Q(c, k), gChannel[c]);
      if (k < N - 1) conductance(Q(c, k), Q(c, k + 1), gManifold[c]);
    }
  }
  rhs[P(0)] += I; // terminal current injected at P_0

  const chol = bandCholesky(A);
  if (!chol) throw new PhysicsError('circuits', 'the shunt network could not be solved (conductance matrix not positive definite)');
  const V = bandCholeskySolve(chol, rhs);
  // One step of iterative refinement: V += A⁻¹(rhs − A·V).
  const AV = A.multiply(V);
  const residual = new Float64Array(n);
  for (let i = 0; i < n; i++) residual[i] = rhs[i] - AV[i];
  const dV = bandCholeskySolve(chol, residual);
  for (let i = 0; i < n; i++) V[i] += dV[i];

  const potential = (node: number) => (node < 0 ? 0 : V[node]);
  const channelCurrents = input.circuits.map((_, c) => {
    const row = new Array<number>(N);
    for (let k = 0; k < N; k++) row[k] = (V[M(k)] - V[Q(c, k)]) * gChannel[c];
    return row;
  });
  const manifoldCurrents = input.circuits.map((_, c) => {
    const row = new Array<number>(N - 1);
    for (let k = 0; k < N - 1; k++) row[k] = (V[Q(c, k)] - V[Q(c, k + 1)]) * gManifold[c];
    return row;
  });

  // Half-cell currents by Kirchhoff's current law from the rectifier end.
  const firstHalfCurrents = new Array<number>(N);
  const secondHalfCurrents = new Array<number>(N);
  const cellCurrents = new Array<number>(N);
  const bypassCurrents = new Array<number>(N);
  let through = I;
  for (let k = 0; k < N; k++) {
    firstHalfCurrents[k] = through;
    let leaving = 0;
    for (let c = 0; c < C; c++) leaving += channelCurrents[c][k];
    through -= leaving;
    secondHalfCurrents[k] = through;
    cellCurrents[k] = 0.5 * (firstHalfCurrents[k] + secondHalfCurrents[k]);
    bypassCurrents[k] = I - cellCurrents[k];
  }

  let shuntPower = 0;
  let maxChannel = { cell: 0, circuit: 0, circuitName: input.circuits[0].name, value: 0 };
  for (let c = 0; c < C; c++) {
    for (let k = 0; k < N; k++) {
      const i = channelCurrents[c][k];
      shuntPower += i * i * input.circuits[c].channelResistance;
      if (Math.abs(i) > Math.abs(maxChannel.value)) maxChannel = { cell: k, circuit: c, circuitName: input.circuits[c].name, value: i };
    }
    for (let k = 0; k < N - 1; k++) {
      const i = manifoldCurrents[c][k];
      shuntPower += i * i * input.circuits[c].manifoldSegmentResistance;
    }
  }
  let maxBypass = { cell: 0, value: bypassCurrents[0] };
  let bypassSum = 0;
  for (let k = 0; k < N; k++) {
    bypassSum += bypassCurrents[k];
    if (bypassCurrents[k] > maxBypass.value) maxBypass = { cell: k, value: bypassCurrents[k] };
  }
  const currentEfficiencyLoss = bypassSum / N / I;
  const stackVoltage = potential(P(0)) - potential(P(N));
  for (const v of [stackVoltage, shuntPower, currentEfficiencyLoss]) {
    if (!Number.isFinite(v)) throw new PhysicsError('circuits', 'the shunt network solve gave a non-finite result');
  }

  const warnings: string[] = [];
  // Rounding floor of a potential-based solve: node potentials carry ~ε·|V_stack| absolute
  // error, which the stiff cell branches (conductance 2/r) turn into current noise.
  const noise = (Number.EPSILON * gHalf * Math.abs(stackVoltage)) / Math.max(Math.abs(maxChannel.value), Number.MIN_VALUE);
  if (noise > STIFFNESS_WARNING) {
    warnings.push(
      `The network is very stiff (cell resistance ${sig(r)} Ω against channel resistances of ${sig(Math.min(...input.circuits.map((c) => c.channelResistance)))} Ω and more): channel currents carry a relative rounding error of about ${sig(noise, 2)}.`,
    );
  }
  if (currentEfficiencyLoss > SHUNT_LOSS_WARNING) {
    warnings.push(
      `Shunt currents take ${percent(currentEfficiencyLoss, 3)} of the current (above ${percent(SHUNT_LOSS_WARNING, 2)}): longer or narrower channels, or fewer cells per electrolyser, reduce them.`,
    );
  }
  if (U0 <= 0) {
    warnings.push(`The cell source voltage U0 = U − r·I = ${sig(U0)} V is not positive: check the cell voltage and resistance.`);
  }
  const worstChannelShare = Math.abs(maxChannel.value) / I;
  if (worstChannelShare > CHANNEL_CURRENT_WARNING) {
    warnings.push(
      `The largest channel current (${sig(Math.abs(maxChannel.value))} A in ${maxChannel.circuitName}, cell ${maxChannel.cell + 1}) is ${percent(worstChannelShare, 3)} of the cell current; stray currents of that size can corrode channel and manifold metal.`,
    );
  }

  return {
    cells: N,
    current: I,
    cellSourceVoltage: U0,
    channelCurrents,
    manifoldCurrents,
    firstHalfCurrents,
    secondHalfCurrents,
    cellCurrents,
    bypassCurrents,
    currentEfficiencyLoss,
    shuntPower,
    stackVoltage,
    rectifierPower: I * stackVoltage,
    maxChannelCurrent: maxChannel,
    maxBypassCurrent: maxBypass,
    unknowns: n,
    warnings,
  };
}
