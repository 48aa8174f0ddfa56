/**
 * uvsky/oifits: reading, validating, selecting, concatenating, writing and simulating OIFITS files
 * (OIFITS 2, Duvert, Young & Hummel 2017, A&A 597:A8; OIFITS 1, Pauls et al. 2005, PASP 117:1255) with an
 * own FITS codec (FITS standard 4.0). Works on bytes (browser, Deno, Node); `uvsky/oifits/node` adds
 * `readOifitsFile(path)`.
 *
 * @module
 */

export { concatOifits } from './concat.js';
export type {
  BaselineColumns,
  FlatCommon,
  FluxView,
  OifitsDataset,
  OiTable,
  OiTables,
  T3View,
  TargetInfo,
  Vis2View,
  VisView,
} from './dataset.js';
export type { BinaryTable, ColumnData, TableColumn, Tform, TformCode } from './fits/bintable.js';
export { parseTform } from './fits/bintable.js';
export type { CardKind, CardValue, HeaderCard } from './fits/header.js';
export { FitsHeader, formatFloat } from './fits/header.js';
export {
  type PlanArray,
  type PlanErrors,
  type PlanInstrument,
  type PlanObservationOptions,
  type PlanStation,
  type PlanTarget,
  type ProjectedBaseline,
  planObservation,
  projectBaseline,
} from './observe-plan.js';
export { type Random, seededRandom } from './random.js';
export { type ReadOifitsOptions, readOifits } from './read.js';
export type { OiTableName } from './schema.js';
export { type OifitsSelection, type Range, selectOifits } from './select.js';
export {
  type SimulateOptions,
  type Simulation,
  type SimulationModel,
  simulate,
  type WavelengthSimulationModel,
} from './simulate.js';
export { type WriteOifitsOptions, writeOifits } from './write.js';
