/**
 * Unit conversion tables. Values are parsed into SI coherent units once at the edges
 * (forms, CSV paste, study files) and converted back only for display.
 *
 * Each factor is exact by definition of the unit (SI prefixes, 1 bar = 1e5 Pa,
 * 1 h = 3600 s, 1 kWh = 3.6e6 J); °C is an offset scale handled separately. The one
 * convention: 't/year' uses a 365-day year (our choice; leap days ignored).
 */
import { InputError } from './errors.js';
import { ZERO_CELSIUS_K } from './constants.js';

export const UNIT_TABLES = {
  currentDensity: { 'A/m2': 1, 'kA/m2': 1e3, 'mA/cm2': 10, 'A/cm2': 1e4 },
  potential: { V: 1, mV: 1e-3 },
  areaResistance: { 'ohm*m2': 1, 'ohm*cm2': 1e-4, 'mohm*cm2': 1e-7 },
  conductivity: { 'S/m': 1, 'S/cm': 100, 'mS/cm': 0.1 },
  length: { m: 1, mm: 1e-3, um: 1e-6, cm: 1e-2 },
  pressure: { Pa: 1, kPa: 1e3, bar: 1e5, MPa: 1e6 },
  specificEnergy: { 'J/kg': 1, 'kWh/t': 3.6e3, 'kWh/kg': 3.6e6 },
  massRate: { 'kg/s': 1, 'kg/h': 1 / 3600, 'kg/day': 1 / 86400, 't/day': 1000 / 86400, 't/h': 1000 / 3600, 't/year': 1000 / (365 * 86400) },
  current: { A: 1, kA: 1e3 },
  power: { W: 1, kW: 1e3, MW: 1e6 },
  area: { m2: 1, cm2: 1e-4 },
  energyPerMol: { 'J/mol': 1, 'kJ/mol': 1e3 },
} as const;

export type Quantity = keyof typeof UNIT_TABLES;
export type UnitOf<Q extends Quantity> = keyof (typeof UNIT_TABLES)[Q] & string;

/** Display labels for unit keys (ASCII keys are what forms and files carry). */
export const UNIT_LABELS: Record<string, string> = {
  'A/m2': 'A/m²', 'kA/m2': 'kA/m²', 'mA/cm2': 'mA/cm²', 'A/cm2': 'A/cm²',
  'ohm*m2': 'Ω·m²', 'ohm*cm2': 'Ω·cm²', 'mohm*cm2': 'mΩ·cm²', um: 'µm', m2: 'm²', cm2: 'cm²',
};

export function unitLabel(unit: string): string {
  return UNIT_LABELS[unit] ?? unit;
}

function factor(quantity: Quantity, unit: string, path: string): number {
  const table = UNIT_TABLES[quantity] as Record<string, number>;
  const f = table[unit];
  if (f === undefined) {
    throw new InputError(path, `unknown unit "${unit}" for ${quantity}; use one of ${Object.keys(table).join(', ')}`);
  }
  return f;
}

/** Convert a value given in `unit` to SI. Throws InputError (with `path`) for an unknown unit. */
export function toSI(value: number, quantity: Quantity, unit: string, path = 'unit'): number {
  return value * factor(quantity, unit, path);
}

/** Convert an SI value to `unit` for display. */
export function fromSI(value: number, quantity: Quantity, unit: string, path = 'unit'): number {
  return value / factor(quantity, unit, path);
}

/** °C → K (offset by 273.15 K, exact). */
export function celsiusToKelvin(celsius: number): number {
  return celsius + ZERO_CELSIUS_K.value;
}

/** K → °C. */
export function kelvinToCelsius(kelvin: number): number {
  return kelvin - ZERO_CELSIUS_K.value;
}
