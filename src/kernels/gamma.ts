/**
 * The gamma function and the logarithm of its absolute value, for real arguments.
 *
 * Used by the Bessel kernels for the factor (x/2)^nu / Gamma(nu + 1) of J_nu. No allocation.
 *
 * @module
 */
import { reciprocalGammaOneTwo } from './gamma-coefficients.js';

/** sqrt(2 pi). */
const SQRT_TWO_PI = 2.5066282746310002;
/** ln(2 pi) / 2. */
const HALF_LN_TWO_PI = 0.9189385332046728;
/** Above this Gamma(z) overflows binary64 (Gamma(171.62...) = 1.8e308). */
const GAMMA_OVERFLOW = 171.625;
/** From here on the Stirling series (seven terms) is used. */
const STIRLING_FROM = 20;

/**
 * sin(pi z) without the rounding of pi z, exact zeros at the integers.
 *
 * @param z - any finite real
 * @returns sin(pi z)
 */
export function sinPi(z: number): number {
  // r = z - 2 round(z / 2) is exact, r in [-1, 1]; then fold into [-1/2, 1/2] by sin(pi (1 - r)) = sin(pi r).
  let r = z - 2 * Math.round(z / 2);
  if (r > 0.5) r = 1 - r;
  else if (r < -0.5) r = -1 - r;
  return Math.sin(Math.PI * r);
}

/** Stirling's correction ln Gamma(z) - [(z - 1/2) ln z - z + ln(2 pi) / 2] for z >= 20 (Bernoulli numbers B2..B14). */
function stirlingCorrection(z: number): number {
  const w = 1 / (z * z);
  // B_{2k} / (2k (2k - 1)) for k = 1..7: 1/12, -1/360, 1/1260, -1/1680, 1/1188, -691/360360, 1/156.
  let r = 1 / 156;
  r = r * w - 691 / 360360;
  r = r * w + 1 / 1188;
  r = r * w - 1 / 1680;
  r = r * w + 1 / 1260;
  r = r * w - 1 / 360;
  r = r * w + 1 / 12;
  return r / z;
}

/** Gamma(z) for z > 0 (finite). */
function gammaPositive(z: number): number {
  if (z < 1) return 1 / (z * reciprocalGammaOneTwo(z - 0.5));
  if (z <= 2) return 1 / reciprocalGammaOneTwo(z - 1.5);
  if (z < STIRLING_FROM) {
    // Gamma(z) = (z - 1)(z - 2) ... (z - n) Gamma(z - n) with z - n in (1, 2].
    let w = z;
    let prod = 1;
    while (w > 2) {
      w -= 1;
      prod *= w;
    }
    return prod / reciprocalGammaOneTwo(w - 1.5);
  }
  if (z > GAMMA_OVERFLOW) return Number.POSITIVE_INFINITY;
  // sqrt(2 pi) z^(z - 1/2) e^-z e^S, with z^(z - 1/2) split in two halves so that it cannot overflow early.
  const half = Math.pow(z, 0.5 * (z - 0.5));
  return SQRT_TWO_PI * half * (half * Math.exp(-z)) * Math.exp(stirlingCorrection(z));
}

/**
 * The gamma function Gamma(z) of a real argument.
 *
 * @param z - argument (dimensionless), any real
 * @returns Gamma(z); +Infinity above 171.62 (overflow) and at the poles z = 0, -1, -2, ... (with the sign of
 *   the zero at z = +-0); NaN only for NaN or -Infinity
 *
 * Notes: relative error below 16 eps (3.6e-15) for 0 < z < 171 (checked against scipy.special.gamma in
 * tests/kernels/gamma.test.ts). On [1, 2] it is the reciprocal of a polynomial fit to 1 / Gamma (an entire
 * function), made by src/kernels/generate-coefficients.py; below 1 and up to 20 the recurrence
 * Gamma(z + 1) = z Gamma(z) (A&S 6.1.15) is used, from 20 on Stirling's series (A&S 6.1.40) with seven terms,
 * and for negative z the reflection formula Gamma(z) Gamma(1 - z) = pi / sin(pi z) (A&S 6.1.17).
 *
 * @example
 * ```ts
 * gamma(5); // 24
 * gamma(0.5); // 1.772453850905516 (sqrt(pi) = 1.7724538509055159)
 * ```
 */
export function gamma(z: number): number {
  if (z > 0) return gammaPositive(z);
  if (z === 0) return 1 / z; // +-Infinity, the sign of the zero
  if (!(z > Number.NEGATIVE_INFINITY)) return Number.NaN;
  const s = sinPi(z);
  if (s === 0) return Number.POSITIVE_INFINITY;
  // For z < -170, Gamma(1 - z) overflows and the quotient is the (correct) underflow to zero.
  return Math.PI / (s * gammaPositive(1 - z));
}

/**
 * The natural logarithm of |Gamma(z)|.
 *
 * @param z - argument (dimensionless), any real
 * @returns ln |Gamma(z)|; +Infinity at the poles z = 0, -1, -2, ... and at +Infinity; NaN only for NaN or
 *   -Infinity
 *
 * Notes: absolute error below about 1e-15 * max(1, |ln Gamma(z)|) (checked against scipy.special.gammaln). Below
 * 20 it is the logarithm of {@link gamma}; from 20 on Stirling's series (A&S 6.1.40), which does not overflow;
 * negative z by the reflection formula (A&S 6.1.17). Near the zeros of ln Gamma at z = 1 and z = 2 the error is
 * absolute, not relative.
 *
 * @example
 * ```ts
 * lnGamma(10); // 12.801827480081469 (ln 362880)
 * ```
 */
export function lnGamma(z: number): number {
  if (z >= STIRLING_FROM) {
    if (z === Number.POSITIVE_INFINITY) return z;
    return (z - 0.5) * Math.log(z) - z + HALF_LN_TWO_PI + stirlingCorrection(z);
  }
  if (z > 0) return Math.log(gammaPositive(z));
  if (z === 0) return Number.POSITIVE_INFINITY;
  if (!(z > Number.NEGATIVE_INFINITY)) return Number.NaN;
  const s = sinPi(z);
  if (s === 0) return Number.POSITIVE_INFINITY;
  return Math.log(Math.PI / Math.abs(s)) - lnGamma(1 - z);
}
