/**
 * uvsky/fit: residuals, chi2, Levenberg-Marquardt fits with honest uncertainties, grid and companion searches,
 * bootstrap.
 *
 * @module
 */

export {
  ARCHETYPE_NAMES,
  type ArchetypeGuesses,
  type ArchetypeName,
  type ArchetypeOptions,
  archetypeGuesses,
  archetypes,
  compareArchetypes,
} from './archetypes.js';
export { type BootstrapOptions, type BootstrapResult, bootstrap } from './bootstrap.js';
export {
  type Candidate,
  type CompareOptions,
  type Comparison,
  type ComparisonRow,
  compare,
  type InformationCriterion,
} from './compare.js';
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
export {
  coordinateSamples,
  type McmcOptions,
  type McmcResult,
  mcmc,
  type ParameterSummary,
  type SamplerOptions,
  type SamplerProgress,
  type SamplerResult,
  sampleLogProbability,
} from './mcmc.js';
export { type ParallelGridOptions, parallelGridSearch, runGridShare } from './parallel-grid.js';
export { type ObservableResiduals, type ResidualReport, residuals } from './residuals.js';
export {
  chi2Survival,
  chi2Threshold,
  probabilityFromSigma,
  sigmaFromProbability,
  sumOfSquares,
} from './stats.js';
