/**
 * Property tests of the algebra (fast-check, fixed seed): linearity, shift invariance of |V|, Hermitian
 * symmetry, composition of linear maps, V(0, 0) = 1 after normalisation, canonical equality.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { disk, gaussian, type Model, point, ring, sum } from '../../src/index.js';
import { arbModel, arbUV } from '../helpers/arbitraries.js';

const SEED = 424242;
const RUNS = 150;
/** Absolute tolerance on normalised visibilities built from a handful of terms (values of order 1). */
const VIS_TOL = 1e-10;

function vis(m: Model, u: number, v: number) {
  return m.visibility(u, v);
}

describe('properties of the model algebra', () => {
  it('V(-u, -v) is the complex conjugate of V(u, v) for any real image', () => {
    fc.assert(
      fc.property(arbModel, arbUV, (m, [u, v]) => {
        const a = vis(m, u, v);
        const b = vis(m, -u, -v);
        return Math.abs(a.re - b.re) < VIS_TOL && Math.abs(a.im + b.im) < VIS_TOL;
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('a shift changes only the phase of V', () => {
    fc.assert(
      fc.property(arbModel, arbUV, fc.double({ min: -100, max: 100, noNaN: true }), (m, [u, v], e) => {
        return Math.abs(vis(m, u, v).abs() - vis(m.shift(e, -0.5 * e), u, v).abs()) < VIS_TOL;
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('the unnormalised transform of a sum is the sum of the transforms', () => {
    fc.assert(
      fc.property(arbModel, arbModel, arbUV, (a, b, [u, v]) => {
        const s = sum(a, b);
        const fa = vis(a, u, v).mul(a.flux);
        const fb = vis(b, u, v).mul(b.flux);
        const fs = vis(s, u, v).mul(s.flux);
        const scale = Math.abs(a.flux) + Math.abs(b.flux);
        return fs.sub(fa).sub(fb).abs() < VIS_TOL * scale;
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('the transform of a convolution is the product of the transforms', () => {
    fc.assert(
      fc.property(arbModel, arbModel, arbUV, (a, b, [u, v]) => {
        return (
          vis(a.convolve(b), u, v)
            .sub(vis(a, u, v).mul(vis(b, u, v)))
            .abs() < VIS_TOL
        );
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('V(0, 0) is 1 and the flux is the sum of the weights', () => {
    fc.assert(
      fc.property(arbModel, fc.double({ min: 0.1, max: 10, noNaN: true }), (m, w) => {
        const z = vis(m.weight(w), 0, 0);
        return (
          Math.abs(z.re - 1) < VIS_TOL &&
          Math.abs(z.im) < VIS_TOL &&
          Math.abs(m.weight(w).flux - w * m.flux) < 1e-9 * w * m.flux
        );
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('rotating by 360 degrees changes nothing, and two rotations compose', () => {
    fc.assert(
      fc.property(
        arbModel,
        fc.double({ min: -180, max: 180, noNaN: true }),
        fc.double({ min: -180, max: 180, noNaN: true }),
        arbUV,
        (m, a, b, [u, v]) => {
          const once = vis(m.rotate(a + b), u, v);
          const twice = vis(m.rotate(a).rotate(b), u, v);
          const full = vis(m.rotate(360), u, v);
          const orig = vis(m, u, v);
          return once.sub(twice).abs() < VIS_TOL && full.sub(orig).abs() < VIS_TOL && m.rotate(360).equals(m);
        },
      ),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('stretches compose by multiplying their factors and V(u, v) of a stretch is V(se u, sn v)', () => {
    fc.assert(
      fc.property(
        arbModel,
        fc.double({ min: 0.2, max: 5, noNaN: true }),
        fc.double({ min: 0.2, max: 5, noNaN: true }),
        arbUV,
        (m, a, b, [u, v]) => {
          const s = m.stretch(a, b);
          return (
            vis(s, u, v)
              .sub(vis(m, a * u, b * v))
              .abs() < VIS_TOL && s.stretch(b, a).equals(m.stretch(a * b, a * b))
          );
        },
      ),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('a model equals itself rebuilt in another term order', () => {
    fc.assert(
      fc.property(
        arbModel,
        arbModel,
        (a, b) =>
          sum(a, b).equals(sum(b, a)) &&
          a
            .plus(b)
            .plus(a)
            .equals(sum(a.weight(2), b)),
      ),
      { seed: SEED, numRuns: RUNS },
    );
  });
});

describe('canonical equality', () => {
  const a = disk({ diameter: 1.5 });
  it('two shifts add', () => {
    expect(a.shift(1, 0).shift(0, 2).equals(a.shift(1, 2))).toBe(true);
  });
  it('two rotations add', () => {
    const e = gaussian({ fwhm: 2 }).stretch(0.5, 1);
    expect(e.rotate(30).rotate(60).equals(e.rotate(90))).toBe(true);
    expect(e.rotate(30).equals(e.rotate(31))).toBe(false);
  });
  it('a rotated circular disk equals the disk, and a stretched unit disk equals a bigger disk', () => {
    expect(a.rotate(47).equals(a)).toBe(true);
    expect(disk({ diameter: 1 }).stretch(1.5, 1.5).equals(a)).toBe(true);
  });
  it('two Gaussians convolved equal one Gaussian whose FWHMs add in quadrature', () => {
    expect(
      gaussian({ fwhm: 3 })
        .convolve(gaussian({ fwhm: 4 }))
        .equals(gaussian({ fwhm: 5 })),
    ).toBe(true);
  });
  it('different shapes, fluxes and positions are not equal', () => {
    expect(a.equals(ring({ diameter: 1.5 }))).toBe(false);
    expect(a.equals(a.weight(2))).toBe(false);
    expect(a.shift(1, 0).equals(a.shift(1 + 1e-6, 0))).toBe(false);
    expect(point().plus(point().shift(1, 0)).equals(point().weight(2))).toBe(false);
  });
});
