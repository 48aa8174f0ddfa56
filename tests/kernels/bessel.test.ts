import { describe, expect, it } from 'vitest';
import * as kernels from '../../src/kernels/bessel.js';
import { cosSinCombination } from '../../src/kernels/trig.js';

describe('the public kernel module', () => {
  it('exports the kernel API under its documented names', () => {
    const names = [
      'besselJ0',
      'besselJ1',
      'besselJ2',
      'besselJnu',
      'diskAmplitude',
      'diskAmplitudeDerivative',
      'ringAmplitudeDerivative',
      'powerLawAmplitude',
      'powerLawAmplitudeDerivative',
      'gamma',
      'lnGamma',
    ];
    for (const n of names) expect(typeof (kernels as Record<string, unknown>)[n]).toBe('function');
    expect(kernels.MAX_BESSEL_ORDER).toBe(1000);
  });

  it('gives the results shown in the doc examples', () => {
    // Each value is the one printed in the @example of the function (src/kernels/*.ts).
    expect(kernels.besselJ0(1)).toBe(0.7651976865579666);
    expect(kernels.besselJ1(1)).toBe(0.4400505857449335);
    expect(kernels.besselJ2(1)).toBe(0.11490348493190049);
    expect(kernels.diskAmplitude(0)).toBe(1);
    expect(kernels.diskAmplitude(3.831705970207512)).toBe(5.885998893916977e-17);
    expect(kernels.diskAmplitudeDerivative(1)).toBe(-0.22980696986380098);
    expect(kernels.ringAmplitudeDerivative(1)).toBe(-0.4400505857449335);
    expect(kernels.besselJnu(1.5, 1)).toBe(0.24029783912342695);
    expect(kernels.powerLawAmplitude(1.5, 2)).toBe(0.6530966624699874);
    expect(kernels.powerLawAmplitudeDerivative(1, 1)).toBe(-0.22980696986380095);
    expect(kernels.gamma(5)).toBe(24);
    expect(kernels.gamma(0.5)).toBe(1.772453850905516);
    expect(kernels.lnGamma(10)).toBe(12.801827480081469);
    expect(cosSinCombination(Math.PI / 3, 2, 0)).toBe(1.0000000000000002);
  });
});
