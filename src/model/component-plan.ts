/**
 * The evaluation-plan side of the extended components: kernel codes, kernel coefficients computed once per
 * plan from the shape parameters, and the term loop for terms that hold an extended or complex factor.
 *
 * @internal
 * @module
 */
import {
  addComplexAmplitudeTerm,
  addComponentRadialTerm,
  COMPLEX_MODULATED_RING,
  COMPLEX_PIXEL_IMAGE,
  isComponentComplex,
  isComponentRadial,
  limbDarkenedCoefficients,
  mulComponentComplex,
  mulComponentRadial,
  RADIAL_ANNULUS,
  RADIAL_BACKGROUND,
  RADIAL_EXPONENTIAL,
  RADIAL_LINEAR_LD,
  RADIAL_LORENTZIAN,
  RADIAL_POWER_LD,
  RADIAL_QUADRATIC_LD,
  RADIAL_TABLE,
} from '../kernels/components.js';
import { phaseNeedsSplit } from '../kernels/sincos.js';
import { addAmplitudeTerm, mulRadial } from '../kernels/terms.js';
import { maxAbs } from '../units/index.js';
import type { ComponentFactorKind } from './component-canonical.js';

/** Kernel code of each extended factor kind. */
export const COMPONENT_CODES: Readonly<Record<ComponentFactorKind, number>> = Object.freeze({
  linearLimbDarkened: RADIAL_LINEAR_LD,
  quadraticLimbDarkened: RADIAL_QUADRATIC_LD,
  powerLawLimbDarkened: RADIAL_POWER_LD,
  uniformAnnulus: RADIAL_ANNULUS,
  exponential: RADIAL_EXPONENTIAL,
  lorentzian: RADIAL_LORENTZIAN,
  background: RADIAL_BACKGROUND,
  radialTable: RADIAL_TABLE,
  modulatedRing: COMPLEX_MODULATED_RING,
  pixelImage: COMPLEX_PIXEL_IMAGE,
});

const NONE = new Float64Array(0);
const DEG = Math.PI / 180;

/** Kernel coefficients of a factor from its shape values (computed once per plan). */
export function componentCoefficients(code: number, shape: readonly number[]): Float64Array {
  switch (code) {
    case RADIAL_LINEAR_LD:
      return Float64Array.from(limbDarkenedCoefficients(shape[0]!, 0)).subarray(0, 2);
    case RADIAL_QUADRATIC_LD:
      return Float64Array.from(limbDarkenedCoefficients(shape[0]!, shape[1]!));
    case RADIAL_POWER_LD:
      return Float64Array.of(shape[0]! / 2 + 1);
    case RADIAL_ANNULUS:
      return Float64Array.of(shape[0]!);
    case COMPLEX_MODULATED_RING: {
      const [c1, pa1, c2, pa2] = shape as [number, number, number, number];
      return Float64Array.of(
        c1 * Math.sin(pa1 * DEG),
        c1 * Math.cos(pa1 * DEG),
        c2 * Math.cos(2 * pa2 * DEG),
        c2 * Math.sin(2 * pa2 * DEG),
      );
    }
    default:
      return NONE;
  }
}

/** A plan factor as this module needs it. */
export interface ComponentPlanFactor {
  readonly code: number;
  readonly m11: number;
  readonly m12: number;
  readonly m22: number;
  /** A in radians per unit (row-major), for complex kinds. */
  readonly a11: number;
  readonly a12: number;
  readonly a21: number;
  readonly a22: number;
  readonly p: Float64Array;
  readonly data: unknown;
}

/** True when a factor needs this module's term loop. */
export function isComponentFactor(f: { readonly code: number }): boolean {
  return f.code >= 16;
}

interface Scratch {
  amp: Float64Array;
  cre: Float64Array;
  cim: Float64Array;
  tmp: Float64Array;
}
const scratches = new WeakMap<object, Scratch>();

function scratchFor(owner: object, n: number): Scratch {
  let s = scratches.get(owner);
  if (s === undefined || s.amp.length < n) {
    s = {
      amp: new Float64Array(n),
      cre: new Float64Array(n),
      cim: new Float64Array(n),
      tmp: new Float64Array(2),
    };
    scratches.set(owner, s);
  }
  return s;
}

/**
 * Adds one term that holds at least one extended factor into (re, im).
 *
 * @param owner - the plan (owns the scratch buffers)
 * @param flux - term flux
 * @param e0 - shift east, rad
 * @param n0 - shift north, rad
 * @param factors - the term's factors
 */
export function addComponentTerm(
  owner: object,
  flux: number,
  e0: number,
  n0: number,
  factors: readonly ComponentPlanFactor[],
  u: Float64Array,
  v: Float64Array,
  re: Float64Array,
  im: Float64Array,
  n: number,
): void {
  const exact = phaseNeedsSplit(maxAbs(u, 0, n), maxAbs(v, 0, n), e0, n0);
  if (factors.length === 1 && isComponentRadial(factors[0]!.code)) {
    const f = factors[0]!;
    addComponentRadialTerm(f.code, re, im, u, v, n, flux, f.m11, f.m12, f.m22, e0, n0, f.p, f.data, exact);
    return;
  }
  const s = scratchFor(owner, n);
  const amp = s.amp;
  amp.fill(flux, 0, n);
  let complex = false;
  for (const f of factors) {
    if (isComponentComplex(f.code)) {
      if (!complex) {
        s.cre.fill(1, 0, n);
        s.cim.fill(0, 0, n);
        complex = true;
      }
      mulComponentComplex(f.code, s.cre, s.cim, u, v, n, f.a11, f.a12, f.a21, f.a22, f.p, f.data, s.tmp);
    } else if (isComponentRadial(f.code)) {
      mulComponentRadial(f.code, amp, u, v, n, f.m11, f.m12, f.m22, f.p, f.data);
    } else {
      mulRadial(f.code, amp, u, v, 0, n, f.m11, f.m12, f.m22);
    }
  }
  if (complex) addComplexAmplitudeTerm(re, im, amp, s.cre, s.cim, u, v, n, e0, n0, exact);
  else addAmplitudeTerm(re, im, amp, u, v, 0, n, e0, n0, exact);
}
