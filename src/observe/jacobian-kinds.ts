/**
 * What the Jacobian needs to know about each factor kind: whether it is radial, the value-and-derivative kernel,
 * and how the kernel's coefficients follow from the shape parameters (with d coefficient / d shape, so the
 * chain rule from the free parameters to the coefficients is done once per plan, not per point).
 *
 * @internal
 * @module
 */
import {
  COMPONENT_COMPLEX_DERIVATIVES,
  COMPONENT_RADIAL_DERIVATIVES,
  type ComplexDerivativeKernel,
} from '../kernels/component-derivatives.js';
import {
  gaussianDerivatives,
  type RadialDerivativeKernel,
  thinRingDerivatives,
  uniformDiskDerivatives,
} from '../kernels/derivatives.js';
import type { FactorKind } from '../model/canonical.js';
import { COMPONENT_CODES, componentCoefficients } from '../model/component-plan.js';

/** Kernel coefficients of a factor and their derivatives with respect to its shape parameters. */
export interface KindCoefficients {
  /** Coefficients, exactly as the value path computes them. */
  readonly p: Float64Array;
  /** d p_k / d shape_q, row-major (p.length x shape.length). */
  readonly dp: Float64Array;
}

/** The Jacobian facts of one factor kind. */
export type JacobianKind =
  | { readonly radial: true; readonly kernel: RadialDerivativeKernel }
  | { readonly radial: false; readonly kernel: ComplexDerivativeKernel };

/** Value-and-derivative kernels of every factor kind. */
export const DERIVATIVE_KERNELS: Readonly<Record<FactorKind, JacobianKind>> = Object.freeze({
  uniformDisk: { radial: true, kernel: uniformDiskDerivatives },
  gaussian: { radial: true, kernel: gaussianDerivatives },
  thinRing: { radial: true, kernel: thinRingDerivatives },
  linearLimbDarkened: { radial: true, kernel: COMPONENT_RADIAL_DERIVATIVES['linearLimbDarkened']! },
  quadraticLimbDarkened: { radial: true, kernel: COMPONENT_RADIAL_DERIVATIVES['quadraticLimbDarkened']! },
  powerLawLimbDarkened: { radial: true, kernel: COMPONENT_RADIAL_DERIVATIVES['powerLawLimbDarkened']! },
  uniformAnnulus: { radial: true, kernel: COMPONENT_RADIAL_DERIVATIVES['uniformAnnulus']! },
  exponential: { radial: true, kernel: COMPONENT_RADIAL_DERIVATIVES['exponential']! },
  lorentzian: { radial: true, kernel: COMPONENT_RADIAL_DERIVATIVES['lorentzian']! },
  background: { radial: true, kernel: COMPONENT_RADIAL_DERIVATIVES['background']! },
  radialTable: { radial: true, kernel: COMPONENT_RADIAL_DERIVATIVES['radialTable']! },
  modulatedRing: { radial: false, kernel: COMPONENT_COMPLEX_DERIVATIVES['modulatedRing']! },
  pixelImage: { radial: false, kernel: COMPONENT_COMPLEX_DERIVATIVES['pixelImage']! },
});

const NONE = new Float64Array(0);
const DEG = Math.PI / 180;

/**
 * The kernel coefficients of a factor and their derivatives with respect to its shape values.
 *
 * @param kind - the factor kind
 * @param shape - the factor's shape values (limb-darkening coefficients, annulus ratio, modulation terms)
 *
 * Notes: limb darkening: c = N / T with T = 1 - a/3 - b/6 the flux (`limbDarkenedCoefficients`), so
 * dc/ds = (dN/ds - c dT/ds) / T; the power law's order nu = alpha/2 + 1; the modulated ring's
 * (c1 sin pa1, c1 cos pa1, c2 cos 2pa2, c2 sin 2pa2) with the angles in degrees.
 */
export function kindCoefficients(kind: FactorKind, shape: readonly number[]): KindCoefficients {
  if (kind === 'uniformDisk' || kind === 'gaussian' || kind === 'thinRing') return { p: NONE, dp: NONE };
  const p = componentCoefficients(COMPONENT_CODES[kind], shape);
  switch (kind) {
    case 'linearLimbDarkened': {
      const t = 1 - shape[0]! / 3;
      return { p, dp: Float64Array.of((-1 + p[0]! / 3) / t, (2 / 3 + p[1]! / 3) / t) };
    }
    case 'quadraticLimbDarkened': {
      const t = 1 - shape[0]! / 3 - shape[1]! / 6;
      const [c1, c32, c2] = [p[0]!, p[1]!, p[2]!];
      // rows c1, c32, c2; columns a, b
      return {
        p,
        dp: Float64Array.of(
          (-1 + c1 / 3) / t,
          (-1 + c1 / 6) / t,
          (2 / 3 + c32 / 3) / t,
          (4 / 3 + c32 / 6) / t,
          c2 / 3 / t,
          (-0.5 + c2 / 6) / t,
        ),
      };
    }
    case 'powerLawLimbDarkened':
      return { p, dp: Float64Array.of(0.5) };
    case 'uniformAnnulus':
      return { p, dp: Float64Array.of(1) };
    case 'modulatedRing': {
      const [c1, pa1, c2, pa2] = shape as [number, number, number, number];
      const s1 = Math.sin(pa1 * DEG);
      const k1 = Math.cos(pa1 * DEG);
      const s2 = Math.sin(2 * pa2 * DEG);
      const k2 = Math.cos(2 * pa2 * DEG);
      // rows p0..p3; columns c1, pa1, c2, pa2
      return {
        p,
        dp: Float64Array.of(
          s1,
          c1 * DEG * k1,
          0,
          0,
          k1,
          -c1 * DEG * s1,
          0,
          0,
          0,
          0,
          k2,
          -2 * DEG * c2 * s2,
          0,
          0,
          s2,
          2 * DEG * c2 * k2,
        ),
      };
    }
    default:
      return { p, dp: NONE };
  }
}
