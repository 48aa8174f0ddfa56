/**
 * Issue 4 benchmark: the cost of values plus the analytic Jacobian against values alone, for 3-component models
 * with 8 free parameters, measured side by side in one run (alternately, so that a change of load reaches both
 * alike). Aim: ratio <= 3.
 *
 * Three models: the disk + inclined Gaussian + shifted point of issue 4; model (b) of the suite (a linearly
 * limb-darkened star with a free coefficient, an inclined Gaussian-blurred ring, a shifted point), as in its (d);
 * and a star whose law is fixed (the common case of a law from model atmospheres) with a companion and an
 * envelope.
 *
 * Run: npm run build && node benchmarks/node-run.mjs benchmarks/jacobian.bench.ts [points]
 */
import {
  disk,
  gaussian,
  gaussianRing,
  limbDarkenedDisk,
  linearLaw,
  type Model,
  param,
  point,
  sum,
  visibilityJacobian,
} from 'uvsky';

const N = Number(process.argv[2] ?? 200_000);
const REPEATS = 15;

const models: [string, Model][] = [
  [
    'disk + inclined Gaussian + shifted point',
    sum(
      disk({ diameter: param('diameter', 1.8, { min: 0 }) }),
      gaussian({ fwhm: param('fwhm', 6, { min: 0 }) })
        .incline(param('inclination', 50, { min: 0, max: 90 }), param('pa', 30))
        .weight(param('envelope', 0.3)),
      point().weight(param('companion', 0.05)).shift(param('east', 4.5), param('north', -2)),
    ),
  ],
  [
    'model (b): limb-darkened star + inclined Gaussian ring + shifted point',
    sum(
      limbDarkenedDisk({ diameter: param('diameter', 1.8, { min: 0 }), law: linearLaw(param('ld', 0.4)) }),
      gaussianRing({
        diameter: param('ringDiameter', 6, { min: 0 }),
        fwhm: param('ringWidth', 1, { min: 0 }),
      })
        .incline(50, param('pa', 30))
        .weight(param('ringFlux', 0.3)),
      point().weight(0.05).shift(param('east', 4.5), param('north', -2)),
    ),
  ],
  [
    'a star with a fixed limb-darkening law + shifted companion + Gaussian envelope',
    sum(
      limbDarkenedDisk({ diameter: param('diameter', 1.8, { min: 0 }), law: linearLaw(0.4) }).shift(
        param('starEast', 0.2),
        param('starNorth', -0.1),
      ),
      point().weight(param('companion', 0.05)).shift(param('east', 4.5), param('north', -2)),
      gaussian({ fwhm: param('envelopeFwhm', 8, { min: 0 }) }).weight(param('envelope', 0.1)),
    ),
  ],
];

const u = new Float64Array(N);
const v = new Float64Array(N);
for (let i = 0; i < N; i++) {
  u[i] = Math.sin(i * 0.37) * 3e8;
  v[i] = Math.cos(i * 0.11) * 3e8;
}
const out = { re: new Float64Array(N), im: new Float64Array(N) };

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)]!;
}

console.log(`uvsky Jacobian benchmark: ${N} points, median of ${REPEATS} alternate runs`);
let check = 0;
for (const [name, model] of models) {
  const cols = model.parameters().length;
  const jout = {
    re: new Float64Array(N),
    im: new Float64Array(N),
    dre: new Float64Array(N * cols),
    dim: new Float64Array(N * cols),
  };
  const valuesOnce = () => {
    model.visibilities(u, v, out);
    return out.re[N >> 1]!;
  };
  const jacobianOnce = () => {
    const j = visibilityJacobian(model, u, v, undefined, jout);
    return j.dre[(N >> 1) * j.cols]! + j.re[0]!;
  };
  check += valuesOnce() + jacobianOnce();
  const tv: number[] = [];
  const tj: number[] = [];
  for (let r = 0; r < REPEATS; r++) {
    let t0 = process.hrtime.bigint();
    check += valuesOnce();
    tv.push(Number(process.hrtime.bigint() - t0));
    t0 = process.hrtime.bigint();
    check += jacobianOnce();
    tj.push(Number(process.hrtime.bigint() - t0));
  }
  const values = median(tv);
  const withJac = median(tj);
  console.log(`\n${name}, ${cols} free parameters`);
  console.log(`values alone        ${(values / N).toFixed(1).padStart(8)} ns/point`);
  console.log(`values + Jacobian   ${(withJac / N).toFixed(1).padStart(8)} ns/point`);
  console.log(`ratio               ${(withJac / values).toFixed(2).padStart(8)}x   (aim: <= 3x)`);
}
if (!Number.isFinite(check)) throw new Error('non-finite result');
