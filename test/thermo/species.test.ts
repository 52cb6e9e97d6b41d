import { describe, it, expect } from 'vitest';
import { expectClose } from '../helpers/close.js';
import {
  SHOMATE,
  SPECIES,
  enthalpy,
  enthalpyIncrement,
  entropy,
  gibbsFunction,
  heatCapacity,
  shomateEnthalpyIncrement,
  shomateEntropy,
  shomateHeatCapacity,
  type SpeciesId,
} from '../../server/core/thermo/species.js';

// Check values "computed from the coefficients above (derived)" in check-values §3. The
// table prints 3 decimals for Cp and S (tolerance 6e-4 J/(mol·K) = half a unit in the last
// place plus rounding of the coefficients) and 4 decimals for ΔH in kJ (tolerance 6e-5 kJ).
const SHOMATE_CHECKS: Array<{ id: 'H2(g)' | 'O2(g)' | 'Cl2(g)' | 'H2O(l)'; cp298: number; s298: number; cp353: number; s353: number; dh353kJ: number }> = [
  { id: 'H2(g)', cp298: 28.837, s298: 130.68, cp353: 29.086, s353: 135.586, dh353kJ: 1.594 },
  { id: 'O2(g)', cp298: 29.383, s298: 205.147, cp353: 29.726, s353: 210.148, dh353kJ: 1.6247 },
  { id: 'Cl2(g)', cp298: 33.946, s298: 223.078, cp353: 34.779, s353: 228.898, dh353kJ: 1.8912 },
  { id: 'H2O(l)', cp298: 75.375, s298: 69.954, cp353: 75.599, s353: 82.71, dh353kJ: 4.1459 },
];

describe('Shomate kernels vs check-values §3 (NIST WebBook coefficients; values derived)', () => {
  for (const c of SHOMATE_CHECKS) {
    const seg = SHOMATE[c.id][0];
    it(`${c.id}: Cp, S at 298.15 and 353.15 K, H(353.15) − H(298.15)`, () => {
      expectClose(shomateHeatCapacity(seg, 298.15), c.cp298, { atol: 6e-4 }, `${c.id} Cp(298.15)`);
      expectClose(shomateEntropy(seg, 298.15), c.s298, { atol: 6e-4 }, `${c.id} S(298.15)`);
      expectClose(shomateHeatCapacity(seg, 353.15), c.cp353, { atol: 6e-4 }, `${c.id} Cp(353.15)`);
      expectClose(shomateEntropy(seg, 353.15), c.s353, { atol: 6e-4 }, `${c.id} S(353.15)`);
      expectClose(shomateEnthalpyIncrement(seg, 353.15) / 1000, c.dh353kJ, { atol: 6e-5 }, `${c.id} ΔH kJ`);
    });
  }
  it('H2O(g) 500–1700 K segment at 500 K: Cp 35.218, S 206.534, H(500) − H(298.15) = 6.9246 kJ (check-values §3)', () => {
    const seg = SHOMATE['H2O(g)'][0];
    expectClose(shomateHeatCapacity(seg, 500), 35.218, { atol: 6e-4 }, 'Cp(500)');
    expectClose(shomateEntropy(seg, 500), 206.534, { atol: 6e-4 }, 'S(500)');
    expectClose(shomateEnthalpyIncrement(seg, 500) / 1000, 6.9246, { atol: 6e-5 }, 'ΔH(500)');
  });
  it('H2O(g) segment extrapolated to 298.15 K reproduces CODATA S° = 188.835 J/(mol·K) (check-values §2a, source seen)', () => {
    // Tolerance 0.005 J/(mol·K): the extrapolation is what we rely on below 500 K.
    expectClose(shomateEntropy(SHOMATE['H2O(g)'][0], 298.15), 188.835, { atol: 0.005 }, 'S°(H2O,g)');
  });
});

describe('species functions: anchors and identities', () => {
  const ids = Object.keys(SPECIES) as SpeciesId[];
  const temps = [278.15, 298.15, 323.15, 353.15, 368.15];

  it('at 298.15 K each species returns its NBS-82 anchors exactly (ΔfH°, S°)', () => {
    for (const id of ids) {
      const sp = SPECIES[id];
      expectClose(enthalpy(sp, 298.15), sp.formationEnthalpy, { atol: 1e-9 }, `${id} H(298.15)`);
      expectClose(entropy(sp, 298.15), sp.entropy, { atol: 1e-12 }, `${id} S(298.15)`);
      expectClose(enthalpyIncrement(sp, 298.15), 0, { atol: 1e-9 }, `${id} ΔH(298.15)`);
    }
  });

  it('dH/dT = Cp and dS/dT = Cp/T (central differences, h = 0.01 K; identity)', () => {
    const h = 0.01;
    for (const id of ids) {
      const sp = SPECIES[id];
      for (const T of temps) {
        const cp = heatCapacity(sp, T);
        const dH = (enthalpy(sp, T + h) - enthalpy(sp, T - h)) / (2 * h);
        const dS = (entropy(sp, T + h) - entropy(sp, T - h)) / (2 * h);
        // Central-difference truncation error ~h²·Cp''' ≪ 1e-6; round-off ~1e-16·|H|/h ≈ 1e-8.
        expectClose(dH, cp, { rtol: 1e-7, atol: 1e-6 }, `${id} dH/dT at ${T}`);
        expectClose(dS, cp / T, { rtol: 1e-7, atol: 1e-8 }, `${id} dS/dT at ${T}`);
      }
    }
  });

  it('g = h − T·s and G(T2) − G(T1) = −∫S dT (Simpson integration; Gibbs–Helmholtz identity)', () => {
    for (const id of ids) {
      const sp = SPECIES[id];
      for (const T of temps) {
        expectClose(gibbsFunction(sp, T), enthalpy(sp, T) - T * entropy(sp, T), { rtol: 1e-14, atol: 1e-9 }, `${id} g = h − Ts at ${T}`);
      }
      const [a, b] = [283.15, 363.15];
      const n = 200;
      const dx = (b - a) / n;
      let integral = entropy(sp, a) + entropy(sp, b);
      for (let i = 1; i < n; i++) integral += (i % 2 ? 4 : 2) * entropy(sp, a + i * dx);
      integral *= dx / 3;
      // Simpson error with n = 200 over 80 K is far below 1e-6 J/mol for these smooth S(T).
      expectClose(gibbsFunction(sp, b) - gibbsFunction(sp, a), -integral, { rtol: 1e-9, atol: 1e-6 }, `${id} ΔG = −∫S dT`);
    }
  });

  it('enthalpy is continuous across Shomate segment boundaries (H2 at 1000 K, O2 at 700 K)', () => {
    for (const [id, Tb] of [['H2(g)', 1000], ['O2(g)', 700]] as const) {
      const sp = SPECIES[id];
      const below = enthalpy(sp, Tb - 1e-6);
      const above = enthalpy(sp, Tb + 1e-6);
      expectClose(above, below, { atol: 1e-3 }, `${id} H continuous at ${Tb}`);
    }
  });

  it('aqueous species use constant Cp° (documented approximation)', () => {
    expect(SPECIES['Cl-(aq)'].heatCapacityModel.kind).toBe('constant');
    expectClose(heatCapacity(SPECIES['Cl-(aq)'], 350), -136.4, { atol: 1e-12 }, 'Cp(Cl−) NBS-82');
  });

  it('"ao" salt records equal the sums of their ions (NBS-82 convention; check-values §2a lists the sums: ΔfH, ΔfG within 0.02 kJ/mol, S° within 0.2 J/(mol·K))', () => {
    const pairs: Array<[SpeciesId, SpeciesId, SpeciesId]> = [
      ['NaCl(aq)', 'Na+(aq)', 'Cl-(aq)'],
      ['NaOH(aq)', 'Na+(aq)', 'OH-(aq)'],
      ['KOH(aq)', 'K+(aq)', 'OH-(aq)'],
    ];
    for (const [salt, cation, anion] of pairs) {
      const [s, c, a] = [SPECIES[salt], SPECIES[cation], SPECIES[anion]];
      expectClose(s.formationEnthalpy, c.formationEnthalpy + a.formationEnthalpy, { atol: 20 }, `${salt} ΔfH`);
      expectClose(s.formationGibbsEnergy, c.formationGibbsEnergy + a.formationGibbsEnergy, { atol: 20 }, `${salt} ΔfG`);
      expectClose(s.entropy, c.entropy + a.entropy, { atol: 0.2 }, `${salt} S°`);
    }
  });
});
