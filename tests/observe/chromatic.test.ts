/**
 * Wavelength-dependent slots and evaluation with wavelengths: plans per wavelength, power-law and blackbody
 * slots (Planck's law written out here with exp, independent of the library's expm1 / log form), and bandwidth
 * smearing against a brute-force fine-sampled channel average.
 */
import { describe, expect, it } from 'vitest';
import {
  blackbodyRatio,
  chromaticBispectrum,
  chromaticClosurePhase,
  chromaticPlan,
  chromaticVis2,
  chromaticVisibilities,
  DEFAULT_BAND_SAMPLES,
  disk,
  gaussian,
  ModelError,
  param,
  point,
  pointsFromFrequencies,
  powerLawFlux,
  powerLawSize,
} from '../../src/index.js';
import { expectClose } from '../helpers/components-fixture.js';

/** Smearing error budget of the issue: 1e-4 for shifts up to 100 mas at R = 30. */
const SMEAR_TOL = 1e-4;

describe('wavelength-dependent slots', () => {
  it('a power-law flux and size give, at each wavelength, the model built with their values there', () => {
    const m = disk({ diameter: powerLawSize(2, 2.2e-6, 0.5) }).plus(
      point()
        .weight(powerLawFlux(0.3, 2.2e-6, -2))
        .shift(3, 0),
    );
    const lambdas = [1.6e-6, 2.2e-6, 2.4e-6];
    const pts = { ucoord: [80, 80, 80], vcoord: [20, 20, 20], wavelength: lambdas };
    const z = chromaticVisibilities(m, pts);
    lambdas.forEach((l, i) => {
      const r = l / 2.2e-6;
      const ref = disk({ diameter: 2 * r ** 0.5 })
        .plus(
          point()
            .weight(0.3 * r ** -2)
            .shift(3, 0),
        )
        .visibility(80 / l, 20 / l);
      expectClose(`re at ${l}`, z.re[i]!, ref.re, 1e-14);
      expectClose(`im at ${l}`, z.im[i]!, ref.im, 1e-14);
    });
  });

  it('a blackbody ratio follows Planck’s law', () => {
    const c2 = 0.014387768775039337; // h c / k, m K (CODATA 2018, from memory)
    const planck = (l: number, t: number) => 1 / (l ** 5 * (Math.exp(c2 / (l * t)) - 1));
    const m = disk({ diameter: 1 }).plus(gaussian({ fwhm: 10 }).weight(blackbodyRatio(1200, 5800, 9)));
    for (const l of [1.2e-6, 2.2e-6, 10e-6]) {
      const ratio = (9 * planck(l, 1200)) / planck(l, 5800);
      expect(chromaticPlan(m, l).totalFlux).toBeCloseTo(1 + ratio, 12);
    }
  });

  it('evaluating a chromatic model without a wavelength is a clear error', () => {
    const m = point().weight(powerLawFlux(1, 2e-6, 1));
    expect(() => m.vis2([1], [1])).toThrow(ModelError);
    expect(() => m.vis2([1], [1])).toThrow(/wavelength-dependent slots.*chromaticVis2/);
    expect(() => m.flux).toThrow(/wavelength/);
  });

  it('params inside chromatic slots are free parameters, substituted by at() and printed', () => {
    const f = param('f0', 0.2, { min: 0 });
    const m = disk({ diameter: 1 }).plus(point().weight(powerLawFlux(f, 2.2e-6, param('k', -1))));
    expect(m.parameters()).toEqual(['f0', 'k']);
    expect(m.toString()).toBe(
      "sum(disk({ diameter: 1 }), point().weight(powerLawFlux(param('f0', 0.2, { min: 0 }), 0.0000022, param('k', -1))))",
    );
    const at = m.at([0.5, 2]);
    expect(at.parameters()).toEqual([]);
    expect(chromaticPlan(at, 4.4e-6).totalFlux).toBeCloseTo(1 + 0.5 * 4, 14);
  });

  it('slot domains are checked at lambda0 when built and at each wavelength when evaluated', () => {
    expect(() => disk({ diameter: powerLawSize(-1, 2e-6, 1) })).toThrow(
      /^disk\.diameter: expected a number >= 0 mas, got -1$/,
    );
    const m = disk({ diameter: 2 }).incline(powerLawSize(80, 2e-6, 1), 0); // 80 degrees at 2 microns
    expect(chromaticVis2(m, { ucoord: [50], vcoord: [0], wavelength: [2e-6] })[0]).toBeGreaterThan(0);
    expect(() => chromaticVis2(m, { ucoord: [50], vcoord: [0], wavelength: [2.5e-6] })).toThrow(
      /incline\.inclination: expected an angle in \[0, 90\] degrees/,
    );
  });
});

describe('evaluation with wavelengths', () => {
  const m = disk({ diameter: 1.5 }).plus(point().weight(0.4).shift(12, -5));

  it('without a band equals the monochromatic evaluation at u = B / lambda', () => {
    const b = [100, -50, 30];
    const c = [20, 80, -60];
    const l = [1.6e-6, 2.2e-6, 1.6e-6];
    const z = chromaticVisibilities(m, { ucoord: b, vcoord: c, wavelength: l });
    const ref = m.visibilities(
      b.map((x, i) => x / l[i]!),
      c.map((x, i) => x / l[i]!),
    );
    for (let i = 0; i < 3; i++) {
      expectClose('re', z.re[i]!, ref.re[i]!, 1e-15);
      expectClose('im', z.im[i]!, ref.im[i]!, 1e-15);
    }
    const p = pointsFromFrequencies([5e7], [0], [2e-6]);
    expect(p.ucoord[0]).toBeCloseTo(100, 12);
  });

  it('caches one plan per model and wavelength', () => {
    const c = point()
      .weight(powerLawFlux(1, 2e-6, 1))
      .plus(disk({ diameter: 1 }));
    expect(chromaticPlan(c, 2e-6)).toBe(chromaticPlan(c, 2e-6));
    expect(chromaticPlan(c, 2e-6)).not.toBe(chromaticPlan(c, 2.1e-6));
  });

  it(`bandwidth smearing with the default ${DEFAULT_BAND_SAMPLES} samples matches a brute-force average within 1e-4 (100 mas, R = 30)`, () => {
    // a binary separated by 100 mas, with a chromatic companion; baselines up to 300 m at 1 micron
    const bin = point().plus(
      point()
        .weight(powerLawFlux(0.5, 1e-6, -1))
        .shift(80, 60),
    );
    const lambda = 1e-6;
    const band = lambda / 30;
    const ucoord = [300, 150, -212];
    const vcoord = [0, 260, 212];
    const pts = { ucoord, vcoord, wavelength: ucoord.map(() => lambda), band: ucoord.map(() => band) };
    const v2 = chromaticVis2(bin, pts);
    const z = chromaticVisibilities(bin, pts);
    const N = 4000; // midpoint rule
    for (let i = 0; i < ucoord.length; i++) {
      let re = 0;
      let im = 0;
      let sq = 0;
      for (let k = 0; k < N; k++) {
        const l = lambda - band / 2 + ((k + 0.5) * band) / N;
        const w = chromaticVisibilities(bin, { ucoord: [ucoord[i]!], vcoord: [vcoord[i]!], wavelength: [l] });
        re += w.re[0]! / N;
        im += w.im[0]! / N;
        sq += (w.re[0]! ** 2 + w.im[0]! ** 2) / N;
      }
      expectClose(`vis2 ${i}`, v2[i]!, sq, SMEAR_TOL);
      expectClose(`vis re ${i}`, z.re[i]!, re, SMEAR_TOL);
      expectClose(`vis im ${i}`, z.im[i]!, im, SMEAR_TOL);
      // the mean of |V|^2 is not |mean V|^2 once fringes smear
      expect(Math.abs(v2[i]! - (re * re + im * im))).toBeGreaterThan(1e-3);
    }
    // too few samples do not reach the budget (so the test can fail)
    const rough = chromaticVis2(bin, pts, { samples: 3 });
    expect(Math.max(...rough.map((x, i) => Math.abs(x - v2[i]!)))).toBeGreaterThan(SMEAR_TOL);
  });

  it('smeared closure phases of a centro-symmetric model stay 0 or 180; bispectrum averages the triple product', () => {
    const sym = disk({ diameter: 2 }).plus(gaussian({ fwhm: 5 }).weight(0.3));
    const tri = {
      u1coord: [100],
      v1coord: [10],
      u2coord: [-30],
      v2coord: [90],
      wavelength: [2.2e-6],
      band: [0.1e-6],
    };
    const cp = chromaticClosurePhase(sym, tri);
    expect(Math.min(Math.abs(cp[0]!), Math.abs(Math.abs(cp[0]!) - 180))).toBeLessThan(1e-9);
    const asym = point().plus(point().weight(0.3).shift(20, 5));
    const t = chromaticBispectrum(asym, { ...tri, band: [0] });
    const ref = asym.bispectrum([100 / 2.2e-6], [10 / 2.2e-6], [-30 / 2.2e-6], [90 / 2.2e-6]);
    expectClose('t3 re', t.re[0]!, ref.re[0]!, 1e-14);
    expectClose('t3 im', t.im[0]!, ref.im[0]!, 1e-14);
  });

  it('rejects columns of unequal length and wavelengths <= 0', () => {
    expect(() => chromaticVis2(m, { ucoord: [1, 2], vcoord: [1], wavelength: [1e-6, 1e-6] })).toThrow(
      /vcoord has 1 entries/,
    );
    expect(() => chromaticVis2(m, { ucoord: [1], vcoord: [1], wavelength: [0] })).toThrow(
      /wavelength\[0\] is 0/,
    );
    expect(() => chromaticVis2(m, { ucoord: [1], vcoord: [1], wavelength: [1e-6], band: [-1] })).toThrow(
      /band\[0\]/,
    );
  });
});
