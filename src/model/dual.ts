/**
 * Forward-mode dual scalars used while folding a model tree into its canonical form.
 *
 * A dual carries a value and, when the model has free parameters, the gradient of that value with respect to
 * the parameter vector (`g`, one entry per free parameter; `null` means a constant). Canonicalisation works on
 * a handful of numbers per term, so these small objects never appear in a per-point loop.
 *
 * @internal
 * @module
 */

/** A value with an optional gradient over the free parameters. */
export interface Dual {
  readonly v: number;
  readonly g: Float64Array | null;
}

/** A constant (no gradient). */
export function constant(v: number): Dual {
  return { v, g: null };
}

function combine(
  ga: Float64Array | null,
  ca: number,
  gb: Float64Array | null,
  cb: number,
): Float64Array | null {
  if (ga === null && gb === null) return null;
  const n = (ga ?? gb)!.length;
  const out = new Float64Array(n);
  if (ga !== null && ca !== 0) for (let i = 0; i < n; i++) out[i] = ca * ga[i]!;
  if (gb !== null && cb !== 0) for (let i = 0; i < n; i++) out[i] = out[i]! + cb * gb[i]!;
  return out;
}

/** a + b */
export function add(a: Dual, b: Dual): Dual {
  return { v: a.v + b.v, g: combine(a.g, 1, b.g, 1) };
}

/** a - b */
export function sub(a: Dual, b: Dual): Dual {
  return { v: a.v - b.v, g: combine(a.g, 1, b.g, -1) };
}

/** a * b */
export function mul(a: Dual, b: Dual): Dual {
  return { v: a.v * b.v, g: combine(a.g, b.v, b.g, a.v) };
}

/** a * c for a plain number c */
export function scale(a: Dual, c: number): Dual {
  return { v: a.v * c, g: combine(a.g, c, null, 0) };
}

/** f(a) given f(a.v) and f'(a.v) */
export function apply(a: Dual, value: number, derivative: number): Dual {
  return { v: value, g: combine(a.g, derivative, null, 0) };
}

/** cos of an angle in degrees */
export function cosDeg(a: Dual): Dual {
  const r = (a.v * Math.PI) / 180;
  return apply(a, Math.cos(r), (-Math.sin(r) * Math.PI) / 180);
}

/** sin of an angle in degrees */
export function sinDeg(a: Dual): Dual {
  const r = (a.v * Math.PI) / 180;
  return apply(a, Math.sin(r), (Math.cos(r) * Math.PI) / 180);
}

/** A 2x2 matrix in row-major order [m11, m12, m21, m22]. */
export type Mat2 = readonly [Dual, Dual, Dual, Dual];

/** The product B A of two 2x2 matrices. */
export function matMul(b: Mat2, a: Mat2): Mat2 {
  return [
    add(mul(b[0], a[0]), mul(b[1], a[2])),
    add(mul(b[0], a[1]), mul(b[1], a[3])),
    add(mul(b[2], a[0]), mul(b[3], a[2])),
    add(mul(b[2], a[1]), mul(b[3], a[3])),
  ];
}

/** The product B x of a 2x2 matrix and a vector. */
export function matVec(b: Mat2, x: readonly [Dual, Dual]): [Dual, Dual] {
  return [add(mul(b[0], x[0]), mul(b[1], x[1])), add(mul(b[2], x[0]), mul(b[3], x[1]))];
}
