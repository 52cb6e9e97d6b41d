import { describe, expect, it } from 'vitest';
import { expectClose } from '../helpers/close.js';
import { crossoverFluxFromHydrogenFraction } from '../../server/core/safety/crossover.js';
import { anodeGasHydrogenFraction } from '../../server/core/safety/checks.js';
import { InputError } from '../../server/core/errors.js';

describe('crossover flux from the anode-gas H₂ fraction', () => {
  it('gives the hand-computed flux', () => {
    // Independent hand computation: x = 0.5 % H₂ in O₂ at g = 1e-2 mol/(m²·s):
    // f = 1e-2 · 0.005/0.995 = 5.025125628…e-5 mol/(m²·s).
    expectClose(crossoverFluxFromHydrogenFraction(0.005, 1e-2), 5.025125628140704e-5, { rtol: 1e-14 }, 'f');
    // x = 1/3 → f = g/2 exactly (1/3 of the gas is H₂ when f : g = 1 : 2).
    expectClose(crossoverFluxFromHydrogenFraction(1 / 3, 4e-3), 2e-3, { rtol: 1e-14 }, 'f at x = 1/3');
  });

  it('is zero at zero H₂ and inverts x = f/(f + g)', () => {
    expectClose(crossoverFluxFromHydrogenFraction(0, 1e-2), 0, { atol: 0 }, 'f at x = 0');
    for (const x of [1e-6, 0.004, 0.02, 0.5, 0.9]) {
      const g = 2.59e-3;
      expectClose(anodeGasHydrogenFraction(crossoverFluxFromHydrogenFraction(x, g), g), x, { rtol: 1e-13 }, `round trip x = ${x}`);
    }
  });

  it('rejects fractions outside [0, 1) and non-positive production', () => {
    for (const x of [-0.1, 1, 1.5, Number.NaN]) expect(() => crossoverFluxFromHydrogenFraction(x, 1e-2)).toThrow(InputError);
    for (const g of [0, -1, Number.POSITIVE_INFINITY]) expect(() => crossoverFluxFromHydrogenFraction(0.01, g)).toThrow(InputError);
  });
});
