/**
 * Visibility kernels of the extended components: limb-darkened disks (linear, quadratic, power law), the
 * uniform annulus, exponential and Lorentzian-like profiles, the flat background (radial kinds, functions of
 * r = |A^T q|), and the azimuthally modulated thin ring (a complex, non-radial kind that needs A^T q itself).
 *
 * Units: u, v in cycles per radian; quadratic forms M = A A^T in rad^2; linear maps A in radians per unit size;
 * shifts in radians. Layout: complex values in separate `re`, `im` Float64Arrays. No allocation in the loops.
 *
 * @module
 */
import { besselJ0, besselJ2, diskAmplitude, powerLawAmplitude } from './bessel.js';
import {
  SIN_COS as SIN_COS_IMPORT,
  sinCosPhase as sinCosPhaseImport,
  sinCosTurns as sinCosTurnsImport,
  splitHead,
} from './sincos.js';

/** Linearly limb-darkened disk of unit diameter; coefficients [c1, c32] (see {@link limbDarkenedCoefficients}). */
export const RADIAL_LINEAR_LD = 16;
/** Quadratically limb-darkened disk of unit diameter; coefficients [c1, c32, c2]. */
export const RADIAL_QUADRATIC_LD = 17;
/** Power-law limb-darkened disk of unit diameter; coefficients [nu = alpha / 2 + 1]. */
export const RADIAL_POWER_LD = 18;
/** Uniform annulus of unit outer diameter; coefficients [ratio = inner / outer]. */
export const RADIAL_ANNULUS = 19;
/** Exponential profile of unit FWHM. */
export const RADIAL_EXPONENTIAL = 20;
/** Lorentzian-like profile (1 + (r/a)^2)^(-3/2) of unit FWHM. */
export const RADIAL_LORENTZIAN = 21;
/** Fully resolved background: 1 at r = 0 exactly, 0 elsewhere. */
export const RADIAL_BACKGROUND = 22;
/** Tabulated radial profile (data: a {@link RadialTable}-like evaluator). */
export const RADIAL_TABLE = 23;
/** Azimuthally modulated thin ring of unit diameter; coefficients [c1 sin pa1, c1 cos pa1, c2 cos 2pa2, c2 sin 2pa2]. */
export const COMPLEX_MODULATED_RING = 32;
/** Pixel image (data: a {@link ComplexEvaluator}). */
export const COMPLEX_PIXEL_IMAGE = 33;

/** A tabulated radial kernel: V(rho) at rho = |A^T q| in cycles per unit. */
export interface RadialEvaluator {
  /** V at rho (cycles per unit). */
  at(rho: number): number;
}
/** A tabulated complex kernel: writes V(w1, w2) into out[0] (re), out[1] (im); w in cycles per unit. */
export interface ComplexEvaluator {
  at(w1: number, w2: number, out: Float64Array): void;
}

/** True when a kernel code is one of this module's radial codes. */
export function isComponentRadial(code: number): boolean {
  return code >= 16 && code < 32;
}
/** True when a kernel code is one of this module's complex (non-radial) codes. */
export function isComponentComplex(code: number): boolean {
  return code >= 32;
}

// ---------- scalar kernels ----------

/**
 * L_{3/2}(x) = Gamma(5/2) (2/x)^{3/2} J_{3/2}(x) = 3 (sin x - x cos x) / x^3, the visibility of I(mu) = mu.
 *
 * Notes: the closed form of J_{3/2} (A&S 10.1.11) above x = 1 (relative rounding about 3e-16 / x^2); below,
 * the power series 0F1(; 5/2; -x^2/4) to the x^16 term (next term below 3e-16).
 */
export function linearLimbAmplitude(x: number): number {
  const a = Math.abs(x);
  if (a >= 1) return (3 * (Math.sin(a) - a * Math.cos(a))) / (a * a * a);
  const z = -0.25 * a * a;
  let term = 1;
  let sum = 1;
  for (let k = 1; k <= 8; k++) {
    term *= z / (k * (1.5 + k));
    sum += term;
  }
  return sum;
}

/** J2(x) / x^2 with the limit 1/8 at 0 (series below 1e-3, where the next term is below 1e-16 relative). */
export function j2OverX2(x: number): number {
  const a = Math.abs(x);
  if (a < 1e-3) return 0.125 - (a * a) / 96;
  return besselJ2(a) / (a * a);
}

/**
 * Normalised coefficients of the quadratic limb-darkening law I(mu) = 1 - a (1 - mu) - b (1 - mu)^2 on the
 * basis L_1 = 2 J1(x)/x (I = 1), L_{3/2} (I = mu) and L_2 = 8 J2(x)/x^2 (I = mu^2).
 *
 * @param a - linear coefficient (dimensionless)
 * @param b - quadratic coefficient (dimensionless; 0 for the linear law)
 * @returns [c1, c32, c2] with V = c1 L_1 + c32 L_{3/2} + c2 L_2 and c1 + c32 + c2 = 1
 *
 * Notes: I = (1 - a - b) + (a + 2b) mu - b mu^2, and a disk of I = mu^k has flux 2 / (k + 2) times the uniform
 * disk's (Hestroffer 1997, A&A 327:199, eq. for the power law at integer alpha), so the total flux is
 * 1 - a/3 - b/6. At b = 0 this is the linear law of Hanbury Brown et al. 1974 (MNRAS 167:475).
 */
export function limbDarkenedCoefficients(a: number, b: number): [number, number, number] {
  const total = 1 - a / 3 - b / 6;
  return [(1 - a - b) / total, ((2 / 3) * (a + 2 * b)) / total, (-0.5 * b) / total];
}

/** Visibility of the quadratic (or, with c2 = 0, linear) limb-darkened disk of unit diameter at x = pi r. */
export function quadraticLimbAmplitude(x: number, c1: number, c32: number, c2: number): number {
  const a = Math.abs(x);
  if (a < 2) {
    return c1 * diskAmplitude(a) + c32 * linearLimbAmplitude(a) + (c2 === 0 ? 0 : 8 * c2 * j2OverX2(a));
  }
  const d = diskAmplitude(a);
  const l32 = (3 * (Math.sin(a) - a * Math.cos(a))) / (a * a * a);
  // J2 = 2 J1 / x - J0 (A&S 9.1.27), so 8 J2 / x^2 = 8 (D - J0) / x^2 with D = 2 J1 / x
  return c1 * d + c32 * l32 + (c2 === 0 ? 0 : (8 * c2 * (d - besselJ0(a))) / (a * a));
}

const ANNULUS_GL = 8;
/** 8-point Gauss-Legendre nodes and weights on [-1, 1] (A&S table 25.4). */
const GL_X = new Float64Array([
  -0.9602898564975363, -0.7966664774136267, -0.525532409916329, -0.1834346424956498, 0.1834346424956498,
  0.525532409916329, 0.7966664774136267, 0.9602898564975363,
]);
const GL_W = new Float64Array([
  0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.362683783378362, 0.362683783378362,
  0.3137066458778873, 0.2223810344533745, 0.1012285362903763,
]);
/** Below this 1 - ratio^2 the annulus uses quadrature instead of the difference of two disks. */
const ANNULUS_QUADRATURE_BELOW = 0.05;
/**
 * Above this x (1 - ratio) (radians of x s across the annulus) the thin annulus goes back to the difference of
 * two disks: the quadrature would need more than 32 panels, and there D(x) and D(r x) are both below about
 * 1.6 x^(-3/2), so the cancellation costs at most about 1e-16 (|D(x)| + |D(r x)|) / (1 - r^2) <= 1e-17
 * absolute, while the quadrature's cost grows with x.
 */
const ANNULUS_QUADRATURE_MAX_PHASE = 64;

/**
 * Visibility of the uniform annulus of unit outer diameter and inner/outer diameter ratio `r`, at x = pi rho.
 *
 * Notes: for 1 - r^2 >= 0.05 the closed form (D(x) - r^2 D(r x)) / (1 - r^2), D = 2 J1(x)/x (a disk minus the
 * disk of the hole, weighted by area; absolute error below 1e-15 / 0.05 = 2e-14). Thinner annuli would lose
 * digits to cancellation, so there V = 2 / (1 - r^2) int_r^1 s J0(x s) ds (the same integral, since
 * d/dt [t J1(t)] = t J0(t), A&S 9.1.30) by 8-point Gauss-Legendre on panels spanning at most 2 radians of
 * x s, which is accurate to about 1e-15. r = 1 is the thin ring J0(x).
 */
export function annulusAmplitude(x: number, r: number): number {
  const a = Math.abs(x);
  const r2 = r * r;
  const gap = 1 - r2;
  if (gap >= ANNULUS_QUADRATURE_BELOW || a * (1 - r) > ANNULUS_QUADRATURE_MAX_PHASE)
    return (diskAmplitude(a) - r2 * diskAmplitude(r * a)) / gap;
  if (1 - r <= 0) return besselJ0(a);
  const panels = Math.max(1, Math.ceil((a * (1 - r)) / 2));
  const h = (1 - r) / panels;
  let acc = 0;
  for (let p = 0; p < panels; p++) {
    const mid = r + (p + 0.5) * h;
    for (let k = 0; k < ANNULUS_GL; k++) {
      const s = mid + 0.5 * h * GL_X[k]!;
      acc += GL_W[k]! * s * besselJ0(a * s);
    }
  }
  // (2 / (1 - r^2)) * (h / 2) * acc, and h = (1 - r) / panels
  return acc / (panels * (1 + r));
}

/** (2 pi h)^2 for the exponential profile of unit FWHM, h = 1 / (2 ln 2). */
export const EXPONENTIAL_K = (Math.PI / Math.LN2) ** 2;
/** 2 pi a for the Lorentzian-like profile of unit FWHM, a = 1 / (2 sqrt(2^(2/3) - 1)). */
export const LORENTZIAN_K = Math.PI / Math.sqrt(2 ** (2 / 3) - 1);

/**
 * Visibility of the exponential profile I(r) ~ exp(-r/h) of unit FWHM (h = 1 / (2 ln 2)) at r2 = rho^2.
 *
 * Notes: V = (1 + (2 pi h rho)^2)^(-3/2), the Hankel transform of exp(-r/h) (a standard pair, e.g.
 * Gradshteyn & Ryzhik 6.623.2, from memory; checked against scipy quad in tests/model/profiles.test.ts).
 */
export function exponentialAmplitude(r2: number): number {
  const s = 1 + EXPONENTIAL_K * (r2 > 0 ? r2 : 0);
  return 1 / (s * Math.sqrt(s));
}

/**
 * Visibility of the Lorentzian-like profile I(r) ~ (1 + (r/a)^2)^(-3/2) of unit FWHM at r2 = rho^2.
 *
 * Notes: V = exp(-2 pi a rho) with a = FWHM / (2 sqrt(2^(2/3) - 1)) = 0.6524 FWHM, the Hankel transform of
 * (a^2 + r^2)^(-3/2) (Gradshteyn & Ryzhik 6.554.1, from memory; checked against scipy quad in the tests). The
 * plain 2D Lorentzian 1 / (1 + (r/a)^2) has infinite flux, so this profile is the one with a closed form.
 */
export function lorentzianAmplitude(r2: number): number {
  return Math.exp(-LORENTZIAN_K * Math.sqrt(r2 > 0 ? r2 : 0));
}

/** Value of a radial component kernel at r2 = |A^T q|^2 (cycles per unit, squared). */
export function componentRadialAmplitude(code: number, r2: number, p: Float64Array, data: unknown): number {
  const rr = r2 > 0 ? r2 : 0;
  switch (code) {
    case RADIAL_LINEAR_LD:
      return quadraticLimbAmplitude(Math.PI * Math.sqrt(rr), p[0]!, p[1]!, 0);
    case RADIAL_QUADRATIC_LD:
      return quadraticLimbAmplitude(Math.PI * Math.sqrt(rr), p[0]!, p[1]!, p[2]!);
    case RADIAL_POWER_LD:
      return powerLawAmplitude(p[0]!, Math.PI * Math.sqrt(rr));
    case RADIAL_ANNULUS:
      return annulusAmplitude(Math.PI * Math.sqrt(rr), p[0]!);
    case RADIAL_EXPONENTIAL:
      return exponentialAmplitude(rr);
    case RADIAL_LORENTZIAN:
      return lorentzianAmplitude(rr);
    case RADIAL_BACKGROUND:
      return rr === 0 ? 1 : 0;
    case RADIAL_TABLE:
      return (data as RadialEvaluator).at(Math.sqrt(rr));
    default:
      throw new Error(`componentRadialAmplitude: unknown kernel code ${code}`);
  }
}

// ---------- loops over points ----------

/**
 * Multiplies `amp[i]` by a radial component kernel at r2 = q^T M q.
 *
 * @param code - one of the RADIAL_* codes of this module
 * @param amp - amplitudes, multiplied in place
 * @param u - spatial frequencies east, cycles/rad
 * @param v - spatial frequencies north, cycles/rad
 * @param n - number of points
 * @param m11 - M = A A^T entries, rad^2
 * @param m12 - off-diagonal entry
 * @param m22 - second diagonal entry
 * @param p - kernel coefficients
 * @param data - tabulated data (RADIAL_TABLE) or null
 */
export function mulComponentRadial(
  code: number,
  amp: Float64Array,
  u: Float64Array,
  v: Float64Array,
  n: number,
  m11: number,
  m12: number,
  m22: number,
  p: Float64Array,
  data: unknown,
): void {
  const m12x2 = 2 * m12;
  for (let i = 0; i < n; i++) {
    const uu = u[i]!;
    const vv = v[i]!;
    const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
    amp[i] = amp[i]! * componentRadialAmplitude(code, r2, p, data);
  }
}

/**
 * Adds a term with one radial component factor, `flux * P(r) * exp(-2 pi i (u e0 + v n0))`, in one pass.
 *
 * Notes: the linear, quadratic and exponential kinds have their own loops (the hot cases); the others go
 * through {@link componentRadialAmplitude}. With `exact` the phase ramp goes through sinCosPhase (the products
 * u e0, v n0 split, about 1e-16 turns for any shift); without, the caller has found |u e0| + |v n0| below
 * PLAIN_PHASE_TURNS (phaseNeedsSplit in sincos.ts) and the plain sum is accurate enough.
 */
export function addComponentRadialTerm(
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
  p: Float64Array,
  data: unknown,
  exact: boolean,
): void {
  const sinCosPhase = sinCosPhaseImport;
  const sinCosTurns = sinCosTurnsImport;
  const SIN_COS = SIN_COS_IMPORT;
  const eh = splitHead(e0);
  const el = e0 - eh;
  const nh = splitHead(n0);
  const nl = n0 - nh;
  const m12x2 = 2 * m12;
  const shifted = e0 !== 0 || n0 !== 0;
  if (code === RADIAL_LINEAR_LD || code === RADIAL_QUADRATIC_LD) {
    const c1 = p[0]!;
    const c32 = p[1]!;
    const c2 = code === RADIAL_QUADRATIC_LD ? p[2]! : 0;
    for (let i = 0; i < n; i++) {
      const uu = u[i]!;
      const vv = v[i]!;
      const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
      const a = flux * quadraticLimbAmplitude(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0), c1, c32, c2);
      if (shifted) {
        if (exact) sinCosPhase(uu, vv, eh, el, nh, nl);
        else sinCosTurns(uu * e0 + vv * n0);
        re[i] = re[i]! + a * SIN_COS[1]!;
        im[i] = im[i]! - a * SIN_COS[0]!;
      } else re[i] = re[i]! + a;
    }
    return;
  }
  if (code === RADIAL_POWER_LD) {
    const nu = p[0]!;
    for (let i = 0; i < n; i++) {
      const uu = u[i]!;
      const vv = v[i]!;
      const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
      const a = flux * powerLawAmplitude(nu, Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
      if (shifted) {
        if (exact) sinCosPhase(uu, vv, eh, el, nh, nl);
        else sinCosTurns(uu * e0 + vv * n0);
        re[i] = re[i]! + a * SIN_COS[1]!;
        im[i] = im[i]! - a * SIN_COS[0]!;
      } else re[i] = re[i]! + a;
    }
    return;
  }
  for (let i = 0; i < n; i++) {
    const uu = u[i]!;
    const vv = v[i]!;
    const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
    const a = flux * componentRadialAmplitude(code, r2, p, data);
    if (shifted) {
      if (exact) sinCosPhase(uu, vv, eh, el, nh, nl);
      else sinCosTurns(uu * e0 + vv * n0);
      re[i] = re[i]! + a * SIN_COS[1]!;
      im[i] = im[i]! - a * SIN_COS[0]!;
    } else re[i] = re[i]! + a;
  }
}

/**
 * The azimuthally modulated thin ring of unit diameter at w = A^T q (cycles per unit), written into out.
 *
 * @param w1 - east component of A^T q
 * @param w2 - north component of A^T q
 * @param p - [c1 sin pa1, c1 cos pa1, c2 cos 2 pa2, c2 sin 2 pa2]
 * @param out - out[0] = Re V, out[1] = Im V
 *
 * Notes: for the brightness 1 + sum_m c_m cos(m (theta - pa_m)) along the ring (theta from north to east) and
 * the sign convention exp(-2 pi i q.x), the Jacobi-Anger expansion (A&S 9.1.42-43) gives
 * V = J0(x) + sum_m (-i)^m c_m J_m(x) cos(m (phi - pa_m)), x = pi |w|, phi the position angle of w. Written
 * without phi: m = 1 is -i (pi/2) D(x) c1 (w1 sin pa1 + w2 cos pa1) with D = 2 J1(x)/x, and m = 2 is
 * -pi^2 (J2(x)/x^2) c2 ((w2^2 - w1^2) cos 2pa2 + 2 w1 w2 sin 2pa2). Checked against a DFT of a rendered image.
 */
export function modulatedRingAt(w1: number, w2: number, p: Float64Array, out: Float64Array): void {
  const rho2 = w1 * w1 + w2 * w2;
  const x = Math.PI * Math.sqrt(rho2);
  const d = diskAmplitude(x);
  const j0 = besselJ0(x);
  // J2 / x^2: the series near 0, else (D - J0) / x^2 (A&S 9.1.27)
  const j2x2 = x < 2 ? j2OverX2(x) : (d - j0) / (x * x);
  out[0] = j0 - Math.PI * Math.PI * j2x2 * ((w2 * w2 - w1 * w1) * p[2]! + 2 * w1 * w2 * p[3]!);
  out[1] = -0.5 * Math.PI * d * (w1 * p[0]! + w2 * p[1]!);
}

/**
 * Multiplies complex amplitudes (cre, cim) by a complex component kernel at w = A^T q.
 *
 * @param code - COMPLEX_MODULATED_RING or COMPLEX_PIXEL_IMAGE
 * @param cre - real parts, multiplied in place
 * @param cim - imaginary parts
 * @param u - spatial frequencies east, cycles/rad
 * @param v - spatial frequencies north, cycles/rad
 * @param n - number of points
 * @param a11 - the linear map A in radians per unit (row-major)
 * @param a12 - entry
 * @param a21 - entry
 * @param a22 - entry
 * @param p - kernel coefficients
 * @param data - evaluator of tabulated kinds
 * @param tmp - scratch of length >= 2
 */
export function mulComponentComplex(
  code: number,
  cre: Float64Array,
  cim: Float64Array,
  u: Float64Array,
  v: Float64Array,
  n: number,
  a11: number,
  a12: number,
  a21: number,
  a22: number,
  p: Float64Array,
  data: unknown,
  tmp: Float64Array,
): void {
  const ev = code === COMPLEX_PIXEL_IMAGE ? (data as ComplexEvaluator) : null;
  if (code !== COMPLEX_MODULATED_RING && ev === null) {
    throw new Error(`mulComponentComplex: unknown kernel code ${code}`);
  }
  for (let i = 0; i < n; i++) {
    const uu = u[i]!;
    const vv = v[i]!;
    // w = A^T q
    const w1 = a11 * uu + a21 * vv;
    const w2 = a12 * uu + a22 * vv;
    if (ev === null) modulatedRingAt(w1, w2, p, tmp);
    else ev.at(w1, w2, tmp);
    const xr = cre[i]!;
    const xi = cim[i]!;
    const yr = tmp[0]!;
    const yi = tmp[1]!;
    cre[i] = xr * yr - xi * yi;
    cim[i] = xr * yi + xi * yr;
  }
}

/**
 * Adds `amp[i] * (cre[i] + i cim[i]) * exp(-2 pi i (u e0 + v n0))` into (re, im).
 *
 * Notes: `exact` as for the radial terms: the split phase of sinCosPhase when u e0 + v n0 can exceed
 * PLAIN_PHASE_TURNS (sincos.ts), else the plain one.
 */
export function addComplexAmplitudeTerm(
  re: Float64Array,
  im: Float64Array,
  amp: Float64Array,
  cre: Float64Array,
  cim: Float64Array,
  u: Float64Array,
  v: Float64Array,
  n: number,
  e0: number,
  n0: number,
  exact: boolean,
): void {
  const sinCosPhase = sinCosPhaseImport;
  const sinCosTurns = sinCosTurnsImport;
  const SIN_COS = SIN_COS_IMPORT;
  const eh = splitHead(e0);
  const el = e0 - eh;
  const nh = splitHead(n0);
  const nl = n0 - nh;
  const shifted = e0 !== 0 || n0 !== 0;
  for (let i = 0; i < n; i++) {
    const a = amp[i]!;
    const xr = a * cre[i]!;
    const xi = a * cim[i]!;
    if (shifted) {
      const uu = u[i]!;
      const vv = v[i]!;
      if (exact) sinCosPhase(uu, vv, eh, el, nh, nl);
      else sinCosTurns(uu * e0 + vv * n0);
      const c = SIN_COS[1]!;
      const s = SIN_COS[0]!;
      // (xr + i xi)(c - i s)
      re[i] = re[i]! + xr * c + xi * s;
      im[i] = im[i]! + xi * c - xr * s;
    } else {
      re[i] = re[i]! + xr;
      im[i] = im[i]! + xi;
    }
  }
}
