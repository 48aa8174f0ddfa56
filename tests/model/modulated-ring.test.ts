/**
 * The azimuthally modulated thin ring: its Fourier form (derived in src/kernels/components.ts with the sign of
 * CONVENTIONS.md) against scipy.special.jv values (components.json) and against an independent numerical
 * transform: the ring rendered as 4096 point sources along its circumference, summed with exp(-2 pi i q.x).
 */
import { describe, expect, it } from 'vitest';
import { disk, modulatedRing, ring } from '../../src/index.js';
import { COMPONENTS, expectClose, qFor } from '../helpers/components-fixture.js';
import { RAD_PER_MAS_REF } from '../helpers/reference.js';

const FIXTURE_TOL = 1e-14;
/** The point-source rendering converges exponentially in the number of points; 4096 is far past 1e-13. */
const RENDER_TOL = 1e-12;

/** Numerical transform of a modulated ring seen through the image map x -> B x (B = 2x2 row-major). */
function renderedRing(
  d: number,
  c: [number, number, number, number],
  b: [number, number, number, number],
  u: number,
  v: number,
): { re: number; im: number } {
  const [c1, pa1, c2, pa2] = c;
  const N = 4096;
  let re = 0;
  let im = 0;
  let tot = 0;
  for (let k = 0; k < N; k++) {
    const t = (2 * Math.PI * k) / N; // position angle from north towards east
    const w = 1 + c1 * Math.cos(t - (pa1 * Math.PI) / 180) + c2 * Math.cos(2 * (t - (pa2 * Math.PI) / 180));
    const e0 = (d / 2) * Math.sin(t);
    const n0 = (d / 2) * Math.cos(t);
    const e = (b[0] * e0 + b[1] * n0) * RAD_PER_MAS_REF;
    const n = (b[2] * e0 + b[3] * n0) * RAD_PER_MAS_REF;
    const ph = -2 * Math.PI * (u * e + v * n);
    re += w * Math.cos(ph);
    im += w * Math.sin(ph);
    tot += w;
  }
  return { re: re / tot, im: im / tot };
}

describe('modulated ring', () => {
  it('matches J0 + sum (-i)^m c_m J_m cos(m (phi - pa_m)) from scipy', () => {
    const d = 3;
    for (const r of COMPONENTS.modulatedRing) {
      const m = modulatedRing({ diameter: d, c1: r.c1, pa1: r.pa1, c2: r.c2, pa2: r.pa2 });
      const q = qFor(r.x, d);
      const p = (r.phi * Math.PI) / 180;
      const z = m.visibility(q * Math.sin(p), q * Math.cos(p));
      expectClose(`re ${JSON.stringify(r)}`, z.re, r.re, FIXTURE_TOL);
      expectClose(`im ${JSON.stringify(r)}`, z.im, r.im, FIXTURE_TOL);
    }
  });

  it('matches the transform of the ring rendered as point sources, face-on and inclined', () => {
    const c: [number, number, number, number] = [0.4, 70, 0.3, -20];
    const face = modulatedRing({ diameter: 4, c1: c[0], pa1: c[1], c2: c[2], pa2: c[3] });
    // incline(i, pa) = stretch(cos i, 1) then rotate(pa) (CONVENTIONS.md)
    const inc = 55;
    const pa = 25;
    const ci = Math.cos((inc * Math.PI) / 180);
    const cp = Math.cos((pa * Math.PI) / 180);
    const sp = Math.sin((pa * Math.PI) / 180);
    const b: [number, number, number, number] = [cp * ci, sp, -sp * ci, cp];
    const inclined = face.incline(inc, pa);
    for (const [u, v] of [
      [3e7, 1e7],
      [-5e7, 8e7],
      [1.2e8, -4e7],
    ] as const) {
      const z = face.visibility(u, v);
      const ref = renderedRing(4, c, [1, 0, 0, 1], u, v);
      expectClose(`face re u=${u} v=${v}`, z.re, ref.re, RENDER_TOL);
      expectClose(`face im u=${u} v=${v}`, z.im, ref.im, RENDER_TOL);
      const zi = inclined.visibility(u, v);
      const refi = renderedRing(4, c, b, u, v);
      expectClose(`inclined re u=${u} v=${v}`, zi.re, refi.re, RENDER_TOL);
      expectClose(`inclined im u=${u} v=${v}`, zi.im, refi.im, RENDER_TOL);
    }
  });

  it('is the thin ring without modulation, and a c1 > 0 ring gives non-zero closure phases', () => {
    const q = [2e7, 7e7];
    const plain = modulatedRing({ diameter: 3 }).vis2(q, [0, 0]);
    const thin = ring({ diameter: 3 }).vis2(q, [0, 0]);
    for (let i = 0; i < q.length; i++) expectClose('no modulation', plain[i]!, thin[i]!, 1e-15);
    const m = modulatedRing({ diameter: 3, c1: 0.8, pa1: 45 });
    const cp = m.closurePhase([5e7], [1e7], [-2e7], [6e7]);
    expect(Math.abs(cp[0]!)).toBeGreaterThan(1);
    const sym = modulatedRing({ diameter: 3, c2: 0.8, pa2: 45 }).closurePhase([5e7], [1e7], [-2e7], [6e7]);
    expect(Math.min(Math.abs(sym[0]!), Math.abs(Math.abs(sym[0]!) - 180))).toBeLessThan(1e-9);
  });

  it('validates its amplitudes and prints as an expression', () => {
    expect(() => modulatedRing({ diameter: 3, c1: 0.7, c2: 0.5 })).toThrow(
      /modulatedRing\.c2: expected c1 \+ c2 <= 1/,
    );
    expect(() => modulatedRing({ diameter: 3, c1: -0.1 })).toThrow(
      /modulatedRing\.c1: expected a modulation amplitude in \[0, 1\]/,
    );
    const m = modulatedRing({ diameter: 3, c1: 0.2, pa1: 10 }).plus(disk({ diameter: 1 }));
    expect(m.toString()).toBe(
      'sum(modulatedRing({ diameter: 3, c1: 0.2, pa1: 10, c2: 0, pa2: 0 }), disk({ diameter: 1 }))',
    );
    // a rotation by 360 degrees changes nothing; by 90 it differs (non-radial equality compares A)
    const r = modulatedRing({ diameter: 3, c1: 0.2, pa1: 10 });
    expect(r.rotate(360).equals(r)).toBe(true);
    expect(r.rotate(90).equals(r)).toBe(false);
  });
});
