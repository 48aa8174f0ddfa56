/**
 * The Bessel function of the first kind of real order, J_nu(x), and the power-law limb-darkened disk
 * amplitude Gamma(nu + 1) (2/x)^nu J_nu(x) with its derivative in x.
 *
 * The normalised function L_nu(x) = Gamma(nu + 1) (2/x)^nu J_nu(x) = 0F1(; nu + 1; -x^2/4) is what the three
 * methods below compute first; J_nu follows by the factor (x/2)^nu / Gamma(nu + 1). For x >= 0, nu >= 0:
 * - power series (A&S 9.1.10) where x^2/4 is small beside max(1, nu + 1): no cancellation to speak of;
 * - Hankel's asymptotic expansion (A&S 9.2.5, 9.2.9, 9.2.10) where x >= max(25, nu^2 / 2): every term is then
 *   below 1 and the series reaches 1e-17 before it starts to diverge;
 * - otherwise Miller's backward recurrence (A&S 9.1.27 run downwards; Miller 1952, Olver 1964) from order
 *   nu + N, N about x + 8 x^(1/3) + 24 (even), normalised by the sum
 *   (x/2)^nu / Gamma(nu + 1) = sum_k (nu + 2k) Gamma(nu + k) / (Gamma(nu + 1) k!) J_{nu + 2k}(x)
 *   (the Neumann series of (x/2)^nu, A&S 9.1.87 for nu = 0, Watson 5.2), which gives L_nu without any Gamma.
 *
 * @module
 */
import { InputError, showValue } from '../errors.js';
import { besselJ0, besselJ1, diskAmplitude } from './bessel-j01.js';
import { gamma, lnGamma, sinPi } from './gamma.js';
import { cosSinCombination } from './trig.js';

/** The series is used for x^2 / 4 below this multiple of max(1, nu + 1). */
const SERIES_RATIO = 1;
/** Hankel's expansion is used from x = max(HANKEL_MIN_X, nu^2 / 2) on. */
const HANKEL_MIN_X = 25;
/** Terms below this (relative to the leading 1) end a series. */
const SERIES_EPS = 1e-17;
/** Miller's recurrence is rescaled when a value grows past this. */
const MILLER_BIG = 1e250;
/**
 * Largest order accepted. Limb darkening needs nu up to about 6; the bound keeps every method inside the range
 * where it was checked and bounds the cost of Miller's recurrence (used for x < nu^2 / 2) to about 1 ms.
 */
export const MAX_BESSEL_ORDER = 1000;
/** Above this order the factor (x/2)^nu / Gamma(nu + 1) is formed through logarithms. */
const DIRECT_POWER_MAX_ORDER = 100;

/** 0F1(; nu + 1; -x^2/4) by its power series; for x^2/4 <= max(1, nu + 1). */
function normalisedSeries(nu: number, x: number): number {
  const z = 0.25 * x * x;
  let term = 1;
  let sum = 1;
  for (let k = 1; k < 200; k++) {
    term *= -z / (k * (nu + k));
    sum += term;
    if (Math.abs(term) < SERIES_EPS) break;
  }
  return sum;
}

/** L_nu(x) by Miller's backward recurrence normalised by the Neumann sum; x > 0. */
function normalisedMiller(nu: number, x: number): number {
  const half = Math.ceil(0.5 * (x + 8 * Math.cbrt(x) + 24));
  const n = 2 * half;
  const twoOverX = 2 / x;
  let next = 0; // f_{k+1}
  let cur = 1; // f_k, starting at k = n
  // acc holds S_m = (nu + 2m) f_2m + (nu + m) / (m + 1) S_{m+1}; the Neumann sum is f_0 + S_1.
  let acc = 0;
  for (let k = n; k > 0; k--) {
    if ((k & 1) === 0) {
      const m = k >> 1;
      acc = (nu + k) * cur + ((nu + m) / (m + 1)) * acc;
    }
    const prev = (nu + k) * twoOverX * cur - next;
    next = cur;
    cur = prev;
    if (Math.abs(cur) > MILLER_BIG) {
      cur /= MILLER_BIG;
      next /= MILLER_BIG;
      acc /= MILLER_BIG;
    }
  }
  return cur / (cur + acc);
}

/** J_nu(x) by Hankel's asymptotic expansion; x >= max(25, nu^2 / 2). */
function besselHankel(nu: number, x: number): number {
  const mu = 4 * nu * nu;
  const eightX = 8 * x;
  let term = 1;
  let p = 1;
  let q = 0;
  for (let k = 1; k < 200; k++) {
    const j = 2 * k - 1;
    term *= (mu - j * j) / (k * eightX);
    // terms k = 1, 2, 3, 4, ... go to Q, P, Q, P with signs +, -, -, +
    const signed = (k & 2) === 0 ? term : -term;
    if ((k & 1) === 1) q += signed;
    else p += signed;
    if (Math.abs(term) < SERIES_EPS) break;
  }
  // w = x - phi, phi = pi (nu/2 + 1/4): cos w = cos x cos phi + sin x sin phi, sin w = sin x cos phi - cos x sin phi
  const a = 0.5 * nu + 0.25;
  const cphi = sinPi(a + 0.5);
  const sphi = sinPi(a);
  // p cos w - q sin w = (p cphi + q sphi) cos x + (p sphi - q cphi) sin x
  return Math.sqrt(2 / (Math.PI * x)) * cosSinCombination(x, p * cphi + q * sphi, p * sphi - q * cphi);
}

/** Which method serves (nu, x): 0 series, 1 Miller, 2 Hankel. */
function regime(nu: number, x: number): 0 | 1 | 2 {
  if (0.25 * x * x <= SERIES_RATIO * Math.max(1, nu + 1)) return 0;
  if (x >= HANKEL_MIN_X && x >= 0.5 * nu * nu) return 2;
  return 1;
}

/** (x/2)^nu / Gamma(nu + 1) for x > 0, nu >= 0. */
function powerOverGamma(nu: number, x: number): number {
  if (nu <= DIRECT_POWER_MAX_ORDER) return Math.pow(0.5 * x, nu) / gamma(nu + 1);
  return Math.exp(nu * Math.log(0.5 * x) - lnGamma(nu + 1));
}

/** J_nu(x) for finite nu >= 0, x >= 0. */
function jnuNonNegative(nu: number, x: number): number {
  if (nu === 0) return besselJ0(x);
  if (nu === 1) return besselJ1(x);
  if (x === 0) return 0;
  switch (regime(nu, x)) {
    case 0:
      return powerOverGamma(nu, x) * normalisedSeries(nu, x);
    case 1:
      return powerOverGamma(nu, x) * normalisedMiller(nu, x);
    default:
      return besselHankel(nu, x);
  }
}

/** L_nu(x) = Gamma(nu + 1) (2/x)^nu J_nu(x) for finite nu >= 0, x >= 0. */
function normalisedNonNegative(nu: number, x: number): number {
  if (nu === 1) return diskAmplitude(x);
  if (nu === 0) return besselJ0(x);
  switch (regime(nu, x)) {
    case 0:
      return normalisedSeries(nu, x);
    case 1:
      return normalisedMiller(nu, x);
    default: {
      const j = besselHankel(nu, x);
      if (nu <= DIRECT_POWER_MAX_ORDER) return gamma(nu + 1) * Math.pow(2 / x, nu) * j;
      return Math.exp(lnGamma(nu + 1) + nu * Math.log(2 / x)) * j;
    }
  }
}

/** Throws when |nu| > MAX_BESSEL_ORDER. */
function checkOrderBound(where: string, nu: number): void {
  if (Math.abs(nu) > MAX_BESSEL_ORDER) {
    throw new InputError(
      `${where}: order nu = ${showValue(nu)} is outside [-${MAX_BESSEL_ORDER}, ${MAX_BESSEL_ORDER}]`,
      {
        argument: 'nu',
      },
    );
  }
}

/** Throws unless 0 <= nu <= MAX_BESSEL_ORDER (nu + 1 is used by the derivative). */
function checkPowerLawOrder(where: string, nu: number): void {
  if (!(nu >= 0 && nu < MAX_BESSEL_ORDER)) {
    throw new InputError(`${where}: order nu = ${showValue(nu)} must be in [0, ${MAX_BESSEL_ORDER})`, {
      argument: 'nu',
    });
  }
}

/**
 * The Bessel function of the first kind of real order, J_nu(x).
 *
 * @param nu - order (dimensionless), 0 <= nu <= 1000, or an integer in [-1000, 1000]
 * @param x - argument (dimensionless), x >= 0, or any real when nu is an integer
 * @returns J_nu(x); NaN when nu or x is not finite
 * @throws InputError when |nu| > 1000 ({@link MAX_BESSEL_ORDER}), when nu < 0 is not an integer, or when x < 0
 *   with a non-integer nu (J_nu is then complex or needs Y_nu)
 *
 * Notes: for 0 <= x <= 200 and the orders of limb darkening (nu from 0 to about 25), the error is below
 * 1e-13 |J_nu(x)| + 1e-14 (checked against mpmath and scipy.special.jv, tests/kernels/bessel-jnu.test.ts).
 * Orders 0 and 1 use {@link besselJ0} and {@link besselJ1}. Methods (power series, Hankel's expansion,
 * Miller's backward recurrence with the Neumann normalisation) as in the module notes. Time: Miller's
 * recurrence takes about x + 8 x^(1/3) + 24 steps, so it is the slow path (a few hundred ns at x = 25 + nu^2/2).
 *
 * @example
 * ```ts
 * besselJnu(1.5, 1); // 0.24029783912342695 (sqrt(2/pi) (sin 1 - cos 1) = 0.240297839123427)
 * ```
 */
export function besselJnu(nu: number, x: number): number {
  if (!(Number.isFinite(nu) && Number.isFinite(x))) return Number.NaN;
  checkOrderBound('besselJnu', nu);
  if (nu >= 0 && x >= 0) return jnuNonNegative(nu, x);
  if (Number.isInteger(nu)) {
    // J_{-n} = (-1)^n J_n and J_n(-x) = (-1)^n J_n(x) (A&S 9.1.5)
    const n = Math.abs(nu);
    const odd = n % 2 === 1;
    const flip = (nu < 0 && odd) !== (x < 0 && odd);
    const r = jnuNonNegative(n, Math.abs(x));
    return flip ? -r : r;
  }
  if (nu < 0) {
    throw new InputError(`besselJnu: order nu = ${showValue(nu)} must be >= 0 or an integer`, {
      argument: 'nu',
    });
  }
  throw new InputError(
    `besselJnu: argument x = ${showValue(x)} must be >= 0 when the order nu = ${showValue(nu)} is not an integer`,
    { argument: 'x' },
  );
}

/**
 * The visibility amplitude of a power-law limb-darkened disk, Gamma(nu + 1) (2/x)^nu J_nu(x), 1 at x = 0.
 *
 * @param nu - order (dimensionless), nu = alpha / 2 + 1 for the intensity law I(mu) = mu^alpha, 0 <= nu < 1000
 * @param x - pi * diameter * q (dimensionless; diameter in rad, q in cycles/rad), any real (even function)
 * @returns Gamma(nu + 1) (2/x)^nu J_nu(x) = 0F1(; nu + 1; -x^2/4); 1 at x = 0; NaN when nu or x is not finite
 * @throws InputError when nu < 0 or nu >= 1000
 *
 * Notes: for |x| <= 200 the error is below 1e-13 |V| + 1e-14 (tests/kernels/bessel-jnu.test.ts, against
 * mpmath). nu = 1 is the uniform disk ({@link diskAmplitude}, alpha = 0), nu = 0 the thin ring J0. The
 * formula is Hestroffer 1997 (A&A 327:199); the methods are those of {@link besselJnu}, here used without the
 * factor (x/2)^nu / Gamma(nu + 1) except for Hankel's expansion.
 *
 * @example
 * ```ts
 * powerLawAmplitude(1.5, 2); // 0.6530966624699874 (= 3 (sin 2 - 2 cos 2) / 8)
 * ```
 */
export function powerLawAmplitude(nu: number, x: number): number {
  if (!(Number.isFinite(nu) && Number.isFinite(x))) return Number.NaN;
  checkPowerLawOrder('powerLawAmplitude', nu);
  return normalisedNonNegative(nu, Math.abs(x));
}

/**
 * The derivative in x of the power-law amplitude: d/dx L_nu(x) = -x / (2 (nu + 1)) L_{nu + 1}(x).
 *
 * @param nu - order (dimensionless), 0 <= nu < 1000
 * @param x - pi * diameter * q (dimensionless), any real (odd function)
 * @returns -x L_{nu + 1}(x) / (2 (nu + 1)), with L_nu = {@link powerLawAmplitude}; 0 at x = 0; NaN when nu or
 *   x is not finite
 * @throws InputError when nu < 0 or nu >= 1000
 *
 * Notes: from d/dx [x^-nu J_nu(x)] = -x^-nu J_{nu + 1}(x) (A&S 9.1.30); the accuracy is that of
 * {@link powerLawAmplitude} at order nu + 1. At nu = 1 it equals {@link diskAmplitudeDerivative}.
 *
 * @example
 * ```ts
 * powerLawAmplitudeDerivative(1, 1); // -0.22980696986380095 (-2 J2(1) = -0.229806969863801)
 * ```
 */
export function powerLawAmplitudeDerivative(nu: number, x: number): number {
  if (!(Number.isFinite(nu) && Number.isFinite(x))) return Number.NaN;
  checkPowerLawOrder('powerLawAmplitudeDerivative', nu);
  return ((-0.5 * x) / (nu + 1)) * normalisedNonNegative(nu + 1, Math.abs(x));
}
