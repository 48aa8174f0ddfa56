/** Units and phase wrapping (CONVENTIONS.md: 1 mas = 4.84813681109536e-9 rad; phases wrap to (-180, 180]). */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  InputError,
  masToRad,
  RAD_PER_MAS,
  radToMas,
  spatialFrequency,
  wrapDegrees,
  wrapRadians,
} from '../../src/index.js';

describe('units', () => {
  it('one milliarcsecond is 4.84813681109536e-9 rad', () => {
    expect(RAD_PER_MAS).toBeCloseTo(4.84813681109536e-9, 22);
    expect(masToRad(1000 * 3600)).toBeCloseTo(Math.PI / 180, 15);
    expect(radToMas(masToRad(12.5))).toBeCloseTo(12.5, 12);
  });

  it('spatial frequency is baseline over wavelength and rejects a wavelength that is not positive', () => {
    expect(spatialFrequency(100, 2e-6)).toBe(5e7);
    expect(() => spatialFrequency(100, 0)).toThrow(InputError);
    expect(() => spatialFrequency(100, -1e-6)).toThrow(
      /wavelength must be a positive finite number of metres/,
    );
  });

  it('wraps phases into (-180, 180] with -180 mapped to +180', () => {
    expect(wrapDegrees(190)).toBe(-170);
    expect(wrapDegrees(-180)).toBe(180);
    expect(wrapDegrees(180)).toBe(180);
    expect(wrapDegrees(540)).toBe(180);
    expect(wrapDegrees(-190)).toBe(170);
    expect(wrapRadians(-Math.PI)).toBe(Math.PI);
  });

  it('a wrapped phase differs from the input by a whole number of turns and lies in (-180, 180]', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), (x) => {
        const w = wrapDegrees(x);
        const turns = (x - w) / 360;
        return w > -180 && w <= 180 && Math.abs(turns - Math.round(turns)) < 1e-9;
      }),
      { seed: 7, numRuns: 500 },
    );
  });
});
