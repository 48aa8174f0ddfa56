#!/usr/bin/env node
import { processIo } from './commands/io.js';
/**
 * The `uvsky` command-line program (package bin): `uvsky inspect | simulate | fit | plot`. See
 * `src/cli/commands/main.ts` for the commands and exit codes.
 *
 * @module
 */
import { main } from './commands/main.js';

main(process.argv.slice(2), processIo()).then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    process.stderr.write(`uvsky: internal error: ${(e as Error)?.stack ?? String(e)}\n`);
    process.exitCode = 3;
  },
);
