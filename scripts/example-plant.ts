/**
 * The example study's `plant` section: a production target, the cell as plant data, a rectifier,
 * the electrolyte circuits of a bipolar electrolyser for the shunt currents, and the inputs of the
 * safety checks.
 *
 * Everything here is INVENTED for the fictional "Brackwater Bay" line. The values sit inside the
 * orientation ranges of ../shared/reference/check-values.md §9a (current density 4–6 kA/m²,
 * U0 ≈ 2.3–2.4 V, K ≈ 0.08–0.12 V per kA/m², CE 95–97 %: "from memory" figures there) so the
 * example sizes sensibly; the conductivities and duct sizes are plausible orders of magnitude
 * chosen for the demonstration (our choice), not measurements.
 */
import { toSI } from '../server/core/units.js';
import { plantSectionSchema } from '../server/scenario/plant-sections.js';

/** mm → m and mm² → m² for the duct sizes below (exact). */
const mm = (v: number) => toSI(v, 'length', 'mm');
const mm2 = (v: number) => v * 1e-6;
/** Cross-section of a round bore of diameter d [mm], in mm². */
const bore = (dMm: number) => Number(((Math.PI * dMm * dMm) / 4).toFixed(1));

/** Spacing of the elements along the headers (one manifold segment per cell), mm (invented). */
const ELEMENT_PITCH_MM = 60;
/** Hose length from an element to its header, mm (invented). */
const HOSE_MM = 1500;

export function examplePlantSections(): Record<string, unknown> {
  const plant = {
    product: 'Cl2',
    productionRate: toSI(300, 'massRate', 't/day'),
    rateUnit: 't/day',
    currentDensity: toSI(5.5, 'currentDensity', 'kA/m2'),
    cellArea: 2.7,
    cellSource: 'plant-data',
    // U = 2.35 V + 0.10 V per kA/m² · j  →  2.90 V at 5.5 kA/m² (invented plant data).
    linear: { intercept: 2.35, slope: 0.1 / toSI(1, 'currentDensity', 'kA/m2') },
    currentEfficiency: 0.96,
    // Hydrogen at the cathode runs at ≈ 100 % current efficiency (domain primer §7).
    coProductCurrentEfficiency: { H2: 1 },
    rectifier: { maxVoltage: 450, maxCurrent: toSI(16, 'current', 'kA'), efficiency: 0.97 },
    shunt: {
      circuits: [
        {
          name: 'anolyte inlet',
          conductivity: 45, // S/m, depleted brine near 88 °C (invented order of magnitude)
          channel: { length: mm(HOSE_MM), crossSection: mm2(bore(12)) },
          manifoldSegment: { length: mm(ELEMENT_PITCH_MM), crossSection: mm2(bore(80)) },
        },
        {
          name: 'anolyte outlet',
          conductivity: 20, // S/m, brine carrying chlorine bubbles (invented)
          channel: { length: mm(HOSE_MM), crossSection: mm2(bore(20)) },
          manifoldSegment: { length: mm(ELEMENT_PITCH_MM), crossSection: mm2(bore(150)) },
        },
        {
          name: 'catholyte inlet',
          conductivity: 90, // S/m, about 32 wt % caustic near 88 °C (invented order of magnitude)
          channel: { length: mm(HOSE_MM), crossSection: mm2(bore(12)) },
          manifoldSegment: { length: mm(ELEMENT_PITCH_MM), crossSection: mm2(bore(80)) },
        },
        {
          name: 'catholyte outlet',
          conductivity: 45, // S/m, caustic carrying hydrogen bubbles (invented)
          channel: { length: mm(HOSE_MM), crossSection: mm2(bore(20)) },
          manifoldSegment: { length: mm(ELEMENT_PITCH_MM), crossSection: mm2(bore(150)) },
        },
      ],
    },
    safety: {
      hydrogenInAnodeGas: 0.0015, // 0.15 vol % H₂ in the cell chlorine (invented; usual 0.1–0.5 vol %, check-values §10, from memory)
      minimumLoad: 0.3,
      limitingCurrentDensity: toSI(30, 'currentDensity', 'kA/m2'), // as the fictional coating B data set
      boilingPointElevation: 0,
      busbarDistance: 1,
    },
  };
  return { plant: plantSectionSchema.parse(plant) };
}
