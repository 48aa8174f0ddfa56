/**
 * Posterior sampling: the affine-invariant ensemble sampler of Goodman & Weare (2010) with the stretch move, on a
 * plain log-probability ({@link sampleLogProbability}) and on a model's free parameters against an OIFITS dataset
 * ({@link mcmc}), with burn-in, thinning, acceptance fractions, integrated autocorrelation times and percentile
 * summaries.
 *
 * @module
 */
import { FitError, ModelError } from '../errors.js';
import type { Model } from '../model/model.js';
import { parameterVector } from '../observe/parameters.js';
import type { OifitsDataset } from '../oifits/dataset.js';
import { seededRandom } from '../oifits/random.js';
import { correlationWhitening, whiten } from './correlations.js';
import { countData, type DataOptions, gatherData } from './data.js';
import type { FitResult, Progress } from './fit.js';
import { checkAborted } from './lm.js';
import { residualsAt } from './residuals.js';
import { sumOfSquares } from './stats.js';

/** Progress of {@link sampleLogProbability}. */
export interface SamplerProgress {
  /** Fraction of all steps (burn-in included) done, in [0, 1]. */
  readonly fraction: number;
  /** Steps done (burn-in included). */
  readonly step: number;
  /** Highest log-probability met so far. */
  readonly bestLogProbability: number;
  /** Fraction of proposals accepted so far (all walkers, burn-in included). */
  readonly acceptance: number;
}

/** Options of {@link sampleLogProbability}. */
export interface SamplerOptions {
  /** Number of walkers: even and at least twice the dimension (default max(16, 4 x dimension)). */
  readonly walkers?: number;
  /** Steps per walker kept after burn-in (default 2000). */
  readonly steps?: number;
  /** Steps per walker discarded first (default 500). */
  readonly burn?: number;
  /** Keep every `thin`-th step after burn-in (default 1). */
  readonly thin?: number;
  /** Seed of the generator (default 1). The same seed gives the same chain. */
  readonly seed?: number;
  /** Stretch-move scale a > 1 (default 2, as Goodman & Weare recommend). */
  readonly stretch?: number;
  /**
   * Standard deviation of the initial Gaussian ball around `start`, per coordinate (one number for every
   * coordinate, or one per coordinate), in the units of the coordinates; default 1e-3 x max(|start|, 1).
   */
  readonly spread?: number | ArrayLike<number>;
  /** Window constant c of Sokal's adaptive window for the autocorrelation time (default 5). */
  readonly windowConstant?: number;
  /** Called every `progressEvery` steps and at the end. */
  readonly onProgress?: (p: SamplerProgress) => void;
  /** Steps between progress calls (default 1 % of the steps, at least 1). */
  readonly progressEvery?: number;
  /** Cancels the run between steps (a FitError is thrown). */
  readonly signal?: AbortSignal;
}

/** What {@link sampleLogProbability} returns. All per-coordinate arrays have length `dimension`. */
export interface SamplerResult {
  /** Number of coordinates. */
  readonly dimension: number;
  /** Number of walkers. */
  readonly walkers: number;
  /** Steps per walker after burn-in. */
  readonly steps: number;
  /** Steps per walker discarded. */
  readonly burn: number;
  /** Thinning factor. */
  readonly thin: number;
  /** Stored steps per walker: floor(steps / thin). */
  readonly stored: number;
  /**
   * The stored chain, layout [stored step][walker][coordinate] flattened: coordinate d of walker w at stored
   * step s is `chain[(s * walkers + w) * dimension + d]`.
   */
  readonly chain: Float64Array;
  /** Log-probability of each stored position, layout [stored step][walker]. */
  readonly logProbability: Float64Array;
  /** Fraction of proposals accepted after burn-in, over all walkers. */
  readonly acceptance: number;
  /** The same per walker. */
  readonly walkerAcceptance: Float64Array;
  /** Integrated autocorrelation time of each coordinate, in steps (of the unthinned chain). */
  readonly autocorrelationTime: Float64Array;
  /**
   * True when the kept chain is at least 50 autocorrelation times long for every coordinate (below that the
   * estimate of the time itself is unreliable, as is common practice with this estimator).
   */
  readonly autocorrelationReliable: boolean;
  /** Effective number of independent samples of each coordinate: walkers x steps / tau. */
  readonly effectiveSamples: Float64Array;
  /** Sample mean of each coordinate. */
  readonly mean: Float64Array;
  /** Sample standard deviation of each coordinate. */
  readonly sd: Float64Array;
  /** Monte Carlo standard error of each mean: sd x sqrt(tau / (walkers x steps)). */
  readonly mcse: Float64Array;
  /** Median (50th percentile) of each coordinate. */
  readonly median: Float64Array;
  /** 16th percentile of each coordinate. */
  readonly lower: Float64Array;
  /** 84th percentile of each coordinate. */
  readonly upper: Float64Array;
  /** Sample covariance matrix (dimension x dimension). */
  readonly covariance: readonly (readonly number[])[];
  /** The highest-probability position met during the run (burn-in included) and its log-probability. */
  readonly best: { readonly position: Float64Array; readonly logProbability: number };
}

const DEFAULT_STEPS = 2000;
const DEFAULT_BURN = 500;
/** Redraws allowed per walker when its initial position has zero probability. */
const INIT_TRIES = 1000;
/** A chain shorter than this many autocorrelation times gives an unreliable time estimate. */
const RELIABLE_LENGTH = 50;

function positiveInteger(x: unknown, name: string, min: number): number {
  if (typeof x !== 'number' || !Number.isInteger(x) || x < min) {
    throw new FitError(`sampleLogProbability: ${name} must be an integer >= ${min}, got ${String(x)}`, {
      argument: name,
    });
  }
  return x;
}

/** In-place radix-2 complex FFT (length a power of two). */
function fft(re: Float64Array, im: Float64Array): void {
  const n = re.length;
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      let t = re[i]!;
      re[i] = re[j]!;
      re[j] = t;
      t = im[i]!;
      im[i] = im[j]!;
      im[j] = t;
    }
  }
  for (let len = 2; len <= n; len <<= 1) {
    const ang = (-2 * Math.PI) / len;
    const wr = Math.cos(ang);
    const wi = Math.sin(ang);
    const half = len >> 1;
    for (let i = 0; i < n; i += len) {
      let cr = 1;
      let ci = 0;
      for (let k = 0; k < half; k++) {
        const a = i + k;
        const b = a + half;
        const xr = re[b]! * cr - im[b]! * ci;
        const xi = re[b]! * ci + im[b]! * cr;
        re[b] = re[a]! - xr;
        im[b] = im[a]! - xi;
        re[a] = re[a]! + xr;
        im[a] = im[a]! + xi;
        const t = cr * wr - ci * wi;
        ci = cr * wi + ci * wr;
        cr = t;
      }
    }
  }
}

/**
 * Adds the normalised autocorrelation function of `x` (rho(0) = 1) into `acc`; returns false when x is constant.
 * Uses the FFT of the zero-padded, mean-subtracted series (Wiener-Khinchin).
 */
function addAutocorrelation(x: Float64Array, acc: Float64Array, re: Float64Array, im: Float64Array): boolean {
  const n = x.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += x[i]!;
  mean /= n;
  re.fill(0);
  im.fill(0);
  for (let i = 0; i < n; i++) re[i] = x[i]! - mean;
  fft(re, im);
  for (let i = 0; i < re.length; i++) {
    re[i] = re[i]! * re[i]! + im[i]! * im[i]!;
    im[i] = 0;
  }
  // inverse transform of a real, even spectrum: a forward FFT gives the same up to the 1 / N factor
  fft(re, im);
  const c0 = re[0]!;
  if (!(c0 > 0)) return false;
  for (let t = 0; t < n; t++) acc[t] = acc[t]! + re[t]! / c0;
  return true;
}

/**
 * Integrated autocorrelation time of one coordinate from the walker-averaged autocorrelation function, with
 * Sokal's adaptive window: tau(M) = 1 + 2 sum_{t=1..M} rho(t), M the smallest lag with M >= c tau(M).
 * Returns NaN when every walker's series is constant, and the full-length sum when no lag qualifies.
 */
function integratedTime(rho: Float64Array, c: number): number {
  let tau = 1;
  for (let m = 1; m < rho.length; m++) {
    tau += 2 * rho[m]!;
    if (m >= c * tau) return tau;
  }
  return tau;
}

function quantileSorted(sorted: Float64Array, q: number): number {
  const pos = q * (sorted.length - 1);
  const i = Math.floor(pos);
  const f = pos - i;
  return i + 1 < sorted.length ? sorted[i]! * (1 - f) + sorted[i + 1]! * f : sorted[i]!;
}

/**
 * Draws samples from a probability density known up to a constant with an affine-invariant ensemble of walkers.
 *
 * @param logProb - natural log of the (unnormalised) density at a point; `-Infinity` outside the support. Called
 *   with a scratch vector it must not keep. NaN is an error.
 * @param start - centre of the initial ball of walkers (length = dimension, at least 1), in the coordinates'
 *   units
 * @param options - walkers, steps kept, burn-in, thinning, seed, stretch scale a, initial spread, Sokal window
 *   constant, progress callback and AbortSignal
 * @returns the stored chain and log-probabilities, acceptance fractions, integrated autocorrelation times,
 *   effective sample sizes, mean, standard deviation, Monte Carlo standard error, median and 16 / 84
 *   percentiles per coordinate, the sample covariance, and the best position met
 * @throws FitError for invalid options, a start of the wrong length, an initial ball where no point has a
 *   finite log-probability after 1000 redraws, a NaN log-probability, or cancellation
 *
 * Notes: the stretch move of Goodman & Weare (2010), "Ensemble samplers with affine invariance", Comm. App.
 * Math. Comp. Sci. 5:65: walker X_k moves to Y = X_j + z (X_k - X_j) with X_j another walker and z drawn from
 * g(z) proportional to 1 / sqrt(z) on [1/a, a], accepted with probability min(1, z^(d-1) p(Y) / p(X_k)). The
 * ensemble is split into two halves updated in turn, each walker of one half paired with a random walker of
 * the other (the parallel form used by Foreman-Mackey et al. 2013, PASP 125:306, "emcee"), so a half could run
 * on several threads; here everything runs on the calling thread. The integrated autocorrelation time of each
 * coordinate is 1 + 2 sum rho(t) over the autocorrelation function averaged over walkers, summed up to Sokal's
 * adaptive window (the smallest M with M >= c tau(M), c = 5; Sokal 1997, "Monte Carlo methods in statistical
 * mechanics", as Goodman & Weare apply it), computed by FFT on the stored chain and multiplied by `thin`.
 * Percentiles interpolate linearly between order statistics of all stored samples. The journal references
 * other than Goodman & Weare's are from memory, as is the "50 autocorrelation times" rule of thumb behind
 * `autocorrelationReliable`.
 * @example
 * ```ts
 * // a unit Gaussian in two dimensions
 * const r = sampleLogProbability((x) => -0.5 * (x[0]! ** 2 + x[1]! ** 2), [0, 0], { seed: 3 });
 * r.mean[0]; // 0.08 with this seed: within 3 r.mcse[0] (about 0.03) of the true 0
 * r.acceptance; // about 0.7 for this target
 * ```
 */
export function sampleLogProbability(
  logProb: (x: Float64Array) => number,
  start: ArrayLike<number>,
  options: SamplerOptions = {},
): SamplerResult {
  if (typeof logProb !== 'function') {
    throw new FitError('sampleLogProbability: logProb must be a function of a Float64Array', {
      argument: 'logProb',
    });
  }
  const dim = start?.length;
  if (typeof dim !== 'number' || dim < 1) {
    throw new FitError('sampleLogProbability: start must be a non-empty array of numbers', {
      argument: 'start',
    });
  }
  const x0 = Float64Array.from(start);
  x0.forEach((x, i) => {
    if (!Number.isFinite(x)) {
      throw new FitError(`sampleLogProbability: start[${i}] = ${x} is not finite`, {
        argument: 'start',
        index: i,
      });
    }
  });
  const walkers = positiveInteger(options.walkers ?? Math.max(16, 4 * dim), 'walkers', 2 * dim);
  if (walkers % 2 !== 0) {
    throw new FitError(`sampleLogProbability: walkers must be even (two halves), got ${walkers}`, {
      argument: 'walkers',
    });
  }
  const steps = positiveInteger(options.steps ?? DEFAULT_STEPS, 'steps', 1);
  const burn = positiveInteger(options.burn ?? DEFAULT_BURN, 'burn', 0);
  const thin = positiveInteger(options.thin ?? 1, 'thin', 1);
  const stored = Math.floor(steps / thin);
  if (stored < 2) {
    throw new FitError(`sampleLogProbability: steps / thin must leave at least 2 stored steps`, {
      argument: 'thin',
    });
  }
  const a = options.stretch ?? 2;
  if (!(a > 1) || !Number.isFinite(a)) {
    throw new FitError(`sampleLogProbability: stretch must be a finite number > 1, got ${a}`, {
      argument: 'stretch',
    });
  }
  const c = options.windowConstant ?? 5;
  if (!(c > 0) || !Number.isFinite(c)) {
    throw new FitError(`sampleLogProbability: windowConstant must be a positive number, got ${c}`, {
      argument: 'windowConstant',
    });
  }
  const spreadOpt = options.spread;
  const spread = new Float64Array(dim);
  for (let d = 0; d < dim; d++) {
    const s =
      spreadOpt === undefined
        ? 1e-3 * Math.max(Math.abs(x0[d]!), 1)
        : typeof spreadOpt === 'number'
          ? spreadOpt
          : spreadOpt[d];
    if (typeof s !== 'number' || !(s > 0) || !Number.isFinite(s)) {
      throw new FitError(
        `sampleLogProbability: spread${typeof spreadOpt === 'number' ? '' : `[${d}]`} must be a positive finite number, got ${String(s)}`,
        { argument: 'spread' },
      );
    }
    spread[d] = s;
  }
  const total = burn + steps;
  const every = options.progressEvery ?? Math.max(1, Math.floor(total / 100));
  const rng = seededRandom(options.seed ?? 1);

  const scratch = new Float64Array(dim);
  const evaluate = (x: Float64Array): number => {
    scratch.set(x);
    const lp = logProb(scratch);
    if (Number.isNaN(lp) || typeof lp !== 'number') {
      throw new FitError(
        `sampleLogProbability: logProb returned ${String(lp)} at [${Array.from(x).join(', ')}]; return -Infinity outside the support`,
        { argument: 'logProb' },
      );
    }
    return lp;
  };

  // walkers in a Gaussian ball around start; points of zero probability are drawn again
  const pos = new Float64Array(walkers * dim);
  const lp = new Float64Array(walkers);
  const trial = new Float64Array(dim);
  const best = { position: x0.slice(), logProbability: Number.NEGATIVE_INFINITY };
  for (let w = 0; w < walkers; w++) {
    let ok = false;
    for (let tries = 0; tries < INIT_TRIES && !ok; tries++) {
      for (let d = 0; d < dim; d++) trial[d] = x0[d]! + spread[d]! * rng.normal();
      const l = evaluate(trial);
      if (l > Number.NEGATIVE_INFINITY) {
        pos.set(trial, w * dim);
        lp[w] = l;
        ok = true;
        if (l > best.logProbability) {
          best.logProbability = l;
          best.position.set(trial);
        }
      }
    }
    if (!ok) {
      throw new FitError(
        `sampleLogProbability: no point of the initial ball around [${Array.from(x0).join(', ')}] has a finite log-probability after ${INIT_TRIES} draws; start inside the support or lower the spread`,
        { argument: 'start' },
      );
    }
  }

  const chain = new Float64Array(stored * walkers * dim);
  const chainLp = new Float64Array(stored * walkers);
  const accepted = new Float64Array(walkers);
  let acceptedAll = 0;
  const half = walkers / 2;
  const sqrtA = Math.sqrt(a);
  for (let s = 0; s < total; s++) {
    checkAborted(options.signal, 'sampleLogProbability');
    for (let h = 0; h < 2; h++) {
      const first = h * half;
      const other = (1 - h) * half;
      for (let k = first; k < first + half; k++) {
        // z = ((a - 1) u + 1)^2 / a has density proportional to 1 / sqrt(z) on [1/a, a]
        const zr = (sqrtA - 1 / sqrtA) * rng.uniform() + 1 / sqrtA;
        const z = zr * zr;
        const j = other + Math.min(half - 1, Math.floor(rng.uniform() * half));
        for (let d = 0; d < dim; d++) {
          const xj = pos[j * dim + d]!;
          trial[d] = xj + z * (pos[k * dim + d]! - xj);
        }
        const l = evaluate(trial);
        const logAccept = (dim - 1) * Math.log(z) + l - lp[k]!;
        if (l > Number.NEGATIVE_INFINITY && Math.log(rng.uniform()) < logAccept) {
          pos.set(trial, k * dim);
          lp[k] = l;
          acceptedAll++;
          if (s >= burn) accepted[k] = accepted[k]! + 1;
          if (l > best.logProbability) {
            best.logProbability = l;
            best.position.set(trial);
          }
        }
      }
    }
    if (s >= burn && (s - burn + 1) % thin === 0) {
      const row = (s - burn + 1) / thin - 1;
      if (row < stored) {
        chain.set(pos, row * walkers * dim);
        chainLp.set(lp, row * walkers);
      }
    }
    if ((s + 1) % every === 0 || s + 1 === total) {
      options.onProgress?.({
        fraction: (s + 1) / total,
        step: s + 1,
        bestLogProbability: best.logProbability,
        acceptance: acceptedAll / ((s + 1) * walkers),
      });
    }
  }

  const walkerAcceptance = Float64Array.from(accepted, (n) => n / steps);
  const acceptance = walkerAcceptance.reduce((x, y) => x + y, 0) / walkers;

  // autocorrelation times from the walker-averaged autocorrelation function of the stored chain
  let size = 1;
  while (size < 2 * stored) size <<= 1;
  const re = new Float64Array(size);
  const im = new Float64Array(size);
  const series = new Float64Array(stored);
  const rho = new Float64Array(stored);
  const tau = new Float64Array(dim);
  for (let d = 0; d < dim; d++) {
    rho.fill(0);
    let used = 0;
    for (let w = 0; w < walkers; w++) {
      for (let s = 0; s < stored; s++) series[s] = chain[(s * walkers + w) * dim + d]!;
      if (addAutocorrelation(series, rho, re, im)) used++;
    }
    if (used === 0) tau[d] = Number.NaN;
    else {
      for (let t = 0; t < stored; t++) rho[t] = rho[t]! / used;
      tau[d] = integratedTime(rho, c) * thin;
    }
  }
  const draws = walkers * steps;
  const effectiveSamples = Float64Array.from(tau, (t) => draws / t);
  const autocorrelationReliable = tau.every((t) => Number.isFinite(t) && steps >= RELIABLE_LENGTH * t);

  // summaries over every stored sample
  const count = stored * walkers;
  const mean = new Float64Array(dim);
  for (let i = 0; i < count; i++) for (let d = 0; d < dim; d++) mean[d] = mean[d]! + chain[i * dim + d]!;
  for (let d = 0; d < dim; d++) mean[d] = mean[d]! / count;
  const cov = Array.from({ length: dim }, () => new Array<number>(dim).fill(0));
  for (let i = 0; i < count; i++) {
    for (let p = 0; p < dim; p++) {
      const dp = chain[i * dim + p]! - mean[p]!;
      for (let q = p; q < dim; q++) cov[p]![q] = cov[p]![q]! + dp * (chain[i * dim + q]! - mean[q]!);
    }
  }
  for (let p = 0; p < dim; p++) {
    for (let q = p; q < dim; q++) {
      cov[p]![q] = cov[p]![q]! / (count - 1);
      cov[q]![p] = cov[p]![q]!;
    }
  }
  const sd = Float64Array.from({ length: dim }, (_, d) => Math.sqrt(cov[d]![d]!));
  const mcse = Float64Array.from({ length: dim }, (_, d) => sd[d]! * Math.sqrt(tau[d]! / draws));
  const median = new Float64Array(dim);
  const lower = new Float64Array(dim);
  const upper = new Float64Array(dim);
  const column = new Float64Array(count);
  for (let d = 0; d < dim; d++) {
    for (let i = 0; i < count; i++) column[i] = chain[i * dim + d]!;
    column.sort();
    median[d] = quantileSorted(column, 0.5);
    lower[d] = quantileSorted(column, 0.16);
    upper[d] = quantileSorted(column, 0.84);
  }
  return Object.freeze({
    dimension: dim,
    walkers,
    steps,
    burn,
    thin,
    stored,
    chain,
    logProbability: chainLp,
    acceptance,
    walkerAcceptance,
    autocorrelationTime: tau,
    autocorrelationReliable,
    effectiveSamples,
    mean,
    sd,
    mcse,
    median,
    lower,
    upper,
    covariance: Object.freeze(cov.map((r) => Object.freeze(r))),
    best: Object.freeze(best),
  });
}

/**
 * Every stored sample of one coordinate of a chain, walkers and steps together.
 *
 * @param result - a {@link SamplerResult} (or {@link McmcResult})
 * @param index - the coordinate, 0 .. dimension - 1 (for a model: its position in `result.parameters`)
 * @returns a new Float64Array of `stored x walkers` values, stored step after stored step
 * @throws FitError for an index out of range
 * @example
 * ```ts
 * const xs = coordinateSamples(r, 0);
 * xs.length === r.stored * r.walkers; // true
 * ```
 */
export function coordinateSamples(result: SamplerResult, index: number): Float64Array {
  if (!Number.isInteger(index) || index < 0 || index >= result.dimension) {
    throw new FitError(
      `coordinateSamples: index ${index} is out of range; the chain has ${result.dimension} coordinates`,
      { argument: 'index' },
    );
  }
  const n = result.stored * result.walkers;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = result.chain[i * result.dimension + index]!;
  return out;
}

/** Posterior summary of one parameter (in the unit of its slot: mas, degrees, flux). */
export interface ParameterSummary {
  /** 50th percentile. */
  readonly median: number;
  /** 16th percentile. */
  readonly lower: number;
  /** 84th percentile. */
  readonly upper: number;
  /** Mean of the samples. */
  readonly mean: number;
  /** Standard deviation of the samples. */
  readonly sd: number;
  /** Monte Carlo standard error of the mean. */
  readonly mcse: number;
  /** Integrated autocorrelation time, steps. */
  readonly autocorrelationTime: number;
}

/** Options of {@link mcmc}. */
export interface McmcOptions extends DataOptions, Omit<SamplerOptions, 'onProgress' | 'spread'> {
  /**
   * Centre of the initial ball: a {@link FitResult} (its best values; the default spread is then a tenth of its
   * uncertainties), an array in the order of `model.parameters()`, or a record by name; default the params'
   * values.
   */
  readonly start?: FitResult | ArrayLike<number> | Readonly<Record<string, number>>;
  /**
   * Standard deviation of the initial ball in parameter units: one number, one per parameter (array or record
   * by name; names left out get the default); default a tenth of the fit's uncertainty when `start` is a fit,
   * else 1e-3 x max(|value|, 1).
   */
  readonly spread?: number | ArrayLike<number> | Readonly<Record<string, number>>;
  /**
   * Natural log of a prior density over the free parameters (by name, slot units), added to the flat prior of
   * the bounds (positions outside the bounds always have zero probability). Default: the flat prior alone.
   */
  readonly logPrior?: (values: Readonly<Record<string, number>>) => number;
  /** Called with the fraction of steps done and the lowest chi2 met so far. */
  readonly onProgress?: (p: Progress) => void;
}

/** The outcome of {@link mcmc}: the sampler's result with the parameters named. */
export interface McmcResult extends SamplerResult {
  /** Names of the free parameters, in chain order. */
  readonly parameters: readonly string[];
  /** Posterior summary by parameter name. */
  readonly summary: Readonly<Record<string, ParameterSummary>>;
  /** The lowest chi2 met (likelihood only, without the prior) and where. */
  readonly bestChi2: number;
  /** The parameter values of `bestChi2`. */
  readonly bestValues: Readonly<Record<string, number>>;
  /** Number of data entries in the likelihood. */
  readonly count: number;
}

function isFitResult(x: unknown): x is FitResult {
  return (
    typeof x === 'object' &&
    x !== null &&
    'values' in x &&
    'uncertainties' in x &&
    'parameters' in x &&
    !ArrayBuffer.isView(x)
  );
}

/**
 * Samples the posterior of a model's free parameters given an OIFITS dataset.
 *
 * @param model - a model whose free parameters are `param(...)`s; their bounds are the flat prior's support
 * @param dataset - an OIFITS dataset
 * @param options - observables and weights, `start` (a fit result, array or record), `spread` (parameter
 *   units), `logPrior`, and the sampler's options (walkers, steps, burn, thin, seed, stretch, progress, signal)
 * @returns the chain (coordinates in the order of `parameters`, slot units: mas, degrees, flux), acceptance,
 *   autocorrelation times, percentile summaries by name, and the lowest chi2 met
 * @throws FitError when the model has no free parameter, there is no usable data, the initial ball has no
 *   valid point, the prior returns NaN, or the signal aborts; ModelError for start values outside the bounds
 *
 * Notes: the likelihood is Gaussian in the normalised residuals of the fit layer (phases wrapped), so
 * ln L = -chi2 / 2 up to a constant, with chi2 weighted by the observables' weights and correlated errors
 * (OI_CORR) whitened exactly as in {@link fit}. The
 * log-posterior is ln L + logPrior, and -Infinity outside the parameters' bounds or where the model is not
 * valid (a slot out of its physical domain). Sampling by {@link sampleLogProbability} (Goodman & Weare 2010,
 * the stretch move with a = 2). Start from a fit (`start: fit(model, dataset)`) to skip most of the burn-in.
 * @example
 * ```ts
 * const model = disk({ diameter: param('diameter', 1, { min: 0 }) });
 * const post = mcmc(model, dataset, { start: fit(model, dataset), steps: 1000, seed: 2 });
 * post.summary.diameter.median; // mas, with post.summary.diameter.lower / .upper the 16 / 84 percentiles
 * ```
 */
export function mcmc(model: Model, dataset: OifitsDataset, options: McmcOptions = {}): McmcResult {
  const info = model.parameterInfo().filter((p) => !p.fixed);
  const names = info.map((p) => p.name);
  if (names.length === 0) {
    throw new FitError('mcmc: the model has no free parameters; put param(...) in the slots to sample', {
      argument: 'model',
    });
  }
  const blocks = gatherData(dataset, options);
  const n = countData(blocks);
  const r = new Float64Array(n);
  const white = correlationWhitening(dataset, blocks);
  const lower = Float64Array.from(info, (p) => p.min);
  const upper = Float64Array.from(info, (p) => p.max);
  const fitStart = isFitResult(options.start) ? options.start : undefined;
  let start: Float64Array;
  try {
    start = parameterVector(
      model,
      fitStart
        ? fitStart.values
        : (options.start as ArrayLike<number> | Readonly<Record<string, number>> | undefined),
    );
  } catch (e) {
    if (e instanceof ModelError) throw new ModelError(`mcmc: start values: ${e.message}`, e.location);
    throw e;
  }
  const opt = options.spread;
  const byName =
    opt !== undefined && typeof opt === 'object' && typeof (opt as ArrayLike<number>).length !== 'number'
      ? (opt as Readonly<Record<string, number>>)
      : undefined;
  if (byName) {
    for (const key of Object.keys(byName)) {
      if (!names.includes(key)) {
        throw new FitError(
          `mcmc: spread names '${key}', which is not a free parameter (${names.join(', ')})`,
          {
            parameter: key,
          },
        );
      }
    }
  } else if (opt !== undefined && typeof opt !== 'number' && opt.length !== names.length) {
    throw new FitError(
      `mcmc: spread has ${opt.length} values but the model has ${names.length} free parameters`,
      {
        argument: 'spread',
      },
    );
  }
  const spread = Float64Array.from(names, (name, i) => {
    let s: number | undefined;
    if (typeof opt === 'number') s = opt;
    else if (byName) s = byName[name];
    else if (opt !== undefined) s = (opt as ArrayLike<number>)[i];
    if (s === undefined) {
      const u = fitStart?.uncertainties[name];
      s = u !== undefined && u > 0 && Number.isFinite(u) ? 0.1 * u : 1e-3 * Math.max(Math.abs(start[i]!), 1);
    }
    return s;
  });
  const logPrior = options.logPrior;
  let bestChi2 = Number.POSITIVE_INFINITY;
  const bestAt = start.slice();
  const logProb = (x: Float64Array): number => {
    for (let i = 0; i < x.length; i++) {
      if (!(x[i]! >= lower[i]! && x[i]! <= upper[i]!)) return Number.NEGATIVE_INFINITY;
    }
    let prior = 0;
    if (logPrior) {
      const rec: Record<string, number> = {};
      for (let i = 0; i < names.length; i++) rec[names[i]!] = x[i]!;
      prior = logPrior(rec);
      if (Number.isNaN(prior) || typeof prior !== 'number') {
        throw new FitError(`mcmc: logPrior returned ${String(prior)} at ${JSON.stringify(rec)}`, {
          argument: 'logPrior',
        });
      }
      if (prior === Number.NEGATIVE_INFINITY) return prior;
    }
    let m: Model;
    try {
      m = model.at(x);
    } catch (e) {
      if (e instanceof ModelError) return Number.NEGATIVE_INFINITY;
      throw e;
    }
    residualsAt(m, blocks, r);
    if (white) whiten(white, r);
    const chi2 = sumOfSquares(r);
    if (!Number.isFinite(chi2)) return Number.NEGATIVE_INFINITY;
    if (chi2 < bestChi2) {
      bestChi2 = chi2;
      bestAt.set(x);
    }
    return -0.5 * chi2 + prior;
  };
  const onProgress = options.onProgress;
  const res = sampleLogProbability(logProb, start, {
    ...options,
    spread,
    ...(onProgress
      ? { onProgress: (p: SamplerProgress) => onProgress({ fraction: p.fraction, bestChi2, step: p.step }) }
      : { onProgress: undefined }),
  });
  const summary: Record<string, ParameterSummary> = {};
  names.forEach((name, i) => {
    summary[name] = Object.freeze({
      median: res.median[i]!,
      lower: res.lower[i]!,
      upper: res.upper[i]!,
      mean: res.mean[i]!,
      sd: res.sd[i]!,
      mcse: res.mcse[i]!,
      autocorrelationTime: res.autocorrelationTime[i]!,
    });
  });
  return Object.freeze({
    ...res,
    parameters: Object.freeze(names),
    summary: Object.freeze(summary),
    bestChi2,
    bestValues: Object.freeze(Object.fromEntries(names.map((name, i) => [name, bestAt[i]!]))),
    count: n,
  });
}
