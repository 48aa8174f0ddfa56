/**
 * Fitting a model with free parameters to an OIFITS dataset.
 *
 * @module
 */
import { inverse, Matrix } from 'ml-matrix';
import { FitError, ModelError } from '../errors.js';
import type { Model } from '../model/model.js';
import { parameterVector } from '../observe/parameters.js';
import type { OifitsDataset } from '../oifits/dataset.js';
import { correlationWhitening, type Whitening, whiten } from './correlations.js';
import { countData, type DataBlock, type DataOptions, type FitObservable, gatherData } from './data.js';
import { levenbergMarquardt, type StopReason, type Tolerances } from './lm.js';
import {
  type ResidualReport,
  residuals as residualReport,
  residualsAndJacobian,
  residualsAt,
} from './residuals.js';

/** Progress of a long computation. */
export interface Progress {
  /** Fraction done in [0, 1] (for a single fit: iterations over the iteration limit, 1 at the end). */
  readonly fraction: number;
  /** Best chi2 so far. */
  readonly bestChi2: number;
  /** Iteration (fit) or node (grid) just finished. */
  readonly step: number;
}

/** Options of {@link fit}. */
export interface FitOptions extends DataOptions {
  /** Iteration limit of Levenberg-Marquardt (default 200). */
  readonly maxIterations?: number;
  /** Convergence tolerances (defaults 1e-10). */
  readonly tolerances?: Tolerances;
  /** Starting values (array in the order of `model.parameters()`, or a record); default: the params' values. */
  readonly start?: ArrayLike<number> | Readonly<Record<string, number>>;
  /** Called after every accepted iteration. */
  readonly onProgress?: (p: Progress) => void;
  /** Cancels the fit between iterations (a FitError is thrown). */
  readonly signal?: AbortSignal;
}

/** The outcome of a fit. */
export interface FitResult {
  /** Names of the free parameters, in order. */
  readonly parameters: readonly string[];
  /** Best-fit values by name (slot units: mas, degrees, flux). */
  readonly values: Readonly<Record<string, number>>;
  /**
   * 1-sigma uncertainties from the covariance (J^T J)^-1, trusting the data's error bars as given ("raw").
   */
  readonly uncertainties: Readonly<Record<string, number>>;
  /** 1-sigma uncertainties scaled by sqrt(reduced chi2) (for error bars believed to be off by a common factor). */
  readonly scaledUncertainties: Readonly<Record<string, number>>;
  /** Covariance matrix (raw), in the order of `parameters`. */
  readonly covariance: readonly (readonly number[])[];
  /** Correlation matrix, in the order of `parameters`. */
  readonly correlation: readonly (readonly number[])[];
  /** Weighted chi2 at the best fit. */
  readonly chi2: number;
  /** chi2 / dof. */
  readonly reducedChi2: number;
  /** Degrees of freedom: data entries minus free parameters. */
  readonly dof: number;
  /** Number of data values whose errors are correlated through OI_CORR (0 when none: chi2 is then a plain sum). */
  readonly correlatedValues: number;
  /** Unweighted chi2 and entry count per observable (each ignoring correlations between values). */
  readonly perObservable: Readonly<
    Partial<Record<FitObservable, { readonly chi2: number; readonly count: number }>>
  >;
  /** Iterations run. */
  readonly iterations: number;
  /** Why the fit stopped. */
  readonly reason: StopReason;
  /** True unless it stopped at the iteration limit or found no downhill step. */
  readonly converged: boolean;
  /** Parameters that ended on a bound (their uncertainties ignore the bound). */
  readonly atBound: readonly string[];
  /** The best-fit model (numeric). */
  readonly model: Model;
  /** Residuals of the best fit, per observable. */
  readonly residuals: ResidualReport;
}

/** @internal A prepared fit problem, reused by grids and bootstrap. */
export interface PreparedFit {
  readonly model: Model;
  readonly blocks: readonly DataBlock[];
  /** Whitening of correlated errors (OI_CORR), or null. */
  readonly whitening: Whitening | null;
  readonly names: readonly string[];
  readonly lower: Float64Array;
  readonly upper: Float64Array;
}

/** @internal */
export function prepareFit(
  model: Model,
  blocks: readonly DataBlock[],
  whitening: Whitening | null = null,
): PreparedFit {
  const info = model.parameterInfo().filter((p) => !p.fixed);
  return {
    model,
    blocks,
    whitening,
    names: info.map((p) => p.name),
    lower: Float64Array.from(info, (p) => p.min),
    upper: Float64Array.from(info, (p) => p.max),
  };
}

/** @internal Runs LM on a prepared problem from `start`; returns the raw solver result. */
export function solvePrepared(
  prep: PreparedFit,
  start: Float64Array,
  options: Pick<FitOptions, 'maxIterations' | 'tolerances' | 'onProgress' | 'signal'> = {},
) {
  const rows = countData(prep.blocks);
  const cols = prep.names.length;
  const maxIterations = options.maxIterations ?? 200;
  return levenbergMarquardt(
    {
      rows,
      cols,
      residuals: (p, r) => {
        residualsAt(prep.model.at(p), prep.blocks, r);
        if (prep.whitening) whiten(prep.whitening, r);
      },
      residualsAndJacobian: (p, r, j) => {
        residualsAndJacobian(prep.model, prep.blocks, p, r, j);
        if (prep.whitening) whiten(prep.whitening, r, j, cols);
      },
    },
    start,
    {
      lower: prep.lower,
      upper: prep.upper,
      maxIterations,
      ...(options.tolerances ? { tolerances: options.tolerances } : {}),
      ...(options.signal ? { signal: options.signal } : {}),
      onIteration: (it, chi2) =>
        options.onProgress?.({ fraction: Math.min(1, it / maxIterations), bestChi2: chi2, step: it }),
    },
  );
}

function record(names: readonly string[], xs: ArrayLike<number>): Record<string, number> {
  const out: Record<string, number> = {};
  names.forEach((n, i) => {
    out[n] = xs[i]!;
  });
  return Object.freeze(out);
}

/** @internal Builds the result object from a solver result. */
export function finishFit(
  prep: PreparedFit,
  dataset: OifitsDataset,
  options: DataOptions,
  sol: ReturnType<typeof solvePrepared>,
): FitResult {
  const names = prep.names;
  const n = countData(prep.blocks);
  const cols = names.length;
  const dof = n - cols;
  const reducedChi2 = dof > 0 ? sol.chi2 / dof : Number.NaN;
  let cov: Matrix;
  if (cols === 0) cov = new Matrix(0, 0);
  else {
    try {
      cov = inverse(sol.normal);
    } catch {
      cov = inverse(sol.normal, true);
    }
  }
  const sig = Array.from({ length: cols }, (_, i) => Math.sqrt(Math.max(0, cov.get(i, i))));
  for (let i = 0; i < cols; i++) {
    if (!Number.isFinite(sig[i]!) || sol.normal.get(i, i) === 0) {
      throw new FitError(
        `fit: parameter '${names[i]}' is not constrained by the data (zero curvature of chi2); fix it or give data that depend on it`,
        { parameter: names[i]! },
      );
    }
  }
  const scale = Math.sqrt(reducedChi2 > 0 ? reducedChi2 : 1);
  const covariance = Array.from({ length: cols }, (_, i) =>
    Object.freeze(Array.from({ length: cols }, (_, j) => cov.get(i, j))),
  );
  const correlation = Array.from({ length: cols }, (_, i) =>
    Object.freeze(Array.from({ length: cols }, (_, j) => cov.get(i, j) / (sig[i]! * sig[j]!))),
  );
  const best = prep.model.at(sol.p);
  const report = residualReport(best, dataset, options);
  const perObservable: Partial<Record<FitObservable, { chi2: number; count: number }>> = {};
  for (const o of report.observables)
    perObservable[o.observable] = Object.freeze({ chi2: o.chi2, count: o.count });
  return Object.freeze({
    parameters: names,
    values: record(names, sol.p),
    uncertainties: record(names, sig),
    scaledUncertainties: record(
      names,
      sig.map((s) => s * scale),
    ),
    covariance: Object.freeze(covariance),
    correlation: Object.freeze(correlation),
    chi2: sol.chi2,
    correlatedValues: prep.whitening?.correlated ?? 0,
    reducedChi2,
    dof,
    perObservable: Object.freeze(perObservable),
    iterations: sol.iterations,
    reason: sol.reason,
    converged: sol.reason !== 'maximum iterations' && sol.reason !== 'no downhill step (damping overflow)',
    atBound: Object.freeze(names.filter((_, i) => sol.atBound[i])),
    model: best,
    residuals: report,
  });
}

/**
 * Fits a model's free parameters to a dataset by bounded Levenberg-Marquardt with analytic Jacobians.
 *
 * @param model - a model whose free parameters are `param(...)`s (bounds come from them)
 * @param dataset - an OIFITS dataset (`readOifits`)
 * @param options - observables (default: every one the dataset has), weights, start, limits, progress, cancel
 * @returns best values, raw and scaled 1-sigma uncertainties, covariance and correlation, chi2, reduced chi2,
 *   dof, per-observable chi2, iterations, the stop reason and the residuals
 * @throws FitError when there is no usable data, no free parameter, a parameter is not constrained, or the
 *   signal aborts; ModelError for invalid start values
 *
 * Notes: the covariance is (J^T J)^-1 at the best fit, with J the Jacobian of the normalised residuals; it is
 * the 1-sigma region of a linearised problem when the error bars are right. `scaledUncertainties` multiply by
 * sqrt(reduced chi2). Closure and visibility phases enter as wrapped differences.
 * @example
 * ```ts
 * const result = fit(disk({ diameter: param('diameter', 1, { min: 0 }) }), dataset);
 * result.values.diameter; // best diameter, mas
 * result.uncertainties.diameter; // 1-sigma, mas
 * ```
 */
export function fit(model: Model, dataset: OifitsDataset, options: FitOptions = {}): FitResult {
  const blocks = gatherData(dataset, options);
  const prep = prepareFit(model, blocks, correlationWhitening(dataset, blocks));
  if (prep.names.length === 0) {
    throw new FitError('fit: the model has no free parameters; put param(...) in the slots to fit', {
      argument: 'model',
    });
  }
  let start: Float64Array;
  try {
    start = parameterVector(model, options.start);
  } catch (e) {
    if (e instanceof ModelError) throw new ModelError(`fit: start values: ${e.message}`, e.location);
    throw e;
  }
  const sol = solvePrepared(prep, start, options);
  options.onProgress?.({ fraction: 1, bestChi2: sol.chi2, step: sol.iterations });
  return finishFit(prep, dataset, options, sol);
}
