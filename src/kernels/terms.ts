/**
 * Visibility kernels of canonical terms: loops over typed arrays that add one term's complex contribution
 * `flux * P(A^T q) * exp(-2 pi i q . x0)` into `re`, `im`. No objects are created inside the loops.
 *
 * Layout: complex numbers are held as separate `re` and `im` Float64Arrays of equal length.
 * Units: u, v in cycles per radian; quadratic forms M = A A^T in rad^2; shifts e0, n0 in radians.
 *
 * @module
 */
import { besselJ0, diskAmplitude } from './bessel.js';
import { SIN_COS, sinCosTurns } from './sincos.js';

/** pi^2 / (4 ln 2): the Gaussian exponent per unit (FWHM q)^2. */
export const GAUSS_K = (Math.PI * Math.PI) / (4 * Math.LN2);

/** Radial kernel codes (unit-size primitives). */
export const RADIAL_UNIFORM_DISK = 0;
/** Gaussian of unit FWHM. */
export const RADIAL_GAUSSIAN = 1;
/** Thin ring of unit diameter. */
export const RADIAL_THIN_RING = 2;

/**
 * Adds the phase ramp of a shifted term without size, `flux * exp(-2 pi i (u e0 + v n0))`.
 *
 * Notes: the phase is reduced in turns (exactly) before it is turned into radians, so a shift of any size
 * keeps only the rounding error of the product u * e0 (about |t| * 1.1e-16 turns).
 */
export function addPointTerm(
  re: Float64Array,
  im: Float64Array,
  u: Float64Array,
  v: Float64Array,
  n: number,
  flux: number,
  e0: number,
  n0: number,
): void {
  if (e0 === 0 && n0 === 0) {
    for (let i = 0; i < n; i++) re[i] = re[i]! + flux;
    return;
  }
  for (let i = 0; i < n; i++) {
    sinCosTurns(u[i]! * e0 + v[i]! * n0);
    re[i] = re[i]! + flux * SIN_COS[1]!;
    im[i] = im[i]! - flux * SIN_COS[0]!;
  }
}

/**
 * Multiplies `amp[i]` by a radial unit kernel evaluated at r = sqrt(q^T M q).
 *
 * @param code - one of the RADIAL_* codes
 * @param amp - amplitudes to multiply in place
 * @param u - spatial frequencies east (cycles/rad)
 * @param v - spatial frequencies north (cycles/rad)
 * @param n - number of points
 * @param m11 - quadratic form entries of M = A A^T (rad^2)
 * @param m12 - off-diagonal entry
 * @param m22 - second diagonal entry
 */
export function mulRadial(
  code: number,
  amp: Float64Array,
  u: Float64Array,
  v: Float64Array,
  n: number,
  m11: number,
  m12: number,
  m22: number,
): void {
  const m12x2 = 2 * m12;
  switch (code) {
    case RADIAL_UNIFORM_DISK:
      for (let i = 0; i < n; i++) {
        const uu = u[i]!;
        const vv = v[i]!;
        const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
        amp[i] = amp[i]! * diskAmplitude(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
      }
      return;
    case RADIAL_GAUSSIAN:
      for (let i = 0; i < n; i++) {
        const uu = u[i]!;
        const vv = v[i]!;
        const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
        amp[i] = amp[i]! * Math.exp(-GAUSS_K * (r2 > 0 ? r2 : 0));
      }
      return;
    case RADIAL_THIN_RING:
      for (let i = 0; i < n; i++) {
        const uu = u[i]!;
        const vv = v[i]!;
        const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
        amp[i] = amp[i]! * besselJ0(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
      }
      return;
    default:
      throw new Error(`mulRadial: unknown kernel code ${code}`);
  }
}

/**
 * Adds a term with one radial factor: `flux * P(r) * exp(-2 pi i (u e0 + v n0))`, fused in one pass.
 *
 * Notes: this is the hot path of most models (one shifted disk, Gaussian or ring); it needs one kernel call and,
 * when the term is shifted, one sin and one cos per point.
 */
export function addRadialTerm(
  code: number,
  re: Float64Array,
  im: Float64Array,
  u: Float64Array,
  v: Float64Array,
  n: number,
  flux: number,
  m11: number,
  m12: number,
  m22: number,
  e0: number,
  n0: number,
): void {
  const m12x2 = 2 * m12;
  const shifted = e0 !== 0 || n0 !== 0;
  switch (code) {
    case RADIAL_UNIFORM_DISK:
      if (shifted) {
        for (let i = 0; i < n; i++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          const a = flux * diskAmplitude(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
          sinCosTurns(uu * e0 + vv * n0);
          re[i] = re[i]! + a * SIN_COS[1]!;
          im[i] = im[i]! - a * SIN_COS[0]!;
        }
      } else {
        for (let i = 0; i < n; i++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          re[i] = re[i]! + flux * diskAmplitude(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
        }
      }
      return;
    case RADIAL_GAUSSIAN:
      if (shifted) {
        for (let i = 0; i < n; i++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          const a = flux * Math.exp(-GAUSS_K * (r2 > 0 ? r2 : 0));
          sinCosTurns(uu * e0 + vv * n0);
          re[i] = re[i]! + a * SIN_COS[1]!;
          im[i] = im[i]! - a * SIN_COS[0]!;
        }
      } else {
        for (let i = 0; i < n; i++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          re[i] = re[i]! + flux * Math.exp(-GAUSS_K * (r2 > 0 ? r2 : 0));
        }
      }
      return;
    case RADIAL_THIN_RING:
      if (shifted) {
        for (let i = 0; i < n; i++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          const a = flux * besselJ0(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
          sinCosTurns(uu * e0 + vv * n0);
          re[i] = re[i]! + a * SIN_COS[1]!;
          im[i] = im[i]! - a * SIN_COS[0]!;
        }
      } else {
        for (let i = 0; i < n; i++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          re[i] = re[i]! + flux * besselJ0(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
        }
      }
      return;
    default:
      throw new Error(`addRadialTerm: unknown kernel code ${code}`);
  }
}

/**
 * Adds `amp[i] * exp(-2 pi i (u e0 + v n0))` for real amplitudes already multiplied by the term's flux.
 */
export function addAmplitudeTerm(
  re: Float64Array,
  im: Float64Array,
  amp: Float64Array,
  u: Float64Array,
  v: Float64Array,
  n: number,
  e0: number,
  n0: number,
): void {
  if (e0 === 0 && n0 === 0) {
    for (let i = 0; i < n; i++) re[i] = re[i]! + amp[i]!;
    return;
  }
  for (let i = 0; i < n; i++) {
    sinCosTurns(u[i]! * e0 + v[i]! * n0);
    const a = amp[i]!;
    re[i] = re[i]! + a * SIN_COS[1]!;
    im[i] = im[i]! - a * SIN_COS[0]!;
  }
}
