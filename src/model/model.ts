/**
 * The user-facing immutable {@link Model}: primitives, operators, canonical form and evaluation.
 *
 * @module
 */
import { Complex } from 'complex.js';
import { InputError, ModelError } from '../errors.js';
import { PixelGrid, RadialTable } from '../kernels/tabulated.js';
import { boundedFrequencyColumn, DEG_PER_RAD } from '../units/index.js';
import { canonicalise, type DualTerm, FACTOR_KINDS, type FactorKind } from './canonical.js';
import {
  chromaticParams,
  chromaticToString,
  hasChromaticSlot,
  isChromatic,
  substituteChromatic,
} from './chromatic-slot.js';
import { componentToString } from './component-nodes.js';
import { type ModelJSON, modelToJSON } from './json.js';
import { childrenOf, MAX_MODEL_DEPTH, type ModelNode, SLOT_NAMES } from './nodes.js';
import { isParam, type Param, type Slot } from './param.js';
import { compilePlan, type Plan, runPlan } from './plan.js';

/** Complex values as separate real and imaginary columns. */
export interface ComplexColumns {
  /** Real parts. */
  re: Float64Array;
  /** Imaginary parts. */
  im: Float64Array;
}

/** A primitive factor of a canonical term (numbers; lengths in mas). */
export interface TermFactor {
  /** Unit-size primitive kind. */
  readonly kind: FactorKind;
  /** Shape parameters of the primitive (none for the foundation primitives). */
  readonly shape: readonly number[];
  /**
   * The linear map A (row-major [a11, a12, a21, a22], mas per unit size): the factor's image is the unit
   * primitive I(A^-1 x) / |det A| and its Fourier transform is P(A^T q).
   */
  readonly matrix: readonly [number, number, number, number];
  /** Fixed data of a tabulated kind (a radial profile's table, a pixel image), compared by identity. */
  readonly data?: unknown;
}

/** One canonical term: `flux * prod P_f(A_f^T q) * exp(-2 pi i q . (east, north))`. */
export interface Term {
  /** Unnormalised flux of the term. */
  readonly flux: number;
  /** Shift east, mas. */
  readonly east: number;
  /** Shift north, mas. */
  readonly north: number;
  /** Primitive factors (none for a point). */
  readonly factors: readonly TermFactor[];
}

/**
 * Relative tolerance of {@link Model.equals}: two numbers agree when |a - b| <= 1e-9 max(|a|, |b|); lengths
 * (mas) also agree when |a - b| <= 1e-9 mas, and matrix entries are compared relative to the largest entry.
 */
export const EQUALS_TOLERANCE = 1e-9;

interface Cache {
  terms: DualTerm[];
  params: Map<string, Param>;
  plan?: Plan;
  /** True when a slot depends on wavelength: `terms` then hold the build-time check values only. */
  chromatic?: boolean;
}

/** The terms of a model without wavelength-dependent slots; a clear error for a chromatic one. */
function achromatic(c: Cache, what: string): DualTerm[] {
  if (c.chromatic) {
    throw new ModelError(
      `${what}: this model has wavelength-dependent slots, so it has no single ${what}; use the wavelength ` +
        'functions (chromaticVisibilities, chromaticVis2, chromaticBispectrum, chromaticPlan, ...) with a wavelength per point',
      { argument: what },
    );
  }
  return c.terms;
}
const caches = new WeakMap<Model, Cache>();

/** Depth of the tree under each node of a built model, so that wrapping a model checks only the new node. */
const depths = new WeakMap<ModelNode, number>();

/**
 * Checks, without recursion, that a tree is at most {@link MAX_MODEL_DEPTH} nodes deep (the walks of the
 * canonical form, JSON and comparison are recursive).
 */
function checkDepth(root: ModelNode): void {
  let deepest = 0;
  const stack: Array<readonly [ModelNode, number]> = [[root, 1]];
  while (stack.length > 0) {
    const [n, d] = stack.pop()!;
    const known = depths.get(n);
    const reach = known === undefined ? d : d + known - 1;
    if (reach > MAX_MODEL_DEPTH) {
      throw new ModelError(
        `${root.kind}: the model is nested more than ${MAX_MODEL_DEPTH} nodes deep; combine components with sum(...) rather than by chaining thousands of operators`,
        { modelPath: root.kind },
      );
    }
    if (reach > deepest) deepest = reach;
    if (known === undefined) for (const c of childrenOf(n)) stack.push([c, d + 1]);
  }
  depths.set(root, deepest);
}

function collectParams(node: ModelNode, into: Map<string, Param>, path: string): void {
  // children first: parameters are listed in the order the model was built
  const kids = childrenOf(node);
  if (node.kind === 'sum' || node.kind === 'convolve') {
    for (let i = 0; i < kids.length; i++) collectParams(kids[i]!, into, `${path}.of[${i}]`);
  } else if (kids[0]) collectParams(kids[0], into, `${path}.of`);
  for (const name of SLOT_NAMES[node.kind]) {
    const held = (node as unknown as Record<string, Slot>)[name];
    for (const s of slotParams(held)) {
      const prev = into.get(s.name);
      if (prev === undefined) into.set(s.name, s);
      else if (
        prev !== s &&
        (prev.value !== s.value || prev.min !== s.min || prev.max !== s.max || prev.fixed !== s.fixed)
      ) {
        throw new ModelError(
          `${path}.${name}: parameter '${s.name}' appears twice with different settings ` +
            `(value ${prev.value} in [${prev.min}, ${prev.max}]${prev.fixed ? ' fixed' : ''} vs value ${s.value} in [${s.min}, ${s.max}]${s.fixed ? ' fixed' : ''}); ` +
            'use the same param(...) object to tie slots, or give them different names',
          { modelPath: `${path}.${name}`, parameter: s.name },
        );
      }
    }
  }
}

/** The params a slot holds (itself, or the coefficients of a wavelength-dependent slot). */
function slotParams(s: Slot | undefined): Param[] {
  if (isParam(s)) return [s];
  if (isChromatic(s)) return chromaticParams(s).map(([, p]) => p);
  return [];
}

function freezeDeep<T>(x: T): T {
  if (typeof x === 'object' && x !== null && !Object.isFrozen(x)) {
    // tabulated factor data (class instances holding typed arrays) are shared, not frozen
    if (!Array.isArray(x) && Object.getPrototypeOf(x) !== Object.prototype) return x;
    for (const v of Object.values(x)) freezeDeep(v);
    Object.freeze(x);
  }
  return x;
}

function sameLength(fn: string, names: readonly string[], arrays: readonly Float64Array[]): number {
  const n = arrays[0]!.length;
  for (let k = 1; k < arrays.length; k++) {
    if (arrays[k]!.length !== n) {
      throw new InputError(
        `${fn}: ${names[0]} has ${n} entries but ${names[k]} has ${arrays[k]!.length}; give arrays of equal length`,
        { argument: names[k]! },
      );
    }
  }
  return n;
}

function checkOut(fn: string, out: Float64Array, n: number, name: string): Float64Array {
  if (!(out instanceof Float64Array) || out.length !== n) {
    throw new InputError(
      `${fn}: ${name} must be a Float64Array of length ${n}, got ${out instanceof Float64Array ? `length ${out.length}` : typeof out}`,
      { argument: name },
    );
  }
  return out;
}

/** Copies an input when it shares memory with an output, so outputs may alias inputs. */
function unalias(x: Float64Array, outs: readonly Float64Array[]): Float64Array {
  for (const o of outs) if (o.buffer === x.buffer) return x.slice();
  return x;
}

function fmtNum(x: number): string {
  return Object.is(x, -0) ? '0' : String(x);
}

function fmtSlot(s: Slot): string {
  if (typeof s === 'number') return fmtNum(s);
  if (isChromatic(s)) return chromaticToString(s, fmtSlot);
  const opts: string[] = [];
  if (s.min !== Number.NEGATIVE_INFINITY) opts.push(`min: ${fmtNum(s.min)}`);
  if (s.max !== Number.POSITIVE_INFINITY) opts.push(`max: ${fmtNum(s.max)}`);
  if (s.fixed) opts.push('fixed: true');
  return `param('${s.name}', ${fmtNum(s.value)}${opts.length ? `, { ${opts.join(', ')} }` : ''})`;
}

function nodeToString(node: ModelNode): string {
  const s = (name: string) => fmtSlot((node as unknown as Record<string, Slot>)[name]!);
  switch (node.kind) {
    case 'point':
      return 'point()';
    case 'disk':
    case 'ring':
      return `${node.kind}({ diameter: ${s('diameter')} })`;
    case 'gaussian':
      return `gaussian({ fwhm: ${s('fwhm')} })`;
    case 'ellipse':
      return `ellipse({ major: ${s('major')}, minor: ${s('minor')}, pa: ${s('pa')} })`;
    case 'weight':
      return `${nodeToString(node.of)}.weight(${s('flux')})`;
    case 'shift':
    case 'stretch':
      return `${nodeToString(node.of)}.${node.kind}(${s('east')}, ${s('north')})`;
    case 'rotate':
      return `${nodeToString(node.of)}.rotate(${s('pa')})`;
    case 'incline':
      return `${nodeToString(node.of)}.incline(${s('inclination')}, ${s('pa')})`;
    case 'sum':
      return `sum(${node.of.map(nodeToString).join(', ')})`;
    case 'convolve':
      return `convolve(${nodeToString(node.of[0])}, ${nodeToString(node.of[1])})`;
    default:
      return componentToString(node, s);
  }
}

function substitute(node: ModelNode, values: ReadonlyMap<string, number>): ModelNode {
  const out: Record<string, unknown> = { ...node };
  for (const name of SLOT_NAMES[node.kind]) {
    const s = (node as unknown as Record<string, Slot>)[name]!;
    out[name] = isParam(s)
      ? (values.get(s.name) ?? s.value)
      : isChromatic(s)
        ? substituteChromatic(s, values)
        : s;
  }
  if (node.kind === 'sum' || node.kind === 'convolve') out['of'] = node.of.map((c) => substitute(c, values));
  else if ('of' in node) out['of'] = substitute(node.of, values);
  return out as unknown as ModelNode;
}

// ---------- canonical comparison ----------

interface NormFactor {
  kind: FactorKind;
  radial: boolean;
  shape: number[];
  /** A A^T (3 entries) for radial kinds, A (4 entries) otherwise. */
  key: number[];
  /** Tabulated data, compared by content (see {@link sameData}). */
  data?: unknown;
}
interface NormTerm {
  flux: number;
  east: number;
  north: number;
  factors: NormFactor[];
}

function closeTo(a: number, b: number, floor: number): boolean {
  return Math.abs(a - b) <= Math.max(EQUALS_TOLERANCE * Math.max(Math.abs(a), Math.abs(b)), floor);
}

function normFactors(factors: readonly TermFactor[]): NormFactor[] {
  const out: NormFactor[] = [];
  let gauss: number[] | null = null;
  for (const f of factors) {
    const [a11, a12, a21, a22] = f.matrix;
    const radial = FACTOR_KINDS[f.kind].radial;
    const key = radial
      ? [a11 * a11 + a12 * a12, a11 * a21 + a12 * a22, a21 * a21 + a22 * a22]
      : [a11, a12, a21, a22];
    if (f.kind === 'gaussian') {
      // A Gaussian convolved with a Gaussian is the Gaussian whose quadratic form is the sum.
      gauss = gauss === null ? key : gauss.map((g, i) => g + key[i]!);
      continue;
    }
    out.push({ kind: f.kind, radial, shape: [...f.shape], key, data: f.data });
  }
  if (gauss !== null) out.push({ kind: 'gaussian', radial: true, shape: [], key: gauss });
  return out;
}

function sameSamples(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  let scale = 0;
  for (let i = 0; i < a.length; i++) scale = Math.max(scale, Math.abs(a[i]!), Math.abs(b[i]!));
  for (let i = 0; i < a.length; i++) if (!closeTo(a[i]!, b[i]!, EQUALS_TOLERANCE * scale)) return false;
  return true;
}

/**
 * Whether two tabulated factors describe the same image: the same profile samples (radial profiles; the table's
 * extent only decides how V is computed) or the same normalised pixels on the same grid (pixel images). A copy
 * read back from JSON holds new arrays, so identity alone would make it unequal to its original.
 */
function sameData(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (a instanceof RadialTable && b instanceof RadialTable) {
    return sameSamples(a.radii, b.radii) && sameSamples(a.intensity, b.intensity);
  }
  if (a instanceof PixelGrid && b instanceof PixelGrid) {
    return a.nx === b.nx && a.ny === b.ny && sameSamples(a.pixels, b.pixels);
  }
  return false;
}

function factorsEqual(a: NormFactor[], b: NormFactor[]): boolean {
  if (a.length !== b.length) return false;
  const used = new Array<boolean>(b.length).fill(false);
  outer: for (const fa of a) {
    for (let j = 0; j < b.length; j++) {
      const fb = b[j]!;
      if (used[j] || fb.kind !== fa.kind || fb.shape.length !== fa.shape.length) continue;
      if (!fa.shape.every((x, i) => closeTo(x, fb.shape[i]!, 0))) continue;
      if (!sameData(fa.data, fb.data)) continue;
      const scale = Math.max(...fa.key.map(Math.abs), ...fb.key.map(Math.abs));
      if (!fa.key.every((x, i) => closeTo(x, fb.key[i]!, EQUALS_TOLERANCE * scale + 1e-18))) continue;
      used[j] = true;
      continue outer;
    }
    return false;
  }
  return true;
}

function sameShape(a: NormTerm, b: NormTerm): boolean {
  const scale = Math.max(Math.hypot(a.east, a.north), Math.hypot(b.east, b.north));
  return (
    closeTo(a.east, b.east, EQUALS_TOLERANCE * (scale + 1)) &&
    closeTo(a.north, b.north, EQUALS_TOLERANCE * (scale + 1)) &&
    factorsEqual(a.factors, b.factors)
  );
}

function normalForm(terms: readonly Term[]): { terms: NormTerm[]; absFlux: number } {
  const merged: NormTerm[] = [];
  let absFlux = 0;
  for (const t of terms) {
    absFlux += Math.abs(t.flux);
    const nt: NormTerm = { flux: t.flux, east: t.east, north: t.north, factors: normFactors(t.factors) };
    const same = merged.find((m) => sameShape(m, nt));
    if (same) same.flux += nt.flux;
    else merged.push(nt);
  }
  return { terms: merged.filter((t) => Math.abs(t.flux) > EQUALS_TOLERANCE * absFlux), absFlux };
}

/**
 * An immutable sky model: a tree of primitives and operators, evaluated through its canonical form.
 * Build one with the primitive factories ({@link point}, {@link disk}, {@link gaussian}, {@link ring},
 * {@link ellipse}) and combine with the methods below; every method returns a new model.
 *
 * @example
 * ```ts
 * const star = disk({ diameter: 2 }).weight(0.9).plus(point().weight(0.1).shift(5, 0));
 * star.flux; // 1
 * star.vis2([0], [0]); // Float64Array [1]
 * ```
 */
export class Model {
  /** The frozen plain-data tree of this model. */
  readonly node: ModelNode;

  /** @internal Use the factories; this checks every slot and freezes the model. */
  constructor(node: ModelNode) {
    checkDepth(node);
    const frozen = freezeDeep(node);
    const params = new Map<string, Param>();
    collectParams(frozen, params, frozen.kind);
    const chromatic = hasChromaticSlot(frozen);
    const terms = chromatic
      ? canonicalise(frozen, { index: new Map(), values: null, gradients: false, chromaticAtReference: true })
      : canonicalise(frozen);
    this.node = frozen;
    caches.set(this, chromatic ? { terms, params, chromatic } : { terms, params });
    Object.freeze(this);
  }

  private get cache(): Cache {
    return caches.get(this)!;
  }

  // ---------- operators ----------

  /**
   * Multiplies the flux by `flux` (negative allowed: a gap is a ring of negative flux).
   * @param flux - flux factor (plain number or param)
   * @returns a new model
   */
  weight(flux: Slot): Model {
    return new Model({ kind: 'weight', flux, of: this.node });
  }

  /**
   * Moves the model by (east, north).
   * @param east - offset towards east (increasing right ascension), mas
   * @param north - offset towards north, mas
   * @returns a new model; its visibility phase decreases along the shift: V' = V exp(-2 pi i (u east + v north))
   */
  shift(east: Slot, north: Slot): Model {
    return new Model({ kind: 'shift', east, north, of: this.node });
  }

  /**
   * Stretches the image by factors along east and north, keeping the flux: I'(e, n) = I(e/se, n/sn) / (se sn).
   * @param east - stretch factor along east (non-zero; negative mirrors)
   * @param north - stretch factor along north (non-zero)
   * @returns a new model with V'(u, v) = V(se u, sn v)
   */
  stretch(east: Slot, north: Slot): Model {
    return new Model({ kind: 'stretch', east, north, of: this.node });
  }

  /**
   * Turns the image about the origin by `pa` degrees from north towards east.
   * @param pa - position angle, degrees (north = 0, east = 90)
   * @returns a new model with V'(u, v) = V(u cos pa - v sin pa, u sin pa + v cos pa)
   */
  rotate(pa: Slot): Model {
    return new Model({ kind: 'rotate', pa, of: this.node });
  }

  /**
   * Inclines a face-on shape: stretch(cos i, 1) then rotate(pa), so a circle becomes an ellipse with
   * minor/major = cos i and its major axis at position angle `pa`.
   * @param inclination - degrees in [0, 90]; 0 = face-on
   * @param pa - position angle of the major axis, degrees east of north
   * @returns a new model
   */
  incline(inclination: Slot, pa: Slot): Model {
    return new Model({ kind: 'incline', inclination, pa, of: this.node });
  }

  /**
   * Adds another model (fluxes add).
   * @param other - the model to add
   * @returns the sum
   */
  plus(other: Model): Model {
    return sum(this, other);
  }

  /**
   * Convolves with another model (visibilities multiply; fluxes multiply).
   * @param other - the other model
   * @returns the convolution
   */
  convolve(other: Model): Model {
    return convolve(this, other);
  }

  // ---------- canonical form ----------

  /** Total (unnormalised) flux F(0, 0) at the parameters' current values. */
  get flux(): number {
    let f = 0;
    for (const t of achromatic(this.cache, 'flux')) f += t.flux.v;
    return f;
  }

  /**
   * The canonical terms at the parameters' current values (frozen).
   * @returns terms in the order the tree lists them
   */
  terms(): readonly Term[] {
    return freezeDeep(
      achromatic(this.cache, 'terms').map((t) => ({
        flux: t.flux.v,
        east: t.east.v,
        north: t.north.v,
        factors: t.factors.map((f) => ({
          kind: f.kind,
          shape: f.shape.map((s) => s.v),
          matrix: [f.a[0].v, f.a[1].v, f.a[2].v, f.a[3].v] as const,
          ...(f.data === undefined ? {} : { data: f.data }),
        })),
      })),
    );
  }

  /**
   * Canonical equality: true when both models have the same terms (in any order, equal terms merged, radial
   * factors compared by A A^T so a rotated disk equals the disk), to the tolerance {@link EQUALS_TOLERANCE}.
   * Parameters are compared by their current values.
   * @param other - the model to compare with
   */
  equals(other: Model): boolean {
    const a = normalForm(this.terms());
    const b = normalForm(other.terms());
    if (a.terms.length !== b.terms.length) return false;
    const used = new Array<boolean>(b.terms.length).fill(false);
    const fluxScale = Math.max(a.absFlux, b.absFlux);
    outer: for (const ta of a.terms) {
      for (let j = 0; j < b.terms.length; j++) {
        const tb = b.terms[j]!;
        if (used[j] || !closeTo(ta.flux, tb.flux, EQUALS_TOLERANCE * fluxScale) || !sameShape(ta, tb))
          continue;
        used[j] = true;
        continue outer;
      }
      return false;
    }
    return true;
  }

  /** A readable TypeScript expression that rebuilds this model with uvsky's factories. */
  toString(): string {
    return nodeToString(this.node);
  }

  /**
   * The JSON document of this model, `{ format: 'uvsky-model', version: 1, model: <node> }`; called by
   * `JSON.stringify(m)`. Read it back with `modelFromJSON`.
   * @returns fresh plain data (see `modelToJSON` for the format)
   * @example
   * ```ts
   * JSON.stringify(point().weight(2)); // '{"format":"uvsky-model","version":1,"model":{"kind":"weight","flux":2,"of":{"kind":"point"}}}'
   * ```
   */
  toJSON(): ModelJSON {
    return modelToJSON(this);
  }

  // ---------- parameters ----------

  /** Names of the free (not fixed) parameters, in order of first appearance in the tree. */
  parameters(): readonly string[] {
    return Object.freeze([...this.cache.params.values()].filter((p) => !p.fixed).map((p) => p.name));
  }

  /** Every parameter (free and fixed) by name, in order of first appearance. */
  parameterInfo(): readonly Param[] {
    return Object.freeze([...this.cache.params.values()]);
  }

  /**
   * The model with every parameter replaced by a number.
   * @param values - free-parameter values in the order of {@link Model.parameters}, or a record by name
   *   (names left out keep their current value; fixed parameters keep theirs)
   * @returns a plain numeric model
   * @throws ModelError when a value is outside the parameter's bounds, a name is unknown, or the array length is wrong
   */
  at(values: ArrayLike<number> | Readonly<Record<string, number>>): Model {
    const free = [...this.cache.params.values()].filter((p) => !p.fixed);
    const map = new Map<string, number>();
    if (typeof (values as ArrayLike<number>).length === 'number') {
      const arr = values as ArrayLike<number>;
      if (arr.length !== free.length) {
        throw new ModelError(
          `at: got ${arr.length} values but the model has ${free.length} free parameters (${free.map((p) => p.name).join(', ')})`,
          { argument: 'values' },
        );
      }
      for (let i = 0; i < free.length; i++) map.set(free[i]!.name, arr[i]!);
    } else {
      for (const [name, x] of Object.entries(values as Record<string, number>)) {
        const p = this.cache.params.get(name);
        if (p === undefined || p.fixed) {
          throw new ModelError(
            `at: '${name}' is not a free parameter of this model; free parameters: ${free.map((q) => q.name).join(', ') || 'none'}`,
            { parameter: name },
          );
        }
        map.set(name, x);
      }
    }
    for (const [name, x] of map) {
      const p = this.cache.params.get(name)!;
      if (typeof x !== 'number' || !Number.isFinite(x) || x < p.min || x > p.max) {
        throw new ModelError(`at: parameter '${name}' = ${x} lies outside its bounds [${p.min}, ${p.max}]`, {
          parameter: name,
        });
      }
    }
    // check the slot domains with the parameters still in place, so errors name them
    const index = new Map(free.map((p, i) => [p.name, i] as const));
    const vec = Float64Array.from(free, (p) => map.get(p.name) ?? p.value);
    canonicalise(this.node, { index, values: vec, gradients: false, chromaticAtReference: true });
    return new Model(substitute(this.node, map));
  }

  // ---------- evaluation ----------

  /** @internal The compiled plan at the parameters' current values. */
  plan(): Plan {
    const c = this.cache;
    if (c.plan === undefined) c.plan = compilePlan(achromatic(c, 'plan'), this.node.kind);
    return c.plan;
  }

  /**
   * The normalised complex visibility at one point.
   * @param u - spatial frequency east, cycles per radian
   * @param v - spatial frequency north, cycles per radian
   * @returns V(u, v) as a complex.js Complex
   * @example
   * ```ts
   * point().shift(1, 0).visibility(1e8, 0).arg(); // -2 pi 1e8 * 4.8481e-9 rad, wrapped: -3.0462
   * ```
   */
  visibility(u: number, v: number): Complex {
    const r = this.visibilities([u], [v]);
    return new Complex(r.re[0]!, r.im[0]!);
  }

  /**
   * Normalised complex visibilities at many points.
   * @param u - spatial frequencies east, cycles per radian
   * @param v - spatial frequencies north, cycles per radian (same length)
   * @param out - optional output columns to reuse (each of the input length; may alias u or v)
   * @returns `{ re, im }` (the `out` given, filled)
   */
  visibilities(u: ArrayLike<number>, v: ArrayLike<number>, out?: ComplexColumns): ComplexColumns {
    const fn = 'visibilities';
    const bu = boundedFrequencyColumn(u, fn, 'u');
    const bv = boundedFrequencyColumn(v, fn, 'v');
    let uu = bu.column;
    let vv = bv.column;
    const n = sameLength(fn, ['u', 'v'], [uu, vv]);
    const re = out ? checkOut(fn, out.re, n, 'out.re') : new Float64Array(n);
    const im = out ? checkOut(fn, out.im, n, 'out.im') : new Float64Array(n);
    uu = unalias(uu, [re, im]);
    vv = unalias(vv, [re, im]);
    runPlan(this.plan(), uu, vv, re, im, n, bu.maxAbs, bv.maxAbs);
    return out ?? { re, im };
  }

  /**
   * Squared visibility amplitudes |V|^2 (OIFITS VIS2DATA).
   * @param u - spatial frequencies east, cycles per radian
   * @param v - spatial frequencies north, cycles per radian
   * @param out - optional output of the input length
   */
  vis2(u: ArrayLike<number>, v: ArrayLike<number>, out?: Float64Array): Float64Array {
    const r = this.visibilities(u, v);
    const o = out ? checkOut('vis2', out, r.re.length, 'out') : r.re;
    for (let i = 0; i < r.re.length; i++) o[i] = r.re[i]! * r.re[i]! + r.im[i]! * r.im[i]!;
    return o;
  }

  /** Visibility amplitudes |V| (OIFITS VISAMP for a normalised visibility). */
  visamp(u: ArrayLike<number>, v: ArrayLike<number>, out?: Float64Array): Float64Array {
    const r = this.visibilities(u, v);
    const o = out ? checkOut('visamp', out, r.re.length, 'out') : r.re;
    for (let i = 0; i < r.re.length; i++) o[i] = Math.hypot(r.re[i]!, r.im[i]!);
    return o;
  }

  /** Visibility phases arg V in degrees, wrapped to (-180, 180] (OIFITS VISPHI). */
  visphi(u: ArrayLike<number>, v: ArrayLike<number>, out?: Float64Array): Float64Array {
    const r = this.visibilities(u, v);
    const o = out ? checkOut('visphi', out, r.re.length, 'out') : r.re;
    for (let i = 0; i < r.re.length; i++) o[i] = phaseDeg(r.im[i]!, r.re[i]!);
    return o;
  }

  /**
   * The bispectrum (triple product) V(u1, v1) V(u2, v2) V(-(u1+u2), -(v1+v2)) of each triangle, with the
   * baselines AB = (u1, v1) and BC = (u2, v2) as in OI_T3's U1COORD..V2COORD.
   * @param u1 - first baseline east, cycles per radian
   * @param v1 - first baseline north
   * @param u2 - second baseline east
   * @param v2 - second baseline north
   * @param out - optional output columns of the input length
   */
  bispectrum(
    u1: ArrayLike<number>,
    v1: ArrayLike<number>,
    u2: ArrayLike<number>,
    v2: ArrayLike<number>,
    out?: ComplexColumns,
  ): ComplexColumns {
    const fn = 'bispectrum';
    const ba = boundedFrequencyColumn(u1, fn, 'u1');
    const bb = boundedFrequencyColumn(v1, fn, 'v1');
    const bc = boundedFrequencyColumn(u2, fn, 'u2');
    const bd = boundedFrequencyColumn(v2, fn, 'v2');
    const a = ba.column;
    const b = bb.column;
    const c = bc.column;
    const d = bd.column;
    const n = sameLength(fn, ['u1', 'v1', 'u2', 'v2'], [a, b, c, d]);
    const re = out ? checkOut(fn, out.re, n, 'out.re') : new Float64Array(n);
    const im = out ? checkOut(fn, out.im, n, 'out.im') : new Float64Array(n);
    // in chunks that stay in the cache: each chunk's three baselines are copied into small columns, evaluated,
    // and multiplied into the outputs (every input entry is read before the output entry of the same index is
    // written, so outputs may alias inputs)
    const plan = this.plan();
    const chunk = Math.min(n, BISPECTRUM_CHUNK);
    const cu = new Float64Array(chunk);
    const cv = new Float64Array(chunk);
    const r1 = new Float64Array(chunk);
    const i1 = new Float64Array(chunk);
    const r2 = new Float64Array(chunk);
    const i2 = new Float64Array(chunk);
    const r3 = new Float64Array(chunk);
    const i3 = new Float64Array(chunk);
    for (let i0 = 0; i0 < n; i0 += chunk) {
      const m = Math.min(chunk, n - i0);
      for (let j = 0; j < m; j++) {
        cu[j] = a[i0 + j]!;
        cv[j] = b[i0 + j]!;
      }
      runPlan(plan, cu, cv, r1, i1, m, ba.maxAbs, bb.maxAbs);
      for (let j = 0; j < m; j++) {
        cu[j] = c[i0 + j]!;
        cv[j] = d[i0 + j]!;
      }
      runPlan(plan, cu, cv, r2, i2, m, bc.maxAbs, bd.maxAbs);
      for (let j = 0; j < m; j++) {
        cu[j] = -(a[i0 + j]! + c[i0 + j]!);
        cv[j] = -(b[i0 + j]! + d[i0 + j]!);
      }
      runPlan(plan, cu, cv, r3, i3, m, ba.maxAbs + bc.maxAbs, bb.maxAbs + bd.maxAbs);
      for (let j = 0; j < m; j++) {
        const xr = r1[j]! * r2[j]! - i1[j]! * i2[j]!;
        const xi = r1[j]! * i2[j]! + i1[j]! * r2[j]!;
        re[i0 + j] = xr * r3[j]! - xi * i3[j]!;
        im[i0 + j] = xr * i3[j]! + xi * r3[j]!;
      }
    }
    return out ?? { re, im };
  }

  /**
   * Closure phases (OIFITS T3PHI): the argument of the bispectrum in degrees, wrapped to (-180, 180].
   * @returns a Float64Array of the input length
   */
  closurePhase(
    u1: ArrayLike<number>,
    v1: ArrayLike<number>,
    u2: ArrayLike<number>,
    v2: ArrayLike<number>,
    out?: Float64Array,
  ): Float64Array {
    const t = this.bispectrum(u1, v1, u2, v2);
    const o = out ? checkOut('closurePhase', out, t.re.length, 'out') : t.re;
    for (let i = 0; i < t.re.length; i++) o[i] = phaseDeg(t.im[i]!, t.re[i]!);
    return o;
  }

  /** Triple-product amplitudes |T3| (OIFITS T3AMP). */
  t3amp(
    u1: ArrayLike<number>,
    v1: ArrayLike<number>,
    u2: ArrayLike<number>,
    v2: ArrayLike<number>,
    out?: Float64Array,
  ): Float64Array {
    const t = this.bispectrum(u1, v1, u2, v2);
    const o = out ? checkOut('t3amp', out, t.re.length, 'out') : t.re;
    for (let i = 0; i < t.re.length; i++) o[i] = Math.hypot(t.re[i]!, t.im[i]!);
    return o;
  }
}

/** Triangles per chunk of {@link Model.bispectrum} (its eight scratch columns take 64 kB). */
const BISPECTRUM_CHUNK = 1024;

/** atan2 in degrees wrapped to (-180, 180]: -180 maps to +180. */
function phaseDeg(y: number, x: number): number {
  const p = Math.atan2(y, x) * DEG_PER_RAD;
  return p <= -180 ? p + 360 : p;
}

// ---------- factories ----------

/**
 * A point source of flux 1 at the origin.
 * @returns a model with V = 1 everywhere
 * @example
 * ```ts
 * point().vis2([1e8], [0]); // Float64Array [1]
 * ```
 */
/* @__NO_SIDE_EFFECTS__ */
export function point(): Model {
  return new Model({ kind: 'point' });
}

/**
 * A uniform disk of flux 1 centred on the origin.
 * @param options - `diameter`: angular diameter in mas (>= 0)
 * @returns a model with V(q) = 2 J1(x)/x, x = pi * diameter * q
 *
 * Notes: first null at q * diameter = 1.21967 (the first zero of J1, 3.831706, over pi).
 * @example
 * ```ts
 * disk({ diameter: 2 }).vis2([1e8], [0]); // Float64Array [0.0766...]
 * ```
 */
/* @__NO_SIDE_EFFECTS__ */
export function disk(options: { readonly diameter: Slot }): Model {
  return new Model({ kind: 'disk', diameter: options?.diameter });
}

/**
 * A circular Gaussian of flux 1 centred on the origin.
 * @param options - `fwhm`: full width at half maximum in mas (>= 0; never sigma)
 * @returns a model with V(q) = exp(-(pi fwhm q)^2 / (4 ln 2))
 */
/* @__NO_SIDE_EFFECTS__ */
export function gaussian(options: { readonly fwhm: Slot }): Model {
  return new Model({ kind: 'gaussian', fwhm: options?.fwhm });
}

/**
 * An infinitely thin ring of flux 1 centred on the origin.
 * @param options - `diameter`: ring diameter in mas (>= 0)
 * @returns a model with V(q) = J0(pi * diameter * q)
 */
/* @__NO_SIDE_EFFECTS__ */
export function ring(options: { readonly diameter: Slot }): Model {
  return new Model({ kind: 'ring', diameter: options?.diameter });
}

/**
 * A uniform elliptical disk of flux 1 centred on the origin.
 * @param options - `major`, `minor`: full axis lengths in mas (0 <= minor <= major); `pa`: position angle of
 *   the major axis in degrees east of north
 * @returns the disk of diameter `major`, stretched by minor/major across the major axis and turned to `pa`
 */
/* @__NO_SIDE_EFFECTS__ */
export function ellipse(options: { readonly major: Slot; readonly minor: Slot; readonly pa: Slot }): Model {
  return new Model({ kind: 'ellipse', major: options?.major, minor: options?.minor, pa: options?.pa });
}

function checkModel(m: unknown, fn: string, where: string): Model {
  if (!(m instanceof Model)) {
    throw new ModelError(`${fn}: ${where} is not a uvsky Model (build one with point(), disk(), ...)`, {
      argument: where,
    });
  }
  return m;
}

/**
 * The sum of models: fluxes add, F = sum F_k.
 * @param models - one or more models
 * @returns a model whose normalised visibility is (sum F_k) / (sum of fluxes)
 */
/* @__NO_SIDE_EFFECTS__ */
export function sum(...models: Model[]): Model {
  if (models.length === 0) throw new ModelError('sum: give at least one model', { argument: 'models' });
  const nodes = models.map((m, i) => checkModel(m, 'sum', `models[${i}]`).node);
  return new Model({ kind: 'sum', of: nodes });
}

/**
 * The convolution of two models: F = F_a F_b (convolution theorem); the flux is the product of the fluxes.
 * @param a - first model
 * @param b - second model
 */
/* @__NO_SIDE_EFFECTS__ */
export function convolve(a: Model, b: Model): Model {
  return new Model({
    kind: 'convolve',
    of: [checkModel(a, 'convolve', 'a').node, checkModel(b, 'convolve', 'b').node],
  });
}
