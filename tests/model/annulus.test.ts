/**
 * The uniform annulus and the Gaussian-profile ring against scipy (components.json: the area-weighted
 * difference of two disks with scipy.special.j1, and a quad Hankel transform of the annulus profile) and a DFT
 * of rendered images.
 */
import { describe, expect, it } from 'vitest';
import { annulus, convolve, disk, gaussian, gaussianRing, ring } from '../../src/index.js';
import { COMPONENTS, expectClose, qFor } from '../helpers/components-fixture.js';
import { dft, render } from '../helpers/reference.js';

/** Closed form: 1e-15 / (1 - r^2) cancellation, quadrature branch about 1e-15; quad reference 1e-13. */
const ANNULUS_TOL = 1e-12;

describe('annulus', () => {
  it('matches scipy for inner/outer ratios from 0 to 0.999', () => {
    const outer = 4;
    for (const r of COMPONENTS.annulus) {
      const m = annulus({ inner: r.ratio * outer, outer });
      expectClose(`ratio=${r.ratio} x=${r.x}`, m.visibility(0, qFor(r.x, outer)).re, r.v, ANNULUS_TOL);
    }
  });

  it('is the disk at inner = 0 and the thin ring at inner = outer', () => {
    const qs = Array.from({ length: 50 }, (_, k) => k * 1e7);
    const z = qs.map(() => 0);
    const a0 = annulus({ inner: 0, outer: 3 }).vis2(qs, z);
    const d = disk({ diameter: 3 }).vis2(qs, z);
    const a1 = annulus({ inner: 3, outer: 3 }).vis2(qs, z);
    const r = ring({ diameter: 3 }).vis2(qs, z);
    for (let i = 0; i < qs.length; i++) {
      expectClose('inner 0', a0[i]!, d[i]!, 1e-15);
      expectClose('inner = outer', a1[i]!, r[i]!, 1e-15);
    }
  });

  it('is continuous across the switch from the closed form to quadrature (1 - r^2 = 0.05)', () => {
    const r = Math.sqrt(0.95);
    const q = qFor(7, 4);
    const below = annulus({ inner: 4 * r * (1 - 1e-12), outer: 4 }).visibility(q, 0).re;
    const above = annulus({ inner: 4 * r * (1 + 1e-12), outer: 4 }).visibility(q, 0).re;
    expectClose('switch', below, above, 1e-12);
  });

  it('matches a DFT of its rendered image', () => {
    const img = render(
      (e, n) => {
        const rr = Math.hypot(e, n);
        return rr >= 1 && rr < 2 ? 1 : 0;
      },
      128,
      4.4 / 128,
      4,
    );
    const m = annulus({ inner: 2, outer: 4 });
    for (const x of [1, 3, 6]) {
      const q = qFor(x, 4);
      expectClose(`render x=${x}`, m.visibility(q, q).re, dft(img, q, q).re, 3e-3);
    }
  });

  it('names the slot when inner > outer', () => {
    expect(() => annulus({ inner: 3, outer: 2 })).toThrow(
      /^annulus\.inner: expected inner <= outer \(2 mas\), got 3 mas$/,
    );
    expect(() => annulus({ inner: -1, outer: 2 })).toThrow(/annulus\.inner/);
  });

  it('prints as an expression and sums with other components', () => {
    const m = annulus({ inner: 1, outer: 2 })
      .weight(0.5)
      .plus(disk({ diameter: 1 }));
    expect(m.toString()).toBe('sum(annulus({ inner: 1, outer: 2 }).weight(0.5), disk({ diameter: 1 }))');
    expect(m.flux).toBeCloseTo(1.5, 15);
  });
});

describe('Gaussian-profile ring', () => {
  it('is the thin ring convolved with a Gaussian (exact), so V = J0 times the Gaussian', () => {
    const m = gaussianRing({ diameter: 5, fwhm: 1.2 });
    expect(m.equals(convolve(ring({ diameter: 5 }), gaussian({ fwhm: 1.2 })))).toBe(true);
    const q = 5e7;
    expect(m.visibility(q, 0).re).toBeCloseTo(
      ring({ diameter: 5 }).visibility(q, 0).re * gaussian({ fwhm: 1.2 }).visibility(q, 0).re,
      15,
    );
  });

  it('matches a DFT of a rendered ring smoothed by a Gaussian', () => {
    // the image of a thin ring (radius R) convolved with a Gaussian: (1/2 pi) int G(x - R(sin t, cos t)) dt
    const R = 2.5;
    const sigma = 0.8 / (2 * Math.sqrt(2 * Math.LN2));
    const img = render(
      (e, n) => {
        let acc = 0;
        for (let k = 0; k < 64; k++) {
          const t = (2 * Math.PI * k) / 64;
          const de = e - R * Math.sin(t);
          const dn = n - R * Math.cos(t);
          acc += Math.exp(-(de * de + dn * dn) / (2 * sigma * sigma));
        }
        return acc;
      },
      96,
      9 / 96,
    );
    const m = gaussianRing({ diameter: 2 * R, fwhm: 0.8 });
    for (const q of [2e7, 6e7, 1e8]) expectClose(`q=${q}`, m.visibility(q, 0).re, dft(img, q, 0).re, 1e-6);
  });
});
