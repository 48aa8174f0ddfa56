/**
 * The derivative of the power-law limb-darkened disk amplitude L_nu(x) = Gamma(nu + 1) (2/x)^nu J_nu(x) with
 * respect to its order nu, for the Jacobian with respect to the limb-darkening exponent (nu = alpha / 2 + 1).
 *
 * Both methods are the ones `bessel-jnu.ts` uses for L_nu itself, differentiated exactly in nu (forward mode):
 * - where x^2 / 4 <= max(1, nu + 1), the power series 0F1(; nu + 1; -x^2/4) (A&S 9.1.10) term by term:
 *   d/dnu t_k = -t_k H_k with H_k = sum_{j=1..k} 1 / (nu + j);
 * - elsewhere Miller's backward recurrence normalised by the Neumann sum (A&S 9.1.27, Watson 5.2), every step
 *   of which is a rational function of nu, carried together with its derivative. Miller's approximation
 *   converges geometrically and uniformly for nu in a complex neighbourhood, so its derivative converges to
 *   dL_nu/dnu as fast (Cauchy's estimate); the start order is taken a little higher than for the value.
 *
 * @module
 */
import { InputError, showValue } from '../errors.js';
import { MAX_BESSEL_ORDER } from './bessel-jnu.js';

/** Series terms below this (relative to the leading 1) end the sums. */
const SERIES_EPS = 1e-17;
/** Rescaling threshold of the recurrence. */
const MILLER_BIG = 1e250;

/** dL/dnu by the differentiated power series; x^2/4 <= max(1, nu + 1). */
function seriesOrderDerivative(nu: number, x: number): number {
  const z = 0.25 * x * x;
  let term = 1;
  let h = 0;
  let d = 0;
  for (let k = 1; k < 200; k++) {
    term *= -z / (k * (nu + k));
    h += 1 / (nu + k);
    d -= term * h;
    if (Math.abs(term) * (1 + h) < SERIES_EPS) break;
  }
  return d;
}

/** dL/dnu by Miller's recurrence carried with its derivative in nu; x > 0. */
function millerOrderDerivative(nu: number, x: number): number {
  const half = Math.ceil(0.5 * (x + 8 * Math.cbrt(x) + 32));
  const n = 2 * half;
  const twoOverX = 2 / x;
  let next = 0;
  let cur = 1;
  let dnext = 0;
  let dcur = 0;
  let acc = 0;
  let dacc = 0;
  for (let k = n; k > 0; k--) {
    if ((k & 1) === 0) {
      const m = k >> 1;
      const c = (nu + m) / (m + 1);
      dacc = cur + (nu + k) * dcur + acc / (m + 1) + c * dacc;
      acc = (nu + k) * cur + c * acc;
    }
    const prev = (nu + k) * twoOverX * cur - next;
    const dprev = twoOverX * cur + (nu + k) * twoOverX * dcur - dnext;
    next = cur;
    cur = prev;
    dnext = dcur;
    dcur = dprev;
    if (Math.abs(cur) > MILLER_BIG) {
      cur /= MILLER_BIG;
      next /= MILLER_BIG;
      acc /= MILLER_BIG;
      dcur /= MILLER_BIG;
      dnext /= MILLER_BIG;
      dacc /= MILLER_BIG;
    }
  }
  // L = f0 / (f0 + S): dL = (df0 S - f0 dS) / (f0 + S)^2
  const total = cur + acc;
  return (dcur * acc - cur * dacc) / (total * total);
}

/**
 * The derivative in the order, d/dnu [Gamma(nu + 1) (2/x)^nu J_nu(x)], of the power-law disk amplitude.
 *
 * @param nu - order (dimensionless), 0 <= nu < 1000 (nu = alpha / 2 + 1 for I(mu) = mu^alpha)
 * @param x - pi * diameter * q (dimensionless), any real (even function)
 * @returns dL_nu(x)/dnu; 0 at x = 0 (L_nu(0) = 1 for every nu); NaN when nu or x is not finite
 * @throws InputError when nu < 0 or nu >= 1000
 *
 * Notes: the methods of the module notes. Checked against central differences in nu of
 * `powerLawAmplitude` (tests/kernels/bessel-jnu-order.test.ts) to about 1e-10 absolute for x <= 200; the
 * recurrence costs about x + 8 x^(1/3) + 32 steps above the series region, so large x is slow (a few hundred
 * ns at x = 100).
 * @example
 * ```ts
 * powerLawOrderDerivative(1, 1); // 0.05827554706222183 (a higher order is less resolved: L_nu(1) grows with nu)
 * ```
 */
export function powerLawOrderDerivative(nu: number, x: number): number {
  if (!(Number.isFinite(nu) && Number.isFinite(x))) return Number.NaN;
  if (!(nu >= 0 && nu < MAX_BESSEL_ORDER)) {
    throw new InputError(
      `powerLawOrderDerivative: order nu = ${showValue(nu)} must be in [0, ${MAX_BESSEL_ORDER})`,
      { argument: 'nu' },
    );
  }
  const a = Math.abs(x);
  if (a === 0) return 0;
  if (0.25 * a * a <= Math.max(1, nu + 1)) return seriesOrderDerivative(nu, a);
  return millerOrderDerivative(nu, a);
}
