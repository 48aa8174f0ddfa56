/**
 * uvsky/fit: residuals, chi2, Levenberg-Marquardt fits with honest uncertainties, grid and companion searches,
 * bootstrap.
 *
 * @module
 */

export { type BootstrapOptions, type BootstrapResult, bootstrap } from './bootstrap.js';
export { type DataOptions, FIT_OBSERVABLES, type FitObservable } from './data.js';
export { type FitOptions, type FitResult, fit, type Progress } from './fit.js';
export {
  type CompanionOptions,
  type CompanionResult,
  companionSearch,
  type GridNode,
  type GridOptions,
  type GridResult,
  gridSearch,
} from './grid.js';
export type { StopReason, Tolerances } from './lm.js';
export { type ObservableResiduals, type ResidualReport, residuals } from './residuals.js';
export {
  chi2Survival,
  chi2Threshold,
  probabilityFromSigma,
  sigmaFromProbability,
  sumOfSquares,
} from './stats.js';
