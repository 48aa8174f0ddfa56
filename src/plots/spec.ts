/**
 * What the plot functions share: the Vega-Lite specification type, the units of the data fields, the choice of
 * usable entries and the model's predictions at a dataset's points.
 *
 * @module
 */
import { InputError } from '../errors.js';
import { hasChromaticSlot } from '../model/chromatic-slot.js';
import { Model } from '../model/model.js';
import { chromaticClosurePhase, chromaticVis2, chromaticVisibilities } from '../observe/chromatic.js';
import type { OifitsDataset } from '../oifits/dataset.js';

/** The Vega-Lite schema the specifications are written for. */
export const VEGA_LITE_SCHEMA = 'https://vega.github.io/schema/vega-lite/v5.json';

/**
 * A Vega-Lite v5 specification: a plain JSON object (no functions, no class instances), with the data inline
 * under `data.values`. Field names inside the data are uvsky's own and are listed by each plot function.
 */
export interface PlotSpec {
  readonly $schema: string;
  readonly [key: string]: unknown;
}

/** A plain data row of a specification. */
export type PlotRow = Record<string, number | string | boolean | null>;

/** A model, or anything that carries one (a fit result). */
export type ModelSource = Model | { readonly model: Model };

/** Size of a plot in pixels. */
export interface PlotSize {
  /** Width, pixels (default depends on the plot). */
  readonly width?: number;
  /** Height, pixels. */
  readonly height?: number;
  /** Title (default: the dataset's name and what is shown). */
  readonly title?: string;
}

/** Spatial frequencies in the data are in units of 10^6 cycles per radian (mega-lambda). */
export const FREQUENCY_UNIT = 1e6;
/** Wavelengths in the data are in micrometres. */
export const WAVELENGTH_UNIT = 1e-6;

/** Axis title of spatial frequencies. */
export const FREQUENCY_TITLE = 'spatial frequency (10⁶ cycles/rad)';
/** Colour legend title of wavelengths. */
export const WAVELENGTH_TITLE = 'wavelength (µm)';

/** @internal The model inside a source, with a clear error for anything else. */
export function modelOf(source: ModelSource | undefined, fn: string): Model | undefined {
  if (source === undefined) return undefined;
  if (source instanceof Model) return source;
  const m = (source as { model?: unknown })?.model;
  if (m instanceof Model) return m;
  throw new InputError(`${fn}: model must be a Model or a fit result with a .model, got ${typeof source}`, {
    argument: 'model',
  });
}

/** @internal Checks the dataset argument. */
export function checkDataset(dataset: OifitsDataset, fn: string): void {
  const d = dataset as Partial<OifitsDataset> | undefined;
  if (!d || typeof d !== 'object' || !d.vis2 || !d.t3 || !d.vis) {
    throw new InputError(`${fn}: dataset must be an OifitsDataset (from readOifits or planObservation)`, {
      argument: 'dataset',
    });
  }
}

/** @internal Indices of the entries that are not flagged and hold a finite value. */
export function usable(flag: Uint8Array, value: Float64Array): number[] {
  const out: number[] = [];
  for (let i = 0; i < value.length; i++) if (flag[i] === 0 && Number.isFinite(value[i]!)) out.push(i);
  return out;
}

/** @internal Picks entries of a column. */
export function pick(src: ArrayLike<number>, idx: readonly number[]): Float64Array {
  return Float64Array.from(idx, (i) => src[i]!);
}

/** @internal A record label: table and row of the entry (FITS rows from 1). */
export function recordLabel(table: number, row: number): string {
  return `${table}:${row + 1}`;
}

/** @internal Model V^2 (or |V|) at entries of a two-station view; wavelength-dependent slots are read per point. */
export function predictVisibility(
  model: Model,
  view: OifitsDataset['vis2'],
  idx: readonly number[],
  amplitude: boolean,
): Float64Array {
  if (hasChromaticSlot(model.node)) {
    const pts = {
      ucoord: pick(view.ucoord, idx),
      vcoord: pick(view.vcoord, idx),
      wavelength: pick(view.wavelength, idx),
    };
    if (!amplitude) return chromaticVis2(model, pts);
    const c = chromaticVisibilities(model, pts);
    return c.re.map((r, k) => Math.hypot(r, c.im[k]!));
  }
  const u = pick(view.u, idx);
  const v = pick(view.v, idx);
  return amplitude ? model.visamp(u, v) : model.vis2(u, v);
}

/** @internal Model closure phases (degrees) at entries of the T3 view. */
export function predictClosurePhase(
  model: Model,
  view: OifitsDataset['t3'],
  idx: readonly number[],
): Float64Array {
  if (hasChromaticSlot(model.node)) {
    return chromaticClosurePhase(model, {
      u1coord: pick(view.u1coord, idx),
      v1coord: pick(view.v1coord, idx),
      u2coord: pick(view.u2coord, idx),
      v2coord: pick(view.v2coord, idx),
      wavelength: pick(view.wavelength, idx),
    });
  }
  return model.closurePhase(pick(view.u1, idx), pick(view.v1, idx), pick(view.u2, idx), pick(view.v2, idx));
}

/** @internal The largest spatial frequency of a triangle, cycles per radian: max(|q1|, |q2|, |q1 + q2|). */
export function largestFrequency(u1: number, v1: number, u2: number, v2: number): number {
  return Math.max(Math.hypot(u1, v1), Math.hypot(u2, v2), Math.hypot(u1 + u2, v1 + v2));
}

/** @internal A finite number or null (JSON has no NaN). */
export function num(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

/** @internal The colour channel by wavelength shared by the plots. */
export const WAVELENGTH_COLOR = {
  field: 'wavelength',
  type: 'quantitative',
  title: WAVELENGTH_TITLE,
  scale: { scheme: 'viridis' },
} as const;
