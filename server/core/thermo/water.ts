/**
 * Properties of pure liquid water used by the electrolyte models: saturation vapour
 * pressure, density at ~1 atm, and the Debye–Hückel osmotic slope A^φ(T) of the Pitzer model.
 * Each is a published correlation, cited below; all inputs and outputs in SI.
 */
import { ZERO_CELSIUS_K } from '../constants.js';
import { InputError } from '../errors.js';
import { requireTemperature } from './guards.js';

// ---------------------------------------------------------------------------------------
// Saturation vapour pressure: Wagner & Pruss (2002), eq. (2.5)
// ---------------------------------------------------------------------------------------

/** Critical temperature of water, 647.096 K. Source: IAPWS-95 (Wagner & Pruss 2002). */
export const WATER_CRITICAL_TEMPERATURE = { value: 647.096, unit: 'K', source: 'IAPWS-95 (Wagner & Pruss, J. Phys. Chem. Ref. Data 31 (2002) 387)' } as const;
/** Critical pressure of water, 22.064 MPa. Source: IAPWS-95 (Wagner & Pruss 2002). */
export const WATER_CRITICAL_PRESSURE = { value: 22.064e6, unit: 'Pa', source: 'IAPWS-95 (Wagner & Pruss, J. Phys. Chem. Ref. Data 31 (2002) 387)' } as const;
/** Triple-point temperature of water, 273.16 K (ITS-90 fixed point). */
export const WATER_TRIPLE_POINT_TEMPERATURE = { value: 273.16, unit: 'K', source: 'ITS-90 fixed point' } as const;

/** Coefficients a1…a6 of Wagner & Pruss (2002) eq. (2.5); source seen in public code (several copies). */
const WP_A = [-7.85951783, 1.84408259, -11.7866497, 22.6807411, -15.9618719, 1.80122502] as const;

/** Lowest temperature accepted for the vapour pressure [K]: 0 °C (0.01 K below the triple point). */
const VAPOUR_PRESSURE_T_MIN = ZERO_CELSIUS_K.value;

/**
 * Saturation vapour pressure of pure water p_sat(T) [Pa]; T [K].
 *
 *   ln(p_sat/p_c) = (T_c/T)·(a1 ϑ + a2 ϑ^1.5 + a3 ϑ³ + a4 ϑ^3.5 + a5 ϑ⁴ + a6 ϑ^7.5),  ϑ = 1 − T/T_c
 *
 * Source: W. Wagner, A. Pruß, "The IAPWS formulation 1995 for the thermodynamic properties
 * of ordinary water substance…", J. Phys. Chem. Ref. Data 31 (2002) 387, eq. (2.5)
 * (auxiliary saturation equation; agrees with IAPWS-95 to better than 0.03 % — from memory).
 * Validity: 273.16 K (triple point) to 647.096 K (critical point); accepted from 273.15 K.
 * Throws InputError outside 273.15–647.096 K.
 */
export function waterVapourPressure(temperature: number): number {
  requireTemperature('temperature', temperature);
  const tc = WATER_CRITICAL_TEMPERATURE.value;
  if (temperature < VAPOUR_PRESSURE_T_MIN || temperature > tc) {
    throw new InputError('temperature', `water vapour pressure correlation valid ${VAPOUR_PRESSURE_T_MIN}–${tc} K`, temperature);
  }
  const v = 1 - temperature / tc;
  const sum =
    WP_A[0] * v + WP_A[1] * v ** 1.5 + WP_A[2] * v ** 3 + WP_A[3] * v ** 3.5 + WP_A[4] * v ** 4 + WP_A[5] * v ** 7.5;
  return WATER_CRITICAL_PRESSURE.value * Math.exp((tc / temperature) * sum);
}

// ---------------------------------------------------------------------------------------
// Density of liquid water at ~1 atm: Kell (1975)
// ---------------------------------------------------------------------------------------

/** Kell (1975) coefficients (t in °C, ρ in kg/m³); source seen in public code (several copies). */
const KELL = { a0: 999.83952, a1: 16.945176, a2: -7.9870401e-3, a3: -46.170461e-6, a4: 105.56302e-9, a5: -280.54253e-12, b: 16.87985e-3 } as const;
/** Kell validity: 0–150 °C [K]. */
export const KELL_RANGE: readonly [number, number] = [273.15, 423.15];

/**
 * Density of air-free liquid water at 1 atm (saturation above 100 °C), ρ_w(T) [kg/m³]; T [K].
 *
 *   ρ = (a0 + a1 t + a2 t² + a3 t³ + a4 t⁴ + a5 t⁵)/(1 + b t),  t = T − 273.15 K in °C
 *
 * Source: G. S. Kell, J. Chem. Eng. Data 20 (1975) 97, eq. (16) (ITS-68 basis).
 * Validity: 0–150 °C; throws InputError outside.
 */
export function waterDensity(temperature: number): number {
  requireTemperature('temperature', temperature);
  if (temperature < KELL_RANGE[0] - 1e-9 || temperature > KELL_RANGE[1] + 1e-9) {
    throw new InputError('temperature', `Kell water density valid ${KELL_RANGE[0]}–${KELL_RANGE[1]} K`, temperature);
  }
  const t = temperature - ZERO_CELSIUS_K.value;
  const num = KELL.a0 + t * (KELL.a1 + t * (KELL.a2 + t * (KELL.a3 + t * (KELL.a4 + t * KELL.a5))));
  return num / (1 + KELL.b * t);
}

// ---------------------------------------------------------------------------------------
// Debye–Hückel osmotic slope A^φ(T): Møller (1988), eq. (13) form
// ---------------------------------------------------------------------------------------

/**
 * Møller (1988) coefficients for A^φ in her eq. (13) form
 * f(T) = a1 + a2 T + a3/T + a4 ln T + a5/(T − 263) + a6 T² + a7/(680 − T) + a8/(T − 227).
 * Source: N. Møller, Geochim. Cosmochim. Acta 52 (1988) 821–837; coefficients seen in the
 * open-source `pytzer` package (several versions agree).
 */
const MOLLER_APHI = [3.36901532e-1, -6.3210043e-4, 9.14252359, -1.35143986e-2, 2.26089488e-3, 1.92118597e-6, 45.2586464, 0] as const;
/** Validity of Møller's A^φ(T) [K] (as annotated in pytzer): 0–300 °C at saturation/1 atm. */
export const APHI_RANGE: readonly [number, number] = [273.15, 573.15];

/**
 * Debye–Hückel slope for the osmotic coefficient A^φ(T) [kg^½ mol^−½]; T [K].
 * Source: Møller (1988) eq. (13) fit (see MOLLER_APHI). Check: 0.39148 at 25 °C against
 * the usual 0.3915 (check-values §4b: value seen as a default in public code; its attribution
 * to Pitzer 1991 / Archer & Wang 1990 is from memory).
 * Validity: 273.15–573.15 K; throws InputError outside.
 */
export function debyeHuckelOsmoticSlope(temperature: number): number {
  requireTemperature('temperature', temperature);
  if (temperature < APHI_RANGE[0] - 1e-9 || temperature > APHI_RANGE[1]) {
    throw new InputError('temperature', `A^φ correlation valid ${APHI_RANGE[0]}–${APHI_RANGE[1]} K`, temperature);
  }
  const a = MOLLER_APHI;
  const T = temperature;
  return a[0] + a[1] * T + a[2] / T + a[3] * Math.log(T) + a[4] / (T - 263) + a[5] * T * T + a[6] / (680 - T) + a[7] / (T - 227);
}
