import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { gamma, lnGamma, sinPi } from '../../src/kernels/gamma.js';
import { col, EPS, expectClose, fixture } from './helpers.js';

const SCIPY = `scipy ${fixture.versions['scipy']} special.gamma / gammaln (tests/fixtures/kernels/bessel.json)`;
/** Relative tolerance of gamma: the recurrence up to z = 20 adds up to 18 roundings. */
const GAMMA_REL_TOL = 16 * EPS;
/** Absolute tolerance of lnGamma, per unit of max(1, |ln Gamma|). */
const LNGAMMA_TOL = 8 * EPS;

describe('gamma and lnGamma against scipy', () => {
  it('gamma agrees to 16 eps relative on 1e-8 .. 170.5 and at negative non-integers', () => {
    expect(fixture.gamma.length).toBeGreaterThan(20);
    for (const row of fixture.gamma) {
      const z = col(row, 0);
      const want = col(row, 1);
      expectClose(`gamma(${z})`, gamma(z), want, GAMMA_REL_TOL * Math.abs(want), SCIPY);
    }
  });

  it('lnGamma agrees to 8 eps times max(1, |ln Gamma|)', () => {
    for (const row of fixture.gamma) {
      const z = col(row, 0);
      const want = col(row, 2);
      expectClose(`lnGamma(${z})`, lnGamma(z), want, LNGAMMA_TOL * Math.max(1, Math.abs(want)), SCIPY);
    }
  });
});

describe('gamma identities', () => {
  it('gives the factorials and sqrt(pi) at z = 1/2 (A&S 6.1.6, 6.1.8)', () => {
    let fact = 1;
    for (let n = 1; n <= 25; n++) {
      expectClose(`gamma(${n})`, gamma(n), fact, GAMMA_REL_TOL * fact, '(n - 1)!');
      fact *= n;
    }
    expectClose('gamma(0.5)', gamma(0.5), Math.sqrt(Math.PI), 2 * EPS, 'A&S 6.1.8');
  });

  // z is a multiple of 2^-20, so that z + 1 and 1 - z are exact: rounding them would move Gamma by
  // psi(z) * ulp(z), more than the tolerance at large z.
  const dyadic = (lo: number, hi: number) =>
    fc.integer({ min: Math.ceil(lo * 2 ** 20), max: Math.floor(hi * 2 ** 20) }).map((k) => k / 2 ** 20);

  it('satisfies Gamma(z + 1) = z Gamma(z) (A&S 6.1.15)', () => {
    fc.assert(
      fc.property(dyadic(1e-3, 150), (z) => {
        const want = z * gamma(z);
        expectClose(`gamma(${z} + 1)`, gamma(z + 1), want, 2 * GAMMA_REL_TOL * want, 'A&S 6.1.15');
      }),
      { numRuns: 500 },
    );
  });

  it('satisfies the reflection formula Gamma(z) Gamma(1 - z) = pi / sin(pi z) (A&S 6.1.17)', () => {
    fc.assert(
      fc.property(dyadic(0.01, 0.99), fc.integer({ min: -30, max: 30 }), (f, n) => {
        const z = f + n;
        const want = Math.PI / sinPi(z);
        const got = gamma(z) * gamma(1 - z);
        expectClose(
          `gamma(${z}) gamma(${1 - z})`,
          got,
          want,
          4 * GAMMA_REL_TOL * Math.abs(want),
          'A&S 6.1.17',
        );
      }),
      { numRuns: 500 },
    );
  });

  it('overflows to Infinity above 171.62, is infinite at the poles, NaN only for NaN and -Infinity', () => {
    expect(gamma(171.62)).toBeLessThan(Number.MAX_VALUE);
    expect(gamma(171.63)).toBe(Number.POSITIVE_INFINITY);
    expect(gamma(0)).toBe(Number.POSITIVE_INFINITY);
    expect(gamma(-0)).toBe(Number.NEGATIVE_INFINITY);
    expect(gamma(-3)).toBe(Number.POSITIVE_INFINITY);
    expect(lnGamma(-3)).toBe(Number.POSITIVE_INFINITY);
    expect(lnGamma(1e300)).toBeCloseTo(1e300 * (Math.log(1e300) - 1), -290);
    expect(gamma(Number.NaN)).toBeNaN();
    expect(gamma(Number.NEGATIVE_INFINITY)).toBeNaN();
    expect(gamma(Number.POSITIVE_INFINITY)).toBe(Number.POSITIVE_INFINITY);
    expect(Math.abs(gamma(-200.5))).toBe(0); // underflow, with the sign of Gamma there
  });
});

describe('sinPi', () => {
  it('is exactly zero at the integers and agrees with Math.sin(pi z) elsewhere', () => {
    for (const n of [-7, -1, 0, 1, 2, 1e6, 2 ** 60]) expect(Math.abs(sinPi(n))).toBe(0);
    fc.assert(
      fc.property(fc.double({ min: -100, max: 100, noNaN: true }), (z) => {
        // Math.sin(pi z) carries the rounding of pi z: about |z| eps
        expectClose(`sinPi(${z})`, sinPi(z), Math.sin(Math.PI * z), 4 * EPS * (1 + Math.abs(z)), 'Math.sin');
      }),
    );
  });
});
