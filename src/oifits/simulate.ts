/**
 * Simulated observations: a dataset's observables replaced by a model's predictions, with optional Gaussian
 * noise drawn from the stated errors.
 *
 * @module
 */
import { InputError } from '../errors.js';
import { wrapDegrees } from '../units/index.js';
import { column } from './columns.js';
import type { OifitsDataset, OiTable, OiTables } from './dataset.js';
import { rebuild, replaceColumn } from './edit.js';
import type { ColumnData } from './fits/bintable.js';
import { flattenTables } from './flatten.js';
import { seededRandom } from './random.js';
import { type WriteOifitsOptions, writeOifits } from './write.js';

/**
 * What `simulate` needs of a model (typed structurally, so that this layer imports no model code). Spatial
 * frequencies in cycles per radian; phases in degrees.
 */
export interface SimulationModel {
  /** Normalised complex visibility at (u, v). */
  visibilities(u: ArrayLike<number>, v: ArrayLike<number>): { re: Float64Array; im: Float64Array };
  /** Squared visibility amplitude at (u, v). */
  vis2(u: ArrayLike<number>, v: ArrayLike<number>): Float64Array;
  /** Closure phase, degrees, of the triangle with baselines (u1, v1), (u2, v2) and -(u1 + u2, v1 + v2). */
  closurePhase(
    u1: ArrayLike<number>,
    v1: ArrayLike<number>,
    u2: ArrayLike<number>,
    v2: ArrayLike<number>,
  ): Float64Array;
  /** Triple-product amplitude of the same triangle. */
  t3amp(
    u1: ArrayLike<number>,
    v1: ArrayLike<number>,
    u2: ArrayLike<number>,
    v2: ArrayLike<number>,
  ): Float64Array;
}

/**
 * A model that also takes each point's wavelength and channel width (EFF_WAVE, EFF_BAND in metres) after the
 * spatial frequencies; it says so with `takesWavelengths: true` (the observe layer's `atWavelengths` builds one).
 */
export interface WavelengthSimulationModel {
  readonly takesWavelengths: true;
  visibilities(
    u: ArrayLike<number>,
    v: ArrayLike<number>,
    wavelength: Float64Array,
    band: Float64Array,
  ): { re: Float64Array; im: Float64Array };
  vis2(
    u: ArrayLike<number>,
    v: ArrayLike<number>,
    wavelength: Float64Array,
    band: Float64Array,
  ): Float64Array;
  closurePhase(
    u1: ArrayLike<number>,
    v1: ArrayLike<number>,
    u2: ArrayLike<number>,
    v2: ArrayLike<number>,
    wavelength: Float64Array,
    band: Float64Array,
  ): Float64Array;
  t3amp(
    u1: ArrayLike<number>,
    v1: ArrayLike<number>,
    u2: ArrayLike<number>,
    v2: ArrayLike<number>,
    wavelength: Float64Array,
    band: Float64Array,
  ): Float64Array;
}

/** Options of {@link simulate}. */
export interface SimulateOptions {
  /** Add Gaussian noise with the standard deviation of each value's stated error (default false). */
  readonly noise?: boolean;
  /** Seed of the noise generator (default 1). The same seed gives the same noise. */
  readonly seed?: number;
  /** Options for writing the file (primary-header values, DATE). */
  readonly write?: WriteOifitsOptions;
}

/** The result of {@link simulate}. */
export interface Simulation {
  /** The dataset with simulated observables. */
  readonly dataset: OifitsDataset;
  /** The same, written as an OIFITS 2 file. */
  readonly bytes: Uint8Array;
}

function checkOutput(name: string, out: unknown, n: number): Float64Array {
  if (!(out instanceof Float64Array) || out.length !== n) {
    throw new InputError(
      `simulate: model.${name} must return a Float64Array of ${n} values, got ${out instanceof Float64Array ? `${out.length} values` : typeof out}`,
      { argument: 'model' },
    );
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(out[i]!)) {
      throw new InputError(
        `simulate: model.${name} returned ${out[i]} at entry ${i}; predictions must be finite`,
        {
          argument: 'model',
          index: i,
        },
      );
    }
  }
  return out;
}

/**
 * Fills a dataset's observables with a model's predictions and writes the result as an OIFITS 2 file.
 *
 * @param model - any object with `visibilities`, `vis2`, `closurePhase` (degrees) and `t3amp`, taking u, v in
 *   cycles per radian (see {@link SimulationModel}); or one that also takes wavelengths and channel widths
 *   ({@link WavelengthSimulationModel}, e.g. `atWavelengths(model)`) for wavelength-dependent models
 * @param dataset - supplies the uv coverage, wavelengths, errors and flags; not changed
 * @param options - `noise` to add Gaussian noise N(0, error) to each value, `seed` for it, `write` options
 * @returns the new dataset and its file bytes
 * @throws InputError when the model's outputs are not finite Float64Arrays of the right length
 *
 * Notes: VIS2DATA = model.vis2; VISAMP = |V| and VISPHI = arg V in degrees (from `visibilities`); T3PHI =
 * closurePhase, T3AMP = t3amp. Phases, noisy or not, are wrapped into (-180, 180]. A value that was NaN in
 * the input (no measurement) stays NaN; errors and flags are kept; OI_FLUX is copied unchanged; the complex
 * coherent-flux columns RVIS / IVIS (and their errors) of OI_VIS, which a normalised model cannot predict,
 * are removed. The generator is a seeded 32-bit hash sequence with Box-Muller deviates (`random.ts`).
 *
 * @example
 * ```ts
 * const { dataset, bytes } = simulate(model, observed, { noise: true, seed: 7 });
 * ```
 */
export function simulate(
  model: SimulationModel | WavelengthSimulationModel,
  dataset: OifitsDataset,
  options: SimulateOptions = {},
): Simulation {
  for (const m of ['visibilities', 'vis2', 'closurePhase', 't3amp'] as const) {
    if (typeof (model as unknown as Record<string, unknown>)?.[m] !== 'function') {
      throw new InputError(
        `simulate: the model has no method ${m}; it needs visibilities, vis2, closurePhase and t3amp`,
        {
          argument: 'model',
        },
      );
    }
  }
  // only a model that declares it takes wavelengths gets them (a Model's third argument is an output buffer)
  const withWave = (model as Partial<WavelengthSimulationModel>).takesWavelengths === true;
  const m = model as WavelengthSimulationModel;
  const call = {
    vis2: (u: Float64Array, v: Float64Array, w: Float64Array, b: Float64Array) =>
      withWave ? m.vis2(u, v, w, b) : (model as SimulationModel).vis2(u, v),
    visibilities: (u: Float64Array, v: Float64Array, w: Float64Array, b: Float64Array) =>
      withWave ? m.visibilities(u, v, w, b) : (model as SimulationModel).visibilities(u, v),
    closurePhase: (
      a: Float64Array,
      b: Float64Array,
      c: Float64Array,
      d: Float64Array,
      w: Float64Array,
      bw: Float64Array,
    ) => (withWave ? m.closurePhase(a, b, c, d, w, bw) : (model as SimulationModel).closurePhase(a, b, c, d)),
    t3amp: (
      a: Float64Array,
      b: Float64Array,
      c: Float64Array,
      d: Float64Array,
      w: Float64Array,
      bw: Float64Array,
    ) => (withWave ? m.t3amp(a, b, c, d, w, bw) : (model as SimulationModel).t3amp(a, b, c, d)),
  };
  const rng = seededRandom(options.seed ?? 1);
  const noise = options.noise === true;
  const full = flattenTables(dataset.tables, dataset.targets);
  const wavelengthOf = new Map(dataset.tables.wavelength.map((t) => [t.insname ?? '', t.nrows]));

  const scatter = (
    tables: readonly OiTable[],
    view: { table: Int32Array; row: Int32Array; channel: Int32Array },
    name: string,
    errName: string,
    pred: Float64Array,
    phase: boolean,
  ): OiTable[] =>
    tables.map((t, ti) => {
      const c = column(t, name)!;
      const err = column(t, errName)!.data as ArrayLike<number>;
      const src = c.data as Float64Array;
      const C = src.constructor as new (n: number) => Float64Array;
      const out = new C(src.length);
      out.set(src);
      const nw = wavelengthOf.get(t.insname ?? '') ?? 0;
      for (let k = 0; k < view.table.length; k++) {
        if (view.table[k] !== ti) continue;
        const i = view.row[k]! * nw + view.channel[k]!;
        if (Number.isNaN(src[i]!)) continue;
        let x = pred[k]!;
        const e = err[i]!;
        if (noise && e > 0 && Number.isFinite(e)) x += e * rng.normal();
        out[i] = phase ? wrapDegrees(x) : x;
      }
      return replaceColumn(t, c.name, out as unknown as ColumnData);
    });

  // OI_VIS2.
  const v2 = full.vis2;
  const p2 = checkOutput('vis2', call.vis2(v2.u, v2.v, v2.wavelength, v2.band), v2.length);
  const vis2 = scatter(dataset.tables.vis2, v2, 'VIS2DATA', 'VIS2ERR', p2, false);

  // OI_VIS.
  const vv = full.vis;
  const cv = call.visibilities(vv.u, vv.v, vv.wavelength, vv.band);
  const re = checkOutput('visibilities (re)', cv?.re, vv.length);
  const im = checkOutput('visibilities (im)', cv?.im, vv.length);
  const amp = new Float64Array(vv.length);
  const phi = new Float64Array(vv.length);
  for (let k = 0; k < vv.length; k++) {
    amp[k] = Math.hypot(re[k]!, im[k]!);
    phi[k] = (Math.atan2(im[k]!, re[k]!) * 180) / Math.PI;
  }
  let vis = scatter(dataset.tables.vis, vv, 'VISAMP', 'VISAMPERR', amp, false);
  vis = scatter(vis, vv, 'VISPHI', 'VISPHIERR', phi, true);
  const coherent = new Set(['RVIS', 'RVISERR', 'IVIS', 'IVISERR', 'CORRINDX_RVIS', 'CORRINDX_IVIS']);
  vis = vis.map((t) =>
    t.columns.some((c) => coherent.has(c.name))
      ? rebuild(t, { columns: t.columns.filter((c) => !coherent.has(c.name)) })
      : t,
  );

  // OI_T3.
  const t3v = full.t3;
  const cp = checkOutput(
    'closurePhase',
    call.closurePhase(t3v.u1, t3v.v1, t3v.u2, t3v.v2, t3v.wavelength, t3v.band),
    t3v.length,
  );
  const ta = checkOutput(
    't3amp',
    call.t3amp(t3v.u1, t3v.v1, t3v.u2, t3v.v2, t3v.wavelength, t3v.band),
    t3v.length,
  );
  let t3 = scatter(dataset.tables.t3, t3v, 'T3PHI', 'T3PHIERR', cp, true);
  t3 = scatter(t3, t3v, 'T3AMP', 'T3AMPERR', ta, false);

  const tables: OiTables = Object.freeze({ ...dataset.tables, vis2, vis, t3 });
  const dropped =
    dataset.vis2.length < full.vis2.length ||
    dataset.vis.length < full.vis.length ||
    dataset.t3.length < full.t3.length;
  const views = flattenTables(tables, dataset.targets, { dropFlagged: dropped });
  const out: OifitsDataset = Object.freeze({ ...dataset, tables, ...views });
  return { dataset: out, bytes: writeOifits(out, options.write) };
}
