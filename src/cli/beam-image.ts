/**
 * The intensity map of a model as seen with a Gaussian beam: the inverse Fourier transform of its visibilities
 * times the beam's transfer function, computed on a regular uv grid by two separable 1-D transforms.
 *
 * @module
 */
import type { Model } from '../model/model.js';
import { RAD_PER_MAS } from '../units/index.js';

/**
 * Renders `model` on an n x n grid spanning -fov/2..fov/2 mas, convolved with a circular Gaussian beam.
 *
 * @param model - a numeric model
 * @param n - pixels per side (even)
 * @param fov - field of view, mas
 * @param beam - beam FWHM, mas (at least two pixels for a smooth map)
 * @returns pixels[j * n + i] with i running east and j running north (pixel centres at (k - n/2) * fov / n)
 *
 * Notes: I(x) = sum_q V(q) B(q) exp(+2 pi i q . x) over the grid q = (k - n/2) / fov, the inverse of the OIFITS
 * transform; B is the beam's transfer function exp(-(pi beam q)^2 / (4 ln 2)). The map is periodic with period
 * fov, so the model must fit inside the field.
 */
export function beamImage(model: Model, n: number, fov: number, beam: number): Float64Array {
  const fovRad = fov * RAD_PER_MAS;
  const q = Float64Array.from({ length: n }, (_, k) => (k - n / 2) / fovRad);
  const u = new Float64Array(n * n);
  const v = new Float64Array(n * n);
  for (let l = 0; l < n; l++) {
    for (let k = 0; k < n; k++) {
      u[l * n + k] = q[k]!;
      v[l * n + k] = q[l]!;
    }
  }
  const vis = model.visibilities(u, v);
  const kb = (Math.PI * beam * RAD_PER_MAS) ** 2 / (4 * Math.LN2);
  for (let i = 0; i < n * n; i++) {
    const w = Math.exp(-kb * (u[i]! * u[i]! + v[i]! * v[i]!));
    vis.re[i] = vis.re[i]! * w;
    vis.im[i] = vis.im[i]! * w;
  }
  // phase table e^{+2 pi i q_k x_i}: q_k x_i = (k - n/2)(i - n/2) / n turns
  const cr = new Float64Array(n * n);
  const ci = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < n; k++) {
      const t = (((k - n / 2) * (i - n / 2)) % n) / n;
      cr[i * n + k] = Math.cos(2 * Math.PI * t);
      ci[i * n + k] = Math.sin(2 * Math.PI * t);
    }
  }
  // along u (k) for every v row (l): G[l][i]
  const gr = new Float64Array(n * n);
  const gi = new Float64Array(n * n);
  for (let l = 0; l < n; l++) {
    for (let i = 0; i < n; i++) {
      let sr = 0;
      let si = 0;
      for (let k = 0; k < n; k++) {
        const a = vis.re[l * n + k]!;
        const b = vis.im[l * n + k]!;
        const c = cr[i * n + k]!;
        const s = ci[i * n + k]!;
        sr += a * c - b * s;
        si += a * s + b * c;
      }
      gr[l * n + i] = sr;
      gi[l * n + i] = si;
    }
  }
  // along v (l) for every pixel column: I[j][i], real part
  const out = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      let sr = 0;
      for (let l = 0; l < n; l++) sr += gr[l * n + i]! * cr[j * n + l]! - gi[l * n + i]! * ci[j * n + l]!;
      out[j * n + i] = sr;
    }
  }
  return out;
}
