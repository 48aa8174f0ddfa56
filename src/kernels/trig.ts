/**
 * A cos(a) + B sin(a) for the Hankel forms of the Bessel kernels, with one argument reduction shared by the
 * sine and the cosine.
 *
 * @module
 */
import { cosReducedC, PIO2_HI, PIO2_LO, sinReducedS, TWO_OVER_PI } from './bessel-coefficients.js';

/** Up to here n = round(2a / pi) stays below 2^20, so that n * PIO2_HI is exact. */
const REDUCTION_MAX = 1.6e6;
/** Added before the int32 truncation that rounds a 2 / pi, so that the truncated value is positive. */
const ROUND_OFFSET = 2 ** 30;

/**
 * The combination A cos(a) + B sin(a), evaluated without forming a - n pi/2 twice.
 *
 * @param a - angle (rad), any finite real
 * @param A - coefficient of cos(a)
 * @param B - coefficient of sin(a)
 * @returns A cos(a) + B sin(a); NaN when a is not finite
 *
 * Notes: for |a| <= 1.6e6 the argument is reduced as r = (a - n PIO2_HI) - n PIO2_LO with n = round(2a / pi)
 * and pi/2 split in a 33-bit head (so n * PIO2_HI and the first subtraction are exact, Cody & Waite 1980) and a
 * tail; r is then within about 6e-17 of the exact a - n pi/2, and sin r, cos r come from polynomials on
 * |r| <= pi/4 fitted by src/kernels/generate-coefficients.py. The error is below about 2e-16 (|A| + |B|)
 * (tests/kernels/trig.test.ts checks it against Math.cos and Math.sin). Larger |a| use Math.cos and Math.sin,
 * whose reduction is exact for every binary64 angle.
 *
 * @example
 * ```ts
 * cosSinCombination(Math.PI / 3, 2, 0); // 1.0000000000000002 (2 cos(pi/3))
 * ```
 */
export function cosSinCombination(a: number, A: number, B: number): number {
  if (!(Math.abs(a) <= REDUCTION_MAX)) return A * Math.cos(a) + B * Math.sin(a);
  // round(a 2 / pi) by an int32 truncation of a positive number (|n| < 2^20 here), cheaper than Math.round
  const n = ((a * TWO_OVER_PI + (0.5 + ROUND_OFFSET)) | 0) - ROUND_OFFSET;
  const r = a - n * PIO2_HI - n * PIO2_LO;
  const u = r * r;
  const s = r + r * u * sinReducedS(u);
  const c = 1 - 0.5 * u + u * u * cosReducedC(u);
  // a = n pi/2 + r: rotate (cos r, sin r) by n quarter turns. Without branches: the quadrant of random
  // arguments is unpredictable, and a mispredicted branch would cost more than the arithmetic.
  const q = n & 3;
  const odd = q & 1; // 0 or 1
  const sign = 1 - (q & 2); // +1 for q = 0, 1; -1 for q = 2, 3
  const even = 1 - odd;
  const cosA = sign * (c * even - s * odd);
  const sinA = sign * (s * even + c * odd);
  return A * cosA + B * sinA;
}
