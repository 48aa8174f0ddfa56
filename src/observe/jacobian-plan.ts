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
import {
  basisPiece as basisPieceImport,
  DISK_PIECES as DISK_PIECES_IMPORT,
  diskPiece,
  HANKEL_START,
  j0Piece,
  L32_PIECES as L32_PIECES_IMPORT,
  pieceIndex,
  pieceLocal,
  W2_PIECES as W2_PIECES_IMPORT,
  w2Piece,
} from '../kernels/bessel-coefficients.js';
import { type BlockColumns, blockColumns, phaseRampPlain, phaseRampSplit } from '../kernels/block.js';
import type { ComplexDerivativeKernel } from '../kernels/component-derivatives.js';
import { j2OverX2, type RadialDerivativeKernel } from '../kernels/derivatives.js';
import { limbPieces, limbSlopePieces } from '../kernels/limb-pieces.js';
import { phaseNeedsSplit, SIN_COS, sinCosPhase, sinCosTurns, splitHead } from '../kernels/sincos.js';
import { GAUSS_K } from '../kernels/terms.js';
import type { DualTerm } from '../model/canonical.js';
import type { Dual } from '../model/dual.js';
import { checkTotalFlux } from '../model/plan.js';
import { maxAbs, RAD_PER_MAS } from '../units/index.js';
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
const sinCosSplit = sinCosPhase;
const SC = SIN_COS;
const GK = GAUSS_K;
const diskP = diskPiece;
const j0P = j0Piece;
const w2P = w2Piece;
/** Where besselJ0 and besselJ1 leave their half-unit-piece polynomials for Hankel's form (bessel-j01.ts). */
const PIECES_END = HANKEL_START;

/** Factor codes of the per-point loop: the three foundation kinds inline, then any radial, then complex. */
const CODE_DISK = 0;
const CODE_GAUSS = 1;
const CODE_RING = 2;
const CODE_RADIAL = 3;
const CODE_COMPLEX = 4;
/** A lone linearly or quadratically limb-darkened disk: its law's value and slope tables (limb-pieces.ts). */
const CODE_LIMB = 5;

/** One canonical term flattened for the per-point loop. */
interface JTerm {
  readonly flux: number;
  /** Shift, radians. */
  readonly e0: number;
  readonly n0: number;
  readonly shifted: boolean;
  /** Heads and tails of e0 and n0 (splitHead), for the split phase of sinCosPhase. */
  readonly eh: number;
  readonly el: number;
  readonly nh: number;
  readonly nl: number;
  readonly nf: number;
  /** True when a factor is complex (non-radial). */
  readonly complex: boolean;
  /** True when a factor has kernel coefficients. */
  readonly coefficients: boolean;
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
  /** Per factor (CODE_LIMB): the law's value and slope tables on the half-unit pieces, else null. */
  readonly limb: readonly ({ readonly p: Float64Array; readonly s: Float64Array } | null)[];
  /** Per factor: 1 when an active parameter moves its kernel coefficients (their slopes are needed). */
  readonly moved: Uint8Array;
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
    const limb: ({ p: Float64Array; s: Float64Array } | null)[] = new Array(nf).fill(null);
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
        // a lone linear or quadratic law gets its tables (simpleTerm); in products the kernel serves
        const law = nf === 1 && (f.kind === 'linearLimbDarkened' || f.kind === 'quadraticLimbDarkened');
        codes[k] =
          f.kind === 'uniformDisk'
            ? CODE_DISK
            : f.kind === 'gaussian'
              ? CODE_GAUSS
              : f.kind === 'thinRing'
                ? CODE_RING
                : law
                  ? CODE_LIMB
                  : CODE_RADIAL;
        const c2 = c.p.length > 2 ? c.p[2]! : 0;
        limb[k] = law
          ? { p: limbPieces(c.p[0]!, c.p[1]!, c2), s: limbSlopePieces(c.p[0]!, c.p[1]!, c2) }
          : null;
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
      if (row.some((x) => x !== 0)) {
        idx.push(j);
        coef.push(...row);
      }
    }
    // which factors' coefficients an active parameter moves (only those need their coefficient slopes)
    const moved = new Uint8Array(nf);
    for (let k = 0; k < nf; k++) {
      for (let q = 0; q < idx.length; q++) {
        for (let i = 0; i < p[k]!.length; i++) if (coef[q * stride + coefOff[k]! + i] !== 0) moved[k] = 1;
      }
    }
    const e0 = t.east.v * RAD_PER_MAS;
    const n0 = t.north.v * RAD_PER_MAS;
    out.push({
      flux: t.flux.v,
      e0,
      n0,
      shifted: e0 !== 0 || n0 !== 0,
      eh: splitHead(e0),
      el: e0 - splitHead(e0),
      nh: splitHead(n0),
      nl: n0 - splitHead(n0),
      nf,
      complex,
      coefficients: p.some((x) => x.length > 0),
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
      limb,
      moved,
      idx: Int32Array.from(idx),
      coef: Float64Array.from(coef),
      stride,
    });
  }
  checkTotalFlux(total, absTotal, path);
  // Terms carry flux / T and d flux / dp / T, so that they add V = F / T and dF / T directly (runJacobian)
  const inv = 1 / total;
  const scaled = out.map((t) => {
    const coef = t.coef.slice();
    for (let o = 0; o < coef.length; o += t.stride) coef[o] = coef[o]! * inv;
    return { ...t, flux: t.flux * inv, coef };
  });
  return { cols, terms: scaled, total, dtotal, maxFactors, maxSlopes, maxOut };
}

/**
 * Points per block: the block's rows of the outputs (2 x cols x BLOCK doubles) stay in the L1 cache. At most
 * BLOCK_POINTS (block.ts): the block's u and v are the columns of the block kernels.
 */
const BLOCK = 128;

/** Per-run scratch (allocated once per call, never per point). */
interface Scratch {
  readonly kout: Float64Array;
  readonly pr: Float64Array;
  readonly pi: Float64Array;
  readonly or: Float64Array;
  readonly oi: Float64Array;
  readonly sv: Float64Array;
  /** Per block point: u, v, u^2, 2uv, v^2. */
  readonly bu: Float64Array;
  readonly bv: Float64Array;
  readonly bu2: Float64Array;
  readonly buv: Float64Array;
  readonly bv2: Float64Array;
  /** Per block point, for the term at hand: P, flux dP/dr2, cos and -sin of the phase, the term's value. */
  readonly bp: Float64Array;
  readonly bg: Float64Array;
  readonly bc: Float64Array;
  readonly bs: Float64Array;
  readonly tre: Float64Array;
  readonly tim: Float64Array;
  /**
   * Per factor and block point ([f * BLOCK + point]): P, dP/dr2 (times fo once the values are in), and fo,
   * the flux times the other factors' product.
   */
  readonly fp: Float64Array;
  readonly fg: Float64Array;
  readonly fo: Float64Array;
  /** Per kernel slope and block point ([(slopeOff + r) * BLOCK + point]): dP/dp_r (times fo, as fg). */
  readonly fs: Float64Array;
  /** Per block point: the real amplitude part of one parameter's derivative. */
  readonly bw: Float64Array;
  /** Per block point: F (unnormalised). */
  readonly fre: Float64Array;
  readonly fim: Float64Array;
  /** The block columns (block.ts): `bu` and `bv` are its u and v, read by the phase ramps. */
  readonly cols: BlockColumns;
}

function scratchFor(plan: JPlan): Scratch {
  const nf = Math.max(1, plan.maxFactors);
  const b = () => new Float64Array(BLOCK);
  // the block's u and v are the columns of the phase ramps themselves (block.ts), so those need no copy
  const cols = blockColumns();
  return {
    kout: new Float64Array(plan.maxOut),
    pr: new Float64Array(nf),
    pi: new Float64Array(nf),
    or: new Float64Array(nf),
    oi: new Float64Array(nf),
    sv: new Float64Array(Math.max(1, plan.maxSlopes)),
    bu: cols.u,
    bv: cols.v,
    bu2: b(),
    buv: b(),
    bv2: b(),
    bp: b(),
    bg: b(),
    bc: b(),
    bs: b(),
    tre: b(),
    tim: b(),
    fp: new Float64Array(nf * BLOCK),
    fg: new Float64Array(nf * BLOCK),
    fo: new Float64Array(nf * BLOCK),
    fs: new Float64Array(Math.max(1, plan.maxSlopes) * BLOCK),
    bw: b(),
    fre: b(),
    fim: b(),
    cols,
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
 * @param uBound - optional: an upper bound on |u| over the points (NaN: none known)
 * @param vBound - optional: an upper bound on |v| over the points
 *
 * Notes: points go in blocks of {@link BLOCK}. Within a block, a term with at most one factor and no kernel
 * coefficients (a point, disk, Gaussian, ring, exponential, ...: the common case) runs one loop per kernel
 * kind over the block and then, per free parameter that moves it, one loop with that parameter's chain-rule
 * coefficients held in locals; other terms go point by point. The terms carry flux / T, so they add V and
 * dF / T straight into the row-major outputs; at the end of the block -V dT / T is added for the parameters
 * that move the total flux T (weights), which completes dV = (dF - V dT) / T.
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
  uBound = Number.NaN,
  vBound = Number.NaN,
): void {
  const cols = plan.cols;
  const s = scratchFor(plan);
  const { bu, bv, bu2, buv, bv2, fre, fim } = s;
  const invTot = 1 / plan.total;
  const dtotal = plan.dtotal;
  // the parameters that move the total flux, with dT / T
  const moving: number[] = [];
  for (let j = 0; j < cols; j++) if (dtotal[j] !== 0) moving.push(j);
  const dtn = Float64Array.from(moving, (j) => dtotal[j]! * invTot);
  const nm = moving.length;
  const movingIdx = Int32Array.from(moving);
  const terms = plan.terms;
  const nt = terms.length;
  // as runPlan: per-block maxima of |u|, |v| only when bounds over all points leave a shift needing the split
  let perBlock = false;
  for (const t of terms) if (t.shifted && phaseNeedsSplit(uBound, vBound, t.e0, t.n0)) perBlock = true;
  for (let i0 = 0; i0 < n; i0 += BLOCK) {
    const m = Math.min(BLOCK, n - i0);
    for (let b = 0; b < m; b++) {
      const uu = u[i0 + b]!;
      const vv = v[i0 + b]!;
      bu[b] = uu;
      bv[b] = vv;
      bu2[b] = uu * uu;
      buv[b] = 2 * uu * vv;
      bv2[b] = vv * vv;
      fre[b] = 0;
      fim[b] = 0;
    }
    const row0 = i0 * cols;
    dre.fill(0, row0, row0 + m * cols);
    dim.fill(0, row0, row0 + m * cols);
    // the split phase ramp only where u e0 + v n0 can exceed PLAIN_PHASE_TURNS (as the value path)
    const uMax = perBlock ? maxAbs(bu, 0, m) : uBound;
    const vMax = perBlock ? maxAbs(bv, 0, m) : vBound;
    for (let k = 0; k < nt; k++) {
      const t = terms[k]!;
      const exact = phaseNeedsSplit(uMax, vMax, t.e0, t.n0);
      if (t.complex) for (let b = 0; b < m; b++) complexTerm(t, b, s, exact, dre, dim, row0 + b * cols);
      else if (t.nf <= 1 && (!t.coefficients || t.codes[0] === CODE_LIMB))
        simpleTerm(t, m, s, exact, dre, dim, row0, cols);
      else blockTerm(t, m, s, exact, dre, dim, row0, cols);
    }
    // the terms added V = F / T and dF / T (their fluxes are divided by T, compileJacobianPlan); what is
    // left of dV = (dF - V dT) / T is -V dT / T for the parameters that move the total flux
    for (let b = 0; b < m; b++) {
      const vre = fre[b]!;
      const vim = fim[b]!;
      re[i0 + b] = vre;
      im[i0 + b] = vim;
      const row = row0 + b * cols;
      for (let q = 0; q < nm; q++) {
        const at = row + movingIdx[q]!;
        dre[at] = dre[at]! - vre * dtn[q]!;
        dim[at] = dim[at]! - vim * dtn[q]!;
      }
    }
  }
}

/**
 * A term with at most one factor and no kernel coefficients, or one limb-darkening law (CODE_LIMB), over the
 * m points of a block. blockTerm handles these terms too; this specialisation (flux folded into the slope, no
 * per-factor scratch, a loop per kind of parameter) measured about 12 % faster on benchmarks/jacobian.bench.ts,
 * so it stays.
 */
function simpleTerm(
  t: JTerm,
  m: number,
  s: Scratch,
  exact: boolean,
  dfr: Float64Array,
  dfi: Float64Array,
  row0: number,
  cols: number,
): void {
  const { bu, bv, bu2, buv, bv2, bp, bg, bc, bs, tre, tim, fre, fim, kout } = s;
  const flux = t.flux;
  if (t.nf === 0) {
    for (let b = 0; b < m; b++) {
      bp[b] = 1;
      bg[b] = 0;
    }
  } else {
    const m11 = t.m[0]!;
    const m12 = t.m[1]!;
    const m22 = t.m[2]!;
    switch (t.codes[0]) {
      case CODE_DISK:
        for (let b = 0; b < m; b++) {
          const r2 = m11 * bu2[b]! + m12 * buv[b]! + m22 * bv2[b]!;
          const x = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
          if (x < 2) {
            bp[b] = disk(x);
            bg[b] = -PI2 * flux * j2x2(x);
          } else {
            // P = 2 J1/x and J2/x^2 = W/8 (A&S 9.1.27) from the tables diskAmplitude uses below HANKEL_START
            // (bessel-coefficients.ts), one piece index for both and no division; beyond, from J0 and J1.
            if (x < PIECES_END) {
              const k = pieceIndex(x);
              const tt = pieceLocal(x, k);
              bp[b] = diskP(k, tt);
              bg[b] = -PI2 * 0.125 * flux * w2P(k, tt);
            } else {
              const jx0 = j0(x);
              const p = (2 * j1(x)) / x;
              bp[b] = p;
              bg[b] = (-PI2 * flux * (p - jx0)) / (x * x);
            }
          }
        }
        break;
      case CODE_GAUSS:
        for (let b = 0; b < m; b++) {
          const r2 = m11 * bu2[b]! + m12 * buv[b]! + m22 * bv2[b]!;
          const p = Math.exp(-GK * (r2 > 0 ? r2 : 0));
          bp[b] = p;
          bg[b] = -GK * flux * p;
        }
        break;
      case CODE_RING:
        for (let b = 0; b < m; b++) {
          const r2 = m11 * bu2[b]! + m12 * buv[b]! + m22 * bv2[b]!;
          const x = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
          // J0 and dJ0/dr2 = -(pi^2/4) 2 J1(x)/x from the tables besselJ0 and diskAmplitude use, one index
          if (x >= 2 && x < PIECES_END) {
            const k = pieceIndex(x);
            const tt = pieceLocal(x, k);
            bp[b] = j0P(k, tt);
            bg[b] = -(PI2 / 4) * flux * diskP(k, tt);
          } else {
            bp[b] = j0(x);
            bg[b] = -(PI2 / 4) * flux * disk(x);
          }
        }
        break;
      case CODE_LIMB: {
        // the law's value and slope from its own tables (one piece index for both), as the value path does; the
        // basis functions (dP/dc, into fs) only when a parameter moves the coefficients; elsewhere the kernel
        const tables = t.limb[0]!;
        const lp = tables.p;
        const ls = tables.s;
        const basisPiece = basisPieceImport;
        const DISK_PIECES = DISK_PIECES_IMPORT;
        const L32_PIECES = L32_PIECES_IMPORT;
        const W2_PIECES = W2_PIECES_IMPORT;
        const fs = s.fs;
        const kernel = t.radialKernels[0]!;
        const pk = t.p[0]!;
        const np = pk.length;
        const moved = t.moved[0] === 1;
        for (let b = 0; b < m; b++) {
          const r2 = m11 * bu2[b]! + m12 * buv[b]! + m22 * bv2[b]!;
          const x = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
          if (x >= 2 && x < PIECES_END) {
            const k = pieceIndex(x);
            const tt = pieceLocal(x, k);
            bp[b] = basisPiece(lp, k, tt);
            bg[b] = flux * basisPiece(ls, k, tt);
            if (moved) {
              fs[b] = basisPiece(DISK_PIECES, k, tt);
              fs[BLOCK + b] = basisPiece(L32_PIECES, k, tt);
              if (np > 2) fs[2 * BLOCK + b] = basisPiece(W2_PIECES, k, tt);
            }
          } else {
            kernel(r2 > 0 ? r2 : 0, pk, kout, null);
            bp[b] = kout[0]!;
            bg[b] = flux * kout[1]!;
            for (let r = 0; r < np; r++) fs[r * BLOCK + b] = kout[2 + r]!;
          }
        }
        break;
      }
      default: {
        const kernel = t.radialKernels[0]!;
        const pk = t.p[0]!;
        const data = t.data[0];
        for (let b = 0; b < m; b++) {
          const r2 = m11 * bu2[b]! + m12 * buv[b]! + m22 * bv2[b]!;
          kernel(r2 > 0 ? r2 : 0, pk, kout, data);
          bp[b] = kout[0]!;
          bg[b] = flux * kout[1]!;
        }
      }
    }
  }
  const e0 = t.e0;
  const n0 = t.n0;
  if (t.shifted) {
    const eh = t.eh;
    const el = t.el;
    const nh = t.nh;
    const nl = t.nl;
    // the block's phases first (block.ts, u and v loaded by runJacobian), then the term
    const rb = s.cols;
    if (exact) phaseRampSplit(rb, m, eh, el, nh, nl);
    else phaseRampPlain(rb, m, e0, n0);
    const rsin = rb.sin;
    const rcos = rb.cos;
    for (let b = 0; b < m; b++) {
      const c = rcos[b]!;
      const sn = -rsin[b]!;
      bc[b] = c;
      bs[b] = sn;
      const a = flux * bp[b]!;
      tre[b] = a * c;
      tim[b] = a * sn;
      fre[b] = fre[b]! + a * c;
      fim[b] = fim[b]! + a * sn;
    }
  } else {
    for (let b = 0; b < m; b++) {
      const a = flux * bp[b]!;
      bc[b] = 1;
      bs[b] = 0;
      tre[b] = a;
      tim[b] = 0;
      fre[b] = fre[b]! + a;
    }
  }
  const idx = t.idx;
  const coef = t.coef;
  const stride = t.stride;
  const geometry = t.nf === 1;
  for (let q = 0; q < idx.length; q++) {
    const o = q * stride;
    const df = coef[o]!;
    const de = TWO_PI * coef[o + 1]!;
    const dn = TWO_PI * coef[o + 2]!;
    const d11 = geometry ? coef[o + 3]! : 0;
    const d12 = geometry ? coef[o + 4]! : 0;
    const d22 = geometry ? coef[o + 5]! : 0;
    const base = row0 + idx[q]!;
    if (movesCoefficients(t, q)) {
      // a parameter of a limb-darkening law: its coefficients' slopes (fs, CODE_LIMB above) join the sum
      coefficientParameter(t, q, m, s, dfr, dfi, base, cols);
    } else if (!t.shifted && de === 0 && dn === 0) {
      // no phase ramp (cos 1, sin 0) and none made by this parameter: the derivative is real, Im is left alone.
      // Such parameters of the term (sizes, axis ratios, angles, weights) go through one pass, up to four at a time
      let k = 1;
      while (k < 4 && q + k < idx.length && realOnly(t, q + k)) k++;
      realParameters(t, q, k, geometry, m, s, dfr, row0, cols);
      q += k - 1;
    } else if (de === 0 && dn === 0 && d11 === 0 && d12 === 0 && d22 === 0) {
      // a flux (weight) parameter: d flux * P, times the phase
      for (let b = 0, at = base; b < m; b++, at += cols) {
        const w = df * bp[b]!;
        dfr[at] = dfr[at]! + w * bc[b]!;
        dfi[at] = dfi[at]! + w * bs[b]!;
      }
    } else if (de === 0 && dn === 0) {
      for (let b = 0, at = base; b < m; b++, at += cols) {
        // d flux * P + flux dP/dr2 * dr2, times the phase
        const w = df * bp[b]! + bg[b]! * (d11 * bu2[b]! + d12 * buv[b]! + d22 * bv2[b]!);
        dfr[at] = dfr[at]! + w * bc[b]!;
        dfi[at] = dfi[at]! + w * bs[b]!;
      }
    } else if (df === 0 && d11 === 0 && d12 === 0 && d22 === 0) {
      // a parameter that only moves the shift: d/dp exp(-2 pi i q.x) = -2 pi i (u dx + v dy) exp(...)
      for (let b = 0, at = base; b < m; b++, at += cols) {
        const ws = bu[b]! * de + bv[b]! * dn;
        dfr[at] = dfr[at]! + ws * tim[b]!;
        dfi[at] = dfi[at]! - ws * tre[b]!;
      }
    } else {
      for (let b = 0, at = base; b < m; b++, at += cols) {
        const w = df * bp[b]! + bg[b]! * (d11 * bu2[b]! + d12 * buv[b]! + d22 * bv2[b]!);
        // d/dp exp(-2 pi i q.x) = -2 pi i (u dx + v dy) exp(...)
        const ws = bu[b]! * de + bv[b]! * dn;
        dfr[at] = dfr[at]! + w * bc[b]! + ws * tim[b]!;
        dfi[at] = dfi[at]! + w * bs[b]! - ws * tre[b]!;
      }
    }
  }
}

/** Whether the term's q-th active parameter adds a real derivative only (an unshifted term it does not shift). */
function realOnly(t: JTerm, q: number): boolean {
  const o = q * t.stride;
  return !t.shifted && t.coef[o + 1] === 0 && t.coef[o + 2] === 0 && !movesCoefficients(t, q);
}

/** Whether the term's q-th active parameter moves the kernel coefficients of its (single) factor. */
function movesCoefficients(t: JTerm, q: number): boolean {
  if (t.nf === 0) return false;
  const o = q * t.stride + t.coefOff[0]!;
  const np = t.p[0]!.length;
  for (let r = 0; r < np; r++) if (t.coef[o + r] !== 0) return true;
  return false;
}

/**
 * Adds the derivative with respect to a parameter that moves the coefficients of a one-factor term (a
 * limb-darkening law, CODE_LIMB): d flux P + dP/dr2 dr2 + flux sum_r dP/dc_r dc_r, times the phase, plus the
 * shift's ramp term; the basis functions dP/dc_r are in the rows of fs (simpleTerm).
 */
function coefficientParameter(
  t: JTerm,
  q: number,
  m: number,
  s: Scratch,
  dfr: Float64Array,
  dfi: Float64Array,
  base: number,
  cols: number,
): void {
  const { bu, bv, bu2, buv, bv2, bp, bg, bc, bs, tre, tim, fs } = s;
  const o = q * t.stride;
  const co = o + t.coefOff[0]!;
  const np = t.p[0]!.length;
  const df = t.coef[o]!;
  const de = TWO_PI * t.coef[o + 1]!;
  const dn = TWO_PI * t.coef[o + 2]!;
  const d11 = t.coef[o + 3]!;
  const d12 = t.coef[o + 4]!;
  const d22 = t.coef[o + 5]!;
  // the slopes carry no flux (the kernel's own scale), so flux goes into their coefficients here
  const c0 = t.flux * t.coef[co]!;
  const c1 = np > 1 ? t.flux * t.coef[co + 1]! : 0;
  const c2 = np > 2 ? t.flux * t.coef[co + 2]! : 0;
  const r1 = np > 1 ? BLOCK : 0; // rows that do not exist read row 0 with a zero coefficient
  const r2 = np > 2 ? 2 * BLOCK : 0;
  if (!t.shifted && de === 0 && dn === 0) {
    for (let b = 0, at = base; b < m; b++, at += cols) {
      const w =
        df * bp[b]! +
        bg[b]! * (d11 * bu2[b]! + d12 * buv[b]! + d22 * bv2[b]!) +
        (c0 * fs[b]! + c1 * fs[r1 + b]! + c2 * fs[r2 + b]!);
      dfr[at] = dfr[at]! + w;
    }
    return;
  }
  for (let b = 0, at = base; b < m; b++, at += cols) {
    const w =
      df * bp[b]! +
      bg[b]! * (d11 * bu2[b]! + d12 * buv[b]! + d22 * bv2[b]!) +
      (c0 * fs[b]! + c1 * fs[r1 + b]! + c2 * fs[r2 + b]!);
    // d/dp exp(-2 pi i q.x) = -2 pi i (u dx + v dy) exp(...)
    const ws = bu[b]! * de + bv[b]! * dn;
    dfr[at] = dfr[at]! + w * bc[b]! + ws * tim[b]!;
    dfi[at] = dfi[at]! + w * bs[b]! - ws * tre[b]!;
  }
}

/**
 * Adds the real derivatives d flux * P + dP/dr2 * dr2 of k (1 to 4) consecutive active parameters of an
 * unshifted term in one pass over the block: the kernel values, slopes and u^2, 2uv, v^2 are read once per point
 * for all k, which measured faster than a pass per parameter (benchmarks/jacobian.bench.ts).
 */
function realParameters(
  t: JTerm,
  q: number,
  k: number,
  geometry: boolean,
  m: number,
  s: Scratch,
  dfr: Float64Array,
  row0: number,
  cols: number,
): void {
  const { bu2, buv, bv2, bp, bg } = s;
  const coef = t.coef;
  const stride = t.stride;
  const idx = t.idx;
  // coefficient e of the j-th of the k parameters (a term without a factor has no geometry entries)
  const c = (j: number, e: number) => (j < k && (e === 0 || geometry) ? coef[(q + j) * stride + e]! : 0);
  const f0 = c(0, 0);
  const a0 = c(0, 3);
  const b0 = c(0, 4);
  const e0 = c(0, 5);
  const c0 = idx[q]!;
  if (k === 1) {
    for (let b = 0, at = row0 + c0; b < m; b++, at += cols) {
      dfr[at] = dfr[at]! + f0 * bp[b]! + bg[b]! * (a0 * bu2[b]! + b0 * buv[b]! + e0 * bv2[b]!);
    }
    return;
  }
  // two to four parameters in one pass; the slots past k repeat the first column with zero coefficients (they
  // add 0), so one loop serves every k
  const col = (j: number) => (j < k ? idx[q + j]! : c0);
  const f1 = c(1, 0);
  const a1 = c(1, 3);
  const b1 = c(1, 4);
  const e1 = c(1, 5);
  const c1 = col(1);
  const f2 = c(2, 0);
  const a2 = c(2, 3);
  const b2 = c(2, 4);
  const e2 = c(2, 5);
  const c2 = col(2);
  const f3 = c(3, 0);
  const a3 = c(3, 3);
  const b3 = c(3, 4);
  const e3 = c(3, 5);
  const c3 = col(3);
  for (let b = 0, row = row0; b < m; b++, row += cols) {
    const p = bp[b]!;
    const g = bg[b]!;
    const x2 = bu2[b]!;
    const xy = buv[b]!;
    const y2 = bv2[b]!;
    dfr[row + c0] = dfr[row + c0]! + f0 * p + g * (a0 * x2 + b0 * xy + e0 * y2);
    dfr[row + c1] = dfr[row + c1]! + f1 * p + g * (a1 * x2 + b1 * xy + e1 * y2);
    dfr[row + c2] = dfr[row + c2]! + f2 * p + g * (a2 * x2 + b2 * xy + e2 * y2);
    dfr[row + c3] = dfr[row + c3]! + f3 * p + g * (a3 * x2 + b3 * xy + e3 * y2);
  }
}

/**
 * A real term of any number of radial factors (with or without kernel coefficients), over the m points of a
 * block: one loop per factor for its kernel values and slopes, one for the phase, then per free parameter that
 * moves the term a few loops over the factors it moves (the others are skipped).
 */
function blockTerm(
  t: JTerm,
  m: number,
  s: Scratch,
  exact: boolean,
  dfr: Float64Array,
  dfi: Float64Array,
  row0: number,
  cols: number,
): void {
  const { bu, bv, bu2, buv, bv2, bp, bc, bs, tre, tim, fre, fim, kout, fp, fg, fo, fs, bw } = s;
  const nf = t.nf;
  const M = t.m;
  const flux = t.flux;
  for (let b = 0; b < m; b++) bp[b] = 1;
  for (let f = 0; f < nf; f++) {
    const m11 = M[3 * f]!;
    const m12 = M[3 * f + 1]!;
    const m22 = M[3 * f + 2]!;
    const po = f * BLOCK;
    switch (t.codes[f]) {
      case CODE_DISK:
        for (let b = 0; b < m; b++) {
          const r2 = m11 * bu2[b]! + m12 * buv[b]! + m22 * bv2[b]!;
          const x = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
          let p: number;
          let g: number;
          if (x >= 2 && x < PIECES_END) {
            const k = pieceIndex(x);
            const tt = pieceLocal(x, k);
            p = diskP(k, tt);
            g = -PI2 * 0.125 * w2P(k, tt); // -pi^2 J2(x)/x^2, W = 8 J2/x^2
          } else {
            p = disk(x);
            g = -PI2 * j2x2(x);
          }
          fp[po + b] = p;
          fg[po + b] = g;
          bp[b] = bp[b]! * p;
        }
        break;
      case CODE_GAUSS:
        for (let b = 0; b < m; b++) {
          const r2 = m11 * bu2[b]! + m12 * buv[b]! + m22 * bv2[b]!;
          const p = Math.exp(-GK * (r2 > 0 ? r2 : 0));
          fp[po + b] = p;
          fg[po + b] = -GK * p;
          bp[b] = bp[b]! * p;
        }
        break;
      case CODE_RING:
        for (let b = 0; b < m; b++) {
          const r2 = m11 * bu2[b]! + m12 * buv[b]! + m22 * bv2[b]!;
          const x = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
          let p: number;
          let g: number;
          if (x >= 2 && x < PIECES_END) {
            const k = pieceIndex(x);
            const tt = pieceLocal(x, k);
            p = j0P(k, tt);
            g = -(PI2 / 4) * diskP(k, tt);
          } else {
            p = j0(x);
            g = -(PI2 / 4) * disk(x);
          }
          fp[po + b] = p;
          fg[po + b] = g;
          bp[b] = bp[b]! * p;
        }
        break;
      default: {
        const kernel = t.radialKernels[f]!;
        const pk = t.p[f]!;
        const np = pk.length;
        const data = t.data[f];
        const so = t.slopeOff[f]! * BLOCK;
        for (let b = 0; b < m; b++) {
          const r2 = m11 * bu2[b]! + m12 * buv[b]! + m22 * bv2[b]!;
          kernel(r2 > 0 ? r2 : 0, pk, kout, data);
          const p = kout[0]!;
          fp[po + b] = p;
          fg[po + b] = kout[1]!;
          for (let r = 0; r < np; r++) fs[so + r * BLOCK + b] = kout[2 + r]!;
          bp[b] = bp[b]! * p;
        }
      }
    }
  }
  if (t.shifted) {
    const rb = s.cols;
    if (exact) phaseRampSplit(rb, m, t.eh, t.el, t.nh, t.nl);
    else phaseRampPlain(rb, m, t.e0, t.n0);
    const rsin = rb.sin;
    const rcos = rb.cos;
    for (let b = 0; b < m; b++) {
      const c = rcos[b]!;
      const sn = -rsin[b]!;
      const a = flux * bp[b]!;
      bc[b] = c;
      bs[b] = sn;
      tre[b] = a * c;
      tim[b] = a * sn;
      fre[b] = fre[b]! + a * c;
      fim[b] = fim[b]! + a * sn;
    }
  } else {
    for (let b = 0; b < m; b++) {
      const a = flux * bp[b]!;
      bc[b] = 1;
      bs[b] = 0;
      tre[b] = a;
      tim[b] = 0;
      fre[b] = fre[b]! + a;
    }
  }
  const idx = t.idx;
  const na = idx.length;
  if (na === 0) return;
  // flux * (product of the other factors), per factor; then folded into that factor's dP/dr2 and slopes, so
  // that each parameter's loops below need one multiplication less
  if (nf === 1) fo.fill(flux, 0, m);
  else if (nf === 2) {
    for (let b = 0; b < m; b++) {
      fo[b] = flux * fp[BLOCK + b]!;
      fo[BLOCK + b] = flux * fp[b]!;
    }
  } else {
    for (let f = 0; f < nf; f++) {
      const po = f * BLOCK;
      for (let b = 0; b < m; b++) {
        let o = flux;
        for (let h = 0; h < nf; h++) if (h !== f) o *= fp[h * BLOCK + b]!;
        fo[po + b] = o;
      }
    }
  }
  for (let f = 0; f < nf; f++) {
    const po = f * BLOCK;
    for (let b = 0; b < m; b++) fg[po + b] = fg[po + b]! * fo[po + b]!;
    const so = t.slopeOff[f]! * BLOCK;
    const np = t.p[f]!.length;
    for (let r = 0; r < np; r++) {
      const sr = so + r * BLOCK;
      for (let b = 0; b < m; b++) fs[sr + b] = fs[sr + b]! * fo[po + b]!;
    }
  }
  const coef = t.coef;
  const stride = t.stride;
  for (let q = 0; q < na; q++) {
    const o = q * stride;
    const base = row0 + idx[q]!;
    const df = coef[o]!;
    const de = TWO_PI * coef[o + 1]!;
    const dn = TWO_PI * coef[o + 2]!;
    // real-amplitude part: d flux * prod + sum over factors of flux * others * (G dr2 + dP/dp dp)
    for (let b = 0; b < m; b++) bw[b] = df * bp[b]!;
    for (let f = 0; f < nf; f++) {
      const go = o + t.geoOff[f]!;
      const d11 = coef[go]!;
      const d12 = coef[go + 1]!;
      const d22 = coef[go + 2]!;
      const po = f * BLOCK;
      if (d11 !== 0 || d12 !== 0 || d22 !== 0) {
        for (let b = 0; b < m; b++) {
          const dr2 = d11 * bu2[b]! + d12 * buv[b]! + d22 * bv2[b]!;
          bw[b] = bw[b]! + fg[po + b]! * dr2;
        }
      }
      const np = t.p[f]!.length;
      const co = o + t.coefOff[f]!;
      const so = t.slopeOff[f]! * BLOCK;
      for (let r = 0; r < np; r++) {
        const dc = coef[co + r]!;
        if (dc === 0) continue;
        const sr = so + r * BLOCK;
        for (let b = 0; b < m; b++) bw[b] = bw[b]! + fs[sr + b]! * dc;
      }
    }
    if (!t.shifted && de === 0 && dn === 0) {
      for (let b = 0, at = base; b < m; b++, at += cols) dfr[at] = dfr[at]! + bw[b]!;
    } else {
      for (let b = 0, at = base; b < m; b++, at += cols) {
        // phase part: d/dp exp(-2 pi i q.x) = -2 pi i (u dx + v dy) exp(...)
        const w = bw[b]!;
        const ws = bu[b]! * de + bv[b]! * dn;
        dfr[at] = dfr[at]! + w * bc[b]! + ws * tim[b]!;
        dfi[at] = dfi[at]! + w * bs[b]! - ws * tre[b]!;
      }
    }
  }
}

/** A term with a complex (non-radial) factor at block point b. */
function complexTerm(
  t: JTerm,
  b: number,
  s: Scratch,
  exact: boolean,
  dfr: Float64Array,
  dfi: Float64Array,
  row: number,
): void {
  const { kout, pr, pi, or, oi, sv, fre, fim } = s;
  const uu = s.bu[b]!;
  const vv = s.bv[b]!;
  const u2 = s.bu2[b]!;
  const uv2 = s.buv[b]!;
  const v2 = s.bv2[b]!;
  const nf = t.nf;
  let zr = 1;
  let zi = 0;
  for (let f = 0; f < nf; f++) {
    const pk = t.p[f]!;
    const so = t.slopeOff[f]!;
    let xr: number;
    let xi = 0;
    if (t.codes[f] === CODE_COMPLEX) {
      const a = t.a;
      // w = A^T q
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
    if (exact) sinCosSplit(uu, vv, t.eh, t.el, t.nh, t.nl);
    else sinCos(uu * t.e0 + vv * t.n0);
    c = SC[1]!;
    sn = -SC[0]!;
  }
  const flux = t.flux;
  // term value flux * z * (c + i sn)
  const tre = flux * (zr * c - zi * sn);
  const tim = flux * (zr * sn + zi * c);
  fre[b] = fre[b]! + tre;
  fim[b] = fim[b]! + tim;
  const idx = t.idx;
  const na = idx.length;
  if (na === 0) return;
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
    const at = row + idx[q]!;
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
    dfr[at] = dfr[at]! + xr * c - xi * sn + ws * tim;
    dfi[at] = dfi[at]! + xr * sn + xi * c - ws * tre;
  }
}
