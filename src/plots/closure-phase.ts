/**
 * Closure phase against the largest spatial frequency of each triangle, data with error bars and the model's
 * predictions, coloured by wavelength.
 *
 * @module
 */
import type { OifitsDataset } from '../oifits/dataset.js';
import {
  checkDataset,
  FREQUENCY_UNIT,
  largestFrequency,
  type ModelSource,
  modelOf,
  num,
  type PlotRow,
  type PlotSize,
  type PlotSpec,
  predictClosurePhase,
  recordLabel,
  usable,
  VEGA_LITE_SCHEMA,
  WAVELENGTH_COLOR,
  WAVELENGTH_UNIT,
} from './spec.js';

/** Options of {@link closurePhasePlot}. */
export interface ClosurePhasePlotOptions extends PlotSize {
  /** A model (or a fit result) whose closure phases are drawn over the data. */
  readonly model?: ModelSource;
}

/**
 * A Vega-Lite plot of closure phases (OI_T3 T3PHI) against the largest spatial frequency of the triangle.
 *
 * @param dataset - an OIFITS dataset; flagged entries and NaN values are left out
 * @param options - `model` to draw, `width`, `height`, `title`
 * @returns a Vega-Lite v5 specification with the data inline
 *
 * Notes: data rows have the fields `series` ('data' or 'model'), `frequency` (max(|q1|, |q2|, |q1 + q2|) in
 * 10^6 cycles per radian), `value` (degrees in (-180, 180]), `error`, `low`, `high` (degrees; null for model
 * rows), `wavelength` (micrometres), `triangle` (station names) and `record` (table:row). The y axis spans
 * -180 to 180 degrees; error bars are drawn as value -/+ error without wrapping.
 * @example
 * ```ts
 * const spec = closurePhasePlot(dataset, { model: result });
 * ```
 */
export function closurePhasePlot(dataset: OifitsDataset, options: ClosurePhasePlotOptions = {}): PlotSpec {
  const fn = 'closurePhasePlot';
  checkDataset(dataset, fn);
  const t3 = dataset.t3;
  const idx = usable(t3.flag, t3.t3phi);
  const base = (i: number): PlotRow => ({
    frequency: largestFrequency(t3.u1[i]!, t3.v1[i]!, t3.u2[i]!, t3.v2[i]!) / FREQUENCY_UNIT,
    wavelength: t3.wavelength[i]! / WAVELENGTH_UNIT,
    triangle: t3.stations[i] ?? '',
    record: recordLabel(t3.table[i]!, t3.row[i]!),
  });
  const rows: PlotRow[] = [];
  for (const i of idx) {
    const x = t3.t3phi[i]!;
    const e = t3.t3phiError[i]!;
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
    const pred = predictClosurePhase(model, t3, idx);
    idx.forEach((i, k) => {
      rows.push({ series: 'model', ...base(i), value: pred[k]!, error: null, low: null, high: null });
    });
  }
  const y = {
    field: 'value',
    type: 'quantitative',
    title: 'closure phase (°)',
    scale: { domain: [-180, 180] },
  };
  const tooltip = [
    { field: 'series', type: 'nominal' },
    { field: 'triangle', type: 'nominal' },
    { field: 'record', type: 'nominal' },
    { field: 'frequency', type: 'quantitative', format: '.2f' },
    { field: 'wavelength', type: 'quantitative', format: '.4f' },
    { field: 'value', type: 'quantitative', format: '.2f' },
    { field: 'error', type: 'quantitative', format: '.2f' },
  ];
  const isData = { filter: "datum.series === 'data'" };
  const isModel = { filter: "datum.series === 'model'" };
  return {
    $schema: VEGA_LITE_SCHEMA,
    description: `closure phase against the largest spatial frequency of the triangle${model ? ', data and model' : ''}`,
    title: options.title ?? `${dataset.name}: closure phase`,
    width: options.width ?? 480,
    height: options.height ?? 320,
    data: { values: rows },
    encoding: {
      x: {
        field: 'frequency',
        type: 'quantitative',
        title: 'largest spatial frequency of the triangle (10⁶ cycles/rad)',
      },
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
              mark: { type: 'point', shape: 'diamond', filled: false, size: 30 },
              encoding: { y, tooltip },
            },
          ]
        : []),
    ],
  };
}
