/**
 * The Vega-Lite specifications: their data rows against the dataset and the model they were made from, the
 * orientation conventions of the trade (east to the left, common practice), plain JSON, and compilation by
 * the vega-lite package itself when it is installed.
 */
import { describe, expect, it } from 'vitest';
import { fit } from '../../src/fit/index.js';
import { disk, param, point, sum } from '../../src/index.js';
import { simulate } from '../../src/oifits/index.js';
import {
  closurePhasePlot,
  imagePlot,
  PlotError,
  type PlotRow,
  type PlotSpec,
  residualPlot,
  toSvg,
  uvCoveragePlot,
  visibilityPlot,
} from '../../src/plots/index.js';
import { plannedDataset } from './helpers.js';

const VALUE_TOL = 1e-12;

const truth = sum(disk({ diameter: 2.5 }), point().weight(0.2).shift(3, 1.5));
const dataset = simulate(truth, plannedDataset(), { noise: true, seed: 11 }).dataset;

function rows(spec: PlotSpec, layer?: number): PlotRow[] {
  const s = spec as { data?: { values: PlotRow[] }; layer?: { data?: { values: PlotRow[] } }[] };
  return (layer === undefined ? s.data!.values : s.layer![layer]!.data!.values) as PlotRow[];
}

let vegaLite: { compile(spec: unknown): { spec: unknown } } | null = null;
try {
  vegaLite = (await import('vega-lite')) as unknown as typeof vegaLite;
} catch {
  vegaLite = null;
}

describe('visibilityPlot', () => {
  it('has one data row per usable V^2 entry and one model row each, at the model V^2 of that point', () => {
    const spec = visibilityPlot(dataset, { model: truth });
    const data = rows(spec).filter((r) => r.series === 'data');
    const model = rows(spec).filter((r) => r.series === 'model');
    expect(data).toHaveLength(dataset.vis2.length);
    expect(model).toHaveLength(dataset.vis2.length);
    const expected = truth.vis2(dataset.vis2.u, dataset.vis2.v);
    model.forEach((r, k) => {
      expect(Math.abs((r.value as number) - expected[k]!)).toBeLessThan(VALUE_TOL);
    });
    data.forEach((r, k) => {
      expect(r.value).toBe(dataset.vis2.value[k]);
      expect(r.frequency).toBeCloseTo(Math.hypot(dataset.vis2.u[k]!, dataset.vis2.v[k]!) / 1e6, 9);
      expect(r.low).toBeCloseTo((r.value as number) - dataset.vis2.error[k]!, 12);
      expect(r.wavelength).toBeCloseTo(dataset.vis2.wavelength[k]! * 1e6, 9);
    });
  });

  it('leaves model layers out when no model is given, and draws |V| from OI_VIS when asked', () => {
    const spec = visibilityPlot(dataset);
    expect((spec.layer as unknown[]).length).toBe(2);
    const amp = rows(visibilityPlot(dataset, { observable: 'visamp' }));
    expect(amp[0]!.value).toBe(dataset.vis.visamp[0]);
  });
});

describe('closurePhasePlot', () => {
  it('puts each triangle at its largest spatial frequency, with the model closure phase beside it', () => {
    const spec = closurePhasePlot(dataset, { model: truth });
    const t3 = dataset.t3;
    const data = rows(spec).filter((r) => r.series === 'data');
    const model = rows(spec).filter((r) => r.series === 'model');
    const cp = truth.closurePhase(t3.u1, t3.v1, t3.u2, t3.v2);
    for (let k = 0; k < t3.length; k++) {
      const q = Math.max(
        Math.hypot(t3.u1[k]!, t3.v1[k]!),
        Math.hypot(t3.u2[k]!, t3.v2[k]!),
        Math.hypot(t3.u1[k]! + t3.u2[k]!, t3.v1[k]! + t3.v2[k]!),
      );
      expect(data[k]!.frequency).toBeCloseTo(q / 1e6, 9);
      expect(model[k]!.value).toBeCloseTo(cp[k]!, 10);
    }
  });
});

describe('uvCoveragePlot', () => {
  it('draws every point with its mirror and reverses the u axis so that east is to the left', () => {
    const spec = uvCoveragePlot(dataset);
    const r = rows(spec);
    const direct = r.filter((x) => !x.mirrored);
    const mirrored = r.filter((x) => x.mirrored);
    expect(mirrored).toHaveLength(direct.length);
    direct.forEach((x, k) => {
      expect(mirrored[k]!.u).toBe(-(x.u as number));
      expect(mirrored[k]!.v).toBe(-(x.v as number));
    });
    const enc = spec.encoding as {
      x: { scale: { reverse: boolean; domain: number[] } };
      y: { scale: { domain: number[] } };
    };
    expect(enc.x.scale.reverse).toBe(true);
    expect(enc.x.scale.domain).toEqual(enc.y.scale.domain);
    // every VIS2 baseline is among the points (OI_VIS repeats the same uv and is not drawn twice)
    expect(direct.length).toBeGreaterThanOrEqual(dataset.vis2.length);
  });
});

describe('residualPlot', () => {
  it('shows the residuals the fit minimised, for a fit result as for its model', () => {
    const start = sum(
      disk({ diameter: param('diameter', 2, { min: 0, max: 10 }) }),
      point()
        .weight(param('flux', 0.1, { min: 0, max: 1 }))
        .shift(param('east', 2.8), param('north', 1.3)),
    );
    const result = fit(start, dataset, { observables: ['vis2', 't3phi'] });
    const fromResult = rows(residualPlot(dataset, result), 1);
    const fromModel = rows(residualPlot(dataset, result.model, { observables: ['vis2', 't3phi'] }), 1);
    expect(fromResult).toHaveLength(dataset.vis2.length + dataset.t3.length);
    let chi2 = 0;
    fromResult.forEach((r, k) => {
      expect(r.residual).toBeCloseTo(fromModel[k]!.residual as number, 9);
      chi2 += (r.residual as number) ** 2;
    });
    expect(chi2).toBeCloseTo(result.chi2, 6);
  });
});

describe('imagePlot', () => {
  it('has one row per pixel, east reversed, and the companion on the pixel 3 mas east, 1.5 mas north', () => {
    const spec = imagePlot(truth, { pixels: 48, fov: 9.6, smoothing: 0.3 });
    const r = rows(spec);
    expect(r).toHaveLength(48 * 48);
    const enc = spec.encoding as { x: { scale: { reverse: boolean } } };
    expect(enc.x.scale.reverse).toBe(true);
    const peak = r.reduce((a, b) => ((b.relative as number) > (a.relative as number) ? b : a));
    expect(peak.east).toBeCloseTo(3, 9);
    expect(peak.north).toBeCloseTo(1.6, 9); // the pixel centre nearest to 1.5 on a 0.2 mas grid
  });
});

describe('the specifications', () => {
  const specs: [string, PlotSpec][] = [
    ['visibility', visibilityPlot(dataset, { model: truth })],
    ['closure phase', closurePhasePlot(dataset, { model: truth })],
    ['residuals', residualPlot(dataset, truth)],
    ['uv coverage', uvCoveragePlot(dataset)],
    ['image', imagePlot(truth, { pixels: 16 })],
  ];

  it.each(specs)('%s is plain JSON that survives a round trip', (_, spec) => {
    expect(JSON.parse(JSON.stringify(spec))).toEqual(spec);
    expect(spec.$schema).toBe('https://vega.github.io/schema/vega-lite/v5.json');
  });

  it.skipIf(vegaLite === null).each(specs)('%s compiles with the vega-lite package', (_, spec) => {
    const warnings: string[] = [];
    const logger = {
      level: () => logger,
      error: (...m: unknown[]) => warnings.push(m.join(' ')),
      warn: (...m: unknown[]) => warnings.push(m.join(' ')),
      info: () => logger,
      debug: () => logger,
    };
    const compiled = (vegaLite as unknown as { compile(s: unknown, o: unknown): { spec: unknown } }).compile(
      spec,
      {
        logger,
      },
    );
    expect(compiled.spec).toBeTypeOf('object');
    expect(warnings).toEqual([]);
  });

  it.skipIf(vegaLite === null)('renders to SVG with the optional packages', async () => {
    const svg = await toSvg(uvCoveragePlot(dataset));
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svg).toContain('uv coverage');
  });

  it('says which package to install when vega-lite cannot be loaded', async () => {
    const missing = async (name: string) => {
      throw new Error(`Cannot find package '${name}'`);
    };
    await expect(toSvg(uvCoveragePlot(dataset), { load: missing })).rejects.toThrow(PlotError);
    await expect(toSvg(uvCoveragePlot(dataset), { load: missing })).rejects.toThrow(
      /npm install vega vega-lite/,
    );
  });
});
