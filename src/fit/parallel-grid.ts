/**
 * Grid searches on worker threads: the nodes are split along the first gridded axis, each worker runs the
 * ordinary grid search on its share (the model travels as JSON, the data as OIFITS bytes), and the calling
 * thread merges the chi2 maps in order and refines the best node once.
 *
 * @module
 */
import { FitError } from '../errors.js';
import { modelFromJSON } from '../model/json.js';
import type { Model } from '../model/model.js';
import { parameterVector } from '../observe/parameters.js';
import type { OifitsDataset } from '../oifits/dataset.js';
import { readOifits } from '../oifits/read.js';
import { writeOifits } from '../oifits/write.js';
import { correlationWhitening } from './correlations.js';
import { gatherData } from './data.js';
import { finishFit, prepareFit, solvePrepared } from './fit.js';
import { distinctMinima, type GridNode, type GridOptions, type GridResult, gridSearch } from './grid.js';

/** Options of {@link parallelGridSearch}. */
export interface ParallelGridOptions extends GridOptions {
  /** Threads to use, the calling thread included (default 2). */
  readonly threads?: number;
  /** Below this many nodes the search stays on the calling thread (default 16). */
  readonly minNodes?: number;
}

/** What a worker is sent. */
interface GridShare {
  readonly model: string;
  readonly data: Uint8Array;
  readonly options: Record<string, unknown>;
}

/**
 * @internal The worker side: runs the grid search of a share and returns its nodes.
 * @param share - the model JSON, the OIFITS bytes and the plain options (grid included)
 */
export function runGridShare(share: GridShare): { nodes: GridNode[]; chi2Map: Float64Array } {
  const model = modelFromJSON(share.model);
  const data = readOifits(share.data, { name: '<grid share>' });
  const g = gridSearch(model, data, share.options as unknown as GridOptions);
  return { nodes: [...g.nodes], chi2Map: g.chi2Map };
}

const WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
const run = (m) => {
  try { parentPort.postMessage({ ok: m.runGridShare(workerData.share) }); }
  catch (e) { parentPort.postMessage({ error: e && e.message ? e.message : String(e) }); }
};
if (workerData.url.endsWith('.ts')) {
  const api = require('node:module').createRequire(workerData.url).resolve('tsx/esm/api');
  const esm = require('node:url').pathToFileURL(api.replace(/\\.cjs$/, '.mjs')).href;
  import(esm).then((t) => t.tsImport(workerData.url, workerData.url)).then(run, (e) => parentPort.postMessage({ error: String(e) }));
} else import(workerData.url).then(run, (e) => parentPort.postMessage({ error: String(e) }));
`;

/** The module the workers import: this source file under tsx, or the built `uvsky/fit` entry. */
function moduleUrl(): string | null {
  try {
    const here = import.meta.url;
    if (typeof here !== 'string') return null;
    if (here.endsWith('.ts')) return here;
    const resolve = (import.meta as { resolve?: (s: string) => string }).resolve;
    return resolve ? resolve('uvsky/fit') : null;
  } catch {
    return null;
  }
}

function plainOptions(
  options: ParallelGridOptions,
  grid: Record<string, readonly number[]>,
): Record<string, unknown> {
  const out: Record<string, unknown> = { grid };
  for (const k of [
    'observables',
    'weights',
    'bandwidthSmearing',
    'maxIterations',
    'tolerances',
    'start',
    'minima',
  ] as const) {
    if (options[k] !== undefined) out[k] = options[k];
  }
  return out;
}

/**
 * {@link gridSearch} on several threads.
 *
 * @param model - a model with free parameters
 * @param dataset - an OIFITS dataset
 * @param options - the grid and fit options of `gridSearch`, `threads` (default 2) and `minNodes` (default 16);
 *   `onProgress` is called as shares finish, `signal` stops the workers
 * @returns a promise of the same result `gridSearch` gives (the same nodes in the same order)
 *
 * Notes: the first gridded axis is split into contiguous shares, one per thread, so the row-major chi2 map is the
 * concatenation of the shares' maps. Small grids, a first axis with fewer values than threads, or a platform
 * without worker threads run on the calling thread. Workers start per call (their start-up is small beside a
 * grid of fits).
 * @example
 * ```ts
 * const g = await parallelGridSearch(binary, data, { grid: { east: axis, north: axis }, threads: 2 });
 * ```
 */
export async function parallelGridSearch(
  model: Model,
  dataset: OifitsDataset,
  options: ParallelGridOptions,
): Promise<GridResult> {
  const threads = options.threads ?? 2;
  if (!Number.isInteger(threads) || threads < 1 || threads > 64) {
    throw new FitError(`parallelGridSearch: threads must be an integer in [1, 64], got ${threads}`, {
      argument: 'threads',
    });
  }
  const entries = Object.entries(options.grid);
  const nodes = entries.reduce((a, [, v]) => a * (Array.isArray(v) ? v.length : 0), 1);
  const first = entries[0];
  const url = moduleUrl();
  const used = first ? Math.min(threads, first[1].length) : 1;
  if (used < 2 || nodes < (options.minNodes ?? 16) || url === null)
    return gridSearch(model, dataset, options);
  // validate everything on the calling thread first (errors stay synchronous in meaning)
  const names = model.parameters();
  for (const [name] of entries) {
    if (!names.includes(name)) {
      throw new FitError(
        `parallelGridSearch: '${name}' is not a free parameter; free parameters: ${names.join(', ')}`,
        {
          parameter: name,
        },
      );
    }
  }
  const [axisName, axisValues] = first!;
  const bounds = Array.from({ length: used + 1 }, (_, k) => Math.round((k * axisValues.length) / used));
  const json = JSON.stringify(model.toJSON());
  const bytes = writeOifits(dataset);
  let Worker: typeof import('node:worker_threads').Worker;
  try {
    ({ Worker } = await import('node:worker_threads'));
  } catch {
    return gridSearch(model, dataset, options);
  }
  const running: { terminate(): Promise<number> }[] = [];
  const shares = Array.from({ length: used }, (_, k) => {
    const grid = { ...options.grid, [axisName]: axisValues.slice(bounds[k]!, bounds[k + 1]!) };
    return { model: json, data: bytes, options: plainOptions(options, grid) };
  });
  let done = 0;
  let best = Number.POSITIVE_INFINITY;
  const onAbort = () => {
    for (const w of running) void w.terminate();
  };
  options.signal?.addEventListener('abort', onAbort, { once: true });
  try {
    const results = await Promise.all(
      shares.map(
        (share) =>
          new Promise<{ nodes: GridNode[]; chi2Map: Float64Array }>((resolve, reject) => {
            const w = new Worker(WORKER_SOURCE, { eval: true, workerData: { url, share } });
            running.push(w);
            w.on('message', (m: { ok?: { nodes: GridNode[]; chi2Map: Float64Array }; error?: string }) => {
              void w.terminate();
              if (m.ok) {
                done++;
                for (const x of m.ok.chi2Map) best = Math.min(best, x);
                options.onProgress?.({ fraction: done / used, bestChi2: best, step: done });
                resolve(m.ok);
              } else reject(new FitError(`parallelGridSearch: a worker failed: ${m.error}`));
            });
            w.on('error', (e: Error) =>
              reject(new FitError(`parallelGridSearch: a worker failed: ${e.message}`)),
            );
            w.on('exit', (code: number) => {
              if (options.signal?.aborted) {
                reject(new FitError("parallelGridSearch: cancelled by the caller's AbortSignal"));
              } else if (code !== 0 && code !== 1)
                reject(new FitError(`parallelGridSearch: a worker exited with code ${code}`));
            });
          }),
      ),
    );
    if (options.signal?.aborted)
      throw new FitError("parallelGridSearch: cancelled by the caller's AbortSignal");
    const all = results.flatMap((r) => r.nodes);
    const chi2Map = new Float64Array(all.length);
    all.forEach((n, i) => {
      chi2Map[i] = n.chi2;
    });
    // the same minima and best fit as the serial search: the best fit is the fit from the first node of
    // lowest chi2, run again here from that node's start (as the serial search keeps it), so it is the same fit
    let bestNode = -1;
    for (let i = 0; i < all.length; i++) {
      if (Number.isFinite(all[i]!.chi2) && (bestNode < 0 || all[i]!.chi2 < all[bestNode]!.chi2)) bestNode = i;
    }
    if (bestNode < 0)
      throw new FitError('parallelGridSearch: every grid node lies outside the parameter bounds');
    const axes = entries.map(([name, values]) => Object.freeze({ name, values: Object.freeze([...values]) }));
    const minima = distinctMinima(all, axes, options.minima ?? 5);
    const blocks = gatherData(dataset, options);
    const prep = prepareFit(model, blocks, correlationWhitening(dataset, blocks));
    const start = parameterVector(model, { ...options.start, ...all[bestNode]!.start });
    const sol = solvePrepared(prep, start, { ...options, onProgress: undefined });
    return {
      axes,
      chi2Map,
      nodes: Object.freeze(all),
      minima: Object.freeze(minima),
      best: finishFit(prep, dataset, options, sol),
    };
  } finally {
    options.signal?.removeEventListener('abort', onAbort);
  }
}
