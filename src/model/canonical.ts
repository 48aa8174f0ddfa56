/**
 * Canonical form: a model tree folded by the shift, similarity and convolution theorems into a flat sum of terms
 *
 *     F(q) = sum_k flux_k * prod_f P_f(A_f^T q; shape_f) * exp(-2 pi i q . x_k)
 *
 * where each factor P_f is a unit-size primitive (a disk of diameter 1 mas, a Gaussian of FWHM 1 mas, ...)
 * seen through its own 2x2 linear map A_f (mas per unit), and x_k = (east_k, north_k) in mas.
 *
 * @module
 */
import { ModelError, showValue } from '../errors.js';
import { isChromatic, readChromatic } from './chromatic-slot.js';
import {
  COMPONENT_FACTOR_KINDS,
  type ComponentFactorKind,
  canonicaliseComponent,
} from './component-canonical.js';
import { add, constant, cosDeg, type Dual, type Mat2, matMul, matVec, mul, sinDeg } from './dual.js';
import type { ModelNode } from './nodes.js';
import { isParam, type Param, type Slot } from './param.js';

/** Kernel kinds of a canonical factor. `radial` kinds depend on |A^T q| only. */
export type FactorKind = 'uniformDisk' | 'gaussian' | 'thinRing' | ComponentFactorKind;

/** Facts about each factor kind. */
export const FACTOR_KINDS: Readonly<
  Record<FactorKind, { readonly radial: boolean; readonly shapeNames: readonly string[] }>
> = Object.freeze({
  uniformDisk: { radial: true, shapeNames: [] },
  gaussian: { radial: true, shapeNames: [] },
  thinRing: { radial: true, shapeNames: [] },
  ...COMPONENT_FACTOR_KINDS,
});

/** One primitive factor of a canonical term, with dual (value + gradient) entries. */
export interface DualFactor {
  readonly kind: FactorKind;
  readonly shape: readonly Dual[];
  /** The linear map A (row-major, mas per unit size) through which the unit primitive is seen. */
  readonly a: Mat2;
  /** Fixed data of tabulated kinds (a radial profile's table, a pixel image); compared by identity. */
  readonly data?: unknown;
}

/** One canonical term with dual entries. */
export interface DualTerm {
  readonly flux: Dual;
  readonly east: Dual;
  readonly north: Dual;
  readonly factors: readonly DualFactor[];
}

/** How slots are read during canonicalisation. */
export interface CanonicalEnv {
  /** Index of each free parameter by name. */
  readonly index: ReadonlyMap<string, number>;
  /** Values of the free parameters (same order as `index`); null to use each parameter's own value. */
  readonly values: Float64Array | null;
  /** When true, duals carry gradients over the free parameters. */
  readonly gradients: boolean;
  /** Wavelength in metres at which wavelength-dependent slots are read (none: such slots are an error). */
  readonly wavelength?: number;
  /** When true and no wavelength is given, wavelength-dependent slots are read at their reference wavelength. */
  readonly chromaticAtReference?: boolean;
}

/** An environment that reads every parameter's own value and tracks no gradients. */
export const PLAIN_ENV: CanonicalEnv = Object.freeze({ index: new Map(), values: null, gradients: false });

/** A domain check of a slot value: returns null when valid or a phrase saying what would be valid. */
export type Domain = (x: number) => string | null;

/** Any finite number. */
export const ANY: Domain = () => null;
/** A finite number >= 0. */
export const NON_NEGATIVE: Domain = (x) => (x >= 0 ? null : 'a number >= 0');
/** A finite non-zero number. */
export const NON_ZERO: Domain = (x) => (x !== 0 ? null : 'a non-zero number');
/** An inclination in [0, 90] degrees. */
export const INCLINATION: Domain = (x) => (x >= 0 && x <= 90 ? null : 'an angle in [0, 90] degrees');

/**
 * Reads a slot as a dual number and checks it against its domain.
 *
 * @param slot - the slot content
 * @param env - parameter values and gradient switch
 * @param path - the model path of the slot, for errors
 * @param domain - the valid values
 * @param unit - unit phrase for messages
 */
export function readSlot(slot: Slot, env: CanonicalEnv, path: string, domain: Domain, unit: string): Dual {
  let value: number;
  let g: Float64Array | null = null;
  let p: Param | null = null;
  if (typeof slot === 'number') {
    value = slot;
  } else if (isChromatic(slot)) {
    const d = readChromatic(
      slot,
      env.wavelength,
      env.chromaticAtReference === true,
      path,
      (c, where, dom, u) => readSlot(c, env, where, dom, u),
    );
    value = d.v;
    g = d.g;
  } else if (isParam(slot)) {
    p = slot;
    const i = slot.fixed ? undefined : env.index.get(slot.name);
    value = i !== undefined && env.values !== null ? env.values[i]! : slot.value;
    if (i !== undefined && env.gradients) {
      g = new Float64Array(env.index.size);
      g[i] = 1;
    }
  } else {
    throw new ModelError(
      `${path}: expected a number or a param(...) (or a wavelength-dependent slot), got ${showValue(slot)}`,
      {
        modelPath: path,
      },
    );
  }
  const named = p === null ? '' : ` (parameter '${p.name}')`;
  if (!Number.isFinite(value)) {
    throw new ModelError(`${path}${named}: expected a finite number${unit}, got ${showValue(value)}`, {
      modelPath: path,
      ...(p ? { parameter: p.name } : {}),
    });
  }
  const problem = domain(value);
  if (problem !== null) {
    throw new ModelError(`${path}${named}: expected ${problem}${unit}, got ${value}`, {
      modelPath: path,
      ...(p ? { parameter: p.name } : {}),
    });
  }
  return { v: value, g };
}

const ZERO = constant(0);
const ONE = constant(1);

function diag(a: Dual, b: Dual): Mat2 {
  return [a, ZERO, ZERO, b];
}

/** The rotation R(pa) of CONVENTIONS.md: north (0, 1) goes to (sin pa, cos pa). */
function rotation(pa: Dual): Mat2 {
  const c = cosDeg(pa);
  const s = sinDeg(pa);
  return [c, s, { v: -s.v, g: s.g === null ? null : s.g.map((x) => -x) }, c];
}

function unitTerm(kind: FactorKind, a: Mat2, shape: readonly Dual[] = []): DualTerm[] {
  return [{ flux: ONE, east: ZERO, north: ZERO, factors: [{ kind, shape, a }] }];
}

function mapTerms(terms: readonly DualTerm[], b: Mat2): DualTerm[] {
  return terms.map((t) => {
    const [east, north] = matVec(b, [t.east, t.north]);
    return {
      flux: t.flux,
      east,
      north,
      factors: t.factors.map((f) => ({ ...f, a: matMul(b, f.a) })),
    };
  });
}

/**
 * Folds a model tree into canonical terms.
 *
 * @param node - the root node
 * @param env - parameter values and gradient switch
 * @param path - model path of `node` (defaults to its kind)
 * @returns the canonical terms (unnormalised; fluxes as given)
 * @throws ModelError naming the model path of an invalid slot value
 */
export function canonicalise(
  node: ModelNode,
  env: CanonicalEnv = PLAIN_ENV,
  path: string = node.kind,
): DualTerm[] {
  const slot = (s: Slot, name: string, domain: Domain, unit: string) =>
    readSlot(s, env, `${path}.${name}`, domain, unit);
  switch (node.kind) {
    case 'point':
      return [{ flux: ONE, east: ZERO, north: ZERO, factors: [] }];
    case 'disk': {
      const d = slot(node.diameter, 'diameter', NON_NEGATIVE, ' mas');
      return unitTerm('uniformDisk', diag(d, d));
    }
    case 'gaussian': {
      const w = slot(node.fwhm, 'fwhm', NON_NEGATIVE, ' mas');
      return unitTerm('gaussian', diag(w, w));
    }
    case 'ring': {
      const d = slot(node.diameter, 'diameter', NON_NEGATIVE, ' mas');
      return unitTerm('thinRing', diag(d, d));
    }
    case 'ellipse': {
      const major = slot(node.major, 'major', NON_NEGATIVE, ' mas');
      const minor = slot(node.minor, 'minor', NON_NEGATIVE, ' mas');
      if (minor.v > major.v) {
        throw new ModelError(
          `${path}.minor: expected minor <= major (${major.v} mas), got ${minor.v} mas; swap them and add 90 degrees to pa`,
          { modelPath: `${path}.minor` },
        );
      }
      const pa = slot(node.pa, 'pa', ANY, ' degrees');
      return unitTerm('uniformDisk', matMul(rotation(pa), diag(minor, major)));
    }
    case 'weight': {
      const w = slot(node.flux, 'flux', ANY, '');
      return canonicalise(node.of, env, `${path}.of`).map((t) => ({ ...t, flux: mul(t.flux, w) }));
    }
    case 'shift': {
      const e = slot(node.east, 'east', ANY, ' mas');
      const n = slot(node.north, 'north', ANY, ' mas');
      return canonicalise(node.of, env, `${path}.of`).map((t) => ({
        ...t,
        east: add(t.east, e),
        north: add(t.north, n),
      }));
    }
    case 'stretch': {
      const e = slot(node.east, 'east', NON_ZERO, '');
      const n = slot(node.north, 'north', NON_ZERO, '');
      return mapTerms(canonicalise(node.of, env, `${path}.of`), diag(e, n));
    }
    case 'rotate': {
      const pa = slot(node.pa, 'pa', ANY, ' degrees');
      return mapTerms(canonicalise(node.of, env, `${path}.of`), rotation(pa));
    }
    case 'incline': {
      const inc = slot(node.inclination, 'inclination', INCLINATION, ' degrees');
      const pa = slot(node.pa, 'pa', ANY, ' degrees');
      const b = matMul(rotation(pa), diag(cosDeg(inc), ONE));
      return mapTerms(canonicalise(node.of, env, `${path}.of`), b);
    }
    case 'sum':
      return node.of.flatMap((child, i) => canonicalise(child, env, `${path}.of[${i}]`));
    case 'convolve': {
      const left = canonicalise(node.of[0], env, `${path}.of[0]`);
      const right = canonicalise(node.of[1], env, `${path}.of[1]`);
      const out: DualTerm[] = [];
      for (const a of left) {
        for (const b of right) {
          out.push({
            flux: mul(a.flux, b.flux),
            east: add(a.east, b.east),
            north: add(a.north, b.north),
            factors: [...a.factors, ...b.factors],
          });
        }
      }
      return out;
    }
    case 'linearLimbDarkenedDisk':
    case 'quadraticLimbDarkenedDisk':
    case 'powerLawLimbDarkenedDisk':
    case 'annulus':
    case 'modulatedRing':
    case 'exponential':
    case 'lorentzian':
    case 'background':
    case 'radialProfile':
    case 'pixelImage':
      return canonicaliseComponent(node, slot, path);
    default: {
      const never: never = node;
      throw new ModelError(
        `${path}: unknown model node kind ${showValue((never as { kind?: unknown }).kind)}`,
        {
          modelPath: path,
        },
      );
    }
  }
}
