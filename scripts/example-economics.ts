/**
 * The example study's coating comparison (`coatings`) and cost study (`costs`) sections.
 *
 * ALL FIGURES ARE INVENTED for demonstration: prices, hours, rates, lives, coating prices and
 * voltage rises describe no real plant, supplier or market. They are chosen to look plausible
 * for a chlor-alkali membrane-cell line (electricity 60 per MWh, 8000 h/yr, installed cost
 * 9000 per m² of active area, 8 %/yr over 10 years; coatings priced per m² with rises of a
 * few mV per year). The K-factor line of the cost study (U0 2.35 V, K 0.10 V per kA/m²,
 * CE 96 %) lies in the orientation ranges of check-values.md §9a (from memory, low confidence).
 *
 * The coating options are electrode swaps on the study's cell definition (scripts/example-cell.ts),
 * each electrode taken from the study's 88 °C polarization datasets and fitted on the fly by the
 * Coatings page; the line makes 300 t/day of chlorine at 5.5 kA/m² (as the plant section).
 * Shapes: server/scenario/economics-sections.ts (SI; money per kWh and per m²).
 */
import { toSI } from '../server/core/units.js';

/** Invented money inputs shared by both sections. */
const ELECTRICITY_PER_KWH = 0.06; // 60 per MWh
const OPERATING_HOURS = 8000; // h/yr
const DISCOUNT_RATE = 0.08; // 8 %/yr

/** Design current density of the fictional line, A/m² (5.5 kA/m², as its cell and plant sections). */
const DESIGN_CURRENT_DENSITY = toSI(5.5, 'currentDensity', 'kA/m2');
/** Chlorine production of the fictional line, kg/s (300 t/day, as its plant section). */
const PRODUCTION_RATE = toSI(300, 'massRate', 't/day');

/** Linear grid lo..hi with n points, A/m² (rounded to 0.1 A/m² for a tidy file). */
function grid(lo: number, hi: number, n: number): number[] {
  return Array.from({ length: n }, (_, k) => Math.round((lo + ((hi - lo) * k) / (n - 1)) * 10) / 10);
}

interface InventedCoating {
  label: string;
  /** Study dataset measured at 88 °C (the cell temperature). */
  dataset: string;
  /** Installed price per m² of active area (invented). */
  price: number;
  /** Cell-voltage rise it causes, V/yr (invented). */
  rise: number;
}

const ANODES: InventedCoating[] = [
  { label: 'Anode B', dataset: 'anode-b-88c', price: 1100, rise: 0.008 },
  { label: 'Anode A', dataset: 'anode-a-88c', price: 1500, rise: 0.004 },
];
const CATHODES: InventedCoating[] = [
  { label: 'plain Ni D', dataset: 'cathode-d-88c', price: 150, rise: 0.001 },
  { label: 'activated Ni C', dataset: 'cathode-c-88c', price: 700, rise: 0.006 },
];
/** Coating life of every option, years (invented; equal lives keep the comparison plain). */
const COATING_LIFE = 8;

/** Every anode × cathode pair as electrode swaps on the study's cell; the first is the baseline. */
function coatingOptions(): Record<string, unknown>[] {
  const out: Record<string, unknown>[] = [];
  for (const a of ANODES) {
    for (const c of CATHODES) {
      out.push({
        name: `${a.label} + ${c.label}`,
        anode: { dataset: a.dataset },
        cathode: { dataset: c.dataset },
        pricePerArea: a.price + c.price,
        voltageRisePerYear: Math.round((a.rise + c.rise) * 1e6) / 1e6,
        lifeYears: COATING_LIFE,
      });
    }
  }
  return out;
}

export function exampleEconomicsSections(): Record<string, unknown> {
  return {
    coatings: {
      product: 'Cl2',
      currentDensity: DESIGN_CURRENT_DENSITY,
      plant: { productionRate: PRODUCTION_RATE },
      electricityPrice: ELECTRICITY_PER_KWH,
      operatingHours: OPERATING_HOURS,
      discountRate: DISCOUNT_RATE,
      baseline: 0,
      options: coatingOptions(),
    },
    costs: {
      product: 'Cl2',
      cell: { linear: { intercept: 2.35, slope: 1.0e-4 } },
      currentEfficiency: 0.96,
      electricityPrice: ELECTRICITY_PER_KWH,
      capitalCostPerArea: 9000,
      operatingHours: OPERATING_HOURS,
      discountRate: DISCOUNT_RATE,
      lifetime: 10,
      currentDensities: grid(1500, 8000, 36),
      designCurrentDensity: DESIGN_CURRENT_DENSITY,
      sensitivityFraction: 0.2,
    },
  };
}
