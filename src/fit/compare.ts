/**
 * Model comparison: fit several candidate models to one dataset and rank them by an information criterion
 * (AIC or BIC).
 *
 * @module
 */
import { FitError, ModelError } from '../errors.js';
import type { Model } from '../model/model.js';
import { parameterVector } from '../observe/parameters.js';
import type { OifitsDataset } from '../oifits/dataset.js';
import { correlationWhitening, whiten } from './correlations.js';
import { countData, type DataOptions, gatherData } from './data.js';
import {
  type FitOptions,
  type FitResult,
  finishFit,
  type Progress,
  prepareFit,
  solvePrepared,
} from './fit.js';
import { checkAborted } from './lm.js';
import { residualsAt } from './residuals.js';
import { sumOfSquares } from './stats.js';

/** A candidate model of a comparison. */
export interface Candidate {
  /** Name shown in the table (unique within a comparison). */
  readonly name: string;
  /** The model; its free parameters are fitted (none: it is only evaluated). */
  readonly model: Model;
  /**
   * Starting values per parameter name whose Cartesian product gives starts (other parameters start at their
   * params' values), as in `gridSearch`.
   */
  readonly grid?: Readonly<Record<string, readonly number[]>>;
  /** Further explicit starts (records by name; names left out start at their params' values). */
  readonly starts?: readonly Readonly<Record<string, number>>[];
  /**
   * Run Levenberg-Marquardt only from the `keep` starts of lowest chi2 at the start itself (default: every
   * start). A cheap screen for large grids of starts.
   */
  readonly keep?: number;
}

/** Information criteria a comparison can rank by. */
export type InformationCriterion = 'bic' | 'aic';

/** Options of {@link compare}. */
export interface CompareOptions extends DataOptions, Pick<FitOptions, 'maxIterations' | 'tolerances'> {
  /** Criterion of the ranking (default 'bic'). */
  readonly criterion?: InformationCriterion;
  /** Called after every start (fraction of all starts done, lowest chi2 of any candidate so far). */
  readonly onProgress?: (p: Progress) => void;
  /** Cancels between starts (a FitError is thrown). */
  readonly signal?: AbortSignal;
}

/** One row of a comparison table. */
export interface ComparisonRow {
  /** The candidate's name. */
  readonly name: string;
  /** Rank by the chosen criterion, 1 = preferred (failed candidates come last). */
  readonly rank: number;
  /** Number of free parameters k. */
  readonly k: number;
  /** Number of data entries n. */
  readonly n: number;
  /** Degrees of freedom n - k. */
  readonly dof: number;
  /** chi2 at the best fit (weighted, as in `fit`). */
  readonly chi2: number;
  /** chi2 / dof. */
  readonly reducedChi2: number;
  /** Akaike information criterion chi2 + 2k. */
  readonly aic: number;
  /** Bayesian (Schwarz) information criterion chi2 + k ln n. */
  readonly bic: number;
  /** aic minus the lowest aic of the table. */
  readonly deltaAic: number;
  /** bic minus the lowest bic of the table. */
  readonly deltaBic: number;
  /**
   * Relative weight exp(-delta / 2) of the chosen criterion, normalised over the table (Akaike weights for AIC;
   * for BIC an approximation to posterior model probabilities with equal prior odds).
   */
  readonly weight: number;
  /** Best-fit values by name (slot units: mas, degrees, flux); empty for a model without free parameters. */
  readonly values: Readonly<Record<string, number>>;
  /** 1-sigma uncertainties from the fit, or null when the fit could not give them (see `note`). */
  readonly uncertainties: Readonly<Record<string, number>> | null;
  /** The full fit result, or null (no free parameters, or uncertainties unavailable). */
  readonly fit: FitResult | null;
  /** The best-fit numeric model. */
  readonly model: Model;
  /** Number of starts from which Levenberg-Marquardt ran. */
  readonly starts: number;
  /** Why uncertainties are missing or the candidate failed; absent when all went well. */
  readonly note?: string;
}

/** The outcome of {@link compare}. */
export interface Comparison {
  /** Criterion of the ranking. */
  readonly criterion: InformationCriterion;
  /** Number of data entries. */
  readonly n: number;
  /** Rows ordered by rank. */
  readonly rows: readonly ComparisonRow[];
  /** The preferred row (rank 1). */
  readonly best: ComparisonRow;
}

function product(axes: readonly [string, readonly number[]][]): Record<string, number>[] {
  let out: Record<string, number>[] = [{}];
  for (const [name, values] of axes)
    out = out.flatMap((prefix) => values.map((x) => ({ ...prefix, [name]: x })));
  return out;
}

function normaliseCandidates(
  models: readonly Candidate[] | Readonly<Record<string, Model | Omit<Candidate, 'name'>>>,
): Candidate[] {
  const list: Candidate[] = Array.isArray(models)
    ? [...(models as readonly Candidate[])]
    : Object.entries(models as Readonly<Record<string, Model | Omit<Candidate, 'name'>>>).map(([name, c]) =>
        'node' in c ? { name, model: c as Model } : { ...(c as Omit<Candidate, 'name'>), name },
      );
  if (list.length === 0)
    throw new FitError('compare: give at least one candidate model', { argument: 'models' });
  const seen = new Set<string>();
  for (const c of list) {
    if (typeof c?.name !== 'string' || c.name === '' || typeof c.model?.parameters !== 'function') {
      throw new FitError('compare: every candidate needs a non-empty name and a model', {
        argument: 'models',
      });
    }
    if (seen.has(c.name)) {
      throw new FitError(`compare: two candidates are named '${c.name}'; names must be unique`, {
        argument: 'models',
      });
    }
    seen.add(c.name);
    if (c.keep !== undefined && !(Number.isInteger(c.keep) && c.keep >= 1)) {
      throw new FitError(`compare: candidate '${c.name}': keep must be an integer >= 1, got ${c.keep}`, {
        argument: 'keep',
      });
    }
  }
  return list;
}

/**
 * Fits each candidate model to a dataset and ranks them by an information criterion.
 *
 * @param models - candidates: an array of {@link Candidate} (name, model, optional `grid` / `starts` of
 *   starting values, `keep`), or a record from name to a model or to a candidate without its name
 * @param dataset - an OIFITS dataset
 * @param options - observables and weights (the same data for every candidate), the ranking `criterion`
 *   (default 'bic'), LM iteration limit and tolerances, progress and AbortSignal
 * @returns the table ordered by rank: per candidate k, n, dof, chi2, reduced chi2, AIC, BIC, their differences
 *   to the lowest, the criterion weight, best values and uncertainties, the fit and the best model
 * @throws FitError for no candidates, duplicate names, a grid key that is not a free parameter, no usable data,
 *   or cancellation; ModelError for starts outside the bounds
 *
 * Notes: AIC = chi2 + 2k (Akaike 1974, IEEE Trans. Autom. Control 19:716) and BIC = chi2 + k ln n (Schwarz
 * 1978, Ann. Stat. 6:461), with k the free parameters and n the data entries. Both are written in terms of
 * -2 ln L_max; for independent Gaussian errors -2 ln L = chi2 + a constant that is the same for every model
 * of the same data, so it drops out of every difference. With observable weights other than 1 the chi2 is no
 * longer -2 ln L and the criteria are heuristics. Each candidate is fitted by Levenberg-Marquardt (the fit
 * layer's solver) from its params' values and from every start of its grid (optionally screened by chi2 at
 * the start), keeping the lowest chi2; `fit`'s uncertainties are attached when the best fit has them (a
 * nested model whose extra parameters end unconstrained, such as a companion of zero flux, still gets its
 * chi2 and criteria, with `uncertainties` null and a `note`). Rows that failed entirely (no start inside the
 * bounds) get chi2 NaN and rank last. The journal references are from memory. The weights exp(-delta / 2) are
 * the usual Akaike weights (Burnham & Anderson 2002, "Model Selection and Multimodel Inference", from memory).
 * @example
 * ```ts
 * const table = compare(
 *   { disk: disk({ diameter: param('diameter', 2, { min: 0 }) }), gaussian: gaussian({ fwhm: param('fwhm', 2, { min: 0 }) }) },
 *   dataset,
 * );
 * table.best.name; // 'disk' for data of a uniform disk
 * table.rows[1].deltaBic; // > 10: strong preference
 * ```
 */
export function compare(
  models: readonly Candidate[] | Readonly<Record<string, Model | Omit<Candidate, 'name'>>>,
  dataset: OifitsDataset,
  options: CompareOptions = {},
): Comparison {
  const candidates = normaliseCandidates(models);
  const criterion = options.criterion ?? 'bic';
  if (criterion !== 'bic' && criterion !== 'aic') {
    throw new FitError(`compare: criterion must be 'bic' or 'aic', got ${String(criterion)}`, {
      argument: 'criterion',
    });
  }
  const blocks = gatherData(dataset, options);
  const n = countData(blocks);
  const r = new Float64Array(n);
  const white = correlationWhitening(dataset, blocks);
  const chi2Of = (m: Model): number => {
    residualsAt(m, blocks, r);
    if (white) whiten(white, r);
    return sumOfSquares(r);
  };

  // starting vectors of every candidate
  const plans = candidates.map((c) => {
    const names = c.model.parameters();
    for (const key of [...Object.keys(c.grid ?? {}), ...(c.starts ?? []).flatMap((s) => Object.keys(s))]) {
      if (!names.includes(key)) {
        throw new FitError(
          `compare: candidate '${c.name}': '${key}' is not a free parameter; free parameters: ${names.join(', ') || 'none'}`,
          { parameter: key },
        );
      }
    }
    for (const [key, values] of Object.entries(c.grid ?? {})) {
      if (!Array.isArray(values) || values.length === 0 || !values.every(Number.isFinite)) {
        throw new FitError(
          `compare: candidate '${c.name}': the grid of '${key}' must be a non-empty array of finite numbers`,
          { parameter: key },
        );
      }
    }
    const prep = prepareFit(c.model, blocks, white);
    let base: Float64Array;
    try {
      base = parameterVector(c.model);
    } catch (e) {
      if (e instanceof ModelError)
        throw new ModelError(`compare: candidate '${c.name}': ${e.message}`, e.location);
      throw e;
    }
    const records = [
      ...(c.grid && Object.keys(c.grid).length > 0 ? product(Object.entries(c.grid)) : []),
      ...(c.starts ?? []),
    ];
    if (records.length === 0) records.push({});
    const starts = records
      .map((rec) => {
        const s = base.slice();
        for (const [key, x] of Object.entries(rec)) s[names.indexOf(key)] = x;
        return s;
      })
      .filter((s) => s.every((x, i) => x >= prep.lower[i]! && x <= prep.upper[i]!));
    return { candidate: c, names, prep, starts };
  });
  const totalStarts = plans.reduce((t, p) => t + Math.max(1, p.starts.length), 0);
  let done = 0;
  let bestChi2 = Number.POSITIVE_INFINITY;
  const progress = () => options.onProgress?.({ fraction: done / totalStarts, bestChi2, step: done });

  const fitted = plans.map(({ candidate, names, prep, starts }) => {
    const k = names.length;
    const dof = n - k;
    if (k === 0) {
      checkAborted(options.signal, 'compare');
      const chi2 = chi2Of(candidate.model);
      bestChi2 = Math.min(bestChi2, chi2);
      done++;
      progress();
      return {
        name: candidate.name,
        k,
        chi2,
        dof,
        values: Object.freeze({}),
        uncertainties: Object.freeze({}),
        fit: null,
        model: candidate.model,
        starts: 0,
      };
    }
    if (starts.length === 0) {
      done++;
      progress();
      return {
        name: candidate.name,
        k,
        chi2: Number.NaN,
        dof,
        values: Object.freeze({}),
        uncertainties: null,
        fit: null,
        model: candidate.model,
        starts: 0,
        note: 'every start lies outside the parameter bounds',
      };
    }
    // optional screen: keep the starts of lowest chi2 at the start itself
    let run = starts;
    if (candidate.keep !== undefined && candidate.keep < starts.length) {
      const scored = starts.map((s) => {
        checkAborted(options.signal, 'compare');
        let c = Number.POSITIVE_INFINITY;
        try {
          c = chi2Of(candidate.model.at(s));
        } catch (e) {
          if (!(e instanceof ModelError)) throw e;
        }
        return { s, c: Number.isNaN(c) ? Number.POSITIVE_INFINITY : c };
      });
      scored.sort((x, y) => x.c - y.c);
      run = scored.slice(0, candidate.keep).map((x) => x.s);
      done += starts.length - run.length;
    }
    let best: ReturnType<typeof solvePrepared> | null = null;
    for (const s of run) {
      checkAborted(options.signal, 'compare');
      const sol = solvePrepared(prep, s, {
        ...(options.maxIterations !== undefined ? { maxIterations: options.maxIterations } : {}),
        ...(options.tolerances ? { tolerances: options.tolerances } : {}),
        ...(options.signal ? { signal: options.signal } : {}),
      });
      if (best === null || sol.chi2 < best.chi2) best = sol;
      bestChi2 = Math.min(bestChi2, sol.chi2);
      done++;
      progress();
    }
    const sol = best!;
    const values = Object.freeze(Object.fromEntries(names.map((name, i) => [name, sol.p[i]!])));
    let result: FitResult | null = null;
    let note: string | undefined;
    try {
      result = finishFit(prep, dataset, options, sol);
    } catch (e) {
      if (!(e instanceof FitError)) throw e;
      note = `no uncertainties: ${e.message}`;
    }
    return {
      name: candidate.name,
      k,
      chi2: sol.chi2,
      dof,
      values,
      uncertainties: result ? result.uncertainties : null,
      fit: result,
      model: result ? result.model : candidate.model.at(sol.p),
      starts: run.length,
      ...(note !== undefined ? { note } : {}),
    };
  });

  const logN = Math.log(n);
  const scored = fitted.map((f) => ({ ...f, aic: f.chi2 + 2 * f.k, bic: f.chi2 + f.k * logN }));
  const minAic = Math.min(...scored.map((s) => (Number.isNaN(s.aic) ? Number.POSITIVE_INFINITY : s.aic)));
  const minBic = Math.min(...scored.map((s) => (Number.isNaN(s.bic) ? Number.POSITIVE_INFINITY : s.bic)));
  const key = (s: (typeof scored)[number]) => (criterion === 'bic' ? s.bic : s.aic);
  const order = scored
    .map((s, i) => ({ s, i }))
    .sort((x, y) => {
      const a = key(x.s);
      const b = key(y.s);
      if (Number.isNaN(a) || Number.isNaN(b)) return Number.isNaN(a) ? (Number.isNaN(b) ? x.i - y.i : 1) : -1;
      return a - b || x.i - y.i;
    });
  const minKey = criterion === 'bic' ? minBic : minAic;
  const rel = order.map(({ s }) => (Number.isNaN(key(s)) ? 0 : Math.exp(-0.5 * (key(s) - minKey))));
  const relSum = rel.reduce((x, y) => x + y, 0);
  const rows: ComparisonRow[] = order.map(({ s }, rank) =>
    Object.freeze({
      name: s.name,
      rank: rank + 1,
      k: s.k,
      n,
      dof: s.dof,
      chi2: s.chi2,
      reducedChi2: s.dof > 0 ? s.chi2 / s.dof : Number.NaN,
      aic: s.aic,
      bic: s.bic,
      deltaAic: s.aic - minAic,
      deltaBic: s.bic - minBic,
      weight: relSum > 0 ? rel[rank]! / relSum : Number.NaN,
      values: s.values,
      uncertainties: s.uncertainties,
      fit: s.fit,
      model: s.model,
      starts: s.starts,
      ...('note' in s && s.note !== undefined ? { note: s.note } : {}),
    }),
  );
  done = totalStarts;
  progress();
  return Object.freeze({ criterion, n, rows: Object.freeze(rows), best: rows[0]! });
}
