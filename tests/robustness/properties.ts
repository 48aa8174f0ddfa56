/**
 * The fuzz properties of the robustness suite, shared by tests/robustness/*.test.ts (fixed seeds, few cases)
 * and tests/robustness/long-fuzz.ts (a seed from the command line, many cases).
 *
 * OIFITS reader: on any bytes it returns a dataset or throws a UvskyError (never a TypeError, RangeError or
 * other exception), within READ_TIME_LIMIT_MS (a hang detector, not a speed test), and the typed-array memory
 * it leaves allocated when it returns stays below READ_MEMORY_FACTOR x the file length + READ_MEMORY_SLACK.
 *
 * Models: every random tree evaluates to finite values with |V| <= 1 (the generated images are non-negative),
 * survives a JSON round trip unchanged (same text, canonically equal, same visibilities).
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import v8 from 'node:v8';
import vm from 'node:vm';
import fc from 'fast-check';
import { UvskyError } from '../../src/errors.js';
import { type Model, modelFromJSON } from '../../src/index.js';
import { planObservation, readOifits, writeOifits } from '../../src/oifits/index.js';
import { arbAnyModel, arbDamages, damage } from '../helpers/arbitraries-robust.js';

/** Longest a single read may take before it counts as a hang, ms (typical reads take 1-80 ms). */
export const READ_TIME_LIMIT_MS = 2000;
/**
 * Bound on the typed-array memory a read leaves allocated, per byte of file. The decoded columns take about as
 * many bytes as the file's data; the flat views (u, v, wavelength, band, time, errors, flags per entry, in
 * Float64) add at most about 16 bytes per stored byte of the smallest per-entry columns (an E value, its E error
 * and an L flag: 9 bytes giving about a dozen Float64 columns). Measured: 0.3-0.4 for the astropy fixtures,
 * 5.6 for a planned observation with 40 channels.
 */
export const READ_MEMORY_FACTOR = 32;
/** Fixed allowance on top of the per-byte bound (small arrays, allocator granularity), bytes. */
export const READ_MEMORY_SLACK = 1 << 20;

/** The astropy-written fixtures (tests/fixtures/oifits/make_fixtures.py). */
const FIXTURES = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'oifits');

function fixture(name: string): Uint8Array {
  const b = readFileSync(join(FIXTURES, name));
  return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
}

/** A synthetic OIFITS 2 file from the observation planner (invented array and target). */
export function plannedFile(channels = 6, snapshots = 4): Uint8Array {
  const ds = planObservation({
    target: { name: 'Kestrel Minor', ra: 123.456, dec: -45.25 },
    array: {
      name: 'TALLGRASS',
      latitude: -24.5,
      longitude: -70.25,
      altitude: 2600,
      stations: [
        { name: 'TG1', east: 0, north: 0 },
        { name: 'TG2', east: 31.25, north: -4.5 },
        { name: 'TG3', east: -12, north: 57.75 },
        { name: 'TG4', east: 48.5, north: 36 },
      ],
    },
    instrument: {
      name: 'REEDPIPE',
      wavelengths: Float64Array.from({ length: channels }, (_, i) => 1.5e-6 + i * 2e-8),
      bandwidths: new Float64Array(channels).fill(2e-8),
    },
    hourAngles: Array.from({ length: snapshots }, (_, i) => -2 + i),
    mjd: 60430.9,
    date: '2024-06-01T00:00:00',
  });
  return writeOifits(ds, { date: '2024-06-01T00:00:00' });
}

/** The files the OIFITS fuzzing starts from: the astropy fixtures and a planned observation. */
export function seedFiles(): ReadonlyArray<readonly [string, Uint8Array]> {
  return [
    ['kestrel_v2.fits', fixture('kestrel_v2.fits')],
    ['kestrel_v1.fits', fixture('kestrel_v1.fits')],
    ['planned.fits', plannedFile()],
  ];
}

/**
 * A full garbage collection (V8's gc, exposed at run time), so that a measurement starts from live memory
 * only. Without it a collection during the call can only lower the measured growth, so a bound that fails
 * without it fails for real; with it the growth seen is what the dataset holds.
 */
export function collectGarbage(): void {
  v8.setFlagsFromString('--expose-gc');
  (vm.runInNewContext('gc') as () => void)();
}

/** What one read did. */
export interface ReadOutcome {
  readonly outcome: 'read' | 'error';
  readonly ms: number;
  /** Growth of process.memoryUsage().arrayBuffers across the call, bytes (the dataset is still held). */
  readonly arrayBuffers: number;
  /** VIS, VIS2 and T3 entries of the dataset read (0 after an error). */
  readonly entries: number;
}

/**
 * Reads bytes, timing the call and measuring the typed-array memory it leaves allocated.
 *
 * @param bytes - the file
 * @param options - `collect`: collect garbage first (slower; exact growth)
 *
 * @throws the reader's exception when it is not a UvskyError, and an Error when the read took longer than
 *   READ_TIME_LIMIT_MS or left more memory than the bound
 */
export function readChecked(bytes: Uint8Array, options: { collect?: boolean } = {}): ReadOutcome {
  if (options.collect) collectGarbage();
  const before = process.memoryUsage().arrayBuffers;
  const t0 = performance.now();
  let outcome: 'read' | 'error';
  let dataset: ReturnType<typeof readOifits> | undefined;
  try {
    dataset = readOifits(bytes, { name: 'fuzz.fits' });
    outcome = 'read';
  } catch (e) {
    if (!(e instanceof UvskyError)) throw e;
    outcome = 'error';
  }
  const ms = performance.now() - t0;
  // measured while the dataset is still referenced, so its arrays count
  const arrayBuffers = process.memoryUsage().arrayBuffers - before;
  const entries = dataset ? dataset.vis.length + dataset.vis2.length + dataset.t3.length : 0;
  if (ms > READ_TIME_LIMIT_MS) {
    throw new Error(
      `reading ${bytes.length} bytes took ${ms.toFixed(0)} ms (limit ${READ_TIME_LIMIT_MS} ms)`,
    );
  }
  const bound = READ_MEMORY_FACTOR * bytes.length + READ_MEMORY_SLACK;
  if (arrayBuffers > bound) {
    throw new Error(
      `reading ${bytes.length} bytes left ${arrayBuffers} bytes of typed arrays allocated (bound ${bound})`,
    );
  }
  return { outcome, ms, arrayBuffers, entries };
}

/** Tally of a fuzz run over damaged files. */
export interface OifitsFuzzTally {
  read: number;
  error: number;
  slowestMs: number;
  largestArrayBuffers: number;
}

/**
 * Runs the reader property over damaged copies of one seed file.
 *
 * @param good - the undamaged file
 * @param seed - fast-check seed
 * @param numRuns - number of damaged copies
 * @returns the tally (every case already passed the property)
 */
export function fuzzOifits(good: Uint8Array, seed: number, numRuns: number): OifitsFuzzTally {
  const tally: OifitsFuzzTally = { read: 0, error: 0, slowestMs: 0, largestArrayBuffers: 0 };
  fc.assert(
    fc.property(arbDamages(good.length), (damages) => {
      const r = readChecked(damage(good, damages));
      tally[r.outcome]++;
      tally.slowestMs = Math.max(tally.slowestMs, r.ms);
      tally.largestArrayBuffers = Math.max(tally.largestArrayBuffers, r.arrayBuffers);
    }),
    { seed, numRuns },
  );
  return tally;
}

/** Spatial frequencies the model properties evaluate at, cycles per radian (0 and up to 1e9). */
export const arbPoints = fc.array(
  fc.tuple(
    fc.oneof(fc.constant(0), fc.double({ min: -1e9, max: 1e9, noNaN: true })),
    fc.oneof(fc.constant(0), fc.double({ min: -1e9, max: 1e9, noNaN: true })),
  ),
  { minLength: 1, maxLength: 6 },
);

/** Largest |V| allowed above 1 for a non-negative image (rounding of the kernels and of the normalisation). */
export const AMPLITUDE_TOL = 1e-9;
/** Largest difference between the visibilities of a model and of its JSON copy. */
export const ROUND_TRIP_TOL = 1e-15;

/** Checks the model properties on one model and a set of points; throws with a description on failure. */
export function checkModel(m: Model, points: ReadonlyArray<readonly [number, number]>): void {
  const u = points.map((p) => p[0]);
  const v = points.map((p) => p[1]);
  const r = m.visibilities(u, v);
  for (let i = 0; i < u.length; i++) {
    const a = Math.hypot(r.re[i]!, r.im[i]!);
    if (!Number.isFinite(r.re[i]!) || !Number.isFinite(r.im[i]!) || a > 1 + AMPLITUDE_TOL) {
      throw new Error(`${m} at (${u[i]}, ${v[i]}): V = ${r.re[i]} + ${r.im[i]} i`);
    }
  }
  const text = JSON.stringify(m);
  const back = modelFromJSON(text);
  if (JSON.stringify(back) !== text) throw new Error(`${m}: the JSON text changed on a round trip`);
  if (!back.equals(m) || !m.equals(back)) throw new Error(`${m}: not canonically equal to its JSON copy`);
  const rb = back.visibilities(u, v);
  for (let i = 0; i < u.length; i++) {
    const d = Math.hypot(rb.re[i]! - r.re[i]!, rb.im[i]! - r.im[i]!);
    if (!(d <= ROUND_TRIP_TOL)) throw new Error(`${m}: its JSON copy differs by ${d} at (${u[i]}, ${v[i]})`);
  }
}

/** Runs the model properties over random trees. */
export function fuzzModels(seed: number, numRuns: number): void {
  fc.assert(
    fc.property(arbAnyModel, arbPoints, (m, points) => checkModel(m, points)),
    { seed, numRuns },
  );
}
