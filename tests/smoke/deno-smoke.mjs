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

// The phase ramps (WebAssembly in Deno): a shifted Gaussian against its closed form (closed-form.mjs).
{
  const { gaussian } = await import('../../dist/index.js');
  const { shiftedGaussianError } = await import('./closed-form.mjs');
  const worst = shiftedGaussianError(gaussian);
  if (!(worst < 1e-14)) throw new Error(`deno smoke test: shifted Gaussian off its closed form by ${worst}`);
  console.log(`deno smoke test passed: shifted Gaussian within ${worst.toExponential(1)} of its closed form`);
}
