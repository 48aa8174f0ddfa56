/** The output contract of the evaluation functions: fresh outputs, reused outputs, aliasing, unchanged inputs. */
import { describe, expect, it } from 'vitest';
import { disk, gaussian, point, sum } from '../../src/index.js';

const m = sum(
  disk({ diameter: 2 }).shift(3, -1),
  gaussian({ fwhm: 4 }).weight(0.5),
  point().weight(0.2).shift(-6, 2),
);
const u = Float64Array.from({ length: 50 }, (_, i) => (i - 25) * 4e6);
const v = Float64Array.from({ length: 50 }, (_, i) => (i % 7) * 3e6);

describe('output contract', () => {
  it('returns fresh arrays of the input length and leaves the inputs unchanged', () => {
    const u0 = u.slice();
    const v0 = v.slice();
    const a = m.visibilities(u, v);
    expect(a.re).toHaveLength(50);
    expect(a.re).not.toBe(u);
    expect(u).toEqual(u0);
    expect(v).toEqual(v0);
    m.vis2(u, v);
    m.closurePhase(u, v, v, u);
    m.bispectrum(u, v, v, u);
    m.t3amp(u, v, v, u);
    expect(u).toEqual(u0);
    expect(v).toEqual(v0);
  });

  it('fills and returns a given out, with the same values as a fresh evaluation', () => {
    const out = { re: new Float64Array(50), im: new Float64Array(50) };
    const r = m.visibilities(u, v, out);
    expect(r).toBe(out);
    expect(out.re).toEqual(m.visibilities(u, v).re);
    const o2 = new Float64Array(50);
    expect(m.vis2(u, v, o2)).toBe(o2);
    expect(o2).toEqual(m.vis2(u, v));
  });

  it('accepts an out that aliases the inputs', () => {
    const expected = m.visibilities(u, v);
    const uu = u.slice();
    const vv = v.slice();
    const r = m.visibilities(uu, vv, { re: uu, im: vv });
    expect(r.re).toEqual(expected.re);
    expect(r.im).toEqual(expected.im);
  });

  it('gives the same bispectrum over several chunks of triangles, also into outputs that alias the inputs', () => {
    // 2500 triangles: more than one chunk of Model.bispectrum (1024), and a short last one
    const n = 2500;
    const a = Float64Array.from({ length: n }, (_, i) => Math.sin(i * 0.7) * 3e7);
    const b = Float64Array.from({ length: n }, (_, i) => Math.cos(i * 0.3) * 3e7);
    const c = Float64Array.from({ length: n }, (_, i) => Math.sin(i * 1.1 + 1) * 3e7);
    const d = Float64Array.from({ length: n }, (_, i) => Math.cos(i * 0.9 + 2) * 3e7);
    const t = m.bispectrum(a, b, c, d);
    for (const i of [0, 1023, 1024, 2047, 2048, 2499]) {
      // the product of the three visibilities, each from the scalar form
      const v1 = m.visibility(a[i]!, b[i]!);
      const v2 = m.visibility(c[i]!, d[i]!);
      const v3 = m.visibility(-(a[i]! + c[i]!), -(b[i]! + d[i]!));
      const want = v1.mul(v2).mul(v3);
      expect(Math.abs(t.re[i]! - want.re)).toBeLessThan(1e-15);
      expect(Math.abs(t.im[i]! - want.im)).toBeLessThan(1e-15);
    }
    const a2 = a.slice();
    const c2 = c.slice();
    const r = m.bispectrum(a2, b, c2, d, { re: a2, im: c2 });
    expect(Array.from(r.re)).toEqual(Array.from(t.re));
    expect(Array.from(r.im)).toEqual(Array.from(t.im));
  });

  it('accepts plain arrays and gives the same result as typed arrays', () => {
    expect(m.vis2(Array.from(u), Array.from(v))).toEqual(m.vis2(u, v));
  });

  it('rejects an out of the wrong length', () => {
    expect(() => m.vis2(u, v, new Float64Array(3))).toThrow(
      /out must be a Float64Array of length 50, got length 3/,
    );
  });

  it('the scalar form agrees with the batch form', () => {
    const b = m.visibilities(u, v);
    for (let i = 0; i < 50; i += 7) {
      const z = m.visibility(u[i]!, v[i]!);
      expect(z.re).toBe(b.re[i]);
      expect(z.im).toBe(b.im[i]);
    }
  });

  it('closure phase, T3 amplitude and bispectrum agree with the product of three visibilities', () => {
    const u2 = v;
    const v2 = u;
    const t = m.bispectrum(u, v, u2, v2);
    const cp = m.closurePhase(u, v, u2, v2);
    const amp = m.t3amp(u, v, u2, v2);
    for (let i = 0; i < 50; i += 5) {
      const z = m
        .visibility(u[i]!, v[i]!)
        .mul(m.visibility(u2[i]!, v2[i]!))
        .mul(m.visibility(-(u[i]! + u2[i]!), -(v[i]! + v2[i]!)));
      expect(t.re[i]).toBeCloseTo(z.re, 14);
      expect(t.im[i]).toBeCloseTo(z.im, 14);
      expect(amp[i]).toBeCloseTo(z.abs(), 14);
      expect(cp[i]).toBeCloseTo((z.arg() * 180) / Math.PI === -180 ? 180 : (z.arg() * 180) / Math.PI, 10);
    }
  });
});
