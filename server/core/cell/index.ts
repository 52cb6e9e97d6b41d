/**
 * Public entry point of the cell model (voltage balance, current efficiency, sweeps,
 * uncertainty). Web routes and plant calculations import from here.
 */
export { cellDefinitionSchema, parseCellDefinition, MAX_SWEEP_POINTS } from './schema.js';
export { prepareCell, voltageBalance } from './balance.js';
export type { PreparedCell, PreparedElectrode, BalancePoint, BalanceFlags } from './balance.js';
export { sweepCell, sweepPrepared, evaluatePoint, kFactorLine, cellModelEvaluator, K_FACTOR_DEFAULT_LOWER_FRACTION, K_FACTOR_MIN_POINTS } from './sweep.js';
export {
  currentEfficiencyAt,
  solveCompetingAnode,
  gasPurityWarnings,
  HYDROGEN_LFL_IN_OXYGEN_PERCENT,
  TRIP_FRACTION_OF_LFL,
  HYDROGEN_IN_OXYGEN_ALARM_PERCENT,
  SAFETY_CAUTION,
} from './efficiency.js';
export { voltageBand, DEFAULT_SAMPLES, DEFAULT_SEED, MAX_SAMPLES, BAND_COVERAGE } from './uncertainty.js';
export type { VoltageBandOptions, VoltageBandResult, BandPoint, BandStatistics, DeltaStatistics, UncertainParameter } from './uncertainty.js';
export type * from './types.js';
