import { describe, expect, it } from 'vitest';
import { InputError, PhysicsError } from '../../server/core/errors.js';
import { butlerVolmerCurrentDensity } from '../../server/core/kinetics/models.js';
import { prepareCell, voltageBalance } from '../../server/core/cell/balance.js';
import { sweepCell } from '../../server/core/cell/sweep.js';
import type { CellDefinition, SweepPoint } from '../../server/core/cell/types.js';
import { expectClose } from '../helpers/close.js';
import { alkalineCell, allFinite, chlorAlkaliCell, idealElectrode, linearCell, linspace } from './cells.js';

function expectBreakdownSums(p: SweepPoint, label: string): void {
  const b = p.breakdown;
  const gapSum = b.gaps.reduce((a, v) => a + v, 0);
  // Identity: the parts add up to the total (rounding only).
  expectClose(b.ohmicDrop, b.membrane + gapSum + b.hardware, { rtol: 1e-14, atol: 1e-15 }, `${label} ohmic`);
  expectClose(b.massTransport, b.massTransportAnode + b.massTransportCathode, { rtol: 1e-14, atol: 1e-16 }, `${label} mt`);
  expectClose(b.total, b.reversible + b.anode + b.cathode + b.massTransport + b.ohmicDrop, { rtol: 1e-14 }, `${label} total`);
  expectClose(p.cellVoltage, b.total, { rtol: 0 }, `${label} cellVoltage`);
  expectClose(p.anodeOverpotential, b.anode, { rtol: 0 }, `${label} anode`);
  expectClose(p.cathodeOverpotential, b.cathode, { rtol: 0 }, `${label} cathode`);
  expectClose(p.ohmicDrop, b.ohmicDrop, { rtol: 0 }, `${label} ohmicDrop`);
  expect(b.anode).toBeGreaterThanOrEqual(0);
  expect(b.cathode).toBeGreaterThanOrEqual(0);
  expect(b.massTransport).toBeGreaterThanOrEqual(0);
}

describe('voltage breakdown (identity: parts sum to the total)', () => {
  it('chlor-alkali cell with membrane, gap and hardware', () => {
    const r = sweepCell(chlorAlkaliCell(linspace(500, 7000, 14)));
    r.points.forEach((p, i) => expectBreakdownSums(p, `point ${i}`));
    expect(allFinite(r)).toBe(true);
  });

  it('alkaline cell with Butler–Volmer electrodes, limiting currents, two gaps and an Arrhenius membrane', () => {
    const r = sweepCell(alkalineCell(linspace(100, 50_000, 25)));
    r.points.forEach((p, i) => expectBreakdownSums(p, `point ${i}`));
    expect(r.points.at(-1)!.breakdown.massTransport).toBeGreaterThan(0);
    expect(r.points.at(-1)!.breakdown.gaps).toHaveLength(2);
  });

  it('chlor-alkali cell with a competing anode reaction', () => {
    const def: CellDefinition = {
      ...chlorAlkaliCell(linspace(500, 7000, 8)),
      anode: { kinetics: { model: 'butler-volmer', exchangeCurrentDensity: 100, anodicTransferCoefficient: 2, cathodicTransferCoefficient: 0.5 } },
      currentEfficiency: {
        model: 'competing',
        sideReaction: { kinetics: { model: 'tafel', exchangeCurrentDensity: 1e-3, transferCoefficient: 0.9 }, equilibriumPotentialShift: -0.13 },
      },
    };
    sweepCell(def).points.forEach((p, i) => expectBreakdownSums(p, `point ${i}`));
  });
});

describe('electrode kinetics in the balance', () => {
  /** PEM cell at T with ideal cathode, no resistances, and the given anode. */
  function anodeOnly(anode: CellDefinition['anode'], temperature: number, js: number[]): CellDefinition {
    return {
      chemistry: 'pem-water',
      temperature,
      pressure: 1e5,
      reversiblePotential: 1.2,
      anode,
      cathode: idealElectrode(),
      ohmic: {},
      currentDensities: js,
    };
  }

  it('Tafel slope per decade: 59.159 mV at 25 °C for α = 1 (check-values §1, derived from CODATA 2018 R, F)', () => {
    const r = sweepCell(anodeOnly({ kinetics: { model: 'tafel', exchangeCurrentDensity: 1e-3, transferCoefficient: 1 } }, 298.15, [10, 100, 1000]));
    const [a, b, c] = r.points.map((p) => p.cellVoltage);
    expectClose(b - a, 0.059159, { rtol: 2e-5 }, 'decade 1');
    expectClose(c - b, 0.059159, { rtol: 2e-5 }, 'decade 2');
  });

  it('Tafel slope per decade: 144.1 mV at 90 °C for α = 0.5 (check-values §9d table)', () => {
    const r = sweepCell(anodeOnly({ kinetics: { model: 'tafel', exchangeCurrentDensity: 1e-3, transferCoefficient: 0.5 } }, 363.15, [100, 1000]));
    expectClose(r.points[1].cellVoltage - r.points[0].cellVoltage, 0.1441, { rtol: 5e-4 }, 'slope');
  });

  it('Butler–Volmer tends to the Tafel line at high current density (identity/limit)', () => {
    const j0 = 1;
    // j/j0 = 1e2 … 1e5; at 1e5 the back reaction exp(−(α_a+α_c) f η) is ≈ 1e-6 of the forward one,
    // shifting η by ≈ 1e-6/(α_a f) ≈ 4e-8 V.
    const js = [1e2, 1e3, 1e4, 1e5];
    const bv = sweepCell(anodeOnly({ kinetics: { model: 'butler-volmer', exchangeCurrentDensity: j0, anodicTransferCoefficient: 0.8, cathodicTransferCoefficient: 0.4 } }, 353.15, js));
    const tf = sweepCell(anodeOnly({ kinetics: { model: 'tafel', exchangeCurrentDensity: j0, transferCoefficient: 0.8 } }, 353.15, js));
    const gaps = js.map((_, i) => bv.points[i].cellVoltage - tf.points[i].cellVoltage);
    // BV carries the back reaction, so it needs slightly more overpotential; the gap shrinks with j.
    for (let i = 0; i < js.length; i++) expect(gaps[i]).toBeGreaterThan(0);
    for (let i = 1; i < js.length; i++) expect(gaps[i]).toBeLessThan(gaps[i - 1]);
    expectClose(bv.points[3].cellVoltage, tf.points[3].cellVoltage, { atol: 1e-7 }, 'j/j0 = 1e5');
    // The same for the cathode (cathodic branch, α_c).
    const cathodeBV: CellDefinition = {
      ...anodeOnly(idealElectrode(), 353.15, js),
      cathode: { kinetics: { model: 'butler-volmer', exchangeCurrentDensity: j0, anodicTransferCoefficient: 0.3, cathodicTransferCoefficient: 0.7 } },
    };
    const cathodeTafel: CellDefinition = { ...cathodeBV, cathode: { kinetics: { model: 'tafel', exchangeCurrentDensity: j0, transferCoefficient: 0.7 } } };
    const cb = sweepCell(cathodeBV);
    const ct = sweepCell(cathodeTafel);
    expectClose(cb.points[3].cathodeOverpotential, ct.points[3].cathodeOverpotential, { atol: 1e-7 }, 'cathode j/j0 = 1e5');
  });

  it('the cathode overpotential is the magnitude of the kinetics module’s cathodic root (independent function)', () => {
    const kin = { exchangeCurrentDensity: 2, anodicTransferCoefficient: 0.5, cathodicTransferCoefficient: 0.6 };
    const def: CellDefinition = { ...anodeOnly(idealElectrode(), 333.15, [50, 500, 5000]), cathode: { kinetics: { model: 'butler-volmer', ...kin } } };
    for (const p of sweepCell(def).points) {
      // Forward check: the kinetics module's j(η) at η = −|η_c| returns −j.
      const j = butlerVolmerCurrentDensity(-p.cathodeOverpotential, kin, 333.15);
      expectClose(j, -p.currentDensity, { rtol: 1e-10 }, `j = ${p.currentDensity}`);
    }
  });

  it('Tafel below its exchange current density gives |η| = 0 and a warning, never a negative overpotential', () => {
    const r = sweepCell(anodeOnly({ kinetics: { model: 'tafel', exchangeCurrentDensity: 100, transferCoefficient: 1 } }, 353.15, [50, 500, 5000]));
    expectClose(r.points[0].anodeOverpotential, 0, { atol: 0 }, 'clamped');
    expect(r.points[1].anodeOverpotential).toBeGreaterThan(0);
    expect(r.warnings.some((w) => w.startsWith('anode: the Tafel line was used at or below its exchange current density'))).toBe(true);
    expect(r.warnings.some((w) => w.startsWith('anode: the Tafel line was used within one decade'))).toBe(true);
  });

  it('moves j0 to the cell temperature with the activation energy (Arrhenius)', () => {
    // 50 kJ/mol from 25 °C to 80 °C: factor exp[(E_a/R)(1/298.15 − 1/353.15)] = 23.13309652961099
    // (independent computation: Python 3 math.exp with R = k·N_A = 8.31446261815324 J/(mol·K), SI 2019 exact).
    const def = anodeOnly(
      { kinetics: { model: 'tafel', exchangeCurrentDensity: 1e-3, transferCoefficient: 1, referenceTemperature: 298.15, activationEnergy: 50e3 } },
      353.15,
      [1000],
    );
    expectClose(sweepCell(def).exchangeCurrentDensities.anode, 1e-3 * 23.13309652961099, { rtol: 1e-12 }, 'j0(80 °C)');
  });

  it('warns when j0 is given at another temperature without an activation energy', () => {
    const def = anodeOnly({ kinetics: { model: 'tafel', exchangeCurrentDensity: 1e-3, transferCoefficient: 1, referenceTemperature: 298.15 } }, 353.15, [1000]);
    const r = sweepCell(def);
    expectClose(r.exchangeCurrentDensities.anode, 1e-3, { rtol: 0 }, 'unchanged');
    expect(r.warnings.some((w) => w.includes('anode.kinetics') && w.includes('no activation energy'))).toBe(true);
  });
});

describe('mass transport', () => {
  it('η_mt = (RT/(nF))·ln 2 at j = j_lim/2: 8.9044 mV for n = 2 at 25 °C (RT/F = 25.6926 mV, check-values §1)', () => {
    const def: CellDefinition = {
      ...linearCell('pem-water', 1.2, 0, [500]),
      temperature: 298.15,
      anode: { ...idealElectrode(), limitingCurrentDensity: 1000 },
      cathode: { ...idealElectrode(), limitingCurrentDensity: 1000 },
    };
    const b = sweepCell(def).points[0].breakdown;
    // RT/(2F)·ln 2 = 0.0256926/2 × 0.693147 = 8.9044 mV.
    expectClose(b.massTransportAnode, 0.0089044, { rtol: 2e-5 }, 'anode');
    expectClose(b.massTransportCathode, 0.0089044, { rtol: 2e-5 }, 'cathode');
    // electrons = 1 doubles it.
    const one = sweepCell({ ...def, anode: { ...def.anode, electrons: 1 } }).points[0].breakdown;
    expectClose(one.massTransportAnode, 2 * 0.0089044, { rtol: 2e-5 }, 'n = 1');
  });

  it('j at or above a limiting current is a PhysicsError naming the point and the limit, never NaN', () => {
    const def: CellDefinition = { ...alkalineCell(linspace(1e4, 8e4, 8)) }; // cathode limit 6e4 → index 5 is exactly 6e4
    let caught: unknown;
    try {
      sweepCell(def);
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(PhysicsError);
    const e = caught as PhysicsError;
    expect(e.issues[0].path).toBe('currentDensities[5]');
    expect(e.message).toContain('cathode.limitingCurrentDensity');

    expect(() => sweepCell({ ...alkalineCell([1000]), designCurrentDensity: 9e4 })).toThrow(/designCurrentDensity/);
    const cell = prepareCell(alkalineCell([1000]));
    expect(() => voltageBalance(cell, 8e4, 'j')).toThrow(PhysicsError);
    expect(() => voltageBalance(cell, 1e6, 'j')).toThrow(PhysicsError);
  });
});

describe('ohmic terms', () => {
  it('Springer membrane: 0.0638 Ω·cm² for 127 µm at λ = 22 and 80 °C (check-values §6, derived)', () => {
    const def: CellDefinition = { ...linearCell('pem-water', 1.2, 0, [1e4]), ohmic: { membrane: { springer: { thickness: 127e-6, waterContent: 22 } } } };
    const r = sweepCell(def);
    expectClose(r.resistances.membrane, 0.0638e-4, { rtol: 1e-3 }, 'ASR');
    expectClose(r.points[0].breakdown.membrane, 1e4 * 0.0638e-4, { rtol: 1e-3 }, 'j·R');
    expect(r.warnings.some((w) => w.includes('springer'))).toBe(false); // PEM: within the model's basis
  });

  it('membrane area resistance with an Arrhenius activation energy', () => {
    // 1 Ω·cm² at 25 °C, E_a = 20 kJ/mol, at 80 °C: 1e-4·exp[(E_a/R)(1/353.15 − 1/298.15)] = 2.8464692199855754e-5 Ω·m²
    // (independent computation: Python 3 math.exp, R = k·N_A = 8.31446261815324 J/(mol·K)).
    const def: CellDefinition = {
      ...linearCell('pem-water', 1.2, 0, [1e4]),
      ohmic: { membrane: { areaResistance: 1e-4, referenceTemperature: 298.15, activationEnergy: 20e3 } },
    };
    expectClose(sweepCell(def).resistances.membrane, 2.8464692199855754e-5, { rtol: 1e-12 }, 'ASR(80 °C)');
  });

  it('gap with bubbles: Bruggeman 0.58566 and Maxwell 0.60870 at ε = 0.3 (check-values §7)', () => {
    const base = linearCell('pem-water', 1.2, 0, [1e4]);
    const brug = sweepCell({ ...base, ohmic: { gaps: [{ thickness: 2e-3, conductivity: 50, voidFraction: 0.3 }] } });
    expectClose(brug.resistances.gaps[0], 2e-3 / (50 * 0.58566), { rtol: 1e-5 }, 'Bruggeman');
    const max = sweepCell({ ...base, ohmic: { gaps: [{ thickness: 2e-3, conductivity: 50, voidFraction: 0.3, voidModel: 'maxwell' }] } });
    expectClose(max.resistances.gaps[0], 2e-3 / (50 * 0.6087), { rtol: 1e-5 }, 'Maxwell');
    expect(max.warnings.some((w) => w.includes('Maxwell relation is a dilute-suspension result'))).toBe(true);
  });

  it('KOH gap from the Gilliam correlation: 30 wt % (7.639 mol/kg) at 80 °C ≈ 1.385 S/cm (check-values §4, §5a)', () => {
    // Check-values §5a gives 1.3850 S/cm at 6.851 mol/L (30 wt % at 20 °C); at 80 °C the molarity
    // is a little lower but the correlation is near its maximum there, hence the 1 % tolerance.
    const def: CellDefinition = { ...linearCell('alkaline-water', 1.2, 0, [1e4]), ohmic: { gaps: [{ thickness: 1e-3, electrolyte: 'KOH' }] } };
    const r = sweepCell(def);
    expectClose(1e-3 / r.resistances.gaps[0], 138.5, { rtol: 0.01 }, 'σ KOH');
  });

  it('a gap with an electrolyte but no concentration anywhere is an error naming the field', () => {
    const def: CellDefinition = { ...linearCell('pem-water', 1.2, 0, [1e4]), ohmic: { gaps: [{ thickness: 1e-3, electrolyte: 'NaOH' }] } };
    expect(() => sweepCell(def)).toThrow(/ohmic\.gaps\[0\]\.concentration/);
  });
});

describe('reversible voltage', () => {
  it('uses the override when given and the thermodynamic value otherwise', () => {
    const over = sweepCell(linearCell('chlor-alkali', 2.25, 0, [1000]));
    expect(over.reversiblePotentialSource).toBe('override');
    expectClose(over.reversiblePotential, 2.25, { rtol: 0 }, 'override');
    const thermo = sweepCell(chlorAlkaliCell([1000]));
    expect(thermo.reversiblePotentialSource).toBe('thermodynamics');
    // Plausibility only: E_rev ≈ 2.2 V at ≈ 90 °C (check-values §9a, from memory, low confidence).
    expect(thermo.reversiblePotential).toBeGreaterThan(2.1);
    expect(thermo.reversiblePotential).toBeLessThan(2.4);
  });
});

describe('input validation (front door)', () => {
  function issuesOf(fn: () => unknown): { path: string; message: string }[] {
    try {
      fn();
    } catch (err) {
      expect(err).toBeInstanceOf(InputError);
      return (err as InputError).issues;
    }
    throw new Error('expected an InputError');
  }

  it('names each bad field by its path', () => {
    const bad = chlorAlkaliCell([1000, 2000, 0]) as unknown as Record<string, unknown>;
    (bad.anode as { kinetics: { exchangeCurrentDensity: number } }).kinetics.exchangeCurrentDensity = -1;
    const paths = issuesOf(() => sweepCell(bad as unknown as CellDefinition)).map((i) => i.path);
    expect(paths).toContain('anode.kinetics.exchangeCurrentDensity');
    expect(paths).toContain('currentDensities[2]');
  });

  it('rejects models that do not apply to the chemistry and gaps without a conductivity source', () => {
    const cross = { ...chlorAlkaliCell([1000]), currentEfficiency: { model: 'crossover' as const, hydrogenPermeability: 1e-14, membraneThickness: 1e-4 } };
    expect(issuesOf(() => sweepCell(cross)).map((i) => i.path)).toContain('currentEfficiency.model');
    const gap = { ...linearCell('pem-water', 1.2, 0, [1000]), ohmic: { gaps: [{ thickness: 1e-3 }] } };
    expect(issuesOf(() => sweepCell(gap)).map((i) => i.path)).toContain('ohmic.gaps[0]');
    const nan = { ...linearCell('pem-water', 1.2, 0, [1000]), temperature: Number.NaN };
    expect(issuesOf(() => sweepCell(nan)).map((i) => i.path)).toContain('temperature');
  });
});
