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
