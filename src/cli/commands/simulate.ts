/**
 * `uvsky simulate TEMPLATE --model MODEL --out FILE`: a template's observables replaced by a model's.
 *
 * @module
 */
import { writeFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { InputError } from '../../errors.js';
import { simulate } from '../../oifits/simulate.js';
import { integer, parse, required } from './args.js';
import { type CommandIo, EXIT } from './io.js';
import { loadDataset, loadModel } from './load.js';

export const SIMULATE_USAGE =
  'uvsky simulate TEMPLATE --model MODEL --out FILE [--noise] [--seed N] [--json]';

/** Runs `uvsky simulate`. */
export async function simulateCommand(argv: readonly string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parse(
    'simulate',
    argv,
    {
      model: { type: 'string', short: 'm' },
      out: { type: 'string', short: 'o' },
      noise: { type: 'boolean' },
      seed: { type: 'string' },
      json: { type: 'boolean' },
    },
    { min: 1, max: 1, usage: SIMULATE_USAGE },
  );
  const modelPath = required('simulate', 'model', values.model, SIMULATE_USAGE);
  const out = required('simulate', 'out', values.out, SIMULATE_USAGE);
  const seed = integer('simulate', 'seed', values.seed, 0, 2 ** 31 - 1);
  const template = await loadDataset(positionals[0]!, io.cwd);
  const model = await loadModel(modelPath, io.cwd);
  const sim = simulate(model, template, {
    noise: values.noise === true,
    ...(seed !== undefined ? { seed } : {}),
  });
  try {
    await writeFile(resolve(io.cwd, out), sim.bytes);
  } catch (e) {
    throw new InputError(`cannot write ${out}: ${(e as Error).message}`, { file: out });
  }
  const report = {
    file: out,
    bytes: sim.bytes.length,
    model: model.toString(),
    noise: values.noise === true,
    seed: seed ?? 1,
    vis2: sim.dataset.vis2.length,
    vis: sim.dataset.vis.length,
    t3: sim.dataset.t3.length,
  };
  io.out(
    values.json
      ? `${JSON.stringify(report, null, 2)}\n`
      : `wrote ${out} (${report.bytes} bytes): ${report.vis2} V², ${report.vis} VIS and ${report.t3} T3 entries from ${report.model}${report.noise ? `, with noise (seed ${report.seed})` : ''}\n`,
  );
  return EXIT.ok;
}
