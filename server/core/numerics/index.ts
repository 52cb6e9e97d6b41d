/**
 * Public entry point of the fitting engine. Users (kinetics/, cell/) import from here only.
 *
 * - linearLeastSquares: pivoted Householder QR + double-double iterative refinement (linear.ts).
 * - levenbergMarquardt: MINPACK-style trust-region Levenberg–Marquardt (lm.ts).
 * - studentTQuantile, confidenceInterval95, correlationMatrix: statistics helpers (stats.ts).
 */
export { linearLeastSquares } from './linear.js';
export { levenbergMarquardt } from './lm.js';
export { studentTQuantile, confidenceInterval95, correlationMatrix } from './stats.js';
export type {
  LinearFit,
  LinearFitOptions,
  NonlinearFit,
  NonlinearOptions,
  NonlinearProblem,
  NonlinearStatus,
  CovarianceScaling,
  SigmaMode,
} from './types.js';
