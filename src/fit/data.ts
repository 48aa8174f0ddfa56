/**
 * The data side of a fit: which observables of an OIFITS dataset take part, which entries are usable (not
 * flagged, finite value, positive error), and their spatial frequencies.
 *
 * @module
 */
import { FitError } from '../errors.js';
import type { OifitsDataset } from '../oifits/dataset.js';

/** Observables a fit can use (OIFITS 2 names in lower case). */
export type FitObservable = 'vis2' | 't3phi' | 't3amp' | 'visamp' | 'visphi';

/** Every observable a fit knows, in the order residuals are stacked. */
export const FIT_OBSERVABLES: readonly FitObservable[] = Object.freeze([
  'vis2',
  't3phi',
  't3amp',
  'visamp',
  'visphi',
]);

/** True for observables that are phases in degrees (residuals are wrapped into (-180, 180]). */
export function isPhase(o: FitObservable): boolean {
  return o === 't3phi' || o === 'visphi';
}

/** One observable's usable entries. */
export interface DataBlock {
  readonly observable: FitObservable;
  /** Index of each entry in the dataset's flat view (`dataset.vis2`, `dataset.t3`, `dataset.vis`). */
  readonly index: Int32Array;
  /** Measured values (degrees for phases). */
  readonly data: Float64Array;
  /** 1-sigma errors. */
  readonly error: Float64Array;
  /** Relative weight of this observable in chi2 (default 1). */
  readonly weight: number;
  /** Baselines (VIS-type) in cycles per radian. */
  readonly u?: Float64Array;
  readonly v?: Float64Array;
  /** Triangles (T3-type) in cycles per radian. */
  readonly u1?: Float64Array;
  readonly v1?: Float64Array;
  readonly u2?: Float64Array;
  readonly v2?: Float64Array;
  /** Wavelength of each entry (EFF_WAVE), metres. */
  readonly wavelength: Float64Array;
  /** Channel width of each entry (EFF_BAND), metres, when bandwidth smearing is asked for; otherwise absent. */
  readonly band?: Float64Array;
  /** Record (row) of each entry in its table, and table number, for resampling by record. */
  readonly record: Int32Array;
  /** Baseline or triangle label of each entry (station names), for resampling by baseline. */
  readonly baseline: readonly string[];
}

/** Options choosing the data of a fit. */
export interface DataOptions {
  /** Observables to use; default: every one the dataset has data for. */
  readonly observables?: readonly FitObservable[];
  /** Relative weights per observable (multiply its chi2); default 1 each. */
  readonly weights?: Partial<Record<FitObservable, number>>;
  /**
   * Average the model over each channel's width (EFF_BAND) as the instrument does (bandwidth smearing; VIS2 as
   * the mean of |V|^2). Default false: the model is evaluated at EFF_WAVE only. Wavelength-dependent models are
   * always evaluated at each entry's own wavelength.
   */
  readonly bandwidthSmearing?: boolean;
}

function pick(src: Float64Array, idx: Int32Array): Float64Array {
  const out = new Float64Array(idx.length);
  for (let k = 0; k < idx.length; k++) out[k] = src[idx[k]!]!;
  return out;
}

/**
 * Gathers the usable entries of the chosen observables.
 *
 * @param dataset - an OIFITS dataset (from `readOifits`)
 * @param options - observables and weights
 * @returns one block per observable that has at least one usable entry
 * @throws FitError when a requested observable has no usable data, a weight is not positive, or nothing is left
 */
export function gatherData(dataset: OifitsDataset, options: DataOptions = {}): DataBlock[] {
  const requested = options.observables;
  if (requested !== undefined) {
    for (const o of requested) {
      if (!FIT_OBSERVABLES.includes(o)) {
        throw new FitError(`fit: unknown observable '${o}'; use one of ${FIT_OBSERVABLES.join(', ')}`, {
          argument: 'observables',
        });
      }
    }
  }
  const wanted = requested ?? FIT_OBSERVABLES;
  const blocks: DataBlock[] = [];
  for (const o of FIT_OBSERVABLES) {
    if (!wanted.includes(o)) continue;
    const weight = options.weights?.[o] ?? 1;
    if (!(weight > 0) || !Number.isFinite(weight)) {
      throw new FitError(`fit: the weight of ${o} must be a positive finite number, got ${weight}`, {
        argument: 'weights',
      });
    }
    let value: Float64Array;
    let error: Float64Array;
    let view: {
      flag: Uint8Array;
      wavelength: Float64Array;
      band: Float64Array;
      row: Int32Array;
      table: Int32Array;
      stations: readonly string[];
    };
    if (o === 'vis2') {
      view = dataset.vis2;
      value = dataset.vis2.value;
      error = dataset.vis2.error;
    } else if (o === 't3phi' || o === 't3amp') {
      view = dataset.t3;
      value = o === 't3phi' ? dataset.t3.t3phi : dataset.t3.t3amp;
      error = o === 't3phi' ? dataset.t3.t3phiError : dataset.t3.t3ampError;
    } else {
      view = dataset.vis;
      value = o === 'visamp' ? dataset.vis.visamp : dataset.vis.visphi;
      error = o === 'visamp' ? dataset.vis.visampError : dataset.vis.visphiError;
    }
    const keep: number[] = [];
    for (let i = 0; i < value.length; i++) {
      const x = value[i]!;
      const e = error[i]!;
      if (view.flag[i] === 0 && Number.isFinite(x) && Number.isFinite(e) && e > 0) keep.push(i);
    }
    if (keep.length === 0) {
      if (requested?.includes(o)) {
        throw new FitError(
          `fit: the dataset${dataset.name ? ` ${dataset.name}` : ''} has no usable ${o} data (every entry is flagged, NaN or has no error)`,
          { file: dataset.name, argument: 'observables' },
        );
      }
      continue;
    }
    const index = Int32Array.from(keep);
    const record = new Int32Array(index.length);
    for (let k = 0; k < index.length; k++)
      record[k] = view.table[index[k]!]! * 1_000_000 + view.row[index[k]!]!;
    const common = {
      observable: o,
      index,
      data: pick(value, index),
      error: pick(error, index),
      weight,
      wavelength: pick(view.wavelength, index),
      ...(options.bandwidthSmearing ? { band: pick(view.band, index) } : {}),
      record,
      baseline: keep.map((i) => view.stations[i] ?? ''),
    };
    if (o === 't3phi' || o === 't3amp') {
      blocks.push({
        ...common,
        u1: pick(dataset.t3.u1, index),
        v1: pick(dataset.t3.v1, index),
        u2: pick(dataset.t3.u2, index),
        v2: pick(dataset.t3.v2, index),
      });
    } else {
      const src = o === 'vis2' ? dataset.vis2 : dataset.vis;
      blocks.push({ ...common, u: pick(src.u, index), v: pick(src.v, index) });
    }
  }
  if (blocks.length === 0) {
    throw new FitError(
      `fit: the dataset${dataset.name ? ` ${dataset.name}` : ''} has no usable data for ${wanted.join(', ')}`,
      { file: dataset.name },
    );
  }
  return blocks;
}

/** Total number of residuals of some blocks. */
export function countData(blocks: readonly DataBlock[]): number {
  let n = 0;
  for (const b of blocks) n += b.data.length;
  return n;
}
