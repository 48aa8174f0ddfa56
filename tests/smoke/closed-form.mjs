// A shifted Gaussian against its closed form (CONVENTIONS.md): exp(-(pi fwhm q)^2 / (4 ln 2)) exp(-2 pi i (u east
// + v north)), computed with Math.exp, Math.cos and Math.sin. Shared by the Deno and the browser smoke tests, which
// run the built package's phase ramps (WebAssembly, or JavaScript where a page forbids it).

/**
 * Largest |V - closed form| of gaussian({ fwhm: 2 }).shift(3, -1) at three baselines.
 * @param gaussian - the package's gaussian factory
 * @returns the largest absolute difference over the real and imaginary parts
 */
export function shiftedGaussianError(gaussian) {
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
  return worst;
}
