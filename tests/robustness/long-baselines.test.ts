/**
 * Shifts up to 10 arcseconds (1e4 mas) at spatial frequencies up to 1e9 cycles per radian: the phase of the
 * ramp exp(-2 pi i (u e0 + v n0)) (CONVENTIONS.md) stays within 1e-9 rad of an exactly reduced reference.
 *
 * The reference phase is computed in exact rational arithmetic with BigInt: u, v and the shifts in mas are
 * binary64 numbers, that is integers times powers of two, so u * east + v * north is an exact rational; times
 * pi / 648e6 (rad per mas, with pi to 50 decimals) it gives the phase in turns, which is reduced mod 1 at 2^-200
 * resolution before it is rounded to a double. The phase then spans up to about 1e5 turns, where a reduction in
 * binary64 after the product would keep only about 1e-11 of a turn.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  disk,
  gaussian,
  limbDarkenedDisk,
  linearLaw,
  type Model,
  modulatedRing,
  point,
} from '../../src/index.js';

/** Largest phase error allowed, rad. */
const PHASE_TOL = 1e-9;
/** pi to 50 decimals (the well-known expansion; its first 16 digits are checked against Math.PI below). */
const PI_DIGITS = 314159265358979323846264338327950288419716939937510n;
const PI_SCALE = 10n ** 50n;
const FRACTION_BITS = 200n;

/** x = m * 2^e exactly, for a finite double x. */
function exact(x: number): [bigint, number] {
  if (x === 0) return [0n, 0];
  const view = new DataView(new ArrayBuffer(8));
  view.setFloat64(0, x);
  const bits = view.getBigUint64(0);
  const biased = Number((bits >> 52n) & 0x7ffn);
  const fraction = bits & ((1n << 52n) - 1n);
  const m = biased === 0 ? fraction : fraction | (1n << 52n);
  const sign = bits >> 63n === 1n ? -1n : 1n;
  return [sign * m, (biased === 0 ? 1 : biased) - 1075];
}

/** Exact u * east + v * north (east, north in mas) as m * 2^e. */
function exactDot(u: number, east: number, v: number, north: number): [bigint, number] {
  const [a, ea] = exact(u);
  const [b, eb] = exact(east);
  const [c, ec] = exact(v);
  const [d, ed] = exact(north);
  const e1 = ea + eb;
  const e2 = ec + ed;
  const e = Math.min(e1, e2);
  return [a * b * (1n << BigInt(e1 - e)) + c * d * (1n << BigInt(e2 - e)), e];
}

/** The reference phase -2 pi frac(t) in (-pi, pi], t = (u east + v north) pi / 648e6 turns. */
function referencePhase(u: number, east: number, v: number, north: number): number {
  const [m, e] = exactDot(u, east, v, north);
  // t * 2^200 = m * 2^e * PI_DIGITS / (PI_SCALE * 648e6) * 2^200
  const num = m * PI_DIGITS;
  const den = PI_SCALE * 648_000_000n;
  const shift = BigInt(e) + FRACTION_BITS;
  const scaled = shift >= 0n ? (num << shift) / den : num / (den << -shift);
  const one = 1n << FRACTION_BITS;
  let frac = scaled % one;
  if (frac < 0n) frac += one;
  const f = Number(frac >> (FRACTION_BITS - 60n)) / 2 ** 60; // in [0, 1)
  const p = -2 * Math.PI * f;
  return p <= -Math.PI ? p + 2 * Math.PI : p;
}

function phaseDifference(a: number, b: number): number {
  const d = (a - b) % (2 * Math.PI);
  return Math.abs(d > Math.PI ? d - 2 * Math.PI : d < -Math.PI ? d + 2 * Math.PI : d);
}

const arbShift = fc.double({ min: -1e4, max: 1e4, noNaN: true });
const arbFrequency = fc.double({ min: -1e9, max: 1e9, noNaN: true });

describe('the exact reference', () => {
  it('uses pi to 50 decimals whose leading digits are Math.PI', () => {
    expect(Number(PI_DIGITS / 10n ** 34n) / 1e16).toBe(Math.PI);
  });

  it('gives the textbook phase for a small shift, where binary64 suffices', () => {
    // 1 mas at u = 1e8: -2 pi 1e8 * 4.8481e-9 rad = -3.0462 rad (the README example)
    const t = 1e8 * (Math.PI / 648_000_000);
    expect(Math.abs(referencePhase(1e8, 1, 0, 0) - -2 * Math.PI * t)).toBeLessThan(1e-14);
  });
});

describe('shifts up to 1e4 mas at u, v up to 1e9 cycles per radian', () => {
  /** Models with positive real V at the points used, so that arg V is the ramp's phase. */
  const shapes: ReadonlyArray<readonly [string, Model]> = [
    ['a point', point()],
    ['a Gaussian (one radial factor)', gaussian({ fwhm: 1e-6 })],
    ['a limb-darkened disk (a component factor)', limbDarkenedDisk({ diameter: 1e-6, law: linearLaw(0.5) })],
    ['a convolution (two factors)', disk({ diameter: 1e-6 }).convolve(gaussian({ fwhm: 1e-6 }))],
  ];
  it.each(shapes)('%s keeps the phase within 1e-9 rad of the exact reduction', (_name, shape) => {
    fc.assert(
      fc.property(arbShift, arbShift, arbFrequency, arbFrequency, (east, north, u, v) => {
        const r = shape.shift(east, north).visibilities([u], [v]);
        const got = Math.atan2(r.im[0]!, r.re[0]!);
        expect(phaseDifference(got, referencePhase(u, east, v, north))).toBeLessThan(PHASE_TOL);
      }),
      { seed: 31, numRuns: 200 },
    );
  });

  it('a modulated ring (complex kernel) gains exactly the ramp of its shift', () => {
    const ring = modulatedRing({ diameter: 1e-3, c1: 0.5, pa1: 40 });
    fc.assert(
      fc.property(arbShift, arbShift, arbFrequency, arbFrequency, (east, north, u, v) => {
        const a = ring.visibilities([u], [v]);
        const b = ring.shift(east, north).visibilities([u], [v]);
        // arg(b conj(a)) is the ramp's phase
        const got = Math.atan2(
          b.im[0]! * a.re[0]! - b.re[0]! * a.im[0]!,
          b.re[0]! * a.re[0]! + b.im[0]! * a.im[0]!,
        );
        expect(phaseDifference(got, referencePhase(u, east, v, north))).toBeLessThan(PHASE_TOL);
      }),
      { seed: 32, numRuns: 200 },
    );
  });

  it('the extreme corner (1e4 mas, 1e9 cycles per radian, about 1e5 turns) is within the tolerance', () => {
    for (const [e, n, u, v] of [
      [1e4, 1e4, 1e9, 1e9],
      [-1e4, 9999.999, 1e9, -999_999_999.5],
      [1e4, 0, 1e9 - 1, 0],
    ] as const) {
      const r = point().shift(e, n).visibility(u, v);
      expect(phaseDifference(r.arg(), referencePhase(u, e, v, n))).toBeLessThan(PHASE_TOL);
      expect(Math.abs(r.abs() - 1)).toBeLessThan(1e-15);
    }
  });
});
