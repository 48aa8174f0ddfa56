/**
 * Sign and axis conventions checked against a direct numerical Fourier transform of rendered images
 * (tests/helpers/reference.ts implements V = sum I exp(-2 pi i (u e + v n)) / sum I from CONVENTIONS.md,
 * the OIFITS convention of Pauls et al. 2005). Images are drawn from their own formulas, not from the
 * library's canonical form.
 */
import { describe, expect, it } from 'vitest';
import { disk, ellipse, gaussian, point, sum } from '../../src/index.js';
import { dft, render } from '../helpers/reference.js';

const LN2 = Math.LN2;
/** Gaussian images sampled at FWHM/40 alias below 1e-9; the DFT of them is that exact. */
const GAUSS_TOL = 1e-8;
/** A uniform disk rendered with 4x4 sub-pixels has edge errors of order (step/diameter)^1.5. */
const DISK_TOL = 3e-3;

/** An elliptical Gaussian, major axis `maj` (FWHM, mas) at position angle `pa` (deg), centred at (e0, n0). */
function ellipticalGaussian(maj: number, min: number, pa: number, e0: number, n0: number) {
  const p = (pa * Math.PI) / 180;
  return (e: number, n: number) => {
    const x = e - e0;
    const y = n - n0;
    const along = x * Math.sin(p) + y * Math.cos(p); // component along the PA direction (sin p, cos p)
    const across = x * Math.cos(p) - y * Math.sin(p);
    return Math.exp(-4 * LN2 * ((along / maj) ** 2 + (across / min) ** 2));
  };
}

const UV: [number, number][] = [
  [3e6, 0],
  [0, 3e6],
  [5e6, 4e6],
  [-7e6, 2e6],
  [1.2e7, -6e6],
  [-2e6, -1.1e7],
];

describe('conventions against a numerical Fourier transform', () => {
  const img = render(ellipticalGaussian(10, 4, 30, 6, -3), 256, 0.25);

  it('a shifted, stretched and rotated Gaussian matches the DFT of its rendered image', () => {
    const m = gaussian({ fwhm: 10 }).stretch(0.4, 1).rotate(30).shift(6, -3);
    for (const [u, v] of UV) {
      const ref = dft(img, u, v);
      const got = m.visibility(u, v);
      expect(Math.abs(got.re - ref.re), `re at (${u}, ${v})`).toBeLessThan(GAUSS_TOL);
      expect(Math.abs(got.im - ref.im), `im at (${u}, ${v})`).toBeLessThan(GAUSS_TOL);
    }
  });

  it('incline(i, pa) gives minor/major = cos i with the major axis at pa', () => {
    const m = gaussian({ fwhm: 10 })
      .incline((Math.acos(0.4) * 180) / Math.PI, 30)
      .shift(6, -3);
    for (const [u, v] of UV) {
      const ref = dft(img, u, v);
      const got = m.visibility(u, v);
      expect(Math.abs(got.re - ref.re)).toBeLessThan(GAUSS_TOL);
      expect(Math.abs(got.im - ref.im)).toBeLessThan(GAUSS_TOL);
    }
  });

  it('a point shifted east has a phase that decreases with u (V = exp(-2 pi i u east))', () => {
    const east = 2; // mas
    const u = 1e7;
    const rad = (east * Math.PI) / 648e6;
    const got = point().shift(east, 0).visibility(u, 0);
    expect(got.arg()).toBeCloseTo(-2 * Math.PI * u * rad, 12);
    const single = render((e, n) => (Math.abs(e - east) < 1e-9 && Math.abs(n) < 1e-9 ? 1 : 0), 41, 0.5);
    const ref = dft(single, u, 0);
    expect(got.re).toBeCloseTo(ref.re, 12);
    expect(got.im).toBeCloseTo(ref.im, 12);
  });

  it('an ellipse with its major axis at pa matches the DFT of a rendered elliptical disk', () => {
    const major = 12;
    const minor = 6;
    const pa = 60;
    const p = (pa * Math.PI) / 180;
    const img2 = render(
      (e, n) => {
        const along = e * Math.sin(p) + n * Math.cos(p);
        const across = e * Math.cos(p) - n * Math.sin(p);
        return (along / (major / 2)) ** 2 + (across / (minor / 2)) ** 2 <= 1 ? 1 : 0;
      },
      160,
      0.1,
      4,
    );
    const m = ellipse({ major, minor, pa });
    for (const [u, v] of UV) {
      const ref = dft(img2, u, v);
      const got = m.visibility(u, v);
      expect(Math.abs(got.re - ref.re), `re at (${u}, ${v})`).toBeLessThan(DISK_TOL);
      expect(Math.abs(got.im - ref.im), `im at (${u}, ${v})`).toBeLessThan(DISK_TOL);
    }
  });

  it('a weighted sum matches the DFT of the summed images', () => {
    const g1 = ellipticalGaussian(8, 8, 0, 0, 0);
    const g2 = ellipticalGaussian(3, 3, 0, -5, 7);
    // unit-flux images: a Gaussian of FWHM w has integral pi w^2 / (4 ln 2)
    const a1 = (Math.PI * 64) / (4 * LN2);
    const a2 = (Math.PI * 9) / (4 * LN2);
    const img3 = render((e, n) => (0.7 * g1(e, n)) / a1 + (0.3 * g2(e, n)) / a2, 256, 0.2);
    const m = sum(gaussian({ fwhm: 8 }).weight(0.7), gaussian({ fwhm: 3 }).shift(-5, 7).weight(0.3));
    for (const [u, v] of UV) {
      const ref = dft(img3, u, v);
      const got = m.visibility(u, v);
      expect(Math.abs(got.re - ref.re)).toBeLessThan(GAUSS_TOL);
      expect(Math.abs(got.im - ref.im)).toBeLessThan(GAUSS_TOL);
    }
  });

  it('a uniform disk rendered on a grid matches 2 J1(x)/x', () => {
    const d = 8;
    const img4 = render((e, n) => (e * e + n * n <= (d / 2) ** 2 ? 1 : 0), 120, 0.1, 4);
    const m = disk({ diameter: d });
    for (const [u, v] of UV) {
      const ref = dft(img4, u, v);
      expect(Math.abs(m.visibility(u, v).re - ref.re)).toBeLessThan(DISK_TOL);
    }
  });
});
