/**
 * Analytic Jacobians of every observable with respect to a model's free parameters.
 *
 * The model is folded into its canonical form with forward-mode dual numbers, so every term's flux, shift,
 * linear maps and shape parameters carry their gradients over the free parameters. Per point, each factor's
 * kernel gives its value and slope; the chain rule then runs through the quadratic form |A^T q|^2 (linear maps),
 * the phase ramp (shifts) and the normalisation by the total flux (weights).
 *
 * @module
 */
import { Matrix } from 'ml-matrix';
import { InputError, ModelError } from '../errors.js';
import { besselJ0, besselJ1, diskAmplitude } from '../kernels/bessel.js';
import {
  gaussianDerivatives,
  j2OverX2,
  type RadialDerivativeKernel,
  thinRingDerivatives,
  uniformDiskDerivatives,
} from '../kernels/derivatives.js';
import { SIN_COS, sinCosTurns } from '../kernels/sincos.js';
import { GAUSS_K } from '../kernels/terms.js';
import { canonicalise, type DualTerm, FACTOR_KINDS, type FactorKind } from '../model/canonical.js';
import type { Dual } from '../model/dual.js';
import type { Model } from '../model/model.js';
import { ZERO_FLUX_FRACTION } from '../model/plan.js';
import { DEG_PER_RAD, RAD_PER_MAS } from '../units/index.js';
import { parameterVector } from './parameters.js';

/** Value-and-slope kernels of the factor kinds that have analytic Jacobians. */
const DERIVATIVE_KERNELS: Partial<Record<FactorKind, RadialDerivativeKernel>> = {
  uniformDisk: uniformDiskDerivatives,
  gaussian: gaussianDerivatives,
  thinRing: thinRingDerivatives,
};

/**
 * Registers the value-and-slope kernel of a radial factor kind (used by component modules).
 * @internal
 */
export function registerDerivativeKernel(kind: FactorKind, kernel: RadialDerivativeKernel): void {
  DERIVATIVE_KERNELS[kind] = kernel;
}

const TWO_PI = 2 * Math.PI;
const RAD2 = RAD_PER_MAS * RAD_PER_MAS;

/** Names of the observables that have Jacobians. */
export type ObservableName =
  | 'visre'
  | 'visim'
  | 'vis2'
  | 'visamp'
  | 'visphi'
  | 't3phi'
  | 't3amp'
  | 't3re'
  | 't3im';

/** An observable's values at a set of points and its Jacobian with respect to the free parameters. */
export interface ObservableJacobian {
  /** Which observable. */
  readonly observable: ObservableName;
  /** Names of the free parameters, one per column (the order of `model.parameters()`). */
  readonly parameters: readonly string[];
  /** Number of rows (points or triangles). */
  readonly rows: number;
  /** Number of columns (free parameters). */
  readonly cols: number;
  /** Observable values, one per row (phases in degrees, wrapped to (-180, 180]). */
  readonly values: Float64Array;
  /** d value / d parameter, row-major: `jacobian[row * cols + col]` (phases in degrees per parameter unit). */
  readonly jacobian: Float64Array;
}

/** Buffers that {@link visibilityJacobian} may fill instead of allocating. */
export interface JacobianBuffers {
  readonly re?: Float64Array;
  readonly im?: Float64Array;
  readonly dre?: Float64Array;
  readonly dim?: Float64Array;
}

/** The complex visibility and its Jacobian at a set of points. */
export interface VisibilityJacobian {
  readonly parameters: readonly string[];
  readonly rows: number;
  readonly cols: number;
  /** Normalised visibility, real and imaginary parts. */
  readonly re: Float64Array;
  readonly im: Float64Array;
  /** d re / d p and d im / d p, row-major rows x cols. */
  readonly dre: Float64Array;
  readonly dim: Float64Array;
}

/** One canonical term flattened for the per-point loop. */
interface JTerm {
  readonly flux: number;
  readonly e0: number;
  readonly n0: number;
  /** Number of factors. */
  readonly nf: number;
  /** Per factor: kernel code (-1 = use `kernels[f]`), and M = A A^T in rad^2. */
  readonly codes: Int32Array;
  readonly kernels: readonly RadialDerivativeKernel[];
  readonly m: Float64Array; // 3 per factor
  readonly shapes: readonly Float64Array[];
  /** Offsets of each factor's shape slopes in the per-point slope buffer. */
  readonly shapeOffsets: Int32Array;
  /** Free parameters that move this term (column indices). */
  readonly idx: Int32Array;
  /**
   * Per active parameter, `stride` coefficients: d flux, d east (rad), d north (rad), then per factor dM (3, rad^2),
   * then d shape for every shape entry of every factor.
   */
  readonly coef: Float64Array;
  readonly stride: number;
  /** Total number of shape entries over the factors. */
  readonly nShape: number;
}

interface JPlan {
  readonly cols: number;
  readonly terms: readonly JTerm[];
  readonly total: number;
  readonly dtotal: Float64Array;
  readonly maxFactors: number;
  readonly maxShapes: number;
}

const CODE_DISK = 0;
const CODE_GAUSS = 1;
const CODE_RING = 2;
const CODE_OTHER = -1;

function gradOf(d: Dual, j: number): number {
  return d.g === null ? 0 : d.g[j]!;
}

function compileJacobianPlan(terms: readonly DualTerm[], cols: number, path: string): JPlan {
  let total = 0;
  let absTotal = 0;
  const dtotal = new Float64Array(cols);
  const out: JTerm[] = [];
  let maxFactors = 0;
  let maxShapes = 0;
  for (const t of terms) {
    total += t.flux.v;
    absTotal += Math.abs(t.flux.v);
    if (t.flux.g) for (let j = 0; j < cols; j++) dtotal[j] = dtotal[j]! + t.flux.g[j]!;
    const nf = t.factors.length;
    maxFactors = Math.max(maxFactors, nf);
    const codes = new Int32Array(nf);
    const kernels: RadialDerivativeKernel[] = [];
    const m = new Float64Array(3 * nf);
    const shapes: Float64Array[] = [];
    const shapeOffsets = new Int32Array(nf);
    let nShape = 0;
    t.factors.forEach((f, k) => {
      const kernel = DERIVATIVE_KERNELS[f.kind];
      if (kernel === undefined || FACTOR_KINDS[f.kind]?.radial !== true) {
        throw new ModelError(`${path}: factor kind '${f.kind}' has no analytic Jacobian yet`, {
          modelPath: path,
        });
      }
      kernels.push(kernel);
      codes[k] =
        kernel === uniformDiskDerivatives
          ? CODE_DISK
          : kernel === gaussianDerivatives
            ? CODE_GAUSS
            : kernel === thinRingDerivatives
              ? CODE_RING
              : CODE_OTHER;
      const [a11, a12, a21, a22] = f.a;
      m[3 * k] = (a11.v * a11.v + a12.v * a12.v) * RAD2;
      m[3 * k + 1] = (a11.v * a21.v + a12.v * a22.v) * RAD2;
      m[3 * k + 2] = (a21.v * a21.v + a22.v * a22.v) * RAD2;
      shapes.push(Float64Array.from(f.shape, (x) => x.v));
      shapeOffsets[k] = nShape;
      nShape += f.shape.length;
    });
    maxShapes = Math.max(maxShapes, nShape);
    const stride = 3 + 3 * nf + nShape;
    const idx: number[] = [];
    const coef: number[] = [];
    for (let j = 0; j < cols; j++) {
      const row = new Array<number>(stride).fill(0);
      row[0] = gradOf(t.flux, j);
      row[1] = gradOf(t.east, j) * RAD_PER_MAS;
      row[2] = gradOf(t.north, j) * RAD_PER_MAS;
      t.factors.forEach((f, k) => {
        const [a11, a12, a21, a22] = f.a;
        const g11 = gradOf(a11, j);
        const g12 = gradOf(a12, j);
        const g21 = gradOf(a21, j);
        const g22 = gradOf(a22, j);
        // M = A A^T: m11 = a11^2 + a12^2, m12 = a11 a21 + a12 a22, m22 = a21^2 + a22^2
        row[3 + 3 * k] = 2 * (a11.v * g11 + a12.v * g12) * RAD2;
        row[4 + 3 * k] = (g11 * a21.v + a11.v * g21 + g12 * a22.v + a12.v * g22) * RAD2;
        row[5 + 3 * k] = 2 * (a21.v * g21 + a22.v * g22) * RAD2;
        f.shape.forEach((sh, q) => {
          row[3 + 3 * nf + shapeOffsets[k]! + q] = gradOf(sh, j);
        });
      });
      if (row.some((x) => x !== 0)) {
        idx.push(j);
        coef.push(...row);
      }
    }
    out.push({
      flux: t.flux.v,
      e0: t.east.v * RAD_PER_MAS,
      n0: t.north.v * RAD_PER_MAS,
      nf,
      codes,
      kernels,
      m,
      shapes,
      shapeOffsets,
      idx: Int32Array.from(idx),
      coef: Float64Array.from(coef),
      stride,
      nShape,
    });
  }
  if (!(Math.abs(total) >= ZERO_FLUX_FRACTION * absTotal) || absTotal === 0) {
    throw new ModelError(
      `${path}: the total flux is ${total} (sum of |flux| ${absTotal}), so visibilities cannot be normalised; ` +
        `give the model a total flux whose magnitude is at least ${ZERO_FLUX_FRACTION} of the sum of |flux|`,
      { modelPath: path },
    );
  }
  return { cols, terms: out, total, dtotal, maxFactors, maxShapes };
}

function toColumn(x: ArrayLike<number>, fn: string, name: string): Float64Array {
  const a = x instanceof Float64Array ? x : Float64Array.from(x);
  for (let i = 0; i < a.length; i++) {
    const t = a[i]!;
    if (t - t !== 0) {
      throw new InputError(
        `${fn}: ${name}[${i}] is ${t}; spatial frequencies must be finite numbers in cycles per radian`,
        {
          argument: name,
          index: i,
        },
      );
    }
  }
  return a;
}

const PI2 = Math.PI * Math.PI;

function runJacobian(
  plan: JPlan,
  u: Float64Array,
  v: Float64Array,
  re: Float64Array,
  im: Float64Array,
  dre: Float64Array,
  dim: Float64Array,
): void {
  const n = u.length;
  const cols = plan.cols;
  const kout = new Float64Array(2 + plan.maxShapes);
  const pv = new Float64Array(plan.maxFactors);
  const gv = new Float64Array(plan.maxFactors);
  const others = new Float64Array(plan.maxFactors);
  const sv = new Float64Array(Math.max(1, plan.maxShapes));
  const dfr = new Float64Array(cols);
  const dfi = new Float64Array(cols);
  const invTot = 1 / plan.total;
  const terms = plan.terms;
  const nt = terms.length;
  for (let i = 0; i < n; i++) {
    const uu = u[i]!;
    const vv = v[i]!;
    const u2 = uu * uu;
    const uv2 = 2 * uu * vv;
    const v2 = vv * vv;
    let fre = 0;
    let fim = 0;
    for (let k = 0; k < nt; k++) {
      const t = terms[k]!;
      const nf = t.nf;
      const m = t.m;
      let prod = 1;
      for (let f = 0; f < nf; f++) {
        const r2raw = m[3 * f]! * u2 + m[3 * f + 1]! * uv2 + m[3 * f + 2]! * v2;
        const r2 = r2raw > 0 ? r2raw : 0;
        let p: number;
        let g: number;
        switch (t.codes[f]) {
          case CODE_DISK: {
            const x = Math.PI * Math.sqrt(r2);
            if (x < 2) {
              p = diskAmplitude(x);
              g = -PI2 * j2OverX2(x);
            } else {
              // one J0 and one J1: P = 2 J1/x and J2/x^2 = (P - J0)/x^2 (A&S 9.1.27), little cancellation for x >= 2
              p = (2 * besselJ1(x)) / x;
              g = (-PI2 * (p - besselJ0(x))) / (x * x);
            }
            break;
          }
          case CODE_GAUSS:
            p = Math.exp(-GAUSS_K * r2);
            g = -GAUSS_K * p;
            break;
          case CODE_RING: {
            const x = Math.PI * Math.sqrt(r2);
            p = besselJ0(x);
            g = -(PI2 / 4) * diskAmplitude(x);
            break;
          }
          default: {
            const sh = t.shapes[f]!;
            t.kernels[f]!(r2, sh, kout);
            p = kout[0]!;
            g = kout[1]!;
            const off = t.shapeOffsets[f]!;
            for (let q = 0; q < sh.length; q++) sv[off + q] = kout[2 + q]!;
          }
        }
        pv[f] = p;
        gv[f] = g;
        prod *= p;
      }
      let c = 1;
      let s = 0;
      if (t.e0 !== 0 || t.n0 !== 0) {
        sinCosTurns(uu * t.e0 + vv * t.n0);
        c = SIN_COS[1]!;
        s = -SIN_COS[0]!;
      }
      const flux = t.flux;
      const tre = flux * prod * c;
      const tim = flux * prod * s;
      fre += tre;
      fim += tim;
      if (t.idx.length === 0) continue;
      // flux * (product of the other factors), per factor
      if (nf === 1) others[0] = flux;
      else {
        for (let f = 0; f < nf; f++) {
          let o = flux;
          for (let h = 0; h < nf; h++) if (h !== f) o *= pv[h]!;
          others[f] = o;
        }
      }
      const idx = t.idx;
      const coef = t.coef;
      const stride = t.stride;
      const shapeBase = 3 + 3 * nf;
      for (let a = 0; a < idx.length; a++) {
        const j = idx[a]!;
        const o = a * stride;
        // real-amplitude part: d flux * prod + sum over factors of flux * others * (G dr2 + dP/dshape dshape)
        let w = coef[o]! * prod;
        for (let f = 0; f < nf; f++) {
          const dr2 = coef[o + 3 + 3 * f]! * u2 + coef[o + 4 + 3 * f]! * uv2 + coef[o + 5 + 3 * f]! * v2;
          w += others[f]! * gv[f]! * dr2;
        }
        if (t.nShape > 0) {
          for (let f = 0; f < nf; f++) {
            const ns = t.shapes[f]!.length;
            const off = t.shapeOffsets[f]!;
            for (let q = 0; q < ns; q++) w += others[f]! * sv[off + q]! * coef[o + shapeBase + off + q]!;
          }
        }
        // phase part: d/dp exp(-2 pi i q.x) = -2 pi i (u dx + v dy) exp(...)
        const ws = TWO_PI * (uu * coef[o + 1]! + vv * coef[o + 2]!);
        dfr[j] = dfr[j]! + w * c + ws * tim;
        dfi[j] = dfi[j]! + w * s - ws * tre;
      }
    }
    // normalise: V = F / T, dV = (dF - V dT) / T
    const vre = fre * invTot;
    const vim = fim * invTot;
    re[i] = vre;
    im[i] = vim;
    const row = i * cols;
    for (let j = 0; j < cols; j++) {
      const dt = plan.dtotal[j]!;
      dre[row + j] = (dfr[j]! - vre * dt) * invTot;
      dim[row + j] = (dfi[j]! - vim * dt) * invTot;
      dfr[j] = 0;
      dfi[j] = 0;
    }
  }
}

function prepare(
  model: Model,
  values: ArrayLike<number> | Readonly<Record<string, number>> | undefined,
): JPlan {
  const names = model.parameters();
  const vec = parameterVector(model, values);
  const index = new Map(names.map((n, i) => [n, i] as const));
  const terms = canonicalise(model.node, { index, values: vec, gradients: true });
  return compileJacobianPlan(terms, names.length, model.node.kind);
}

/**
 * The normalised complex visibility and its Jacobian with respect to the free parameters.
 *
 * @param model - a model with free parameters (`param(...)` in its slots)
 * @param u - spatial frequencies east, cycles per radian
 * @param v - spatial frequencies north, cycles per radian
 * @param values - optional parameter values (array in the order of `model.parameters()` or a record); default:
 *   the parameters' current values
 * @param out - optional buffers to fill instead of allocating (`re`, `im` of length n; `dre`, `dim` of n x cols);
 *   they must not alias `u` or `v`
 * @returns values and row-major Jacobians of the real and imaginary parts
 *
 * Notes: exact derivatives (no finite differences): every factor's kernel supplies P and dP/d|A^T q|^2, shifts
 * contribute -2 pi i q.dx, and the normalisation by the total flux gives dV = (dF - V dF(0)) / F(0).
 * @example
 * ```ts
 * const m = disk({ diameter: param('d', 2) });
 * visibilityJacobian(m, [5e7], [0]).dre[0]; // dRe V / d diameter at q = 5e7, per mas
 * ```
 */
export function visibilityJacobian(
  model: Model,
  u: ArrayLike<number>,
  v: ArrayLike<number>,
  values?: ArrayLike<number> | Readonly<Record<string, number>>,
  out?: JacobianBuffers,
): VisibilityJacobian {
  const fn = 'visibilityJacobian';
  const uu = toColumn(u, fn, 'u');
  const vv = toColumn(v, fn, 'v');
  if (uu.length !== vv.length) {
    throw new InputError(
      `${fn}: u has ${uu.length} entries but v has ${vv.length}; give arrays of equal length`,
      {
        argument: 'v',
      },
    );
  }
  const plan = prepare(model, values);
  const n = uu.length;
  const cols = plan.cols;
  const buf = (b: Float64Array | undefined, len: number, name: string): Float64Array => {
    if (b === undefined) return new Float64Array(len);
    if (!(b instanceof Float64Array) || b.length !== len) {
      throw new InputError(`${fn}: out.${name} must be a Float64Array of length ${len}`, {
        argument: `out.${name}`,
      });
    }
    return b;
  };
  const re = buf(out?.re, n, 're');
  const im = buf(out?.im, n, 'im');
  const dre = buf(out?.dre, n * cols, 'dre');
  const dim = buf(out?.dim, n * cols, 'dim');
  runJacobian(plan, uu, vv, re, im, dre, dim);
  return { parameters: model.parameters(), rows: n, cols, re, im, dre, dim };
}

function wrapDeg(p: number): number {
  return p <= -180 ? p + 360 : p;
}

/** Points of a request: baselines for VIS-type observables, triangles for T3-type ones. */
export type JacobianPoints =
  | { readonly u: ArrayLike<number>; readonly v: ArrayLike<number> }
  | {
      readonly u1: ArrayLike<number>;
      readonly v1: ArrayLike<number>;
      readonly u2: ArrayLike<number>;
      readonly v2: ArrayLike<number>;
    };

/**
 * An observable and its Jacobian with respect to the free parameters.
 *
 * @param model - a model with free parameters
 * @param observable - 'visre', 'visim', 'vis2', 'visamp', 'visphi' (degrees) at `{ u, v }`; or 't3re', 't3im',
 *   't3amp', 't3phi' (degrees) at triangles `{ u1, v1, u2, v2 }` (OI_T3 convention, third baseline -(1+2))
 * @param points - spatial frequencies in cycles per radian
 * @param values - optional parameter values (array or record); default: current values
 * @returns values and the row-major Jacobian (`rows` x `cols`)
 *
 * Notes: VIS2 = |V|^2 so dVIS2 = 2 (re dre + im dim); VISAMP = |V|, dVISAMP = (re dre + im dim)/|V|; phases use
 * d arg z = (re dim - im dre)/|z|^2 in degrees. Where |V| = 0 exactly the amplitude and phase are not
 * differentiable; their rows are 0 there. The bispectrum's derivative is the product rule over its three
 * visibilities.
 * @example
 * ```ts
 * const m = disk({ diameter: param('d', 2) });
 * const j = observableJacobian(m, 'vis2', { u: [5e7], v: [0] });
 * j.jacobian[0]; // dV^2 / d diameter, per mas (negative: a bigger disk is more resolved)
 * ```
 */
export function observableJacobian(
  model: Model,
  observable: ObservableName,
  points: JacobianPoints,
  values?: ArrayLike<number> | Readonly<Record<string, number>>,
): ObservableJacobian {
  const names = model.parameters();
  const cols = names.length;
  if ('u' in points) {
    if (!['visre', 'visim', 'vis2', 'visamp', 'visphi'].includes(observable)) {
      throw new InputError(
        `observableJacobian: '${observable}' needs triangles { u1, v1, u2, v2 }; with { u, v } use visre, visim, vis2, visamp or visphi`,
        { argument: 'observable' },
      );
    }
    const j = visibilityJacobian(model, points.u, points.v, values);
    const n = j.rows;
    const out = new Float64Array(n);
    const jac = new Float64Array(n * cols);
    for (let i = 0; i < n; i++) {
      const re = j.re[i]!;
      const im = j.im[i]!;
      const a2 = re * re + im * im;
      const a = Math.sqrt(a2);
      for (let k = 0; k < cols; k++) {
        const dr = j.dre[i * cols + k]!;
        const di = j.dim[i * cols + k]!;
        let d: number;
        switch (observable) {
          case 'visre':
            d = dr;
            break;
          case 'visim':
            d = di;
            break;
          case 'vis2':
            d = 2 * (re * dr + im * di);
            break;
          case 'visamp':
            d = a > 0 ? (re * dr + im * di) / a : 0;
            break;
          default:
            d = a2 > 0 ? ((re * di - im * dr) / a2) * DEG_PER_RAD : 0;
        }
        jac[i * cols + k] = d;
      }
      out[i] =
        observable === 'visre'
          ? re
          : observable === 'visim'
            ? im
            : observable === 'vis2'
              ? a2
              : observable === 'visamp'
                ? a
                : wrapDeg(Math.atan2(im, re) * DEG_PER_RAD);
    }
    return { observable, parameters: names, rows: n, cols, values: out, jacobian: jac };
  }
  if (!['t3re', 't3im', 't3amp', 't3phi'].includes(observable)) {
    throw new InputError(
      `observableJacobian: '${observable}' needs baselines { u, v }; with triangles use t3re, t3im, t3amp or t3phi`,
      { argument: 'observable' },
    );
  }
  const fn = 'observableJacobian';
  const u1 = toColumn(points.u1, fn, 'u1');
  const v1 = toColumn(points.v1, fn, 'v1');
  const u2 = toColumn(points.u2, fn, 'u2');
  const v2 = toColumn(points.v2, fn, 'v2');
  const n = u1.length;
  for (const [name, a] of [
    ['v1', v1],
    ['u2', u2],
    ['v2', v2],
  ] as const) {
    if (a.length !== n) {
      throw new InputError(
        `${fn}: u1 has ${n} entries but ${name} has ${a.length}; give arrays of equal length`,
        {
          argument: name,
        },
      );
    }
  }
  // all three baselines in one pass: [AB, BC, CA = -(AB + BC)]
  const uu = new Float64Array(3 * n);
  const vv = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) {
    uu[i] = u1[i]!;
    vv[i] = v1[i]!;
    uu[n + i] = u2[i]!;
    vv[n + i] = v2[i]!;
    uu[2 * n + i] = -(u1[i]! + u2[i]!);
    vv[2 * n + i] = -(v1[i]! + v2[i]!);
  }
  const j = visibilityJacobian(model, uu, vv, values);
  const out = new Float64Array(n);
  const jac = new Float64Array(n * cols);
  for (let i = 0; i < n; i++) {
    const ar = j.re[i]!;
    const ai = j.im[i]!;
    const br = j.re[n + i]!;
    const bi = j.im[n + i]!;
    const cr = j.re[2 * n + i]!;
    const ci = j.im[2 * n + i]!;
    // products of pairs
    const abr = ar * br - ai * bi;
    const abi = ar * bi + ai * br;
    const bcr = br * cr - bi * ci;
    const bci = br * ci + bi * cr;
    const acr = ar * cr - ai * ci;
    const aci = ar * ci + ai * cr;
    const tr = abr * cr - abi * ci;
    const ti = abr * ci + abi * cr;
    const t2 = tr * tr + ti * ti;
    const ta = Math.sqrt(t2);
    for (let k = 0; k < cols; k++) {
      const dar = j.dre[i * cols + k]!;
      const dai = j.dim[i * cols + k]!;
      const dbr = j.dre[(n + i) * cols + k]!;
      const dbi = j.dim[(n + i) * cols + k]!;
      const dcr = j.dre[(2 * n + i) * cols + k]!;
      const dci = j.dim[(2 * n + i) * cols + k]!;
      // dT = dA (BC) + dB (AC) + dC (AB)
      const dtr = dar * bcr - dai * bci + (dbr * acr - dbi * aci) + (dcr * abr - dci * abi);
      const dti = dar * bci + dai * bcr + (dbr * aci + dbi * acr) + (dcr * abi + dci * abr);
      let d: number;
      switch (observable) {
        case 't3re':
          d = dtr;
          break;
        case 't3im':
          d = dti;
          break;
        case 't3amp':
          d = ta > 0 ? (tr * dtr + ti * dti) / ta : 0;
          break;
        default:
          d = t2 > 0 ? ((tr * dti - ti * dtr) / t2) * DEG_PER_RAD : 0;
      }
      jac[i * cols + k] = d;
    }
    out[i] =
      observable === 't3re'
        ? tr
        : observable === 't3im'
          ? ti
          : observable === 't3amp'
            ? ta
            : wrapDeg(Math.atan2(ti, tr) * DEG_PER_RAD);
  }
  return { observable, parameters: names, rows: n, cols, values: out, jacobian: jac };
}

/**
 * The Jacobian as an ml-matrix `Matrix` (rows x cols), for linear algebra.
 * @param j - a result of {@link observableJacobian}
 * @returns a new Matrix holding a copy of the entries
 */
export function jacobianMatrix(j: ObservableJacobian): Matrix {
  const m = new Matrix(j.rows, j.cols);
  for (let r = 0; r < j.rows; r++) for (let c = 0; c < j.cols; c++) m.set(r, c, j.jacobian[r * j.cols + c]!);
  return m;
}
