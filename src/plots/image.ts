/**
 * A model's intensity image as a Vega-Lite heat map: north up, east to the left, axes in mas.
 *
 * @module
 */
import { type RenderOptions, renderImage } from '../image/render.js';
import {
  type ModelSource,
  modelOf,
  type PlotRow,
  type PlotSize,
  type PlotSpec,
  VEGA_LITE_SCHEMA,
} from './spec.js';

/** Options of {@link imagePlot}: the rendering options and the plot's size. */
export interface ImagePlotOptions extends RenderOptions, PlotSize {}

/** Default pixels along each axis of {@link imagePlot} (fewer than `renderImage`'s, to keep the JSON small). */
export const DEFAULT_IMAGE_PLOT_PIXELS = 64;

/**
 * A Vega-Lite heat map of a model's intensity, rendered by `renderImage`.
 *
 * @param source - a model or a fit result (its best-fit model)
 * @param options - `pixels` (default 64), `fov` (mas), `smoothing` (FWHM, mas), `wavelength` (metres), `width`,
 *   `title`
 * @returns a Vega-Lite v5 specification with one data row per pixel
 *
 * Notes: rows have the fields `east`, `north` (pixel centre, mas), `east0`, `east1`, `north0`, `north1` (pixel
 * edges, mas), `intensity` (fraction of the total flux in the pixel) and `relative` (intensity / the largest
 * pixel). The east axis is reversed (east to the left) and both axes have the same scale. The image is the
 * model convolved with a circular Gaussian of FWHM `smoothing` (see `renderImage`); the subtitle says so.
 * @example
 * ```ts
 * const spec = imagePlot(disk({ diameter: 2 }), { fov: 4 });
 * ```
 */
export function imagePlot(source: ModelSource, options: ImagePlotOptions = {}): PlotSpec {
  const model = modelOf(source, 'imagePlot')!;
  const img = renderImage(model, { pixels: DEFAULT_IMAGE_PLOT_PIXELS, ...options });
  const n = img.pixels;
  let peak = 0;
  for (const x of img.intensity) peak = Math.max(peak, x);
  const h = img.step / 2;
  const rows: PlotRow[] = [];
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const e = img.east[i]!;
      const no = img.north[j]!;
      const x = img.intensity[j * n + i]!;
      rows.push({
        east: e,
        north: no,
        east0: e - h,
        east1: e + h,
        north0: no - h,
        north1: no + h,
        intensity: x,
        relative: peak > 0 ? x / peak : 0,
      });
    }
  }
  const lo = img.east[0]! - h;
  const hi = img.east[n - 1]! + h;
  const size = options.width ?? options.height ?? 400;
  const at = Number.isNaN(img.wavelength) ? '' : ` at ${(img.wavelength * 1e6).toPrecision(4)} µm`;
  return {
    $schema: VEGA_LITE_SCHEMA,
    description: 'model intensity, north up and east to the left',
    title: {
      text: options.title ?? `model intensity${at}`,
      subtitle: `convolved with a Gaussian of FWHM ${img.smoothing.toPrecision(3)} mas; ${n} × ${n} pixels of ${img.step.toPrecision(3)} mas`,
    },
    width: size,
    height: size,
    data: { values: rows },
    mark: { type: 'rect' },
    encoding: {
      x: {
        field: 'east0',
        type: 'quantitative',
        title: '← east (mas)',
        scale: { domain: [lo, hi], reverse: true, nice: false, zero: false },
      },
      x2: { field: 'east1' },
      y: {
        field: 'north0',
        type: 'quantitative',
        title: 'north (mas) →',
        scale: { domain: [lo, hi], nice: false, zero: false },
      },
      y2: { field: 'north1' },
      color: {
        field: 'relative',
        type: 'quantitative',
        title: 'relative intensity',
        scale: { scheme: 'inferno', domain: [0, 1], clamp: true },
      },
      tooltip: [
        { field: 'east', type: 'quantitative', format: '.3f' },
        { field: 'north', type: 'quantitative', format: '.3f' },
        { field: 'intensity', type: 'quantitative', format: '.3e' },
      ],
    },
    config: { view: { stroke: null }, axis: { grid: false } },
  };
}
