/**
 * Compiled evaluation plans: a canonical form turned into numbers in radians and kernel codes, run over columns
 * of spatial frequencies with no allocation per point.
 *
 * @module
 */
import { ModelError } from '../errors.js';
import { BLOCK_POINTS, blockColumns, loadBlock, phaseRampPlain, phaseRampSplit } from '../kernels/block.js';
import { RADIAL_LINEAR_LD, RADIAL_QUADRATIC_LD } from '../kernels/components.js';
import { limbPieces } from '../kernels/limb-pieces.js';
import { phaseNeedsSplit, splitHead } from '../kernels/sincos.js';
import {
  addLimbDarkenedTerm,
  addPointTerm,
  addRadialProductTerm,
  addRadialTerm,
  RADIAL_GAUSSIAN,
  RADIAL_THIN_RING,
  RADIAL_UNIFORM_DISK,
} from '../kernels/terms.js';
import { maxAbs, RAD_PER_MAS } from '../units/index.js';
import type { DualTerm, FactorKind } from './canonical.js';
import {
  addComponentTerm,
  COMPONENT_CODES,
  componentCoefficients,
  isComponentFactor,
} from './component-plan.js';

/**
 * Below this fraction of the sum of |flux| the total flux counts as zero and the model cannot be normalised.
 * (1e-10: cancellation to that depth leaves fewer than six significant digits in any normalised visibility.)
 */
export const ZERO_FLUX_FRACTION = 1e-10;

const RADIAL_CODES: Readonly<Record<FactorKind, number>> = {
  uniformDisk: RADIAL_UNIFORM_DISK,
  gaussian: RADIAL_GAUSSIAN,
  thinRing: RADIAL_THIN_RING,
  ...COMPONENT_CODES,
};

/** A factor ready for a kernel: M = A A^T in rad^2 for radial kinds. */
export interface PlanFactor {
  readonly code: number;
  readonly m11: number;
  readonly m12: number;
  readonly m22: number;
  /** A (row-major) in radians per unit, used by non-radial kinds. */
  readonly a11: number;
  readonly a12: number;
  readonly a21: number;
  readonly a22: number;
  /** Kernel coefficients computed from the shape parameters (empty for the foundation kinds). */
  readonly p: Float64Array;
  /** Tabulated data of data-driven kinds (null otherwise). */
  readonly data: unknown;
}

export interface PlanTerm {
  readonly flux: number;
  /** Shift in radians. */
  readonly e0: number;
  readonly n0: number;
  readonly factors: readonly PlanFactor[];
  /**
   * @internal How {@link runPlan} evaluates the term: its factors' codes and quadratic forms packed for one
   * fused loop (foundation radial products), or null when the term goes through the general loops.
   */
  readonly fused?: { readonly codes: Int32Array; readonly m: Float64Array; readonly ratio: number } | null;
  /** @internal True when a factor is one of the extended components (run over all points, after the blocks). */
  readonly component?: boolean;
  /** @internal For a lone limb-darkened disk: its law's table on the unit pieces (limbPieces, limb-pieces.ts). */
  readonly limb?: Float64Array | null;
  /** @internal Heads and tails of the shift (splitHead: e0 head, tail, n0 head, tail), for the split phase ramp. */
  readonly split?: Float64Array;
}

/** A compiled model: terms in radians with kernel codes, the total flux, and scratch buffers. */
export interface Plan {
  readonly terms: readonly PlanTerm[];
  /** Sum of the term fluxes (the unnormalised F(0, 0)). */
  readonly totalFlux: number;
  /** Scratch held by the plan and grown when needed (not shared across threads). */
  scratch: Float64Array;
}

/**
 * The ratio r with M_b = r M_a when two factors' quadratic forms are proportional to rounding (a blurred ring
 * or disk: both factors seen through one map, scaled), else NaN.
 * @param a - first factor
 * @param b - second factor
 */
function formRatio(a: PlanFactor, b: PlanFactor): number {
  const ta = a.m11 + a.m22;
  if (!(ta > 0)) return Number.NaN;
  const r = (b.m11 + b.m22) / ta;
  const tol = 1e-14 * (b.m11 + b.m22);
  const close = (x: number, y: number) => Math.abs(y - r * x) <= tol;
  return close(a.m11, b.m11) && close(a.m12, b.m12) && close(a.m22, b.m22) ? r : Number.NaN;
}

/**
 * Compiles canonical terms into a plan.
 *
 * @param terms - canonical terms (values only are used)
 * @param path - model path for error messages
 * @throws ModelError when the total flux is zero (|sum flux| < ZERO_FLUX_FRACTION * sum |flux|)
 */
export function compilePlan(terms: readonly DualTerm[], path = 'model'): Plan {
  let total = 0;
  let absTotal = 0;
  const out: PlanTerm[] = [];
  for (const t of terms) {
    total += t.flux.v;
    absTotal += Math.abs(t.flux.v);
    if (t.flux.v === 0) continue;
    const factors: PlanFactor[] = t.factors.map((f) => {
      const a = f.a;
      const s = RAD_PER_MAS * RAD_PER_MAS;
      const a11 = a[0].v;
      const a12 = a[1].v;
      const a21 = a[2].v;
      const a22 = a[3].v;
      // |A^T q|^2 = q^T (A A^T) q
      return {
        code: RADIAL_CODES[f.kind],
        a11: a11 * RAD_PER_MAS,
        a12: a12 * RAD_PER_MAS,
        a21: a21 * RAD_PER_MAS,
        a22: a22 * RAD_PER_MAS,
        p: componentCoefficients(
          RADIAL_CODES[f.kind],
          f.shape.map((x) => x.v),
        ),
        data: f.data ?? null,
        m11: (a11 * a11 + a12 * a12) * s,
        m12: (a11 * a21 + a12 * a22) * s,
        m22: (a21 * a21 + a22 * a22) * s,
      };
    });
    const foundation = factors.length > 1 && factors.every((f) => !isComponentFactor(f));
    const fused = foundation
      ? {
          codes: Int32Array.from(factors, (f) => f.code),
          m: Float64Array.from(factors.flatMap((f) => [f.m11, f.m12, f.m22])),
          ratio: factors.length === 2 ? formRatio(factors[0]!, factors[1]!) : Number.NaN,
        }
      : null;
    // a lone limb-darkened disk has its own block kernel (addLimbDarkenedTerm); other components do not
    const loneLimb =
      factors.length === 1 &&
      (factors[0]!.code === RADIAL_LINEAR_LD || factors[0]!.code === RADIAL_QUADRATIC_LD);
    const component = !loneLimb && factors.some(isComponentFactor);
    const lp = factors[0]?.p;
    const limb = loneLimb
      ? limbPieces(lp![0]!, lp![1]!, factors[0]!.code === RADIAL_QUADRATIC_LD ? lp![2]! : 0)
      : null;
    const e0 = t.east.v * RAD_PER_MAS;
    const n0 = t.north.v * RAD_PER_MAS;
    out.push({
      flux: t.flux.v,
      e0,
      n0,
      factors,
      fused,
      component,
      limb,
      split: Float64Array.of(splitHead(e0), e0 - splitHead(e0), splitHead(n0), n0 - splitHead(n0)),
    });
  }
  checkTotalFlux(total, absTotal, path);
  return { terms: out, totalFlux: total, scratch: new Float64Array(0) };
}

/**
 * Throws when a total flux cannot normalise visibilities.
 *
 * @param total - sum of the term fluxes
 * @param absTotal - sum of their magnitudes
 * @param path - model path for the message
 * @throws ModelError when |total| < ZERO_FLUX_FRACTION * absTotal (or every flux is zero)
 */
export function checkTotalFlux(total: number, absTotal: number, path: string): void {
  if (!(Math.abs(total) >= ZERO_FLUX_FRACTION * absTotal) || absTotal === 0) {
    throw new ModelError(
      `${path}: the total flux is ${total} (sum of |flux| ${absTotal}), so visibilities cannot be normalised; ` +
        `give the model a total flux whose magnitude is at least ${ZERO_FLUX_FRACTION} of the sum of |flux|`,
      { modelPath: path },
    );
  }
}

/**
 * Points per block of {@link runPlan}: the block's u, v, re and im (32 kB) stay in the first- or second-level
 * cache while every term adds into them, instead of one pass over the whole columns per term.
 */
export const PLAN_BLOCK = BLOCK_POINTS;

/**
 * Evaluates the normalised complex visibility of a plan into `re`, `im`.
 *
 * @param plan - a compiled plan
 * @param u - spatial frequencies east, cycles per radian
 * @param v - spatial frequencies north, cycles per radian
 * @param re - output real parts (length >= n); may not alias u or v
 * @param im - output imaginary parts (length >= n)
 * @param n - number of points
 * @param uBound - optional: an upper bound on |u| over the points (NaN: none known)
 * @param vBound - optional: an upper bound on |v| over the points
 *
 * Notes: terms of the foundation kinds and the limb-darkened disks run block by block ({@link PLAN_BLOCK}
 * points), with the decision between the split and the plain phase ramp ({@link phaseNeedsSplit}) taken per
 * block from its largest |u| and |v|; terms with other components run over all points afterwards (their
 * kernels keep scratch of the full length). Without such terms each term's flux is divided by the total flux
 * before it is added (no last pass); with them, the sum is normalised at the end.
 */
export function runPlan(
  plan: Plan,
  u: Float64Array,
  v: Float64Array,
  re: Float64Array,
  im: Float64Array,
  n: number,
  uBound = Number.NaN,
  vBound = Number.NaN,
): void {
  const terms = plan.terms;
  const k = 1 / plan.totalFlux;
  let late = false;
  // the largest |u|, |v| of each block decide between the plain and the split phase, unless bounds over all
  // points (the caller's, from its finiteness check) already say that no term needs the split one
  let perBlock = false;
  for (const t of terms) {
    if (t.component === true) late = true;
    else if ((t.e0 !== 0 || t.n0 !== 0) && phaseNeedsSplit(uBound, vBound, t.e0, t.n0)) perBlock = true;
  }
  // the phase ramps of block.ts (WebAssembly SIMD where it runs): u and v of each block are loaded into their
  // columns once when a term is shifted, then one call per shifted term
  const bc = blockColumns();
  const load = terms.some((t) => t.component !== true && (t.e0 !== 0 || t.n0 !== 0));
  // without extended components every term is added already normalised (flux / total), with no last pass
  const scale = late ? 1 : k;
  for (let b0 = 0; b0 < n; b0 += PLAN_BLOCK) {
    const b1 = b0 + PLAN_BLOCK < n ? b0 + PLAN_BLOCK : n;
    const len = b1 - b0;
    re.fill(0, b0, b1);
    im.fill(0, b0, b1);
    const uMax = perBlock ? maxAbs(u, b0, b1) : uBound;
    const vMax = perBlock ? maxAbs(v, b0, b1) : vBound;
    if (load) loadBlock(bc, u, v, b0, len);
    for (let j = 0; j < terms.length; j++) {
      const t = terms[j]!;
      if (t.component === true) continue; // a term with other components: below, over all points
      const nf = t.factors.length;
      const f0 = t.factors[0];
      const flux = t.flux * scale;
      const shifted = t.e0 !== 0 || t.n0 !== 0;
      if (shifted) {
        if (phaseNeedsSplit(uMax, vMax, t.e0, t.n0)) {
          const sp = t.split!;
          phaseRampSplit(bc, len, sp[0]!, sp[1]!, sp[2]!, sp[3]!);
        } else phaseRampPlain(bc, len, t.e0, t.n0);
      }
      if (nf === 1 && (f0!.code === RADIAL_LINEAR_LD || f0!.code === RADIAL_QUADRATIC_LD)) {
        const p = f0!.p;
        const c2 = f0!.code === RADIAL_QUADRATIC_LD ? p[2]! : 0;
        addLimbDarkenedTerm(
          re,
          im,
          u,
          v,
          b0,
          b1,
          flux,
          f0!.m11,
          f0!.m12,
          f0!.m22,
          p[0]!,
          p[1]!,
          c2,
          t.limb!,
          bc,
          shifted,
        );
      } else if (nf === 0) {
        addPointTerm(re, im, b0, b1, flux, bc, shifted);
      } else if (nf === 1) {
        const f = f0!;
        addRadialTerm(f.code, re, im, u, v, b0, b1, flux, f.m11, f.m12, f.m22, bc, shifted);
      } else {
        // a product of foundation kinds (compilePlan packed it): one fused pass, no scratch
        const fused = t.fused!;
        addRadialProductTerm(fused.codes, fused.m, nf, re, im, u, v, b0, b1, flux, bc, shifted, fused.ratio);
      }
    }
  }
  if (!late) return;
  for (const t of terms) {
    if (t.component === true) addComponentTerm(plan, t.flux, t.e0, t.n0, t.factors, u, v, re, im, n);
  }
  for (let i = 0; i < n; i++) {
    re[i] = re[i]! * k;
    im[i] = im[i]! * k;
  }
}
