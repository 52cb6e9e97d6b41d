/**
 * Generates the shipped example study `scenarios/brackwater-pilot.study.json`.
 *
 * Everything here is INVENTED for demonstration: the "Brackwater Bay" pilot line, its
 * coatings and all their parameters are fictional. Parameters are chosen inside the
 * orientation ranges of the domain notes (chlorine evolution on mixed-metal-oxide anodes
 * ~30–45 mV/decade; activated nickel cathodes ~40–70 mV/decade; plain nickel ~120 mV/decade;
 * all "from memory" orientation values, see ../shared/reference/check-values.md §9d).
 * Data = Butler–Volmer overpotential + uncompensated-resistance drop + Gaussian noise
 * (seeded), so the file is reproducible: `npx tsx scripts/make-example-study.ts`.
 *
 * Tool versions: tsx 4.23, @stdlib/random-base-normal 0.2.2, seed below.
 */
import { writeFileSync } from 'node:fs';
import path from 'node:path';
import normalFactory from '@stdlib/random-base-normal';
import { butlerVolmerOverpotential, exchangeCurrentAtTemperature, transferCoefficientFromTafelSlope, type ButlerVolmerParams } from '../server/core/kinetics/models.js';
import { celsiusToKelvin } from '../server/core/units.js';
import { datasetSchema, studySchema } from '../server/scenario/schema.js';
import { SCENARIOS_DIR } from '../server/paths.js';
import { buildExampleSections } from './example-sections.js';

const SEED = Number(process.env.EXAMPLE_SEED ?? 17);
const rnorm = normalFactory.factory({ seed: SEED });


interface Truth {
  id: string;
  name: string;
  electrode: 'anode' | 'cathode';
  coating: string;
  /** Tafel slope of the main branch at the measurement temperature, V/decade. */
  slope: number;
  /** Exchange current density at 88 °C, A/m². */
  j0At88C: number;
  /** Activation energy of j0, J/mol. */
  activationEnergy: number;
  /** Limiting current density magnitude of the main branch, A/m² (optional). */
  limiting?: number;
  electrons: number;
}

const T_REF = celsiusToKelvin(88);
const TRUTHS: Truth[] = [
  { id: 'anode-a', name: 'Anode coating A', electrode: 'anode', coating: 'Coating A: Ru–Ir–Ti mixed oxide on Ti (fictional "Saltmarsh RX-3")', slope: 0.036, j0At88C: 12, activationEnergy: 35e3, electrons: 2 },
  { id: 'anode-b', name: 'Anode coating B', electrode: 'anode', coating: 'Coating B: Ru–Ti mixed oxide on Ti (fictional "Gullrock T2")', slope: 0.044, j0At88C: 8, activationEnergy: 40e3, limiting: 40e3, electrons: 2 },
  { id: 'cathode-c', name: 'Cathode C (activated Ni)', electrode: 'cathode', coating: 'Cathode C: activated nickel, Ni–S type (fictional "Tidewell N5")', slope: 0.055, j0At88C: 10, activationEnergy: 30e3, electrons: 2 },
  { id: 'cathode-d', name: 'Cathode D (plain Ni)', electrode: 'cathode', coating: 'Cathode D: plain nickel mesh, uncoated reference', slope: 0.12, j0At88C: 3, activationEnergy: 25e3, electrons: 2 },
];

/** Uncompensated resistance of the fictional test cell, Ω·m² (0.08 Ω·cm²). */
const R_U = 0.08e-4;
/** Measurement noise, V (1σ). */
const NOISE = 0.0015;
/** Equilibrium potentials vs Ag/AgCl (sat. KCl) of the fictional test cell, V: anode (Cl2/Cl−) and cathode (H2O/H2 in caustic). */
const E_EQ_ANODE_VS_AGCL = 1.12;

function currentDensities(): number[] {
  const out: number[] = [];
  const n = 28;
  for (let i = 0; i < n; i++) out.push(10 * Math.pow(10, (i * Math.log10(15000 / 10)) / (n - 1)));
  return out;
}

function dataset(t: Truth, celsius: number) {
  const T = celsiusToKelvin(celsius);
  const alphaMain = transferCoefficientFromTafelSlope(t.slope * (T / T_REF), T); // slope ∝ T at fixed α
  const j0 = exchangeCurrentAtTemperature(t.j0At88C, T_REF, t.activationEnergy, T);
  const p: ButlerVolmerParams = t.electrode === 'anode'
    ? { exchangeCurrentDensity: j0, anodicTransferCoefficient: alphaMain, cathodicTransferCoefficient: 2 - alphaMain > 0.1 ? 2 - alphaMain : 0.5, anodicLimitingCurrentDensity: t.limiting }
    : { exchangeCurrentDensity: j0, cathodicTransferCoefficient: alphaMain, anodicTransferCoefficient: 2 - alphaMain > 0.1 ? 2 - alphaMain : 0.5, cathodicLimitingCurrentDensity: t.limiting };
  const sign = t.electrode === 'anode' ? 1 : -1;
  const points = currentDensities().map((mag) => {
    const j = sign * mag;
    const eta = butlerVolmerOverpotential(j, p, T);
    const measured = eta + j * R_U + NOISE * rnorm(0, 1);
    const potential = t.electrode === 'anode' ? E_EQ_ANODE_VS_AGCL + measured : measured;
    return { currentDensity: round(j, 6), potential: round(potential, 5) };
  });
  const common = {
    id: `${t.id}-${celsius}c`,
    name: `${t.name}, ${celsius} °C`,
    electrode: t.electrode,
    coating: t.coating,
    temperature: T,
    electrons: t.electrons,
    uncompensatedResistance: R_U,
    points,
  };
  if (t.electrode === 'anode') {
    return {
      ...common,
      potentialKind: 'electrode' as const,
      reference: 'AgAgCl-satKCl' as const,
      equilibriumPotential: E_EQ_ANODE_VS_AGCL,
      notes: `Synthetic. Electrode potential vs Ag/AgCl (sat. KCl) including an uncompensated drop j·R_u, R_u = 0.08 Ω·cm². Generated from Butler–Volmer with slope ${(t.slope * 1000).toFixed(0)} mV/decade at 88 °C, j0(88 °C) = ${t.j0At88C} A/m², Ea = ${t.activationEnergy / 1000} kJ/mol${t.limiting ? `, anodic limiting current ${t.limiting / 1000} kA/m²` : ''}; noise 1.5 mV (1σ), seed ${SEED}.`,
    };
  }
  return {
    ...common,
    potentialKind: 'overpotential' as const,
    notes: `Synthetic. Overpotential vs the reversible hydrogen electrode in the same catholyte, not iR-corrected (R_u = 0.08 Ω·cm²). Generated from Butler–Volmer with slope ${(t.slope * 1000).toFixed(0)} mV/decade at 88 °C, j0(88 °C) = ${t.j0At88C} A/m², Ea = ${t.activationEnergy / 1000} kJ/mol; noise 1.5 mV (1σ), seed ${SEED}.`,
  };
}

function round(x: number, sig: number): number {
  return Number(x.toPrecision(sig));
}

const datasets = TRUTHS.flatMap((t) => [dataset(t, 70), dataset(t, 88)]);

const study = studySchema.parse({
  format: 'electrolysis-study',
  version: 1,
  name: 'Brackwater Bay pilot line (fictional)',
  synthetic: true,
  description:
    'A fictional chlor-alkali membrane-cell pilot line, "Brackwater Bay", used to show the whole workflow: two candidate anode coatings and two cathodes, each measured at 70 °C and 88 °C on a small test cell.\n\n' +
    'All data in this study are synthetic: generated by scripts/make-example-study.ts from stated Butler–Volmer parameters with an uncompensated-resistance drop and seeded Gaussian noise. They describe no real plant, coating or supplier.',
  chemistry: 'chlor-alkali',
  operating: {
    temperature: celsiusToKelvin(88),
    pressure: 1.2e5,
    composition: { brineNaCl: 3.6, causticNaOH: 11.8 },
  },
  datasets,
  fits: [],
  ...buildExampleSections(datasetSchema.array().parse(datasets)),
});

const file = path.join(SCENARIOS_DIR, 'brackwater-pilot.study.json');
writeFileSync(file, JSON.stringify(study, null, 2) + '\n');
console.log(`wrote ${file}: ${datasets.length} datasets`);
