/**
 * Facts of the trade (common practice; the Bessel zeros are from A&S table 9.5, quoted from memory in
 * CONVENTIONS.md: j_{1,1} = 3.831706, j_{0,1} = 2.404826).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { disk, gaussian, point, RAD_PER_MAS, ring, sum } from '../../src/index.js';

/** Bisection to find where a function of q changes sign. */
function zeroBetween(f: (q: number) => number, a: number, b: number): number {
  let lo = a;
  let hi = b;
  for (let k = 0; k < 200; k++) {
    const mid = 0.5 * (lo + hi);
    if (Math.sign(f(mid)) === Math.sign(f(lo))) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

describe('facts of the trade', () => {
  it('the first null of a uniform disk is at q theta = 1.21967', () => {
    const theta = 2; // mas
    const m = disk({ diameter: theta });
    const thetaRad = theta * RAD_PER_MAS;
    const q0 = zeroBetween((q) => m.visibility(q, 0).re, 1 / thetaRad, 1.5 / thetaRad);
    expect(q0 * thetaRad).toBeCloseTo(1.21967, 5);
  });

  it('the first null of a thin ring is at q theta = 0.76548', () => {
    const theta = 4;
    const m = ring({ diameter: theta });
    const thetaRad = theta * RAD_PER_MAS;
    const q0 = zeroBetween((q) => m.visibility(0, q).re, 0.6 / thetaRad, 0.9 / thetaRad);
    expect(q0 * thetaRad).toBeCloseTo(0.76548, 5);
  });

  it('a centro-symmetric model has closure phases of 0 or 180 degrees only', () => {
    // disk + ring of different sizes, both centred: real visibilities that change sign
    const m = sum(
      disk({ diameter: 3 }),
      ring({ diameter: 7 }).weight(0.5),
      gaussian({ fwhm: 9 }).stretch(0.5, 1).rotate(20),
    );
    fc.assert(
      fc.property(
        fc.double({ min: -4e8, max: 4e8, noNaN: true }),
        fc.double({ min: -4e8, max: 4e8, noNaN: true }),
        fc.double({ min: -4e8, max: 4e8, noNaN: true }),
        fc.double({ min: -4e8, max: 4e8, noNaN: true }),
        (u1, v1, u2, v2) => {
          const cp = m.closurePhase([u1], [v1], [u2], [v2])[0]!;
          return Math.abs(cp) < 1e-9 || Math.abs(Math.abs(cp) - 180) < 1e-9;
        },
      ),
      { seed: 20261201, numRuns: 300 },
    );
  });

  it('an unresolved binary has V^2 between ((1-f)/(1+f))^2 and 1 with period 1/separation', () => {
    const f = 0.25;
    const sep = 10; // mas, along east
    const m = point().plus(point().weight(f).shift(sep, 0));
    const sepRad = sep * RAD_PER_MAS;
    const u = Array.from({ length: 3001 }, (_, k) => k / 1000 / sepRad); // includes u = 0.5 / sep
    const v2 = m.vis2(u, new Array(u.length).fill(0));
    const lo = ((1 - f) / (1 + f)) ** 2;
    let min = Number.POSITIVE_INFINITY;
    let max = Number.NEGATIVE_INFINITY;
    for (const x of v2) {
      min = Math.min(min, x);
      max = Math.max(max, x);
    }
    expect(min).toBeCloseTo(lo, 12); // reached at u = (k + 1/2) / sep
    expect(max).toBeCloseTo(1, 12);
    const period = m.vis2([0.3 / sepRad, 1.3 / sepRad], [0, 0]);
    expect(period[0]).toBeCloseTo(period[1]!, 12);
    // along north the binary is unresolved
    expect(m.vis2([0], [1 / sepRad])[0]).toBeCloseTo(1, 12);
  });
});
