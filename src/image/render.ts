/**
 * Rendering a model's intensity on a grid of sky positions, from its own visibilities: the inverse Fourier
 * transform of V(u, v) sampled on a regular uv grid and tapered by a Gaussian, which is exactly the image of the
 * model convolved with a circular Gaussian of a chosen FWHM, sampled at the pixel centres.
 *
 * @module
 */
import { InputError, ModelError, showValue } from '../errors.js';
import { hasChromaticSlot } from '../model/chromatic-slot.js';
import type { Model } from '../model/model.js';
import { runPlan } from '../model/plan.js';
import { chromaticPlan } from '../observe/chromatic.js';
import { RAD_PER_MAS } from '../units/index.js';

/** Options of {@link renderImage}. */
export interface RenderOptions {
  /** Pixels along each axis (an integer in [8, 1024], default 128). */
  readonly pixels?: number;
  /** Full width of the square field, mas (default: 2.4 times the model's extent, see Notes). */
  readonly fov?: number;
  /**
   * FWHM of the circular Gaussian the image is convolved with, mas (>= 0; default 3 pixels). Below about 2.5
   * pixels the uv grid's edge cuts the spectrum and the image rings.
   */
  readonly smoothing?: number;
  /** Wavelength, metres, at which a wavelength-dependent model is drawn (required for such a model). */
  readonly wavelength?: number;
}

/** A rendered image. Pixel (i, j) is centred on (east[i], north[j]). */
export interface RenderedImage {
  /** Pixels along each axis. */
  readonly pixels: number;
  /** Pixel size, mas. */
  readonly step: number;
  /** Full width of the field, mas (pixels * step). */
  readonly fov: number;
  /** FWHM of the Gaussian the model was convolved with, mas. */
  readonly smoothing: number;
  /** Wavelength the model was drawn at, metres (NaN for a model without wavelength-dependent slots). */
  readonly wavelength: number;
  /** East offsets of the pixel columns, mas, increasing with i; east[floor(pixels / 2)] = 0. */
  readonly east: Float64Array;
  /** North offsets of the pixel rows, mas, increasing with j; north[floor(pixels / 2)] = 0. */
  readonly north: Float64Array;
  /**
   * Fraction of the total flux in each pixel, row-major: `intensity[j * pixels + i]` at (east[i], north[j]).
   * Sums to 1 up to the flux that falls outside the field.
   */
  readonly intensity: Float64Array;
}

/** Default pixels along each axis of {@link renderImage}. */
export const DEFAULT_RENDER_PIXELS = 128;
/** Default smoothing of {@link renderImage}, in pixels (FWHM). */
export const DEFAULT_SMOOTHING_PIXELS = 3;
/** The field of view is this many times the model's extent (largest offset plus half size of a term). */
const FOV_PER_EXTENT = 2.4;
/** Field of view of a model without extent (a point at the origin), mas. */
const POINT_FOV = 1;

/** The model's extent in mas: largest over terms of |shift| + half the Frobenius norm of the factor maps. */
function extentOf(plan: ReturnType<typeof chromaticPlan>): number {
  let ext = 0;
  for (const t of plan.terms) {
    let half = 0;
    for (const f of t.factors) {
      half += 0.5 * Math.sqrt(f.a11 * f.a11 + f.a12 * f.a12 + f.a21 * f.a21 + f.a22 * f.a22);
    }
    const e = (Math.hypot(t.e0, t.n0) + half) / RAD_PER_MAS;
    if (Number.isFinite(e) && e > ext) ext = e;
  }
  return ext;
}

function positiveOption(x: unknown, name: string, allowZero: boolean): number {
  const ok = typeof x === 'number' && Number.isFinite(x) && (allowZero ? x >= 0 : x > 0);
  if (!ok) {
    throw new InputError(
      `renderImage: ${name} = ${showValue(x)}; it must be a finite number ${allowZero ? '>= 0' : '> 0'}`,
      { argument: name },
    );
  }
  return x as number;
}

/**
 * Renders a model's intensity on a square grid, north up and east increasing with the column index.
 *
 * @param model - any model without free parameters left unset (free parameters are drawn at their values)
 * @param options - `pixels`, `fov` (mas), `smoothing` (FWHM, mas) and `wavelength` (metres, for a
 *   wavelength-dependent model)
 * @returns pixel centres in mas and the fraction of the total flux per pixel
 * @throws InputError for options out of range, or a wavelength-dependent model without a wavelength
 *
 * Notes: the normalised visibility is sampled at u_k = k / fov for k = -floor(pixels / 2) .. floor(pixels / 2)
 * (and likewise v), multiplied by the Gaussian taper exp(-(pi s q)^2 / (4 ln 2)) of FWHM s and summed back
 * with exp(+2 pi i (u east + v north)) (the inverse of the OIFITS convention in CONVENTIONS.md), separably
 * along u and v. The result is the model convolved with that Gaussian, sampled at the pixel centres, exact
 * but for two effects: flux outside the field wraps around (the sum is periodic in fov), and the spectrum
 * beyond the grid's edge is dropped, which the default smoothing of 3 pixels keeps below 4e-4 of the peak
 * taper. The default field is 2.4 times the largest |shift| + half size of the model's terms (1 mas for a
 * point at the origin). Cost: (pixels + 1)^2 visibilities and two passes of pixels^3 complex products.
 * @example
 * ```ts
 * const img = renderImage(point().shift(2, 0), { pixels: 33, fov: 8.25 });
 * img.east[img.intensity.indexOf(Math.max(...img.intensity)) % 33]; // 2 (mas east)
 * ```
 */
export function renderImage(model: Model, options: RenderOptions = {}): RenderedImage {
  const n = options.pixels ?? DEFAULT_RENDER_PIXELS;
  if (!Number.isInteger(n) || n < 8 || n > 1024) {
    throw new InputError(`renderImage: pixels = ${showValue(n)}; it must be an integer in [8, 1024]`, {
      argument: 'pixels',
    });
  }
  const chromatic = hasChromaticSlot(model.node);
  let wavelength = Number.NaN;
  if (options.wavelength !== undefined) wavelength = positiveOption(options.wavelength, 'wavelength', false);
  if (chromatic && Number.isNaN(wavelength)) {
    throw new InputError(
      'renderImage: the model has wavelength-dependent slots; give options.wavelength (metres) to draw it at',
      { argument: 'wavelength' },
    );
  }
  // a model without wavelength-dependent slots has the same plan at every wavelength
  const plan = chromaticPlan(model, chromatic ? wavelength : 1e-6);
  const fov =
    options.fov === undefined
      ? (() => {
          const e = extentOf(plan);
          return e > 0 ? FOV_PER_EXTENT * e : POINT_FOV;
        })()
      : positiveOption(options.fov, 'fov', false);
  const step = fov / n;
  const smoothing =
    options.smoothing === undefined
      ? DEFAULT_SMOOTHING_PIXELS * step
      : positiveOption(options.smoothing, 'smoothing', true);

  const K = Math.floor(n / 2);
  const m = 2 * K + 1;
  const du = 1 / (fov * RAD_PER_MAS); // cycles per radian
  const u = new Float64Array(m * m);
  const v = new Float64Array(m * m);
  for (let l = 0; l < m; l++) {
    for (let k = 0; k < m; k++) {
      u[l * m + k] = (k - K) * du;
      v[l * m + k] = (l - K) * du;
    }
  }
  const re = new Float64Array(m * m);
  const im = new Float64Array(m * m);
  runPlan(plan, u, v, re, im, m * m);
  const s = smoothing * RAD_PER_MAS;
  const c = (Math.PI * s) ** 2 / (4 * Math.LN2);
  for (let i = 0; i < m * m; i++) {
    const g = Math.exp(-c * (u[i]! * u[i]! + v[i]! * v[i]!));
    re[i] = re[i]! * g;
    im[i] = im[i]! * g;
  }
  for (let i = 0; i < m * m; i++) {
    if (!Number.isFinite(re[i]!) || !Number.isFinite(im[i]!)) {
      throw new ModelError(`renderImage: the model's visibility is not finite at grid point ${i}`, {
        argument: 'model',
      });
    }
  }

  // exp(2 pi i k x / fov) at pixel x = (i - K) step is exp(2 pi i k (i - K) / n): a table of n roots of unity
  const cosT = new Float64Array(n);
  const sinT = new Float64Array(n);
  for (let r = 0; r < n; r++) {
    cosT[r] = Math.cos((2 * Math.PI * r) / n);
    sinT[r] = Math.sin((2 * Math.PI * r) / n);
  }
  const root = (k: number, i: number): number => ((((k - K) * (i - K)) % n) + n) % n;

  // pass 1, along u: T[l][i] = sum_k V[l][k] exp(2 pi i u_k east_i)
  const tr = new Float64Array(m * n);
  const ti = new Float64Array(m * n);
  for (let l = 0; l < m; l++) {
    for (let i = 0; i < n; i++) {
      let sr = 0;
      let si = 0;
      for (let k = 0; k < m; k++) {
        const r = root(k, i);
        const a = re[l * m + k]!;
        const b = im[l * m + k]!;
        sr += a * cosT[r]! - b * sinT[r]!;
        si += a * sinT[r]! + b * cosT[r]!;
      }
      tr[l * n + i] = sr;
      ti[l * n + i] = si;
    }
  }
  // pass 2, along v: I[j][i] = Re sum_l T[l][i] exp(2 pi i v_l north_j) / n^2
  const intensity = new Float64Array(n * n);
  const norm = 1 / (n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      let sr = 0;
      for (let l = 0; l < m; l++) {
        const r = root(l, j);
        sr += tr[l * n + i]! * cosT[r]! - ti[l * n + i]! * sinT[r]!;
      }
      intensity[j * n + i] = sr * norm;
    }
  }
  const east = Float64Array.from({ length: n }, (_, i) => (i - K) * step);
  return Object.freeze({
    pixels: n,
    step,
    fov,
    smoothing,
    wavelength: chromatic ? wavelength : Number.NaN,
    east,
    north: Float64Array.from(east),
    intensity,
  });
}
