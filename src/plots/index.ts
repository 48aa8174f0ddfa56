/**
 * uvsky/plots: plots as data. Each function returns a Vega-Lite v5 specification (a plain JSON object with the
 * data inline) for a dataset and a model or fit result; `toSvg` renders one with the optional `vega` and
 * `vega-lite` packages; `renderImage` draws a model's intensity on a grid.
 *
 * @module
 */
export {
  DEFAULT_RENDER_PIXELS,
  DEFAULT_SMOOTHING_PIXELS,
  type RenderedImage,
  type RenderOptions,
  renderImage,
} from '../image/render.js';
export { type ClosurePhasePlotOptions, closurePhasePlot } from './closure-phase.js';
export { DEFAULT_IMAGE_PLOT_PIXELS, type ImagePlotOptions, imagePlot } from './image.js';
export { type ResidualPlotOptions, residualPlot } from './residuals.js';
export {
  FREQUENCY_UNIT,
  type ModelSource,
  type PlotRow,
  type PlotSize,
  type PlotSpec,
  VEGA_LITE_SCHEMA,
  WAVELENGTH_UNIT,
} from './spec.js';
export { type ModuleLoader, PlotError, type ToSvgOptions, toSvg } from './svg.js';
export { type UvCoveragePlotOptions, uvCoveragePlot } from './uv-coverage.js';
export { type VisibilityPlotOptions, visibilityPlot } from './visibility.js';
