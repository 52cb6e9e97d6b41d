/**
 * Argument guards shared by thermo/, transport/ and chemistry/. They turn a malformed
 * number into an InputError naming the field, so no NaN or Infinity leaks into a result.
 * They are cheap (a comparison or two) and safe to call once per evaluation.
 */
import { ZERO_CELSIUS_K } from '../constants.js';
import { InputError } from '../errors.js';

/** Throw InputError(path) unless value is a finite number. */
export function requireFinite(path: string, value: number, unit = ''): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new InputError(path, `must be a finite number${unit ? ` (${unit})` : ''}`, value);
  }
}

/** Throw InputError(path) unless value is finite and > 0. */
export function requirePositive(path: string, value: number, unit = ''): void {
  requireFinite(path, value, unit);
  if (value <= 0) throw new InputError(path, `must be > 0${unit ? ` ${unit}` : ''}`, value);
}

/** Throw InputError(path) unless value is finite and ≥ 0. */
export function requireNonNegative(path: string, value: number, unit = ''): void {
  requireFinite(path, value, unit);
  if (value < 0) throw new InputError(path, `must be ≥ 0${unit ? ` ${unit}` : ''}`, value);
}

/** Throw InputError(path) unless a temperature is finite and > 0 K. */
export function requireTemperature(path: string, temperature: number): void {
  requireFinite(path, temperature, 'K');
  if (temperature <= 0) throw new InputError(path, 'must be an absolute temperature > 0 K', temperature);
}

/** "25.0 °C (298.15 K)" — used in warning texts so engineers read familiar units. */
export function describeTemperature(temperature: number): string {
  return `${(temperature - ZERO_CELSIUS_K.value).toFixed(1)} °C (${temperature.toFixed(2)} K)`;
}
