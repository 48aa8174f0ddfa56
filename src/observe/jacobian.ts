/**
 * Analytic Jacobians of every observable with respect to a model's free parameters, and the matching
 * value-only evaluation, at spatial frequencies with optional wavelengths and channel widths.
 *
 * The model is folded into its canonical form with forward-mode dual numbers, so every term's flux, shift,
 * linear maps and shape parameters carry their gradients over the free parameters (`jacobian-plan.ts`). Per
 * point, each factor's kernel gives its value and exact slopes (`kernels/derivatives.ts`,
 * `kernels/component-derivatives.ts`); the chain rule then runs through |A^T q|^2 or A^T q (linear maps), the
 * phase ramp (shifts), the kernel coefficients (shape parameters) and the normalisation by the total flux.
 *
 * With wavelengths, points are grouped by distinct (sub-)wavelength and the model is canonicalised with
 * gradients once per wavelength, so wavelength-dependent slots (power laws, blackbody ratios) and their
 * coefficients take part; with channel widths the observables are channel averages exactly as in
 * `observe/chromatic.ts`.
 *
 * @module
 */
import { Matrix } from 'ml-matrix';
import { InputError, ModelError } from '../errors.js';
import { canonicalise } from '../model/canonical.js';
import { hasChromaticSlot } from '../model/chromatic-slot.js';
import type { Model } from '../model/model.js';
import { boundedFrequencyColumn, DEG_PER_RAD, frequencyColumn } from '../units/index.js';
import {
  type ChromaticOptions,
  channelSamples,
  chromaticBispectrum,
  chromaticVis2,
  chromaticVisibilities,
  DEFAULT_BAND_SAMPLES,
} from './chromatic.js';
import { compileJacobianPlan, type JPlan, runJacobian } from './jacobian-plan.js';
import { parameterVector } from './parameters.js';

/** Names of the observables that have values and Jacobians here. */
export type ObservableName =
  | 'visre'
  | 'visim'
  | 'vis2'
  | 'visamp'
  | 'visphi'
  | 't3phi'
  | 't3amp'
  | 't3re'
  | 't3im';

const VIS_NAMES: readonly ObservableName[] = ['visre', 'visim', 'vis2', 'visamp', 'visphi'];
const T3_NAMES: readonly ObservableName[] = ['t3re', 't3im', 't3amp', 't3phi'];

/** An observable's values at a set of points and its Jacobian with respect to the free parameters. */
export interface ObservableJacobian {
  /** Which observable. */
  readonly observable: ObservableName;
  /** Names of the free parameters, one per column (the order of `model.parameters()`). */
  readonly parameters: readonly string[];
  /** Number of rows (points or triangles). */
  readonly rows: number;
  /** Number of columns (free parameters). */
  readonly cols: number;
  /** Observable values, one per row (phases in degrees, wrapped to (-180, 180]). */
  readonly values: Float64Array;
  /** d value / d parameter, row-major: `jacobian[row * cols + col]` (phases in degrees per parameter unit). */
  readonly jacobian: Float64Array;
}

/** Buffers that {@link visibilityJacobian} may fill instead of allocating. */
export interface JacobianBuffers {
  readonly re?: Float64Array;
  readonly im?: Float64Array;
  readonly dre?: Float64Array;
  readonly dim?: Float64Array;
}

/** The complex visibility and its Jacobian at a set of points. */
export interface VisibilityJacobian {
  readonly parameters: readonly string[];
  readonly rows: number;
  readonly cols: number;
  /** Normalised visibility, real and imaginary parts. */
  readonly re: Float64Array;
  readonly im: Float64Array;
  /** d re / d p and d im / d p, row-major rows x cols. */
  readonly dre: Float64Array;
  readonly dim: Float64Array;
}

/** Optional wavelength columns of a request (OIFITS EFF_WAVE and EFF_BAND of each point). */
export interface WavelengthColumns {
  /**
   * Effective wavelength of each point, metres (> 0). Needed when the model has wavelength-dependent slots;
   * u, v (or u1..v2) are then the spatial frequencies at this wavelength (UCOORD / EFF_WAVE).
   */
  readonly wavelength?: ArrayLike<number>;
  /**
   * Channel width of each point, metres (>= 0; needs `wavelength`): the observable becomes the channel average
   * of `observe/chromatic.ts` (a top-hat in wavelength, Gauss-Legendre sub-samples at which the spatial
   * frequency is u * wavelength / lambda). 0 means no average for that point.
   */
  readonly band?: ArrayLike<number>;
}

/** Points of a request: baselines for VIS-type observables, triangles for T3-type ones (cycles per radian). */
export type JacobianPoints =
  | ({ readonly u: ArrayLike<number>; readonly v: ArrayLike<number> } & WavelengthColumns)
  | ({
      readonly u1: ArrayLike<number>;
      readonly v1: ArrayLike<number>;
      readonly u2: ArrayLike<number>;
      readonly v2: ArrayLike<number>;
    } & WavelengthColumns);

/** Free-parameter values: an array in the order of `model.parameters()`, or a record by name. */
export type ParameterValues = ArrayLike<number> | Readonly<Record<string, number>>;
type Values = ParameterValues;

/** A request's columns, checked. */
interface Request {
  readonly triangles: boolean;
  readonly n: number;
  /** Baselines per row (1 or 3) and their frequencies: baseline b of row i at b * n + i. */
  readonly nb: number;
  readonly u: Float64Array;
  readonly v: Float64Array;
  readonly wavelength: Float64Array | null;
  readonly band: Float64Array | null;
}

function wavelengthColumn(
  x: ArrayLike<number> | undefined,
  n: number,
  fn: string,
  name: 'wavelength' | 'band',
): Float64Array | null {
  if (x === undefined) return null;
  if (x === null || typeof x !== 'object' || typeof x.length !== 'number') {
    throw new InputError(`${fn}: points.${name} must be an array or typed array of metres`, {
      argument: name,
    });
  }
  if (x.length !== n) {
    throw new InputError(
      `${fn}: points.${name} has ${x.length} entries but there are ${n} points; give one per point`,
      { argument: name },
    );
  }
  const a = Float64Array.from(x);
  for (let i = 0; i < n; i++) {
    const t = a[i]!;
    const ok = name === 'wavelength' ? t > 0 && Number.isFinite(t) : t >= 0 && Number.isFinite(t);
    if (!ok) {
      throw new InputError(
        `${fn}: points.${name}[${i}] is ${t}; expected a finite number of metres ${name === 'wavelength' ? '> 0' : '>= 0'}`,
        { argument: name, index: i },
      );
    }
  }
  return a;
}

function readRequest(fn: string, observable: ObservableName, points: JacobianPoints): Request {
  if (points === null || typeof points !== 'object') {
    throw new InputError(`${fn}: give points as { u, v } or { u1, v1, u2, v2 } (cycles per radian)`, {
      argument: 'points',
    });
  }
  if ('u' in points) {
    if (!VIS_NAMES.includes(observable)) {
      throw new InputError(
        `${fn}: '${observable}' needs triangles { u1, v1, u2, v2 }; with { u, v } use visre, visim, vis2, visamp or visphi`,
        { argument: 'observable' },
      );
    }
    const u = frequencyColumn(points.u, fn, 'u');
    const v = frequencyColumn(points.v, fn, 'v');
    if (u.length !== v.length) {
      throw new InputError(
        `${fn}: u has ${u.length} entries but v has ${v.length}; give arrays of equal length`,
        {
          argument: 'v',
        },
      );
    }
    const n = u.length;
    return { triangles: false, n, nb: 1, u, v, ...wavelengths(points, n, fn) };
  }
  if (!T3_NAMES.includes(observable)) {
    throw new InputError(
      `${fn}: '${observable}' needs baselines { u, v }; with triangles use t3re, t3im, t3amp or t3phi`,
      { argument: 'observable' },
    );
  }
  const u1 = frequencyColumn(points.u1, fn, 'u1');
  const v1 = frequencyColumn(points.v1, fn, 'v1');
  const u2 = frequencyColumn(points.u2, fn, 'u2');
  const v2 = frequencyColumn(points.v2, fn, 'v2');
  const n = u1.length;
  for (const [name, a] of [
    ['v1', v1],
    ['u2', u2],
    ['v2', v2],
  ] as const) {
    if (a.length !== n) {
      throw new InputError(
        `${fn}: u1 has ${n} entries but ${name} has ${a.length}; give arrays of equal length`,
        {
          argument: name,
        },
      );
    }
  }
  // all three baselines: [AB, BC, CA = -(AB + BC)]
  const u = new Float64Array(3 * n);
  const v = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) {
    u[i] = u1[i]!;
    v[i] = v1[i]!;
    u[n + i] = u2[i]!;
    v[n + i] = v2[i]!;
    u[2 * n + i] = -(u1[i]! + u2[i]!);
    v[2 * n + i] = -(v1[i]! + v2[i]!);
  }
  return { triangles: true, n, nb: 3, u, v, ...wavelengths(points, n, fn) };
}

function wavelengths(points: WavelengthColumns, n: number, fn: string) {
  const wavelength = wavelengthColumn(points.wavelength, n, fn, 'wavelength');
  const band = wavelengthColumn(points.band, n, fn, 'band');
  if (band !== null && wavelength === null) {
    throw new InputError(`${fn}: points.band needs points.wavelength (the channel centres, metres)`, {
      argument: 'band',
    });
  }
  return { wavelength, band };
}

function readSamples(options: ChromaticOptions | undefined, fn: string): number {
  const s = options?.samples ?? DEFAULT_BAND_SAMPLES;
  if (!Number.isInteger(s) || s < 1 || s > 10000) {
    throw new InputError(`${fn}: options.samples must be an integer in [1, 10000], got ${s}`, {
      argument: 'samples',
    });
  }
  return s;
}

/** How a request is evaluated: at its own frequencies (no wavelength effect) or per sub-wavelength. */
function needsWavelengths(model: Model, req: Request, fn: string): boolean {
  const chromatic = hasChromaticSlot(model.node);
  if (req.wavelength === null) {
    if (chromatic) {
      throw new ModelError(
        `${fn}: the model has wavelength-dependent slots; give points.wavelength (EFF_WAVE in metres, one per point)`,
        { argument: 'points.wavelength' },
      );
    }
    return false;
  }
  if (chromatic) return true;
  return req.band?.some((b) => b > 0) === true;
}

function prepare(model: Model, vec: Float64Array, wavelength?: number): JPlan {
  const names = model.parameters();
  const index = new Map(names.map((n, i) => [n, i] as const));
  const env =
    wavelength === undefined
      ? { index, values: vec, gradients: true }
      : { index, values: vec, gradients: true, wavelength };
  const terms = canonicalise(model.node, env);
  const path =
    wavelength === undefined ? model.node.kind : `${model.node.kind} at wavelength ${wavelength} m`;
  return compileJacobianPlan(terms, names.length, path);
}

/**
 * The normalised complex visibility and its Jacobian with respect to the free parameters.
 *
 * @param model - a model with free parameters (`param(...)` in its slots), without wavelength-dependent slots
 *   (for those use {@link observableJacobian} with `points.wavelength`)
 * @param u - spatial frequencies east, cycles per radian
 * @param v - spatial frequencies north, cycles per radian
 * @param values - optional parameter values (array in the order of `model.parameters()` or a record); default:
 *   the parameters' current values
 * @param out - optional buffers to fill instead of allocating (`re`, `im` of length n; `dre`, `dim` of n x cols);
 *   they must not alias `u` or `v`
 * @returns values and row-major Jacobians of the real and imaginary parts
 * @throws InputError for non-finite or unequal columns or wrong buffers; ModelError for values outside their
 *   bounds or a model with wavelength-dependent slots
 *
 * Notes: exact derivatives (no finite differences): every factor's kernel supplies P and its slopes in
 * |A^T q|^2 (radial kinds) or A^T q (the modulated ring, pixel images) and in its coefficients, shifts
 * contribute -2 pi i q.dx, and the normalisation by the total flux gives dV = (dF - V dF(0)) / F(0).
 * @example
 * ```ts
 * const m = disk({ diameter: param('d', 2) });
 * visibilityJacobian(m, [5e7], [0]).dre[0]; // dRe V / d diameter at q = 5e7, per mas
 * ```
 */
export function visibilityJacobian(
  model: Model,
  u: ArrayLike<number>,
  v: ArrayLike<number>,
  values?: Values,
  out?: JacobianBuffers,
): VisibilityJacobian {
  const fn = 'visibilityJacobian';
  const bu = boundedFrequencyColumn(u, fn, 'u');
  const bv = boundedFrequencyColumn(v, fn, 'v');
  const uu = bu.column;
  const vv = bv.column;
  if (uu.length !== vv.length) {
    throw new InputError(
      `${fn}: u has ${uu.length} entries but v has ${vv.length}; give arrays of equal length`,
      {
        argument: 'v',
      },
    );
  }
  if (hasChromaticSlot(model.node)) {
    throw new ModelError(
      `${fn}: the model has wavelength-dependent slots; use observableJacobian with points.wavelength (metres)`,
      { argument: 'model' },
    );
  }
  const plan = prepare(model, parameterVector(model, values));
  const n = uu.length;
  const cols = plan.cols;
  const buf = (b: Float64Array | undefined, len: number, name: string): Float64Array => {
    if (b === undefined) return new Float64Array(len);
    if (!(b instanceof Float64Array) || b.length !== len) {
      throw new InputError(`${fn}: out.${name} must be a Float64Array of length ${len}`, {
        argument: `out.${name}`,
      });
    }
    return b;
  };
  const re = buf(out?.re, n, 're');
  const im = buf(out?.im, n, 'im');
  const dre = buf(out?.dre, n * cols, 'dre');
  const dim = buf(out?.dim, n * cols, 'dim');
  runJacobian(plan, uu, vv, re, im, dre, dim, n, bu.maxAbs, bv.maxAbs);
  return { parameters: model.parameters(), rows: n, cols, re, im, dre, dim };
}

function wrapDeg(p: number): number {
  return p <= -180 ? p + 360 : p;
}

/** Values and Jacobian of a VIS-type observable from V and dV (or, for vis2 given as `a2`, |V|^2 directly). */
function finishVis(
  observable: ObservableName,
  n: number,
  cols: number,
  re: Float64Array,
  im: Float64Array,
  dre: Float64Array,
  dim: Float64Array,
): { values: Float64Array; jacobian: Float64Array } {
  const out = new Float64Array(n);
  const jac = new Float64Array(n * cols);
  for (let i = 0; i < n; i++) {
    const r = re[i]!;
    const m = im[i]!;
    const a2 = r * r + m * m;
    const a = Math.sqrt(a2);
    const o = i * cols;
    switch (observable) {
      case 'visre':
        out[i] = r;
        for (let k = 0; k < cols; k++) jac[o + k] = dre[o + k]!;
        break;
      case 'visim':
        out[i] = m;
        for (let k = 0; k < cols; k++) jac[o + k] = dim[o + k]!;
        break;
      case 'vis2':
        out[i] = a2;
        for (let k = 0; k < cols; k++) jac[o + k] = 2 * (r * dre[o + k]! + m * dim[o + k]!);
        break;
      case 'visamp':
        out[i] = a;
        if (a > 0) for (let k = 0; k < cols; k++) jac[o + k] = (r * dre[o + k]! + m * dim[o + k]!) / a;
        break;
      default:
        out[i] = wrapDeg(Math.atan2(m, r) * DEG_PER_RAD);
        if (a2 > 0) {
          for (let k = 0; k < cols; k++)
            jac[o + k] = ((r * dim[o + k]! - m * dre[o + k]!) / a2) * DEG_PER_RAD;
        }
    }
  }
  return { values: out, jacobian: jac };
}

/** Values and Jacobian of a T3-type observable from the bispectrum T and dT. */
function finishT3(
  observable: ObservableName,
  n: number,
  cols: number,
  tr: Float64Array,
  ti: Float64Array,
  dtr: Float64Array,
  dti: Float64Array,
): { values: Float64Array; jacobian: Float64Array } {
  const map: Record<string, ObservableName> = {
    t3re: 'visre',
    t3im: 'visim',
    t3amp: 'visamp',
    t3phi: 'visphi',
  };
  return finishVis(map[observable]!, n, cols, tr, ti, dtr, dti);
}

/**
 * Adds w * T and w * dT of the triangles at rows [0, m) of V columns laid out as [AB | BC | CA] blocks of
 * length m, into the accumulators at `rows[k]`.
 */
function accumulateBispectrum(
  m: number,
  cols: number,
  re: Float64Array,
  im: Float64Array,
  dre: Float64Array,
  dim: Float64Array,
  rows: Int32Array | null,
  weights: Float64Array | null,
  tr: Float64Array,
  ti: Float64Array,
  dtr: Float64Array,
  dti: Float64Array,
): void {
  for (let k = 0; k < m; k++) {
    const row = rows === null ? k : rows[k]!;
    const w = weights === null ? 1 : weights[k]!;
    const ar = re[k]!;
    const ai = im[k]!;
    const br = re[m + k]!;
    const bi = im[m + k]!;
    const cr = re[2 * m + k]!;
    const ci = im[2 * m + k]!;
    const abr = ar * br - ai * bi;
    const abi = ar * bi + ai * br;
    const bcr = br * cr - bi * ci;
    const bci = br * ci + bi * cr;
    const acr = ar * cr - ai * ci;
    const aci = ar * ci + ai * cr;
    tr[row] = tr[row]! + w * (abr * cr - abi * ci);
    ti[row] = ti[row]! + w * (abr * ci + abi * cr);
    const oa = k * cols;
    const ob = (m + k) * cols;
    const oc = (2 * m + k) * cols;
    const o = row * cols;
    for (let j = 0; j < cols; j++) {
      const dar = dre[oa + j]!;
      const dai = dim[oa + j]!;
      const dbr = dre[ob + j]!;
      const dbi = dim[ob + j]!;
      const dcr = dre[oc + j]!;
      const dci = dim[oc + j]!;
      // dT = dA (BC) + dB (AC) + dC (AB)
      dtr[o + j] =
        dtr[o + j]! + w * (dar * bcr - dai * bci + (dbr * acr - dbi * aci) + (dcr * abr - dci * abi));
      dti[o + j] =
        dti[o + j]! + w * (dar * bci + dai * bcr + (dbr * aci + dbi * acr) + (dcr * abi + dci * abr));
    }
  }
}

/** Samples evaluated per runJacobian call (bounds the scratch to CHUNK x 3 x cols doubles per column). */
const CHUNK = 2048;

/**
 * Channel-averaged values and Jacobians: per group of sub-samples sharing a plan, V and dV at the scaled
 * frequencies, accumulated with the channel weights into mean V (VIS types), mean |V|^2 (VIS2) or mean T3.
 */
function sampledJacobian(
  model: Model,
  observable: ObservableName,
  req: Request,
  vec: Float64Array,
  samples: number,
  fn: string,
): { values: Float64Array; jacobian: Float64Array } {
  const n = req.n;
  const nb = req.nb;
  const cols = vec.length;
  const s = channelSamples(req.wavelength!, req.band, samples, fn, 'points.band');
  const chromatic = hasChromaticSlot(model.node);
  // the sub-samples come grouped by wavelength (one plan each for a chromatic model, one for all otherwise)
  const ar = new Float64Array(n);
  const ai = new Float64Array(n);
  const dar = new Float64Array(n * cols);
  const dai = new Float64Array(n * cols);
  const vis2 = observable === 'vis2';
  const width = Math.min(CHUNK, s.lambda.length);
  const uu = new Float64Array(nb * width);
  const vv = new Float64Array(nb * width);
  const re = new Float64Array(nb * width);
  const im = new Float64Array(nb * width);
  const dre = new Float64Array(nb * width * cols);
  const dim = new Float64Array(nb * width * cols);
  const rows = new Int32Array(width);
  const weights = new Float64Array(width);
  const achromaticPlan = chromatic ? null : prepare(model, vec);
  for (let g = 0; g < s.lam.length; g++) {
    const plan = achromaticPlan ?? prepare(model, vec, s.lam[g]!);
    const g0 = s.start[g]!;
    const size = s.start[g + 1]! - g0;
    for (let start = 0; start < size; start += width) {
      const m = Math.min(width, size - start);
      for (let k = 0; k < m; k++) {
        const smp = g0 + start + k;
        const r = s.point[smp]!;
        rows[k] = r;
        weights[k] = s.weight[smp]!;
        const scale = req.wavelength![r]! / s.lambda[smp]!;
        for (let b = 0; b < nb; b++) {
          uu[b * m + k] = req.u[b * n + r]! * scale;
          vv[b * m + k] = req.v[b * n + r]! * scale;
        }
      }
      runJacobian(plan, uu, vv, re, im, dre, dim, nb * m);
      if (req.triangles) {
        accumulateBispectrum(m, cols, re, im, dre, dim, rows, weights, ar, ai, dar, dai);
        continue;
      }
      for (let k = 0; k < m; k++) {
        const r = rows[k]!;
        const w = weights[k]!;
        const vr = re[k]!;
        const vi = im[k]!;
        const o = k * cols;
        const ro = r * cols;
        if (vis2) {
          // mean |V|^2 in ar, its derivative in dar
          ar[r] = ar[r]! + w * (vr * vr + vi * vi);
          for (let j = 0; j < cols; j++)
            dar[ro + j] = dar[ro + j]! + 2 * w * (vr * dre[o + j]! + vi * dim[o + j]!);
        } else {
          ar[r] = ar[r]! + w * vr;
          ai[r] = ai[r]! + w * vi;
          for (let j = 0; j < cols; j++) {
            dar[ro + j] = dar[ro + j]! + w * dre[o + j]!;
            dai[ro + j] = dai[ro + j]! + w * dim[o + j]!;
          }
        }
      }
    }
  }
  if (req.triangles) return finishT3(observable, n, cols, ar, ai, dar, dai);
  if (vis2) return { values: ar, jacobian: dar };
  return finishVis(observable, n, cols, ar, ai, dar, dai);
}

/**
 * An observable and its Jacobian with respect to the free parameters.
 *
 * @param model - a model with free parameters
 * @param observable - 'visre', 'visim', 'vis2', 'visamp', 'visphi' (degrees) at `{ u, v }`; or 't3re', 't3im',
 *   't3amp', 't3phi' (degrees) at triangles `{ u1, v1, u2, v2 }` (OI_T3 convention, third baseline -(1+2))
 * @param points - spatial frequencies in cycles per radian, with optional `wavelength` (EFF_WAVE, metres, per
 *   point; needed for wavelength-dependent slots) and `band` (EFF_BAND, metres, per point: channel average)
 * @param values - optional parameter values (array or record); default: current values
 * @param options - `samples`: Gauss-Legendre sub-samples per channel (default {@link DEFAULT_BAND_SAMPLES})
 * @returns values and the row-major Jacobian (`rows` x `cols`)
 * @throws InputError for malformed columns or an observable that does not fit the points; ModelError for
 *   values outside their bounds, slots outside their domain (at some wavelength) or a zero total flux
 *
 * Notes: VIS2 = |V|^2 so dVIS2 = 2 (re dre + im dim); VISAMP = |V|, dVISAMP = (re dre + im dim)/|V|; phases use
 * d arg z = (re dim - im dre)/|z|^2 in degrees. Where |V| = 0 exactly the amplitude and phase are not
 * differentiable; their rows are 0 there. The bispectrum's derivative is the product rule over its three
 * visibilities. With `wavelength`, the model is canonicalised (with gradients) once per distinct wavelength,
 * so the coefficients of power-law and blackbody slots are parameters like any other; for a model without
 * such slots a wavelength alone changes nothing. With `band`, exactly as `chromaticVisibilities`,
 * `chromaticVis2` and `chromaticBispectrum`: the sub-samples lambda_k = lambda + (band/2) x_k carry the
 * Gauss-Legendre weights, the frequency there is u * lambda / lambda_k, VIS-type observables derive from the
 * channel mean of V, VIS2 is the mean of |V|^2 (so its derivative is the mean of d|V|^2) and T3-type ones
 * derive from the mean bispectrum.
 * @example
 * ```ts
 * const m = disk({ diameter: param('d', 2) });
 * const j = observableJacobian(m, 'vis2', { u: [5e7], v: [0] });
 * j.jacobian[0]; // dV^2 / d diameter, per mas (negative: a bigger disk is more resolved)
 * ```
 */
export function observableJacobian(
  model: Model,
  observable: ObservableName,
  points: JacobianPoints,
  values?: Values,
  options?: ChromaticOptions,
): ObservableJacobian {
  const fn = 'observableJacobian';
  const names = model.parameters();
  const cols = names.length;
  const req = readRequest(fn, observable, points);
  const samples = readSamples(options, fn);
  const vec = parameterVector(model, values);
  const n = req.n;
  let result: { values: Float64Array; jacobian: Float64Array };
  if (needsWavelengths(model, req, fn)) {
    result = sampledJacobian(model, observable, req, vec, samples, fn);
  } else {
    const plan = prepare(model, vec);
    const len = req.nb * n;
    const re = new Float64Array(len);
    const im = new Float64Array(len);
    const dre = new Float64Array(len * cols);
    const dim = new Float64Array(len * cols);
    runJacobian(plan, req.u, req.v, re, im, dre, dim, len);
    if (req.triangles) {
      const tr = new Float64Array(n);
      const ti = new Float64Array(n);
      const dtr = new Float64Array(n * cols);
      const dti = new Float64Array(n * cols);
      accumulateBispectrum(n, cols, re, im, dre, dim, null, null, tr, ti, dtr, dti);
      result = finishT3(observable, n, cols, tr, ti, dtr, dti);
    } else {
      result = finishVis(observable, n, cols, re, im, dre, dim);
    }
  }
  return { observable, parameters: names, rows: n, cols, values: result.values, jacobian: result.jacobian };
}

function phases(re: Float64Array, im: Float64Array): Float64Array {
  const out = new Float64Array(re.length);
  for (let i = 0; i < re.length; i++) out[i] = wrapDeg(Math.atan2(im[i]!, re[i]!) * DEG_PER_RAD);
  return out;
}

function moduli(re: Float64Array, im: Float64Array): Float64Array {
  const out = new Float64Array(re.length);
  for (let i = 0; i < re.length; i++) out[i] = Math.hypot(re[i]!, im[i]!);
  return out;
}

/**
 * An observable's values alone, with the same arguments as {@link observableJacobian}: the entry point for
 * residual-only evaluations.
 *
 * @param model - a model (free parameters at `values`, or at their current values)
 * @param observable - as {@link observableJacobian}: 'visre', 'visim', 'vis2', 'visamp', 'visphi' at `{ u, v }`;
 *   't3re', 't3im', 't3amp', 't3phi' at `{ u1, v1, u2, v2 }`
 * @param points - spatial frequencies in cycles per radian, with optional `wavelength` and `band` (metres, per
 *   point) as in {@link observableJacobian}
 * @param values - optional parameter values (array or record); default: current values
 * @param options - `samples`: sub-samples per channel (default {@link DEFAULT_BAND_SAMPLES})
 * @returns one value per row; phases in degrees wrapped to (-180, 180]
 * @throws as {@link observableJacobian}
 *
 * Notes: uses the compiled value plans, no gradients: `model.at(values)` and then its methods (`visibilities`,
 * `vis2`, `bispectrum`, ...) when no wavelength matters, else `chromaticVisibilities`, `chromaticVis2` or
 * `chromaticBispectrum` at baselines u * wavelength (metres), which compile one plan per wavelength. The
 * results equal `observableJacobian(...).values` to rounding.
 * @example
 * ```ts
 * observableValues(disk({ diameter: param('d', 2) }), 'vis2', { u: [5e7], v: [0] }, [3]); // V^2 of a 3 mas disk
 * ```
 */
export function observableValues(
  model: Model,
  observable: ObservableName,
  points: JacobianPoints,
  values?: Values,
  options?: ChromaticOptions,
): Float64Array {
  const fn = 'observableValues';
  const req = readRequest(fn, observable, points);
  const samples = readSamples(options, fn);
  const m = values === undefined ? model : model.at(values);
  const n = req.n;
  const wavelengthsMatter = needsWavelengths(model, req, fn);
  if (!req.triangles) {
    const u = req.u;
    const v = req.v;
    if (observable === 'vis2') {
      if (!wavelengthsMatter) return m.vis2(u, v);
      return chromaticVis2(m, baselines(req, [u], [v])[0]!, { samples });
    }
    const z = wavelengthsMatter
      ? chromaticVisibilities(m, baselines(req, [u], [v])[0]!, { samples })
      : m.visibilities(u, v);
    return observable === 'visre'
      ? z.re
      : observable === 'visim'
        ? z.im
        : observable === 'visamp'
          ? moduli(z.re, z.im)
          : phases(z.re, z.im);
  }
  const u1 = req.u.subarray(0, n);
  const v1 = req.v.subarray(0, n);
  const u2 = req.u.subarray(n, 2 * n);
  const v2 = req.v.subarray(n, 2 * n);
  let t: { re: Float64Array; im: Float64Array };
  if (wavelengthsMatter) {
    const [a, b] = baselines(req, [u1, u2], [v1, v2]);
    t = chromaticBispectrum(
      m,
      {
        u1coord: a!.ucoord,
        v1coord: a!.vcoord,
        u2coord: b!.ucoord,
        v2coord: b!.vcoord,
        wavelength: a!.wavelength,
        ...(a!.band === undefined ? {} : { band: a!.band }),
      },
      { samples },
    );
  } else {
    t = m.bispectrum(u1, v1, u2, v2);
  }
  return observable === 't3re'
    ? t.re
    : observable === 't3im'
      ? t.im
      : observable === 't3amp'
        ? moduli(t.re, t.im)
        : phases(t.re, t.im);
}

/** Baselines in metres (u * wavelength) with the request's wavelength columns, for the chromatic functions. */
function baselines(
  req: Request,
  us: readonly Float64Array[],
  vs: readonly Float64Array[],
): { ucoord: Float64Array; vcoord: Float64Array; wavelength: Float64Array; band?: Float64Array }[] {
  const wl = req.wavelength!;
  return us.map((u, k) => {
    const v = vs[k]!;
    const ucoord = new Float64Array(req.n);
    const vcoord = new Float64Array(req.n);
    for (let i = 0; i < req.n; i++) {
      ucoord[i] = u[i]! * wl[i]!;
      vcoord[i] = v[i]! * wl[i]!;
    }
    return req.band === null
      ? { ucoord, vcoord, wavelength: wl }
      : { ucoord, vcoord, wavelength: wl, band: req.band };
  });
}

/**
 * The Jacobian as an ml-matrix `Matrix` (rows x cols), for linear algebra.
 * @param j - a result of {@link observableJacobian}
 * @returns a new Matrix holding a copy of the entries
 */
export function jacobianMatrix(j: ObservableJacobian): Matrix {
  const m = new Matrix(j.rows, j.cols);
  for (let r = 0; r < j.rows; r++) for (let c = 0; c < j.cols; c++) m.set(r, c, j.jacobian[r * j.cols + c]!);
  return m;
}
