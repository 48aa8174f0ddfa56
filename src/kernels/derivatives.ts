/**
 * Values and derivatives of the unit-size radial kernels, for the analytic Jacobians.
 *
 * Each function takes r2 = |A^T q|^2 (squared spatial frequency seen through the factor's map, in units where the
 * primitive has size 1) and the factor's shape parameters, and writes into `out`:
 * `out[0]` = P, `out[1]` = dP/d(r2), `out[2 + k]` = dP/d(shape_k). Using r2 rather than r keeps the slope
 * finite at q = 0.
 *
 * @module
 */
import { besselJ0, besselJ2, diskAmplitude } from './bessel.js';
import { GAUSS_K } from './terms.js';

/** Signature of a radial kernel with derivatives. */
export type RadialDerivativeKernel = (r2: number, shape: Float64Array, out: Float64Array) => void;

const PI2 = Math.PI * Math.PI;

/**
 * J2(x) / x^2, finite at 0.
 *
 * Notes: series J2(x)/x^2 = 1/8 - x^2/96 + x^4/3072 - x^6/184320 (A&S 9.1.10) below x = 0.05, where the next
 * term is below 1e-16 relative; above, J2 from the kernel library.
 */
export function j2OverX2(x: number): number {
  if (x < 0.05) {
    const x2 = x * x;
    return 1 / 8 + x2 * (-1 / 96 + x2 * (1 / 3072 - x2 / 184320));
  }
  return besselJ2(x) / (x * x);
}

/**
 * Uniform disk of unit diameter: P = 2 J1(x)/x with x = pi r; dP/dr2 = -pi^2 J2(x)/x^2.
 *
 * Notes: d/dx [2 J1(x)/x] = -2 J2(x)/x (A&S 9.1.30 with the recurrences 9.1.27), and dx/dr2 = pi^2 / (2x).
 */
export function uniformDiskDerivatives(r2: number, _shape: Float64Array, out: Float64Array): void {
  const x = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
  out[0] = diskAmplitude(x);
  out[1] = -PI2 * j2OverX2(x);
}

/** Gaussian of unit FWHM: P = exp(-K r2), K = pi^2 / (4 ln 2); dP/dr2 = -K P. */
export function gaussianDerivatives(r2: number, _shape: Float64Array, out: Float64Array): void {
  const p = Math.exp(-GAUSS_K * (r2 > 0 ? r2 : 0));
  out[0] = p;
  out[1] = -GAUSS_K * p;
}

/**
 * Thin ring of unit diameter: P = J0(x), x = pi r; dP/dr2 = -(pi^2 / 4) 2 J1(x)/x.
 *
 * Notes: J0' = -J1 (A&S 9.1.28) and dx/dr2 = pi^2 / (2x).
 */
export function thinRingDerivatives(r2: number, _shape: Float64Array, out: Float64Array): void {
  const x = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
  out[0] = besselJ0(x);
  out[1] = -(PI2 / 4) * diskAmplitude(x);
}
