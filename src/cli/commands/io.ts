/**
 * What every command shares: where its output goes, the usage error, and the exit codes.
 *
 * @module
 */
import { UvskyError } from '../../errors.js';

/** Exit codes of the `uvsky` command. */
export const EXIT = Object.freeze({
  /** Done. */
  ok: 0,
  /** The input was read but is wrong (bad file, bad model, a fit that cannot run): a UvskyError. */
  failed: 1,
  /** The command line itself is wrong (unknown command or option, missing argument). */
  usage: 2,
  /** An unexpected error: a bug in uvsky, reported with its stack. */
  internal: 3,
});

/** Where a command writes. Standard output carries results; standard error carries progress and messages. */
export interface CommandIo {
  /** Writes to standard output. */
  out(text: string): void;
  /** Writes to standard error. */
  err(text: string): void;
  /** True when standard error is a terminal (progress bars are drawn only then). */
  readonly interactive: boolean;
  /** The stream a progress bar draws on (standard error). */
  readonly progressStream?: NodeJS.WritableStream;
  /** Directory relative paths are resolved against. */
  readonly cwd: string;
}

/** The command line is wrong: exit code 2, with the usage of the command. */
export class UsageError extends UvskyError {}

/** The io of the running process. */
export function processIo(): CommandIo {
  return {
    out: (t) => process.stdout.write(t),
    err: (t) => process.stderr.write(t),
    interactive: process.stderr.isTTY === true,
    progressStream: process.stderr,
    cwd: process.cwd(),
  };
}
