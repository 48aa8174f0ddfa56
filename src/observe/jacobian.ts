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
import {
  gaussianDerivatives,
  type RadialDerivativeKernel,
  thinRingDerivatives,
  uniformDiskDerivatives,
} from '../kernels/derivatives.js';
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

interface SparseGrad {
  readonly idx: Int32Array;
  readonly val: Float64Array;
}

function sparse(d: Dual, factor: number): SparseGrad {
  if (d.g === null) return { idx: new Int32Array(0), val: new Float64Array(0) };
  const idx: number[] = [];
  const val: number[] = [];
  for (let j = 0; j < d.g.length; j++) {
    if (d.g[j] !== 0) {
      idx.push(j);
      val.push(d.g[j]! * factor);
    }
  }
  return { idx: Int32Array.from(idx), val: Float64Array.from(val) };
}

interface JFactor {
  readonly kernel: RadialDerivativeKernel;
  readonly m11: number;
  readonly m12: number;
  readonly m22: number;
  readonly shape: Float64Array;
  /** Parameters that change M, with dM entries (rad^2). */
  readonly mIdx: Int32Array;
  readonly dm11: Float64Array;
  readonly dm12: Float64Array;
  readonly dm22: Float64Array;
  /** Per shape entry k: its sparse gradient. */
  readonly shapeGrads: readonly SparseGrad[];
}

interface JTerm {
  readonly flux: number;
  readonly e0: number;
  readonly n0: number;
  readonly dflux: SparseGrad;
  /** Shift gradients in radians; union index set. */
  readonly sIdx: Int32Array;
  readonly de: Float64Array;
  readonly dn: Float64Array;
  readonly factors: readonly JFactor[];
}

interface JPlan {
  readonly cols: number;
  readonly terms: readonly JTerm[];
  readonly total: number;
  readonly dtotal: Float64Array;
  readonly maxShape: number;
}

function gradOf(d: Dual, j: number): number {
  return d.g === null ? 0 : d.g[j]!;
}

function compileJacobianPlan(terms: readonly DualTerm[], cols: number, path: string): JPlan {
  let total = 0;
  let absTotal = 0;
  const dtotal = new Float64Array(cols);
  const out: JTerm[] = [];
  let maxShape = 0;
  for (const t of terms) {
    total += t.flux.v;
    absTotal += Math.abs(t.flux.v);
    if (t.flux.g) for (let j = 0; j < cols; j++) dtotal[j] = dtotal[j]! + t.flux.g[j]!;
    const sIdx: number[] = [];
    const de: number[] = [];
    const dn: number[] = [];
    for (let j = 0; j < cols; j++) {
      const a = gradOf(t.east, j);
      const b = gradOf(t.north, j);
      if (a !== 0 || b !== 0) {
        sIdx.push(j);
        de.push(a * RAD_PER_MAS);
        dn.push(b * RAD_PER_MAS);
      }
    }
    const factors = t.factors.map((f): JFactor => {
      const kernel = DERIVATIVE_KERNELS[f.kind];
      if (kernel === undefined || !FACTOR_KINDS[f.kind].radial) {
        throw new ModelError(`${path}: factor kind '${f.kind}' has no analytic Jacobian yet`, {
          modelPath: path,
        });
      }
      const [a11, a12, a21, a22] = f.a;
      const mIdx: number[] = [];
      const dm11: number[] = [];
      const dm12: number[] = [];
      const dm22: number[] = [];
      for (let j = 0; j < cols; j++) {
        const g11 = gradOf(a11, j);
        const g12 = gradOf(a12, j);
        const g21 = gradOf(a21, j);
        const g22 = gradOf(a22, j);
        if (g11 === 0 && g12 === 0 && g21 === 0 && g22 === 0) continue;
        // M = A A^T: m11 = a11^2 + a12^2, m12 = a11 a21 + a12 a22, m22 = a21^2 + a22^2
        mIdx.push(j);
        dm11.push(2 * (a11.v * g11 + a12.v * g12) * RAD2);
        dm12.push((g11 * a21.v + a11.v * g21 + g12 * a22.v + a12.v * g22) * RAD2);
        dm22.push(2 * (a21.v * g21 + a22.v * g22) * RAD2);
      }
      maxShape = Math.max(maxShape, f.shape.length);
      return {
        kernel,
        m11: (a11.v * a11.v + a12.v * a12.v) * RAD2,
        m12: (a11.v * a21.v + a12.v * a22.v) * RAD2,
        m22: (a21.v * a21.v + a22.v * a22.v) * RAD2,
        shape: Float64Array.from(f.shape, (s) => s.v),
        mIdx: Int32Array.from(mIdx),
        dm11: Float64Array.from(dm11),
        dm12: Float64Array.from(dm12),
        dm22: Float64Array.from(dm22),
        shapeGrads: f.shape.map((s) => sparse(s, 1)),
      };
    });
    out.push({
      flux: t.flux.v,
      e0: t.east.v * RAD_PER_MAS,
      n0: t.north.v * RAD_PER_MAS,
      dflux: sparse(t.flux, 1),
      sIdx: Int32Array.from(sIdx),
      de: Float64Array.from(de),
      dn: Float64Array.from(dn),
      factors,
    });
  }
  if (!(Math.abs(total) >= ZERO_FLUX_FRACTION * absTotal) || absTotal === 0) {
    throw new ModelError(
      `${path}: the total flux is ${total} (sum of |flux| ${absTotal}), so visibilities cannot be normalised; ` +
        `give the model a total flux whose magnitude is at least ${ZERO_FLUX_FRACTION} of the sum of |flux|`,
      { modelPath: path },
    );
  }
  return { cols, terms: out, total, dtotal, maxShape };
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
  const kout = new Float64Array(2 + plan.maxShape);
  let pv = new Float64Array(4);
  let gv = new Float64Array(4);
  let sv = new Float64Array(4 * (plan.maxShape || 1));
  const invTot = 1 / plan.total;
  for (let i = 0; i < n; i++) {
    const uu = u[i]!;
    const vv = v[i]!;
    const row = i * cols;
    let fre = 0;
    let fim = 0;
    for (const t of plan.terms) {
      const nf = t.factors.length;
      if (pv.length < nf) {
        pv = new Float64Array(nf);
        gv = new Float64Array(nf);
        sv = new Float64Array(nf * (plan.maxShape || 1));
      }
      let prod = 1;
      for (let f = 0; f < nf; f++) {
        const fac = t.factors[f]!;
        const r2 = fac.m11 * uu * uu + 2 * fac.m12 * uu * vv + fac.m22 * vv * vv;
        fac.kernel(r2, fac.shape, kout);
        pv[f] = kout[0]!;
        gv[f] = kout[1]!;
        for (let k = 0; k < fac.shape.length; k++) sv[f * plan.maxShape + k] = kout[2 + k]!;
        prod *= kout[0]!;
      }
      let c = 1;
      let s = 0;
      if (t.e0 !== 0 || t.n0 !== 0) {
        let ph = uu * t.e0 + vv * t.n0;
        ph -= Math.round(ph);
        c = Math.cos(TWO_PI * ph);
        s = -Math.sin(TWO_PI * ph);
      }
      // term = flux * prod * (c + i s)
      const tre = t.flux * prod * c;
      const tim = t.flux * prod * s;
      fre += tre;
      fim += tim;
      // flux gradients
      const df = t.dflux;
      for (let k = 0; k < df.idx.length; k++) {
        const j = row + df.idx[k]!;
        const w = df.val[k]! * prod;
        dre[j] = dre[j]! + w * c;
        dim[j] = dim[j]! + w * s;
      }
      // shift gradients: d/dp exp(-2 pi i q.x) = -2 pi i (u dx + v dy) exp(...)
      for (let k = 0; k < t.sIdx.length; k++) {
        const j = row + t.sIdx[k]!;
        const w = TWO_PI * (uu * t.de[k]! + vv * t.dn[k]!);
        dre[j] = dre[j]! + w * tim;
        dim[j] = dim[j]! - w * tre;
      }
      // factor gradients through M and shape
      for (let f = 0; f < nf; f++) {
        const fac = t.factors[f]!;
        let others = 1;
        for (let g = 0; g < nf; g++) if (g !== f) others *= pv[g]!;
        const base = t.flux * others;
        const gr = base * gv[f]!;
        for (let k = 0; k < fac.mIdx.length; k++) {
          const j = row + fac.mIdx[k]!;
          const dr2 = fac.dm11[k]! * uu * uu + 2 * fac.dm12[k]! * uu * vv + fac.dm22[k]! * vv * vv;
          const w = gr * dr2;
          dre[j] = dre[j]! + w * c;
          dim[j] = dim[j]! + w * s;
        }
        for (let sIx = 0; sIx < fac.shapeGrads.length; sIx++) {
          const sg = fac.shapeGrads[sIx]!;
          const dp = base * sv[f * plan.maxShape + sIx]!;
          for (let k = 0; k < sg.idx.length; k++) {
            const j = row + sg.idx[k]!;
            const w = dp * sg.val[k]!;
            dre[j] = dre[j]! + w * c;
            dim[j] = dim[j]! + w * s;
          }
        }
      }
    }
    // normalise: V = F / T, dV = (dF - V dT) / T
    const vre = fre * invTot;
    const vim = fim * invTot;
    re[i] = vre;
    im[i] = vim;
    for (let j = 0; j < cols; j++) {
      const dt = plan.dtotal[j]!;
      dre[row + j] = (dre[row + j]! - vre * dt) * invTot;
      dim[row + j] = (dim[row + j]! - vim * dt) * invTot;
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
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  const dre = new Float64Array(n * cols);
  const dim = new Float64Array(n * cols);
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
