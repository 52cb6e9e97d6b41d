import { describe, expect, it } from 'vitest';
import { cellAreaResistanceAt, type CellPerformance } from '../../server/core/plant/index.js';
import { expectClose } from '../helpers/close.js';

describe('small-signal area resistance dU/dj of a cell', () => {
  it('is the K-factor itself for a linear cell', () => {
    const cell: CellPerformance = { kind: 'linear', intercept: 2.35, slope: 1.0e-4, currentEfficiency: 0.96 };
    expect(cellAreaResistanceAt(cell, 5500)).toBe(1.0e-4);
  });

  it('matches the analytic derivative of a smooth model cell', () => {
    // U(j) = 2.2 + 0.03·ln(j/10) + 8e-5·j: dU/dj = 0.03/j + 8e-5 (calculus, differentiated by hand).
    const cell: CellPerformance = {
      kind: 'model',
      thermoneutralVoltage: 2.31,
      evaluate: (j) => ({ cellVoltage: 2.2 + 0.03 * Math.log(j / 10) + 8e-5 * j, currentEfficiency: 0.96 }),
    };
    for (const j of [500, 2000, 6000]) {
      expectClose(cellAreaResistanceAt(cell, j), 0.03 / j + 8e-5, { rtol: 1e-7 }, `j = ${j}`);
    }
  });

  it('refuses a non-positive current density', () => {
    const cell: CellPerformance = { kind: 'linear', intercept: 2.35, slope: 1.0e-4, currentEfficiency: 0.96 };
    expect(() => cellAreaResistanceAt(cell, 0)).toThrow(/currentDensity/);
  });
});
