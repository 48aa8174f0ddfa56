/**
 * uvsky: a typed, immutable sky-model algebra for long-baseline interferometry.
 *
 * @module
 */
export * from './errors.js';
export { FACTOR_KINDS, type FactorKind } from './model/canonical.js';
export {
  type BlackbodyRatio,
  blackbodyRatio,
  CHECK_WAVELENGTH,
  type ChromaticSlot,
  type Coefficient,
  isChromatic,
  type PowerLawFlux,
  type PowerLawSize,
  powerLawFlux,
  powerLawSize,
  SECOND_RADIATION_CONSTANT,
} from './model/chromatic-slot.js';
export type { ComponentFactorKind } from './model/component-canonical.js';
export {
  annulus,
  background,
  DEFAULT_PROFILE_MAX_FREQUENCY,
  DEFAULT_PROFILE_SAMPLES,
  exponential,
  gaussianRing,
  type LimbDarkeningLaw,
  type LinearLaw,
  limbDarkenedDisk,
  linearLaw,
  lorentzian,
  modulatedRing,
  type PowerLaw,
  pixelImage,
  powerLaw,
  type QuadraticLaw,
  quadraticLaw,
  radialProfile,
  uniformDiskEquivalent,
} from './model/components.js';
export {
  type JsonObject,
  type JsonValue,
  MODEL_JSON_FORMAT,
  MODEL_JSON_VERSION,
  type ModelJSON,
  modelFromJSON,
  type NodeJSON,
  type ParamJSON,
} from './model/json.js';
export {
  type ComplexColumns,
  convolve,
  disk,
  EQUALS_TOLERANCE,
  ellipse,
  gaussian,
  Model,
  point,
  ring,
  sum,
  type Term,
  type TermFactor,
} from './model/model.js';
export type * from './model/nodes.js';
export { fixed, isParam, type Param, type ParamOptions, param, type Slot } from './model/param.js';
export { type Plan, type PlanFactor, type PlanTerm, ZERO_FLUX_FRACTION } from './model/plan.js';
export { type AtWavelengthsOptions, atWavelengths, type WavelengthModel } from './observe/adapter.js';
export * from './observe/chromatic.js';
export {
  type JacobianBuffers,
  type JacobianPoints,
  jacobianMatrix,
  type ObservableJacobian,
  type ObservableName,
  observableJacobian,
  observableValues,
  type ParameterValues,
  type VisibilityJacobian,
  visibilityJacobian,
  type WavelengthColumns,
} from './observe/jacobian.js';
export {
  closeParallelPool,
  MIN_POINTS_PER_THREAD,
  type ParallelOptions,
  parallelVisibilities,
  sharedFloat64Array,
} from './observe/parallel.js';
export { parameterVector } from './observe/parameters.js';
export * from './units/index.js';
