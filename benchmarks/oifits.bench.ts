/**
 * OIFITS read speed: a ~50 MB OIFITS 2 file, generated in memory by uvsky's writer from the astropy fixture
 * (OI_VIS2 and OI_T3 rows repeated), read with readOifits; printed beside the raw speed of copying the same
 * bytes into a Float64Array with a big-endian DataView loop, measured in the same run.
 *
 * Run: node --import tsx benchmarks/oifits.bench.ts
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { OifitsDataset } from '../src/oifits/dataset.js';
import { subsetTable } from '../src/oifits/edit.js';
import { readOifits, writeOifits } from '../src/oifits/index.js';

const TARGET_BYTES = 50e6;
const REPEATS = 5;

function bigFile(): Uint8Array {
  const b = readFileSync(join(import.meta.dirname, '..', 'tests', 'fixtures', 'oifits', 'kestrel_v2.fits'));
  const ds = readOifits(new Uint8Array(b.buffer, b.byteOffset, b.byteLength));
  const vis2 = ds.tables.vis2[0]!;
  const t3 = ds.tables.t3[0]!;
  const rowBytes = (t: typeof vis2) => t.columns.reduce((s, c) => s + c.tform.bytes, 0);
  const per = rowBytes(vis2) + rowBytes(t3) / 3;
  const n = Math.ceil(TARGET_BYTES / per);
  const rows = (m: number, k: number) => Int32Array.from({ length: k }, (_, i) => i % m);
  const big: OifitsDataset = {
    ...ds,
    tables: {
      ...ds.tables,
      vis2: [subsetTable(vis2, rows(vis2.nrows, n))],
      t3: [subsetTable(t3, rows(t3.nrows, Math.ceil(n / 3)))],
    },
  };
  return writeOifits(big, { date: '2024-01-01T00:00:00' });
}

function rawCopy(bytes: Uint8Array): Float64Array {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const n = Math.floor(bytes.length / 8);
  const out = new Float64Array(n);
  for (let i = 0, p = 0; i < n; i++, p += 8) out[i] = dv.getFloat64(p, false);
  return out;
}

function best(f: () => number): number {
  let t = Number.POSITIVE_INFINITY;
  for (let r = 0; r < REPEATS; r++) {
    const t0 = performance.now();
    const sink = f();
    const dt = performance.now() - t0;
    if (!Number.isFinite(sink) && !Number.isNaN(sink)) throw new Error('unexpected');
    t = Math.min(t, dt);
  }
  return t;
}

const bytes = bigFile();
const mb = bytes.length / 1e6;
let entries = 0;
const tRead = best(() => {
  const ds = readOifits(bytes, { name: 'bench.fits' });
  entries = ds.vis2.length + ds.t3.length;
  return ds.vis2.u[ds.vis2.length - 1]!;
});
const tDecodeOnly = best(() => {
  const ds = readOifits(bytes);
  return ds.tables.vis2[0]!.nrows;
});
const tRaw = best(() => {
  const a = rawCopy(bytes);
  return a[a.length - 1]!;
});
console.log(`file: ${mb.toFixed(1)} MB, ${entries} flat entries (OI_VIS2 + OI_T3), best of ${REPEATS}`);
console.log(
  `readOifits (decode, validate, flatten): ${tRead.toFixed(0)} ms = ${(mb / (tRead / 1000)).toFixed(0)} MB/s`,
);
console.log(
  `readOifits (second timing):             ${tDecodeOnly.toFixed(0)} ms = ${(mb / (tDecodeOnly / 1000)).toFixed(0)} MB/s`,
);
console.log(
  `raw DataView big-endian float64 copy:   ${tRaw.toFixed(0)} ms = ${(mb / (tRaw / 1000)).toFixed(0)} MB/s`,
);
console.log(`ratio read / raw copy: ${(tRead / tRaw).toFixed(2)}x the time`);
