/** Statistics of significance against scipy.stats (fixture written by tests/fixtures/fit/generate_stats.py). */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  chi2Survival,
  chi2Threshold,
  probabilityFromSigma,
  sigmaFromProbability,
  sumOfSquares,
} from '../../src/fit/index.js';

const ref = JSON.parse(readFileSync(new URL('../fixtures/fit/stats.json', import.meta.url), 'utf8')) as {
  chi2_sf: { x: number; dof: number; sf: number }[];
  two_sided_sigma: { sigma: number; p: number }[];
  chi2_isf: { p: number; dof: number; x: number }[];
};

/** Relative tolerance of the tail probabilities (series / continued fraction accuracy). */
const REL = 1e-12;

describe('chi-squared and Gaussian significance (reference: scipy.stats)', () => {
  it('chi2Survival matches scipy.stats.chi2.sf', () => {
    for (const c of ref.chi2_sf) {
      const got = chi2Survival(c.x, c.dof);
      const tol = REL * c.sf + 1e-300;
      if (Math.abs(got - c.sf) > tol) {
        throw new Error(
          `chi2Survival(${c.x}, ${c.dof}) = ${got}, expected ${c.sf}, diff ${got - c.sf}, tol ${tol}`,
        );
      }
    }
  });

  it('sigma and two-sided probability convert both ways as scipy.stats.norm does', () => {
    for (const c of ref.two_sided_sigma) {
      expect(Math.abs(probabilityFromSigma(c.sigma) - c.p)).toBeLessThanOrEqual(REL * c.p);
      expect(sigmaFromProbability(c.p)).toBeCloseTo(c.sigma, 10);
    }
  });

  it('chi2Threshold inverts the survival function as scipy.stats.chi2.isf', () => {
    for (const c of ref.chi2_isf) expect(chi2Threshold(c.p, c.dof)).toBeCloseTo(c.x, 8);
  });

  it('rejects a non-positive number of degrees of freedom', () => {
    expect(() => chi2Survival(1, 0)).toThrow(/degrees of freedom must be a positive number/);
  });

  it('compensated sum of squares keeps small terms next to a large one', () => {
    // 1 + 1e6 * (1e-5)^2 = 1.0001 exactly in decimal; naive summation drifts by about 1e6 roundings of 1e-10
    const r = new Float64Array(1_000_001).fill(1e-5);
    r[0] = 1;
    let naive = 0;
    for (const x of r) naive += x * x;
    expect(Math.abs(sumOfSquares(r) - 1.0001)).toBeLessThanOrEqual(2.3e-16);
    expect(Math.abs(naive - 1.0001)).toBeGreaterThan(Math.abs(sumOfSquares(r) - 1.0001));
  });
});
