import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { cosSinCombination } from '../../src/kernels/trig.js';
import { EPS, expectClose } from './helpers.js';

/** Our reduction and polynomials plus the rounding of Math.cos / Math.sin (< 1 ulp each). */
const COMBINATION_TOL = 2 * EPS;

describe('cosSinCombination', () => {
  it('agrees with A cos a + B sin a from Math.cos and Math.sin over the reduced range and beyond', () => {
    fc.assert(
      fc.property(
        fc.oneof(
          fc.double({ min: -10, max: 10, noNaN: true }),
          fc.double({ min: -1.6e6, max: 1.6e6, noNaN: true }),
          fc.double({ min: -1e300, max: 1e300, noNaN: true }),
        ),
        fc.double({ min: -2, max: 2, noNaN: true }),
        fc.double({ min: -2, max: 2, noNaN: true }),
        (a, A, B) => {
          const want = A * Math.cos(a) + B * Math.sin(a);
          const tol = COMBINATION_TOL * (Math.abs(A) + Math.abs(B));
          expectClose(
            `cosSinCombination(${a}, ${A}, ${B})`,
            cosSinCombination(a, A, B),
            want,
            tol,
            'Math.cos, Math.sin',
          );
        },
      ),
      { numRuns: 5000 },
    );
  });

  it('is accurate next to multiples of pi/2, where the reduced argument is small', () => {
    for (const k of [1, 2, 3, 7, 1001, 123457, 1018000]) {
      const a = (k * Math.PI) / 2; // within a few ulp(a) of k pi/2
      for (const [A, B] of [
        [1, 0],
        [0, 1],
      ] as const) {
        const want = A * Math.cos(a) + B * Math.sin(a);
        expectClose(
          `cosSinCombination(${a}, ${A}, ${B})`,
          cosSinCombination(a, A, B),
          want,
          COMBINATION_TOL,
          'Math.cos, Math.sin',
        );
      }
    }
  });

  it('gives NaN for a non-finite angle', () => {
    expect(cosSinCombination(Number.POSITIVE_INFINITY, 1, 1)).toBeNaN();
    expect(cosSinCombination(Number.NaN, 1, 1)).toBeNaN();
  });
});
