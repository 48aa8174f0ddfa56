/**
 * The `uvsky` command: dispatch to the sub-commands, help, and the mapping of errors to exit codes.
 *
 * @module
 */
import { UvskyError } from '../../errors.js';
import { FIT_USAGE, fitCommand } from './fit.js';
import { INSPECT_USAGE, inspectCommand } from './inspect.js';
import { type CommandIo, EXIT, UsageError } from './io.js';
import { PLOT_USAGE, plotCommand } from './plot.js';
import { SIMULATE_USAGE, simulateCommand } from './simulate.js';

const COMMANDS: Record<string, (argv: readonly string[], io: CommandIo) => Promise<number>> = {
  inspect: inspectCommand,
  simulate: simulateCommand,
  fit: fitCommand,
  plot: plotCommand,
};

export const HELP = `uvsky: sky models for long-baseline interferometry

commands
  ${INSPECT_USAGE}
      what an OIFITS file holds: targets, tables, channels, baselines, counts and flags
  ${SIMULATE_USAGE}
      a model's observables on the uv coverage, errors and flags of a template OIFITS file
  ${FIT_USAGE}
      least-squares fit of the model's free parameters (param(...) slots), with uncertainties
  ${PLOT_USAGE}
      Vega-Lite JSON plots (and SVG when the optional vega and vega-lite packages are installed)

MODEL is a .json model document (model.toJSON()) or a .mjs / .js module whose default export (or export
'model') is a Model; a .ts module needs uvsky to run under tsx.

exit codes: 0 done, 1 bad input (file, model, fit), 2 bad command line, 3 internal error
`;

/**
 * Runs the command line `argv` (without the node and script paths) and returns the exit code. Never throws:
 * errors are written to `io.err`.
 */
export async function main(argv: readonly string[], io: CommandIo): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === 'help' || name === '--help' || name === '-h') {
    (name === undefined ? io.err : io.out)(HELP);
    return name === undefined ? EXIT.usage : EXIT.ok;
  }
  if (name === '--version' || name === '-v') {
    io.out(`${VERSION}\n`);
    return EXIT.ok;
  }
  const command = COMMANDS[name];
  if (command === undefined) {
    io.err(
      `uvsky: unknown command '${name}'; the commands are ${Object.keys(COMMANDS).join(', ')} (uvsky --help)\n`,
    );
    return EXIT.usage;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    io.out(HELP);
    return EXIT.ok;
  }
  try {
    return await command(rest, io);
  } catch (e) {
    if (e instanceof UsageError) {
      io.err(`${e.message}\n`);
      return EXIT.usage;
    }
    if (e instanceof UvskyError) {
      io.err(`uvsky ${name}: ${e.name}: ${e.message}\n`);
      return EXIT.failed;
    }
    io.err(`uvsky ${name}: internal error, please report it: ${(e as Error)?.stack ?? String(e)}\n`);
    return EXIT.internal;
  }
}

/** The package version, filled in by the build (tsup `define`); 'development' when run from the sources. */
declare const __UVSKY_VERSION__: string | undefined;
const VERSION = typeof __UVSKY_VERSION__ === 'string' ? __UVSKY_VERSION__ : 'development';
