/**
 * PEM water electrolysis: pure liquid water fed to a proton-exchange-membrane cell.
 *
 *   Overall  H₂O(l) → H₂(g) + ½ O₂(g),  n = 2
 *   Anode    H₂O → ½ O₂ + 2 H⁺ + 2 e⁻
 *   Cathode  2 H⁺ + 2 e⁻ → H₂
 *
 * Water activity 1 (pure water). Both compartments at one absolute pressure p; each product
 * gas saturated with water vapour (p_gas = p − p_sat(T)). Differential-pressure operation
 * (H₂ side pressurised) is not represented by this contract.
 * Validity: 0–150 °C (liquid-water Shomate fit to 500 K, Wagner–Pruss vapour pressure);
 * the pressure must exceed p_sat(T) (PhysicsError otherwise).
 * Source of data: NBS-82 and NIST WebBook via thermo/species.ts.
 */
import { HYDROGEN, OXYGEN, WATER_ELECTRONS, validateConditions, waterSplittingReversible } from './common.js';
import type { Chemistry, OperatingConditions, ReversibleResult } from './types.js';

/** 0–150 °C: see the module doc (water thermodynamics). */
const RANGE: [number, number] = [273.15, 423.15];

export const PEM_WATER: Chemistry = {
  id: 'pem-water',
  name: 'PEM water electrolysis',
  electrons: WATER_ELECTRONS,
  overallReaction: 'H₂O(l) → H₂(g) + ½ O₂(g)',
  anodeReaction: 'H₂O → ½ O₂ + 2 H⁺ + 2 e⁻',
  cathodeReaction: '2 H⁺ + 2 e⁻ → H₂',
  products: [HYDROGEN, OXYGEN],
  mainProduct: 'H2',
  requiredComposition: [],
  temperatureRange: RANGE,
  reversible(c: OperatingConditions): ReversibleResult {
    validateConditions(c, RANGE, [], 'PEM water electrolysis');
    return waterSplittingReversible(c, 1, []);
  },
};
