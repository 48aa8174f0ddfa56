/**
 * Kernel benchmark: ns per call of besselJ0, besselJ1, diskAmplitude and besselJnu, against the npm `bessel`
 * package and @stdlib (Cephes-derived) measured in the same run, with the ratios. Every result is summed and the
 * sums are printed, so no call can be optimised away.
 *
 * Run: node --import tsx benchmarks/kernels.bench.ts [calls per repeat]
 */
import besselj0 from '@stdlib/math-base-special-besselj0';
import besselj1 from '@stdlib/math-base-special-besselj1';
import bessel from 'bessel';
import { besselJ0, besselJ1, besselJnu, diskAmplitude, powerLawAmplitude } from '../src/kernels/bessel.js';

const N = Number(process.argv[2] ?? 200_000);
const REPEATS = 7;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

/** Deterministic arguments uniform on [lo, hi). */
function grid(lo: number, hi: number): Float64Array {
  const xs = new Float64Array(N);
  let s = 12345;
  for (let i = 0; i < N; i++) {
    s = (s * 1103515245 + 12345) % 2147483648;
    xs[i] = lo + ((hi - lo) * s) / 2147483648;
  }
  return xs;
}

type Loop = (f: (x: number) => number, xs: Float64Array) => number;

/**
 * A fresh copy of the timing loop for each case: a loop shared by all cases would see many callees, stop
 * inlining them and add the cost of an indirect call to every measurement.
 */
function freshLoop(): Loop {
  return new Function(
    'f',
    'xs',
    'let acc = 0; for (let i = 0; i < xs.length; i++) acc += f(xs[i]); return acc;',
  ) as Loop;
}

/** Median ns per call of f over xs, and the sum of all results. */
function time(f: (x: number) => number, xs: Float64Array): { ns: number; sum: number } {
  const loop = freshLoop();
  let sum = 0;
  const ts: number[] = [];
  for (let r = 0; r <= REPEATS; r++) {
    const t0 = process.hrtime.bigint();
    const acc = loop(f, xs);
    const dt = Number(process.hrtime.bigint() - t0);
    if (r > 0) ts.push(dt); // the first pass warms up
    sum += acc;
  }
  return { ns: median(ts) / xs.length, sum };
}

const ranges: [string, number, number][] = [
  ['0..12', 0, 12],
  ['0..200', 0, 200],
  ['200..1e6', 200, 1e6],
];

interface Row {
  name: string;
  range: string;
  ns: number;
  baselines: string;
  sum: number;
}
const rows: Row[] = [];

function compare(
  name: string,
  ours: (x: number) => number,
  baselines: [string, (x: number) => number][],
  lo: number,
  hi: number,
  range: string,
): void {
  const xs = grid(lo, hi);
  const mine = time(ours, xs);
  let sum = mine.sum;
  const parts: string[] = [];
  for (const [label, f] of baselines) {
    const b = time(f, xs);
    sum += b.sum;
    parts.push(`${label} ${b.ns.toFixed(1)} ns (x${(b.ns / mine.ns).toFixed(1)})`);
  }
  rows.push({ name, range, ns: mine.ns, baselines: parts.join(', '), sum });
}

for (const [range, lo, hi] of ranges) {
  compare(
    'besselJ0',
    besselJ0,
    [
      ['npm bessel', (x) => bessel.besselj(x, 0)],
      ['@stdlib', besselj0],
    ],
    lo,
    hi,
    range,
  );
  compare(
    'besselJ1',
    besselJ1,
    [
      ['npm bessel', (x) => bessel.besselj(x, 1)],
      ['@stdlib', besselj1],
    ],
    lo,
    hi,
    range,
  );
}
compare(
  'diskAmplitude',
  diskAmplitude,
  [
    ['2 J1/x, npm bessel', (x) => (x === 0 ? 1 : (2 * bessel.besselj(x, 1)) / x)],
    ['2 J1/x, @stdlib', (x) => (x === 0 ? 1 : (2 * besselj1(x)) / x)],
  ],
  0,
  12,
  '0..12',
);
for (const [range, lo, hi] of [ranges[0]!, ranges[1]!]) {
  compare(
    'besselJnu(3, x)',
    (x) => besselJnu(3, x),
    [['npm bessel n=3', (x) => bessel.besselj(x, 3)]],
    lo,
    hi,
    range,
  );
}
compare('besselJnu(2.37, x)', (x) => besselJnu(2.37, x), [], 0, 12, '0..12');
compare('powerLawAmplitude(2.37, x)', (x) => powerLawAmplitude(2.37, x), [], 0, 12, '0..12');
compare('besselJnu(2.37, x)', (x) => besselJnu(2.37, x), [], 0, 200, '0..200');

console.log(`uvsky kernels, ${N} calls per repeat, median of ${REPEATS} repeats, Node ${process.version}`);
for (const r of rows) {
  const tail = r.baselines ? `  vs ${r.baselines}` : '';
  console.log(`${r.name.padEnd(28)} x in ${r.range.padEnd(9)} ${r.ns.toFixed(1).padStart(6)} ns/call${tail}`);
}
console.log(`checksum (sum of all results): ${rows.reduce((a, r) => a + r.sum, 0)}`);
