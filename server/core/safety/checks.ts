/**
 * Computed hazard checks. Each returns a SafetyCheck with a level ('ok' | 'caution' | 'alarm'),
 * a plain message, the value, the limits it was judged against, and the source of each figure.
 *
 * These are design-study screens, not protective settings: local codes, standards, permits and
 * licensed engineering practice govern (see cautions.ts, SAFETY_DISCLAIMER).
 *
 * Units: gas compositions as mole fractions (= volume fractions for ideal gases, reported as
 * vol %), temperatures in K, pressures in Pa, current densities in A/m², fluxes in mol/(m²·s),
 * magnetic flux density in T.
 */
import { FARADAY, ZERO_CELSIUS_K } from '../constants.js';
import { InputError } from '../errors.js';
import { waterSaturationTemperature } from './water.js';

export type SafetyLevel = 'ok' | 'caution' | 'alarm';

export interface SafetyCheck {
  /** Stable identifier, e.g. "hydrogen-in-oxygen.minimum-load". */
  id: string;
  title: string;
  level: SafetyLevel;
  message: string;
  /** The computed quantity, in `unit`. */
  value: number;
  /** Threshold for 'alarm', in `unit`. */
  limit: number;
  /** Threshold for 'caution', in `unit`. */
  cautionLimit: number;
  unit: string;
  /** Where the limits come from. */
  source: string;
}

/** A limit with unit and source. */
export interface SourcedLimit {
  readonly value: number;
  readonly unit: string;
  readonly source: string;
}

// ---------------------------------------------------------------------------------------------
// Flammability / explosion limits and the fractions of them used as screens.

/**
 * Lower flammability limit of H₂ in O₂: 4.0 vol % (1 atm; −60 to 100 °C per GEST 91/168).
 * Source: Zabetakis, US Bureau of Mines Bulletin 627 (1965); Euro Chlor GEST 91/168 ch. 9
 * (both via secondary copies; check-values §10).
 */
export const HYDROGEN_IN_OXYGEN_LOWER_LIMIT: SourcedLimit = {
  value: 0.04,
  unit: 'mol/mol',
  source: 'Zabetakis, US Bureau of Mines Bull. 627 (1965); Euro Chlor GEST 91/168 ch. 9',
};

/**
 * Lower explosion limit of H₂ in Cl₂ against temperature at about 1 bar (explosion = > 5 %
 * pressure rise): 5.0 vol % at −60 °C, 4.0 at −40 and −20 °C, 3.5 at 0 °C, 3.0 at 20–25, 50 and
 * 100 °C; 2.5–3 vol % at 13.5 bar(a).
 * Source: Euro Chlor GEST 91/168 ch. 9 (via a 2016 industry presentation); Chlorine Institute
 * Pamphlet 121 (2009) (check-values §10).
 */
const HYDROGEN_IN_CHLORINE_TABLE: readonly { celsius: number; lowerLimit: number }[] = [
  { celsius: -60, lowerLimit: 0.05 },
  { celsius: -40, lowerLimit: 0.04 },
  { celsius: -20, lowerLimit: 0.04 },
  { celsius: 0, lowerLimit: 0.035 },
  { celsius: 20, lowerLimit: 0.03 },
  { celsius: 25, lowerLimit: 0.03 },
  { celsius: 50, lowerLimit: 0.03 },
  { celsius: 100, lowerLimit: 0.03 },
];
const HYDROGEN_IN_CHLORINE_SOURCE = 'Euro Chlor GEST 91/168 ch. 9; Chlorine Institute Pamphlet 121 (2009)';
/** H₂ in Cl₂ lower limit at elevated pressure: 2.5 vol % (low end of 2.5–3 at 13.5 bar(a), GEST 91/168). */
const HYDROGEN_IN_CHLORINE_PRESSURISED = 0.025;
/** Above this absolute pressure the pressurised figure is used (2 bar(a), our choice: the table is for ≈ 1 bar). */
const PRESSURISED_ABOVE = 2e5;

/**
 * Screens as fractions of the lower limit. Water electrolysers commonly trip near 2 vol % H₂ in O₂
 * (half the 4 % limit) and alarm near 1 vol % (a quarter): common practice, check-values §10
 * (e.g. Haug et al. 2017; Schalenbach et al. 2016 — numbers from memory). The same fractions are
 * applied to H₂ in Cl₂ (our choice: no published screen for H₂ in Cl₂ is recorded in
 * check-values §10, which only says plants keep it "well below the LEL").
 */
export const ALARM_FRACTION_OF_LOWER_LIMIT = 0.5;
export const CAUTION_FRACTION_OF_LOWER_LIMIT = 0.25;
const SCREEN_SOURCE = 'trip near ½ and alarm near ¼ of the lower limit: common practice (check-values §10)';

/** Plant-specific thresholds that replace the defaults (mole fractions). */
export interface GasThresholds {
  caution: number;
  alarm: number;
}

function levelOf(value: number, caution: number, alarm: number): SafetyLevel {
  if (value >= alarm) return 'alarm';
  if (value >= caution) return 'caution';
  return 'ok';
}

function volPercent(x: number): string {
  return `${(100 * x).toPrecision(3)} vol %`;
}

function checkFraction(name: string, value: number): void {
  if (!Number.isFinite(value) || value < 0 || value > 1) throw new InputError(name, 'must be a mole fraction between 0 and 1');
}

function checkThresholds(t: GasThresholds | undefined): void {
  if (!t) return;
  if (!(t.caution > 0 && t.alarm > 0 && t.caution <= t.alarm && t.alarm < 1)) {
    throw new InputError('thresholds', 'caution and alarm must be fractions with 0 < caution ≤ alarm < 1');
  }
}

/**
 * H₂ content of oxygen (water-electrolysis anode gas) against the lower flammability limit
 * (4 vol %): caution from ¼ of it (1 vol %), alarm from ½ (2 vol %), unless the plant's own
 * thresholds are given. `where` labels the operating state, e.g. "minimum load".
 */
export function checkHydrogenInOxygen(hydrogenFraction: number, options: { where?: string; thresholds?: GasThresholds } = {}): SafetyCheck {
  checkFraction('hydrogenFraction', hydrogenFraction);
  checkThresholds(options.thresholds);
  const lfl = HYDROGEN_IN_OXYGEN_LOWER_LIMIT.value;
  const alarm = options.thresholds?.alarm ?? ALARM_FRACTION_OF_LOWER_LIMIT * lfl;
  const caution = options.thresholds?.caution ?? CAUTION_FRACTION_OF_LOWER_LIMIT * lfl;
  const level = levelOf(hydrogenFraction, caution, alarm);
  const where = options.where ? ` at ${options.where}` : '';
  const verdict =
    level === 'alarm'
      ? 'at or above the trip screen: the oxygen side is too close to a flammable mixture'
      : level === 'caution'
        ? 'above the alarm screen: watch the gas analyser and the part-load limit'
        : 'below the alarm screen';
  return {
    id: `hydrogen-in-oxygen${options.where ? '.' + slug(options.where) : ''}`,
    title: `Hydrogen in oxygen${where}`,
    level,
    message: `Hydrogen in the oxygen${where}: ${volPercent(hydrogenFraction)} (${verdict}; lower flammability limit ${volPercent(lfl)}, trip screen ${volPercent(alarm)}, alarm screen ${volPercent(caution)}).`,
    value: hydrogenFraction,
    limit: alarm,
    cautionLimit: caution,
    unit: 'mol/mol',
    source: options.thresholds ? 'plant thresholds given with the input' : `${HYDROGEN_IN_OXYGEN_LOWER_LIMIT.source}; ${SCREEN_SOURCE}`,
  };
}

/**
 * Lower explosion limit of H₂ in Cl₂ [mol/mol] at temperature T [K] and absolute pressure p [Pa].
 * Between table temperatures the lower (more conservative) neighbour is used; outside the table
 * the nearest end; without a temperature, the lowest tabulated value at ≈ 1 bar (3.0 vol %).
 * Above 2 bar(a), 2.5 vol % (GEST figure for 13.5 bar(a); intermediate pressures are not
 * tabulated, so this is the conservative choice). Source: see HYDROGEN_IN_CHLORINE_TABLE.
 */
export function hydrogenInChlorineLowerLimit(temperature?: number, pressure?: number): { value: number; note: string } {
  if (pressure !== undefined && (!Number.isFinite(pressure) || pressure <= 0)) throw new InputError('pressure', 'must be a finite pressure > 0 Pa');
  if (temperature !== undefined && (!Number.isFinite(temperature) || temperature <= 0)) throw new InputError('temperature', 'must be a finite temperature > 0 K');
  if (pressure !== undefined && pressure > PRESSURISED_ABOVE) {
    return { value: HYDROGEN_IN_CHLORINE_PRESSURISED, note: 'pressurised gas: 2.5 vol % (GEST 91/168 at 13.5 bar(a))' };
  }
  if (temperature === undefined) {
    return { value: Math.min(...HYDROGEN_IN_CHLORINE_TABLE.map((r) => r.lowerLimit)), note: 'no temperature given: lowest tabulated value at ≈ 1 bar' };
  }
  const celsius = temperature - ZERO_CELSIUS_K.value;
  const table = HYDROGEN_IN_CHLORINE_TABLE;
  if (celsius <= table[0].celsius) return { value: table[0].lowerLimit, note: `at or below ${table[0].celsius} °C: table end` };
  const last = table[table.length - 1];
  if (celsius >= last.celsius) return { value: last.lowerLimit, note: celsius > last.celsius ? `above ${last.celsius} °C: table end used` : 'tabulated' };
  for (let k = 1; k < table.length; k++) {
    if (celsius === table[k].celsius) return { value: table[k].lowerLimit, note: 'tabulated' };
    if (celsius < table[k].celsius) {
      const value = Math.min(table[k - 1].lowerLimit, table[k].lowerLimit);
      return { value, note: `between ${table[k - 1].celsius} and ${table[k].celsius} °C: lower neighbour` };
    }
  }
  return { value: last.lowerLimit, note: 'tabulated' };
}

/**
 * H₂ content of chlorine (chlor-alkali cell gas or liquefaction tail gas) against the lower
 * explosion limit of H₂–Cl₂ mixtures (3–4 vol % at ≈ 1 bar, lower when pressurised): caution from
 * ¼, alarm from ½ of it, unless the plant's own thresholds are given.
 */
export function checkHydrogenInChlorine(
  hydrogenFraction: number,
  options: { where?: string; temperature?: number; pressure?: number; thresholds?: GasThresholds } = {},
): SafetyCheck {
  checkFraction('hydrogenFraction', hydrogenFraction);
  checkThresholds(options.thresholds);
  const lel = hydrogenInChlorineLowerLimit(options.temperature, options.pressure);
  const alarm = options.thresholds?.alarm ?? ALARM_FRACTION_OF_LOWER_LIMIT * lel.value;
  const caution = options.thresholds?.caution ?? CAUTION_FRACTION_OF_LOWER_LIMIT * lel.value;
  const level = levelOf(hydrogenFraction, caution, alarm);
  const where = options.where ? ` at ${options.where}` : '';
  const verdict =
    level === 'alarm'
      ? 'at or above the trip screen: hydrogen–chlorine mixtures can explode, and light, static or a shock can set them off'
      : level === 'caution'
        ? 'above the alarm screen: plants normally hold hydrogen in chlorine far lower'
        : 'below the alarm screen';
  return {
    id: `hydrogen-in-chlorine${options.where ? '.' + slug(options.where) : ''}`,
    title: `Hydrogen in chlorine${where}`,
    level,
    message: `Hydrogen in the chlorine${where}: ${volPercent(hydrogenFraction)} (${verdict}; lower explosion limit ${volPercent(lel.value)} — ${lel.note}; trip screen ${volPercent(alarm)}, alarm screen ${volPercent(caution)}).`,
    value: hydrogenFraction,
    limit: alarm,
    cautionLimit: caution,
    unit: 'mol/mol',
    source: options.thresholds ? 'plant thresholds given with the input' : `${HYDROGEN_IN_CHLORINE_SOURCE}; ${SCREEN_SOURCE}`,
  };
}

// ---------------------------------------------------------------------------------------------
// Anode-gas hydrogen from crossover.

/**
 * H₂ mole fraction of the anode gas, x = f/(f + g) [mol/mol].
 * crossoverFlux f: H₂ reaching the anode gas, mol/(m²·s) ≥ 0; anodeGasProduction g: main anode
 * gas (O₂ or Cl₂) produced, mol/(m²·s) > 0. Other gases (O₂ in Cl₂, N₂, CO₂) are ignored, which
 * overstates x slightly (the safe side). Source: mass balance (definition of mole fraction).
 */
export function anodeGasHydrogenFraction(crossoverFlux: number, anodeGasProduction: number): number {
  if (!Number.isFinite(crossoverFlux) || crossoverFlux < 0) throw new InputError('crossoverFlux', 'must be a finite flux ≥ 0 mol/(m²·s)');
  if (!Number.isFinite(anodeGasProduction) || anodeGasProduction <= 0) throw new InputError('anodeGasProduction', 'must be a finite rate > 0 mol/(m²·s)');
  return crossoverFlux / (crossoverFlux + anodeGasProduction);
}

/**
 * Gas produced at an electrode, g = CE·j/(z·F) [mol/(m²·s)]. j [A/m²] > 0, CE (0, 1],
 * z electrons per molecule (4 for O₂, 2 for Cl₂ and H₂). Source: Faraday's law.
 */
export function gasProductionRate(currentDensity: number, electronsPerMolecule: number, currentEfficiency = 1): number {
  if (!Number.isFinite(currentDensity) || currentDensity <= 0) throw new InputError('currentDensity', 'must be a finite current density > 0 A/m²');
  if (!(currentEfficiency > 0 && currentEfficiency <= 1)) throw new InputError('currentEfficiency', 'must be in (0, 1]');
  if (!Number.isInteger(electronsPerMolecule) || electronsPerMolecule < 1) throw new InputError('electronsPerMolecule', 'must be a whole number ≥ 1');
  return (currentEfficiency * currentDensity) / (electronsPerMolecule * FARADAY.value);
}

/**
 * H₂ permeation flux through a membrane or diaphragm by Fick's law, f = P·p_H₂/d [mol/(m²·s)].
 * permeability P [mol/(m·s·Pa)], hydrogen partial pressure on the cathode side p_H₂ [Pa] (the
 * anode side taken as ≈ 0), thickness d [m]. Pressure-driven only: dissolved-gas
 * supersaturation at high current density adds to it (from memory, e.g. Schalenbach et al.).
 * Source: Fick's first law (domain primer §7).
 */
export function hydrogenPermeationFlux(permeability: number, hydrogenPartialPressure: number, thickness: number): number {
  if (!Number.isFinite(permeability) || permeability < 0) throw new InputError('permeability', 'must be a finite permeability ≥ 0 mol/(m·s·Pa)');
  if (!Number.isFinite(hydrogenPartialPressure) || hydrogenPartialPressure < 0) throw new InputError('hydrogenPartialPressure', 'must be a finite pressure ≥ 0 Pa');
  if (!Number.isFinite(thickness) || thickness <= 0) throw new InputError('thickness', 'must be a finite thickness > 0 m');
  return (permeability * hydrogenPartialPressure) / thickness;
}

export interface AnodeGasPurityInput {
  chemistry: 'water' | 'chlor-alkali';
  /** H₂ reaching the anode gas, mol/(m²·s), taken independent of load. */
  crossoverFlux: number;
  /** A/m². */
  operatingCurrentDensity: number;
  /** Minimum-load current density, A/m². */
  minimumCurrentDensity: number;
  /** Current efficiency of the anode gas (0–1], default 1. */
  currentEfficiency?: number;
  /** Gas temperature, K (chlorine limit table). */
  temperature?: number;
  /** Absolute gas pressure, Pa. */
  pressure?: number;
  thresholds?: GasThresholds;
}

export interface AnodeGasPurityResult {
  operating: { currentDensity: number; hydrogenFraction: number; check: SafetyCheck };
  minimumLoad: { currentDensity: number; hydrogenFraction: number; check: SafetyCheck };
  /** Current density below which the H₂ fraction reaches the trip screen, A/m². */
  lowestCurrentDensityBelowTrip: number;
  checks: SafetyCheck[];
}

/**
 * Anode-gas purity at the operating point and at minimum load, with a constant crossover flux
 * (so the H₂ fraction rises as load falls: x ∝ 1/j when x ≪ 1), and the current density at which
 * it reaches the trip screen: j = z·F·f·(1 − x_trip)/(x_trip·CE).
 * Anode gas: O₂ (z = 4) for water electrolysis, Cl₂ (z = 2) for chlor-alkali.
 */
export function anodeGasPurity(input: AnodeGasPurityInput): AnodeGasPurityResult {
  if (!Number.isFinite(input.minimumCurrentDensity) || input.minimumCurrentDensity <= 0) {
    throw new InputError('minimumCurrentDensity', 'must be a finite current density > 0 A/m²');
  }
  if (!(input.operatingCurrentDensity >= input.minimumCurrentDensity)) {
    throw new InputError('operatingCurrentDensity', 'must be at least the minimum-load current density');
  }
  const z = input.chemistry === 'water' ? 4 : 2;
  const ce = input.currentEfficiency ?? 1;
  const evaluate = (j: number, where: string) => {
    const x = anodeGasHydrogenFraction(input.crossoverFlux, gasProductionRate(j, z, ce));
    const check =
      input.chemistry === 'water'
        ? checkHydrogenInOxygen(x, { where, thresholds: input.thresholds })
        : checkHydrogenInChlorine(x, { where, temperature: input.temperature, pressure: input.pressure, thresholds: input.thresholds });
    return { currentDensity: j, hydrogenFraction: x, check };
  };
  const operating = evaluate(input.operatingCurrentDensity, 'the operating point');
  const minimumLoad = evaluate(input.minimumCurrentDensity, 'minimum load');
  const trip = operating.check.limit;
  const lowest = (z * FARADAY.value * input.crossoverFlux * (1 - trip)) / (trip * ce);
  return { operating, minimumLoad, lowestCurrentDensityBelowTrip: lowest, checks: [operating.check, minimumLoad.check] };
}

// ---------------------------------------------------------------------------------------------
// Temperature against the boiling point.

/** Margins below the boiling point: caution within 10 K, alarm within 3 K (our choice). */
export const BOILING_CAUTION_MARGIN = 10;
export const BOILING_ALARM_MARGIN = 3;

/**
 * Electrolyte temperature T [K] against its boiling point at absolute pressure p [Pa]:
 * T_b = T_s,water(p) (IAPWS-IF97) + boiling-point elevation [K, default 0: pure water, the
 * conservative side]. Caution within 10 K of T_b, alarm within 3 K or above.
 */
export function checkBoilingMargin(temperature: number, pressure: number, options: { boilingPointElevation?: number } = {}): SafetyCheck {
  if (!Number.isFinite(temperature) || temperature <= 0) throw new InputError('temperature', 'must be a finite temperature > 0 K');
  const elevation = options.boilingPointElevation ?? 0;
  if (!Number.isFinite(elevation) || elevation < 0) throw new InputError('boilingPointElevation', 'must be a finite elevation ≥ 0 K');
  const boiling = waterSaturationTemperature(pressure) + elevation;
  const alarm = boiling - BOILING_ALARM_MARGIN;
  const caution = boiling - BOILING_CAUTION_MARGIN;
  const level = levelOf(temperature, caution, alarm);
  const c = (k: number) => `${(k - ZERO_CELSIUS_K.value).toFixed(1)} °C`;
  const basis = elevation > 0 ? `pure water ${c(boiling - elevation)} + ${elevation.toFixed(1)} K elevation` : 'pure water; the solution boils somewhat higher';
  const verdict =
    level === 'alarm'
      ? 'at or within 3 K of boiling: vapour flashing, foaming and loss of level control are likely'
      : level === 'caution'
        ? 'within 10 K of boiling: the cell gas carries much water vapour and the margin for upsets is small'
        : 'a comfortable margin below boiling';
  return {
    id: 'temperature-boiling-margin',
    title: 'Temperature against the boiling point',
    level,
    message: `Electrolyte at ${c(temperature)}, boiling point ${c(boiling)} at ${(pressure / 1e5).toPrecision(4)} bar(a) (${basis}): ${verdict}.`,
    value: temperature,
    limit: alarm,
    cautionLimit: caution,
    unit: 'K',
    source: 'boiling point: IAPWS R7-97(2012) IF97 saturation temperature; margins 10 K / 3 K: our choice',
  };
}

// ---------------------------------------------------------------------------------------------
// Current density against a limiting current.

/** Fractions of the limiting current density: caution above 0.8, alarm from 0.95 (our choice). */
export const LIMITING_CURRENT_CAUTION = 0.8;
export const LIMITING_CURRENT_ALARM = 0.95;

/**
 * Current density j [A/m²] against a limiting current density j_lim [A/m²]: caution above
 * 80 %, alarm from 95 % (mass-transport overpotential ln(1/(1 − j/j_lim)) grows without bound and
 * side reactions take over as j → j_lim).
 */
export function checkLimitingCurrent(currentDensity: number, limitingCurrentDensity: number): SafetyCheck {
  if (!Number.isFinite(currentDensity) || currentDensity < 0) throw new InputError('currentDensity', 'must be a finite current density ≥ 0 A/m²');
  if (!Number.isFinite(limitingCurrentDensity) || limitingCurrentDensity <= 0) {
    throw new InputError('limitingCurrentDensity', 'must be a finite current density > 0 A/m²');
  }
  const ratio = currentDensity / limitingCurrentDensity;
  const level: SafetyLevel = ratio >= LIMITING_CURRENT_ALARM ? 'alarm' : ratio > LIMITING_CURRENT_CAUTION ? 'caution' : 'ok';
  const verdict =
    ratio >= 1
      ? 'at or above the limiting current: no steady state exists, the voltage runs away and side reactions take the current'
      : level === 'alarm'
        ? 'very close to the limiting current: the concentration overpotential is steep and side reactions are likely'
        : level === 'caution'
          ? 'above 80 % of the limiting current: mass transport is starting to limit the cell'
          : 'well below the limiting current';
  return {
    id: 'limiting-current',
    title: 'Current density against the limiting current',
    level,
    message: `Current density ${(currentDensity / 1e3).toFixed(2)} kA/m² is ${(100 * ratio).toFixed(1)} % of the limiting ${(limitingCurrentDensity / 1e3).toFixed(2)} kA/m²: ${verdict}.`,
    value: currentDensity,
    limit: LIMITING_CURRENT_ALARM * limitingCurrentDensity,
    cautionLimit: LIMITING_CURRENT_CAUTION * limitingCurrentDensity,
    unit: 'A/m²',
    source: 'mass-transport limit (domain primer §6); screens 80 % / 95 %: our choice',
  };
}

// ---------------------------------------------------------------------------------------------
// Static magnetic field near DC busbars.

/** Magnetic constant μ0 = 1.256 637 062 12e-6 N/A². Source: CODATA 2018. */
const MU_0 = 1.25663706212e-6;
/**
 * Static-field screens: caution from 0.5 mT (people with implanted medical devices; ICNIRP 2009
 * advice, from memory); alarm from 400 mT (ICNIRP 2009 general-public limit; occupational
 * 2 T head and trunk, 8 T limbs). Source: ICNIRP, Health Phys. 96(4) (2009) 504–514 (via a
 * secondary summary).
 */
export const MAGNETIC_FIELD_CAUTION = 0.5e-3;
export const MAGNETIC_FIELD_ALARM = 0.4;

/**
 * Magnetic flux density at distance d [m] from a long straight conductor carrying I [A]:
 * B = μ0·I/(2π·d) [T]. A single conductor, return current ignored (the higher, safe side).
 * Source: Ampère's circuital law.
 */
export function busbarMagneticField(current: number, distance: number): number {
  if (!Number.isFinite(current) || current < 0) throw new InputError('current', 'must be a finite current ≥ 0 A');
  if (!Number.isFinite(distance) || distance <= 0) throw new InputError('distance', 'must be a finite distance > 0 m');
  return (MU_0 * current) / (2 * Math.PI * distance);
}

/** Static field near a busbar (see busbarMagneticField) against the screens above. */
export function checkMagneticField(current: number, distance: number): SafetyCheck {
  const b = busbarMagneticField(current, distance);
  const level = levelOf(b, MAGNETIC_FIELD_CAUTION, MAGNETIC_FIELD_ALARM);
  const verdict =
    level === 'alarm'
      ? 'above the general-public exposure limit'
      : level === 'caution'
        ? 'above the level at which people with pacemakers or other implants should stay away; loose steel tools are pulled'
        : 'below the implant screen';
  return {
    id: 'magnetic-field',
    title: 'Static magnetic field near the busbar',
    level,
    message: `About ${(b * 1e3).toPrecision(3)} mT at ${distance.toPrecision(3)} m from ${(current / 1e3).toPrecision(4)} kA: ${verdict}.`,
    value: b,
    limit: MAGNETIC_FIELD_ALARM,
    cautionLimit: MAGNETIC_FIELD_CAUTION,
    unit: 'T',
    source: 'B = μ0·I/(2π·d) (Ampère); ICNIRP 2009 static-field guidelines (400 mT public; 0.5 mT implant advice from memory)',
  };
}

function slug(text: string): string {
  return text
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '')
    .replace(/^the-/, '');
}
