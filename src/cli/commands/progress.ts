/**
 * A progress bar on standard error for long fits and grids, drawn only when standard error is a terminal.
 *
 * @module
 */
import cliProgress from 'cli-progress';
import type { Progress } from '../../fit/fit.js';
import type { CommandIo } from './io.js';

/** A started bar: `update` with the fit's progress reports, `stop` at the end (also after an error). */
export interface Bar {
  update(p: Progress): void;
  stop(): void;
}

const SILENT: Bar = { update() {}, stop() {} };

/** Starts a bar labelled `label` when the io is interactive; a silent one otherwise. */
export function startBar(io: CommandIo, label: string, quiet: boolean): Bar {
  if (!io.interactive || quiet) return SILENT;
  const bar = new cliProgress.SingleBar(
    {
      stream: io.progressStream ?? process.stderr,
      format: `${label} [{bar}] {percentage}% | chi2 {chi2} | step {step}`,
      hideCursor: true,
      clearOnComplete: true,
      barsize: 30,
    },
    cliProgress.Presets.shades_classic,
  );
  bar.start(100, 0, { chi2: '-', step: 0 });
  return {
    update(p) {
      bar.update(Math.round(p.fraction * 100), { chi2: p.bestChi2.toPrecision(6), step: p.step });
    },
    stop() {
      bar.stop();
    },
  };
}
