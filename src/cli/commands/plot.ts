/**
 * `uvsky plot FILE [--model MODEL] --out DIR`: Vega-Lite JSON of the data (and the model), and SVG when the
 * optional `vega` and `vega-lite` packages are installed.
 *
 * @module
 */
import { mkdir, writeFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { InputError } from '../../errors.js';
import { closurePhasePlot } from '../../plots/closure-phase.js';
import { imagePlot } from '../../plots/image.js';
import { residualPlot } from '../../plots/residuals.js';
import type { PlotSpec } from '../../plots/spec.js';
import { PlotError, toSvg } from '../../plots/svg.js';
import { uvCoveragePlot } from '../../plots/uv-coverage.js';
import { visibilityPlot } from '../../plots/visibility.js';
import { integer, number, parse, required } from './args.js';
import { type CommandIo, EXIT } from './io.js';
import { loadDataset, loadModel } from './load.js';

export const PLOT_USAGE =
  'uvsky plot FILE [--model MODEL] --out DIR [--no-svg] [--pixels N] [--fov MAS] [--wavelength METRES] [--json]';

/** Runs `uvsky plot`. */
export async function plotCommand(argv: readonly string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parse(
    'plot',
    argv,
    {
      model: { type: 'string', short: 'm' },
      out: { type: 'string', short: 'o' },
      'no-svg': { type: 'boolean' },
      pixels: { type: 'string' },
      fov: { type: 'string' },
      wavelength: { type: 'string' },
      json: { type: 'boolean' },
    },
    { min: 1, max: 1, usage: PLOT_USAGE },
  );
  const dir = resolve(io.cwd, required('plot', 'out', values.out, PLOT_USAGE));
  const pixels = integer('plot', 'pixels', values.pixels, 8, 1024);
  const fov = number('plot', 'fov', values.fov);
  const wavelength = number('plot', 'wavelength', values.wavelength);
  const dataset = await loadDataset(positionals[0]!, io.cwd);
  const model = values.model === undefined ? undefined : await loadModel(values.model, io.cwd);
  const specs: [string, PlotSpec][] = [['uv-coverage', uvCoveragePlot(dataset)]];
  if (dataset.vis2.length > 0) specs.push(['vis2', visibilityPlot(dataset, model ? { model } : {})]);
  if (dataset.vis.length > 0) {
    specs.push(['visamp', visibilityPlot(dataset, { observable: 'visamp', ...(model ? { model } : {}) })]);
  }
  if (dataset.t3.length > 0) specs.push(['closure-phase', closurePhasePlot(dataset, model ? { model } : {})]);
  if (model) {
    specs.push(['residuals', residualPlot(dataset, model)]);
    const defaultWavelength = dataset.vis2.length > 0 ? dataset.vis2.wavelength[0] : dataset.t3.wavelength[0];
    specs.push([
      'image',
      imagePlot(model, {
        ...(pixels !== undefined ? { pixels } : {}),
        ...(fov !== undefined ? { fov } : {}),
        ...(wavelength !== undefined
          ? { wavelength }
          : defaultWavelength !== undefined
            ? { wavelength: defaultWavelength }
            : {}),
      }),
    ]);
  }
  try {
    await mkdir(dir, { recursive: true });
  } catch (e) {
    throw new InputError(`cannot create ${dir}: ${(e as Error).message}`, { file: dir });
  }
  const written: string[] = [];
  let svgNote = values['no-svg'] ? 'SVG not asked for (--no-svg)' : '';
  for (const [name, spec] of specs) {
    const file = join(dir, `${name}.vl.json`);
    await writeFile(file, `${JSON.stringify(spec)}\n`);
    written.push(file);
  }
  if (!values['no-svg']) {
    for (const [name, spec] of specs) {
      try {
        const file = join(dir, `${name}.svg`);
        await writeFile(file, await toSvg(spec));
        written.push(file);
      } catch (e) {
        if (!(e instanceof PlotError)) throw e;
        svgNote = `no SVG: ${e.message}`;
        break;
      }
    }
  }
  if (values.json) io.out(`${JSON.stringify({ written, note: svgNote || null }, null, 2)}\n`);
  else io.out(`${written.map((f) => `wrote ${f}`).join('\n')}\n${svgNote ? `${svgNote}\n` : ''}`);
  return EXIT.ok;
}
