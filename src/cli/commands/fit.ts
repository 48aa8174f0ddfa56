/**
 * `uvsky fit FILE --model MODEL`: a least-squares fit of a model's free parameters, optionally from every node
 * of a grid of starting values.
 *
 * @module
 */
import { writeFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { InputError } from '../../errors.js';
import { FIT_OBSERVABLES, type FitObservable } from '../../fit/data.js';
import { type FitResult, fit } from '../../fit/fit.js';
import { type GridResult, gridSearch } from '../../fit/grid.js';
import { integer, parse, required } from './args.js';
import { type CommandIo, EXIT, UsageError } from './io.js';
import { loadDataset, loadModel } from './load.js';
import { startBar } from './progress.js';
import { fmt, formatTable } from './table.js';

export const FIT_USAGE =
  'uvsky fit FILE --model MODEL [--observables vis2,t3phi,...] [--max-iterations N] [--grid NAME=FROM:TO:COUNT]... [--save BEST.json] [--json] [--quiet]';

/** Parses `NAME=FROM:TO:COUNT` into COUNT evenly spaced values from FROM to TO (both included). */
export function parseGridAxis(text: string): [string, number[]] {
  const m = /^([^=]+)=([^:]+):([^:]+):([^:]+)$/.exec(text);
  const from = Number(m?.[2]);
  const to = Number(m?.[3]);
  const count = Number(m?.[4]);
  if (
    !m ||
    !Number.isFinite(from) ||
    !Number.isFinite(to) ||
    !Number.isInteger(count) ||
    count < 1 ||
    count > 10000
  ) {
    throw new UsageError(
      `uvsky fit: --grid ${JSON.stringify(text)}; write NAME=FROM:TO:COUNT, e.g. east=-20:20:21 (COUNT an integer in [1, 10000])`,
      { argument: 'grid' },
    );
  }
  const values =
    count === 1 ? [from] : Array.from({ length: count }, (_, k) => from + ((to - from) * k) / (count - 1));
  return [m[1]!.trim(), values];
}

function parseObservables(text: string | undefined): FitObservable[] | undefined {
  if (text === undefined) return undefined;
  const list = text
    .split(',')
    .map((s) => s.trim().toLowerCase())
    .filter((s) => s !== '');
  for (const o of list) {
    if (!FIT_OBSERVABLES.includes(o as FitObservable)) {
      throw new UsageError(
        `uvsky fit: unknown observable '${o}' in --observables; use ${FIT_OBSERVABLES.join(', ')}`,
        {
          argument: 'observables',
        },
      );
    }
  }
  return list as FitObservable[];
}

/** The JSON form of a fit result (what `--json` prints). */
export function fitReport(r: FitResult, grid?: GridResult) {
  return {
    parameters: r.parameters.map((name) => ({
      name,
      value: r.values[name]!,
      uncertainty: r.uncertainties[name]!,
      scaledUncertainty: r.scaledUncertainties[name]!,
      atBound: r.atBound.includes(name),
    })),
    chi2: r.chi2,
    dof: r.dof,
    reducedChi2: r.reducedChi2,
    iterations: r.iterations,
    reason: r.reason,
    converged: r.converged,
    perObservable: r.perObservable,
    correlation: r.correlation,
    model: r.model.toString(),
    ...(grid
      ? {
          grid: {
            axes: grid.axes,
            minima: grid.minima.map((m) => ({ start: m.start, values: m.values, chi2: m.chi2 })),
          },
        }
      : {}),
  };
}

/** Renders a fit result as text tables. */
export function formatFit(r: FitResult, grid?: GridResult): string {
  const lines: string[] = [];
  if (grid) {
    const names = grid.axes.map((a) => a.name);
    lines.push(
      `grid of ${grid.nodes.length} starts over ${names.join(', ')}: best distinct minima`,
      formatTable(
        [...r.parameters.map((p) => ({ title: p, right: true })), { title: 'chi2', right: true }],
        grid.minima.map((m) => [...r.parameters.map((p) => fmt(m.values[p] ?? Number.NaN)), fmt(m.chi2)]),
      ),
      '',
    );
  }
  lines.push(
    formatTable(
      [
        { title: 'parameter' },
        { title: 'value', right: true },
        { title: '± (raw)', right: true },
        { title: '± (scaled)', right: true },
        { title: 'note' },
      ],
      r.parameters.map((p) => [
        p,
        fmt(r.values[p]!),
        fmt(r.uncertainties[p]!, 3),
        fmt(r.scaledUncertainties[p]!, 3),
        r.atBound.includes(p) ? 'at a bound' : '',
      ]),
    ),
    '',
    formatTable(
      [
        { title: 'observable' },
        { title: 'values', right: true },
        { title: 'chi2', right: true },
        { title: 'chi2 / value', right: true },
      ],
      Object.entries(r.perObservable).map(([o, c]) => [
        o,
        String(c!.count),
        fmt(c!.chi2),
        fmt(c!.chi2 / c!.count, 4),
      ]),
    ),
    '',
    `chi2 ${fmt(r.chi2)} for ${r.dof} degrees of freedom: reduced chi2 ${fmt(r.reducedChi2, 4)}`,
    `${r.iterations} iterations, ${r.converged ? 'converged' : 'NOT converged'} (${r.reason})`,
    `best fit: ${r.model.toString()}`,
  );
  return `${lines.join('\n')}\n`;
}

/** Runs `uvsky fit`. */
export async function fitCommand(argv: readonly string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parse(
    'fit',
    argv,
    {
      model: { type: 'string', short: 'm' },
      observables: { type: 'string' },
      'max-iterations': { type: 'string' },
      grid: { type: 'string', multiple: true },
      save: { type: 'string' },
      json: { type: 'boolean' },
      quiet: { type: 'boolean', short: 'q' },
    },
    { min: 1, max: 1, usage: FIT_USAGE },
  );
  const modelPath = required('fit', 'model', values.model, FIT_USAGE);
  const observables = parseObservables(values.observables);
  const maxIterations = integer('fit', 'max-iterations', values['max-iterations'], 1, 100000);
  const axes = (values.grid ?? []).map(parseGridAxis);
  const dataset = await loadDataset(positionals[0]!, io.cwd);
  const model = await loadModel(modelPath, io.cwd);
  const options = {
    ...(observables ? { observables } : {}),
    ...(maxIterations !== undefined ? { maxIterations } : {}),
  };
  const bar = startBar(io, axes.length > 0 ? 'grid' : 'fit', values.quiet === true || values.json === true);
  let result: FitResult;
  let grid: GridResult | undefined;
  try {
    if (axes.length > 0) {
      grid = gridSearch(model, dataset, {
        ...options,
        grid: Object.fromEntries(axes),
        onProgress: (p) => bar.update(p),
      });
      result = grid.best;
    } else {
      result = fit(model, dataset, { ...options, onProgress: (p) => bar.update(p) });
    }
  } finally {
    bar.stop();
  }
  if (values.save !== undefined) {
    try {
      await writeFile(resolve(io.cwd, values.save), `${JSON.stringify(result.model.toJSON(), null, 2)}\n`);
    } catch (e) {
      throw new InputError(`cannot write ${values.save}: ${(e as Error).message}`, { file: values.save });
    }
  }
  io.out(values.json ? `${JSON.stringify(fitReport(result, grid), null, 2)}\n` : formatFit(result, grid));
  return EXIT.ok;
}
