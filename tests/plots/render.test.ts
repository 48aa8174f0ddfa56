/**
 * renderImage against closed forms: a Gaussian convolved with a Gaussian is a Gaussian whose FWHMs add in
 * quadrature (convolution theorem; common practice), a point source lands on its pixel (the OIFITS sign
 * convention of CONVENTIONS.md: east increases with the column index), and the pixels hold the total flux.
 */
import { describe, expect, it } from 'vitest';
import { gaussian, InputError, point, powerLawFlux, sum } from '../../src/index.js';
import { renderImage } from '../../src/plots/index.js';

const FLUX_TOL = 1e-12; // fraction of the total flux
const PIXEL_TOL = 1e-9; // relative, per pixel

describe('renderImage', () => {
  it('renders a Gaussian as the Gaussian of FWHM sqrt(theta^2 + smoothing^2), pixel by pixel', () => {
    const theta = 2; // mas
    const img = renderImage(gaussian({ fwhm: theta }), { pixels: 64, fov: 16 });
    const w = Math.hypot(theta, img.smoothing);
    const sigma = w / (2 * Math.sqrt(2 * Math.LN2));
    let worst = 0;
    for (let j = 0; j < 64; j++) {
      for (let i = 0; i < 64; i++) {
        const r2 = img.east[i]! ** 2 + img.north[j]! ** 2;
        const expected = (img.step ** 2 / (2 * Math.PI * sigma ** 2)) * Math.exp(-r2 / (2 * sigma ** 2));
        const peak = img.step ** 2 / (2 * Math.PI * sigma ** 2);
        worst = Math.max(worst, Math.abs(img.intensity[j * 64 + i]! - expected) / peak);
      }
    }
    expect(worst).toBeLessThan(PIXEL_TOL);
  });

  it('puts a point shifted 2 mas east and 1 mas south on the pixel at east = 2, north = -1', () => {
    const img = renderImage(point().shift(2, -1), { pixels: 40, fov: 10 });
    const k = img.intensity.indexOf(Math.max(...img.intensity));
    expect(img.east[k % 40]).toBeCloseTo(2, 12);
    expect(img.north[Math.floor(k / 40)]).toBeCloseTo(-1, 12);
  });

  it('keeps the total flux: the pixels sum to 1', () => {
    const img = renderImage(sum(gaussian({ fwhm: 1 }), point().weight(0.5).shift(1.5, 0.5)), { pixels: 50 });
    const total = img.intensity.reduce((a, b) => a + b, 0);
    expect(Math.abs(total - 1)).toBeLessThan(FLUX_TOL);
  });

  it('chooses a field that holds the model: 2.4 times the largest offset plus half size', () => {
    const img = renderImage(point().shift(5, 0), { pixels: 16 });
    expect(img.fov).toBeCloseTo(12, 12);
    expect(img.east[8]).toBe(0);
  });

  it('asks for a wavelength when the model depends on it, and names the option', () => {
    const m = sum(gaussian({ fwhm: 1 }), point().weight(powerLawFlux(0.2, 2e-6, 2)));
    expect(() => renderImage(m)).toThrow(/options\.wavelength/);
    expect(renderImage(m, { wavelength: 2e-6, pixels: 16 }).wavelength).toBe(2e-6);
  });

  it('rejects a pixel count that is not an integer in [8, 1024]', () => {
    expect(() => renderImage(point(), { pixels: 7 })).toThrow(InputError);
    expect(() => renderImage(point(), { pixels: 10.5 })).toThrow(/integer in \[8, 1024\]/);
    expect(() => renderImage(point(), { fov: -1 })).toThrow(/fov/);
  });
});
