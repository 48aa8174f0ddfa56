/**
 * Normalised residuals (model - data) / error of a model against a dataset, per observable, against spatial
 * frequency.
 *
 * @module
 */
import { type DataOptions, FIT_OBSERVABLES, type FitObservable } from '../fit/data.js';
import { type ResidualReport, residuals } from '../fit/residuals.js';
import type { OifitsDataset } from '../oifits/dataset.js';
import {
  checkDataset,
  FREQUENCY_TITLE,
  FREQUENCY_UNIT,
  largestFrequency,
  type ModelSource,
  modelOf,
  type PlotRow,
  type PlotSize,
  type PlotSpec,
  recordLabel,
  VEGA_LITE_SCHEMA,
  WAVELENGTH_UNIT,
} from './spec.js';

/** Options of {@link residualPlot}. */
export interface ResidualPlotOptions extends PlotSize, DataOptions {
  /** Horizontal guide lines at -/+ this many sigma, besides 0 (default 3). */
  readonly band?: number;
}

/** Label of each observable in the plot's legend. */
const LABEL: Record<FitObservable, string> = {
  vis2: 'V²',
  t3phi: 'closure phase',
  t3amp: 'triple amplitude',
  visamp: '|V|',
  visphi: 'visibility phase',
};

/**
 * A Vega-Lite plot of normalised residuals against spatial frequency, one colour per observable.
 *
 * @param dataset - the OIFITS dataset the model was compared with
 * @param source - a model, or a fit result (its `residuals` report is used as it is, with its `model`)
 * @param options - observables and weights as for `residuals` (for a model), `band`, `width`, `height`, `title`
 * @returns a Vega-Lite v5 specification with the data inline
 *
 * Notes: the residuals are those of `uvsky/fit`'s `residuals` (phases wrapped into (-180, 180] before dividing
 * by the error; flagged entries left out), so the plot shows what the fit minimised. Data rows have the fields
 * `observable` (OIFITS name in lower case), `label`, `residual` ((model - data) / error), `frequency` (10^6
 * cycles per radian; the largest of the triangle for T3 observables), `wavelength` (micrometres), `baseline`
 * and `record` (table:row).
 * @example
 * ```ts
 * const spec = residualPlot(dataset, fit(model, dataset));
 * ```
 */
export function residualPlot(
  dataset: OifitsDataset,
  source: ModelSource,
  options: ResidualPlotOptions = {},
): PlotSpec {
  const fn = 'residualPlot';
  checkDataset(dataset, fn);
  const given = (source as { residuals?: ResidualReport }).residuals;
  const report: ResidualReport =
    given && Array.isArray(given.observables) ? given : residuals(modelOf(source, fn)!, dataset, options);
  const rows: PlotRow[] = [];
  for (const o of report.observables) {
    const t3 = o.observable === 't3phi' || o.observable === 't3amp';
    const view = o.observable === 'vis2' ? dataset.vis2 : o.observable.startsWith('vis') ? dataset.vis : null;
    for (let k = 0; k < o.count; k++) {
      const i = o.index[k]!;
      let frequency: number;
      let baseline: string;
      let wl: number;
      let record: string;
      if (t3) {
        const d = dataset.t3;
        frequency = largestFrequency(d.u1[i]!, d.v1[i]!, d.u2[i]!, d.v2[i]!);
        baseline = d.stations[i] ?? '';
        wl = d.wavelength[i]!;
        record = recordLabel(d.table[i]!, d.row[i]!);
      } else {
        const d = view!;
        frequency = Math.hypot(d.u[i]!, d.v[i]!);
        baseline = d.stations[i] ?? '';
        wl = d.wavelength[i]!;
        record = recordLabel(d.table[i]!, d.row[i]!);
      }
      rows.push({
        observable: o.observable,
        label: LABEL[o.observable],
        residual: o.normalised[k]!,
        frequency: frequency / FREQUENCY_UNIT,
        wavelength: wl / WAVELENGTH_UNIT,
        baseline,
        record,
      });
    }
  }
  const band = options.band ?? 3;
  const order = FIT_OBSERVABLES.filter((o) => report.observables.some((r) => r.observable === o)).map(
    (o) => LABEL[o],
  );
  return {
    $schema: VEGA_LITE_SCHEMA,
    description: 'normalised residuals (model - data) / error against spatial frequency',
    title:
      options.title ??
      `${dataset.name}: normalised residuals, chi² = ${report.chi2.toPrecision(5)} for ${report.count} values`,
    width: options.width ?? 480,
    height: options.height ?? 280,
    layer: [
      {
        data: { values: [{ level: 0 }, { level: -band }, { level: band }] },
        mark: { type: 'rule', color: '#888888', strokeDash: [4, 4] },
        encoding: { y: { field: 'level', type: 'quantitative' } },
      },
      {
        data: { values: rows },
        mark: { type: 'point', filled: true, size: 20 },
        encoding: {
          x: { field: 'frequency', type: 'quantitative', title: FREQUENCY_TITLE },
          y: { field: 'residual', type: 'quantitative', title: '(model − data) / error' },
          color: { field: 'label', type: 'nominal', title: 'observable', sort: order },
          tooltip: [
            { field: 'label', type: 'nominal', title: 'observable' },
            { field: 'baseline', type: 'nominal' },
            { field: 'record', type: 'nominal' },
            { field: 'frequency', type: 'quantitative', format: '.2f' },
            { field: 'wavelength', type: 'quantitative', format: '.4f' },
            { field: 'residual', type: 'quantitative', format: '.2f' },
          ],
        },
      },
    ],
  };
}
