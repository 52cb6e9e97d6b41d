/**
 * The example study's cell (fictional "Brackwater Bay" pilot line): a chlor-alkali membrane
 * cell at 88 °C and 1.2 bar(a), depleted brine 3.6 mol/kg NaCl, caustic 11.8 mol/kg NaOH
 * (≈ 32 wt %). Every value is INVENTED for demonstration, chosen inside the orientation ranges
 * of ../shared/reference/check-values.md §9a (modern zero-gap cells ≈ 2.9–3.2 V at 5–6 kA/m²,
 * K ≈ 0.08–0.12 V per kA/m²; "from memory, low confidence" there). With these numbers the
 * cell model gives ≈ 2.9–3.0 V at the 5.5 kA/m² design point and K ≈ 0.09 V per kA/m².
 *
 *  - Anode: coating A, Tafel parameters from a Tafel fit (automatic window, known R_u
 *    subtracted) of the example's 88 °C dataset "anode-a-88c", made here with the kinetics
 *    core when the example is generated, with that fit's standard errors and ln j0–α
 *    correlation (rounded to 4 significant digits); Ea = the value the synthetic data were
 *    generated with (35 kJ/mol).
 *  - Cathode: cathode C (activated Ni), likewise from "cathode-c-88c"; Ea 30 kJ/mol.
 *  - Membrane 0.55 Ω·cm² at 88 °C with an apparent activation energy of 15 kJ/mol (invented).
 *  - Gaps: a 0.3 mm anolyte film (brine, conductivity from the NaCl correlation at the cell
 *    temperature) with 35 % gas voids, and a 1 mm catholyte gap with an invented "measured"
 *    conductivity of 950 mS/cm and 15 % voids (Bruggeman).
 *  - Hardware 0.05 Ω·cm²; current efficiency 1 − j_p/j with j_p = 200 A/m² (≈ 96.4 % at the
 *    design point); rectifier and transformer 97 %.
 *  - Sweep 0.5–7 kA/m² in 14 points; 95 % band from 2000 Monte Carlo draws, seed 42.
 * All numbers SI (the study-file convention).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fitKinetics } from '../server/core/kinetics/index.js';
import { SCENARIOS_DIR } from '../server/paths.js';
import { celsiusToKelvin, toSI } from '../server/core/units.js';
import type { Dataset } from '../server/scenario/schema.js';

/** Round to 4 significant digits (the example file shows what an engineer would type). */
function sig4(x: number): number {
  return Number(x.toPrecision(4));
}

/**
 * Tafel kinetics of one example dataset: η from the dataset's potentials (electrode potential
 * minus the equilibrium potential on the same reference, or η as given), fitted with the
 * automatic window and its known R_u subtracted.
 */
function fittedTafel(datasets: Dataset[], id: string, activationEnergy: number): Record<string, unknown> {
  const d = datasets.find((x) => x.id === id);
  if (!d) throw new Error(`example dataset ${id} missing`);
  const points = d.points.map((p) => ({
    currentDensity: p.currentDensity,
    overpotential: d.potentialKind === 'electrode' ? p.potential - (d.equilibriumPotential ?? 0) : p.potential,
  }));
  const fit = fitKinetics({ points, model: 'tafel', temperature: d.temperature, electrons: d.electrons, window: 'auto', uncompensatedResistance: d.uncompensatedResistance });
  const u = fit.workingBranchUncertainty;
  if (!fit.converged || !u) throw new Error(`example fit of ${id} did not give a determined (ln j0, α) pair`);
  return {
    model: 'tafel',
    exchangeCurrentDensity: sig4(Math.exp(u.lnExchangeCurrentDensity)),
    transferCoefficient: sig4(u.transferCoefficient),
    referenceTemperature: d.temperature,
    activationEnergy,
    uncertainty: {
      lnExchangeCurrentDensitySE: sig4(u.lnExchangeCurrentDensitySE),
      transferCoefficientSE: sig4(u.transferCoefficientSE),
      correlation: sig4(u.correlation),
    },
  };
}

const T_CELL = celsiusToKelvin(88);

/** 14 current densities 0.5, 1.0, …, 7.0 kA/m² in A/m². */
function sweep(): number[] {
  const out: number[] = [];
  for (let k = 1; k <= 14; k++) out.push(toSI(0.5 * k, 'currentDensity', 'kA/m2'));
  return out;
}

/** The datasets of the shipped example file (used when no freshly generated ones are passed). */
function shippedDatasets(): Dataset[] {
  const text = readFileSync(path.join(SCENARIOS_DIR, 'brackwater-pilot.study.json'), 'utf8');
  return (JSON.parse(text) as { datasets: Dataset[] }).datasets;
}

/** The example study's cell definition, as the study's `cell` section. */
export function exampleCell(datasets: Dataset[] = shippedDatasets()): { cell: Record<string, unknown> } {
  return {
    cell: {
      chemistry: 'chlor-alkali',
      temperature: T_CELL,
      pressure: toSI(1.2, 'pressure', 'bar'),
      composition: { brineNaCl: 3.6, causticNaOH: 11.8 },
      anode: { kinetics: fittedTafel(datasets, 'anode-a-88c', 35e3) },
      cathode: { kinetics: fittedTafel(datasets, 'cathode-c-88c', 30e3) },
      ohmic: {
        membrane: { areaResistance: toSI(0.55, 'areaResistance', 'ohm*cm2'), referenceTemperature: T_CELL, activationEnergy: 15e3 },
        gaps: [
          { thickness: toSI(0.3, 'length', 'mm'), electrolyte: 'NaCl', voidFraction: 0.35, voidModel: 'bruggeman' },
          { thickness: toSI(1, 'length', 'mm'), conductivity: toSI(950, 'conductivity', 'mS/cm'), voidFraction: 0.15, voidModel: 'bruggeman' },
        ],
        hardware: toSI(0.05, 'areaResistance', 'ohm*cm2'),
      },
      currentEfficiency: { model: 'parasitic', currentDensity: 200 },
      currentDensities: sweep(),
      designCurrentDensity: toSI(5.5, 'currentDensity', 'kA/m2'),
      rectifierEfficiency: 0.97,
      uncertainty: { samples: 2000, seed: 42 },
      provenance: {
        anode: {
          kind: 'manual',
          note: 'Coating A: from a Tafel fit of dataset "Anode coating A, 88 °C" (automatic window, R_u subtracted); Ea from the synthetic data (fictional)',
        },
        cathode: {
          kind: 'manual',
          note: 'Cathode C: from a Tafel fit of dataset "Cathode C (activated Ni), 88 °C" (automatic window, R_u subtracted); Ea from the synthetic data (fictional)',
        },
      },
    },
  };
}
