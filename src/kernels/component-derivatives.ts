/**
 * Values and exact derivatives of the extended component kernels, for the analytic Jacobians.
 *
 * Radial kernels have the {@link RadialDerivativeKernel} signature `(r2, p, out, data)`: r2 = |A^T q|^2 in
 * cycles per unit squared, `p` the kernel coefficients the value path uses (see `componentCoefficients` of the
 * evaluation plan), and they write `out[0]` = P, `out[1]` = dP/d(r2), `out[2 + k]` = dP/dp_k.
 *
 * Complex (non-radial) kernels have the {@link ComplexDerivativeKernel} signature `(w1, w2, p, out, data)`,
 * w = A^T q in cycles per unit, and write the complex value and its derivatives as (re, im) pairs:
 * `out[0..1]` = V, `out[2..3]` = dV/dw1, `out[4..5]` = dV/dw2, `out[6 + 2k .. 7 + 2k]` = dV/dp_k.
 *
 * Every derivative is the exact derivative of the value path's formula (Bessel recurrences, closed forms,
 * the interpolant of a table), so Jacobians agree with finite differences of the values. Nothing allocates.
 *
 * @module
 */
import { besselJ0, besselJ1, diskAmplitude, powerLawAmplitude } from './bessel.js';
import {
  DISK_PIECES,
  HANKEL_START,
  L3_PIECES,
  L32_PIECES,
  L52_PIECES,
  pieceIndex,
  pieceLocal,
  W2_PIECES,
} from './bessel-coefficients.js';
import { powerLawOrderDerivative } from './bessel-jnu-order.js';
import {
  annulusAmplitude,
  EXPONENTIAL_K,
  LORENTZIAN_K,
  linearLimbAmplitude,
  quadraticLimbAmplitude,
} from './components.js';
import { j2OverX2, type RadialDerivativeKernel } from './derivatives.js';
import { basisPiece } from './limb-pieces.js';

/** A complex kernel with derivatives in w = A^T q and in its coefficients (layout in the module notes). */
export type ComplexDerivativeKernel = (
  w1: number,
  w2: number,
  p: Float64Array,
  out: Float64Array,
  data: unknown,
) => void;

const PI2 = Math.PI * Math.PI;
const TWO_PI = 2 * Math.PI;

/** Series of 0F1(; b; -x^2/4) for x < 2 (16 terms; the next is below 1e-20 there for b >= 2.5). */
function hyp0f1Small(b: number, x: number): number {
  const z = -0.25 * x * x;
  let term = 1;
  let sum = 1;
  for (let k = 1; k <= 16; k++) {
    term *= z / (k * (b - 1 + k));
    sum += term;
  }
  return sum;
}

/**
 * L_{5/2}(x) = Gamma(7/2) (2/x)^{5/2} J_{5/2}(x) = 15 ((3 - x^2) sin x - 3 x cos x) / x^5.
 *
 * Notes: the closed form of J_{5/2} (A&S 10.1.11) from x = 2 (where the bracket loses under a factor 2 to
 * cancellation), the power series 0F1(; 7/2; -x^2/4) below.
 */
export function l52(x: number): number {
  const a = Math.abs(x);
  if (a < 2) return hyp0f1Small(3.5, a);
  const a2 = a * a;
  return (15 * ((3 - a2) * Math.sin(a) - 3 * a * Math.cos(a))) / (a2 * a2 * a);
}

/**
 * L_3(x) = 48 J3(x) / x^3.
 *
 * Notes: from x = 2 by the upward recurrence J2 = 2 J1/x - J0, J3 = 4 J2/x - J1 (A&S 9.1.27, stable while the
 * order stays below x and losing at most a factor 5 at x = 2); the power series 0F1(; 4; -x^2/4) below.
 */
export function l3(x: number): number {
  const a = Math.abs(x);
  if (a < 2) return hyp0f1Small(4, a);
  const j0 = besselJ0(a);
  const j1 = besselJ1(a);
  const j2 = (2 * j1) / a - j0;
  const j3 = (4 * j2) / a - j1;
  return (48 * j3) / (a * a * a);
}

/**
 * Linearly or quadratically limb-darkened disk of unit diameter, coefficients p = [c1, c32] or [c1, c32, c2]
 * (the basis of `limbDarkenedCoefficients`): P = c1 L_1 + c32 L_{3/2} + c2 L_2 at x = pi sqrt(r2).
 *
 * Notes: d/dx L_nu = -x L_{nu+1} / (2 (nu + 1)) (A&S 9.1.30) and dx/dr2 = pi^2 / (2x), so
 * dL_nu/dr2 = -pi^2 L_{nu+1} / (4 (nu + 1)): the slopes need L_2 = 8 J2/x^2, L_{5/2} and L_3. dP/dc_k is the
 * basis function itself. For 2 <= x < HANKEL_START all five come from their half-unit-piece tables
 * (bessel-coefficients.ts, error of each below 7e-17), elsewhere from the closed forms and series.
 */
export function limbDarkenedDerivatives(r2: number, p: Float64Array, out: Float64Array): void {
  const x = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
  const c1 = p[0]!;
  const c32 = p[1]!;
  const quadratic = p.length > 2;
  const c2 = quadratic ? p[2]! : 0;
  if (x >= 2 && x < HANKEL_START) {
    // every basis function from its half-unit-piece table (bessel-coefficients.ts), one piece index for all
    const k = pieceIndex(x);
    const t = pieceLocal(x, k);
    const d = basisPiece(DISK_PIECES, k, t);
    const l = basisPiece(L32_PIECES, k, t);
    const w = basisPiece(W2_PIECES, k, t); // 8 J2/x^2
    out[0] = c1 * d + c32 * l + c2 * w;
    let sl = -PI2 * (c1 * 0.125 * w + (c32 * basisPiece(L52_PIECES, k, t)) / 10);
    if (quadratic) sl -= (PI2 / 12) * c2 * basisPiece(L3_PIECES, k, t);
    out[1] = sl;
    out[2] = d;
    out[3] = l;
    if (quadratic) out[4] = w;
    return;
  }
  const j = j2OverX2(x);
  const l1 = diskAmplitude(x);
  const l32 = linearLimbAmplitude(x);
  out[0] = quadraticLimbAmplitude(x, c1, c32, c2);
  let slope = -PI2 * (c1 * j + (c32 * l52(x)) / 10);
  if (quadratic) slope -= (PI2 / 12) * c2 * l3(x);
  out[1] = slope;
  out[2] = l1;
  out[3] = l32;
  if (quadratic) out[4] = 8 * j;
}

/**
 * Power-law limb-darkened disk of unit diameter, p = [nu] (nu = alpha / 2 + 1): P = L_nu(x), x = pi sqrt(r2).
 *
 * Notes: dP/dr2 = -pi^2 L_{nu+1}(x) / (4 (nu + 1)) (the identity behind `powerLawAmplitudeDerivative`);
 * dP/dnu from {@link powerLawOrderDerivative}.
 */
export function powerLawDerivatives(r2: number, p: Float64Array, out: Float64Array): void {
  const x = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
  const nu = p[0]!;
  out[0] = powerLawAmplitude(nu, x);
  out[1] = (-PI2 / (4 * (nu + 1))) * powerLawAmplitude(nu + 1, x);
  out[2] = powerLawOrderDerivative(nu, x);
}

const ANNULUS_GL = 8;
/** 8-point Gauss-Legendre nodes and weights on [-1, 1] (A&S table 25.4), as the value kernel uses. */
const GL_X = new Float64Array([
  -0.9602898564975363, -0.7966664774136267, -0.525532409916329, -0.1834346424956498, 0.1834346424956498,
  0.525532409916329, 0.7966664774136267, 0.9602898564975363,
]);
const GL_W = new Float64Array([
  0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.362683783378362, 0.362683783378362,
  0.3137066458778873, 0.2223810344533745, 0.1012285362903763,
]);
/** Where the value kernel switches from the difference of two disks to quadrature (1 - ratio^2). */
const ANNULUS_QUADRATURE_BELOW = 0.05;
/** Above this x (1 - ratio) the value kernel keeps the difference of two disks even for thin annuli. */
const ANNULUS_QUADRATURE_MAX_PHASE = 64;

/**
 * Uniform annulus of unit outer diameter, p = [r] (inner / outer): P = (D(x) - r^2 D(r x)) / (1 - r^2).
 *
 * Notes: with D = 2 J1(x)/x, dD/dr2 = -pi^2 J2(x)/x^2 (= -pi^2 j(x)), so for the closed form
 * dP/dr2 = -pi^2 (j(x) - r^4 j(r x)) / g and dP/dr = 2 r (P - D(r x) + r^2 x^2 j(r x)) / g, g = 1 - r^2.
 * For thin annuli (g < 0.05, unless x (1 - r) > 64, where the closed form is kept) the value kernel integrates V = (2/g) int_r^1 s J0(x s) ds, and so do the
 * derivatives: dP/dr2 = -(pi^2 / (2 g)) int_r^1 s^3 D(x s) ds and, integrating (V - J0(r x)) / g by parts,
 * dP/dr = -(2 r x / g^2) int_r^1 J1(x s) (1 - s^2) ds (no cancellation), on the same Gauss-Legendre panels.
 * At r = 1 (the thin ring) the limits J0(x), -(pi^2/4) D(x) and -x J1(x) / 2.
 */
export function annulusDerivatives(r2: number, p: Float64Array, out: Float64Array): void {
  const a = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
  const r = p[0]!;
  const rr = r * r;
  const gap = 1 - rr;
  out[0] = annulusAmplitude(a, r);
  if (gap >= ANNULUS_QUADRATURE_BELOW || a * (1 - r) > ANNULUS_QUADRATURE_MAX_PHASE) {
    const b = r * a;
    const jb = j2OverX2(b);
    out[1] = (-PI2 * (j2OverX2(a) - rr * rr * jb)) / gap;
    out[2] = (2 * r * (out[0]! - diskAmplitude(b) + rr * a * a * jb)) / gap;
    return;
  }
  if (1 - r <= 0) {
    out[1] = -(PI2 / 4) * diskAmplitude(a);
    out[2] = -0.5 * a * besselJ1(a);
    return;
  }
  const panels = Math.max(1, Math.ceil((a * (1 - r)) / 2));
  const h = (1 - r) / panels;
  let i3 = 0;
  let i1 = 0;
  for (let q = 0; q < panels; q++) {
    const mid = r + (q + 0.5) * h;
    for (let k = 0; k < ANNULUS_GL; k++) {
      const s = mid + 0.5 * h * GL_X[k]!;
      const w = GL_W[k]!;
      i3 += w * s * s * s * diskAmplitude(a * s);
      i1 += w * besselJ1(a * s) * (1 - s * s);
    }
  }
  // the integrals are (h / 2) * the sums
  out[1] = -(PI2 / (2 * gap)) * 0.5 * h * i3;
  out[2] = (-(2 * r * a) / (gap * gap)) * 0.5 * h * i1;
}

/** Exponential profile of unit FWHM: P = s^(-3/2), s = 1 + K r2; dP/dr2 = -(3/2) K P / s. No coefficients. */
export function exponentialDerivatives(r2: number, _p: Float64Array, out: Float64Array): void {
  const s = 1 + EXPONENTIAL_K * (r2 > 0 ? r2 : 0);
  const v = 1 / (s * Math.sqrt(s));
  out[0] = v;
  out[1] = (-1.5 * EXPONENTIAL_K * v) / s;
}

/**
 * Lorentzian-like profile of unit FWHM: P = exp(-K rho), rho = sqrt(r2); dP/dr2 = -K P / (2 rho).
 *
 * Notes: V has a cusp at rho = 0, where dP/dr2 is infinite; there it is set to 0. That loses nothing: when
 * rho = |A^T q| = 0 every change of the parameters leaves r2 = q^T A A^T q stationary (dr2 = 2 (q^T dA)(A^T q)
 * = 0), so the product dP/dr2 dr2 is 0 either way (the one-sided slope of a size about 0 is not represented).
 */
export function lorentzianDerivatives(r2: number, _p: Float64Array, out: Float64Array): void {
  const rho = Math.sqrt(r2 > 0 ? r2 : 0);
  const v = Math.exp(-LORENTZIAN_K * rho);
  out[0] = v;
  out[1] = rho > 0 ? (-LORENTZIAN_K * v) / (2 * rho) : 0;
}

/** Fully resolved background: P = 1 at r2 = 0, else 0; its slope is 0 wherever it is defined. */
export function backgroundDerivatives(r2: number, _p: Float64Array, out: Float64Array): void {
  out[0] = r2 > 0 ? 0 : 1;
  out[1] = 0;
}

/** A tabulated radial kernel that gives V and dV/d(rho^2) of the interpolant it reads. */
export interface RadialDerivativeEvaluator {
  /** out[0] = V(rho), out[1] = dV/d(rho^2); rho in cycles per unit. */
  derivatives(rho: number, out: Float64Array): void;
}

/**
 * Tabulated radial profile (data: a {@link RadialDerivativeEvaluator}, e.g. a `RadialTable`): P and dP/dr2 of
 * the same cubic Hermite interpolant the value path reads. No coefficients.
 */
export function radialTableDerivatives(
  r2: number,
  _p: Float64Array,
  out: Float64Array,
  data?: unknown,
): void {
  (data as RadialDerivativeEvaluator).derivatives(Math.sqrt(r2 > 0 ? r2 : 0), out);
}

/**
 * Azimuthally modulated thin ring of unit diameter, p = [c1 sin pa1, c1 cos pa1, c2 cos 2pa2, c2 sin 2pa2]:
 * V = J0(x) - pi^2 j(x) Q - i (pi/2) D(x) L with Q = (w2^2 - w1^2) p2 + 2 w1 w2 p3, L = w1 p0 + w2 p1,
 * x = pi |w|, j = J2(x)/x^2, D = 2 J1(x)/x (the formula of `modulatedRingAt`).
 *
 * Notes: with dx/dw_k = pi^2 w_k / x: dJ0/dw_k = -(pi^2/2) D w_k (A&S 9.1.28), dD/dw_k = -2 pi^2 j w_k and
 * dj/dw_k = -pi^2 w_k J3(x)/x^3 = -pi^2 w_k L_3(x) / 48 (d/dx [x^-n J_n] = -x^-n J_{n+1}, A&S 9.1.30); all
 * finite at w = 0.
 */
export function modulatedRingDerivatives(
  w1: number,
  w2: number,
  p: Float64Array,
  out: Float64Array,
  _data?: unknown,
): void {
  const x = Math.PI * Math.sqrt(w1 * w1 + w2 * w2);
  const d = diskAmplitude(x);
  const j0 = besselJ0(x);
  const j = j2OverX2(x);
  const k3 = l3(x) / 48;
  const p0 = p[0]!;
  const p1 = p[1]!;
  const p2 = p[2]!;
  const p3 = p[3]!;
  const qd = w2 * w2 - w1 * w1;
  const qx = 2 * w1 * w2;
  const q = qd * p2 + qx * p3;
  const l = w1 * p0 + w2 * p1;
  out[0] = j0 - PI2 * j * q;
  out[1] = -0.5 * Math.PI * d * l;
  // d Re / dw_k = -(pi^2/2) D w_k - pi^2 (dj/dw_k Q + j dQ/dw_k)
  const dq1 = -2 * w1 * p2 + 2 * w2 * p3;
  const dq2 = 2 * w2 * p2 + 2 * w1 * p3;
  out[2] = -0.5 * PI2 * d * w1 - PI2 * (-PI2 * w1 * k3 * q + j * dq1);
  out[3] = -0.5 * Math.PI * (-2 * PI2 * j * w1 * l + d * p0);
  out[4] = -0.5 * PI2 * d * w2 - PI2 * (-PI2 * w2 * k3 * q + j * dq2);
  out[5] = -0.5 * Math.PI * (-2 * PI2 * j * w2 * l + d * p1);
  // coefficients: p0, p1 only in Im, p2, p3 only in Re
  out[6] = 0;
  out[7] = -0.5 * Math.PI * d * w1;
  out[8] = 0;
  out[9] = -0.5 * Math.PI * d * w2;
  out[10] = -PI2 * j * qd;
  out[11] = 0;
  out[12] = -PI2 * j * qx;
  out[13] = 0;
}

/** The fields of a pixel grid that the derivative kernel reads (a `PixelGrid`). */
export interface PixelGridData {
  readonly nx: number;
  readonly ny: number;
  /** Pixels divided by their sum, row-major by north: pixel (i, j) is `pixels[j * nx + i]`. */
  readonly pixels: Float64Array;
}

function reduce(t: number): number {
  return t - Math.round(t);
}

/**
 * Scratch of {@link pixelImageDerivatives}: column phases, grown to the widest image seen.
 * (Module scope: the kernel runs to completion before another call can start.)
 */
let colRe = new Float64Array(0);
let colIm = new Float64Array(0);

/**
 * Pixel image (data: {@link PixelGridData}): V(w) = sum_j N_j(w2) sum_i p_ji E_i(w1) with
 * E_i = exp(-2 pi i w1 (i - ci)), N_j = exp(-2 pi i w2 (j - cj)), w in cycles per pixel; no coefficients.
 *
 * Notes: the separable direct Fourier transform of `PixelGrid.at` with the same phase recurrences re-seeded
 * exactly every 32 steps, extended by the two weighted sums that give dV/dw1 = -2 pi i sum (i - ci) p E N and
 * dV/dw2 = -2 pi i sum (j - cj) p E N in the same pass over the pixels (about twice the cost of the value).
 */
export function pixelImageDerivatives(
  w1: number,
  w2: number,
  _p: Float64Array,
  out: Float64Array,
  data?: unknown,
): void {
  const g = data as PixelGridData;
  const nx = g.nx;
  const ny = g.ny;
  const pixels = g.pixels;
  if (colRe.length < nx) {
    colRe = new Float64Array(nx);
    colIm = new Float64Array(nx);
  }
  const er = colRe;
  const ei = colIm;
  const ci = (nx - 1) / 2;
  {
    const sr = Math.cos(TWO_PI * reduce(w1));
    const si = -Math.sin(TWO_PI * reduce(w1));
    let xr = 0;
    let xi = 0;
    for (let i = 0; i < nx; i++) {
      if ((i & 31) === 0) {
        const t = reduce(w1 * (i - ci));
        xr = Math.cos(TWO_PI * t);
        xi = -Math.sin(TWO_PI * t);
      }
      er[i] = xr;
      ei[i] = xi;
      const y = xr * sr - xi * si;
      xi = xr * si + xi * sr;
      xr = y;
    }
  }
  const cj = (ny - 1) / 2;
  const sr0 = Math.cos(TWO_PI * reduce(w2));
  const si0 = -Math.sin(TWO_PI * reduce(w2));
  let vr = 0;
  let vi = 0;
  let ar = 0; // sum N (i - ci) p E
  let ai = 0;
  let br = 0; // sum N (j - cj) p E
  let bi = 0;
  let nr = 0;
  let ni = 0;
  for (let j = 0; j < ny; j++) {
    if ((j & 31) === 0) {
      const t = reduce(w2 * (j - cj));
      nr = Math.cos(TWO_PI * t);
      ni = -Math.sin(TWO_PI * t);
    }
    let sr = 0;
    let si = 0;
    let tr = 0;
    let ti = 0;
    const row = j * nx;
    for (let i = 0; i < nx; i++) {
      const pe = pixels[row + i]!;
      const xr = pe * er[i]!;
      const xi = pe * ei[i]!;
      const di = i - ci;
      sr += xr;
      si += xi;
      tr += di * xr;
      ti += di * xi;
    }
    const rr = nr * sr - ni * si;
    const ri = nr * si + ni * sr;
    vr += rr;
    vi += ri;
    ar += nr * tr - ni * ti;
    ai += nr * ti + ni * tr;
    const dj = j - cj;
    br += dj * rr;
    bi += dj * ri;
    const t = nr * sr0 - ni * si0;
    ni = nr * si0 + ni * sr0;
    nr = t;
  }
  out[0] = vr;
  out[1] = vi;
  // -2 pi i (a) = (2 pi ai, -2 pi ar)
  out[2] = TWO_PI * ai;
  out[3] = -TWO_PI * ar;
  out[4] = TWO_PI * bi;
  out[5] = -TWO_PI * br;
}

/** The radial kernels of this module, by factor kind. */
export const COMPONENT_RADIAL_DERIVATIVES: Readonly<Record<string, RadialDerivativeKernel>> = Object.freeze({
  linearLimbDarkened: limbDarkenedDerivatives,
  quadraticLimbDarkened: limbDarkenedDerivatives,
  powerLawLimbDarkened: powerLawDerivatives,
  uniformAnnulus: annulusDerivatives,
  exponential: exponentialDerivatives,
  lorentzian: lorentzianDerivatives,
  background: backgroundDerivatives,
  radialTable: radialTableDerivatives,
});

/** The complex kernels of this module, by factor kind. */
export const COMPONENT_COMPLEX_DERIVATIVES: Readonly<Record<string, ComplexDerivativeKernel>> = Object.freeze(
  {
    modulatedRing: modulatedRingDerivatives,
    pixelImage: pixelImageDerivatives,
  },
);
