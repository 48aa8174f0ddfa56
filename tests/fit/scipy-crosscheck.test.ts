/**
 * Against an outside optimiser (issue 6): scipy.optimize.least_squares fitted the same file with the same
 * model written independently in numpy (tests/fixtures/fit/fit_with_scipy.py, results in scipy_fit.json).
 * Best values agree to 1e-6 relative and the covariance to 1e-3.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fit } from '../../src/fit/index.js';
import { disk, param, point, sum } from '../../src/index.js';
import { readOifits } from '../../src/oifits/index.js';

const ref = JSON.parse(readFileSync(new URL('../fixtures/fit/scipy_fit.json', import.meta.url), 'utf8')) as {
  start: number[];
  values: number[];
  covariance: number[][];
  chi2: number;
  n: number;
};
const VALUE_REL = 1e-6;
const COV_REL = 1e-3;

describe('agreement with scipy.optimize.least_squares', () => {
  const data = readOifits(readFileSync(new URL('../fixtures/fit/binary.fits', import.meta.url)), {
    name: 'binary.fits',
  });
  const [d0, f0, e0, n0] = ref.start as [number, number, number, number];
  const model = sum(
    disk({ diameter: param('diameter', d0, { min: 0 }) }),
    point()
      .weight(param('flux', f0, { min: 0 }))
      .shift(param('east', e0), param('north', n0)),
  );
  const r = fit(model, data, { observables: ['vis2', 't3phi'] });

  it('uses the same number of data points', () => {
    expect(r.residuals.count).toBe(ref.n);
  });

  it('finds the same best values to 1e-6 relative and the same chi2', () => {
    r.parameters.forEach((name, i) => {
      const expected = ref.values[i]!;
      expect(Math.abs(r.values[name]! - expected), name).toBeLessThan(VALUE_REL * Math.abs(expected));
    });
    expect(r.chi2).toBeCloseTo(ref.chi2, 6);
  });

  it('finds the same covariance to 1e-3 relative', () => {
    for (let i = 0; i < 4; i++) {
      for (let j = 0; j < 4; j++) {
        const expected = ref.covariance[i]![j]!;
        const scale = Math.sqrt(ref.covariance[i]![i]! * ref.covariance[j]![j]!);
        expect(Math.abs(r.covariance[i]![j]! - expected), `cov[${i}][${j}]`).toBeLessThan(COV_REL * scale);
      }
    }
  });
});

describe('correlated errors from OI_CORR (reference: make_corr_fixture.py with numpy whitening)', () => {
  const corrRef = JSON.parse(
    readFileSync(new URL('../fixtures/fit/scipy_corr_fit.json', import.meta.url), 'utf8'),
  ) as {
    start: number[];
    values: number[];
    covariance: number[][];
    chi2: number;
  };
  const data = readOifits(readFileSync(new URL('../fixtures/fit/binary_corr.fits', import.meta.url)), {
    name: 'binary_corr.fits',
  });
  const [d0, f0, e0, n0] = corrRef.start as [number, number, number, number];
  const model = sum(
    disk({ diameter: param('diameter', d0, { min: 0 }) }),
    point()
      .weight(param('flux', f0, { min: 0 }))
      .shift(param('east', e0), param('north', n0)),
  );
  const r = fit(model, data, { observables: ['vis2', 't3phi'] });

  it('sees the correlated V^2 values', () => {
    expect(r.correlatedValues).toBe(data.vis2.length);
  });

  it('finds the same best values, chi2 and covariance as the whitened scipy fit', () => {
    r.parameters.forEach((name, i) => {
      const expected = corrRef.values[i]!;
      expect(Math.abs(r.values[name]! - expected), name).toBeLessThan(VALUE_REL * Math.abs(expected));
    });
    expect(r.chi2).toBeCloseTo(corrRef.chi2, 6);
    for (let i = 0; i < 4; i++) {
      for (let j = 0; j < 4; j++) {
        const scale = Math.sqrt(corrRef.covariance[i]![i]! * corrRef.covariance[j]![j]!);
        expect(Math.abs(r.covariance[i]![j]! - corrRef.covariance[i]![j]!)).toBeLessThan(COV_REL * scale);
      }
    }
  });

  it('differs from the fit that ignores the correlations', () => {
    expect(Math.abs(r.values.diameter! - ref.values[0]!)).toBeGreaterThan(10 * VALUE_REL);
  });
});
