/** An in-memory io for running the `uvsky` command inside a test, and a fresh working directory. */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { CommandIo } from '../../src/cli/commands/io.js';
import { main } from '../../src/cli/commands/main.js';
import { writeOifits } from '../../src/oifits/index.js';
import { plannedDataset } from '../plots/helpers.js';

export interface Run {
  readonly code: number;
  readonly out: string;
  readonly err: string;
}

export async function run(argv: string[], cwd: string, interactive = false): Promise<Run> {
  let out = '';
  let err = '';
  const io: CommandIo = {
    out: (t) => {
      out += t;
    },
    err: (t) => {
      err += t;
    },
    interactive,
    cwd,
  };
  const code = await main(argv, io);
  return { code, out, err };
}

/** A temporary directory holding `plan.fits`, the planned (placeholder) observation of tests/plots/helpers. */
export function workdir(): string {
  const dir = mkdtempSync(join(tmpdir(), 'uvsky-cli-'));
  writeFileSync(join(dir, 'plan.fits'), writeOifits(plannedDataset()));
  return dir;
}
