import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import {
  besselJ0,
  besselJ1,
  besselJ2,
  diskAmplitude,
  diskAmplitudeDerivative,
} from '../../src/kernels/bessel-j01.js';
import {
  besselJnu,
  MAX_BESSEL_ORDER,
  powerLawAmplitude,
  powerLawAmplitudeDerivative,
} from '../../src/kernels/bessel-jnu.js';
import { col, derivative, EPS, expectClose, fixture, range } from './helpers.js';

const MPMATH = `mpmath ${fixture.versions['mpmath']} besselj at ${fixture.versions['mpmath_digits']} digits, checked against scipy ${fixture.versions['scipy']} jv (tests/fixtures/kernels/bessel.json)`;
/** The accuracy goal for J_nu on 0 <= x <= 200: relative where |J| is not tiny, absolute otherwise. */
const JNU_REL_TOL = 1e-13;
const JNU_ABS_TOL = 1e-14;
const jnuTol = (want: number) => JNU_REL_TOL * Math.abs(want) + JNU_ABS_TOL;

describe('besselJnu against mpmath', () => {
  it('meets 1e-13 relative + 1e-14 absolute for every order and argument of the fixture', () => {
    expect(fixture.jnu.length).toBeGreaterThan(500);
    for (const row of fixture.jnu) {
      const nu = col(row, 0);
      const x = col(row, 1);
      const want = col(row, 2);
      expectClose(`besselJnu(${nu}, ${x})`, besselJnu(nu, x), want, jnuTol(want), MPMATH);
    }
  });

  it('gives powerLawAmplitude = Gamma(nu + 1) (2/x)^nu J_nu with J_nu from mpmath, for |V| not tiny', () => {
    // Gamma(nu + 1) (2/x)^nu from the same fixture's gamma column would need those orders; use the ratio of two
    // of the library's own evaluations instead: V(nu, x) / V(nu, x0) = (x0/x)^nu J_nu(x) / J_nu(x0).
    for (const nu of [1.5, 2.5, 3.3, 4.75, 6]) {
      const rows = fixture.jnu.filter(
        (r) => col(r, 0) === nu && col(r, 1) > 0.2 && Math.abs(col(r, 2)) > 1e-3,
      );
      expect(rows.length).toBeGreaterThan(10);
      const x0 = col(rows[0]!, 1);
      const j0 = col(rows[0]!, 2);
      for (const row of rows) {
        const x = col(row, 1);
        const want = ((x0 / x) ** nu * col(row, 2)) / j0;
        const got = powerLawAmplitude(nu, x) / powerLawAmplitude(nu, x0);
        expectClose(
          `powerLawAmplitude(${nu}, ${x}) / powerLawAmplitude(${nu}, ${x0})`,
          got,
          want,
          1e-12 * Math.abs(want),
          MPMATH,
        );
      }
    }
  });
});

describe('closed forms of half-integer order (A&S 10.1.11 with J_{n+1/2} = sqrt(2x/pi) j_n)', () => {
  // On a dense grid that crosses every method: series (x small), Miller's recurrence, Hankel's expansion (x >= 25).
  const xs = [...range(1, 200, 0.0173)];
  const amp = (x: number) => Math.sqrt(2 / (Math.PI * x));
  /** The closed forms are themselves rounded: a few eps times the size of their terms. */
  const closedTol = (x: number, want: number) =>
    JNU_REL_TOL * Math.abs(want) + 8 * EPS * amp(x) * (1 + 3 / x);

  it('J_{1/2}(x) = sqrt(2/(pi x)) sin x', () => {
    for (const x of xs) {
      const want = amp(x) * Math.sin(x);
      expectClose(`besselJnu(0.5, ${x})`, besselJnu(0.5, x), want, closedTol(x, want), 'A&S 10.1.11');
    }
  });

  it('J_{3/2}(x) = sqrt(2/(pi x)) (sin x / x - cos x)', () => {
    for (const x of xs) {
      const want = amp(x) * (Math.sin(x) / x - Math.cos(x));
      expectClose(`besselJnu(1.5, ${x})`, besselJnu(1.5, x), want, closedTol(x, want), 'A&S 10.1.11');
    }
  });

  it('J_{5/2}(x) = sqrt(2/(pi x)) ((3/x^2 - 1) sin x - 3 cos x / x)', () => {
    for (const x of xs) {
      const want = amp(x) * ((3 / (x * x) - 1) * Math.sin(x) - (3 * Math.cos(x)) / x);
      expectClose(`besselJnu(2.5, ${x})`, besselJnu(2.5, x), want, closedTol(x, want), 'A&S 10.1.11');
    }
  });
});

describe('powerLawAmplitude', () => {
  it('is 1 at x = 0 for every order', () => {
    for (const nu of [0, 0.3, 1, 1.5, 2.5, 6, 40]) expect(powerLawAmplitude(nu, 0)).toBe(1);
  });

  it('at nu = 1 (alpha = 0) is the uniform disk, also when reached through the general-order methods', () => {
    const NEAR_ONE_TOL = 1e-11; // nu = 1 + 1e-12 moves V by about 1e-12 |dV/dnu|
    for (const x of range(0, 120, 0.0917)) {
      expect(powerLawAmplitude(1, x)).toBe(diskAmplitude(x));
      expectClose(
        `powerLawAmplitude(1 + 1e-12, ${x})`,
        powerLawAmplitude(1 + 1e-12, x),
        diskAmplitude(x),
        NEAR_ONE_TOL,
        'uniform disk 2 J1(x)/x (CONVENTIONS.md)',
      );
    }
  });

  it('at nu = 0 is the thin ring J0, also through the general-order methods', () => {
    for (const x of range(0, 120, 0.0917)) {
      expect(powerLawAmplitude(0, x)).toBe(besselJ0(x));
      expectClose(
        `powerLawAmplitude(1e-12, ${x})`,
        powerLawAmplitude(1e-12, x),
        besselJ0(x),
        1e-11,
        'thin ring J0',
      );
    }
  });

  it('at nu = 1.5 equals 3 (sin x - x cos x) / x^3, and 1 - x^2/10 + x^4/280 near 0', () => {
    for (const x of range(0.5, 200, 0.0531)) {
      const want = (3 * (Math.sin(x) - x * Math.cos(x))) / (x * x * x);
      // the closed form cancels for small x: its rounding is about eps * 3 / x^2
      const tol = JNU_REL_TOL * Math.abs(want) + (8 * EPS * 3) / (x * x);
      expectClose(
        `powerLawAmplitude(1.5, ${x})`,
        powerLawAmplitude(1.5, x),
        want,
        tol,
        'closed form of J_{3/2}',
      );
    }
    for (const x of [1e-8, 1e-4, 1e-2, 0.05]) {
      const s = x * x;
      const want = 1 - s / 10 + (s * s) / 280 - (s * s * s) / 15120;
      expectClose(
        `powerLawAmplitude(1.5, ${x})`,
        powerLawAmplitude(1.5, x),
        want,
        EPS,
        'series 0F1(; 5/2; -x^2/4)',
      );
    }
  });

  it('is even in x', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 20, noNaN: true }),
        fc.double({ min: -300, max: 300, noNaN: true }),
        (nu, x) => {
          expect(powerLawAmplitude(nu, -x)).toBe(powerLawAmplitude(nu, x));
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe('powerLawAmplitudeDerivative', () => {
  it('matches central differences of powerLawAmplitude', () => {
    const H = 1e-3;
    const DIFF_TOL = 5e-12;
    for (const nu of [0.4, 1.3, 2, 2.5, 4.1, 6]) {
      for (const x of range(0.05, 60, 0.377)) {
        expectClose(
          `powerLawAmplitudeDerivative(${nu}, ${x})`,
          powerLawAmplitudeDerivative(nu, x),
          derivative((t) => powerLawAmplitude(nu, t), x, H),
          DIFF_TOL,
          'five-point central difference of powerLawAmplitude',
        );
      }
    }
  });

  it('at nu = 1 equals diskAmplitudeDerivative, and is 0 at x = 0', () => {
    for (const x of range(-50, 50, 0.173)) {
      expectClose(
        `powerLawAmplitudeDerivative(1, ${x})`,
        powerLawAmplitudeDerivative(1, x),
        diskAmplitudeDerivative(x),
        4 * EPS,
        'd/dx 2 J1(x)/x = -2 J2(x)/x (A&S 9.1.30)',
      );
    }
    expect(Math.abs(powerLawAmplitudeDerivative(2.3, 0))).toBe(0);
  });
});

describe('besselJnu at integer orders and with signs', () => {
  it('at nu = 2 agrees with besselJ2 (recurrence A&S 9.1.27)', () => {
    for (const x of range(0, 200, 0.0391)) {
      const want = besselJ2(x);
      expectClose(`besselJnu(2, ${x})`, besselJnu(2, x), want, 1e-15, 'besselJ2 = 2 J1/x - J0 (A&S 9.1.27)');
    }
  });

  it('uses J_n(-x) = (-1)^n J_n(x) and J_{-n} = (-1)^n J_n (A&S 9.1.5)', () => {
    for (const x of [0.7, 3.1, 17, 60]) {
      expect(besselJnu(0, -x)).toBe(besselJ0(x));
      expect(besselJnu(1, -x)).toBe(-besselJ1(x));
      expect(besselJnu(-1, x)).toBe(-besselJ1(x));
      expect(besselJnu(-1, -x)).toBe(besselJ1(x));
      expect(besselJnu(3, -x)).toBe(-besselJnu(3, x));
      expect(besselJnu(-4, -x)).toBe(besselJnu(4, x));
    }
  });

  it('satisfies J_{nu-1} + J_{nu+1} = (2 nu / x) J_nu (A&S 9.1.27) for random orders and arguments', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 8, noNaN: true }),
        fc.double({ min: 0.5, max: 200, noNaN: true }),
        (nu, x) => {
          const lhs = besselJnu(nu - 1, x) + besselJnu(nu + 1, x);
          const rhs = ((2 * nu) / x) * besselJnu(nu, x);
          expectClose(
            `J(${nu - 1}, ${x}) + J(${nu + 1}, ${x})`,
            lhs,
            rhs,
            4e-14 * (1 + (2 * nu) / x),
            'A&S 9.1.27',
          );
        },
      ),
      { numRuns: 500 },
    );
  });
});

describe('domain', () => {
  it('returns NaN for non-finite order or argument', () => {
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) {
      expect(besselJnu(bad, 1)).toBeNaN();
      expect(besselJnu(2.5, bad)).toBeNaN();
      expect(powerLawAmplitude(bad, 1)).toBeNaN();
      expect(powerLawAmplitude(2.5, bad)).toBeNaN();
      expect(powerLawAmplitudeDerivative(2.5, bad)).toBeNaN();
    }
  });

  it('throws InputError for a negative non-integer order, a negative argument with a non-integer order, and orders above the bound', () => {
    expect(() => besselJnu(-0.5, 1)).toThrow(InputError);
    expect(() => besselJnu(1.5, -1)).toThrow(InputError);
    expect(() => besselJnu(MAX_BESSEL_ORDER + 1, 1)).toThrow(InputError);
    expect(() => powerLawAmplitude(-0.1, 1)).toThrow(InputError);
    expect(() => powerLawAmplitudeDerivative(-0.1, 1)).toThrow(InputError);
    expect(() => powerLawAmplitude(MAX_BESSEL_ORDER, 1)).toThrow(InputError);
  });

  it('gives finite values for every finite order in range and every finite argument', () => {
    fc.assert(
      fc.property(
        fc.oneof(fc.double({ min: 0, max: 10, noNaN: true }), fc.double({ min: 0, max: 60, noNaN: true })),
        fc.oneof(
          fc.double({ min: 0, max: 300, noNaN: true }),
          fc.double({ min: 0, max: Number.MAX_VALUE, noNaN: true }),
        ),
        (nu, x) => {
          const j = besselJnu(nu, x);
          const v = powerLawAmplitude(nu, x);
          const d = powerLawAmplitudeDerivative(nu, x);
          expect(Number.isFinite(j) && Number.isFinite(v) && Number.isFinite(d)).toBe(true);
          // |J_nu| <= 1 for nu >= 0 (A&S 9.1.60) and |V| <= 1 (V is the transform of a positive image with V(0) = 1)
          expect(Math.abs(j)).toBeLessThanOrEqual(1 + 1e-15);
          expect(Math.abs(v)).toBeLessThanOrEqual(1 + 1e-15);
        },
      ),
      { numRuns: 400 },
    );
  });
});
