/** fast-check generators of random model trees and uv points, shared by the property tests. */
import fc from 'fast-check';
import { disk, ellipse, gaussian, type Model, point, ring, sum } from '../../src/index.js';

const size = fc.double({ min: 0.05, max: 20, noNaN: true });
const offset = fc.double({ min: -50, max: 50, noNaN: true });
const angle = fc.double({ min: -360, max: 360, noNaN: true });
const factor = fc.double({ min: 0.2, max: 5, noNaN: true });

export const arbPrimitive: fc.Arbitrary<Model> = fc.oneof(
  fc.constant(null).map(() => point()),
  size.map((d) => disk({ diameter: d })),
  size.map((w) => gaussian({ fwhm: w })),
  size.map((d) => ring({ diameter: d })),
  fc
    .tuple(size, fc.double({ min: 0.1, max: 1, noNaN: true }), angle)
    .map(([a, r, p]) => ellipse({ major: a, minor: a * r, pa: p })),
);

/** Random trees of primitives and operators with a positive total flux. */
export const arbModel: fc.Arbitrary<Model> = fc.letrec<{ m: Model }>((tie) => ({
  m: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    arbPrimitive,
    fc.tuple(tie('m'), fc.double({ min: 0.1, max: 3, noNaN: true })).map(([m, w]) => m.weight(w)),
    fc.tuple(tie('m'), offset, offset).map(([m, e, n]) => m.shift(e, n)),
    fc.tuple(tie('m'), factor, factor).map(([m, a, b]) => m.stretch(a, b)),
    fc.tuple(tie('m'), angle).map(([m, p]) => m.rotate(p)),
    fc
      .tuple(tie('m'), fc.double({ min: 0, max: 85, noNaN: true }), angle)
      .map(([m, i, p]) => m.incline(i, p)),
    fc.array(tie('m'), { minLength: 1, maxLength: 3 }).map((ms) => sum(...ms)),
    fc.tuple(tie('m'), tie('m')).map(([a, b]) => a.convolve(b)),
  ),
})).m;

/** Spatial frequencies up to 3e8 cycles per radian (a 300 m baseline at 1 micron). */
export const arbUV = fc.tuple(
  fc.double({ min: -3e8, max: 3e8, noNaN: true }),
  fc.double({ min: -3e8, max: 3e8, noNaN: true }),
);
