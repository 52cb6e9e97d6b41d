/**
 * Concentration (mass-transport) overpotential with a limiting current density (domain §6).
 *
 *   j_lim = n·F·k_m·c                                  [A/m²]
 *   η_mt  = sign(j)·(RT/(nF))·ln[1/(1 − |j|/j_lim)]    [V]
 *
 * k_m mass-transfer coefficient [m/s], c bulk concentration of the reacting species
 * [mol/m³], n electrons per reacting molecule, T [K], j [A/m²] (anodic > 0, cathodic < 0).
 * The sign follows the IUPAC convention (anode η > 0, cathode η < 0); |η_mt| is the voltage
 * loss. Source: the classical film (Nernst diffusion layer) model, e.g. Bard & Faulkner,
 * Electrochemical Methods, 2nd ed., ch. 1 (from memory).
 * At or above the limiting current the model has no solution: PhysicsError, never NaN.
 */
import { FARADAY, thermalVoltage } from '../constants.js';
import { PhysicsError } from '../errors.js';
import { requireFinite, requireNonNegative, requirePositive, requireTemperature } from '../thermo/guards.js';

/** j_lim = n·F·k_m·c [A/m²]; n > 0, k_m [m/s] ≥ 0, c [mol/m³] ≥ 0. */
export function limitingCurrentDensity(electrons: number, massTransferCoefficient: number, concentration: number): number {
  requirePositive('electrons', electrons);
  requireNonNegative('massTransferCoefficient', massTransferCoefficient, 'm/s');
  requireNonNegative('concentration', concentration, 'mol/m³');
  return electrons * FARADAY.value * massTransferCoefficient * concentration;
}

/**
 * η_mt = sign(j)·(RT/(nF))·ln[1/(1 − |j|/j_lim)] [V] (module doc).
 * j [A/m²] any sign, j_lim [A/m²] > 0 (a magnitude), T [K], n > 0.
 * Throws PhysicsError('currentDensity') when |j| ≥ j_lim.
 */
export function concentrationOverpotential(currentDensity: number, limitingCurrent: number, temperature: number, electrons: number): number {
  requireFinite('currentDensity', currentDensity, 'A/m²');
  requirePositive('limitingCurrentDensity', limitingCurrent, 'A/m²');
  requireTemperature('temperature', temperature);
  requirePositive('electrons', electrons);
  const ratio = Math.abs(currentDensity) / limitingCurrent;
  if (ratio >= 1) {
    throw new PhysicsError(
      'currentDensity',
      `|j| = ${Math.abs(currentDensity).toPrecision(4)} A/m² is at or above the limiting current density ${limitingCurrent.toPrecision(4)} A/m²: the mass-transport model has no solution`,
    );
  }
  const magnitude = -(thermalVoltage(temperature) / electrons) * Math.log1p(-ratio);
  return currentDensity < 0 ? -magnitude : magnitude;
}
