/**
 * Hydrogen crossover flux from a measured (or modelled) H₂ content of the anode gas.
 */
import { InputError } from '../errors.js';

/**
 * Crossover flux that gives an anode-gas H₂ mole fraction x, f = g·x/(1 − x) [mol/(m²·s)]: the
 * inverse of x = f/(f + g) (checks.ts anodeGasHydrogenFraction).
 * hydrogenFraction x: H₂ mole fraction of the anode gas, [0, 1); anodeGasProduction g: main
 * anode gas (O₂ or Cl₂) produced at the same point, mol/(m²·s) > 0 (checks.ts gasProductionRate).
 * Taken at one operating point; with f held constant the fraction at other loads follows from
 * anodeGasPurity. Source: mass balance (definition of mole fraction).
 */
export function crossoverFluxFromHydrogenFraction(hydrogenFraction: number, anodeGasProduction: number): number {
  if (!Number.isFinite(hydrogenFraction) || hydrogenFraction < 0 || hydrogenFraction >= 1) {
    throw new InputError('hydrogenFraction', 'must be a mole fraction in [0, 1)');
  }
  if (!Number.isFinite(anodeGasProduction) || anodeGasProduction <= 0) {
    throw new InputError('anodeGasProduction', 'must be a finite rate > 0 mol/(m²·s)');
  }
  return (anodeGasProduction * hydrogenFraction) / (1 - hydrogenFraction);
}
