/**
 * Bootstrap uncertainties: refit on data resampled with replacement (by record, by baseline or by entry), for
 * error bars that do not trust the stated errors or their independence.
 *
 * @module
 */
import { FitError } from '../errors.js';
import type { Model } from '../model/model.js';
import type { OifitsDataset } from '../oifits/dataset.js';
import { seededRandom } from '../oifits/random.js';
import { type DataBlock, gatherData } from './data.js';
import { type FitOptions, fit, prepareFit, solvePrepared } from './fit.js';
import { checkAborted } from './lm.js';

/** Options of {@link bootstrap}. */
export interface BootstrapOptions extends FitOptions {
  /** Number of resampled fits (default 200). */
  readonly samples?: number;
  /**
   * What is drawn with replacement: 'record' (a table row with all its channels: the default, keeps the
   * correlations between channels of one exposure), 'baseline' (every entry of one baseline or triangle), or
   * 'entry' (single values).
   */
  readonly by?: 'record' | 'baseline' | 'entry';
  /** Seed of the resampling (default 1). */
  readonly seed?: number;
}

/** Bootstrap summary per parameter. */
export interface BootstrapResult {
  readonly parameters: readonly string[];
  /** Best fit on the full data. */
  readonly values: Readonly<Record<string, number>>;
  /** Standard deviation of the resampled best fits. */
  readonly uncertainties: Readonly<Record<string, number>>;
  /** 16th and 84th percentiles of the resampled best fits. */
  readonly percentiles: Readonly<Record<string, readonly [number, number]>>;
  /** Every resampled best fit, one row per sample. */
  readonly samples: readonly Readonly<Record<string, number>>[];
}

function resample(
  blocks: readonly DataBlock[],
  by: 'record' | 'baseline' | 'entry',
  rnd: () => number,
): DataBlock[] {
  // groups are drawn across all observables together, so a record's VIS2 and T3 stay together
  const key = (b: DataBlock, k: number) =>
    by === 'entry' ? `${b.observable}:${k}` : by === 'record' ? `r${b.record[k]}` : `b${b.baseline[k]}`;
  const groups = new Map<string, { b: number; k: number }[]>();
  blocks.forEach((b, bi) => {
    for (let k = 0; k < b.data.length; k++) {
      const g = key(b, k);
      const list = groups.get(g);
      if (list) list.push({ b: bi, k });
      else groups.set(g, [{ b: bi, k }]);
    }
  });
  const all = [...groups.values()];
  const picks: number[][] = blocks.map(() => []);
  for (let i = 0; i < all.length; i++) {
    const g = all[Math.floor(rnd() * all.length)]!;
    for (const { b, k } of g) picks[b]!.push(k);
  }
  return blocks
    .map((b, bi) => {
      const idx = picks[bi]!;
      const take = (a: Float64Array | undefined) => (a ? Float64Array.from(idx, (k) => a[k]!) : undefined);
      const out: DataBlock = {
        observable: b.observable,
        index: Int32Array.from(idx, (k) => b.index[k]!),
        data: take(b.data)!,
        error: take(b.error)!,
        weight: b.weight,
        wavelength: take(b.wavelength)!,
        ...(b.band ? { band: take(b.band)! } : {}),
        record: Int32Array.from(idx, (k) => b.record[k]!),
        baseline: idx.map((k) => b.baseline[k]!),
        ...(b.u ? { u: take(b.u)!, v: take(b.v)! } : {}),
        ...(b.u1 ? { u1: take(b.u1)!, v1: take(b.v1)!, u2: take(b.u2)!, v2: take(b.v2)! } : {}),
      };
      return out;
    })
    .filter((b) => b.data.length > 0);
}

function quantile(sorted: readonly number[], q: number): number {
  const pos = q * (sorted.length - 1);
  const i = Math.floor(pos);
  const f = pos - i;
  return i + 1 < sorted.length ? sorted[i]! * (1 - f) + sorted[i + 1]! * f : sorted[i]!;
}

/**
 * Bootstrap uncertainties of a fit.
 *
 * @param model - a model with free parameters
 * @param dataset - an OIFITS dataset
 * @param options - number of samples, what to resample (`by`), seed, and the fit options
 * @returns the full-data best fit, the standard deviation and 16/84 percentiles of the resampled fits, and
 *   every sample
 *
 * Notes: each resample draws as many groups as there are, with replacement (Efron & Tibshirani 1993, "An
 * Introduction to the Bootstrap", the nonparametric bootstrap), and refits from the full-data best fit.
 * Resampled fits treat errors as independent (OI_CORR correlations are not carried into the resamples; resampling
 * by record keeps a row's correlated channels together, which is the usual remedy).
 * Progress reports the fraction of samples done.
 */
export function bootstrap(
  model: Model,
  dataset: OifitsDataset,
  options: BootstrapOptions = {},
): BootstrapResult {
  const samples = options.samples ?? 200;
  if (!Number.isInteger(samples) || samples < 2) {
    throw new FitError(`bootstrap: samples must be an integer >= 2, got ${samples}`, { argument: 'samples' });
  }
  const by = options.by ?? 'record';
  const full = fit(model, dataset, { ...options, onProgress: undefined });
  const names = full.parameters;
  const start = Float64Array.from(names, (n) => full.values[n]!);
  const blocks = gatherData(dataset, options);
  const rng = seededRandom(options.seed ?? 1);
  const rows: Record<string, number>[] = [];
  for (let s = 0; s < samples; s++) {
    checkAborted(options.signal, 'bootstrap');
    const res = resample(blocks, by, () => rng.uniform());
    const sol = solvePrepared(prepareFit(model, res), start, { ...options, onProgress: undefined });
    rows.push(Object.fromEntries(names.map((n, i) => [n, sol.p[i]!])));
    options.onProgress?.({ fraction: (s + 1) / samples, bestChi2: full.chi2, step: s + 1 });
  }
  const uncertainties: Record<string, number> = {};
  const percentiles: Record<string, readonly [number, number]> = {};
  for (const n of names) {
    const xs = rows.map((r) => r[n]!);
    const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
    uncertainties[n] = Math.sqrt(xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (xs.length - 1));
    const sorted = [...xs].sort((a, b) => a - b);
    percentiles[n] = Object.freeze([quantile(sorted, 0.16), quantile(sorted, 0.84)] as const);
  }
  return {
    parameters: names,
    values: full.values,
    uncertainties: Object.freeze(uncertainties),
    percentiles: Object.freeze(percentiles),
    samples: Object.freeze(rows.map((r) => Object.freeze(r))),
  };
}
