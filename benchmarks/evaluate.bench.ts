/**
 * Foundation benchmark: ns per point per term for each primitive with a shift, and the ratio against a naive
 * per-point complex.js evaluation (using the npm `bessel` package for J0/J1) measured in the same run.
 * Aim (issue 2): the shifted disk term at or under 25 ns per point on one core.
 *
 * Run: npm run build && node benchmarks/node-run.mjs benchmarks/evaluate.bench.ts [points]
 */
import bessel from 'bessel';
import { Complex } from 'complex.js';
import { disk, ellipse, gaussian, type Model, point, RAD_PER_MAS, ring } from 'uvsky';

const N = Number(process.argv[2] ?? 1_000_000);
const REPEATS = 7;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

function time(f: () => number): { ns: number; check: number } {
  let check = 0;
  const ts: number[] = [];
  f(); // warm up
  for (let r = 0; r < REPEATS; r++) {
    const t0 = process.hrtime.bigint();
    check += f();
    ts.push(Number(process.hrtime.bigint() - t0));
  }
  return { ns: median(ts), check };
}

// deterministic uv points up to 3e8 cycles / rad
const u = new Float64Array(N);
const v = new Float64Array(N);
let s = 12345;
const rnd = () => {
  s = (s * 1103515245 + 12345) % 2147483648;
  return s / 2147483648;
};
for (let i = 0; i < N; i++) {
  u[i] = (rnd() - 0.5) * 6e8;
  v[i] = (rnd() - 0.5) * 6e8;
}
const out = { re: new Float64Array(N), im: new Float64Array(N) };

const cases: [string, Model, (q: number) => number][] = [
  ['point', point().shift(2.5, -1), () => 1],
  [
    'disk',
    disk({ diameter: 1.8 }).shift(2.5, -1),
    (x) => (x === 0 ? 1 : (2 * bessel.besselj(x * 1.8, 1)) / (x * 1.8)),
  ],
  ['gaussian', gaussian({ fwhm: 1.8 }).shift(2.5, -1), (x) => Math.exp(-((x * 1.8) ** 2) / (4 * Math.LN2))],
  ['ring', ring({ diameter: 1.8 }).shift(2.5, -1), (x) => bessel.besselj(x * 1.8, 0)],
  ['ellipse', ellipse({ major: 2, minor: 1, pa: 30 }).shift(2.5, -1), () => Number.NaN],
];

const e0 = 2.5 * RAD_PER_MAS;
const n0 = -1 * RAD_PER_MAS;
function naive(f: (x: number) => number): number {
  let acc = 0;
  for (let i = 0; i < N; i++) {
    const q = Math.hypot(u[i]!, v[i]!);
    const amp = new Complex(f(Math.PI * q * RAD_PER_MAS), 0);
    const ph = new Complex(0, -2 * Math.PI * (u[i]! * e0 + v[i]! * n0)).exp();
    acc += amp.mul(ph).re;
  }
  return acc;
}

console.log(
  `uvsky foundation benchmark: ${N} points, median of ${REPEATS}, node ${process.version}, ${process.arch}`,
);
console.log('term (shifted)   ns/point   naive complex.js ns/point   speed-up');
for (const [name, m, f] of cases) {
  m.visibilities(u.subarray(0, 10), v.subarray(0, 10)); // compile the plan outside the timing
  const ours = time(() => {
    m.visibilities(u, v, out);
    return out.re[N >> 1]!;
  });
  const base = Number.isNaN(f(1)) ? null : time(() => naive(f));
  const line = `${name.padEnd(16)} ${(ours.ns / N).toFixed(1).padStart(9)}`;
  console.log(
    base
      ? `${line} ${(base.ns / N).toFixed(1).padStart(27)} ${(base.ns / ours.ns).toFixed(1).padStart(10)}x`
      : `${line} ${'-'.padStart(27)} ${'-'.padStart(10)}`,
  );
  if (!Number.isFinite(ours.check) || (base && !Number.isFinite(base.check)))
    throw new Error('non-finite result');
}
