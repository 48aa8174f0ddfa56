/**
 * Bessel-function kernels of the radial visibility models: J0, J1, J2 and J_nu of real order, the uniform-disk,
 * thin-ring and power-law limb-darkened amplitudes, and their derivatives in x. This module gathers the public
 * names; the methods are described in `bessel-j01.ts` (orders 0, 1, 2) and `bessel-jnu.ts` (real order).
 *
 * @module
 */
export {
  besselJ0,
  besselJ1,
  besselJ2,
  diskAmplitude,
  diskAmplitudeDerivative,
  ringAmplitudeDerivative,
} from './bessel-j01.js';
export {
  besselJnu,
  MAX_BESSEL_ORDER,
  powerLawAmplitude,
  powerLawAmplitudeDerivative,
} from './bessel-jnu.js';
export { gamma, lnGamma } from './gamma.js';
