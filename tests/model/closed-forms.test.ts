/**
 * Every foundation primitive against its published closed form (CONVENTIONS.md table; Berger & Segransan 2007,
 * New Astron. Rev. 51:576), with J0 and J1 from the Cephes-derived @stdlib implementations.
 */
import { describe, expect, it } from 'vitest';
import { disk, ellipse, gaussian, point, RAD_PER_MAS, ring } from '../../src/index.js';
import { refDisk, refJ0 } from '../helpers/reference.js';

/** Absolute tolerance of a normalised visibility against a closed form evaluated with @stdlib. */
const VIS_TOL = 1e-13;

const Q = Array.from({ length: 400 }, (_, k) => (k + 0.5) * 1.5e6); // up to 6e8 cycles / rad

function check(name: string, model: ReturnType<typeof disk>, f: (q: number) => number) {
  const u = Q.map((q) => q * Math.cos(0.7));
  const v = Q.map((q) => q * Math.sin(0.7));
  const r = model.visibilities(u, v);
  for (let k = 0; k < Q.length; k++) {
    const expected = f(Q[k]!);
    const diff = Math.abs(r.re[k]! - expected);
    if (diff > VIS_TOL || Math.abs(r.im[k]!) > VIS_TOL) {
      throw new Error(
        `${name}: q=${Q[k]} got ${r.re[k]} + ${r.im[k]}i expected ${expected} diff ${diff} tol ${VIS_TOL}`,
      );
    }
  }
}

describe('closed forms of the primitives', () => {
  it('a point has V = 1 at every q', () => {
    check('point', point(), () => 1);
  });

  it('a uniform disk has V = 2 J1(x)/x with x = pi theta q', () => {
    const theta = 3.7;
    check('disk', disk({ diameter: theta }), (q) => refDisk(Math.PI * theta * RAD_PER_MAS * q));
  });

  it('a Gaussian has V = exp(-(pi theta q)^2 / (4 ln 2)) with theta the FWHM', () => {
    const w = 2.2;
    check('gaussian', gaussian({ fwhm: w }), (q) =>
      Math.exp(-((Math.PI * w * RAD_PER_MAS * q) ** 2) / (4 * Math.LN2)),
    );
  });

  it('a thin ring has V = J0(x) with x = pi theta q', () => {
    const theta = 5.1;
    check('ring', ring({ diameter: theta }), (q) => refJ0(Math.PI * theta * RAD_PER_MAS * q));
  });

  it('a circular ellipse (major = minor) is a uniform disk at any pa', () => {
    const theta = 2.5;
    check('ellipse', ellipse({ major: theta, minor: theta, pa: 33 }), (q) =>
      refDisk(Math.PI * theta * RAD_PER_MAS * q),
    );
  });

  it('an ellipse along its minor axis is a disk of the minor diameter, along its major axis one of the major', () => {
    const m = ellipse({ major: 6, minor: 2, pa: 90 }); // major axis along east
    const q = 4e7;
    const alongMajor = m.visibility(q, 0).re;
    const alongMinor = m.visibility(0, q).re;
    expect(alongMajor).toBeCloseTo(refDisk(Math.PI * 6 * RAD_PER_MAS * q), 13);
    expect(alongMinor).toBeCloseTo(refDisk(Math.PI * 2 * RAD_PER_MAS * q), 13);
  });
});
