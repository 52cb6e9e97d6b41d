import { describe, expect, it } from 'vitest';
import { expectClose } from '../helpers/close.js';
import {
  cellResistanceFromKFactor,
  electrolytePathResistance,
  solveShuntCurrents,
  type ShuntInput,
} from '../../server/core/plant/shunt.js';
import { InputError } from '../../server/core/errors.js';

/**
 * Independent check: the same network written as a branch list, every node potential unknown
 * (P_0…P_N first, then M_0…M_{N−1}, then the manifold nodes circuit by circuit — a different
 * order from the solver's), KCL rows assembled densely with the ground row replaced by
 * V(P_N) = 0, solved by Gaussian elimination with partial pivoting.
 */
function denseReference(input: ShuntInput): { V: number[]; node: { P: (k: number) => number; M: (k: number) => number; Q: (c: number, k: number) => number } } {
  const N = input.cells;
  const C = input.circuits.length;
  const P = (k: number) => k;
  const M = (k: number) => N + 1 + k;
  const Q = (c: number, k: number) => 2 * N + 1 + c * N + k;
  const n = 2 * N + 1 + C * N;
  const U0 = input.cellVoltage - input.cellResistance * input.current;
  // Branch: current from a to b = (V_a − V_b − E)/R.
  const branches: { a: number; b: number; R: number; E: number }[] = [];
  for (let k = 0; k < N; k++) {
    branches.push({ a: P(k), b: M(k), R: input.cellResistance / 2, E: U0 / 2 });
    branches.push({ a: M(k), b: P(k + 1), R: input.cellResistance / 2, E: U0 / 2 });
    input.circuits.forEach((c, ci) => {
      branches.push({ a: M(k), b: Q(ci, k), R: c.channelResistance, E: 0 });
      if (k < N - 1) branches.push({ a: Q(ci, k), b: Q(ci, k + 1), R: c.manifoldSegmentResistance, E: 0 });
    });
  }
  const A = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const b = new Array<number>(n).fill(0);
  for (const br of branches) {
    const g = 1 / br.R;
    // KCL: Σ currents leaving a node = current injected into it.
    A[br.a][br.a] += g;
    A[br.a][br.b] -= g;
    b[br.a] += g * br.E;
    A[br.b][br.b] += g;
    A[br.b][br.a] -= g;
    b[br.b] -= g * br.E;
  }
  b[P(0)] += input.current;
  // Ground P_N.
  A[P(N)].fill(0);
  A[P(N)][P(N)] = 1;
  b[P(N)] = 0;
  // Gaussian elimination with partial pivoting.
  for (let col = 0; col < n; col++) {
    let piv = col;
    for (let row = col + 1; row < n; row++) if (Math.abs(A[row][col]) > Math.abs(A[piv][col])) piv = row;
    [A[col], A[piv]] = [A[piv], A[col]];
    [b[col], b[piv]] = [b[piv], b[col]];
    for (let row = col + 1; row < n; row++) {
      const f = A[row][col] / A[col][col];
      if (f === 0) continue;
      for (let k = col; k < n; k++) A[row][k] -= f * A[col][k];
      b[row] -= f * b[col];
    }
  }
  const V = new Array<number>(n).fill(0);
  for (let row = n - 1; row >= 0; row--) {
    let s = b[row];
    for (let k = row + 1; k < n; k++) s -= A[row][k] * V[k];
    V[row] = s / A[row][row];
  }
  return { V, node: { P, M, Q } };
}

/** An invented 4-circuit stack: resistances of the order of a small chlor-alkali electrolyser. */
function fourCircuits(cells: number): ShuntInput {
  return {
    cells,
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
}

describe('solveShuntCurrents vs an independent dense solve', () => {
  for (const cells of [2, 7, 40]) {
    it(`${cells} cells, 4 circuits: channel and manifold currents agree`, () => {
      const input = fourCircuits(cells);
      const r = solveShuntCurrents(input);
      const { V, node } = denseReference(input);
      const scale = Math.max(...r.channelCurrents.flat().map(Math.abs));
      input.circuits.forEach((c, ci) => {
        for (let k = 0; k < cells; k++) {
          const ref = (V[node.M(k)] - V[node.Q(ci, k)]) / c.channelResistance;
          expectClose(r.channelCurrents[ci][k], ref, { rtol: 1e-7, atol: 1e-9 * scale }, `channel ${ci},${k}`);
        }
        for (let k = 0; k < cells - 1; k++) {
          const ref = (V[node.Q(ci, k)] - V[node.Q(ci, k + 1)]) / c.manifoldSegmentResistance;
          expectClose(r.manifoldCurrents[ci][k], ref, { rtol: 1e-7, atol: 1e-9 * scale }, `manifold ${ci},${k}`);
        }
      });
      expectClose(r.stackVoltage, V[node.P(0)], { rtol: 1e-10 }, 'stack voltage');
      // Half-cell currents from the dense potentials (differences across r/2 lose digits: looser).
      const U0 = input.cellVoltage - input.cellResistance * input.current;
      for (let k = 0; k < cells; k++) {
        const j1 = (V[node.P(k)] - V[node.M(k)] - U0 / 2) / (input.cellResistance / 2);
        expectClose(r.firstHalfCurrents[k], j1, { rtol: 1e-6 }, `first half ${k}`);
      }
    });
  }
});

describe('solveShuntCurrents — hand-solvable two-cell stack', () => {
  it('matches the two-branch parallel solution i_s = U/(2R_ch + R_m + r)', () => {
    /*
     * Between M_0 and M_1 two paths in parallel carry I: the cell path (EMF U0, resistance r)
     * and the shunt path M_0 → Q_0 → Q_1 → M_1 (resistance R_s = 2·R_ch + R_m, no EMF).
     * U0 + r·(I − i_s) = R_s·i_s  ⇒  i_s = (U0 + r·I)/(R_s + r) = U/(R_s + r).
     * U = 3 V, r = 1e-4 Ω, R_ch = 10 Ω, R_m = 1 Ω: i_s = 3/21.0001 = 0.142 856 462… A.
     */
    const r = solveShuntCurrents({
      cells: 2,
      current: 1000,
      cellVoltage: 3,
      cellResistance: 1e-4,
      circuits: [{ name: 'c', channelResistance: 10, manifoldSegmentResistance: 1 }],
    });
    const iShunt = 3 / 21.0001;
    expectClose(r.channelCurrents[0][0], iShunt, { rtol: 1e-12 }, 'leaves cell 1');
    expectClose(r.channelCurrents[0][1], -iShunt, { rtol: 1e-12 }, 'returns at cell 2');
    expectClose(r.manifoldCurrents[0][0], iShunt, { rtol: 1e-12 }, 'manifold');
    // Each cell loses half the shunt current on average (one half-cell bypassed each).
    expectClose(r.bypassCurrents[0], iShunt / 2, { rtol: 1e-9 });
    expectClose(r.bypassCurrents[1], iShunt / 2, { rtol: 1e-9 });
    expectClose(r.currentEfficiencyLoss, iShunt / 2 / 1000, { rtol: 1e-9 });
    expectClose(r.shuntPower, iShunt * iShunt * 21, { rtol: 1e-9 });
  });

  it('a single common manifold node (R_m → 0, r → 0) gives i_k = U·((N−1)/2 − k)/R_ch', () => {
    // With ideal cells the mid-node potentials step by U; the floating manifold sits at their mean.
    // r = R_m = 1 µΩ against R_ch = 100 Ω departs from the limit by ~2e-7 relative.
    const N = 10;
    const r = solveShuntCurrents({
      cells: N,
      current: 1000,
      cellVoltage: 2,
      cellResistance: 1e-6,
      circuits: [{ name: 'c', channelResistance: 100, manifoldSegmentResistance: 1e-6 }],
    });
    for (let k = 0; k < N; k++) {
      expectClose(r.channelCurrents[0][k], (2 * ((N - 1) / 2 - k)) / 100, { rtol: 1e-6, atol: 1e-9 }, `cell ${k}`);
    }
  });
});

describe('solveShuntCurrents — invariants', () => {
  const input = fourCircuits(60);
  const r = solveShuntCurrents(input);
  const scale = Math.max(...r.channelCurrents.flat().map(Math.abs));

  it('channel currents are antisymmetric about the stack centre; bypass is symmetric and largest there', () => {
    for (let c = 0; c < 4; c++) {
      for (let k = 0; k < 60; k++) {
        expectClose(r.channelCurrents[c][k], -r.channelCurrents[c][59 - k], { atol: 1e-9 * scale }, `circuit ${c} cell ${k}`);
      }
    }
    for (let k = 0; k < 60; k++) expectClose(r.bypassCurrents[k], r.bypassCurrents[59 - k], { rtol: 1e-8 }, `bypass ${k}`);
    expect([29, 30]).toContain(r.maxBypassCurrent.cell);
    expect([0, 59]).toContain(r.maxChannelCurrent.cell);
  });

  it('Kirchhoff: each manifold node balances, each circuit nets to zero, the terminal current leaves intact', () => {
    for (let c = 0; c < 4; c++) {
      let net = 0;
      for (let k = 0; k < 60; k++) {
        const inFromLeft = k > 0 ? r.manifoldCurrents[c][k - 1] : 0;
        const outToRight = k < 59 ? r.manifoldCurrents[c][k] : 0;
        expectClose(r.channelCurrents[c][k] + inFromLeft - outToRight, 0, { atol: 1e-9 * scale }, `node ${c},${k}`);
        net += r.channelCurrents[c][k];
      }
      expectClose(net, 0, { atol: 1e-9 * scale }, `circuit ${c} net`);
    }
    expectClose(r.secondHalfCurrents[59], input.current, { rtol: 1e-12 }, 'current out of P_N');
  });

  it('power: rectifier power = cell sources + cell resistance losses + shunt losses (Tellegen)', () => {
    const U0 = r.cellSourceVoltage;
    const rHalf = input.cellResistance / 2;
    let cells = 0;
    for (let k = 0; k < 60; k++) {
      const a = r.firstHalfCurrents[k];
      const b = r.secondHalfCurrents[k];
      cells += (U0 / 2) * (a + b) + rHalf * (a * a + b * b);
    }
    expectClose(r.rectifierPower, cells + r.shuntPower, { rtol: 1e-9 }, 'power balance');
  });

  it('loss grows with the number of cells and falls with channel resistance', () => {
    const small = solveShuntCurrents(fourCircuits(30));
    expect(r.currentEfficiencyLoss).toBeGreaterThan(small.currentEfficiencyLoss);
    const longer = fourCircuits(60);
    longer.circuits = longer.circuits.map((c) => ({ ...c, channelResistance: 4 * c.channelResistance }));
    expect(solveShuntCurrents(longer).currentEfficiencyLoss).toBeLessThan(r.currentEfficiencyLoss);
  });

  it('warns when the loss exceeds 1 %', () => {
    const leaky = fourCircuits(200);
    leaky.circuits = leaky.circuits.map((c) => ({
      ...c,
      channelResistance: c.channelResistance / 20,
      manifoldSegmentResistance: c.manifoldSegmentResistance / 10,
    }));
    const out = solveShuntCurrents(leaky);
    expect(out.currentEfficiencyLoss).toBeGreaterThan(0.01);
    expect(out.warnings.some((w) => /Shunt currents take/.test(w))).toBe(true);
  });
});

describe('solveShuntCurrents — rounding floor', () => {
  it('warns when the cell resistance is so small against the channels that potentials lose the channel currents', () => {
    const stiff = solveShuntCurrents({
      cells: 10,
      current: 1000,
      cellVoltage: 2,
      cellResistance: 1e-9,
      circuits: [{ name: 'c', channelResistance: 100, manifoldSegmentResistance: 1e-9 }],
    });
    expect(stiff.warnings.some((w) => /very stiff/.test(w))).toBe(true);
    expect(solveShuntCurrents(fourCircuits(200)).warnings.some((w) => /very stiff/.test(w))).toBe(false);
  });
});

describe('shunt helpers and validation', () => {
  it('R = L/(σA): 0.5 m of 1 cm² duct at 50 S/m is 100 Ω (hand calculation)', () => {
    expectClose(electrolytePathResistance(0.5, 1e-4, 50), 100, { rtol: 1e-14 });
  });

  it('r = K/A: 0.1 V per kA/m² (1e-4 Ω·m²) over 2.5 m² is 40 µΩ', () => {
    expectClose(cellResistanceFromKFactor(1e-4, 2.5), 4e-5, { rtol: 1e-14 });
  });

  it('rejects fewer than two cells and non-positive resistances', () => {
    const bad = (patch: Partial<ShuntInput>) => {
      try {
        solveShuntCurrents({ ...fourCircuits(10), ...patch });
      } catch (e) {
        expect(e).toBeInstanceOf(InputError);
        return (e as InputError).issues.map((i) => i.path);
      }
      throw new Error('expected an InputError');
    };
    expect(bad({ cells: 1 })).toContain('cells');
    expect(bad({ cells: 2.5 })).toContain('cells');
    expect(bad({ cellResistance: 0 })).toContain('cellResistance');
    expect(bad({ circuits: [{ name: 'x', channelResistance: 0, manifoldSegmentResistance: -1 }] })).toEqual([
      'circuits.0.channelResistance',
      'circuits.0.manifoldSegmentResistance',
    ]);
    expect(bad({ circuits: [] })).toContain('circuits');
    expect(() => electrolytePathResistance(1, 0, 10)).toThrow(InputError);
  });
});
