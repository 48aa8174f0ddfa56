/**
 * Kernels of the data-driven components: a circular profile given by samples, turned into V(rho) by a
 * numerical Hankel transform onto a table, and a pixel image evaluated by a separable direct Fourier
 * transform. Both are built once (when the model is built) and then evaluated per point without allocation.
 *
 * @module
 */
import { besselJ0, besselJ1 } from './bessel.js';
import type { ComplexEvaluator, RadialEvaluator } from './components.js';

const TWO_PI = 2 * Math.PI;
/** 8-point Gauss-Legendre nodes and weights on [-1, 1] (A&S table 25.4). */
const GL_X = [
  -0.9602898564975363, -0.7966664774136267, -0.525532409916329, -0.1834346424956498, 0.1834346424956498,
  0.525532409916329, 0.7966664774136267, 0.9602898564975363,
];
const GL_W = [
  0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.362683783378362, 0.362683783378362,
  0.3137066458778873, 0.2223810344533745, 0.1012285362903763,
];

/** Table points per unit of (outer radius x frequency): spacing 1 / (TABLE_DENSITY R) in rho. */
export const TABLE_DENSITY = 128;
/** Largest table built (entries); beyond it a profile is evaluated by direct quadrature at every point. */
export const MAX_TABLE = 200_000;

/**
 * The visibility of a circular profile given by samples (piecewise linear between them, zero beyond the
 * last), V(rho) = 2 pi int I(r) J0(2 pi rho r) r dr / flux, tabulated in rho and interpolated.
 *
 * Notes: the quadrature is 8-point Gauss-Legendre on panels that never straddle a sample (so the kinks of the
 * piecewise-linear profile sit on panel edges) and span at most half a period of J0 at the frequency asked
 * for: its error is below 1e-13. The table holds V and dV/drho (the same quadrature with -2 pi r J1) every
 * 1 / (128 R) up to `maxFrequency`, R the last radius, and is read by cubic Hermite interpolation, whose error
 * is below (2 pi / 128)^4 / 384 = 1.5e-8 (measured: 1.9e-9 worst for a uniform disk over 20000 frequencies,
 * tests/model/radial-profile.test.ts).
 * Above `maxFrequency` each point is integrated directly (slow: about R rho x 16 Bessel calls).
 */
export class RadialTable implements RadialEvaluator {
  /** Sample radii (units of the profile, mas at unit scale). */
  readonly radii: Float64Array;
  /** Sample intensities. */
  readonly intensity: Float64Array;
  /** Total flux 2 pi int I r dr (exact for the piecewise-linear profile). */
  readonly flux: number;
  /** Table spacing in rho (cycles per unit). */
  readonly step: number;
  /** Highest rho held in the table. */
  readonly maxRho: number;
  private readonly values: Float64Array;
  private readonly slopes: Float64Array;
  private readonly pair = new Float64Array(2);

  /**
   * @param radii - non-decreasing sample radii >= 0 (a radius repeated once is a step)
   * @param intensity - intensity at each radius (>= 0, not all zero)
   * @param maxFrequency - highest rho (cycles per unit) to tabulate
   */
  constructor(radii: ArrayLike<number>, intensity: ArrayLike<number>, maxFrequency: number) {
    this.radii = Float64Array.from(radii);
    this.intensity = Float64Array.from(intensity);
    let flux = 0;
    for (let k = 0; k + 1 < this.radii.length; k++) {
      const r0 = this.radii[k]!;
      const r1 = this.radii[k + 1]!;
      const i0 = this.intensity[k]!;
      const i1 = this.intensity[k + 1]!;
      // int_r0^r1 I(r) r dr for linear I, exactly
      flux += ((r1 - r0) * (i0 * (2 * r0 + r1) + i1 * (r0 + 2 * r1))) / 6;
    }
    this.flux = TWO_PI * flux;
    const outer = this.radii[this.radii.length - 1]!;
    this.step = 1 / (TABLE_DENSITY * Math.max(outer, 1e-300));
    const count = Math.min(MAX_TABLE, Math.ceil(maxFrequency / this.step) + 2);
    this.maxRho = (count - 2) * this.step;
    this.values = new Float64Array(count);
    this.slopes = new Float64Array(count);
    const top = (count - 1) * this.step;
    for (let k = 0; k < count; k++) {
      this.integrate(k * this.step, top, this.pair);
      this.values[k] = this.pair[0]!;
      this.slopes[k] = this.pair[1]!;
    }
  }

  /**
   * V(rho) and dV/drho by quadrature, written into out[0], out[1].
   * @param rho - frequency, cycles per unit
   * @param design - the frequency the panels are sized for (>= rho)
   * @param out - output pair
   */
  integrate(rho: number, design: number, out: Float64Array): void {
    const hmax = 1 / (2 * Math.max(design, 1e-300));
    let v = 0;
    let dv = 0;
    const k0 = TWO_PI * rho;
    for (let k = 0; k + 1 < this.radii.length; k++) {
      const r0 = this.radii[k]!;
      const r1 = this.radii[k + 1]!;
      const len = r1 - r0;
      if (len <= 0) continue;
      const i0 = this.intensity[k]!;
      const slope = (this.intensity[k + 1]! - i0) / len;
      const panels = Math.max(1, Math.ceil(len / hmax));
      const h = len / panels;
      for (let p = 0; p < panels; p++) {
        const mid = r0 + (p + 0.5) * h;
        for (let g = 0; g < 8; g++) {
          const r = mid + 0.5 * h * GL_X[g]!;
          const w = 0.5 * h * GL_W[g]! * (i0 + slope * (r - r0)) * r;
          v += w * besselJ0(k0 * r);
          dv -= w * TWO_PI * r * besselJ1(k0 * r);
        }
      }
    }
    out[0] = (TWO_PI * v) / this.flux;
    out[1] = (TWO_PI * dv) / this.flux;
  }

  /**
   * V and dV / d(rho^2) at rho, the derivative being that of the same interpolant {@link RadialTable.at} reads
   * (so a Jacobian agrees with finite differences of the values), written into out[0], out[1].
   *
   * @param rho - frequency, cycles per unit (>= 0)
   * @param out - output pair: out[0] = V(rho), out[1] = dV/d(rho^2) in units^2
   *
   * Notes: dV/d(rho^2) = (dV/drho) / (2 rho). In the first cell the Hermite cubic's slope at 0 is exactly 0
   * (V is even in rho, so the tabulated dV/drho at 0 is 0), which lets p'(s) / s be written without the
   * division, so the value at rho = 0 is the interpolant's p''(0) / (2 h^2), finite. Above `maxRho` the direct
   * quadrature's own dV/drho is used.
   */
  derivatives(rho: number, out: Float64Array): void {
    if (rho > this.maxRho) {
      this.integrate(rho, rho, this.pair);
      out[0] = this.pair[0]!;
      out[1] = this.pair[1]! / (2 * rho);
      return;
    }
    const h = this.step;
    const t = rho / h;
    const k = Math.floor(t);
    const s = t - k;
    const s1 = 1 - s;
    const v0 = this.values[k]!;
    const v1 = this.values[k + 1]!;
    const m0 = this.slopes[k]!;
    const m1 = this.slopes[k + 1]!;
    out[0] =
      (1 + 2 * s) * s1 * s1 * v0 + s * s1 * s1 * h * m0 + s * s * (3 - 2 * s) * v1 - s * s * s1 * h * m1;
    if (k === 0) {
      // p'(s) / s with m0 = 0: 6 (s - 1) v0 + 6 (1 - s) v1 + h m1 (3 s - 2); dV/d(rho^2) = p'(s) / (2 s h^2)
      out[1] = (6 * s1 * (v1 - v0) + h * m1 * (3 * s - 2)) / (2 * h * h);
      return;
    }
    // p'(s) = 6 s (s - 1) v0 + h m0 (1 - 4 s + 3 s^2) + 6 s (1 - s) v1 + h m1 (3 s^2 - 2 s)
    const dp = 6 * s * s1 * (v1 - v0) + h * m0 * (1 - 4 * s + 3 * s * s) + h * m1 * s * (3 * s - 2);
    out[1] = dp / (2 * h * rho);
  }

  /** V at rho (cycles per unit). */
  at(rho: number): number {
    if (rho > this.maxRho) {
      this.integrate(rho, rho, this.pair);
      return this.pair[0]!;
    }
    const t = rho / this.step;
    const k = Math.floor(t);
    const s = t - k;
    const s1 = 1 - s;
    const h = this.step;
    return (
      (1 + 2 * s) * s1 * s1 * this.values[k]! +
      s * s1 * s1 * h * this.slopes[k]! +
      s * s * (3 - 2 * s) * this.values[k + 1]! -
      s * s * s1 * h * this.slopes[k + 1]!
    );
  }
}

/**
 * A pixel image as a sum of point sources at the pixel centres, evaluated by a separable direct Fourier
 * transform: V(w) = sum_j N_j(w2) sum_i p_ji E_i(w1), E_i = exp(-2 pi i w1 (i - ci)), N_j likewise.
 *
 * Notes: per point one pass over the pixels with two multiply-adds each; the column and row phase factors come
 * from a complex recurrence re-seeded exactly every 32 steps, so the error stays below about 1e-14 (relative to
 * the total flux). Pixel (i, j) is `pixels[j * nx + i]`; i runs east, j north; w in cycles per pixel.
 */
export class PixelGrid implements ComplexEvaluator {
  readonly nx: number;
  readonly ny: number;
  /** Pixels divided by their sum. */
  readonly pixels: Float64Array;
  private readonly er: Float64Array;
  private readonly ei: Float64Array;

  /**
   * @param nx - columns (east)
   * @param ny - rows (north)
   * @param pixels - nx * ny values, row-major by north
   * @param total - their sum (non-zero)
   */
  constructor(nx: number, ny: number, pixels: ArrayLike<number>, total: number) {
    this.nx = nx;
    this.ny = ny;
    this.pixels = Float64Array.from(pixels, (p) => p / total);
    this.er = new Float64Array(nx);
    this.ei = new Float64Array(nx);
  }

  at(w1: number, w2: number, out: Float64Array): void {
    const { nx, ny, pixels, er, ei } = this;
    fillPhases(w1, nx, er, ei);
    const cj = (ny - 1) / 2;
    let accR = 0;
    let accI = 0;
    let nr = 0;
    let ni = 0;
    const sr0 = Math.cos(TWO_PI * reduce(w2));
    const si0 = -Math.sin(TWO_PI * reduce(w2));
    for (let j = 0; j < ny; j++) {
      if ((j & 31) === 0) {
        const t = reduce(w2 * (j - cj));
        nr = Math.cos(TWO_PI * t);
        ni = -Math.sin(TWO_PI * t);
      }
      let sr = 0;
      let si = 0;
      const row = j * nx;
      for (let i = 0; i < nx; i++) {
        const p = pixels[row + i]!;
        sr += p * er[i]!;
        si += p * ei[i]!;
      }
      accR += nr * sr - ni * si;
      accI += nr * si + ni * sr;
      const t = nr * sr0 - ni * si0;
      ni = nr * si0 + ni * sr0;
      nr = t;
    }
    out[0] = accR;
    out[1] = accI;
  }
}

function reduce(t: number): number {
  return t - Math.round(t);
}

/** er + i ei = exp(-2 pi i w (i - c)), c = (n - 1) / 2, by a recurrence re-seeded every 32 steps. */
function fillPhases(w: number, n: number, er: Float64Array, ei: Float64Array): void {
  const c = (n - 1) / 2;
  const sr = Math.cos(TWO_PI * reduce(w));
  const si = -Math.sin(TWO_PI * reduce(w));
  let xr = 0;
  let xi = 0;
  for (let i = 0; i < n; i++) {
    if ((i & 31) === 0) {
      const t = reduce(w * (i - c));
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
