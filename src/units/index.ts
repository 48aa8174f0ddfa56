/**
 * Units and angle helpers (see the conventions table in the README).
 *
 * @module
 */
import { InputError } from '../errors.js';

/** Radians per milliarcsecond: pi / (180 * 3600 * 1000). */
export const RAD_PER_MAS = Math.PI / 648_000_000;
/** Milliarcseconds per radian. */
export const MAS_PER_RAD = 648_000_000 / Math.PI;
/** Radians per degree. */
export const RAD_PER_DEG = Math.PI / 180;
/** Degrees per radian. */
export const DEG_PER_RAD = 180 / Math.PI;

/**
 * Converts milliarcseconds to radians.
 *
 * @param mas - angle in milliarcseconds
 * @returns the angle in radians
 * @example
 * ```ts
 * masToRad(1); // 4.84813681109536e-9
 * ```
 */
export function masToRad(mas: number): number {
  return mas * RAD_PER_MAS;
}

/**
 * Converts radians to milliarcseconds.
 *
 * @param rad - angle in radians
 * @returns the angle in milliarcseconds
 */
export function radToMas(rad: number): number {
  return rad * MAS_PER_RAD;
}

/** Converts degrees to radians. */
export function degToRad(deg: number): number {
  return deg * RAD_PER_DEG;
}

/** Converts radians to degrees. */
export function radToDeg(rad: number): number {
  return rad * DEG_PER_RAD;
}

/**
 * Spatial frequency of a projected baseline at a wavelength.
 *
 * @param baseline - projected baseline component in metres (OIFITS UCOORD or VCOORD)
 * @param wavelength - wavelength in metres (OIFITS EFF_WAVE), must be positive
 * @returns the spatial frequency in cycles per radian (baseline / wavelength)
 * @example
 * ```ts
 * spatialFrequency(100, 2e-6); // 5e7 cycles per radian
 * ```
 */
export function spatialFrequency(baseline: number, wavelength: number): number {
  if (!(wavelength > 0) || !Number.isFinite(wavelength)) {
    throw new InputError(
      `spatialFrequency: wavelength must be a positive finite number of metres, got ${wavelength}`,
      { argument: 'wavelength' },
    );
  }
  return baseline / wavelength;
}

/**
 * Wraps a phase in degrees into (-180, 180]; -180 maps to +180.
 *
 * @param deg - phase in degrees (any finite value)
 * @returns the same angle in (-180, 180]
 * @example
 * ```ts
 * wrapDegrees(190); // -170
 * wrapDegrees(-180); // 180
 * ```
 */
export function wrapDegrees(deg: number): number {
  let r = deg % 360; // in (-360, 360)
  if (r > 180) r -= 360;
  else if (r <= -180) r += 360;
  return r;
}

/**
 * Wraps a phase in radians into (-pi, pi]; -pi maps to +pi.
 *
 * @param rad - phase in radians
 * @returns the same angle in (-pi, pi]
 */
export function wrapRadians(rad: number): number {
  const twoPi = 2 * Math.PI;
  let r = rad % twoPi;
  if (r > Math.PI) r -= twoPi;
  else if (r <= -Math.PI) r += twoPi;
  return r;
}

/**
 * Largest |x| over x[start..end): NaN when an entry is NaN and Infinity when one is infinite, so one pass
 * gives both the finiteness check of the inputs and the bound on |u|, |v| that the phase ramps need
 * (phaseNeedsSplit in kernels/sincos.ts says true for NaN).
 *
 * @param x - a column
 * @param start - first index
 * @param end - one past the last index
 *
 * Notes: four independent Math.max chains (branch-free; Math.max passes NaN on); a loop with a test per entry
 * measured about four times slower.
 */
export function maxAbs(x: Float64Array, start: number, end: number): number {
  let m0 = 0;
  let m1 = 0;
  let m2 = 0;
  let m3 = 0;
  let i = start;
  for (; i + 3 < end; i += 4) {
    m0 = Math.max(m0, Math.abs(x[i]!));
    m1 = Math.max(m1, Math.abs(x[i + 1]!));
    m2 = Math.max(m2, Math.abs(x[i + 2]!));
    m3 = Math.max(m3, Math.abs(x[i + 3]!));
  }
  for (; i < end; i++) m0 = Math.max(m0, Math.abs(x[i]!));
  return Math.max(m0, m1, m2, m3);
}

/**
 * A column of spatial frequencies as a Float64Array, checked to be finite.
 *
 * @param x - an array or typed array of numbers (cycles per radian); a Float64Array is returned as it is, not copied
 * @param fn - the calling function's name, for the message
 * @param name - the argument's name, for the message
 * @returns the values as a Float64Array
 * @throws InputError naming the argument and the index of the first value that is NaN, infinite or beyond
 *   {@link MAX_SPATIAL_FREQUENCY}
 */
export function frequencyColumn(x: ArrayLike<number>, fn: string, name: string): Float64Array {
  return boundedFrequencyColumn(x, fn, name).column;
}

/**
 * As {@link frequencyColumn}, with the largest |value| found by the same pass.
 *
 * @param x - an array or typed array of numbers (cycles per radian)
 * @param fn - the calling function's name, for the message
 * @param name - the argument's name, for the message
 * @returns the column and its largest |value|
 * @throws InputError naming the argument and the index of the first value that is NaN, infinite or beyond
 *   {@link MAX_SPATIAL_FREQUENCY}
 */
export function boundedFrequencyColumn(
  x: ArrayLike<number>,
  fn: string,
  name: string,
): { column: Float64Array; maxAbs: number } {
  if (x === null || typeof x !== 'object' || typeof x.length !== 'number') {
    throw new InputError(`${fn}: ${name} must be an array or typed array of numbers`, { argument: name });
  }
  const a = x instanceof Float64Array ? x : Float64Array.from(x);
  const m = maxAbs(a, 0, a.length);
  if (m <= MAX_SPATIAL_FREQUENCY) return { column: a, maxAbs: m };
  for (let i = 0; i < a.length; i++) {
    const t = a[i]!;
    if (t - t !== 0) {
      throw new InputError(
        `${fn}: ${name}[${i}] is ${t}; spatial frequencies must be finite numbers in cycles per radian`,
        { argument: name, index: i },
      );
    }
    if (Math.abs(t) > MAX_SPATIAL_FREQUENCY) {
      throw new InputError(
        `${fn}: ${name}[${i}] is ${t} cycles per radian; spatial frequencies (projected baseline / wavelength) ` +
          `must lie within +-${MAX_SPATIAL_FREQUENCY}, far beyond any baseline in use (about 1e10 for an Earth-sized ` +
          `baseline at a millimetre); give u and v in cycles per radian`,
        { argument: name, index: i },
      );
    }
  }
  return { column: a, maxAbs: m };
}

/**
 * Largest |u| or |v| accepted, cycles per radian: 1e20, some 1e10 times the longest baselines in use (an
 * Earth-sized baseline, 1.3e7 m, at 1 mm is about 1e10). Beyond it |A^T q|^2 of large components can overflow, so
 * such input is an error rather than a silently meaningless visibility.
 */
export const MAX_SPATIAL_FREQUENCY = 1e20;
