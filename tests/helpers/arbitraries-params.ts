/**
 * fast-check generators of random model trees whose slots hold parameters as well as numbers: finite and
 * infinite bounds, fixed and free parameters, and parameters tied across several slots.
 */
import fc from 'fast-check';
import { disk, ellipse, gaussian, type Model, type Param, param, point, ring, sum } from '../../src/index.js';

/** Classes of slots by the values they accept (mas, degrees or plain factors). */
type SlotClass = 'size' | 'minor' | 'offset' | 'angle' | 'factor' | 'inclination' | 'flux';

const RANGES: Readonly<Record<SlotClass, readonly [number, number]>> = {
  size: [0.05, 20], // mas
  minor: [0.001, 0.05], // mas, never above the smallest size, so an ellipse's minor <= major
  offset: [-50, 50], // mas
  angle: [-360, 360], // degrees
  factor: [0.2, 5],
  inclination: [0, 85], // degrees
  flux: [0.1, 3],
};
const CLASSES = Object.keys(RANGES) as SlotClass[];

/** A double in [lo, hi] with -0 written as 0 (JSON has no -0). */
function value(lo: number, hi: number): fc.Arbitrary<number> {
  return fc.double({ min: lo, max: hi, noNaN: true }).map((x) => x + 0);
}

/** A parameter named `name` with a value in the class range, optional finite bounds around it and a random fixed flag. */
function arbParam(name: string, c: SlotClass): fc.Arbitrary<Param> {
  const [lo, hi] = RANGES[c];
  const margin = fc.option(value(0, 10), { nil: null });
  return fc.tuple(value(lo, hi), margin, margin, fc.boolean()).map(([v, below, above, fixed]) =>
    param(name, v, {
      min: below === null ? Number.NEGATIVE_INFINITY : v - below,
      max: above === null ? Number.POSITIVE_INFINITY : v + above,
      fixed,
    }),
  );
}

/** One or two parameters per slot class, named `<class><i>`; a tree draws from these, so names repeat (ties). */
type Pool = Readonly<Record<SlotClass, readonly Param[]>>;

const arbPool: fc.Arbitrary<Pool> = fc.record(
  Object.fromEntries(
    CLASSES.map((c) => [
      c,
      fc
        .integer({ min: 1, max: 2 })
        .chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => arbParam(`${c}${i}`, c)))),
    ]),
  ) as Record<SlotClass, fc.Arbitrary<Param[]>>,
);

function slotValue(s: number | Param): number {
  return typeof s === 'number' ? s : s.value;
}

function arbTree(pool: Pool): fc.Arbitrary<Model> {
  const slot = (c: SlotClass): fc.Arbitrary<number | Param> =>
    fc.oneof(
      { arbitrary: value(...RANGES[c]), weight: 1 },
      { arbitrary: fc.constantFrom(...pool[c]), weight: 1 },
    );
  const primitive = fc.oneof(
    fc.constant(null).map(() => point()),
    slot('size').map((d) => disk({ diameter: d })),
    slot('size').map((w) => gaussian({ fwhm: w })),
    slot('size').map((d) => ring({ diameter: d })),
    fc
      .tuple(
        slot('size'),
        value(0.1, 1),
        fc.option(fc.constantFrom(...pool.minor), { nil: null }),
        slot('angle'),
      )
      .map(([major, r, minor, pa]) => ellipse({ major, minor: minor ?? slotValue(major) * r, pa })),
  );
  return fc.letrec<{ m: Model }>((tie) => ({
    m: fc.oneof(
      { depthSize: 'small', withCrossShrink: true },
      primitive,
      fc.tuple(tie('m'), slot('flux')).map(([m, w]) => m.weight(w)),
      fc.tuple(tie('m'), slot('offset'), slot('offset')).map(([m, e, n]) => m.shift(e, n)),
      fc.tuple(tie('m'), slot('factor'), slot('factor')).map(([m, a, b]) => m.stretch(a, b)),
      fc.tuple(tie('m'), slot('angle')).map(([m, p]) => m.rotate(p)),
      fc.tuple(tie('m'), slot('inclination'), slot('angle')).map(([m, i, p]) => m.incline(i, p)),
      fc.array(tie('m'), { minLength: 1, maxLength: 3 }).map((ms) => sum(...ms)),
      fc.tuple(tie('m'), tie('m')).map(([a, b]) => a.convolve(b)),
    ),
  })).m;
}

/** Random model trees with parameters (finite or infinite bounds, fixed or free, tied) in random slots. */
export const arbParamModel: fc.Arbitrary<Model> = arbPool.chain(arbTree);
