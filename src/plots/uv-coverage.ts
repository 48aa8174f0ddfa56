/**
 * The uv coverage of a dataset: every baseline's (u, v) and its mirror (-u, -v), east to the left.
 *
 * @module
 */
import type { OifitsDataset } from '../oifits/dataset.js';
import {
  checkDataset,
  FREQUENCY_UNIT,
  type PlotRow,
  type PlotSize,
  type PlotSpec,
  VEGA_LITE_SCHEMA,
  WAVELENGTH_COLOR,
  WAVELENGTH_UNIT,
} from './spec.js';

/** Options of {@link uvCoveragePlot}. */
export interface UvCoveragePlotOptions extends PlotSize {
  /** Include flagged entries (default false). */
  readonly flagged?: boolean;
}

/**
 * A Vega-Lite plot of the uv coverage of a dataset's OI_VIS2 and OI_VIS baselines and of the three baselines
 * of every OI_T3 triangle, with the mirrored points.
 *
 * @param dataset - an OIFITS dataset
 * @param options - `flagged` to keep flagged entries, `width` (also the height: the axes have equal scales), `title`
 * @returns a Vega-Lite v5 specification with the data inline
 *
 * Notes: V(-u, -v) is the complex conjugate of V(u, v) for a real image, so every measured point also samples
 * its mirror; both are drawn, the mirrors faint. The u axis (east) is reversed, so east is to the left as on
 * the sky, and both axes span the same range. Data rows have the fields `u`, `v` (10^6 cycles per radian),
 * `wavelength` (micrometres), `baseline` (station names), `table` ('vis2', 'vis' or 't3') and `mirrored`. A
 * baseline measured at the same (u, v, wavelength) in several tables appears once.
 * @example
 * ```ts
 * const spec = uvCoveragePlot(dataset);
 * ```
 */
export function uvCoveragePlot(dataset: OifitsDataset, options: UvCoveragePlotOptions = {}): PlotSpec {
  checkDataset(dataset, 'uvCoveragePlot');
  const rows: PlotRow[] = [];
  const seen = new Set<string>();
  let extent = 0;
  const add = (u: number, v: number, wl: number, baseline: string, table: string): void => {
    const key = `${u}|${v}|${wl}`;
    if (seen.has(key) || !Number.isFinite(u) || !Number.isFinite(v)) return;
    seen.add(key);
    const uu = u / FREQUENCY_UNIT;
    const vv = v / FREQUENCY_UNIT;
    extent = Math.max(extent, Math.abs(uu), Math.abs(vv));
    const w = wl / WAVELENGTH_UNIT;
    rows.push({ u: uu, v: vv, wavelength: w, baseline, table, mirrored: false });
    rows.push({ u: -uu, v: -vv, wavelength: w, baseline, table, mirrored: true });
  };
  const keep = (flag: Uint8Array, i: number) => options.flagged === true || flag[i] === 0;
  for (const [name, view] of [
    ['vis2', dataset.vis2],
    ['vis', dataset.vis],
  ] as const) {
    for (let i = 0; i < view.length; i++) {
      if (keep(view.flag, i)) add(view.u[i]!, view.v[i]!, view.wavelength[i]!, view.stations[i] ?? '', name);
    }
  }
  const t3 = dataset.t3;
  for (let i = 0; i < t3.length; i++) {
    if (!keep(t3.flag, i)) continue;
    const names = (t3.stations[i] ?? '').split('-');
    const [a = '', b = '', c = ''] = names;
    const wl = t3.wavelength[i]!;
    add(t3.u1[i]!, t3.v1[i]!, wl, `${a}-${b}`, 't3');
    add(t3.u2[i]!, t3.v2[i]!, wl, `${b}-${c}`, 't3');
    // the closing baseline C -> A is -(AB + BC); its mirror A -> C is drawn as well
    add(-(t3.u1[i]! + t3.u2[i]!), -(t3.v1[i]! + t3.v2[i]!), wl, `${c}-${a}`, 't3');
  }
  const m = extent > 0 ? extent * 1.05 : 1;
  const size = options.width ?? options.height ?? 400;
  return {
    $schema: VEGA_LITE_SCHEMA,
    description: 'uv coverage with mirrored points; u (east) increases to the left',
    title: options.title ?? `${dataset.name}: uv coverage`,
    width: size,
    height: size,
    data: { values: rows },
    mark: { type: 'point', size: 18, filled: true },
    encoding: {
      x: {
        field: 'u',
        type: 'quantitative',
        title: '← east   u (10⁶ cycles/rad)',
        scale: { domain: [-m, m], reverse: true, nice: false },
      },
      y: {
        field: 'v',
        type: 'quantitative',
        title: 'v (10⁶ cycles/rad)   north →',
        scale: { domain: [-m, m], nice: false },
      },
      color: WAVELENGTH_COLOR,
      opacity: { condition: { test: 'datum.mirrored', value: 0.35 }, value: 1 },
      tooltip: [
        { field: 'baseline', type: 'nominal' },
        { field: 'table', type: 'nominal' },
        { field: 'u', type: 'quantitative', format: '.2f' },
        { field: 'v', type: 'quantitative', format: '.2f' },
        { field: 'wavelength', type: 'quantitative', format: '.4f' },
        { field: 'mirrored', type: 'nominal' },
      ],
    },
  };
}
