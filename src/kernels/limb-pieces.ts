/**
 * Limb-darkened disks on the half-unit-piece tables: a law's visibility c1 D(x) + c32 L(x) + c2 W(x) (see
 * limbDarkenedCoefficients in components.ts) is, on each half-unit piece [2 + j/2, 2.5 + j/2] below HANKEL_START, one
 * polynomial whose coefficients are the same combination of the basis tables' coefficients. A plan adds the
 * tables once for its law, and each point then costs one polynomial instead of three.
 *
 * @module
 */
import { DISK_PIECES, L3_PIECES, L32_PIECES, L52_PIECES, W2_PIECES } from './bessel-coefficients.js';

/** Piece j of a table such as {@link limbPieces} gives, at t = pieceLocal(x, j) (generated with the tables). */
export { basisPiece } from './bessel-coefficients.js';

/**
 * The table of c1 D + c32 L + c2 W per piece, with D = 2 J1(x)/x, L = 3 (sin x - x cos x)/x^3, W = 8 J2(x)/x^2.
 *
 * @param c1 - weight of D
 * @param c32 - weight of L
 * @param c2 - weight of W (0 for the linear law)
 * @returns BASIS_STRIDE coefficients per piece, for basisPiece
 *
 * Notes: each coefficient is rounded once more than the basis tables' own; at the points the result differs
 * from the sum of the three polynomials by a few ulp of (|c1| + |c32| + |c2|) times the largest basis value.
 */
export function limbPieces(c1: number, c32: number, c2: number): Float64Array {
  const out = new Float64Array(DISK_PIECES.length);
  for (let j = 0; j < out.length; j++)
    out[j] = c1 * DISK_PIECES[j]! + c32 * L32_PIECES[j]! + c2 * W2_PIECES[j]!;
  return out;
}

const PI2 = Math.PI * Math.PI;

/**
 * The table of the law's slope dP/dr2 per piece, for r2 = x^2 / pi^2 (x = pi sqrt(r2)):
 * -pi^2 (c1 W / 8 + c32 L_{5/2} / 10 + c2 L_3 / 12), with W = 8 J2(x)/x^2, L_{5/2} and L_3 = 48 J3(x)/x^3.
 *
 * @param c1 - weight of D = 2 J1(x)/x in the law's visibility
 * @param c32 - weight of L_{3/2}
 * @param c2 - weight of W (0 for the linear law)
 * @returns BASIS_STRIDE coefficients per piece, for basisPiece
 *
 * Notes: d/dx L_nu = -x L_{nu+1} / (2 (nu + 1)) (A&S 9.1.30) and dx/dr2 = pi^2 / (2 x), so each basis function's
 * slope in r2 is -pi^2 L_{nu+1} / (4 (nu + 1)), as limbDarkenedDerivatives (component-derivatives.ts) sums them
 * point by point; here the sum is taken once on the tables' coefficients, like {@link limbPieces}.
 */
export function limbSlopePieces(c1: number, c32: number, c2: number): Float64Array {
  const w = (-PI2 * c1) / 8;
  const l = (-PI2 * c32) / 10;
  const t = (-PI2 * c2) / 12;
  const out = new Float64Array(DISK_PIECES.length);
  for (let j = 0; j < out.length; j++) out[j] = w * W2_PIECES[j]! + l * L52_PIECES[j]! + t * L3_PIECES[j]!;
  return out;
}
