/**
 * The piecewise tables of bessel-coefficients.ts (half-unit pieces, 2 <= x < HANKEL_START): every basis function of the
 * limb-darkened disks and their slopes, and the law tables a plan builds from them.
 */
import besselj0 from '@stdlib/math-base-special-besselj0';
import besselj1 from '@stdlib/math-base-special-besselj1';
import { describe, expect, it } from 'vitest';
import {
  BASIS_STRIDE,
  DISK_PIECES,
  HANKEL_START,
  L3_PIECES,
  L32_PIECES,
  L52_PIECES,
  pieceIndex,
  pieceLocal,
  W2_PIECES,
} from '../../src/kernels/bessel-coefficients.js';
import { limbDarkenedCoefficients } from '../../src/kernels/components.js';
import { basisPiece, limbPieces } from '../../src/kernels/limb-pieces.js';
import { col, EPS, expectClose, fixture } from './helpers.js';

const MPMATH = `mpmath ${fixture.versions['mpmath']} (tests/fixtures/kernels/bessel.json, J0 J1 J2)`;
const STDLIB = '@stdlib/math-base-special-besselj0/-besselj1 0.3.1 (Cephes-derived), recurrence A&S 9.1.27';
const CLOSED = 'closed forms of the spherical Bessel functions (A&S 10.1.11) in binary64';

/** Rows [x, J0, J1, J2] of the fixture with 2 <= x < HANKEL_START. */
const rows = fixture.j012_moderate.filter((r) => col(r, 0) >= 2 && col(r, 0) < HANKEL_START);

/** The table's polynomial at x, with the piece found here independently of pieceIndex (half-unit pieces from 2). */
function atPiece(table: Float64Array, x: number): number {
  const j = Math.floor(2 * (x - 2));
  expect(pieceIndex(x)).toBe(j);
  return basisPiece(table, j, x - (2 + (j + 0.5) / 2));
}

// Tolerances: the tables' own fit error is below 7e-17 (generator report); what is left is rounding in the
// evaluation (a few ulp of values below 1) and, for the closed forms, their own rounding.
/** Against values built from mpmath's J0, J1, J2 (2 J1/x, 8 J2/x^2, 48 J3/x^3 with J3 = 4 J2/x - J1). */
const MPMATH_TOL = 4 * EPS;
/** Against @stdlib's J0 and J1 (a few eps each; the recurrence to J3 loses up to a factor 5 near x = 2). */
const STDLIB_TOL = 16 * EPS;
/** Against the closed forms, whose brackets lose up to a factor 2 to cancellation near x = 2. */
const CLOSED_TOL = 8 * EPS;

describe('unit-interval tables of the limb-darkening basis', () => {
  it('has fixture points on many pieces', () => {
    const pieces = new Set(rows.map((r) => Math.floor(2 * (col(r, 0) - 2))));
    expect(pieces.size).toBeGreaterThan(25);
  });

  it('finds the half-unit piece of x and its local variable, also at the piece ends', () => {
    for (const [x, j] of [
      [2, 0],
      [2.4999999999999996, 0],
      [2.5, 1],
      [3, 2],
      [47.99999999999999, 91],
    ] as const) {
      expect(pieceIndex(x)).toBe(j);
      const t = pieceLocal(x, j);
      expect(t).toBeGreaterThanOrEqual(-0.25);
      expect(t).toBeLessThan(0.25);
    }
    expect(DISK_PIECES.length / BASIS_STRIDE).toBe(2 * (HANKEL_START - 2));
  });

  it('gives 2 J1/x, 8 J2/x^2 and 48 J3/x^3 on every piece against @stdlib (Cephes-derived) J0 and J1', () => {
    for (let x = 2; x < HANKEL_START; x += 0.0537) {
      const j0 = besselj0(x);
      const j1 = besselj1(x);
      const j2 = (2 * j1) / x - j0; // A&S 9.1.27
      const j3 = (4 * j2) / x - j1;
      expectClose(`DISK_PIECES at ${x}`, atPiece(DISK_PIECES, x), (2 * j1) / x, STDLIB_TOL, STDLIB);
      expectClose(`W2_PIECES at ${x}`, atPiece(W2_PIECES, x), (8 * j2) / (x * x), STDLIB_TOL, STDLIB);
      expectClose(`L3_PIECES at ${x}`, atPiece(L3_PIECES, x), (48 * j3) / (x * x * x), STDLIB_TOL, STDLIB);
    }
  });

  it('gives 2 J1(x)/x, 8 J2(x)/x^2 and 48 J3(x)/x^3 to 4 eps against mpmath', () => {
    for (const r of rows) {
      const [x, , j1, j2] = [col(r, 0), col(r, 1), col(r, 2), col(r, 3)];
      const j3 = (4 * j2) / x - j1; // A&S 9.1.27
      expectClose(`DISK_PIECES at ${x}`, atPiece(DISK_PIECES, x), (2 * j1) / x, MPMATH_TOL, MPMATH);
      expectClose(`W2_PIECES at ${x}`, atPiece(W2_PIECES, x), (8 * j2) / (x * x), MPMATH_TOL, MPMATH);
      expectClose(`L3_PIECES at ${x}`, atPiece(L3_PIECES, x), (48 * j3) / (x * x * x), MPMATH_TOL, MPMATH);
    }
  });

  it('gives L_3/2 = 3 (sin x - x cos x)/x^3 and L_5/2 = 15 ((3 - x^2) sin x - 3 x cos x)/x^5', () => {
    for (let x = 2; x < HANKEL_START; x += 0.0371) {
      const s = Math.sin(x);
      const c = Math.cos(x);
      expectClose(
        `L32_PIECES at ${x}`,
        atPiece(L32_PIECES, x),
        (3 * (s - x * c)) / x ** 3,
        CLOSED_TOL,
        CLOSED,
      );
      const l52 = (15 * ((3 - x * x) * s - 3 * x * c)) / x ** 5;
      expectClose(`L52_PIECES at ${x}`, atPiece(L52_PIECES, x), l52, CLOSED_TOL, CLOSED);
    }
  });

  it('joins neighbouring pieces to within a few ulp at their common ends', () => {
    for (const table of [DISK_PIECES, L32_PIECES, W2_PIECES, L52_PIECES, L3_PIECES]) {
      for (let k = 0; k + 1 < table.length / BASIS_STRIDE; k++) {
        const left = basisPiece(table, k, 0.25);
        const right = basisPiece(table, k + 1, -0.25);
        expect(Math.abs(left - right)).toBeLessThan(2 * MPMATH_TOL);
      }
    }
  });

  it('adds a law table that equals the law on the basis (linear and quadratic laws)', () => {
    for (const [a, b] of [
      [0.4, 0],
      [0.2, 0.3],
      [1, 0],
    ] as const) {
      const [c1, c32, c2] = limbDarkenedCoefficients(a, b);
      const law = limbPieces(c1, c32, c2);
      for (let x = 2; x < HANKEL_START; x += 0.0913) {
        const want = c1 * atPiece(DISK_PIECES, x) + c32 * atPiece(L32_PIECES, x) + c2 * atPiece(W2_PIECES, x);
        expectClose(
          `law (${a}, ${b}) at ${x}`,
          atPiece(law, x),
          want,
          MPMATH_TOL,
          'the sum of the basis tables',
        );
      }
    }
  });
});
