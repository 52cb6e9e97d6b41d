/** Public entry of the electrode-kinetics core. */
export * from './models.js';
export * from './types.js';
export { fitKinetics } from './fit.js';
export type { KineticsFitInput, KineticsFitResult, KineticsParameters } from './fit.js';
export { fitTafel, tafelParameters } from './tafel.js';
export type { TafelFitOptions, TafelFitResult, TafelParameters, TafelWindow } from './tafel.js';
export { fitButlerVolmer } from './butler-volmer.js';
export type { ButlerVolmerFitOptions, ButlerVolmerFitResult, ButlerVolmerParameters } from './butler-volmer.js';
export { compareTafelButlerVolmer } from './compare.js';
export type { CompareOptions, ModelComparison, ModelSummary } from './compare.js';
export { pairFromCovariance, tafelWorkingBranchUncertainty, WORKING_BRANCH_LN_J0, workingTransferCoefficientKey } from './working-branch.js';
export type { WorkingBranchUncertainty } from './working-branch.js';
export { fitArrhenius } from './arrhenius.js';
export type { ArrheniusPoint, ArrheniusOptions, ArrheniusResult } from './arrhenius.js';
export { AUTO_WINDOW_RULE, lowFieldLimit } from './window.js';
export * from './reference-electrodes.js';
export { MAX_POINTS } from './validate.js';
