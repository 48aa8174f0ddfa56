import besselj0 from '@stdlib/math-base-special-besselj0';
import besselj1 from '@stdlib/math-base-special-besselj1';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  besselJ0,
  besselJ1,
  besselJ2,
  diskAmplitude,
  diskAmplitudeDerivative,
  ringAmplitudeDerivative,
} from '../../src/kernels/bessel-j01.js';
import { col, derivative, EPS, expectClose, fixture, range, worstError } from './helpers.js';

const STDLIB = '@stdlib/math-base-special-besselj0/-besselj1 0.3.1 (Cephes-derived)';
const MPMATH = `mpmath ${fixture.versions['mpmath']} at ${fixture.versions['mpmath_digits']} digits (tests/fixtures/kernels/bessel.json)`;

// Tolerances against @stdlib include @stdlib's own error (up to about 3 eps near x = 1 on this grid).
/** |x| < 2: the polynomials in x^2. */
const STDLIB_NEAR_ZERO_TOL = 4 * EPS;
/** within 0.05 of a zero of J0 or J1. */
const STDLIB_NEAR_ROOTS_TOL = 4 * EPS;
/** 2 <= x < 50. */
const STDLIB_MODERATE_TOL = 4 * EPS;
/** 50 <= x <= 200. */
const STDLIB_LARGE_TOL = 2 * EPS;
// Against mpmath, whose values are exact to the last bit.
const MPMATH_NEAR_ZERO_TOL = 1 * EPS;
const MPMATH_MODERATE_TOL = 1 * EPS;
/** 200 <= x <= 1e6, where |J| <= 0.06: 1e-16 absolute. */
const MPMATH_LARGE_TOL = 1e-16;
/** at the zeros (mpmath's besseljzero rounded to binary64). */
const MPMATH_AT_ZEROS_TOL = 1 * EPS;

const GRID_STEP = 0.005;
const grid = [...range(0, 200, GRID_STEP)];
/** McMahon's first term for the zeros (A&S 9.5.12): j_{0,k} ~ (k - 1/4) pi, j_{1,k} ~ (k + 1/4) pi. */
function nearRoot(x: number): boolean {
  const phase0 = x / Math.PI + 0.25;
  const phase1 = x / Math.PI - 0.25;
  const d = Math.min(Math.abs(phase0 - Math.round(phase0)), Math.abs(phase1 - Math.round(phase1))) * Math.PI;
  return x > 2 && d < 0.05;
}
const regimes: [string, number[], number][] = [
  ['near zero (|x| < 2)', grid.filter((x) => x < 2), STDLIB_NEAR_ZERO_TOL],
  ['near the zeros of J0 and J1', grid.filter(nearRoot), STDLIB_NEAR_ROOTS_TOL],
  ['moderate (2 <= x < 50)', grid.filter((x) => x >= 2 && x < 50 && !nearRoot(x)), STDLIB_MODERATE_TOL],
  ['large (50 <= x <= 200)', grid.filter((x) => x >= 50 && !nearRoot(x)), STDLIB_LARGE_TOL],
];

describe('besselJ0 and besselJ1 against @stdlib on a dense grid over 0..200', () => {
  for (const [name, xs, tol] of regimes) {
    it(`agree in the regime ${name}, for x and -x`, () => {
      expect(xs.length).toBeGreaterThan(100);
      worstError('besselJ0', xs, besselJ0, besselj0, () => tol, STDLIB);
      worstError('besselJ1', xs, besselJ1, besselj1, () => tol, STDLIB);
      const neg = xs.map((x) => -x);
      // J0 is even and J1 odd (A&S 9.1.5); @stdlib is evaluated at -x too.
      worstError('besselJ0', neg, besselJ0, besselj0, () => tol, STDLIB);
      worstError('besselJ1', neg, besselJ1, besselj1, () => tol, STDLIB);
    });
  }
});

describe('besselJ0, besselJ1 and besselJ2 against mpmath', () => {
  const sets: [string, number[][], number][] = [
    ['near zero (0 .. 2)', fixture.j012_near_zero, MPMATH_NEAR_ZERO_TOL],
    ['at random points of 0 .. 200', fixture.j012_moderate, MPMATH_MODERATE_TOL],
    ['at large arguments 200 .. 1e6', fixture.j012_large, MPMATH_LARGE_TOL],
    ['at the zeros of J0 and J1', fixture.j012_at_zeros, MPMATH_AT_ZEROS_TOL],
  ];
  for (const [name, rows, tol] of sets) {
    it(`agree ${name}`, () => {
      expect(rows.length).toBeGreaterThan(5);
      for (const row of rows) {
        const x = col(row, 0);
        expectClose(`besselJ0(${x})`, besselJ0(x), col(row, 1), tol, MPMATH);
        expectClose(`besselJ1(${x})`, besselJ1(x), col(row, 2), tol, MPMATH);
        expectClose(`besselJ2(${x})`, besselJ2(x), col(row, 3), tol, MPMATH);
      }
    });
  }

  it('keep the relative accuracy of J1 and J2 near zero', () => {
    // J1(x) ~ x/2 and J2(x) ~ x^2/8: the polynomials in x^2 have no cancellation there.
    for (const row of fixture.j012_near_zero) {
      const x = col(row, 0);
      if (x === 0) continue;
      const j1 = col(row, 2);
      const j2 = col(row, 3);
      expectClose(`besselJ1(${x})`, besselJ1(x), j1, 2 * EPS * Math.abs(j1), MPMATH);
      expectClose(`besselJ2(${x})`, besselJ2(x), j2, 2 * EPS * Math.abs(j2), MPMATH);
    }
  });
});

describe('values of Abramowitz & Stegun', () => {
  // from memory, A&S table 9.5 (zeros j_{0,k} and j_{1,k}, given there to more digits than shown here)
  const j0Zeros = [2.404825557695773, 5.520078110286311, 8.653727912911013];
  const j1Zeros = [3.831705970207512, 7.015586669815619];
  /** The decimal zero is within 1e-15 of the true zero and |J'| < 0.6 there, plus the kernel's own error. */
  const ZERO_TOL = 1e-15;

  it('J0 vanishes at the zeros of table 9.5', () => {
    for (const z of j0Zeros)
      expectClose(`besselJ0(${z})`, besselJ0(z), 0, ZERO_TOL, 'A&S table 9.5, from memory');
  });

  it('J1 and the disk amplitude vanish at the zeros of table 9.5', () => {
    for (const z of j1Zeros) {
      expectClose(`besselJ1(${z})`, besselJ1(z), 0, ZERO_TOL, 'A&S table 9.5, from memory');
      expectClose(`diskAmplitude(${z})`, diskAmplitude(z), 0, ZERO_TOL, 'A&S table 9.5, from memory');
    }
  });

  it('J0, J1 and J2 match table 9.1 at x = 1 and x = 2', () => {
    // from memory, A&S table 9.1 (tabulated to 15 decimals there)
    const source = 'A&S table 9.1, from memory';
    const TABLE_TOL = 1e-15;
    expectClose('besselJ0(1)', besselJ0(1), 0.765197686557967, TABLE_TOL, source);
    expectClose('besselJ1(1)', besselJ1(1), 0.440050585744934, TABLE_TOL, source);
    expectClose('besselJ2(1)', besselJ2(1), 0.1149034849319, TABLE_TOL, source);
    expectClose('besselJ0(2)', besselJ0(2), 0.223890779141236, TABLE_TOL, source);
    expectClose('besselJ1(2)', besselJ1(2), 0.576724807756873, TABLE_TOL, source);
  });
});

describe('derivatives', () => {
  const H = 1e-3;
  /** Five-point difference with h = 1e-3: truncation about h^4 / 30 * max|f^(5)| < 4e-14, rounding ~ eps / h. */
  const DIFF_TOL = 2e-12;
  const xs = [...range(0.05, 60, 0.0731)];

  it('J0 has derivative -J1 (A&S 9.1.28), checked by central differences', () => {
    worstError(
      "J0'",
      xs,
      (x) => derivative(besselJ0, x, H),
      (x) => -besselJ1(x),
      () => DIFF_TOL,
      'A&S 9.1.28',
    );
  });

  it('J1 has derivative J0 - J1/x (A&S 9.1.27-28), checked by central differences', () => {
    worstError(
      "J1'",
      xs,
      (x) => derivative(besselJ1, x, H),
      (x) => besselJ0(x) - besselJ1(x) / x,
      () => DIFF_TOL,
      'A&S 9.1.27-28',
    );
  });

  it('ringAmplitudeDerivative is -J1 against mpmath', () => {
    for (const row of fixture.j012_moderate) {
      const x = col(row, 0);
      expectClose(`ringAmplitudeDerivative(${x})`, ringAmplitudeDerivative(x), -col(row, 2), EPS, MPMATH);
    }
  });

  it('diskAmplitudeDerivative matches central differences of diskAmplitude', () => {
    worstError(
      'diskAmplitudeDerivative',
      [...xs, ...xs.map((x) => -x)],
      diskAmplitudeDerivative,
      (x) => derivative(diskAmplitude, x, H),
      () => DIFF_TOL,
      'five-point central difference of diskAmplitude',
    );
  });

  it('diskAmplitudeDerivative is -2 J2(x) / x with J2 from mpmath, and 0 at x = 0', () => {
    expect(Math.abs(diskAmplitudeDerivative(0))).toBe(0);
    for (const row of [...fixture.j012_near_zero, ...fixture.j012_moderate]) {
      const x = col(row, 0);
      if (x === 0) continue;
      const want = (-2 * col(row, 3)) / x;
      expectClose(`diskAmplitudeDerivative(${x})`, diskAmplitudeDerivative(x), want, 2 * EPS, MPMATH);
    }
  });
});

describe('diskAmplitude', () => {
  it('is exactly 1 at x = 0 and follows 1 - x^2/8 + x^4/192 for small x (A&S 9.1.10)', () => {
    expect(diskAmplitude(0)).toBe(1);
    for (const x of [1e-300, 1e-12, 1e-8, 1e-6, 1e-4, 1e-3, 1e-2]) {
      const s = x * x;
      const series = 1 - s / 8 + (s * s) / 192 - (s * s * s) / 9216;
      expectClose(`diskAmplitude(${x})`, diskAmplitude(x), series, EPS, 'series A&S 9.1.10, 4 terms');
    }
  });

  it('equals 2 J1(x) / x with J1 from mpmath', () => {
    for (const row of [...fixture.j012_near_zero, ...fixture.j012_moderate, ...fixture.j012_large]) {
      const x = col(row, 0);
      if (x === 0) continue;
      expectClose(`diskAmplitude(${x})`, diskAmplitude(x), (2 * col(row, 2)) / x, 2 * EPS, MPMATH);
    }
  });
});

describe('properties', () => {
  const finite = fc.double({ noNaN: true, noDefaultInfinity: true });

  it('J0, J2 and the disk amplitude are even; J1 and both derivatives are odd', () => {
    fc.assert(
      fc.property(finite, (x) => {
        expect(besselJ0(-x)).toBe(besselJ0(x));
        expect(besselJ2(-x)).toBe(besselJ2(x));
        expect(diskAmplitude(-x)).toBe(diskAmplitude(x));
        expect(besselJ1(-x)).toBe(-besselJ1(x));
        expect(diskAmplitudeDerivative(-x)).toBe(-diskAmplitudeDerivative(x));
        expect(ringAmplitudeDerivative(-x)).toBe(-ringAmplitudeDerivative(x));
      }),
      { numRuns: 2000 },
    );
  });

  it('every kernel gives a finite value of at most 1 in size for every finite x', () => {
    fc.assert(
      fc.property(finite, (x) => {
        for (const f of [
          besselJ0,
          besselJ1,
          besselJ2,
          diskAmplitude,
          diskAmplitudeDerivative,
          ringAmplitudeDerivative,
        ]) {
          const y = f(x);
          expect(Number.isFinite(y)).toBe(true);
          // |J_n| <= 1 (A&S 9.1.60), so the amplitudes and their derivatives are bounded by 1 too
          expect(Math.abs(y)).toBeLessThanOrEqual(1);
        }
      }),
      { numRuns: 2000 },
    );
  });

  it('every kernel gives NaN for NaN and the infinities', () => {
    for (const x of [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) {
      for (const f of [
        besselJ0,
        besselJ1,
        besselJ2,
        diskAmplitude,
        diskAmplitudeDerivative,
        ringAmplitudeDerivative,
      ]) {
        expect(f(x)).toBeNaN();
      }
    }
  });

  it('J0 and J1 at the largest doubles and the subnormals are finite and of the right size', () => {
    expect(Math.abs(besselJ0(Number.MAX_VALUE))).toBeLessThan(1e-150);
    expect(besselJ0(Number.MIN_VALUE)).toBe(1);
    expect(besselJ1(Number.MIN_VALUE)).toBe(Number.MIN_VALUE / 2);
  });
});
