/**
 * The uvsky benchmark suite (`npm run bench`): every workload of issue 7 timed side by side in one run with its
 * peers (a NumPy/SciPy script, a naive per-point complex.js loop, and the floors: a loop that computes only the
 * phase ramps with Math.sin / Math.cos, and the same with sinCosTurns), reported as ratios. Medians of repeated
 * runs; a report goes to benchmarks/results/<date>.json and .md.
 *
 * Run: npm run bench (or bench:quick): builds the package, then node benchmarks/node-run.mjs benchmarks/run.ts [--quick]
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import bessel from 'bessel';
import { Complex } from 'complex.js';
import {
  chromaticVis2,
  closeParallelPool,
  disk,
  ellipse,
  gaussian,
  gaussianRing,
  limbDarkenedDisk,
  linearLaw,
  type Model,
  parallelVisibilities,
  param,
  point,
  RAD_PER_MAS,
  ring,
  sharedFloat64Array,
  sum,
  visibilityJacobian,
} from 'uvsky';
import { fit } from 'uvsky/fit';
import { planObservation, readOifits, simulate } from 'uvsky/oifits';
import { BLOCK_POINTS, blockColumns, loadBlock, phaseRampPlain } from '../src/kernels/block.js';
import { SIN_COS, sinCosTurns } from '../src/kernels/sincos.js';

const QUICK = process.argv.includes('--quick');
const N = QUICK ? 200_000 : 1_000_000;
const NT = QUICK ? 60_000 : 300_000;
const NC = QUICK ? 40_000 : 200_000;
const REPEATS = QUICK ? 3 : 7;
const PYTHON = '/usr/bin/python3';

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

/** Median wall time (ms) of f over REPEATS runs after one warm-up, and a checksum of its results. */
function time(f: () => number, repeats = REPEATS): { ms: number; check: number } {
  let check = f();
  const ts: number[] = [];
  for (let r = 0; r < repeats; r++) {
    const t0 = process.hrtime.bigint();
    check += f();
    ts.push(Number(process.hrtime.bigint() - t0) / 1e6);
  }
  if (!Number.isFinite(check)) throw new Error('non-finite benchmark result');
  return { ms: median(ts), check };
}

/**
 * Median wall times (ms) of a and b run alternately (a, b, a, b, ...) after a warm-up of each, so that a change
 * of load during the run reaches both alike; for ratios of two of our own paths.
 */
function alternate(a: () => number, b: () => number, repeats = REPEATS): { a: number; b: number } {
  let check = a() + b();
  const ta: number[] = [];
  const tb: number[] = [];
  for (let r = 0; r < repeats; r++) {
    for (const [f, into] of [
      [a, ta],
      [b, tb],
    ] as const) {
      const t0 = process.hrtime.bigint();
      check += f();
      into.push(Number(process.hrtime.bigint() - t0) / 1e6);
    }
  }
  if (!Number.isFinite(check)) throw new Error('non-finite benchmark result');
  return { a: median(ta), b: median(tb) };
}

function columns(n: number, seed: number): { u: Float64Array; v: Float64Array } {
  const u = new Float64Array(n);
  const v = new Float64Array(n);
  let s = seed;
  for (let i = 0; i < n; i++) {
    s = (s * 1103515245 + 12345) % 2147483648;
    u[i] = (s / 2147483648 - 0.5) * 6e8;
    s = (s * 1103515245 + 12345) % 2147483648;
    v[i] = (s / 2147483648 - 0.5) * 6e8;
  }
  return { u, v };
}

// ---------- machine ----------

function cpuModel(): string {
  try {
    const m = /model name\s*:\s*(.*)/.exec(readFileSync('/proc/cpuinfo', 'utf8'));
    if (m) return m[1]!.trim();
  } catch {
    // not Linux
  }
  return cpus()[0]?.model ?? 'unknown';
}

function pythonVersions(): { numpy: string; scipy: string } | null {
  try {
    const out = execFileSync(
      PYTHON,
      ['-c', 'import numpy, scipy; print(numpy.__version__, scipy.__version__)'],
      {
        encoding: 'utf8',
      },
    ).trim();
    const [numpy, scipy] = out.split(' ');
    return { numpy: numpy!, scipy: scipy! };
  } catch {
    return null;
  }
}

const machine = {
  cpu: cpuModel(),
  cores: cpus().length,
  node: process.version,
  python: pythonVersions(),
  loadAverageAtStart: loadavg().map((x) => Number(x.toFixed(2))),
  date: new Date().toISOString(),
  points: N,
  repeats: REPEATS,
};
console.log(
  `uvsky benchmark suite: ${machine.cpu} (${machine.cores} cores), node ${machine.node}, ` +
    `numpy ${machine.python?.numpy ?? '-'}, scipy ${machine.python?.scipy ?? '-'}, ` +
    `load average at start ${machine.loadAverageAtStart.join(' ')}; median of ${REPEATS}`,
);

// ---------- models ----------

const { u, v } = columns(N, 12345);
const out = { re: new Float64Array(N), im: new Float64Array(N) };
const SHIFT_E = 2.5;
const SHIFT_N = -1;

const modelB = sum(
  limbDarkenedDisk({ diameter: 1.8, law: linearLaw(0.4) }),
  gaussianRing({ diameter: 6, fwhm: 1 }).incline(50, 30).weight(0.3),
  point().weight(0.05).shift(4.5, -2),
);

const primitives: [string, Model][] = [
  ['point', point()],
  ['disk', disk({ diameter: 1.8 })],
  ['gaussian', gaussian({ fwhm: 1.8 })],
  ['ring', ring({ diameter: 1.8 })],
  ['ellipse', ellipse({ major: 2, minor: 1, pa: 30 })],
  ['linear limb-darkened disk', limbDarkenedDisk({ diameter: 1.8, law: linearLaw(0.4) })],
  ['gaussian ring (inclined)', gaussianRing({ diameter: 6, fwhm: 1 }).incline(50, 30)],
];

function ours(m: Model, uu = u, vv = v, o = out): () => number {
  const n = uu.length;
  return () => {
    m.visibilities(uu, vv, o);
    return o.re[n >> 1]! + o.im[n >> 2]!;
  };
}

// ---------- floors ----------

/** One Math.sin and one Math.cos per point per term: the cost of the phase ramps alone. */
function floorMath(terms: number, uu = u, vv = v): () => number {
  const n = uu.length;
  const re = out.re;
  const im = out.im;
  return () => {
    const e0 = SHIFT_E * RAD_PER_MAS;
    const n0 = SHIFT_N * RAD_PER_MAS;
    for (let i = 0; i < n; i++) {
      let a = 0;
      let b = 0;
      for (let k = 0; k < terms; k++) {
        const p = 2 * Math.PI * (uu[i]! * (e0 + k * 1e-10) + vv[i]! * n0);
        a += Math.cos(p);
        b -= Math.sin(p);
      }
      re[i] = a;
      im[i] = b;
    }
    return re[n >> 1]! + im[n >> 2]!;
  };
}

/** The same ramps with the library's sinCosTurns (one call per point per term). */
function floorTurns(terms: number, uu = u, vv = v): () => number {
  const n = uu.length;
  const re = out.re;
  const im = out.im;
  const sc = SIN_COS;
  const f = sinCosTurns;
  return () => {
    const e0 = SHIFT_E * RAD_PER_MAS;
    const n0 = SHIFT_N * RAD_PER_MAS;
    for (let i = 0; i < n; i++) {
      let a = 0;
      let b = 0;
      for (let k = 0; k < terms; k++) {
        f(uu[i]! * (e0 + k * 1e-10) + vv[i]! * n0);
        a += sc[1]!;
        b -= sc[0]!;
      }
      re[i] = a;
      im[i] = b;
    }
    return re[n >> 1]! + im[n >> 2]!;
  };
}

/**
 * The same ramps through the library's block kernels (block.ts: WebAssembly SIMD here), one phaseRampPlain call
 * per block per term, summed into the outputs: the floor of the phase ramps as the library computes them.
 */
function floorBlock(terms: number, uu = u, vv = v): () => number {
  const n = uu.length;
  const re = out.re;
  const im = out.im;
  const cols = blockColumns();
  return () => {
    const e0 = SHIFT_E * RAD_PER_MAS;
    const n0 = SHIFT_N * RAD_PER_MAS;
    const sn = cols.sin;
    const cs = cols.cos;
    for (let b0 = 0; b0 < n; b0 += BLOCK_POINTS) {
      const len = Math.min(BLOCK_POINTS, n - b0);
      loadBlock(cols, uu, vv, b0, len);
      re.fill(0, b0, b0 + len);
      im.fill(0, b0, b0 + len);
      for (let k = 0; k < terms; k++) {
        phaseRampPlain(cols, len, e0 + k * 1e-10, n0);
        for (let j = 0, i = b0; j < len; j++, i++) {
          re[i] = re[i]! + cs[j]!;
          im[i] = im[i]! - sn[j]!;
        }
      }
    }
    return re[n >> 1]! + im[n >> 2]!;
  };
}

// ---------- naive per-point complex.js ----------

function naive(amp: (q: number) => number): () => number {
  const e0 = SHIFT_E * RAD_PER_MAS;
  const n0 = SHIFT_N * RAD_PER_MAS;
  return () => {
    let acc = 0;
    for (let i = 0; i < N; i++) {
      const q = Math.hypot(u[i]!, v[i]!);
      const a = new Complex(amp(Math.PI * q * RAD_PER_MAS), 0);
      const ph = new Complex(0, -2 * Math.PI * (u[i]! * e0 + v[i]! * n0)).exp();
      acc += a.mul(ph).re;
    }
    return acc;
  };
}
const NAIVE: Record<string, (x: number) => number> = {
  point: () => 1,
  disk: (x) => (x === 0 ? 1 : (2 * bessel.besselj(x * 1.8, 1)) / (x * 1.8)),
  gaussian: (x) => Math.exp(-((x * 1.8) ** 2) / (4 * Math.LN2)),
  ring: (x) => bessel.besselj(x * 1.8, 0),
};

// ---------- the NumPy/SciPy peer ----------

interface PeerWorkload {
  name: string;
  kind: 'vis' | 't3';
  plan: unknown;
  columns: Record<string, Float64Array>;
}

function planJSON(m: Model): unknown {
  const p = m.plan();
  return {
    totalFlux: p.totalFlux,
    terms: p.terms.map((t) => ({
      flux: t.flux,
      e0: t.e0,
      n0: t.n0,
      factors: t.factors.map((f) => ({
        code: f.code,
        m11: f.m11,
        m12: f.m12,
        m22: f.m22,
        p: Array.from(f.p),
      })),
    })),
  };
}

function runPeer(
  workloads: PeerWorkload[],
): { seconds: Record<string, number>; outputs: Record<string, Float64Array> } | null {
  if (machine.python === null) return null;
  const dir = mkdtempSync(join(tmpdir(), 'uvsky-bench-'));
  try {
    for (const w of workloads) {
      for (const [c, a] of Object.entries(w.columns)) {
        writeFileSync(join(dir, `${w.name}.${c}.bin`), new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
      }
    }
    const spec = {
      repeats: REPEATS,
      workloads: workloads.map((w) => ({
        name: w.name,
        kind: w.kind,
        plan: w.plan,
        columns: Object.keys(w.columns),
      })),
    };
    writeFileSync(join(dir, 'spec.json'), JSON.stringify(spec));
    execFileSync(PYTHON, [join(import.meta.dirname, 'peers', 'workloads.py'), dir], { stdio: 'inherit' });
    const rep = JSON.parse(readFileSync(join(dir, 'peer.json'), 'utf8')) as {
      results: Record<string, number>;
    };
    const outputs: Record<string, Float64Array> = {};
    for (const w of workloads) {
      const b = readFileSync(join(dir, `${w.name}.out.bin`));
      outputs[w.name] = new Float64Array(b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength));
    }
    return { seconds: rep.results, outputs };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function maxDiff(a: Float64Array, b: Float64Array): number {
  let d = 0;
  for (let i = 0; i < a.length; i++) d = Math.max(d, Math.abs(a[i]! - b[i]!));
  return d;
}

// ---------- workloads ----------

interface Row {
  workload: string;
  ours: number; // ms
  peers: Record<string, number>; // ms
  note?: string;
}
const rows: Row[] = [];
const CHECK_TOL = 1e-10;

// (c) triangles
const t1 = columns(NT, 777);
const t2 = columns(NT, 999);
const cp = new Float64Array(NT);

const agreement: Record<string, number> = {};

/**
 * Ours and the peer side by side: ours, the peer, ours, the peer again (each a median of REPEATS), keeping the
 * faster median of each side, so a change of the machine's load during the run favours neither. The peer's
 * output is compared with ours right after our run.
 */
function sideBySide(
  w: PeerWorkload,
  mine: () => number,
  result: () => Float64Array[],
): { ours: number; peer: number } {
  let best = Number.POSITIVE_INFINITY;
  let peerBest = Number.POSITIVE_INFINITY;
  for (let pass = 0; pass < 2; pass++) {
    best = Math.min(best, time(mine).ms);
    const ours = result();
    const p = runPeer([w]);
    if (p === null) continue;
    peerBest = Math.min(peerBest, p.seconds[w.name]! * 1e3);
    const o = p.outputs[w.name]!;
    let d = 0;
    let at = 0;
    for (const col of ours) {
      d = Math.max(d, maxDiff(col, o.subarray(at, at + col.length)));
      at += col.length;
    }
    agreement[w.name] = Math.max(agreement[w.name] ?? 0, d);
  }
  return { ours: best, peer: Number.isFinite(peerBest) ? peerBest : Number.NaN };
}

// (a) primitives
for (const [name, m0] of primitives) {
  const m = m0.shift(SHIFT_E, SHIFT_N);
  const key = `a-${name.replace(/[^a-z]+/g, '-')}`;
  const r = sideBySide({ name: key, kind: 'vis', plan: planJSON(m), columns: { u, v } }, ours(m), () => [
    out.re,
    out.im,
  ]);
  const peers: Record<string, number> = {
    numpy: r.peer,
    floorMath: time(floorMath(m.terms().length)).ms,
  };
  const nf = NAIVE[name];
  if (nf) peers['naive complex.js'] = time(naive(nf), Math.min(REPEATS, 3)).ms;
  rows.push({ workload: `(a) ${name}, shifted, ${N} points`, ours: r.ours, peers });
}

// (b) the 3-component model
const bSide = sideBySide(
  { name: 'b', kind: 'vis', plan: planJSON(modelB), columns: { u, v } },
  ours(modelB),
  () => [out.re, out.im],
);
const su = sharedFloat64Array(N);
const sv = sharedFloat64Array(N);
su.set(u);
sv.set(v);
const sout = { re: sharedFloat64Array(N), im: sharedFloat64Array(N) };
// one thread and two threads alternately through the same API, so both see the same load
const one: number[] = [];
const two: number[] = [];
for (let r = 0; r <= REPEATS; r++) {
  for (const [threads, into] of [
    [1, one],
    [2, two],
  ] as const) {
    const t0 = process.hrtime.bigint();
    await parallelVisibilities(modelB, su, sv, { threads, out: sout });
    if (r > 0) into.push(Number(process.hrtime.bigint() - t0) / 1e6);
  }
}
rows.push({
  workload: `(b) limb-darkened star + inclined Gaussian ring + shifted point, ${N} points`,
  ours: bSide.ours,
  peers: {
    numpy: bSide.peer,
    floorMath: time(floorMath(3)).ms,
    floorTurns: time(floorTurns(3)).ms,
    floorBlock: time(floorBlock(3)).ms,
    'ours, 2 threads': median(two),
    'ours, parallel API with 1 thread': median(one),
  },
});

// zero allocation: heap growth over repeated calls with out buffers, at two sizes (growth that does not scale
// with the number of points is the runtime's own bookkeeping, not the loop's)
function heapGrowth(n: number, calls: number): number {
  const uu = u.subarray(0, n);
  const vv = v.subarray(0, n);
  const o = { re: out.re.subarray(0, n), im: out.im.subarray(0, n) };
  // warm-up: the first calls allocate the runtime's feedback and optimised code once (about 100 kB in all)
  for (let k = 0; k < 15; k++) modelB.visibilities(uu, vv, o);
  globalThis.gc?.();
  const h0 = process.memoryUsage().heapUsed;
  for (let k = 0; k < calls; k++) modelB.visibilities(uu, vv, o);
  return (process.memoryUsage().heapUsed - h0) / calls;
}
const heap = { small: N / 10, large: N, smallBytes: heapGrowth(N / 10, 30), largeBytes: heapGrowth(N, 30) };
const heapPerCall = heap.largeBytes;

// (c) closure phases
const cSide = sideBySide(
  { name: 'c', kind: 't3', plan: planJSON(modelB), columns: { u1: t1.u, v1: t1.v, u2: t2.u, v2: t2.v } },
  () => {
    modelB.closurePhase(t1.u, t1.v, t2.u, t2.v, cp);
    return cp[NT >> 1]!;
  },
  () => [cp],
);
rows.push({
  workload: `(c) closure phases of (b), ${NT} triangles`,
  ours: cSide.ours,
  peers: { numpy: cSide.peer },
});

// (d) values + Jacobian, 8 free parameters
const modelD = sum(
  limbDarkenedDisk({ diameter: param('diameter', 1.8, { min: 0 }), law: linearLaw(param('ld', 0.4)) }),
  gaussianRing({ diameter: param('ringDiameter', 6, { min: 0 }), fwhm: param('ringWidth', 1, { min: 0 }) })
    .incline(50, param('pa', 30))
    .weight(param('ringFlux', 0.3)),
  point().weight(0.05).shift(param('east', 4.5), param('north', -2)),
);
let dNote = 'model (b) with 8 free parameters';
let dModel = modelD;
try {
  visibilityJacobian(modelD, u.subarray(0, 4), v.subarray(0, 4));
} catch (e) {
  dNote = `model (b) has no analytic Jacobian here (${(e as Error).message}); used disk + inclined Gaussian + point`;
  dModel = sum(
    disk({ diameter: param('diameter', 1.8, { min: 0 }) }),
    gaussian({ fwhm: param('fwhm', 6, { min: 0 }) })
      .incline(param('inclination', 50, { min: 0, max: 90 }), param('pa', 30))
      .weight(param('envelope', 0.3)),
    point().weight(param('companion', 0.05)).shift(param('east', 4.5), param('north', -2)),
  );
}
const cols = dModel.parameters().length;
const ND = QUICK ? 50_000 : 200_000;
const ud = u.subarray(0, ND);
const vd = v.subarray(0, ND);
const jout = {
  re: new Float64Array(ND),
  im: new Float64Array(ND),
  dre: new Float64Array(ND * cols),
  dim: new Float64Array(ND * cols),
};
// values + Jacobian and values alone alternately (a ratio of two of our paths, under the same load)
const dSide = alternate(
  () => {
    const j = visibilityJacobian(dModel, ud, vd, undefined, jout);
    return j.dre[(ND >> 1) * cols]! + j.re[0]!;
  },
  ours(dModel, ud, vd, { re: out.re.subarray(0, ND), im: out.im.subarray(0, ND) }),
  2 * REPEATS + 1,
);
rows.push({
  workload: `(d) values + Jacobian, ${cols} free parameters, ${ND} points`,
  ours: dSide.a,
  peers: { 'values alone': dSide.b },
  note: dNote,
});

// (e) chromatic with bandwidth smearing, 8 sub-samples
const ce = columns(NC, 4242);
const wl = new Float64Array(NC).fill(1.65e-6);
for (let i = 0; i < NC; i++) wl[i] = 1.5e-6 + (i % 16) * 2e-8;
const points = {
  ucoord: ce.u.map((x, i) => x * wl[i]!),
  vcoord: ce.v.map((x, i) => x * wl[i]!),
  wavelength: wl,
  band: new Float64Array(NC).fill(2e-8),
};
const eOurs = time(() => chromaticVis2(modelB, points, { samples: 8 })[NC >> 1]!, Math.min(REPEATS, 3));
const eMono = time(() => modelB.vis2(ce.u, ce.v)[NC >> 1]!);
rows.push({
  workload: `(e) chromatic V² of (b), 8 sub-samples per channel, ${NC} points`,
  ours: eOurs.ms,
  peers: { 'monochromatic V² (8x fewer evaluations)': eMono.ms },
});

// (f) the demo fit (docs/demo/kestrel-minor.fits, the binary model of src/cli/demo.ts), started near the
// best node of the demo's companion search as the demo does
const DEMO_LIMB = linearLaw(0.35); // the demo's fixed law (src/cli/demo.ts)
const demo = readOifits(readFileSync(join(import.meta.dirname, '..', 'docs', 'demo', 'kestrel-minor.fits')));
const binary = sum(
  limbDarkenedDisk({ diameter: param('diameter', 2, { min: 0, max: 10 }), law: DEMO_LIMB }),
  point()
    .weight(param('flux', 0.04, { min: 0, max: 1 }))
    .shift(param('east', 5), param('north', -3)),
);
const fOurs = time(() => fit(binary, demo).chi2, Math.min(REPEATS, 3));
rows.push({
  workload: `(f) fit of the demo data set (${demo.vis2.length} V², ${demo.t3.length} T3), 4 parameters`,
  ours: fOurs.ms,
  peers: {},
  note: 'wall time only (no peer for this one)',
});

// (f) the issue-6 fit: 6 parameters, ~10,000 V² and ~3,400 closure phases, beside scipy.optimize.least_squares
const fitPlan = planObservation({
  target: { name: 'Bench Target', ra: 88.25, dec: -41.5 },
  array: {
    name: 'TALLGRASS',
    latitude: -30,
    stations: [
      { name: 'TG1', east: 0, north: 0 },
      { name: 'TG2', east: 62, north: 18 },
      { name: 'TG3', east: -25, north: 95 },
    ],
  },
  instrument: {
    name: 'REEDPIPE',
    wavelengths: Array.from({ length: 100 }, (_, k) => 1.5e-6 + k * 3e-9),
    bandwidths: 3e-9,
  },
  hourAngles: Array.from({ length: 34 }, (_, k) => -4 + (8 * k) / 33),
  mjd: 61100.2,
});
const truth = sum(
  disk({ diameter: 1.3 }),
  gaussian({ fwhm: 8 }).weight(0.2),
  point().weight(0.12).shift(7.5, -4.2),
);
const fitData = simulate(truth, fitPlan, { noise: true, seed: 7 }).dataset;
const fitModel = sum(
  disk({ diameter: param('diameter', 1.2, { min: 0, max: 10 }) }),
  gaussian({ fwhm: param('fwhm', 7, { min: 0.1, max: 50 }) }).weight(
    param('envelope', 0.15, { min: 0, max: 1 }),
  ),
  point()
    .weight(param('flux', 0.1, { min: 0, max: 1 }))
    .shift(param('east', 7.3), param('north', -4)),
);
const fitOptions = { observables: ['vis2', 't3phi'] as const };
let fitResult = fit(fitModel, fitData, { observables: [...fitOptions.observables] });
const fitOurs = time(
  () => {
    fitResult = fit(fitModel, fitData, { observables: [...fitOptions.observables] });
    return fitResult.chi2;
  },
  Math.min(REPEATS, 3),
);
let scipyFit: { seconds: number; x: number[]; chi2: number; nfev: number } | null = null;
if (machine.python !== null) {
  const dir = mkdtempSync(join(tmpdir(), 'uvsky-fit-'));
  try {
    const cols: Record<string, Float64Array> = {
      u: fitData.vis2.u,
      v: fitData.vis2.v,
      vis2: fitData.vis2.value,
      vis2err: fitData.vis2.error,
      u1: fitData.t3.u1,
      v1: fitData.t3.v1,
      u2: fitData.t3.u2,
      v2: fitData.t3.v2,
      t3phi: fitData.t3.t3phi,
      t3phierr: fitData.t3.t3phiError,
    };
    for (const [c, a] of Object.entries(cols)) {
      const f = Float64Array.from(a);
      writeFileSync(join(dir, `fit.${c}.bin`), new Uint8Array(f.buffer));
    }
    const info = fitModel.parameterInfo();
    writeFileSync(
      join(dir, 'fit.json'),
      JSON.stringify({
        repeats: Math.min(REPEATS, 3),
        start: info.map((p) => p.value),
        lower: info.map((p) => (Number.isFinite(p.min) ? p.min : null)),
        upper: info.map((p) => (Number.isFinite(p.max) ? p.max : null)),
      }),
    );
    execFileSync(PYTHON, [join(import.meta.dirname, 'peers', 'fit_peer.py'), dir], { stdio: 'inherit' });
    scipyFit = JSON.parse(readFileSync(join(dir, 'fit.out.json'), 'utf8'));
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
const fitDiff = scipyFit
  ? Math.max(
      ...fitResult.parameters.map(
        (p, i) => Math.abs(fitResult.values[p]! - scipyFit!.x[i]!) / fitResult.uncertainties[p]!,
      ),
    )
  : Number.NaN;
rows.push({
  workload: `(f) issue-6 fit, 6 parameters, ${fitData.vis2.value.length} V² + ${fitData.t3.t3phi.length} T3PHI`,
  ours: fitOurs.ms,
  peers: scipyFit ? { 'scipy least_squares': scipyFit.seconds * 1e3 } : {},
  note:
    `best values of the two fits differ by at most ${fitDiff.toFixed(3)} sigma; chi2 ours ${fitResult.chi2.toFixed(1)}, ` +
    `scipy ${scipyFit?.chi2.toFixed(1) ?? '-'} (${scipyFit?.nfev ?? '-'} evaluations); ours ${fitResult.iterations} iterations`,
});

await closeParallelPool();

// ---------- report ----------

const ratio = (a: number, b: number) => (Number.isFinite(a) && Number.isFinite(b) ? b / a : Number.NaN);
const fmt = (x: number) => (Number.isFinite(x) ? `${x.toFixed(2)}x` : '-');
const lines: string[] = [];
lines.push(`# uvsky benchmarks, ${machine.date.slice(0, 10)}`);
lines.push('');
lines.push(
  `Machine: ${machine.cpu}, ${machine.cores} cores, node ${machine.node}, numpy ${machine.python?.numpy ?? '-'}, ` +
    `scipy ${machine.python?.scipy ?? '-'}, load average at start ${machine.loadAverageAtStart.join(' ')}. ` +
    `Median of ${REPEATS} runs. Ratios are peer time / our time (above 1: we are faster; for floors, how close we are).`,
);
lines.push('');
lines.push('| workload | ours (ns/point) | peer | peer time / ours |');
lines.push('| --- | --- | --- | --- |');
const perPoint = (r: Row) => {
  const m = /(\d+) (points|triangles)/.exec(r.workload);
  return m ? (r.ours * 1e6) / Number(m[1]) : Number.NaN;
};
for (const r of rows) {
  const names = Object.keys(r.peers);
  if (names.length === 0) lines.push(`| ${r.workload} | ${r.ours.toFixed(0)} ms per fit | - | - |`);
  names.forEach((p, k) => {
    lines.push(
      `| ${k === 0 ? r.workload : ''} | ${k === 0 ? (Number.isFinite(perPoint(r)) ? perPoint(r).toFixed(1) : `${r.ours.toFixed(0)} ms per fit`) : ''} | ${p} | ${fmt(ratio(r.ours, r.peers[p]!))} |`,
    );
  });
  if (r.note) lines.push(`| | | note | ${r.note} |`);
}
const bRow = rows.find((r) => r.workload.startsWith('(b)'))!;
lines.push('');
lines.push('## Aims (ratios from this run)');
lines.push('');
lines.push('| aim | measured |');
lines.push('| --- | --- |');
lines.push(
  `| (b) at least 1.5x faster than NumPy/SciPy, one thread | ${fmt(ratio(bRow.ours, bRow.peers['numpy']!))} |`,
);
lines.push(
  `| (b) within 2.5x of the Math.sin/cos floor (3 ramps) | ${fmt(bRow.ours / bRow.peers['floorMath']!)} of the floor |`,
);
lines.push(
  `| (b) within 2.5x of the sinCosTurns floor | ${fmt(bRow.ours / bRow.peers['floorTurns']!)} of the floor |`,
  `| (b) within 2.5x of the block-kernel floor (block.ts, SIMD) | ${fmt(bRow.ours / bRow.peers['floorBlock']!)} of the floor |`,
);
lines.push(
  `| (b) at least 1.7x on 2 threads | ${fmt(bRow.peers['ours, parallel API with 1 thread']! / bRow.peers['ours, 2 threads']!)} (1 thread / 2 threads, parallel API) |`,
);
lines.push(
  `| zero allocation in the hot loop | heap growth per call ${heap.smallBytes.toFixed(0)} B at ${heap.small} points, ${heap.largeBytes.toFixed(0)} B at ${heap.large} points (${(heap.largeBytes / heap.large).toFixed(3)} B per point) |`,
);
lines.push(
  '| memory per point (parallel) | 2 Float64 outputs with SharedArrayBuffer inputs; 4 when the inputs must be copied |',
);
lines.push('');
lines.push(`Heap growth per call of (b) with out buffers: ${heapPerCall.toFixed(0)} bytes (${N} points).`);
lines.push(
  `Largest |ours - numpy| over the outputs: ${Object.entries(agreement)
    .map(([k, d]) => `${k} ${d.toExponential(1)}`)
    .join(', ')} (aim < ${CHECK_TOL}).`,
);
const md = lines.join('\n');
console.log(md);
const resultsDir = join(import.meta.dirname, 'results');
mkdirSync(resultsDir, { recursive: true });
const stamp = machine.date.slice(0, 10);
writeFileSync(join(resultsDir, `${stamp}.md`), `${md}\n`);
writeFileSync(
  join(resultsDir, `${stamp}.json`),
  `${JSON.stringify({ machine, rows, heap, agreement }, null, 2)}\n`,
);
for (const [k, d] of Object.entries(agreement)) {
  if (!(d < CHECK_TOL)) {
    console.error(`${k}: ours and the NumPy peer differ by ${d}, more than ${CHECK_TOL}`);
    process.exitCode = 1;
  }
}
