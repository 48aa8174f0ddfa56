/**
 * Complex visibilities of large batches split across worker threads.
 *
 * The model travels to the workers as its JSON (`m.toJSON()`, read back there with `modelFromJSON`), once per
 * model and worker; the columns travel as SharedArrayBuffer-backed Float64Arrays, so no point is copied between
 * threads. Workers are created on first use, kept, and reused by later calls (they do not keep the process
 * alive; {@link closeParallelPool} ends them). The calling thread computes one share itself, so `threads: 2`
 * starts one worker. Every point is computed by the same compiled plan as `m.visibilities`, so the results are
 * the same numbers.
 *
 * @module
 */
import { InputError } from '../errors.js';
import { modelFromJSON } from '../model/json.js';
import type { ComplexColumns, Model } from '../model/model.js';
import { runPlan } from '../model/plan.js';

/** Below this many points per thread a call runs on the calling thread only (a hand-off costs ~0.1 ms). */
export const MIN_POINTS_PER_THREAD = 20_000;

/** Options of {@link parallelVisibilities}. */
export interface ParallelOptions {
  /** Threads to use, the calling one included (integer >= 1; default 2, at most 64). */
  readonly threads?: number;
  /** Smallest share worth a thread (default {@link MIN_POINTS_PER_THREAD}); fewer points use fewer threads. */
  readonly minPointsPerThread?: number;
  /**
   * Output columns to fill (each of the input length). When they are backed by a SharedArrayBuffer the workers
   * write into them directly; otherwise the results are computed into shared columns and copied into them.
   */
  readonly out?: ComplexColumns;
}

/**
 * A Float64Array of `n` zeros backed by a SharedArrayBuffer, for columns handed to {@link parallelVisibilities}
 * without a copy.
 * @param n - length (integer >= 0)
 * @example
 * ```ts
 * sharedFloat64Array(3); // Float64Array [0, 0, 0] on a SharedArrayBuffer
 * ```
 */
export function sharedFloat64Array(n: number): Float64Array {
  if (!Number.isInteger(n) || n < 0) {
    throw new InputError(`sharedFloat64Array: n must be an integer >= 0, got ${n}`, { argument: 'n' });
  }
  return new Float64Array(new SharedArrayBuffer(8 * n));
}

function isShared(a: Float64Array): boolean {
  return typeof SharedArrayBuffer !== 'undefined' && a.buffer instanceof SharedArrayBuffer;
}

// ---------- the pool ----------

interface WorkerLike {
  postMessage(message: unknown): void;
  on(event: 'message', listener: (m: WorkerReply) => void): void;
  on(event: 'error', listener: (e: Error) => void): void;
  unref(): void;
  terminate(): Promise<number>;
}

interface WorkerJob {
  readonly job: number;
  readonly model: number;
  readonly json?: string;
  readonly u: Float64Array;
  readonly v: Float64Array;
  readonly re: Float64Array;
  readonly im: Float64Array;
  readonly start: number;
  readonly end: number;
}

interface WorkerReply {
  readonly job: number;
  readonly error?: string;
}

interface PoolWorker {
  readonly worker: WorkerLike;
  readonly known: Set<number>;
  readonly pending: Map<number, { resolve: () => void; reject: (e: Error) => void }>;
}

const pool: PoolWorker[] = [];
let nextJob = 1;
let nextModel = 1;
const modelIds = new WeakMap<Model, { id: number; json: string }>();

/**
 * Source of each worker: it imports this module by its URL and serves jobs. From TypeScript sources (tests,
 * benchmarks run with tsx) the import goes through tsx's `tsImport`, resolved from this module's location.
 */
const WORKER_SOURCE = `
const { parentPort, workerData } = require('node:worker_threads');
const start = (m) => m.serveParallelJobs(parentPort);
if (workerData.url.endsWith('.ts')) {
  const api = require('node:module').createRequire(workerData.url).resolve('tsx/esm/api');
  const esm = require('node:url').pathToFileURL(api.replace(/\\.cjs$/, '.mjs')).href;
  import(esm).then((t) => t.tsImport(workerData.url, workerData.url)).then(start);
} else import(workerData.url).then(start);
`;

async function spawn(): Promise<PoolWorker> {
  const { Worker } = await import('node:worker_threads');
  const url = import.meta.url;
  const worker = new Worker(WORKER_SOURCE, { eval: true, workerData: { url } }) as WorkerLike;
  worker.unref();
  const w: PoolWorker = { worker, known: new Set(), pending: new Map() };
  worker.on('message', (m: WorkerReply) => {
    const p = w.pending.get(m.job);
    if (p === undefined) return;
    w.pending.delete(m.job);
    if (m.error === undefined) p.resolve();
    else p.reject(new Error(`parallelVisibilities: a worker failed: ${m.error}`));
  });
  worker.on('error', (e: Error) => {
    for (const p of w.pending.values()) p.reject(e);
    w.pending.clear();
    const i = pool.indexOf(w);
    if (i >= 0) pool.splice(i, 1);
  });
  return w;
}

async function workers(count: number): Promise<PoolWorker[]> {
  while (pool.length < count) pool.push(await spawn());
  return pool.slice(0, count);
}

/**
 * Ends the worker threads of {@link parallelVisibilities} (later calls start new ones).
 * @returns a promise that settles when every worker has stopped
 */
export async function closeParallelPool(): Promise<void> {
  const all = pool.splice(0, pool.length);
  await Promise.all(all.map((w) => w.worker.terminate()));
}

/**
 * @internal The worker side: compiles each model once (by id) and evaluates the share of points it is sent.
 * @param port - the worker's parent port
 */
export function serveParallelJobs(port: {
  on(event: 'message', f: (j: WorkerJob) => void): void;
  postMessage(m: WorkerReply): void;
}): void {
  const models = new Map<number, Model>();
  port.on('message', (j: WorkerJob) => {
    try {
      let m = models.get(j.model);
      if (m === undefined) {
        if (j.json === undefined) throw new Error(`model ${j.model} was never sent`);
        if (models.size > 64) models.clear();
        m = modelFromJSON(j.json);
        models.set(j.model, m);
      }
      const n = j.end - j.start;
      runPlan(
        m.plan(),
        j.u.subarray(j.start, j.end),
        j.v.subarray(j.start, j.end),
        j.re.subarray(j.start, j.end),
        j.im.subarray(j.start, j.end),
        n,
      );
      port.postMessage({ job: j.job });
    } catch (e) {
      port.postMessage({ job: j.job, error: e instanceof Error ? e.message : String(e) });
    }
  });
}

// ---------- the call ----------

function column(x: ArrayLike<number>, name: string): Float64Array {
  if (x === null || typeof x !== 'object' || typeof x.length !== 'number') {
    throw new InputError(`parallelVisibilities: ${name} must be an array or Float64Array of numbers`, {
      argument: name,
    });
  }
  const n = x.length;
  for (let i = 0; i < n; i++) {
    const t = x[i]!;
    if (typeof t !== 'number' || t - t !== 0) {
      throw new InputError(
        `parallelVisibilities: ${name}[${i}] is ${t}; spatial frequencies must be finite numbers in cycles per radian`,
        { argument: name, index: i },
      );
    }
  }
  if (x instanceof Float64Array && isShared(x)) return x;
  const s = sharedFloat64Array(n);
  s.set(x);
  return s;
}

function readThreads(options: ParallelOptions | undefined): { threads: number; minShare: number } {
  const threads = options?.threads ?? 2;
  if (!Number.isInteger(threads) || threads < 1 || threads > 64) {
    throw new InputError(`parallelVisibilities: threads must be an integer in [1, 64], got ${threads}`, {
      argument: 'threads',
    });
  }
  const minShare = options?.minPointsPerThread ?? MIN_POINTS_PER_THREAD;
  if (!Number.isInteger(minShare) || minShare < 1) {
    throw new InputError(
      `parallelVisibilities: minPointsPerThread must be an integer >= 1, got ${minShare}`,
      { argument: 'minPointsPerThread' },
    );
  }
  return { threads, minShare };
}

/**
 * Normalised complex visibilities of many points, computed on several threads.
 *
 * @param model - any model without wavelength-dependent slots (as for `m.visibilities`)
 * @param u - spatial frequencies east, cycles per radian
 * @param v - spatial frequencies north, cycles per radian (same length)
 * @param options - `threads` (default 2, the calling thread included), `minPointsPerThread`, `out`
 * @returns a promise of `{ re, im }`: `options.out` when given, else SharedArrayBuffer-backed columns
 * @throws InputError (synchronously) for columns of unequal length, non-finite values, bad options or an `out`
 *   of the wrong length; ModelError for a model that cannot be evaluated (zero total flux, wavelength-dependent)
 *
 * Notes: the same numbers as `model.visibilities(u, v)`: each thread runs the same compiled plan on its share
 * of the points, and no point's value depends on the others. Inputs are never changed. Memory: with
 * SharedArrayBuffer-backed `u`, `v` (see {@link sharedFloat64Array}) and `out`, nothing beyond the two output
 * columns; other inputs are first copied into shared columns (two Float64 per point more). With fewer than
 * `2 * minPointsPerThread` points, or `threads: 1`, the work stays on the calling thread and no worker is
 * started. Where `node:worker_threads` is missing the call falls back to the calling thread.
 * @example
 * ```ts
 * const r = await parallelVisibilities(disk({ diameter: 2 }), u, v, { threads: 2 });
 * r.re; // equal to disk({ diameter: 2 }).visibilities(u, v).re
 * ```
 */
export function parallelVisibilities(
  model: Model,
  u: ArrayLike<number>,
  v: ArrayLike<number>,
  options?: ParallelOptions,
): Promise<ComplexColumns> {
  const { threads, minShare } = readThreads(options);
  const uu = column(u, 'u');
  const vv = column(v, 'v');
  const n = uu.length;
  if (vv.length !== n) {
    throw new InputError(
      `parallelVisibilities: u has ${n} entries but v has ${vv.length}; give columns of equal length`,
      { argument: 'v' },
    );
  }
  const out = options?.out;
  for (const name of ['re', 'im'] as const) {
    const o = out?.[name];
    if (out !== undefined && (!(o instanceof Float64Array) || o.length !== n)) {
      throw new InputError(`parallelVisibilities: out.${name} must be a Float64Array of length ${n}`, {
        argument: `out.${name}`,
      });
    }
  }
  const plan = model.plan(); // model errors surface here, on the calling thread
  const used = Math.max(1, Math.min(threads, Math.floor(n / minShare)));
  const direct = out !== undefined && isShared(out.re) && isShared(out.im);
  const re = direct ? out.re : used > 1 || out === undefined ? sharedFloat64Array(n) : out.re;
  const im = direct ? out.im : used > 1 || out === undefined ? sharedFloat64Array(n) : out.im;
  const finish = (): ComplexColumns => {
    if (out === undefined) return { re, im };
    if (re !== out.re) out.re.set(re);
    if (im !== out.im) out.im.set(im);
    return out;
  };
  if (used === 1) {
    runPlan(plan, uu, vv, re, im, n);
    return Promise.resolve(finish());
  }
  let entry = modelIds.get(model);
  if (entry === undefined) {
    entry = { id: nextModel++, json: JSON.stringify(model.toJSON()) };
    modelIds.set(model, entry);
  }
  const known = entry;
  const bounds = Array.from({ length: used + 1 }, (_, k) => Math.round((k * n) / used));
  return workers(used - 1).then(
    async (ws) => {
      const done = ws.map(
        (w, k) =>
          new Promise<void>((resolve, reject) => {
            const job = nextJob++;
            w.pending.set(job, { resolve, reject });
            const first = !w.known.has(known.id);
            w.known.add(known.id);
            const msg: WorkerJob = {
              job,
              model: known.id,
              ...(first ? { json: known.json } : {}),
              u: uu,
              v: vv,
              re,
              im,
              start: bounds[k + 1]!,
              end: bounds[k + 2]!,
            };
            w.worker.postMessage(msg);
          }),
      );
      // the calling thread takes the first share while the workers run theirs
      const s = bounds[1]!;
      runPlan(plan, uu.subarray(0, s), vv.subarray(0, s), re.subarray(0, s), im.subarray(0, s), s);
      await Promise.all(done);
      return finish();
    },
    () => {
      // no worker threads here: one thread
      runPlan(plan, uu, vv, re, im, n);
      return finish();
    },
  );
}
