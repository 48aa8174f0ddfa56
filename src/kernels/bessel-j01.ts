/**
 * Bessel functions of the first kind of orders 0, 1 and 2 for real arguments, and the radial visibility
 * amplitudes built on them: the uniform disk 2 J1(x) / x, the thin ring J0(x), and their derivatives in x.
 *
 * Every function is a pure function of numbers that allocates nothing.
 *
 * Method, for a = |x|:
 * - a < 2: J0 = 1 + s B0(s), J1 / x = 1/2 + s B1(s), J2 / x^2 = 1/8 + s B2(s) with s = x^2 and B polynomials
 *   (the power series A&S 9.1.10, economised by a Chebyshev fit), so there is no cancellation near 0;
 * - 2 <= a < HANKEL_START (48): one polynomial of degree 11 per half-unit piece [2 + j/2, 2.5 + j/2], read from a
 *   table (no argument reduction, no division, no square root: the arguments x = pi D q of interferometric
 *   models lie mostly below a few tens, so this is the common path);
 * - a >= HANKEL_START: the Hankel form (A&S 9.2.5) J_n = sqrt(2 / (pi a)) (P_n cos w - Q_n sin w),
 *   w = a - (2n + 1) pi / 4, with P_n and a Q_n polynomials in HANKEL_START^2 / a^2 (degree 6 and 7). The shift of the phase by pi/4 or 3 pi/4 is applied with the
 *   addition theorem to sin a and cos a (cos(a - pi/4) = (cos a + sin a) / sqrt 2, and so on), so a itself is
 *   never rounded by a subtraction of pi/4; sin a and cos a come from one careful reduction of a by pi/2
 *   (`trig.ts`).
 * All polynomials are fitted to mpmath values by src/kernels/generate-coefficients.py, which writes
 * src/kernels/bessel-coefficients.ts.
 *
 * @module
 */
import {
  diskPiece,
  HANKEL_START,
  j0NearZeroB,
  j0Piece,
  j1NearZeroB,
  j1Piece,
  j2NearZeroB,
  p0Hankel,
  p1Hankel,
  pieceIndex,
  pieceLocal,
  q0Hankel,
  q1Hankel,
} from './bessel-coefficients.js';

import { cosSinCombination } from './trig.js';

/** Upper end of the near-zero polynomials in x^2. */
const NEAR_ZERO_END = 2;
/** 1 / sqrt(pi). */
const INV_SQRT_PI = 0.5641895835477563;

/** J0(a) for a >= 0 or NaN. */
function j0NonNegative(a: number): number {
  if (a < NEAR_ZERO_END) {
    const s = a * a;
    return 1 + s * j0NearZeroB(s);
  }
  if (a < HANKEL_START) {
    const j = pieceIndex(a);
    return j0Piece(j, pieceLocal(a, j));
  }
  if (!(a < Number.POSITIVE_INFINITY)) return Number.NaN;
  const inv = 1 / a;
  const t = HANKEL_START * HANKEL_START * inv * inv;
  const p = p0Hankel(t);
  const q = q0Hankel(t) * inv;
  // sqrt(2/(pi a)) [P cos(a - pi/4) - Q sin(a - pi/4)] = [(P + Q) cos a + (P - Q) sin a] / sqrt(pi a)
  return cosSinCombination(a, p + q, p - q) * INV_SQRT_PI * Math.sqrt(inv);
}

/** J1(a) for a >= 2 or NaN (the caller handles a < 2). */
function j1AtLeastTwo(a: number): number {
  if (a < HANKEL_START) {
    const j = pieceIndex(a);
    return j1Piece(j, pieceLocal(a, j));
  }
  if (!(a < Number.POSITIVE_INFINITY)) return Number.NaN;
  const inv = 1 / a;
  const t = HANKEL_START * HANKEL_START * inv * inv;
  const p = p1Hankel(t);
  const q = q1Hankel(t) * inv;
  // sqrt(2/(pi a)) [P cos(a - 3pi/4) - Q sin(a - 3pi/4)] = [(Q - P) cos a + (P + Q) sin a] / sqrt(pi a)
  return cosSinCombination(a, q - p, p + q) * INV_SQRT_PI * Math.sqrt(inv);
}

/**
 * The Bessel function of the first kind of order zero, J0(x).
 *
 * @param x - argument (dimensionless; in the library x = pi * diameter * q, diameter in rad, q in cycles/rad)
 * @returns J0(x), an even function; NaN for non-finite x
 *
 * Notes: absolute error below 1e-15 on 0 <= |x| <= 200 against @stdlib/math-base-special-besselj0 and
 * mpmath, and below 1e-15 up to |x| = 1e6 against mpmath (tests/kernels/bessel-j01.test.ts). Near its zeros
 * the error is absolute, not relative. Method: fitted polynomials below 48, Hankel's asymptotic form
 * (Abramowitz & Stegun 9.2.5) with fitted P0, Q0 above (see the module notes).
 *
 * @example
 * ```ts
 * besselJ0(1); // 0.7651976865579666
 * ```
 */
export function besselJ0(x: number): number {
  return j0NonNegative(Math.abs(x));
}

/**
 * The Bessel function of the first kind of order one, J1(x).
 *
 * @param x - argument (dimensionless)
 * @returns J1(x), an odd function; NaN for non-finite x
 *
 * Notes: absolute error below 1e-15 on 0 <= |x| <= 200 against @stdlib/math-base-special-besselj1 and mpmath,
 * and below 1e-15 up to |x| = 1e6 against mpmath; near 0 the relative error is a few ulp. Method as for
 * {@link besselJ0}, with J1(x) = x (1/2 + x^2 B1(x^2)) below 2.
 *
 * @example
 * ```ts
 * besselJ1(1); // 0.4400505857449335
 * ```
 */
export function besselJ1(x: number): number {
  const a = Math.abs(x);
  if (a < NEAR_ZERO_END) {
    const s = x * x;
    return x * (0.5 + s * j1NearZeroB(s));
  }
  const r = j1AtLeastTwo(a);
  return x < 0 ? -r : r;
}

/**
 * The Bessel function of the first kind of order two, J2(x).
 *
 * @param x - argument (dimensionless)
 * @returns J2(x), an even function; NaN for non-finite x
 *
 * Notes: below |x| = 2 a fitted polynomial x^2 (1/8 + x^2 B2(x^2)) (relative error of a few ulp, no
 * cancellation); above, the recurrence J2 = 2 J1 / x - J0 (A&S 9.1.27), whose absolute error stays below
 * about 3e-16 there but whose relative error grows near the zeros of J2.
 *
 * @example
 * ```ts
 * besselJ2(1); // 0.11490348493190049
 * ```
 */
export function besselJ2(x: number): number {
  const a = Math.abs(x);
  if (a < NEAR_ZERO_END) {
    const s = a * a;
    return s * (0.125 + s * j2NearZeroB(s));
  }
  return (2 * j1AtLeastTwo(a)) / a - j0NonNegative(a);
}

/**
 * The visibility amplitude of a uniform disk, 2 J1(x) / x, with the value 1 at x = 0.
 *
 * @param x - pi * diameter * q (dimensionless; diameter in rad, q in cycles/rad)
 * @returns 2 J1(x) / x, an even function, 1 at x = 0; NaN for non-finite x
 *
 * Notes: below |x| = 2 it is the polynomial 1 + 2 x^2 B1(x^2) in x^2 (the power series of A&S 9.1.10
 * economised), so small x loses nothing to cancellation and x = 0 gives exactly 1; from 2 to HANKEL_START
 * (48) a polynomial per half-unit piece fitted to 2 J1(x) / x itself; above, 2 J1(|x|) / |x|.
 * Absolute error below 1e-15. The uniform-disk formula is that of e.g. Berger & Segransan 2007.
 *
 * @example
 * ```ts
 * diskAmplitude(0); // 1
 * diskAmplitude(3.831705970207512); // 5.885998893916977e-17, at the first null
 * ```
 */
export function diskAmplitude(x: number): number {
  const a = Math.abs(x);
  if (a < NEAR_ZERO_END) {
    const s = a * a;
    return 1 + 2 * s * j1NearZeroB(s);
  }
  if (a < HANKEL_START) {
    const j = pieceIndex(a);
    return diskPiece(j, pieceLocal(a, j)); // its own table: no division by a
  }
  return (2 * j1AtLeastTwo(a)) / a;
}

/**
 * The derivative in x of the uniform-disk amplitude, d/dx [2 J1(x) / x] = -2 J2(x) / x.
 *
 * @param x - pi * diameter * q (dimensionless)
 * @returns -2 J2(x) / x, an odd function, 0 at x = 0; NaN for non-finite x
 *
 * Notes: the identity follows from d/dx [x^-1 J1(x)] = -x^-1 J2(x) (A&S 9.1.30). Below |x| = 2 it is
 * -x (1/4 + 2 x^2 B2(x^2)), free of cancellation; above, -2 J2(x) / x with J2 from {@link besselJ2}. Absolute
 * error below about 1e-15.
 *
 * @example
 * ```ts
 * diskAmplitudeDerivative(1); // -0.22980696986380098
 * ```
 */
export function diskAmplitudeDerivative(x: number): number {
  const a = Math.abs(x);
  if (a < NEAR_ZERO_END) {
    const s = a * a;
    return -x * (0.25 + 2 * s * j2NearZeroB(s));
  }
  return (-2 * ((2 * j1AtLeastTwo(a)) / a - j0NonNegative(a))) / x;
}

/**
 * The derivative in x of the thin-ring amplitude, d/dx J0(x) = -J1(x).
 *
 * @param x - pi * diameter * q (dimensionless)
 * @returns -J1(x), an odd function; NaN for non-finite x
 *
 * Notes: A&S 9.1.28; the accuracy is that of {@link besselJ1}.
 *
 * @example
 * ```ts
 * ringAmplitudeDerivative(1); // -0.4400505857449335
 * ```
 */
export function ringAmplitudeDerivative(x: number): number {
  return -besselJ1(x);
}
