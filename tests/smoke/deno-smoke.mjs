// Deno smoke test: import the built ESM bundle and evaluate a model (run by .ci/run after the build).
import { disk, point, sum } from '../../dist/index.js';

const m = sum(disk({ diameter: 2 }), point().weight(0.1).shift(3, 0));
const v2 = m.vis2([0, 5e7], [0, 0]);
if (Math.abs(v2[0] - 1) > 1e-12 || !(v2[1] > 0 && v2[1] < 1)) {
  throw new Error(`deno smoke test: unexpected V^2 ${v2}`);
}
console.log(
  `deno smoke test passed: V^2 = ${Array.from(v2)
    .map((x) => x.toFixed(6))
    .join(', ')}`,
);

// The block kernels (WebAssembly in Deno): a shifted Gaussian against its closed form, CONVENTIONS.md:
// exp(-(pi fwhm q)^2 / (4 ln 2)) exp(-2 pi i (u east + v north)), computed here with Math.exp, Math.cos, Math.sin.
{
  const { gaussian } = await import('../../dist/index.js');
  const MAS = Math.PI / 180 / 3600 / 1000;
  const u = [5e7, 1.2e8, -2e8];
  const v = [2e7, -3e7, 1e8];
  const z = gaussian({ fwhm: 2 }).shift(3, -1).visibilities(u, v);
  let worst = 0;
  for (let i = 0; i < u.length; i++) {
    const amp = Math.exp(-((Math.PI * 2 * MAS * Math.hypot(u[i], v[i])) ** 2) / (4 * Math.LN2));
    const phase = -2 * Math.PI * (u[i] * 3 * MAS - v[i] * MAS);
    worst = Math.max(
      worst,
      Math.abs(z.re[i] - amp * Math.cos(phase)),
      Math.abs(z.im[i] - amp * Math.sin(phase)),
    );
  }
  if (!(worst < 1e-14)) throw new Error(`deno smoke test: shifted Gaussian off its closed form by ${worst}`);
  console.log(`deno smoke test passed: shifted Gaussian within ${worst.toExponential(1)} of its closed form`);
}
