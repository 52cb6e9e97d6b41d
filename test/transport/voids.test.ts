import { describe, it, expect } from 'vitest';
import { expectClose } from '../helpers/close.js';
import { bruggemanConductivity, gapResistance, maxwellConductivity, voidConductivityFactor } from '../../server/core/transport/voids.js';
import { InputError } from '../../server/core/errors.js';

describe('gas-void correction vs check-values §7 (derived)', () => {
  // 5 decimals in the table → atol 6e-6.
  const rows: Array<[number, number, number]> = [
    [0.05, 0.92595, 0.92683],
    [0.1, 0.85381, 0.85714],
    [0.2, 0.71554, 0.72727],
    [0.3, 0.58566, 0.6087],
    [0.4, 0.46476, 0.5],
  ];
  for (const [eps, brug, maxw] of rows) {
    it(`ε = ${eps}: Bruggeman ${brug}, Maxwell ${maxw}`, () => {
      expectClose(bruggemanConductivity(1, eps), brug, { atol: 6e-6 }, 'Bruggeman');
      expectClose(maxwellConductivity(1, eps), maxw, { atol: 6e-6 }, 'Maxwell');
    });
  }
  it('limits: ε = 0 gives σ; the two models agree to first order in ε (both 1 − 1.5ε)', () => {
    expectClose(bruggemanConductivity(50, 0), 50, { rtol: 0 }, 'ε = 0');
    const eps = 1e-5;
    expectClose(voidConductivityFactor(eps, 'bruggeman'), voidConductivityFactor(eps, 'maxwell'), { atol: 1e-9 }, 'first order');
  });
});

describe('gap resistance R = d/σ_eff', () => {
  it('3 mm of 100 S/m electrolyte with ε = 0.2 (Bruggeman) → 4.1926e-5 Ω·m² (= 0.003/(100·0.71554))', () => {
    expectClose(gapResistance(3e-3, 100, 0.2), 3e-3 / (100 * 0.715541753), { rtol: 1e-8 }, 'R');
    expectClose(gapResistance(3e-3, 100, 0.2, 'maxwell'), 3e-3 / (100 * (0.8 / 1.1)), { rtol: 1e-12 }, 'R Maxwell');
  });
  it('ε outside [0, 1) → InputError (never Infinity)', () => {
    expect(() => gapResistance(1e-3, 50, 1)).toThrow(InputError);
    expect(() => gapResistance(1e-3, 50, -0.01)).toThrow(InputError);
    expect(() => bruggemanConductivity(50, Number.NaN)).toThrow(InputError);
    expect(() => gapResistance(1e-3, 0, 0.1)).toThrow(InputError);
  });
});
