/**
 * Grid searches: Levenberg-Marquardt started from every node of a grid, and the companion search built on it
 * (detection significance against the single-star model, and a map of upper limits on companion flux).
 *
 * @module
 */
import { FitError } from '../errors.js';
import { type Model, point, sum } from '../model/model.js';
import { param } from '../model/param.js';
import { parameterVector } from '../observe/parameters.js';
import type { OifitsDataset } from '../oifits/dataset.js';
import { correlationWhitening, whiten } from './correlations.js';
import { countData, gatherData } from './data.js';
import { type FitOptions, type FitResult, finishFit, prepareFit, solvePrepared } from './fit.js';
import { checkAborted } from './lm.js';
import { residualsAt } from './residuals.js';
import { chi2Survival, sigmaFromProbability, sumOfSquares } from './stats.js';

/** Options of {@link gridSearch}. */
export interface GridOptions extends FitOptions {
  /** Starting values per parameter name: the grid is their Cartesian product (first name varies slowest). */
  readonly grid: Readonly<Record<string, readonly number[]>>;
  /** How many distinct minima to report (default 5). */
  readonly minima?: number;
}

/** One node of a grid search. */
export interface GridNode {
  /** The starting values of the gridded parameters. */
  readonly start: Readonly<Record<string, number>>;
  /** Where LM ended, by parameter name. */
  readonly values: Readonly<Record<string, number>>;
  /** chi2 at the end point. */
  readonly chi2: number;
}

/** The outcome of a grid search. */
export interface GridResult {
  /** Gridded parameter names and their node values. */
  readonly axes: readonly { readonly name: string; readonly values: readonly number[] }[];
  /** chi2 after LM from each node, row-major over `axes` (first axis slowest). */
  readonly chi2Map: Float64Array;
  /** Every node. */
  readonly nodes: readonly GridNode[];
  /** The best distinct minima, lowest chi2 first (end points closer than 1e-3 of the grid spacing merge). */
  readonly minima: readonly GridNode[];
  /** The full fit result of the best minimum. */
  readonly best: FitResult;
}

function product(axes: readonly { name: string; values: readonly number[] }[]): number[][] {
  let out: number[][] = [[]];
  for (const a of axes) out = out.flatMap((prefix) => a.values.map((x) => [...prefix, x]));
  return out;
}

/**
 * Starts a least-squares fit from every node of a grid of starting values and keeps the chi2 map.
 *
 * @param model - a model with free parameters; every grid key must be one of them
 * @param dataset - an OIFITS dataset
 * @param options - `grid` (values per parameter), the number of `minima` to report, and the fit options
 *   (progress is reported per node: fraction of nodes done and the best chi2 so far)
 * @returns the chi2 map, every node, the distinct minima and the best fit
 * @throws FitError for an unknown grid parameter, an empty axis, or cancellation
 *
 * Notes: nodes whose starting values fall outside a parameter's bounds are skipped (chi2 NaN in the map is
 * avoided: such a node gets +Infinity). The search runs on the calling thread.
 * @example
 * ```ts
 * const g = gridSearch(binary, dataset, { grid: { east: [-10, 0, 10], north: [-10, 0, 10] } });
 * g.minima[0].values.east; // the best separation east, mas
 * ```
 */
export function gridSearch(model: Model, dataset: OifitsDataset, options: GridOptions): GridResult {
  const names = model.parameters();
  const axes = Object.entries(options.grid).map(([name, values]) => {
    if (!names.includes(name)) {
      throw new FitError(
        `gridSearch: '${name}' is not a free parameter; free parameters: ${names.join(', ')}`,
        {
          parameter: name,
        },
      );
    }
    if (!Array.isArray(values) || values.length === 0 || !values.every(Number.isFinite)) {
      throw new FitError(`gridSearch: the grid of '${name}' must be a non-empty array of finite numbers`, {
        parameter: name,
      });
    }
    return { name, values: [...values] };
  });
  if (axes.length === 0)
    throw new FitError('gridSearch: give at least one gridded parameter', { argument: 'grid' });
  const blocks = gatherData(dataset, options);
  const prep = prepareFit(model, blocks, correlationWhitening(dataset, blocks));
  const base = parameterVector(model, options.start);
  const combos = product(axes);
  const chi2Map = new Float64Array(combos.length);
  const nodes: GridNode[] = [];
  let bestChi2 = Number.POSITIVE_INFINITY;
  let bestSol: ReturnType<typeof solvePrepared> | null = null;
  const record = (xs: ArrayLike<number>) =>
    Object.freeze(Object.fromEntries(names.map((n, i) => [n, xs[i]!])));
  combos.forEach((combo, k) => {
    checkAborted(options.signal, 'gridSearch');
    const start = base.slice();
    axes.forEach((a, i) => {
      start[names.indexOf(a.name)] = combo[i]!;
    });
    const inside = start.every((x, i) => x >= prep.lower[i]! && x <= prep.upper[i]!);
    let chi2 = Number.POSITIVE_INFINITY;
    let end: Float64Array = start;
    if (inside) {
      const sol = solvePrepared(prep, start, { ...options, onProgress: undefined });
      chi2 = sol.chi2;
      end = sol.p;
      if (chi2 < bestChi2) {
        bestChi2 = chi2;
        bestSol = sol;
      }
    }
    chi2Map[k] = chi2;
    nodes.push({
      start: Object.freeze(Object.fromEntries(axes.map((a, i) => [a.name, combo[i]!]))),
      values: record(end),
      chi2,
    });
    options.onProgress?.({ fraction: (k + 1) / combos.length, bestChi2, step: k + 1 });
  });
  if (bestSol === null)
    throw new FitError('gridSearch: every grid node lies outside the parameter bounds', { argument: 'grid' });
  const minima = distinctMinima(nodes, axes, options.minima ?? 5);
  return {
    axes: axes.map((a) => Object.freeze({ name: a.name, values: Object.freeze(a.values) })),
    chi2Map,
    nodes: Object.freeze(nodes),
    minima: Object.freeze(minima),
    best: finishFit(prep, dataset, options, bestSol),
  };
}

/**
 * @internal The best distinct end points of a grid, lowest chi2 first: end points closer than 1e-3 of the grid
 * spacing along every gridded axis count as one minimum.
 * @param nodes - every node of the grid
 * @param axes - the gridded parameters and their node values
 * @param count - how many minima to keep
 */
export function distinctMinima(
  nodes: readonly GridNode[],
  axes: readonly { readonly name: string; readonly values: readonly number[] }[],
  count: number,
): GridNode[] {
  const spacing = axes.map((a) => {
    const s = [...a.values].sort((x, y) => x - y);
    let d = Number.POSITIVE_INFINITY;
    for (let i = 1; i < s.length; i++) d = Math.min(d, s[i]! - s[i - 1]!);
    return Number.isFinite(d) && d > 0 ? d : 1;
  });
  const sorted = nodes.filter((n) => Number.isFinite(n.chi2)).sort((a, b) => a.chi2 - b.chi2);
  const minima: GridNode[] = [];
  for (const n of sorted) {
    const same = minima.some((m) =>
      axes.every((a, i) => Math.abs(m.values[a.name]! - n.values[a.name]!) <= 1e-3 * spacing[i]!),
    );
    if (!same) minima.push(n);
    if (minima.length >= count) break;
  }
  return minima;
}

/** Options of {@link companionSearch}. */
export interface CompanionOptions extends FitOptions {
  /** Grid of starting offsets east, mas. */
  readonly east: readonly number[];
  /** Grid of starting offsets north, mas. */
  readonly north: readonly number[];
  /** Starting companion flux relative to the primary's total flux (default 0.01). */
  readonly flux?: number;
  /** Upper bound on the companion flux ratio (default 1). */
  readonly maxFlux?: number;
  /** Significance (sigma) of the upper-limit map (default 3). */
  readonly sigma?: number;
}

/** The outcome of a companion search. */
export interface CompanionResult {
  /** Fit of the primary alone. */
  readonly single: FitResult;
  /** Grid search of primary + companion (parameters companionFlux, companionEast, companionNorth). */
  readonly grid: GridResult;
  /** chi2(single) - chi2(binary) at the best binary. */
  readonly deltaChi2: number;
  /** Probability of a chi2 improvement at least this large with no companion, chi2 with 3 dof. */
  readonly falseAlarmProbability: number;
  /** That probability as a two-sided Gaussian significance (sigma). */
  readonly significance: number;
  /** Upper limit on the companion flux ratio at each (east, north) node, row-major, east slowest. */
  readonly upperLimits: Float64Array;
  /** The sigma of the upper limits. */
  readonly upperLimitSigma: number;
}

/**
 * Searches for a faint point companion around a primary model.
 *
 * @param primary - the model of the primary alone (its free parameters are fitted in both hypotheses)
 * @param dataset - an OIFITS dataset
 * @param options - the east / north grid (mas), starting and maximum flux ratio, the limit's sigma, fit options
 * @returns the single-star fit, the binary grid search, the detection significance and the upper-limit map
 *
 * Notes: the binary adds `point().weight(companionFlux * F).shift(companionEast, companionNorth)` with F the
 * primary's flux. Significance: by Wilks' theorem the chi2 improvement of the nested binary model over the single
 * star follows chi2 with 3 degrees of freedom (flux, east, north) when there is no companion; its tail
 * probability is turned into a two-sided Gaussian sigma. This is the usual approximation; it is
 * conservative-to-optimistic depending on how many independent positions the grid covers (look-elsewhere effect is
 * not included). Upper limits: with the primary at its single-star best fit and the companion held at each node,
 * the smallest flux ratio f whose chi2 exceeds chi2(f = 0) by sigma^2 (1 dof), found by stepping in log f and
 * bisection.
 */
export function companionSearch(
  primary: Model,
  dataset: OifitsDataset,
  options: CompanionOptions,
): CompanionResult {
  const names = primary.parameters();
  for (const n of ['companionFlux', 'companionEast', 'companionNorth']) {
    if (primary.parameterInfo().some((p) => p.name === n)) {
      throw new FitError(`companionSearch: the primary already has a parameter named '${n}'; rename it`, {
        parameter: n,
      });
    }
  }
  const sigma = options.sigma ?? 3;
  const maxFlux = options.maxFlux ?? 1;
  const f0 = primary.flux;
  let single: FitResult | null = null;
  if (names.length > 0) {
    const bl = gatherData(dataset, options);
    const prep = prepareFit(primary, bl, correlationWhitening(dataset, bl));
    const sol = solvePrepared(prep, parameterVector(primary, options.start), {
      ...options,
      onProgress: undefined,
    });
    single = finishFit(prep, dataset, options, sol);
  }
  const singleModel = single?.model ?? primary;
  const blocks = gatherData(dataset, options);
  const white = correlationWhitening(dataset, blocks);
  const r = new Float64Array(countData(blocks));
  const chi2Of = (m: Model) => {
    residualsAt(m, blocks, r);
    if (white) whiten(white, r);
    return sumOfSquares(r);
  };
  const chi2Single = chi2Of(singleModel);
  const ratio = param('companionFlux', options.flux ?? 0.01, { min: 0, max: maxFlux });
  const binary = sum(
    primary,
    point()
      .weight(ratio)
      .weight(f0)
      .shift(param('companionEast', options.east[0] ?? 0), param('companionNorth', options.north[0] ?? 0)),
  );
  const grid = gridSearch(binary, dataset, {
    ...options,
    start: { ...(single ? single.values : {}) },
    grid: { companionEast: options.east, companionNorth: options.north },
  });
  const deltaChi2 = Math.max(0, chi2Single - grid.best.chi2);
  const falseAlarmProbability = chi2Survival(deltaChi2, 3);
  const threshold = sigma * sigma;
  const upperLimits = new Float64Array(options.east.length * options.north.length);
  let k = 0;
  for (const e of options.east) {
    for (const n of options.north) {
      checkAborted(options.signal, 'companionSearch');
      const chi2At = (f: number) => {
        const m = sum(
          singleModel,
          point()
            .weight(f * f0)
            .shift(e, n),
        );
        residualsAt(m, blocks, r);
        return sumOfSquares(r) - chi2Single;
      };
      let lo = 0;
      let hi = 1e-5 * maxFlux;
      while (hi < maxFlux && chi2At(hi) < threshold) {
        lo = hi;
        hi *= 2;
      }
      if (hi >= maxFlux) {
        hi = maxFlux;
        if (chi2At(hi) < threshold) {
          upperLimits[k++] = Number.POSITIVE_INFINITY; // not excluded at any flux up to maxFlux
          continue;
        }
      }
      for (let it = 0; it < 60 && hi - lo > 1e-6 * hi; it++) {
        const mid = 0.5 * (lo + hi);
        if (chi2At(mid) < threshold) lo = mid;
        else hi = mid;
      }
      upperLimits[k++] = hi;
    }
  }
  const singleResult =
    single ??
    ({
      parameters: [],
      values: {},
      uncertainties: {},
      scaledUncertainties: {},
      covariance: [],
      correlation: [],
      chi2: chi2Single,
      correlatedValues: white?.correlated ?? 0,
      reducedChi2: chi2Single / countData(blocks),
      dof: countData(blocks),
      perObservable: {},
      iterations: 0,
      reason: 'no free parameters',
      converged: true,
      atBound: [],
      model: primary,
      residuals: {
        observables: [],
        chi2: chi2Single,
        count: countData(blocks),
        correlatedValues: white?.correlated ?? 0,
      },
    } satisfies FitResult);
  return {
    single: singleResult,
    grid,
    deltaChi2,
    falseAlarmProbability,
    significance: sigmaFromProbability(falseAlarmProbability),
    upperLimits,
    upperLimitSigma: sigma,
  };
}
