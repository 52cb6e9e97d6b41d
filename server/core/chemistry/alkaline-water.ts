/**
 * Alkaline water electrolysis in aqueous KOH.
 *
 *   Overall  H₂O(l) → H₂(g) + ½ O₂(g),  n = 2
 *   Anode    2 OH⁻ → ½ O₂ + H₂O + 2 e⁻
 *   Cathode  2 H₂O + 2 e⁻ → H₂ + 2 OH⁻
 *
 * KOH is not consumed; it enters only through the water activity a_w (Nernst term and the
 * water vapour pressure over the electrolyte, p_w = a_w·p_sat). a_w from the Pitzer model
 * with the 25 °C parameters of Pitzer & Mayorga (1973) — no temperature derivatives are
 * available for KOH here, and the fit reaches ≈ 5.5 mol/kg (from memory, low confidence), so
 * typical 25–30 wt % KOH (check-values §9b, from memory; ≈ 5.9–7.6 mol/kg, derived) at
 * 70–90 °C (IRENA 2020, source seen) is an extrapolation and is reported as such. The effect
 * on E_rev is modest: (RT/2F)·ln(1/a_w) is ≈ 6.6–7.8 mV for a_w 0.65–0.6 at 80 °C (derived;
 * that a_w range is an indicative reading of the extrapolated Pitzer model, not a measured value).
 * Validity: 0–150 °C (water thermodynamics: liquid-water Shomate fit to 500 K, Wagner–Pruss
 * vapour pressure; the 150 °C cap is our choice); composition.koh ≥ 0 mol/kg required.
 */
import { pitzerActivity } from '../thermo/activity.js';
import { molalityToMassFraction } from '../thermo/concentration.js';
import { HYDROGEN, OXYGEN, WATER_ELECTRONS, validateConditions, waterSplittingReversible } from './common.js';
import type { Chemistry, OperatingConditions, ReversibleResult } from './types.js';

/** 0–150 °C: see the module doc (water thermodynamics). */
const RANGE: [number, number] = [273.15, 423.15];

export const ALKALINE_WATER: Chemistry = {
  id: 'alkaline-water',
  name: 'Alkaline water electrolysis (KOH)',
  electrons: WATER_ELECTRONS,
  overallReaction: 'H₂O(l) → H₂(g) + ½ O₂(g)',
  anodeReaction: '2 OH⁻ → ½ O₂ + H₂O + 2 e⁻',
  cathodeReaction: '2 H₂O + 2 e⁻ → H₂ + 2 OH⁻',
  products: [HYDROGEN, OXYGEN],
  mainProduct: 'H2',
  requiredComposition: ['koh'],
  temperatureRange: RANGE,
  reversible(c: OperatingConditions): ReversibleResult {
    validateConditions(c, RANGE, ['koh'], 'alkaline water electrolysis');
    const m = c.composition.koh as number;
    const act = pitzerActivity('KOH', m, c.temperature);
    return waterSplittingReversible(c, act.waterActivity, act.warnings, {
      kohMolality: m,
      kohMassFraction: molalityToMassFraction('KOH', m),
      kohMeanActivityCoefficient: act.meanActivityCoefficient,
      kohOsmoticCoefficient: act.osmoticCoefficient,
    });
  },
};
