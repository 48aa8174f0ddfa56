/**
 * Squared visibility (or visibility amplitude) against spatial frequency, data with error bars and the model's
 * predictions, coloured by wavelength.
 *
 * @module
 */
import type { OifitsDataset } from '../oifits/dataset.js';
import {
  checkDataset,
  FREQUENCY_TITLE,
  FREQUENCY_UNIT,
  type ModelSource,
  modelOf,
  num,
  type PlotRow,
  type PlotSize,
  type PlotSpec,
  predictVisibility,
  recordLabel,
  usable,
  VEGA_LITE_SCHEMA,
  WAVELENGTH_COLOR,
  WAVELENGTH_UNIT,
} from './spec.js';

/** Options of {@link visibilityPlot}. */
export interface VisibilityPlotOptions extends PlotSize {
  /** A model (or a fit result) whose predictions are drawn over the data. */
  readonly model?: ModelSource;
  /** `'vis2'` (OI_VIS2 VIS2DATA, the default) or `'visamp'` (OI_VIS VISAMP). */
  readonly observable?: 'vis2' | 'visamp';
}

/**
 * A Vega-Lite plot of V^2 (or |V|) against spatial frequency.
 *
 * @param dataset - an OIFITS dataset; flagged entries and NaN values are left out
 * @param options - `model` to draw, `observable`, `width`, `height`, `title`
 * @returns a Vega-Lite v5 specification with the data inline
 *
 * Notes: one data row per entry, with the fields `series` ('data' or 'model'), `frequency` (sqrt(u^2 + v^2) in
 * 10^6 cycles per radian), `value`, `error`, `low` and `high` (value -/+ error; null for model rows),
 * `wavelength` (micrometres), `baseline` (station names) and `record` (table:row, FITS rows from 1). Model
 * rows sit at the data's own (u, v, wavelength), so a record's channels join into a curve; the model is
 * evaluated per point at its wavelength when it has wavelength-dependent slots (without bandwidth smearing).
 * @example
 * ```ts
 * const spec = visibilityPlot(dataset, { model });
 * JSON.stringify(spec); // ready for any Vega-Lite renderer
 * ```
 */
export function visibilityPlot(dataset: OifitsDataset, options: VisibilityPlotOptions = {}): PlotSpec {
  const fn = 'visibilityPlot';
  checkDataset(dataset, fn);
  const amplitude = options.observable === 'visamp';
  const view = amplitude ? dataset.vis : dataset.vis2;
  const value = amplitude ? dataset.vis.visamp : dataset.vis2.value;
  const error = amplitude ? dataset.vis.visampError : dataset.vis2.error;
  const idx = usable(view.flag, value);
  const rows: PlotRow[] = [];
  const base = (i: number): PlotRow => ({
    frequency: Math.hypot(view.u[i]!, view.v[i]!) / FREQUENCY_UNIT,
    wavelength: view.wavelength[i]! / WAVELENGTH_UNIT,
    baseline: view.stations[i] ?? '',
    record: recordLabel(view.table[i]!, view.row[i]!),
  });
  for (const i of idx) {
    const e = error[i]!;
    const x = value[i]!;
    rows.push({
      series: 'data',
      ...base(i),
      value: x,
      error: num(e),
      low: Number.isFinite(e) ? x - e : null,
      high: Number.isFinite(e) ? x + e : null,
    });
  }
  const model = modelOf(options.model, fn);
  if (model !== undefined && idx.length > 0) {
    const pred = predictVisibility(model, view as OifitsDataset['vis2'], idx, amplitude);
    idx.forEach((i, k) => {
      rows.push({ series: 'model', ...base(i), value: pred[k]!, error: null, low: null, high: null });
    });
  }
  const yTitle = amplitude ? '|V|' : 'V²';
  const y = { field: 'value', type: 'quantitative', title: yTitle };
  const tooltip = [
    { field: 'series', type: 'nominal' },
    { field: 'baseline', type: 'nominal' },
    { field: 'record', type: 'nominal' },
    { field: 'frequency', type: 'quantitative', format: '.2f' },
    { field: 'wavelength', type: 'quantitative', format: '.4f' },
    { field: 'value', type: 'quantitative', format: '.4f' },
    { field: 'error', type: 'quantitative', format: '.4f' },
  ];
  const isData = { filter: "datum.series === 'data'" };
  const isModel = { filter: "datum.series === 'model'" };
  return {
    $schema: VEGA_LITE_SCHEMA,
    description: `${yTitle} against spatial frequency${model ? ', data and model' : ''}`,
    title: options.title ?? `${dataset.name}: ${yTitle}`,
    width: options.width ?? 480,
    height: options.height ?? 320,
    data: { values: rows },
    encoding: {
      x: { field: 'frequency', type: 'quantitative', title: FREQUENCY_TITLE },
      color: WAVELENGTH_COLOR,
    },
    layer: [
      {
        transform: [isData],
        mark: { type: 'rule' },
        encoding: { y: { ...y, field: 'low' }, y2: { field: 'high' } },
      },
      { transform: [isData], mark: { type: 'point', filled: true, size: 24 }, encoding: { y, tooltip } },
      ...(model
        ? [
            {
              transform: [isModel],
              mark: { type: 'line', strokeWidth: 1.5 },
              encoding: { y, detail: { field: 'record', type: 'nominal' }, order: { field: 'frequency' } },
            },
            {
              transform: [isModel],
              mark: { type: 'point', shape: 'diamond', filled: false, size: 30 },
              encoding: { y, tooltip },
            },
          ]
        : []),
    ],
  };
}
