/**
 * Physical constants and molar masses. Each carries its value, unit and source.
 * SI 2019 defining constants are exact; F and R are derived from them, never typed in.
 */
export interface Constant {
  readonly value: number;
  readonly unit: string;
  readonly source: string;
}

/** Elementary charge. Source: BIPM SI Brochure, 9th ed. (2019), exact. */
export const ELEMENTARY_CHARGE: Constant = { value: 1.602176634e-19, unit: 'C', source: 'SI 2019 defining constant (exact)' };
/** Avogadro constant. Source: BIPM SI Brochure, 9th ed. (2019), exact. */
export const AVOGADRO: Constant = { value: 6.02214076e23, unit: '1/mol', source: 'SI 2019 defining constant (exact)' };
/** Boltzmann constant. Source: BIPM SI Brochure, 9th ed. (2019), exact. */
export const BOLTZMANN: Constant = { value: 1.380649e-23, unit: 'J/K', source: 'SI 2019 defining constant (exact)' };
/** Faraday constant F = e·N_A = 96 485.332 12… C/mol. Source: CODATA 2018 (exact since 2019). */
export const FARADAY: Constant = { value: ELEMENTARY_CHARGE.value * AVOGADRO.value, unit: 'C/mol', source: 'SI 2019 exact (e·N_A); CODATA 2018' };
/** Molar gas constant R = k·N_A = 8.314 462 618… J/(mol·K). Source: CODATA 2018 (exact since 2019). */
export const GAS_CONSTANT: Constant = { value: BOLTZMANN.value * AVOGADRO.value, unit: 'J/(mol·K)', source: 'SI 2019 exact (k·N_A); CODATA 2018' };

/** 0 °C in kelvin (exact by definition of the Celsius scale). */
export const ZERO_CELSIUS_K: Constant = { value: 273.15, unit: 'K', source: 'SI definition of the degree Celsius (exact)' };
/** Standard temperature for thermodynamic tables, 298.15 K. Source: IUPAC convention. */
export const T_STANDARD: Constant = { value: 298.15, unit: 'K', source: 'IUPAC standard reference temperature' };
/** Standard-state pressure p° = 1 bar = 1e5 Pa. Source: IUPAC (1982) standard-state pressure. */
export const P_STANDARD: Constant = { value: 1e5, unit: 'Pa', source: 'IUPAC standard-state pressure (1 bar)' };
/** Normal (Nm³) reference: 0 °C and 101.325 kPa. Source: DIN 1343 / common practice for Nm³. */
export const P_NORMAL: Constant = { value: 101325, unit: 'Pa', source: 'DIN 1343 normal conditions (0 °C, 101.325 kPa)' };

/**
 * Conventional (abridged) standard atomic weights, g/mol → stored in kg/mol.
 * Source: IUPAC/CIAAW abridged standard atomic weights (2021): H 1.008, O 15.999,
 * Na 22.990, Cl 35.45, K 39.098.
 */
export const ATOMIC_WEIGHT = {
  H: 1.008e-3,
  O: 15.999e-3,
  Na: 22.99e-3,
  Cl: 35.45e-3,
  K: 39.098e-3,
} as const;
export const ATOMIC_WEIGHT_SOURCE = 'IUPAC/CIAAW abridged standard atomic weights (2021)';

/** Molar masses of the products and feeds, kg/mol, from ATOMIC_WEIGHT. */
export const MOLAR_MASS = {
  H2: 2 * ATOMIC_WEIGHT.H,
  O2: 2 * ATOMIC_WEIGHT.O,
  Cl2: 2 * ATOMIC_WEIGHT.Cl,
  H2O: 2 * ATOMIC_WEIGHT.H + ATOMIC_WEIGHT.O,
  NaOH: ATOMIC_WEIGHT.Na + ATOMIC_WEIGHT.O + ATOMIC_WEIGHT.H,
  NaCl: ATOMIC_WEIGHT.Na + ATOMIC_WEIGHT.Cl,
  KOH: ATOMIC_WEIGHT.K + ATOMIC_WEIGHT.O + ATOMIC_WEIGHT.H,
} as const;
export type Species = keyof typeof MOLAR_MASS;

/** f = F/(RT) [1/V] at temperature T [K]. */
export function faradayOverRT(temperatureK: number): number {
  return FARADAY.value / (GAS_CONSTANT.value * temperatureK);
}

/** Thermal voltage RT/F [V] at temperature T [K]. 25.6926 mV at 298.15 K (derived from CODATA 2018). */
export function thermalVoltage(temperatureK: number): number {
  return (GAS_CONSTANT.value * temperatureK) / FARADAY.value;
}
