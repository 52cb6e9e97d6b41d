/**
 * Small figures derived from a cell sweep's results for display: the thermodynamic voltage
 * efficiency and points on the fitted K-factor line.
 */
import { InputError } from '../errors.js';
import type { KFactorResult } from './types.js';

/**
 * Thermodynamic voltage efficiency ε_V = E_rev/U [-], the chlor-alkali habit (water
 * electrolysis quotes U_HHV/U instead, SweepPoint.voltageEfficiency).
 * reversibleVoltage E_rev [V] > 0 and cellVoltage U [V] > 0, both at the same temperature and
 * pressure. Above 1 when U < E_rev (below the decomposition voltage). Source: definition
 * (common practice).
 */
export function thermodynamicVoltageEfficiency(reversibleVoltage: number, cellVoltage: number): number {
  if (!Number.isFinite(reversibleVoltage) || reversibleVoltage <= 0) throw new InputError('reversibleVoltage', 'must be a finite voltage > 0 V');
  if (!Number.isFinite(cellVoltage) || cellVoltage <= 0) throw new InputError('cellVoltage', 'must be a finite voltage > 0 V');
  return reversibleVoltage / cellVoltage;
}

/**
 * Cell voltage on the fitted K-factor line, U = U0 + K·j [V]. line: intercept U0 [V] and slope
 * K [V/(A/m²) = Ω·m²] (sweep.ts kFactorLine); currentDensity j [A/m²], finite. Meaningful within
 * the fitted range (line.range); outside it the straight line is an extrapolation.
 * Source: domain.md §5 (common practice).
 */
export function kFactorLineVoltage(line: Pick<KFactorResult, 'intercept' | 'value'>, currentDensity: number): number {
  if (!Number.isFinite(currentDensity)) throw new InputError('currentDensity', 'must be a finite current density in A/m²');
  return line.intercept + line.value * currentDensity;
}
