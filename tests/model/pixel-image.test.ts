/**
 * Pixel images: a rendered Gaussian's pixelImage reproduces the analytic Gaussian, and the separable fast
 * transform agrees with the direct DFT of tests/helpers/reference.ts (written from the definition).
 */
import { describe, expect, it } from 'vitest';
import { gaussian, pixelImage, point } from '../../src/index.js';
import { expectClose } from '../helpers/components-fixture.js';
import { dft, render } from '../helpers/reference.js';

describe('pixel image', () => {
  // 128 x 128 pixels of 0.25 mas: a 4 mas FWHM Gaussian, well sampled and wholly inside
  const img = render((e, n) => Math.exp((-4 * Math.LN2 * (e * e + n * n)) / 16), 128, 0.25);
  const m = pixelImage({ nx: 128, pixels: img.pixels, scale: 0.25 });

  it('a rendered Gaussian reproduces the analytic Gaussian', () => {
    const g = gaussian({ fwhm: 4 });
    for (const [u, v] of [
      [0, 0],
      [2e7, 0],
      [3e7, -4e7],
      [-8e7, 5e7],
    ] as const) {
      const z = m.visibility(u, v);
      // sampling at the centres aliases only exp(-(pi fwhm / step)^2 / (4 ln 2)) ~ 0: agreement to rounding
      expectClose(`re u=${u} v=${v}`, z.re, g.visibility(u, v).re, 1e-12);
      expectClose(`im u=${u} v=${v}`, z.im, 0, 1e-12);
    }
  });

  it('the separable transform equals the direct DFT, with east along the columns', () => {
    const asym = render((e, n) => (e > 0.5 ? 2 : 0) + Math.exp(-(e * e + (n - 1) ** 2)), 40, 0.3);
    const pm = pixelImage({ nx: 40, pixels: asym.pixels, scale: 0.3 });
    for (const [u, v] of [
      [1e8, 0],
      [0, 1e8],
      [7e7, -3e7],
    ] as const) {
      const z = pm.visibility(u, v);
      const ref = dft(asym, u, v);
      expectClose(`re u=${u} v=${v}`, z.re, ref.re, 1e-13);
      expectClose(`im u=${u} v=${v}`, z.im, ref.im, 1e-13);
    }
  });

  it('shifts, rotates and stretches like the analytic components', () => {
    const g = gaussian({ fwhm: 4 });
    const u = 3e7;
    const v = 2e7;
    const a = m.shift(2, -1).stretch(1, 0.5).rotate(30).visibility(u, v);
    const b = g.shift(2, -1).stretch(1, 0.5).rotate(30).visibility(u, v);
    expectClose('re', a.re, b.re, 1e-12);
    expectClose('im', a.im, b.im, 1e-12);
    expect(pixelImage({ nx: 1, pixels: [3], scale: 1 }).visibility(1e8, 1e8).re).toBeCloseTo(
      point().visibility(1e8, 1e8).re,
      15,
    );
  });

  it('rejects a grid of the wrong size, a zero sum and a bad scale', () => {
    expect(() => pixelImage({ nx: 3, pixels: [1, 2, 3, 4], scale: 1 })).toThrow(/4 pixels do not fill/);
    expect(() => pixelImage({ nx: 2, pixels: [0, 0], scale: 1 })).toThrow(/sum to 0/);
    expect(() => pixelImage({ nx: 1, pixels: [1], scale: 0 })).toThrow(
      /pixelImage\.scale: expected a number > 0/,
    );
  });
});
