/**
 * Safety: computed hazard checks, caution texts and the governing-practice statement.
 */
import { type AnodeGasPurityInput, type SafetyCheck, anodeGasPurity, checkBoilingMargin, checkLimitingCurrent, checkMagneticField } from './checks.js';
import { CAUTIONS, type Caution, SAFETY_DISCLAIMER } from './cautions.js';

export * from './checks.js';
export * from './cautions.js';
export { waterSaturationTemperature, SATURATION_PRESSURE_MIN, SATURATION_PRESSURE_MAX } from './water.js';

export interface SafetyAssessmentInput {
  chemistry: 'water' | 'chlor-alkali';
  /** Anode-gas purity from crossover (operating point and minimum load). */
  anodeGas?: Omit<AnodeGasPurityInput, 'chemistry'>;
  /** Electrolyte temperature K and absolute pressure Pa, optional boiling-point elevation K. */
  boiling?: { temperature: number; pressure: number; boilingPointElevation?: number };
  /** Current density and limiting current density, A/m². */
  limitingCurrent?: { currentDensity: number; limitingCurrentDensity: number };
  /** Busbar current A and the nearest working distance m. */
  busbar?: { current: number; distance: number };
}

export interface SafetyAssessment {
  checks: SafetyCheck[];
  /** The worst level among the checks ('ok' when there are none). */
  worst: SafetyCheck['level'];
  /** Current density below which anode-gas H₂ reaches the trip screen, A/m² (when computed). */
  lowestCurrentDensityBelowTrip: number | null;
  cautions: readonly Caution[];
  disclaimer: string;
}

const RANK = { ok: 0, caution: 1, alarm: 2 } as const;

/**
 * Run the checks for which data are given and attach the caution texts that apply to the
 * chemistry (chlorine topics only for chlor-alkali) and the disclaimer.
 */
export function assessSafety(input: SafetyAssessmentInput): SafetyAssessment {
  const checks: SafetyCheck[] = [];
  let lowest: number | null = null;
  if (input.anodeGas) {
    const purity = anodeGasPurity({ ...input.anodeGas, chemistry: input.chemistry });
    checks.push(...purity.checks);
    lowest = purity.lowestCurrentDensityBelowTrip;
  }
  if (input.boiling) checks.push(checkBoilingMargin(input.boiling.temperature, input.boiling.pressure, { boilingPointElevation: input.boiling.boilingPointElevation }));
  if (input.limitingCurrent) checks.push(checkLimitingCurrent(input.limitingCurrent.currentDensity, input.limitingCurrent.limitingCurrentDensity));
  if (input.busbar) checks.push(checkMagneticField(input.busbar.current, input.busbar.distance));
  const worst = checks.reduce<SafetyCheck['level']>((w, c) => (RANK[c.level] > RANK[w] ? c.level : w), 'ok');
  const cautions = CAUTIONS.filter((c) => input.chemistry === 'chlor-alkali' || (c.topic !== 'chlorine' && c.topic !== 'hydrogen-chlorine'));
  return { checks, worst, lowestCurrentDensityBelowTrip: lowest, cautions, disclaimer: SAFETY_DISCLAIMER };
}
