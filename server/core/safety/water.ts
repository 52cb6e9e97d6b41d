/**
 * Boiling point of pure water at a given pressure, for the temperature-margin check.
 *
 * The saturation-temperature equation of IAPWS-IF97 (region 4, "backward" form T_s(p)):
 *   β = (p/p*)^¼, p* = 1 MPa
 *   E = β² + n3·β + n6,  F = n1·β² + n4·β + n7,  G = n2·β² + n5·β + n8
 *   D = 2G / (−F − √(F² − 4EG))
 *   T_s = T*·[n10 + D − √((n10 + D)² − 4(n9 + n10·D))]/2, T* = 1 K
 * Valid 611.213 Pa ≤ p ≤ 22.064 MPa. Check values: T_s(0.1 MPa) = 372.755919 K,
 * T_s(1 MPa) = 453.035632 K, T_s(10 MPa) = 584.149488 K.
 * Source: IAPWS R7-97(2012), Revised Release on the IAPWS Industrial Formulation 1997 for the
 * Thermodynamic Properties of Water and Steam, section 8 (region 4): saturation-temperature
 * equation, its coefficients and its computer-program verification values.
 *
 * Electrolyte solutions boil higher than pure water (boiling-point elevation; several kelvin for
 * depleted brine, more for 30 % KOH or 32 % NaOH): using pure water is the conservative side.
 */
import { InputError } from '../errors.js';

/** IAPWS-IF97 region-4 coefficients n1…n10 (IAPWS R7-97(2012), section 8). */
const N = [
  0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5, -0.32325550322333e7,
  0.14915108613530e2, -0.48232657361591e4, 0.40511340542057e6, -0.23855557567849, 0.65017534844798e3,
] as const;

/** Lowest pressure of the IF97 saturation line (triple point), Pa. */
export const SATURATION_PRESSURE_MIN = 611.213;
/** Critical pressure, Pa (IAPWS-IF97). */
export const SATURATION_PRESSURE_MAX = 22.064e6;

/**
 * Saturation (boiling) temperature of pure water T_s [K] at pressure p [Pa] (see module note).
 * Throws InputError outside 611.213 Pa – 22.064 MPa.
 */
export function waterSaturationTemperature(pressure: number): number {
  if (!Number.isFinite(pressure) || pressure < SATURATION_PRESSURE_MIN || pressure > SATURATION_PRESSURE_MAX) {
    throw new InputError('pressure', `must be between ${SATURATION_PRESSURE_MIN} Pa and ${SATURATION_PRESSURE_MAX} Pa for the water saturation line`);
  }
  const [n1, n2, n3, n4, n5, n6, n7, n8, n9, n10] = N;
  const beta = Math.pow(pressure / 1e6, 0.25);
  const E = beta * beta + n3 * beta + n6;
  const F = n1 * beta * beta + n4 * beta + n7;
  const G = n2 * beta * beta + n5 * beta + n8;
  const D = (2 * G) / (-F - Math.sqrt(F * F - 4 * E * G));
  return (n10 + D - Math.sqrt((n10 + D) * (n10 + D) - 4 * (n9 + n10 * D))) / 2;
}
