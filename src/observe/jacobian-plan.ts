/**
 * The compiled Jacobian plan: canonical terms with dual entries flattened into numbers (radians) and, per term
 * and per free parameter that moves it, the coefficients of the chain rule; and the per-point loop that gives
 * the normalised visibility and its derivatives.
 *
 * Per term, F_k(q) = flux * prod_f P_f * exp(-2 pi i q . x). A radial factor depends on r2 = q^T M q with
 * M = A A^T, so dP = dP/dr2 (q^T dM q) + sum_k dP/dp_k dp_k; a complex factor depends on w = A^T q, so
 * dP = dP/dw . (dA^T q) + sum_k dP/dp_k dp_k (p: kernel coefficients, whose derivatives over the parameters
 * are formed once here). Shifts give -2 pi i q . dx, the flux its own derivative, and the normalisation
 * V = F / F(0) gives dV = (dF - V dF(0)) / F(0).
 *
 * @internal
 * @module
 */
import { ModelError } from '../errors.js';
import { besselJ0, besselJ1, diskAmplitude } from '../kernels/bessel.js';
import type { ComplexDerivativeKernel } from '../kernels/component-derivatives.js';
import { j2OverX2, type RadialDerivativeKernel } from '../kernels/derivatives.js';
import { SIN_COS, sinCosTurns } from '../kernels/sincos.js';
import { GAUSS_K } from '../kernels/terms.js';
import type { DualTerm } from '../model/canonical.js';
import type { Dual } from '../model/dual.js';
import { ZERO_FLUX_FRACTION } from '../model/plan.js';
import { RAD_PER_MAS } from '../units/index.js';
import { DERIVATIVE_KERNELS, kindCoefficients } from './jacobian-kinds.js';

const TWO_PI = 2 * Math.PI;
const PI2 = Math.PI * Math.PI;
const RAD2 = RAD_PER_MAS * RAD_PER_MAS;

// The per-point loop reads these through module-local constants: where modules are transpiled to CommonJS
// (tsx, the test runner) every read of an imported binding is a getter call, about 15% of the loop's time.
const j0 = besselJ0;
const j1 = besselJ1;
const disk = diskAmplitude;
const j2x2 = j2OverX2;
const sinCos = sinCosTurns;
const SC = SIN_COS;
const GK = GAUSS_K;

/** Factor codes of the per-point loop: the three foundation kinds inline, then any radial, then complex. */
const CODE_DISK = 0;
const CODE_GAUSS = 1;
const CODE_RING = 2;
const CODE_RADIAL = 3;
const CODE_COMPLEX = 4;

/** One canonical term flattened for the per-point loop. */
interface JTerm {
  readonly flux: number;
  /** Shift, radians. */
  readonly e0: number;
  readonly n0: number;
  readonly shifted: boolean;
  readonly nf: number;
  /** True when a factor is complex (non-radial). */
  readonly complex: boolean;
  /** True when a factor has kernel coefficients. */
  readonly coefficients: boolean;
  /** True when some free parameter moves the shift. */
  readonly shiftMoves: boolean;
  readonly codes: Int32Array;
  readonly radialKernels: readonly (RadialDerivativeKernel | null)[];
  readonly complexKernels: readonly (ComplexDerivativeKernel | null)[];
  readonly data: readonly unknown[];
  /** Per factor M = A A^T (3 entries, rad^2). */
  readonly m: Float64Array;
  /** Per factor A (4 entries, row-major, rad per unit). */
  readonly a: Float64Array;
  /** Per factor kernel coefficients. */
  readonly p: readonly Float64Array[];
  /** Per factor: offset of its geometry entries (dM: 3, or dA: 4) in a coefficient row. */
  readonly geoOff: Int32Array;
  /** Per factor: offset of its coefficient entries in a coefficient row. */
  readonly coefOff: Int32Array;
  /** Per factor: offset of its slopes in the per-point slope scratch. */
  readonly slopeOff: Int32Array;
  /** Free parameters that move this term (column indices). */
  readonly idx: Int32Array;
  /** Per active parameter, `stride` entries: d flux, d east (rad), d north (rad), geometry, coefficients. */
  readonly coef: Float64Array;
  readonly stride: number;
}

/** A compiled Jacobian plan. */
export interface JPlan {
  readonly cols: number;
  readonly terms: readonly JTerm[];
  /** Total flux F(0). */
  readonly total: number;
  /** d F(0) / d parameter. */
  readonly dtotal: Float64Array;
  readonly maxFactors: number;
  /** Largest per-point slope scratch of a term. */
  readonly maxSlopes: number;
  /** Largest kernel output. */
  readonly maxOut: number;
}

function gradOf(d: Dual, j: number): number {
  return d.g === null ? 0 : d.g[j]!;
}

/**
 * Compiles canonical terms (with gradients) into a Jacobian plan.
 *
 * @param terms - canonical terms from `canonicalise(..., { gradients: true })`
 * @param cols - number of free parameters
 * @param path - model path for errors
 * @throws ModelError when the total flux is zero (as the value path)
 */
export function compileJacobianPlan(terms: readonly DualTerm[], cols: number, path: string): JPlan {
  let total = 0;
  let absTotal = 0;
  const dtotal = new Float64Array(cols);
  const out: JTerm[] = [];
  let maxFactors = 0;
  let maxSlopes = 0;
  let maxOut = 2;
  for (const t of terms) {
    total += t.flux.v;
    absTotal += Math.abs(t.flux.v);
    if (t.flux.g) for (let j = 0; j < cols; j++) dtotal[j] = dtotal[j]! + t.flux.g[j]!;
    const nf = t.factors.length;
    maxFactors = Math.max(maxFactors, nf);
    const codes = new Int32Array(nf);
    const radialKernels: (RadialDerivativeKernel | null)[] = [];
    const complexKernels: (ComplexDerivativeKernel | null)[] = [];
    const data: unknown[] = [];
    const m = new Float64Array(3 * nf);
    const a = new Float64Array(4 * nf);
    const p: Float64Array[] = [];
    const dps: Float64Array[] = [];
    const geoOff = new Int32Array(nf);
    const coefOff = new Int32Array(nf);
    const slopeOff = new Int32Array(nf);
    let complex = false;
    let geo = 3;
    let slopes = 0;
    t.factors.forEach((f, k) => {
      const kind = DERIVATIVE_KERNELS[f.kind];
      if (kind === undefined) {
        throw new ModelError(`${path}: factor kind '${f.kind}' has no analytic Jacobian`, {
          modelPath: path,
        });
      }
      const c = kindCoefficients(
        f.kind,
        f.shape.map((x) => x.v),
      );
      p.push(c.p);
      dps.push(c.dp);
      data.push(f.data ?? null);
      const [a11, a12, a21, a22] = f.a;
      m[3 * k] = (a11.v * a11.v + a12.v * a12.v) * RAD2;
      m[3 * k + 1] = (a11.v * a21.v + a12.v * a22.v) * RAD2;
      m[3 * k + 2] = (a21.v * a21.v + a22.v * a22.v) * RAD2;
      a[4 * k] = a11.v * RAD_PER_MAS;
      a[4 * k + 1] = a12.v * RAD_PER_MAS;
      a[4 * k + 2] = a21.v * RAD_PER_MAS;
      a[4 * k + 3] = a22.v * RAD_PER_MAS;
      geoOff[k] = geo;
      slopeOff[k] = slopes;
      const np = c.p.length;
      if (kind.radial) {
        radialKernels.push(kind.kernel);
        complexKernels.push(null);
        codes[k] =
          f.kind === 'uniformDisk'
            ? CODE_DISK
            : f.kind === 'gaussian'
              ? CODE_GAUSS
              : f.kind === 'thinRing'
                ? CODE_RING
                : CODE_RADIAL;
        geo += 3;
        slopes += 1 + np;
        maxOut = Math.max(maxOut, 2 + np);
      } else {
        radialKernels.push(null);
        complexKernels.push(kind.kernel);
        codes[k] = CODE_COMPLEX;
        complex = true;
        geo += 4;
        slopes += 4 + 2 * np;
        maxOut = Math.max(maxOut, 6 + 2 * np);
      }
    });
    let co = geo;
    t.factors.forEach((_, k) => {
      coefOff[k] = co;
      co += p[k]!.length;
    });
    const stride = co;
    maxSlopes = Math.max(maxSlopes, slopes);
    const idx: number[] = [];
    const coef: number[] = [];
    let shiftMoves = false;
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
        const o = geoOff[k]!;
        if (codes[k] === CODE_COMPLEX) {
          row[o] = g11 * RAD_PER_MAS;
          row[o + 1] = g12 * RAD_PER_MAS;
          row[o + 2] = g21 * RAD_PER_MAS;
          row[o + 3] = g22 * RAD_PER_MAS;
        } else {
          // M = A A^T: m11 = a11^2 + a12^2, m12 = a11 a21 + a12 a22, m22 = a21^2 + a22^2
          row[o] = 2 * (a11.v * g11 + a12.v * g12) * RAD2;
          row[o + 1] = (g11 * a21.v + a11.v * g21 + g12 * a22.v + a12.v * g22) * RAD2;
          row[o + 2] = 2 * (a21.v * g21 + a22.v * g22) * RAD2;
        }
        // d p_i / d param_j = sum_q d p_i / d shape_q * d shape_q / d param_j
        const np = p[k]!.length;
        const ns = f.shape.length;
        const dp = dps[k]!;
        for (let i = 0; i < np; i++) {
          let s = 0;
          for (let q = 0; q < ns; q++) s += dp[i * ns + q]! * gradOf(f.shape[q]!, j);
          row[coefOff[k]! + i] = s;
        }
      });
      if (row[1] !== 0 || row[2] !== 0) shiftMoves = true;
      if (row.some((x) => x !== 0)) {
        idx.push(j);
        coef.push(...row);
      }
    }
    const e0 = t.east.v * RAD_PER_MAS;
    const n0 = t.north.v * RAD_PER_MAS;
    out.push({
      flux: t.flux.v,
      e0,
      n0,
      shifted: e0 !== 0 || n0 !== 0,
      nf,
      complex,
      coefficients: p.some((x) => x.length > 0),
      shiftMoves,
      codes,
      radialKernels,
      complexKernels,
      data,
      m,
      a,
      p,
      geoOff,
      coefOff,
      slopeOff,
      idx: Int32Array.from(idx),
      coef: Float64Array.from(coef),
      stride,
    });
  }
  if (!(Math.abs(total) >= ZERO_FLUX_FRACTION * absTotal) || absTotal === 0) {
    throw new ModelError(
      `${path}: the total flux is ${total} (sum of |flux| ${absTotal}), so visibilities cannot be normalised; ` +
        `give the model a total flux whose magnitude is at least ${ZERO_FLUX_FRACTION} of the sum of |flux|`,
      { modelPath: path },
    );
  }
  return { cols, terms: out, total, dtotal, maxFactors, maxSlopes, maxOut };
}

/** Per-run scratch (allocated once per call, never per point). */
interface Scratch {
  readonly kout: Float64Array;
  readonly pv: Float64Array;
  readonly gv: Float64Array;
  readonly pr: Float64Array;
  readonly pi: Float64Array;
  readonly or: Float64Array;
  readonly oi: Float64Array;
  readonly others: Float64Array;
  readonly sv: Float64Array;
  /** Per-row accumulators of dF (real, imaginary), one entry per parameter. */
  readonly dfr: Float64Array;
  readonly dfi: Float64Array;
}

function scratchFor(plan: JPlan): Scratch {
  const nf = Math.max(1, plan.maxFactors);
  return {
    kout: new Float64Array(plan.maxOut),
    pv: new Float64Array(nf),
    gv: new Float64Array(nf),
    pr: new Float64Array(nf),
    pi: new Float64Array(nf),
    or: new Float64Array(nf),
    oi: new Float64Array(nf),
    others: new Float64Array(nf),
    sv: new Float64Array(Math.max(1, plan.maxSlopes)),
    dfr: new Float64Array(plan.cols),
    dfi: new Float64Array(plan.cols),
  };
}

/**
 * The normalised visibility and its Jacobian at n points.
 *
 * @param plan - a compiled Jacobian plan
 * @param u - spatial frequencies east, cycles per radian
 * @param v - spatial frequencies north, cycles per radian
 * @param re - out: Re V (length >= n)
 * @param im - out: Im V
 * @param dre - out: d Re V / d p, row-major n x cols
 * @param dim - out: d Im V / d p
 * @param n - number of points
 */
export function runJacobian(
  plan: JPlan,
  u: Float64Array,
  v: Float64Array,
  re: Float64Array,
  im: Float64Array,
  dre: Float64Array,
  dim: Float64Array,
  n: number,
): void {
  const cols = plan.cols;
  const s = scratchFor(plan);
  const { kout, pv, gv, others, sv, dfr, dfi } = s;
  const invTot = 1 / plan.total;
  const dtotal = plan.dtotal;
  const terms = plan.terms;
  const nt = terms.length;
  for (let i = 0; i < n; i++) {
    const uu = u[i]!;
    const vv = v[i]!;
    const u2 = uu * uu;
    const uv2 = 2 * uu * vv;
    const v2 = vv * vv;
    const row = i * cols;
    let fre = 0;
    let fim = 0;
    for (let k = 0; k < nt; k++) {
      const t = terms[k]!;
      if (t.complex) {
        complexTerm(t, uu, vv, s);
        fre += kout[0]!;
        fim += kout[1]!;
        continue;
      }
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
              p = disk(x);
              g = -PI2 * j2x2(x);
            } else {
              // one J0 and one J1: P = 2 J1/x and J2/x^2 = (P - J0)/x^2 (A&S 9.1.27), little cancellation for x >= 2
              p = (2 * j1(x)) / x;
              g = (-PI2 * (p - j0(x))) / (x * x);
            }
            break;
          }
          case CODE_GAUSS:
            p = Math.exp(-GK * r2);
            g = -GK * p;
            break;
          case CODE_RING: {
            const x = Math.PI * Math.sqrt(r2);
            p = j0(x);
            g = -(PI2 / 4) * disk(x);
            break;
          }
          default: {
            const pk = t.p[f]!;
            t.radialKernels[f]!(r2, pk, kout, t.data[f]);
            p = kout[0]!;
            g = kout[1]!;
            const off = t.slopeOff[f]!;
            for (let q = 0; q < pk.length; q++) sv[off + q] = kout[2 + q]!;
          }
        }
        pv[f] = p;
        gv[f] = g;
        prod *= p;
      }
      let c = 1;
      let sn = 0;
      if (t.shifted) {
        sinCos(uu * t.e0 + vv * t.n0);
        c = SC[1]!;
        sn = -SC[0]!;
      }
      const flux = t.flux;
      const tre = flux * prod * c;
      const tim = flux * prod * sn;
      fre += tre;
      fim += tim;
      const idx = t.idx;
      const na = idx.length;
      if (na === 0) continue;
      // flux * (product of the other factors), per factor
      if (nf === 1) others[0] = flux;
      else {
        for (let f = 0; f < nf; f++) {
          let o = flux;
          for (let h = 0; h < nf; h++) if (h !== f) o *= pv[h]!;
          others[f] = o;
        }
      }
      const coef = t.coef;
      const stride = t.stride;
      if (nf <= 1 && !t.coefficients) {
        // the common cases: a point, or one factor without coefficients (disk, Gaussian, ring, ...) whose
        // geometry entries sit at 3..5
        const g0 = nf === 1 ? others[0]! * gv[0]! : 0;
        const moves = t.shiftMoves;
        for (let q = 0; q < na; q++) {
          const j = idx[q]!;
          const o = q * stride;
          let w = coef[o]! * prod;
          if (nf === 1) w += g0 * (coef[o + 3]! * u2 + coef[o + 4]! * uv2 + coef[o + 5]! * v2);
          if (moves) {
            const ws = TWO_PI * (uu * coef[o + 1]! + vv * coef[o + 2]!);
            dfr[j] = dfr[j]! + w * c + ws * tim;
            dfi[j] = dfi[j]! + w * sn - ws * tre;
          } else {
            dfr[j] = dfr[j]! + w * c;
            dfi[j] = dfi[j]! + w * sn;
          }
        }
        continue;
      }
      for (let q = 0; q < na; q++) {
        const j = idx[q]!;
        const o = q * stride;
        // real-amplitude part: d flux * prod + sum over factors of flux * others * (G dr2 + dP/dp dp)
        let w = coef[o]! * prod;
        for (let f = 0; f < nf; f++) {
          const go = o + t.geoOff[f]!;
          const dr2 = coef[go]! * u2 + coef[go + 1]! * uv2 + coef[go + 2]! * v2;
          let d = gv[f]! * dr2;
          const np = t.p[f]!.length;
          if (np > 0) {
            const co = o + t.coefOff[f]!;
            const so = t.slopeOff[f]!;
            for (let r = 0; r < np; r++) d += sv[so + r]! * coef[co + r]!;
          }
          w += others[f]! * d;
        }
        // phase part: d/dp exp(-2 pi i q.x) = -2 pi i (u dx + v dy) exp(...)
        const ws = TWO_PI * (uu * coef[o + 1]! + vv * coef[o + 2]!);
        dfr[j] = dfr[j]! + w * c + ws * tim;
        dfi[j] = dfi[j]! + w * sn - ws * tre;
      }
    }
    // normalise: V = F / T, dV = (dF - V dT) / T
    const vre = fre * invTot;
    const vim = fim * invTot;
    re[i] = vre;
    im[i] = vim;
    for (let j = 0; j < cols; j++) {
      const dt = dtotal[j]!;
      dre[row + j] = (dfr[j]! - vre * dt) * invTot;
      dim[row + j] = (dfi[j]! - vim * dt) * invTot;
      dfr[j] = 0;
      dfi[j] = 0;
    }
  }
}

/**
 * One term with a complex factor at one point: adds its derivatives into s.dfr, s.dfi and leaves the term's
 * value in s.kout[0], s.kout[1].
 */
function complexTerm(t: JTerm, uu: number, vv: number, s: Scratch): void {
  const { kout, pr, pi, or, oi, sv, dfr, dfi } = s;
  const nf = t.nf;
  const u2 = uu * uu;
  const uv2 = 2 * uu * vv;
  const v2 = vv * vv;
  let zr = 1;
  let zi = 0;
  for (let f = 0; f < nf; f++) {
    const pk = t.p[f]!;
    const so = t.slopeOff[f]!;
    let xr: number;
    let xi = 0;
    if (t.codes[f] === CODE_COMPLEX) {
      const a = t.a;
      const w1 = a[4 * f]! * uu + a[4 * f + 2]! * vv;
      const w2 = a[4 * f + 1]! * uu + a[4 * f + 3]! * vv;
      t.complexKernels[f]!(w1, w2, pk, kout, t.data[f]);
      xr = kout[0]!;
      xi = kout[1]!;
      const len = 4 + 2 * pk.length;
      for (let q = 0; q < len; q++) sv[so + q] = kout[2 + q]!;
    } else {
      const m = t.m;
      const r2raw = m[3 * f]! * u2 + m[3 * f + 1]! * uv2 + m[3 * f + 2]! * v2;
      t.radialKernels[f]!(r2raw > 0 ? r2raw : 0, pk, kout, t.data[f]);
      xr = kout[0]!;
      const len = 1 + pk.length;
      for (let q = 0; q < len; q++) sv[so + q] = kout[1 + q]!;
    }
    pr[f] = xr;
    pi[f] = xi;
    const y = zr * xr - zi * xi;
    zi = zr * xi + zi * xr;
    zr = y;
  }
  let c = 1;
  let sn = 0;
  if (t.shifted) {
    sinCos(uu * t.e0 + vv * t.n0);
    c = SC[1]!;
    sn = -SC[0]!;
  }
  const flux = t.flux;
  // term value flux * z * (c + i sn)
  const tre = flux * (zr * c - zi * sn);
  const tim = flux * (zr * sn + zi * c);
  const idx = t.idx;
  const na = idx.length;
  if (na > 0) {
    for (let f = 0; f < nf; f++) {
      let yr = flux;
      let yi = 0;
      for (let h = 0; h < nf; h++) {
        if (h === f) continue;
        const q = yr * pr[h]! - yi * pi[h]!;
        yi = yr * pi[h]! + yi * pr[h]!;
        yr = q;
      }
      or[f] = yr;
      oi[f] = yi;
    }
    const coef = t.coef;
    const stride = t.stride;
    for (let q = 0; q < na; q++) {
      const j = idx[q]!;
      const o = q * stride;
      let xr = coef[o]! * zr;
      let xi = coef[o]! * zi;
      for (let f = 0; f < nf; f++) {
        const go = o + t.geoOff[f]!;
        const co = o + t.coefOff[f]!;
        const so = t.slopeOff[f]!;
        const np = t.p[f]!.length;
        let dr: number;
        let di = 0;
        if (t.codes[f] === CODE_COMPLEX) {
          // dw = dA^T q
          const dw1 = coef[go]! * uu + coef[go + 2]! * vv;
          const dw2 = coef[go + 1]! * uu + coef[go + 3]! * vv;
          dr = sv[so]! * dw1 + sv[so + 2]! * dw2;
          di = sv[so + 1]! * dw1 + sv[so + 3]! * dw2;
          for (let r = 0; r < np; r++) {
            const dc = coef[co + r]!;
            dr += sv[so + 4 + 2 * r]! * dc;
            di += sv[so + 5 + 2 * r]! * dc;
          }
        } else {
          const dr2 = coef[go]! * u2 + coef[go + 1]! * uv2 + coef[go + 2]! * v2;
          dr = sv[so]! * dr2;
          for (let r = 0; r < np; r++) dr += sv[so + 1 + r]! * coef[co + r]!;
        }
        xr += or[f]! * dr - oi[f]! * di;
        xi += or[f]! * di + oi[f]! * dr;
      }
      // X (c + i sn) + term * (-i ws)
      const ws = TWO_PI * (uu * coef[o + 1]! + vv * coef[o + 2]!);
      dfr[j] = dfr[j]! + xr * c - xi * sn + ws * tim;
      dfi[j] = dfi[j]! + xr * sn + xi * c - ws * tre;
    }
  }
  kout[0] = tre;
  kout[1] = tim;
}
