/**
 * Component benchmark: ns per point for each kernel of the extended component set, beside the uniform-disk
 * kernel measured in the same run (the ratio column), all shifted so the phase ramp is included.
 *
 * Run: npm run build && node benchmarks/node-run.mjs benchmarks/components.bench.ts [points]
 */
import {
  annulus,
  background,
  disk,
  exponential,
  gaussian,
  gaussianRing,
  limbDarkenedDisk,
  linearLaw,
  lorentzian,
  type Model,
  modulatedRing,
  pixelImage,
  powerLaw,
  quadraticLaw,
  radialProfile,
} from 'uvsky';

const N = Number(process.argv[2] ?? 200_000);
const REPEATS = 5;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
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

function nsPerPoint(m: Model, n = N): { ns: number; check: number } {
  const uu = u.subarray(0, n);
  const vv = v.subarray(0, n);
  const o = { re: out.re.subarray(0, n), im: out.im.subarray(0, n) };
  m.visibilities(uu, vv, o); // compile the plan and warm up
  const ts: number[] = [];
  let check = 0;
  for (let r = 0; r < REPEATS; r++) {
    const t0 = process.hrtime.bigint();
    m.visibilities(uu, vv, o);
    ts.push(Number(process.hrtime.bigint() - t0));
    check += o.re[n >> 1]! + o.im[n >> 2]!;
  }
  return { ns: median(ts) / n, check };
}

const img = Array.from({ length: 32 * 32 }, (_, k) =>
  Math.exp(-(((k % 32) - 15.5) ** 2 + (Math.floor(k / 32) - 15.5) ** 2) / 40),
);
const cases: [string, Model, number?][] = [
  ['uniform disk (baseline)', disk({ diameter: 1.8 })],
  ['linear limb darkening', limbDarkenedDisk({ diameter: 1.8, law: linearLaw(0.4) })],
  ['quadratic limb darkening', limbDarkenedDisk({ diameter: 1.8, law: quadraticLaw(0.3, 0.2) })],
  ['power-law limb darkening', limbDarkenedDisk({ diameter: 1.8, law: powerLaw(0.3) })],
  ['annulus (r = 0.5)', annulus({ inner: 0.9, outer: 1.8 })],
  ['annulus (r = 0.99)', annulus({ inner: 1.782, outer: 1.8 })],
  ['gaussian ring (ring x gaussian)', gaussianRing({ diameter: 1.8, fwhm: 0.5 })],
  ['modulated ring', modulatedRing({ diameter: 1.8, c1: 0.3, pa1: 40, c2: 0.2, pa2: 10 })],
  ['exponential', exponential({ fwhm: 1.8 })],
  ['lorentzian', lorentzian({ fwhm: 1.8 })],
  ['background', background()],
  ['radial profile (table)', radialProfile({ radii: [0, 0.9, 0.9], intensity: [1, 0.6, 0] })],
  ['pixel image 32x32', pixelImage({ nx: 32, pixels: img, scale: 0.1 }), Math.min(N, 20_000)],
  ['gaussian (foundation)', gaussian({ fwhm: 1.8 })],
];

console.log(
  `uvsky component benchmark: ${N} points, median of ${REPEATS}, node ${process.version}, ${process.arch}`,
);
console.log('kernel (shifted 2.5, -1 mas)        ns/point   x uniform disk');
let base = 0;
for (const [name, m0, n] of cases) {
  const r = nsPerPoint(m0.shift(2.5, -1), n);
  if (base === 0) base = r.ns;
  if (!Number.isFinite(r.check)) throw new Error(`${name}: non-finite result`);
  console.log(`${name.padEnd(34)} ${r.ns.toFixed(1).padStart(9)} ${(r.ns / base).toFixed(2).padStart(14)}`);
}
