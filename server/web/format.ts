/**
 * Display formatting. Numbers leave the SI core as float64; for display they are converted
 * to the engineer's unit and rounded with decimal.js so that shown values are exact decimal
 * roundings (no 0.30000000000000004 on screen).
 */
import { Decimal } from 'decimal.js';
import { UNIT_TABLES, type Quantity, unitLabel } from '../core/units.js';
import { ZERO_CELSIUS_K } from '../core/constants.js';

/** Round to `sig` significant digits and print without exponent for ordinary magnitudes. */
export function fmt(value: number | undefined | null, sig = 4): string {
  if (value === undefined || value === null) return '—';
  if (!Number.isFinite(value)) return '—';
  if (value === 0) return '0';
  const d = new Decimal(value).toSignificantDigits(sig, Decimal.ROUND_HALF_EVEN);
  const abs = Math.abs(value);
  if (abs >= 1e-4 && abs < 1e9) {
    return d.toFixed();
  }
  return d.toExponential(sig - 1).replace('e+', 'e');
}

/** Fixed decimals (for values like voltages where the engineer expects a fixed resolution). */
export function fixed(value: number | undefined | null, places: number): string {
  if (value === undefined || value === null || !Number.isFinite(value)) return '—';
  return new Decimal(value).toDecimalPlaces(places, Decimal.ROUND_HALF_EVEN).toFixed(places);
}

/** Convert an SI value into `unit` (exact decimal factor) and format. */
export function inUnit(valueSI: number | undefined | null, quantity: Quantity, unit: string, sig = 4): string {
  if (valueSI === undefined || valueSI === null || !Number.isFinite(valueSI)) return '—';
  const table = UNIT_TABLES[quantity] as Record<string, number>;
  const f = table[unit];
  if (f === undefined) return fmt(valueSI, sig);
  return fmt(new Decimal(valueSI).div(f).toNumber(), sig);
}

export function celsius(kelvin: number | undefined, places = 1): string {
  if (kelvin === undefined || !Number.isFinite(kelvin)) return '—';
  return new Decimal(kelvin).minus(ZERO_CELSIUS_K.value).toDecimalPlaces(places).toFixed(places);
}

export { unitLabel };
