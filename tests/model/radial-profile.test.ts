/**
 * Radial profiles by a numerical Hankel transform: a uniform-disk profile reproduces 2 J1(x)/x (from @stdlib,
 * Cephes-derived) and a sampled Gaussian reproduces the analytic Gaussian, to the accuracy stated in
 * radialProfile's docs.
 */
import { describe, expect, it } from 'vitest';
import { disk, gaussian, radialProfile } from '../../src/index.js';
import { expectClose } from '../helpers/components-fixture.js';
import { RAD_PER_MAS_REF, refDisk } from '../helpers/reference.js';

/** Stated accuracy of the table (cubic Hermite every 1 / (128 R)): 1.5e-8. */
const TABLE_TOL = 1.5e-8;

describe('radial profile', () => {
  it('a uniform-disk profile reproduces 2 J1(x)/x inside the table and beyond it', () => {
    const m = radialProfile({ radii: [0, 1.5, 1.5], intensity: [1, 1, 0] }); // diameter 3 mas
    let worst = 0;
    for (let k = 0; k <= 400; k++) {
      const q = k * 2.6e6; // up to 1.04e9 cycles / rad, inside the default 5 cycles / mas
      const expected = refDisk(Math.PI * 3 * RAD_PER_MAS_REF * q);
      const got = m.visibility(q * 0.8, q * 0.6).re;
      worst = Math.max(worst, Math.abs(got - expected));
    }
    expect(worst).toBeLessThan(TABLE_TOL);
    // beyond the table each point is integrated directly
    const q = 2e9;
    expectClose('beyond the table', m.visibility(q, 0).re, refDisk(Math.PI * 3 * RAD_PER_MAS_REF * q), 1e-12);
    expect(m.equals(disk({ diameter: 3 }))).toBe(false); // different kinds, though V agrees
  });

  it('a Gaussian given as a function reproduces the analytic Gaussian', () => {
    const w = 2;
    const sigma = w / (2 * Math.sqrt(2 * Math.LN2));
    const m = radialProfile({
      intensity: (r) => Math.exp(-(r * r) / (2 * sigma * sigma)),
      maxRadius: 8 * sigma,
    });
    const g = gaussian({ fwhm: w });
    for (const q of [0, 3e7, 1e8, 2e8]) {
      // sampled every 8 sigma / 2000: linear interpolation error h^2 |I''| / 8 relative, about 2e-6
      expectClose(`q=${q}`, m.visibility(q, 0).re, g.visibility(q, 0).re, 3e-6);
    }
  });

  it('stretches and shifts like any component', () => {
    const m = radialProfile({ radii: [0, 1, 1], intensity: [1, 1, 0] });
    const q = 7e7;
    expectClose(
      'stretched',
      m.stretch(2, 2).visibility(q, 0).re,
      refDisk(Math.PI * 4 * RAD_PER_MAS_REF * q),
      TABLE_TOL,
    );
    expect(m.shift(1, 0).visibility(q, 0).arg()).toBeLessThan(0);
  });

  it('rejects bad samples with the option named', () => {
    expect(() => radialProfile({ radii: [0, 2, 1], intensity: [1, 1, 0] })).toThrow(
      /radii must be non-decreasing/,
    );
    expect(() => radialProfile({ radii: [0, 1], intensity: [1] })).toThrow(/as many intensities as radii/);
    expect(() => radialProfile({ radii: [0, 1], intensity: [0, 0] })).toThrow(/zero flux/);
    expect(() => radialProfile({ radii: [0, 1], intensity: [1, -1] })).toThrow(/intensity\[1\] must be >= 0/);
    expect(() => radialProfile({ intensity: () => 1, maxRadius: 0 })).toThrow(/maxRadius must be/);
  });

  it('prints as an expression that rebuilds it', () => {
    const m = radialProfile({ radii: [0, 1, 1], intensity: [1, 0.5, 0] });
    expect(m.toString()).toBe('radialProfile({ radii: [0, 1, 1], intensity: [1, 0.5, 0], maxFrequency: 5 })');
  });
});
