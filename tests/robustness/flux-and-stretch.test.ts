/**
 * Negative and near-zero total flux (CONVENTIONS.md: a total flux of zero, or of magnitude below
 * ZERO_FLUX_FRACTION of the sum of |flux|, cannot be normalised and is an error, never a NaN), and extremely
 * elongated stretches (factors 1e-6 and 1e6) of every component kind, which must give finite visibilities.
 */
import { describe, expect, it } from 'vitest';
import { ModelError, UvskyError } from '../../src/errors.js';
import {
  annulus,
  background,
  chromaticVis2,
  disk,
  ellipse,
  exponential,
  gaussian,
  gaussianRing,
  limbDarkenedDisk,
  linearLaw,
  lorentzian,
  type Model,
  modulatedRing,
  observableJacobian,
  param,
  pixelImage,
  point,
  powerLaw,
  quadraticLaw,
  radialProfile,
  ring,
  ZERO_FLUX_FRACTION,
} from '../../src/index.js';

/** |V(0) - 1| allowed after normalising by a total flux that cancels to 1e-10 of the sum of |flux|. */
const CANCELLED_NORMALISATION_TOL = 1e-5;

/** point(shifted) of flux 1 plus a point of flux -(1 - d): total d, sum of |flux| 2 - d, ratio r = d / (2 - d). */
function cancelling(ratio: number): Model {
  const d = (2 * ratio) / (1 + ratio);
  return point()
    .shift(1, 0)
    .plus(point().weight(-(1 - d)));
}

function modelErrorOf(f: () => unknown): ModelError {
  try {
    f();
  } catch (e) {
    if (e instanceof ModelError) return e;
    throw e;
  }
  throw new Error('no error');
}

describe('negative and near-zero total flux', () => {
  it('a total flux of exactly zero is a ModelError naming the total flux, at every evaluation', () => {
    const m = disk({ diameter: 1 }).plus(disk({ diameter: 1 }).weight(-1));
    expect(m.flux).toBe(0);
    for (const f of [
      () => m.visibilities([1e7], [0]),
      () => m.vis2([1e7], [0]),
      () => m.closurePhase([1e7], [0], [0], [1e7]),
      () => chromaticVis2(m, { ucoord: [10], vcoord: [0], wavelength: [2e-6] }),
    ]) {
      expect(modelErrorOf(f).message).toContain('total flux is 0');
    }
  });

  it('a cancellation just above ZERO_FLUX_FRACTION of the sum of |flux| still normalises', () => {
    const m = cancelling(1.5 * ZERO_FLUX_FRACTION);
    const r = m.visibilities([0, 1e8], [0, 0]);
    expect(Math.abs(r.re[0]! - 1)).toBeLessThan(CANCELLED_NORMALISATION_TOL);
    expect([...r.re, ...r.im].every(Number.isFinite)).toBe(true);
  });

  it('a cancellation just below ZERO_FLUX_FRACTION is a ModelError, not a huge or NaN visibility', () => {
    const m = cancelling(0.5 * ZERO_FLUX_FRACTION);
    expect(modelErrorOf(() => m.visibilities([0], [0])).message).toMatch(/cannot be normalised/);
  });

  it('a Jacobian of a zero-flux model is an error, never NaN', () => {
    const m = disk({ diameter: param('d', 1) }).plus(disk({ diameter: 2 }).weight(-1));
    expect(() => observableJacobian(m, 'vis2', { u: [1e7], v: [0] })).toThrow(UvskyError);
  });

  it('a negative total flux normalises to V(0) = 1, and negative components subtract', () => {
    const m = point().weight(-2).plus(point().shift(3, 0));
    expect(m.flux).toBe(-1);
    expect(m.visibility(0, 0).re).toBe(1);
    // a disk with a negative point in its centre: V = (D - 0.5) / 0.5
    const hole = disk({ diameter: 2 }).plus(point().weight(-0.5));
    const q = 5e7;
    const d = disk({ diameter: 2 }).visibility(q, 0).re;
    expect(Math.abs(hole.visibility(q, 0).re - (d - 0.5) / 0.5)).toBeLessThan(1e-15);
  });
});

/** Every component kind (flux 1), for the stretches. */
const KINDS: ReadonlyArray<readonly [string, Model]> = [
  ['point', point()],
  ['disk', disk({ diameter: 2 })],
  ['gaussian', gaussian({ fwhm: 2 })],
  ['ring', ring({ diameter: 2 })],
  ['ellipse', ellipse({ major: 3, minor: 1, pa: 30 })],
  ['linear limb-darkened disk', limbDarkenedDisk({ diameter: 2, law: linearLaw(0.5) })],
  ['quadratic limb-darkened disk', limbDarkenedDisk({ diameter: 2, law: quadraticLaw(0.3, 0.2) })],
  ['power-law limb-darkened disk', limbDarkenedDisk({ diameter: 2, law: powerLaw(0.3) })],
  ['annulus', annulus({ inner: 1, outer: 2 })],
  ['thin annulus', annulus({ inner: 1.99, outer: 2 })],
  ['Gaussian ring', gaussianRing({ diameter: 2, fwhm: 0.5 })],
  ['modulated ring', modulatedRing({ diameter: 2, c1: 0.3, pa1: 20, c2: 0.2, pa2: 50 })],
  ['exponential', exponential({ fwhm: 2 })],
  ['lorentzian', lorentzian({ fwhm: 2 })],
  ['background', background().plus(point())],
  ['radial profile', radialProfile({ radii: [0, 1, 1], intensity: [1, 1, 0], maxFrequency: 0.5 })],
  ['pixel image', pixelImage({ nx: 3, pixels: [0, 1, 0, 1, 2, 1, 0, 1, 0], scale: 0.5 })],
];

const FACTORS: ReadonlyArray<readonly [number, number]> = [
  [1e-6, 1],
  [1, 1e6],
  [1e6, 1e-6],
  [1e-6, 1e-6],
  [1e6, 1e6],
];
const U = [0, 1e3, 1e6, 1e8, 1e9, 3e8, -7e8];
const V = [0, 1e3, 1e6, 1e8, 3e8, 1e9, 2e8];

describe('stretches by 1e-6 and 1e6', () => {
  it.each(KINDS)('%s gives finite visibilities with V(0) = 1', (name, m) => {
    for (const [se, sn] of FACTORS) {
      // a radial profile past its table integrates every point directly, at a cost growing with the
      // frequency seen through the stretch (R rho x 16 Bessel calls); stay below 1e6 cycles/rad there
      const big = name === 'radial profile' && Math.max(se, sn) > 1;
      const u = big ? U.filter((x) => Math.abs(x) <= 1e3) : U;
      const v = big ? V.slice(0, u.length) : V;
      const s = m.stretch(se, sn);
      const r = s.visibilities(u, v);
      expect([...r.re, ...r.im].every(Number.isFinite)).toBe(true);
      expect(Math.abs(r.re[0]! - 1)).toBeLessThan(1e-15);
      for (let i = 0; i < u.length; i++)
        expect(Math.hypot(r.re[i]!, r.im[i]!)).toBeLessThanOrEqual(1 + 1e-12);
    }
  });

  it('a stretch by 1e6 and by 1e-6 along one axis composes to the inverse map', () => {
    const m = ellipse({ major: 3, minor: 1, pa: 30 });
    const there = m.stretch(1e6, 1e-6).stretch(1e-6, 1e6);
    expect(there.equals(m)).toBe(true);
  });
});
