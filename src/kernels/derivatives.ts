/**
 * Values and derivatives of the unit-size radial kernels, for the analytic Jacobians.
 *
 * Each function takes r2 = |A^T q|^2 (squared spatial frequency seen through the factor's map, in units where the
 * primitive has size 1) and the factor's kernel coefficients, and writes into `out`:
 * `out[0]` = P, `out[1]` = dP/d(r2), `out[2 + k]` = dP/d(p_k) for the kernel coefficients p_k (the numbers the
 * value path computes from the shape parameters once per plan). Using r2 rather than r keeps the slope
 * finite at q = 0.
 *
 * @module
 */
import { besselJ0, besselJ1, diskAmplitude } from './bessel.js';
import { GAUSS_K } from './terms.js';

/**
 * Signature of a radial kernel with derivatives: `p` holds the kernel coefficients (empty for the foundation
 * kinds), `data` the fixed data of tabulated kinds; `out[2 + k]` receives dP/dp_k.
 */
export type RadialDerivativeKernel = (r2: number, p: Float64Array, out: Float64Array, data?: unknown) => void;

const PI2 = Math.PI * Math.PI;

// J2(x)/x^2 = sum_k (-1)^k (x^2/4)^k / (4 k! (k+2)!)  (A&S 9.1.10)
const J2X2 = Array.from({ length: 12 }, (_, k) => {
  let f = 4;
  for (let i = 2; i <= k; i++) f *= i;
  for (let i = 2; i <= k + 2; i++) f *= i;
  return (k % 2 === 0 ? 1 : -1) / f;
});
const [T0, T1, T2, T3, T4, T5, T6, T7, T8, T9, T10, T11] = J2X2 as [
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
  number,
];

/**
 * J2(x) / x^2, finite at 0.
 *
 * Notes: below x = 2 the power series of A&S 9.1.10 to (x^2/4)^11, whose next term is below 1e-18 there; above,
 * (2 J1(x)/x - J0(x)) / x^2 from the recurrence A&S 9.1.27, where the cancellation costs at most a factor 4 in
 * relative accuracy.
 */
export function j2OverX2(x: number): number {
  if (x < 2) {
    const y = 0.25 * x * x;
    return (
      T0 +
      y *
        (T1 +
          y *
            (T2 +
              y *
                (T3 + y * (T4 + y * (T5 + y * (T6 + y * (T7 + y * (T8 + y * (T9 + y * (T10 + y * T11))))))))))
    );
  }
  return ((2 * besselJ1(x)) / x - besselJ0(x)) / (x * x);
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
