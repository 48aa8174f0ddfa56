/**
 * Visibility kernels of canonical terms: loops over typed arrays that add one term's complex contribution
 * `flux * P(A^T q) * exp(-2 pi i q . x0)` into `re`, `im` for the points start..end - 1 (the plan runs them on
 * blocks of points small enough to stay in the first-level caches). No objects are created inside the loops.
 *
 * Layout: complex numbers are held as separate `re` and `im` Float64Arrays of equal length.
 * Units: u, v in cycles per radian; quadratic forms M = A A^T in rad^2; shifts e0, n0 in radians.
 *
 * The block kernels (addPointTerm, addRadialTerm, addRadialProductTerm, addLimbDarkenedTerm) take the block's
 * columns of block.ts, loaded with the block's u and v (index j for the point start + j); for a shifted term
 * (`shifted` true) `bc.sin` and `bc.cos` already hold its phase ramp.
 *
 * @module
 */
import { besselJ0 as besselJ0Import, diskAmplitude as diskAmplitudeImport } from './bessel.js';
import { HANKEL_START as PIECES_END, pieceIndex, pieceLocal } from './bessel-coefficients.js';
import type { BlockColumns } from './block.js';
import { quadraticLimbAmplitude as quadraticLimbAmplitudeImport } from './components.js';
import { basisPiece as basisPieceImport } from './limb-pieces.js';
import {
  SIN_COS as SIN_COS_IMPORT,
  sinCosPhase as sinCosPhaseImport,
  sinCosTurns as sinCosTurnsImport,
  splitHead,
} from './sincos.js';

// Every loop below copies the imported kernels and the SIN_COS buffer into locals before it starts: a read of
// an imported binding inside a hot loop is a module-cell load with a check that the binding is initialised,
// and measured (benchmarks/run.ts, sincos floor) it made a phase ramp about three times slower than with locals.

/** pi^2 / (4 ln 2): the Gaussian exponent per unit (FWHM q)^2. */
export const GAUSS_K = (Math.PI * Math.PI) / (4 * Math.LN2);

/** Radial kernel codes (unit-size primitives). */
export const RADIAL_UNIFORM_DISK = 0;
/** Gaussian of unit FWHM. */
export const RADIAL_GAUSSIAN = 1;
/** Thin ring of unit diameter. */
export const RADIAL_THIN_RING = 2;

/**
 * Adds a term without size, `flux * exp(-2 pi i (u e0 + v n0))`, from its phase ramp.
 *
 * @param re - real parts to add into
 * @param im - imaginary parts to add into
 * @param start - first point
 * @param end - one past the last point
 * @param flux - term flux
 * @param bc - the block columns (block.ts); with `shifted`, `bc.sin[j]` and `bc.cos[j]` hold sin and cos of
 *   2 pi (u e0 + v n0) at the point start + j
 * @param shifted - whether the term is shifted (false: a term at the origin)
 */
export function addPointTerm(
  re: Float64Array,
  im: Float64Array,
  start: number,
  end: number,
  flux: number,
  bc: BlockColumns,
  shifted: boolean,
): void {
  if (!shifted) {
    for (let i = start; i < end; i++) re[i] = re[i]! + flux;
    return;
  }
  const sn = bc.sin;
  const cs = bc.cos;
  for (let i = start, j = 0; i < end; i++, j++) {
    re[i] = re[i]! + flux * cs[j]!;
    im[i] = im[i]! - flux * sn[j]!;
  }
}

/**
 * Multiplies `amp[i]` by a radial unit kernel evaluated at r = sqrt(q^T M q).
 *
 * @param code - one of the RADIAL_* codes
 * @param amp - amplitudes to multiply in place
 * @param u - spatial frequencies east (cycles/rad)
 * @param v - spatial frequencies north (cycles/rad)
 * @param start - first point
 * @param end - one past the last point
 * @param m11 - quadratic form entries of M = A A^T (rad^2)
 * @param m12 - off-diagonal entry
 * @param m22 - second diagonal entry
 */
export function mulRadial(
  code: number,
  amp: Float64Array,
  u: Float64Array,
  v: Float64Array,
  start: number,
  end: number,
  m11: number,
  m12: number,
  m22: number,
): void {
  const diskAmplitude = diskAmplitudeImport;
  const besselJ0 = besselJ0Import;
  const m12x2 = 2 * m12;
  switch (code) {
    case RADIAL_UNIFORM_DISK:
      for (let i = start; i < end; i++) {
        const uu = u[i]!;
        const vv = v[i]!;
        const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
        amp[i] = amp[i]! * diskAmplitude(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
      }
      return;
    case RADIAL_GAUSSIAN:
      for (let i = start; i < end; i++) {
        const uu = u[i]!;
        const vv = v[i]!;
        const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
        amp[i] = amp[i]! * Math.exp(-GAUSS_K * (r2 > 0 ? r2 : 0));
      }
      return;
    case RADIAL_THIN_RING:
      for (let i = start; i < end; i++) {
        const uu = u[i]!;
        const vv = v[i]!;
        const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
        amp[i] = amp[i]! * besselJ0(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
      }
      return;
    default:
      throw new Error(`mulRadial: unknown kernel code ${code}`);
  }
}

/**
 * Adds a term with one radial factor: `flux * P(r) * exp(-2 pi i (u e0 + v n0))`, fused in one pass.
 *
 * @param code - one of the RADIAL_* codes
 * @param re - real parts to add into
 * @param im - imaginary parts to add into
 * @param u - spatial frequencies east (cycles/rad)
 * @param v - spatial frequencies north (cycles/rad)
 * @param start - first point
 * @param end - one past the last point
 * @param flux - term flux
 * @param m11 - quadratic form entries of M = A A^T (rad^2)
 * @param m12 - off-diagonal entry
 * @param m22 - second diagonal entry
 * @param bc - the block columns (block.ts), u and v loaded; with `shifted`, sin and cos hold the phase ramp
 * @param shifted - whether the term is shifted
 *
 * Notes: this is the hot path of most models (one shifted disk, Gaussian or ring): one kernel call per point,
 * the phase ramp read from the block's columns.
 */
export function addRadialTerm(
  code: number,
  re: Float64Array,
  im: Float64Array,
  u: Float64Array,
  v: Float64Array,
  start: number,
  end: number,
  flux: number,
  m11: number,
  m12: number,
  m22: number,
  bc: BlockColumns,
  shifted: boolean,
): void {
  const diskAmplitude = diskAmplitudeImport;
  const besselJ0 = besselJ0Import;
  const m12x2 = 2 * m12;
  const sn = shifted ? bc.sin : null;
  const cs = shifted ? bc.cos : null;
  switch (code) {
    case RADIAL_UNIFORM_DISK:
      if (sn !== null && cs !== null) {
        for (let i = start, j = 0; i < end; i++, j++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          const a = flux * diskAmplitude(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
          re[i] = re[i]! + a * cs[j]!;
          im[i] = im[i]! - a * sn[j]!;
        }
      } else {
        for (let i = start; i < end; i++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          re[i] = re[i]! + flux * diskAmplitude(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
        }
      }
      return;
    case RADIAL_GAUSSIAN:
      if (sn !== null && cs !== null) {
        for (let i = start, j = 0; i < end; i++, j++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          const a = flux * Math.exp(-GAUSS_K * (r2 > 0 ? r2 : 0));
          re[i] = re[i]! + a * cs[j]!;
          im[i] = im[i]! - a * sn[j]!;
        }
      } else {
        for (let i = start; i < end; i++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          re[i] = re[i]! + flux * Math.exp(-GAUSS_K * (r2 > 0 ? r2 : 0));
        }
      }
      return;
    case RADIAL_THIN_RING:
      if (sn !== null && cs !== null) {
        for (let i = start, j = 0; i < end; i++, j++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          const a = flux * besselJ0(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
          re[i] = re[i]! + a * cs[j]!;
          im[i] = im[i]! - a * sn[j]!;
        }
      } else {
        for (let i = start; i < end; i++) {
          const uu = u[i]!;
          const vv = v[i]!;
          const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
          re[i] = re[i]! + flux * besselJ0(Math.PI * Math.sqrt(r2 > 0 ? r2 : 0));
        }
      }
      return;
    default:
      throw new Error(`addRadialTerm: unknown kernel code ${code}`);
  }
}

// The foundation radial factors at r^2 = q^T M q >= 0, one small function each, picked once per term (see
// addRadialProductTerm): a call site that meets one or two of them is inlined, where one function that branched
// on the kind inside the loop measured about 9 ns per point slower for a blurred ring.
const diskAmplitudeLocal = diskAmplitudeImport;
const besselJ0Local = besselJ0Import;
function gaussianUnit(r2: number): number {
  return Math.exp(-GAUSS_K * r2);
}
function diskUnit(r2: number): number {
  return diskAmplitudeLocal(Math.PI * Math.sqrt(r2));
}
function ringUnit(r2: number): number {
  return besselJ0Local(Math.PI * Math.sqrt(r2));
}
/**
 * The unit function of a foundation radial kind.
 * @param code - RADIAL_GAUSSIAN, RADIAL_UNIFORM_DISK or RADIAL_THIN_RING (checked by the caller)
 */
function radialUnit(code: number): (r2: number) => number {
  return code === RADIAL_GAUSSIAN ? gaussianUnit : code === RADIAL_UNIFORM_DISK ? diskUnit : ringUnit;
}

/**
 * Adds `amp[i] * exp(-2 pi i (u e0 + v n0))` for real amplitudes already multiplied by the term's flux.
 */
export function addAmplitudeTerm(
  re: Float64Array,
  im: Float64Array,
  amp: Float64Array,
  u: Float64Array,
  v: Float64Array,
  start: number,
  end: number,
  e0: number,
  n0: number,
  exact: boolean,
): void {
  const sinCosPhase = sinCosPhaseImport;
  const sinCosTurns = sinCosTurnsImport;
  const eh = splitHead(e0);
  const el = e0 - eh;
  const nh = splitHead(n0);
  const nl = n0 - nh;
  const SIN_COS = SIN_COS_IMPORT;
  if (e0 === 0 && n0 === 0) {
    for (let i = start; i < end; i++) re[i] = re[i]! + amp[i]!;
    return;
  }
  for (let i = start; i < end; i++) {
    const uu = u[i]!;
    const vv = v[i]!;
    if (exact) sinCosPhase(uu, vv, eh, el, nh, nl);
    else sinCosTurns(uu * e0 + vv * n0);
    const a = amp[i]!;
    re[i] = re[i]! + a * SIN_COS[1]!;
    im[i] = im[i]! - a * SIN_COS[0]!;
  }
}

/**
 * Adds a term that is a product of foundation radial factors (uniform disk, Gaussian, thin ring), each seen
 * through its own quadratic form, `flux * prod_f P_f(sqrt(q^T M_f q)) * exp(-2 pi i (u e0 + v n0))`, in one
 * pass over the points with no scratch buffer (a convolution such as `gaussianRing` gives such terms).
 *
 * @param codes - RADIAL_* code of each factor
 * @param m - per factor the entries m11, m12, m22 of M = A A^T (rad^2), 3 numbers per factor
 * @param nf - number of factors (codes.length)
 * @param re - real parts to add into
 * @param im - imaginary parts to add into
 * @param u - spatial frequencies east (cycles/rad)
 * @param v - spatial frequencies north (cycles/rad)
 * @param start - first point
 * @param end - one past the last point
 * @param flux - term flux
 * @param bc - the block columns (block.ts), u and v loaded; with `shifted`, sin and cos hold the phase ramp
 * @param shifted - whether the term is shifted
 * @param ratio - for two factors whose forms are proportional to rounding (M_1 = ratio M_0, compilePlan finds
 *   them), the ratio, so that one form serves both; NaN otherwise
 *
 * Notes: gives the same numbers as multiplying the factors one loop at a time ({@link mulRadial}) and adding the
 * ramp ({@link addAmplitudeTerm}): the factors are multiplied into the flux in the same order.
 */
export function addRadialProductTerm(
  codes: Int32Array,
  m: Float64Array,
  nf: number,
  re: Float64Array,
  im: Float64Array,
  u: Float64Array,
  v: Float64Array,
  start: number,
  end: number,
  flux: number,
  bc: BlockColumns,
  shifted: boolean,
  ratio = Number.NaN,
): void {
  const diskAmplitude = diskAmplitudeImport;
  const besselJ0 = besselJ0Import;
  const sn = shifted ? bc.sin : null;
  const cs = shifted ? bc.cos : null;
  for (let f = 0; f < nf; f++) {
    const c = codes[f]!;
    if (c !== RADIAL_UNIFORM_DISK && c !== RADIAL_GAUSSIAN && c !== RADIAL_THIN_RING) {
      throw new Error(`addRadialProductTerm: unknown kernel code ${c}`);
    }
  }
  if (nf === 2) {
    // two factors (a blurred ring, a blurred disk): unrolled, the forms in locals, the kernels picked once
    const k0 = radialUnit(codes[0]!);
    const k1 = radialUnit(codes[1]!);
    const a11 = m[0]!;
    const a12 = 2 * m[1]!;
    const a22 = m[2]!;
    const b11 = m[3]!;
    const b12 = 2 * m[4]!;
    const b22 = m[5]!;
    // a blurred ring or disk: both factors seen through one map, so M_1 = ratio M_0 and one form serves both
    const proportional = !Number.isNaN(ratio);
    for (let i = start, j = 0; i < end; i++, j++) {
      const uu = u[i]!;
      const vv = v[i]!;
      const r2a = a11 * uu * uu + a12 * uu * vv + a22 * vv * vv;
      const r2b = proportional ? ratio * r2a : b11 * uu * uu + b12 * uu * vv + b22 * vv * vv;
      const a = flux * k0(r2a > 0 ? r2a : 0) * k1(r2b > 0 ? r2b : 0);
      if (sn !== null && cs !== null) {
        re[i] = re[i]! + a * cs[j]!;
        im[i] = im[i]! - a * sn[j]!;
      } else re[i] = re[i]! + a;
    }
    return;
  }
  for (let i = start, j = 0; i < end; i++, j++) {
    const uu = u[i]!;
    const vv = v[i]!;
    let a = flux;
    for (let f = 0; f < nf; f++) {
      const o = 3 * f;
      // the same expression (and rounding) as mulRadial's
      const r2raw = m[o]! * uu * uu + 2 * m[o + 1]! * uu * vv + m[o + 2]! * vv * vv;
      const r2 = r2raw > 0 ? r2raw : 0;
      const c = codes[f]!;
      if (c === RADIAL_GAUSSIAN) a *= Math.exp(-GAUSS_K * r2);
      else if (c === RADIAL_UNIFORM_DISK) a *= diskAmplitude(Math.PI * Math.sqrt(r2));
      else a *= besselJ0(Math.PI * Math.sqrt(r2));
    }
    if (sn !== null && cs !== null) {
      re[i] = re[i]! + a * cs[j]!;
      im[i] = im[i]! - a * sn[j]!;
    } else re[i] = re[i]! + a;
  }
}

/**
 * Adds a term with one linearly or quadratically limb-darkened disk factor,
 * `flux * V_LD(pi sqrt(q^T M q)) * exp(-2 pi i (u e0 + v n0))`, in one pass.
 *
 * @param re - real parts to add into
 * @param im - imaginary parts to add into
 * @param u - spatial frequencies east (cycles/rad)
 * @param v - spatial frequencies north (cycles/rad)
 * @param start - first point
 * @param end - one past the last point
 * @param flux - term flux
 * @param m11 - M = A A^T entries (rad^2)
 * @param m12 - off-diagonal entry
 * @param m22 - second diagonal entry
 * @param c1 - weight of 2 J1(x)/x (see limbDarkenedCoefficients in components.ts)
 * @param c32 - weight of L_{3/2}(x) = 3 (sin x - x cos x) / x^3
 * @param c2 - weight of 8 J2(x)/x^2 (0 for the linear law)
 * @param pieces - the law's table on the unit pieces, limbPieces(c1, c32, c2) (limb-pieces.ts)
 * @param bc - the block columns (block.ts), u and v loaded; with `shifted`, sin and cos hold the phase ramp
 * @param shifted - whether the term is shifted
 *
 * Notes: from 2 to HANKEL_START (48) the whole law is one polynomial per piece (`pieces`, the basis tables of
 * bessel-coefficients.ts added with the law's weights; error of each basis polynomial below 6e-17); elsewhere it
 * calls `quadraticLimbAmplitude` of components.ts (series below 2, closed forms beyond 48). The two agree to
 * about 1e-16 (tests/model/limb-darkening.test.ts checks the values against closed forms to 2e-14).
 */
export function addLimbDarkenedTerm(
  re: Float64Array,
  im: Float64Array,
  u: Float64Array,
  v: Float64Array,
  start: number,
  end: number,
  flux: number,
  m11: number,
  m12: number,
  m22: number,
  c1: number,
  c32: number,
  c2: number,
  pieces: Float64Array,
  bc: BlockColumns,
  shifted: boolean,
): void {
  const outside = quadraticLimbAmplitudeImport;
  const basisPiece = basisPieceImport;
  const m12x2 = 2 * m12;
  const sn = shifted ? bc.sin : null;
  const cs = shifted ? bc.cos : null;
  for (let i = start, j = 0; i < end; i++, j++) {
    const uu = u[i]!;
    const vv = v[i]!;
    const r2 = m11 * uu * uu + m12x2 * uu * vv + m22 * vv * vv;
    const x = Math.PI * Math.sqrt(r2 > 0 ? r2 : 0);
    let p: number;
    if (x >= 2 && x < PIECES_END) {
      // the law's own polynomial on the piece (limbPieces): c1 D + c32 L + c2 W in one evaluation
      const k = pieceIndex(x);
      p = basisPiece(pieces, k, pieceLocal(x, k));
    } else p = outside(x, c1, c32, c2); // near the centre and beyond the tables (closed forms, series)
    const a = flux * p;
    if (sn !== null && cs !== null) {
      re[i] = re[i]! + a * cs[j]!;
      im[i] = im[i]! - a * sn[j]!;
    } else re[i] = re[i]! + a;
  }
}
