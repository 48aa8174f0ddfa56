/**
 * Exponential and Lorentzian-like profiles and the flat background. The closed forms are checked against
 * scipy quad transforms of the profiles (components.json): a Hankel transform for the exponential, and for
 * the Lorentzian-like profile the 1D cosine transform (quad QAWF) of its Abel projection 2/(1 + t^2).
 */
import { describe, expect, it } from 'vitest';
import { background, disk, exponential, lorentzian, point } from '../../src/index.js';
import { COMPONENTS, expectClose, qFor } from '../helpers/components-fixture.js';

/** The kernels are exact formulas; the quad references are good to about 1e-12. */
const PROFILE_TOL = 1e-11;
/** quad's QAWF (Fourier integral on [0, inf)) reaches about 1e-11 here; the generator accepts 1e-9. */
const QAWF_TOL = 1e-9;

describe('smooth profiles', () => {
  it('the exponential profile matches (1 + (2 pi h q)^2)^(-3/2) and its quad Hankel transform', () => {
    const w = 3;
    for (const r of COMPONENTS.exponential) {
      const got = exponential({ fwhm: w }).visibility(qFor(r.x, w), 0).re;
      expectClose(`exponential x=${r.x}`, got, r.quad, PROFILE_TOL);
    }
  });

  it('the Lorentzian-like profile matches exp(-2 pi a q) and the transform of its projection', () => {
    const w = 2;
    let checked = 0;
    for (const r of COMPONENTS.lorentzian) {
      const got = lorentzian({ fwhm: w }).visibility(0, qFor(r.x, w)).re;
      expectClose(`lorentzian x=${r.x}`, got, r.v, 1e-15);
      if (r.quad !== null) {
        expectClose(`lorentzian quad x=${r.x}`, got, r.quad, QAWF_TOL);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(8);
  });

  it('both profiles have their stated FWHM (half the central intensity at r = fwhm / 2)', () => {
    // I(r) of the exponential: exp(-r / h), h = fwhm / (2 ln 2); of the Lorentzian: (1 + (r/a)^2)^-1.5
    const w = 2;
    const h = w / (2 * Math.LN2);
    expect(Math.exp(-(w / 2) / h)).toBeCloseTo(0.5, 15);
    const a = w / (2 * Math.sqrt(2 ** (2 / 3) - 1));
    expect((1 + (w / 2 / a) ** 2) ** -1.5).toBeCloseTo(0.5, 15);
  });
});

describe('background', () => {
  it('adds flux but no visibility at q > 0', () => {
    const m = disk({ diameter: 1 }).plus(background().weight(0.25));
    expect(m.flux).toBe(1.25);
    expect(m.visibility(0, 0).re).toBe(1);
    const q = 1e5;
    expect(m.visibility(q, 0).re).toBeCloseTo(disk({ diameter: 1 }).visibility(q, 0).re / 1.25, 15);
    expect(background().vis2([1e-3, 0], [0, 1e-3])).toEqual(Float64Array.from([0, 0]));
    expect(background().shift(3, 4).stretch(2, 0.5).visibility(0, 0).re).toBe(1);
  });

  it('prints as background() and convolves to a background', () => {
    expect(point().plus(background()).toString()).toBe('sum(point(), background())');
    expect(disk({ diameter: 2 }).convolve(background()).vis2([1e6], [0])[0]).toBe(0);
  });
});
