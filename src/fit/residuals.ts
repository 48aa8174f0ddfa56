/**
 * Residuals of a model against data: (model - data) / error per entry, phases wrapped into (-180, 180] before
 * they are divided, each observable scaled by the square root of its weight.
 *
 * @module
 */
import type { Model } from '../model/model.js';
import type { JacobianPoints, ObservableName } from '../observe/jacobian.js';
import { observableJacobian, observableValues } from '../observe/jacobian.js';
import type { OifitsDataset } from '../oifits/dataset.js';
import { wrapDegrees } from '../units/index.js';
import { correlationWhitening, whiten } from './correlations.js';
import {
  countData,
  type DataBlock,
  type DataOptions,
  type FitObservable,
  gatherData,
  isPhase,
} from './data.js';
import { sumOfSquares } from './stats.js';

const JACOBIAN_NAME: Record<FitObservable, ObservableName> = {
  vis2: 'vis2',
  t3phi: 't3phi',
  t3amp: 't3amp',
  visamp: 'visamp',
  visphi: 'visphi',
};

/** The points of a block as the observe layer takes them (with wavelengths, and bands when smearing). */
export function blockPoints(b: DataBlock): JacobianPoints {
  const w = b.band ? { wavelength: b.wavelength, band: b.band } : { wavelength: b.wavelength };
  return b.u ? { u: b.u, v: b.v!, ...w } : { u1: b.u1!, v1: b.v1!, u2: b.u2!, v2: b.v2!, ...w };
}

/** A model's predictions of one block. */
export function predict(model: Model, b: DataBlock): Float64Array {
  return observableValues(model, JACOBIAN_NAME[b.observable], blockPoints(b));
}

/** Writes normalised residuals of `model` (predictions) for block `b` into `out` from offset `at`. */
export function writeResiduals(b: DataBlock, model: Float64Array, out: Float64Array, at: number): void {
  const w = Math.sqrt(b.weight);
  const phase = isPhase(b.observable);
  for (let k = 0; k < b.data.length; k++) {
    const d = phase ? wrapDegrees(model[k]! - b.data[k]!) : model[k]! - b.data[k]!;
    out[at + k] = (w * d) / b.error[k]!;
  }
}

/** Residuals and the Jacobian of the residuals (rows x free parameters, row-major) at a parameter vector. */
export function residualsAndJacobian(
  model: Model,
  blocks: readonly DataBlock[],
  values: Float64Array,
  r: Float64Array,
  jac: Float64Array,
): void {
  const cols = values.length;
  let at = 0;
  for (const b of blocks) {
    const j = observableJacobian(model, JACOBIAN_NAME[b.observable], blockPoints(b), values);
    writeResiduals(b, j.values, r, at);
    const w = Math.sqrt(b.weight);
    for (let k = 0; k < b.data.length; k++) {
      const s = w / b.error[k]!;
      const src = k * cols;
      const dst = (at + k) * cols;
      for (let c = 0; c < cols; c++) jac[dst + c] = s * j.jacobian[src + c]!;
    }
    at += b.data.length;
  }
}

/** Residuals only, at a numeric model. */
export function residualsAt(model: Model, blocks: readonly DataBlock[], r: Float64Array): void {
  let at = 0;
  for (const b of blocks) {
    writeResiduals(b, predict(model, b), r, at);
    at += b.data.length;
  }
}

/** One observable's part of a residual report. */
export interface ObservableResiduals {
  /** Which observable. */
  readonly observable: FitObservable;
  /** Index of each entry in the dataset's flat view. */
  readonly index: Int32Array;
  /** Model predictions. */
  readonly model: Float64Array;
  /** Data values. */
  readonly data: Float64Array;
  /** Errors. */
  readonly error: Float64Array;
  /** (model - data) / error, phases wrapped first (not weighted). */
  readonly normalised: Float64Array;
  /** Sum of squares of `normalised` (unweighted chi2 of this observable). */
  readonly chi2: number;
  /** Number of entries. */
  readonly count: number;
}

/** Residuals of a model against a dataset, per observable, with the total chi2. */
export interface ResidualReport {
  readonly observables: readonly ObservableResiduals[];
  /**
   * Weighted total chi2: the sum over observables of weight * chi2 when errors are independent, and
   * r^T R^-1 r with the OI_CORR correlations R when the dataset has them.
   */
  readonly chi2: number;
  /** Number of values whose errors are correlated through OI_CORR. */
  readonly correlatedValues: number;
  /** Number of data entries used. */
  readonly count: number;
}

/**
 * Residuals and chi2 of a model against a dataset.
 *
 * @param model - a model (free parameters at their current values)
 * @param dataset - an OIFITS dataset
 * @param options - observables (default: all the dataset has) and per-observable weights
 * @returns per-observable predictions, normalised residuals and chi2, and the weighted total
 *
 * Notes: flagged entries, NaN values and non-positive errors are left out. Correlated errors (OI_CORR with
 * CORRINDX_* columns) enter the total chi2 as r^T R^-1 r; the per-observable chi2 ignore them. Phase residuals are wrapped into
 * (-180, 180] before they are divided by the error (a model at 179 degrees and data at -179 differ by 2).
 * chi2 uses compensated (Neumaier) summation.
 * @example
 * ```ts
 * const report = residuals(disk({ diameter: 2 }), dataset);
 * report.chi2 / report.count; // about 1 for a good model
 * ```
 */
export function residuals(model: Model, dataset: OifitsDataset, options: DataOptions = {}): ResidualReport {
  const blocks = gatherData(dataset, options);
  const out: ObservableResiduals[] = [];
  let chi2 = 0;
  for (const b of blocks) {
    const m = predict(model, b);
    const n = new Float64Array(b.data.length);
    writeResiduals({ ...b, weight: 1 }, m, n, 0);
    const c = sumOfSquares(n);
    chi2 += b.weight * c;
    out.push({
      observable: b.observable,
      index: b.index,
      model: m,
      data: b.data,
      error: b.error,
      normalised: n,
      chi2: c,
      count: b.data.length,
    });
  }
  const white = correlationWhitening(dataset, blocks);
  if (white) {
    // the weighted residuals stacked as the fit stacks them, from the predictions already made
    const r = new Float64Array(countData(blocks));
    let at = 0;
    blocks.forEach((b, k) => {
      const w = Math.sqrt(b.weight);
      const n = out[k]!.normalised;
      for (let i = 0; i < n.length; i++) r[at + i] = w * n[i]!;
      at += n.length;
    });
    whiten(white, r);
    chi2 = sumOfSquares(r);
  }
  return { observables: out, chi2, count: countData(blocks), correlatedValues: white?.correlated ?? 0 };
}
