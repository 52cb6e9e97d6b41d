import { describe, expect, it } from 'vitest';
import { expectClose } from '../helpers/close.js';
import { findRootBracketed, minimizeBracketed } from '../../server/core/plant/optimize1d.js';

describe('minimizeBracketed (Brent)', () => {
  it('a/x + b·x has its minimum at √(a/b) (calculus)', () => {
    const r = minimizeBracketed((x) => 4 / x + x, 0.1, 10, { rtol: 1e-10 });
    expect(r.status).toBe('converged');
    // A smooth minimum is located to about √ε relative in float64.
    expectClose(r.x, 2, { rtol: 1e-7 });
    expectClose(r.fx, 4, { rtol: 1e-14 });
  });

  it('cos x on [2, 4] → π (hand: minimum of cos at π)', () => {
    const r = minimizeBracketed(Math.cos, 2, 4);
    expectClose(r.x, Math.PI, { rtol: 1e-7 });
  });

  it('a kinked function |x − 0.3| converges by golden-section steps', () => {
    const r = minimizeBracketed((x) => Math.abs(x - 0.3), -1, 2, { atol: 1e-10, rtol: 0 });
    expect(r.status).toBe('converged');
    expectClose(r.x, 0.3, { atol: 1e-9 });
  });

  it('reports a non-finite objective instead of a value', () => {
    const r = minimizeBracketed(() => NaN, 0, 1);
    expect(r.status).toBe('failed:non-finite');
  });
});

describe('findRootBracketed (Illinois with bisection safeguard)', () => {
  it('x³ − 2 = 0 → 2^(1/3) = 1.259 921 049 894 873… (hand)', () => {
    const r = findRootBracketed((x) => x ** 3 - 2, 0, 2);
    expect(r.status).toBe('converged');
    expectClose(r.x, 1.2599210498948732, { rtol: 1e-12 });
  });

  it('a steep exponential converges without stalling at one end', () => {
    const r = findRootBracketed((x) => Math.exp(20 * x) - 2, -1, 1);
    expectClose(r.x, Math.log(2) / 20, { rtol: 1e-12 });
    expect(r.iterations).toBeLessThan(100);
  });

  it('refuses an interval without a sign change', () => {
    expect(findRootBracketed((x) => x * x + 1, -1, 1).status).toBe('failed:no-bracket');
  });
});
