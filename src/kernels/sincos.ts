/**
 * sin and cos of a phase given in turns (cycles), for the phase ramps exp(-2 pi i q.x0).
 *
 * The phase in turns is reduced exactly (t - q / 4 with q = floor(4 t + 1/2) lies in [-1/8, 1/8] and the
 * subtraction is exact), then sin and cos of x = 2 pi r, |x| <= pi/4, come from their Taylor series to x^15 and
 * x^16, whose next terms are below 5e-17 there; the quarter turns are put back by arithmetic on the quadrant
 * (no table, no branch). One call gives both values.
 *
 * @module
 */

/** Output of {@link sinCosTurns}: `[sin, cos]` of the last phase. Read it right after the call. */
export const SIN_COS = new Float64Array(2);

const TWO_PI = 2 * Math.PI;
// Taylor coefficients 1/n! with alternating signs
const S3 = -1 / 6;
const S5 = 1 / 120;
const S7 = -1 / 5040;
const S9 = 1 / 362880;
const S11 = -1 / 39916800;
const S13 = 1 / 6227020800;
const S15 = -1 / 1307674368000;
const C2 = -1 / 2;
const C4 = 1 / 24;
const C6 = -1 / 720;
const C8 = 1 / 40320;
const C10 = -1 / 3628800;
const C12 = 1 / 479001600;
const C14 = -1 / 87178291200;
const C16 = 1 / 20922789888000;

/** Beyond this many turns the whole turns are removed first, so that 4 t + 1/2 + OFFSET stays below 2^31. */
const BIG = 2 ** 26;
/** Added before the int32 truncation so that it rounds down (the truncated value is positive). */
const OFFSET = 2 ** 30;

/**
 * Writes sin(2 pi t) and cos(2 pi t) into {@link SIN_COS}.
 *
 * @param t - phase in turns (any finite value; accuracy is that of t itself, reduced exactly)
 *
 * Notes: absolute error below 4e-16 for both values (tested against Math.sin / Math.cos of the reduced
 * phase, tests/kernels/sincos.test.ts); a few multiply-adds (Estrin's scheme, so the two polynomials do not
 * wait on one long chain), no branch on the quadrant, no table look-up and no call into the runtime. The
 * quadrant q = floor(4 t + 1/2) comes from an int32 truncation of 4 t + 1/2 + 2^30 (positive, so truncation
 * is the floor; Math.floor measured about 3 ns slower per call in benchmarks/run.ts); when 4 t + 1/2 + 2^30
 * rounds up across an integer, r = t - q / 4 lies up to 2^-24 outside [-1/8, 1/8], where the series are still
 * far below an ulp in error. The quadrant is put back by arithmetic on q & 3: a quadrant table indexed by it
 * made the call about three times slower than the arithmetic.
 *
 * @example
 * ```ts
 * sinCosTurns(0.125);
 * SIN_COS[0]; // 0.7071067811865475 (sin 45 degrees)
 * SIN_COS[1]; // 0.7071067811865476 (cos 45 degrees)
 * ```
 */
export function sinCosTurns(t: number): void {
  if (t > BIG || t < -BIG) t -= Math.round(t); // whole turns change nothing
  const q = ((4 * t + (0.5 + OFFSET)) | 0) - OFFSET;
  const r = t - q * 0.25; // exact
  const x = TWO_PI * r;
  const x2 = x * x;
  const x4 = x2 * x2;
  const x8 = x4 * x4;
  // the small parts are summed first and added to the leading term last, so their rounding stays below an ulp
  const s = x + x * (x2 * S3 + (x4 * (S5 + x2 * S7) + x8 * (S9 + x2 * S11 + x4 * (S13 + x2 * S15))));
  const c = 1 + (x2 * C2 + (x4 * (C4 + x2 * C6) + x8 * (C8 + x2 * C10 + x4 * (C12 + x2 * C14) + x8 * C16)));
  // t = r + k / 4 with k = q mod 4 in {0, 1, 2, 3}: rotate (cos, sin) of 2 pi r by k quarter turns
  const k = q & 3;
  const odd = k & 1;
  const even = 1 - odd;
  const sign = 1 - (k & 2);
  SIN_COS[0] = sign * (s * even + c * odd);
  SIN_COS[1] = sign * (c * even - s * odd);
}

/**
 * Largest phase, in turns, whose plain evaluation `u * e + v * n` is accurate enough: the two roundings of the
 * products and the one of their sum cost at most 3 * 2^-53 * PLAIN_PHASE_TURNS turns, here 2.1e-14 turns or
 * 1.3e-13 rad, well inside the 1e-12 rad the phase ramps are held to. Larger phases go through
 * {@link sinCosPhase}.
 */
export const PLAIN_PHASE_TURNS = 64;

/**
 * Whether the phase ramp of a shift (e, n) needs {@link sinCosPhase} over points whose |u|, |v| are at most
 * uMax, vMax: true when |u e| + |v n| can exceed {@link PLAIN_PHASE_TURNS} turns (or a bound is not finite).
 *
 * @param uMax - largest |u| of the points, cycles per radian
 * @param vMax - largest |v| of the points
 * @param e - shift east, rad
 * @param n - shift north, rad
 * @returns true for the split evaluation, false when `sinCosTurns(u * e + v * n)` is accurate enough
 */
export function phaseNeedsSplit(uMax: number, vMax: number, e: number, n: number): boolean {
  return !(uMax * Math.abs(e) + vMax * Math.abs(n) <= PLAIN_PHASE_TURNS);
}

/** 2^27 + 1: Veltkamp's constant that splits a binary64 number into two halves of 26 bits. */
const SPLITTER = 134217729;

/**
 * The 26-bit head of x (x minus it is the tail); a product of two heads is exact in binary64.
 * @param x - any finite number below about 1e300
 * @returns the head of x
 */
export function splitHead(x: number): number {
  const c = SPLITTER * x;
  return c - (c - x);
}

/**
 * Writes sin and cos of the phase 2 pi (u e + v n) into {@link SIN_COS}, with the products u e and v n reduced
 * by whole turns before they are added, so the phase keeps about 1e-16 turns of absolute accuracy however many
 * turns it spans.
 *
 * @param u - spatial frequency east, cycles per radian
 * @param v - spatial frequency north, cycles per radian
 * @param eh - head of the shift east (rad), {@link splitHead}
 * @param el - tail of the shift east, e - eh
 * @param nh - head of the shift north (rad)
 * @param nl - tail of the shift north
 *
 * Notes: u and v are split by Veltkamp's method (Dekker 1971), so uh eh and vh nh are exact and their whole
 * turns come off exactly; the cross terms are 2^-26 of the phase, so their rounding is far below an ulp of
 * the result. A plain `sinCosTurns(u * e + v * n)` rounds the phase to an ulp of u e + v n first: about 2e-12 rad
 * for a shift of 1 arcsecond at |u| = 3e8 cycles per radian (tests/kernels/sincos.test.ts); this keeps it below
 * 1e-12 there, for about a dozen more additions and multiplications.
 *
 * @example
 * ```ts
 * const e = 1000 * 4.84813681109536e-9; // 1 arcsecond east, rad
 * sinCosPhase(3e8, 0, splitHead(e), e - splitHead(e), 0, 0); // SIN_COS holds sin, cos of 2 pi 3e8 e
 * ```
 */
export function sinCosPhase(u: number, v: number, eh: number, el: number, nh: number, nl: number): void {
  const cu = SPLITTER * u;
  const uh = cu - (cu - u);
  const cv = SPLITTER * v;
  const vh = cv - (cv - v);
  const p = uh * eh; // exact
  const q = vh * nh; // exact
  const small = uh * el + (u - uh) * (eh + el) + vh * nl + (v - vh) * (nh + nl);
  sinCosTurns(p - Math.floor(p + 0.5) + (q - Math.floor(q + 0.5)) + small);
}
