/**
 * Ready-made candidate models ("archetypes": point, uniform disk, Gaussian, thin ring, disk plus a point
 * companion) with starting values guessed from the data, and their comparison in one call.
 *
 * @module
 */
import { FitError } from '../errors.js';
import { disk, gaussian, type Model, point, ring, sum } from '../model/model.js';
import { param } from '../model/param.js';
import type { OifitsDataset } from '../oifits/dataset.js';
import { type Candidate, type CompareOptions, type Comparison, compare } from './compare.js';
import { type DataBlock, type DataOptions, gatherData } from './data.js';

/** Names of the archetypes. */
export type ArchetypeName = 'point' | 'disk' | 'gaussian' | 'ring' | 'binary';

/** Every archetype, in the order {@link archetypes} lists them. */
export const ARCHETYPE_NAMES: readonly ArchetypeName[] = Object.freeze([
  'point',
  'disk',
  'gaussian',
  'ring',
  'binary',
]);

/** 1 mas in radians. */
const MAS = Math.PI / (180 * 3600 * 1000);
/** Squared visibilities counted as "partly resolved" when estimating the size (outside: too close to 1 or 0). */
const V2_LOW = 0.1;
const V2_HIGH = 0.9;
/** Relative factors of the size starts around the guess. */
const SIZE_FACTORS: readonly number[] = Object.freeze([0.6, 1, 1.5]);
/** Default cap on the nodes per axis of the binary's east / north grid. */
const DEFAULT_MAX_NODES = 31;
/** Default number of binary starts refined by Levenberg-Marquardt after the chi2 screen. */
const DEFAULT_KEEP = 8;

/** Starting guesses read off a dataset. */
export interface ArchetypeGuesses {
  /** Shortest non-zero spatial frequency of the data, cycles per radian. */
  readonly qMin: number;
  /** Longest spatial frequency of the data, cycles per radian. */
  readonly qMax: number;
  /**
   * Spatial frequency where a Gaussian through the partly resolved squared visibilities of the longest
   * baselines falls to V^2 = 0.5, cycles per radian.
   */
  readonly halfFrequency: number;
  /** How the squared visibilities look: mostly above 0.9, partly resolved, or mostly below 0.1. */
  readonly regime: 'unresolved' | 'resolved' | 'over-resolved';
  /** Uniform-disk diameter with V^2 = 0.5 at `halfFrequency`, mas. */
  readonly diameter: number;
  /** Gaussian FWHM with V^2 = 0.5 at `halfFrequency`, mas. */
  readonly fwhm: number;
  /** Thin-ring diameter with V^2 = 0.5 at `halfFrequency`, mas. */
  readonly ringDiameter: number;
  /** East / north starting offsets of the binary's companion, mas (the same list on both axes). */
  readonly separations: readonly number[];
}

/** Options of {@link archetypeGuesses} and {@link archetypes}. */
export interface ArchetypeOptions extends DataOptions {
  /** Archetypes to build (default all of {@link ARCHETYPE_NAMES}). */
  readonly include?: readonly ArchetypeName[];
  /** Companion starting offsets east and north, mas (default: see {@link archetypeGuesses}). */
  readonly separations?: readonly number[];
  /** Cap on the nodes per axis of the default separations (default 31). */
  readonly maxNodes?: number;
  /** Binary starts refined by Levenberg-Marquardt after the chi2 screen (default 8). */
  readonly keep?: number;
}

/** Size (mas) of a one-parameter shape whose V^2 at spatial frequency q is 0.5: first crossing, by bisection. */
function halfPowerSize(shape: (size: number) => Model, q: number): number {
  const v2 = (size: number) => shape(size).vis2([q], [0])[0]!;
  let lo = 0;
  let hi = 1e-3 / (q * MAS);
  while (v2(hi) > 0.5) {
    lo = hi;
    hi *= 1.25;
  }
  for (let i = 0; i < 80 && hi - lo > 1e-12 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (v2(mid) > 0.5) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 === 1 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}

function frequencies(b: DataBlock): number[] {
  if (b.u) return Array.from(b.u, (u, k) => Math.hypot(u, b.v![k]!));
  const out: number[] = [];
  for (let k = 0; k < b.data.length; k++) {
    const u1 = b.u1![k]!;
    const v1 = b.v1![k]!;
    const u2 = b.u2![k]!;
    const v2 = b.v2![k]!;
    out.push(Math.hypot(u1, v1), Math.hypot(u2, v2), Math.hypot(u1 + u2, v1 + v2));
  }
  return out;
}

/**
 * Reads starting guesses for the archetypes off a dataset: a size from where the squared visibility falls to
 * 0.5 on the longest baselines, and a grid of companion offsets from the baseline range.
 *
 * @param dataset - an OIFITS dataset
 * @param options - the observables to use (as in `fit`) and the separation grid's options
 * @returns the spatial-frequency range and half-power frequency (cycles per radian), the regime, the
 *   half-power sizes of a uniform disk, a Gaussian and a thin ring (mas), and the companion offsets (mas)
 * @throws FitError when the dataset has no usable data
 *
 * Notes: each usable V^2 (or VISAMP^2 when there is no VIS2) between 0.1 and 0.9 gives the frequency where a
 * Gaussian through it would reach 0.5, q sqrt(ln 2 / -ln V^2); the guess is the median of these over the
 * longer half of such baselines. When no value lies in that range the source is taken as unresolved (half
 * frequency 3 qMax) or over-resolved (0.5 qMin). Each shape's size is then the one whose own V^2 is 0.5 at
 * that frequency (first crossing, by bisection on the library's model, so no tabulated constant is used). The
 * companion offsets run from -1/qMin to +1/qMin (the fringe spacing of the shortest baseline) in steps of
 * 1/(2 qMax) (half the finest fringe spacing), coarsened to at most `maxNodes` per axis. These are heuristics
 * of common practice, not published recipes.
 * @example
 * ```ts
 * const g = archetypeGuesses(dataset);
 * g.diameter; // mas, a starting uniform-disk diameter
 * ```
 */
export function archetypeGuesses(
  dataset: OifitsDataset,
  options: Pick<ArchetypeOptions, 'observables' | 'weights' | 'maxNodes'> = {},
): ArchetypeGuesses {
  const blocks = gatherData(dataset, options);
  const qs = blocks.flatMap(frequencies).filter((q) => q > 0 && Number.isFinite(q));
  if (qs.length === 0) {
    throw new FitError('archetypeGuesses: the data have no non-zero spatial frequency', {
      argument: 'dataset',
    });
  }
  let qMin = Number.POSITIVE_INFINITY;
  let qMax = 0;
  for (const q of qs) {
    qMin = Math.min(qMin, q);
    qMax = Math.max(qMax, q);
  }
  // squared visibilities with their frequencies
  const amp = blocks.find((b) => b.observable === 'vis2') ?? blocks.find((b) => b.observable === 'visamp');
  const points: { q: number; v2: number }[] = [];
  if (amp) {
    const fq = frequencies(amp);
    for (let k = 0; k < amp.data.length; k++) {
      const x = amp.data[k]!;
      points.push({ q: fq[k]!, v2: amp.observable === 'vis2' ? x : x * x });
    }
  }
  const partly = points.filter((p) => p.v2 > V2_LOW && p.v2 < V2_HIGH).sort((a, b) => a.q - b.q);
  let halfFrequency: number;
  let regime: ArchetypeGuesses['regime'];
  if (partly.length > 0) {
    regime = 'resolved';
    const longer = partly.slice(Math.floor(partly.length / 2));
    halfFrequency = median(longer.map((p) => p.q * Math.sqrt(Math.LN2 / -Math.log(p.v2))));
  } else {
    const high = points.filter((p) => p.v2 >= V2_HIGH).length;
    regime = points.length === 0 || high >= points.length / 2 ? 'unresolved' : 'over-resolved';
    halfFrequency = regime === 'unresolved' ? 3 * qMax : 0.5 * qMin;
  }
  const maxNodes = options.maxNodes ?? DEFAULT_MAX_NODES;
  if (!(Number.isInteger(maxNodes) && maxNodes >= 2)) {
    throw new FitError(`archetypeGuesses: maxNodes must be an integer >= 2, got ${maxNodes}`, {
      argument: 'maxNodes',
    });
  }
  const range = 1 / (qMin * MAS);
  let step = 1 / (2 * qMax * MAS);
  let half = Math.ceil(range / step);
  if (2 * half + 1 > maxNodes) {
    half = Math.floor((maxNodes - 1) / 2);
    step = range / half;
  }
  const separations = Object.freeze(Array.from({ length: 2 * half + 1 }, (_, i) => (i - half) * step));
  return Object.freeze({
    qMin,
    qMax,
    halfFrequency,
    regime,
    diameter: halfPowerSize((d) => disk({ diameter: d }), halfFrequency),
    fwhm: halfPowerSize((w) => gaussian({ fwhm: w }), halfFrequency),
    ringDiameter: halfPowerSize((d) => ring({ diameter: d }), halfFrequency),
    separations,
  });
}

/**
 * Builds the archetype candidates for {@link compare}, with starting values guessed from the data.
 *
 * @param dataset - an OIFITS dataset
 * @param options - which archetypes (`include`), the companion offsets (`separations`, mas) or their cap
 *   (`maxNodes`), the binary's `keep`, and the observables used for the guesses
 * @returns candidates named after {@link ArchetypeName}: `point` (no parameter); `disk` (parameter
 *   `diameter`, mas); `gaussian` (`fwhm`, mas); `ring` (`diameter`, mas); `binary`: a uniform disk of flux 1
 *   plus a point of flux `companionFlux` (0 to 1, relative to the disk) at (`companionEast`,
 *   `companionNorth`) mas, 4 parameters
 * @throws FitError for an unknown archetype name or no usable data
 *
 * Notes: sizes start at 0.6, 1 and 1.5 times the guess of {@link archetypeGuesses} (bounded below by 0). The
 * binary starts from every east / north node except the origin (where a companion on the disk is a
 * degenerate start), with the disk at half the disk guess and the companion at flux 0.1 and 0.4; the `keep` starts of lowest chi2 are refined. Companion offsets are
 * bounded to twice the grid's extent.
 * @example
 * ```ts
 * const cands = archetypes(dataset, { include: ['disk', 'binary'] });
 * cands.map((c) => c.name); // ['disk', 'binary']
 * ```
 */
export function archetypes(dataset: OifitsDataset, options: ArchetypeOptions = {}): Candidate[] {
  const include = options.include ?? ARCHETYPE_NAMES;
  for (const name of include) {
    if (!ARCHETYPE_NAMES.includes(name)) {
      throw new FitError(`archetypes: unknown archetype '${name}'; use ${ARCHETYPE_NAMES.join(', ')}`, {
        argument: 'include',
      });
    }
  }
  const g = archetypeGuesses(dataset, options);
  const seps = options.separations ?? g.separations;
  if (!Array.isArray(seps) || seps.length === 0 || !seps.every(Number.isFinite)) {
    throw new FitError('archetypes: separations must be a non-empty array of finite offsets (mas)', {
      argument: 'separations',
    });
  }
  const sizes = (x: number) => SIZE_FACTORS.map((f) => f * x);
  const out: Candidate[] = [];
  for (const name of ARCHETYPE_NAMES) {
    if (!include.includes(name)) continue;
    if (name === 'point') out.push({ name, model: point() });
    else if (name === 'disk') {
      out.push({
        name,
        model: disk({ diameter: param('diameter', g.diameter, { min: 0 }) }),
        grid: { diameter: sizes(g.diameter) },
      });
    } else if (name === 'gaussian') {
      out.push({
        name,
        model: gaussian({ fwhm: param('fwhm', g.fwhm, { min: 0 }) }),
        grid: { fwhm: sizes(g.fwhm) },
      });
    } else if (name === 'ring') {
      out.push({
        name,
        model: ring({ diameter: param('diameter', g.ringDiameter, { min: 0 }) }),
        grid: { diameter: sizes(g.ringDiameter) },
      });
    } else {
      const reach = 2 * Math.max(...seps.map(Math.abs), 1e-6);
      const model = sum(
        disk({ diameter: param('diameter', g.diameter, { min: 0 }) }),
        point()
          .weight(param('companionFlux', 0.1, { min: 0, max: 1 }))
          .shift(
            param('companionEast', 0, { min: -reach, max: reach }),
            param('companionNorth', 0, { min: -reach, max: reach }),
          ),
      );
      // every east / north node but the origin, where the companion sits on the disk (a degenerate start)
      const starts: Record<string, number>[] = [];
      for (const companionFlux of [0.1, 0.4]) {
        for (const companionEast of seps) {
          for (const companionNorth of seps) {
            if (companionEast === 0 && companionNorth === 0) continue;
            starts.push({ diameter: 0.5 * g.diameter, companionFlux, companionEast, companionNorth });
          }
        }
      }
      out.push({
        name,
        model,
        starts,
        keep: options.keep ?? DEFAULT_KEEP,
      });
    }
  }
  return out;
}

/**
 * Fits the archetypes (point, uniform disk, Gaussian, ring, disk plus point companion) to a dataset and ranks
 * them by an information criterion, in one call.
 *
 * @param dataset - an OIFITS dataset
 * @param options - the options of {@link archetypes} and of {@link compare} (criterion, default 'bic';
 *   observables; progress; AbortSignal)
 * @returns the comparison table of {@link compare}
 * @throws FitError as {@link archetypes} and {@link compare} do
 *
 * Notes: AIC and BIC as in {@link compare} (Akaike 1974; Schwarz 1978), chi2 standing for -2 ln L up to a
 * constant for Gaussian errors. The starting values are the heuristics of {@link archetypeGuesses}; for a
 * source far from every archetype, build candidates by hand and call {@link compare}.
 * @example
 * ```ts
 * const table = compareArchetypes(dataset);
 * table.best.name; // e.g. 'disk'
 * table.rows.map((r) => [r.name, r.deltaBic]);
 * ```
 */
export function compareArchetypes(
  dataset: OifitsDataset,
  options: ArchetypeOptions & CompareOptions = {},
): Comparison {
  return compare(archetypes(dataset, options), dataset, options);
}
