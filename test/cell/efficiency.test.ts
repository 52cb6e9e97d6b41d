import { describe, expect, it } from 'vitest';
import { FARADAY } from '../../server/core/constants.js';
import { PhysicsError } from '../../server/core/errors.js';
import { butlerVolmerCurrentDensity } from '../../server/core/kinetics/models.js';
import { waterVapourPressure } from '../../server/core/thermo/water.js';
import { sweepCell } from '../../server/core/cell/sweep.js';
import type { CellDefinition } from '../../server/core/cell/types.js';
import { expectClose } from '../helpers/close.js';
import { chlorAlkaliCell, IDEAL_ELECTRODE_ETA_BOUND, linearCell, linspace } from './cells.js';

/** J/kg → kWh per tonne (1 kWh = 3.6e6 J, 1 t = 1000 kg). */
const kWhPerTonne = (w: number) => w / 3.6e3;
/** J/kg → kWh per kg. */
const kWhPerKg = (w: number) => w / 3.6e6;

describe('specific energy against check-values §8 (derived from Faraday’s law, IUPAC atomic weights)', () => {
  it('chlor-alkali: 2.9 V at 96 % CE → 2284 kWh/t Cl2 and 2024 kWh/t NaOH', () => {
    // U = 2.3 V + 1e-4 Ω·m² × 6000 A/m² = 2.9 V (ideal electrodes add < 1e-8 V).
    const def: CellDefinition = { ...linearCell('chlor-alkali', 2.3, 1e-4, [6000]), currentEfficiency: { model: 'constant', value: 0.96 }, rectifierEfficiency: 0.97 };
    const p = sweepCell(def).points[0];
    expectClose(p.cellVoltage, 2.9, { atol: IDEAL_ELECTRODE_ETA_BOUND }, 'U');
    expectClose(kWhPerTonne(p.specificEnergy.Cl2!), 2284, { rtol: 3e-4 }, 'Cl2');
    expectClose(kWhPerTonne(p.specificEnergy.NaOH!), 2024, { rtol: 3e-4 }, 'NaOH');
    expectClose(p.specificEnergyAC!.Cl2!, p.specificEnergy.Cl2! / 0.97, { rtol: 1e-15 }, 'AC = DC / rectifier efficiency');
    expectClose(p.currentEfficiency.byProduct.Cl2!, 0.96, { rtol: 0 }, 'CE Cl2');
    expectClose(p.currentEfficiency.byProduct.NaOH!, 0.96, { rtol: 0 }, 'CE NaOH');
    expectClose(p.currentEfficiency.byProduct.H2!, 1, { rtol: 0 }, 'CE H2 (cathode at 100 %)');
  });

  it('chlor-alkali: 3.0 V at 95 % → 2387 and at 97 % → 2338 kWh/t Cl2; 3.1 V at 96 % → 2441 (2164 NaOH)', () => {
    const at = (U: number, ce: number) =>
      sweepCell({ ...linearCell('chlor-alkali', U - 0.6, 1e-4, [6000]), currentEfficiency: { model: 'constant', value: ce } }).points[0];
    expectClose(kWhPerTonne(at(3.0, 0.95).specificEnergy.Cl2!), 2387, { rtol: 3e-4 }, '3.0 V, 95 %');
    expectClose(kWhPerTonne(at(3.0, 0.97).specificEnergy.Cl2!), 2338, { rtol: 3e-4 }, '3.0 V, 97 %');
    const p = at(3.1, 0.96);
    expectClose(kWhPerTonne(p.specificEnergy.Cl2!), 2441, { rtol: 3e-4 }, '3.1 V Cl2');
    expectClose(kWhPerTonne(p.specificEnergy.NaOH!), 2164, { rtol: 3e-4 }, '3.1 V NaOH');
  });

  it('water: 1.8 V → 47.86 kWh/kg H2, 2.0 V → 53.18, 1.481 V → 39.38 (100 % Faradaic efficiency)', () => {
    for (const [U, expected] of [
      [1.8, 47.86],
      [2.0, 53.18],
      [1.481, 39.38],
    ] as const) {
      const p = sweepCell(linearCell('alkaline-water', U - 0.5, 0.5e-4, [1e4])).points[0];
      expectClose(kWhPerKg(p.specificEnergy.H2!), expected, { rtol: 2e-4 }, `${U} V`);
    }
  });

  it('voltage efficiency at 1.8 V: 82.3 % on the HHV basis and 69.6 % on the LHV basis', () => {
    const p = sweepCell(linearCell('pem-water', 1.3, 0.5e-4, [1e4])).points[0];
    expectClose(p.voltageEfficiency!.hhv, 0.823, { rtol: 1e-3 }, 'HHV');
    expectClose(p.voltageEfficiency!.lhv!, 0.696, { rtol: 1e-3 }, 'LHV');
    // 1.4812 V / U (check-values §8): the HHV voltage itself.
    expectClose(p.voltageEfficiency!.hhv * p.cellVoltage, 1.4812, { rtol: 1e-4 }, 'U_HHV');
  });

  it('production per kA·h at 100 % CE: Cl2 1.32269, NaOH 1.49234, H2 0.037610, O2 0.29847 kg', () => {
    const seconds = 3600; // 1000 A/m² for one hour on 1 m² = 1 kA·h
    const ca = sweepCell(linearCell('chlor-alkali', 2.3, 1e-4, [1000])).points[0].productionRate;
    expectClose(ca.Cl2! * seconds, 1.32269, { rtol: 1e-5 }, 'Cl2');
    expectClose(ca.NaOH! * seconds, 1.49234, { rtol: 1e-5 }, 'NaOH');
    expectClose(ca.H2! * seconds, 0.03761, { rtol: 1e-4 }, 'H2');
    const w = sweepCell(linearCell('pem-water', 1.3, 1e-4, [1000])).points[0].productionRate;
    expectClose(w.H2! * seconds, 0.03761, { rtol: 1e-4 }, 'H2 water');
    expectClose(w.O2! * seconds, 0.29847, { rtol: 1e-5 }, 'O2');
  });
});

describe('parasitic current density', () => {
  it('CE = 1 − j_p/j falls at low load and is the same for the main products', () => {
    const def: CellDefinition = { ...linearCell('chlor-alkali', 2.3, 1e-4, [200, 1000, 6000]), currentEfficiency: { model: 'parasitic', currentDensity: 100 } };
    const ps = sweepCell(def).points;
    expectClose(ps[0].currentEfficiency.byProduct.Cl2!, 0.5, { rtol: 1e-15 }, 'j = 2 j_p');
    expectClose(ps[2].currentEfficiency.byProduct.NaOH!, 1 - 100 / 6000, { rtol: 1e-15 }, 'j = 60 j_p');
    expect(ps[0].currentEfficiency.byProduct.Cl2!).toBeLessThan(ps[1].currentEfficiency.byProduct.Cl2!);
    expectClose(ps[1].currentEfficiency.byProduct.H2!, 1, { rtol: 0 }, 'H2');
  });

  it('j at or below j_p is a PhysicsError naming the point', () => {
    const def: CellDefinition = { ...linearCell('pem-water', 1.3, 1e-4, [1000, 50]), currentEfficiency: { model: 'parasitic', currentDensity: 50 } };
    expect(() => sweepCell(def)).toThrow(PhysicsError);
    expect(() => sweepCell(def)).toThrow(/currentDensities\[1\]/);
  });
});

describe('hydrogen crossover and the H2-in-O2 caution', () => {
  // Invented permeation: P = 1e-15 mol/(m·s·Pa), δ = 50 µm, 30 bar(a), 80 °C.
  const crossover = (js: number[], thickness = 50e-6): CellDefinition => ({
    ...linearCell('pem-water', 1.3, 1e-4, js),
    pressure: 30e5,
    currentEfficiency: { model: 'crossover', hydrogenPermeability: 1e-15, membraneThickness: thickness },
  });

  it('the Faradaic loss and the anode-gas H2 content are two views of the same flux (mole balance)', () => {
    const r = sweepCell(crossover([500, 1000, 3000, 10_000, 30_000]));
    for (const p of r.points) {
      const loss = 1 - p.currentEfficiency.byProduct.H2!;
      // H2 lost per O2 made: (1 − CE)·j/2F over j/4F = 2(1 − CE); x = 2(1−CE)/(2(1−CE) + 1).
      expectClose(p.currentEfficiency.hydrogenInOxygenPercent!, (100 * 2 * loss) / (2 * loss + 1), { rtol: 1e-12 }, `j = ${p.currentDensity}`);
      expectClose(p.currentEfficiency.byProduct.O2!, 1, { rtol: 0 }, 'O2');
    }
    const x = r.points.map((p) => p.currentEfficiency.hydrogenInOxygenPercent!);
    for (let i = 1; i < x.length; i++) expect(x[i]).toBeLessThan(x[i - 1]); // purity worsens at low load
  });

  it('Fick’s law: the crossover scales with 1/thickness and with the water-saturated H2 pressure', () => {
    const thin = sweepCell(crossover([1e4], 50e-6)).points[0].currentEfficiency.crossoverCurrentDensity!;
    const thick = sweepCell(crossover([1e4], 100e-6)).points[0].currentEfficiency.crossoverCurrentDensity!;
    expectClose(thin / thick, 2, { rtol: 1e-14 }, 'thickness');
    // p_H2 = p − p_sat(T) for pure water (PEM), with p_sat from the thermo module (independent of the cell code).
    const pH2 = (thin / (2 * FARADAY.value)) * (50e-6 / 1e-15);
    expectClose(pH2, 30e5 - waterVapourPressure(353.15), { rtol: 1e-12 }, 'p_H2');
  });

  it('cautions at half the lower flammability limit (2 vol % H2 in O2) and notes the ≈ 1 % alarm level', () => {
    const r = sweepCell(crossover(linspace(200, 20_000, 12)));
    const worst = r.points[0].currentEfficiency.hydrogenInOxygenPercent!;
    expect(worst).toBeGreaterThan(2);
    const caution = r.warnings.find((w) => w.includes('half the lower flammability limit'));
    expect(caution).toBeDefined();
    expect(caution).toContain('4 vol % H2 in O2');
    expect(caution).toContain('local codes, standards and licensed engineering practice govern');
    expect(r.warnings.some((w) => w.includes('typical alarm level'))).toBe(true);
    // At full load only: no caution.
    const high = sweepCell(crossover([20_000]));
    expect(high.points[0].currentEfficiency.hydrogenInOxygenPercent!).toBeLessThan(1);
    expect(high.warnings.some((w) => w.includes('flammability'))).toBe(false);
  });

  it('a crossover equivalent current above j is a PhysicsError (no net hydrogen)', () => {
    expect(() => sweepCell(crossover([1]))).toThrow(/no net hydrogen/);
  });
});

describe('competing anode reaction (oxygen evolution beside chlorine)', () => {
  const T = 361.15;
  const main = { exchangeCurrentDensity: 100, anodicTransferCoefficient: 2, cathodicTransferCoefficient: 0.5 };
  const side = { exchangeCurrentDensity: 2e-3, anodicTransferCoefficient: 1, cathodicTransferCoefficient: 0.5 };
  const competing = (shift: number, js: number[]): CellDefinition => ({
    ...chlorAlkaliCell(js),
    anode: { kinetics: { model: 'butler-volmer', ...main } },
    currentEfficiency: {
      model: 'competing',
      sideReaction: { kinetics: { model: 'butler-volmer', ...side }, equilibriumPotentialShift: shift },
    },
  });

  it('both reactions share the anode potential and their currents add up to j (kinetics module as the independent check)', () => {
    const r = sweepCell(competing(-0.13, [1000, 3000, 6000]));
    for (const p of r.points) {
      const eta = p.anodeOverpotential;
      const jMain = butlerVolmerCurrentDensity(eta, main, T);
      const jSide = butlerVolmerCurrentDensity(eta + 0.13, side, T);
      expectClose(jMain + jSide, p.currentDensity, { rtol: 1e-10 }, `Σj at ${p.currentDensity}`);
      expectClose(p.currentEfficiency.sideReactionCurrentDensity!, jSide, { rtol: 1e-9 }, 'side current');
      expectClose(p.currentEfficiency.byProduct.Cl2!, jMain / p.currentDensity, { rtol: 1e-9 }, 'CE Cl2');
      expectClose(p.currentEfficiency.byProduct.NaOH!, 1, { rtol: 0 }, 'NaOH not affected by anode side reactions');
      // O2 in Cl2 by mole balance: (j_side/4F)/(j_side/4F + j_main/2F).
      const o2 = jSide / 4 / (jSide / 4 + jMain / 2);
      expectClose(p.currentEfficiency.oxygenInChlorinePercent!, 100 * o2, { rtol: 1e-9 }, 'O2 in Cl2');
      // Plausibility: the side reaction takes a few per cent at most (check-values §9a: up to ≈ 5 %,
      // Karlsson & Cornell 2016).
      expect(p.currentEfficiency.byProduct.Cl2!).toBeGreaterThan(0.9);
      expect(p.currentEfficiency.byProduct.Cl2!).toBeLessThan(1);
    }
  });

  it('a thermodynamically easier side reaction takes more current', () => {
    const easy = sweepCell(competing(-0.2, [3000])).points[0].currentEfficiency.byProduct.Cl2!;
    const hard = sweepCell(competing(-0.05, [3000])).points[0].currentEfficiency.byProduct.Cl2!;
    expect(easy).toBeLessThan(hard);
  });

  it('a side reaction that would carry all the current is a PhysicsError naming the side reaction', () => {
    const def = competing(-0.13, [10]);
    (def.currentEfficiency as { sideReaction: { kinetics: { exchangeCurrentDensity: number } } }).sideReaction.kinetics.exchangeCurrentDensity = 1e6;
    expect(() => sweepCell(def)).toThrow(/currentEfficiency\.sideReaction/);
  });
});
