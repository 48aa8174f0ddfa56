/**
 * Limb-darkened disks against scipy (tests/fixtures/components/components.json: the published closed forms of
 * Hanbury Brown et al. 1974 and Hestroffer 1997 with scipy.special.jv / gamma, and quad Hankel transforms of the
 * intensity profiles), against a direct Fourier transform of a rendered image, and facts of the trade.
 */
import { describe, expect, it } from 'vitest';
import {
  disk,
  limbDarkenedDisk,
  linearLaw,
  ModelError,
  param,
  powerLaw,
  quadraticLaw,
  uniformDiskEquivalent,
} from '../../src/index.js';
import { COMPONENTS, expectClose, qFor } from '../helpers/components-fixture.js';
import { dft, render } from '../helpers/reference.js';

/** Linear and quadratic kernels use closed forms of J1, J_{3/2}, J2: absolute error of a few 1e-16. */
const CLOSED_TOL = 2e-14;
/** The power law uses the real-order Bessel kernel (stated 1e-13 relative + 1e-14). */
const POWER_TOL = 1e-12;
/** Rendered 256 x 256 image with 4 x 4 sub-samples per pixel: the limb edge limits agreement. */
const RENDER_TOL = 2e-3;

const D = 2.5; // mas

describe('limb-darkened disks against scipy', () => {
  it('the linear law matches the closed form of CONVENTIONS.md for a in [0, 1]', () => {
    for (const r of COMPONENTS.linear) {
      const m = limbDarkenedDisk({ diameter: D, law: linearLaw(r.a) });
      const q = qFor(r.x, D);
      const z = m.visibility(q * 0.6, q * 0.8);
      expectClose(`linear a=${r.a} x=${r.x}`, z.re, r.v, CLOSED_TOL);
      expectClose(`linear a=${r.a} x=${r.x} imag`, z.im, 0, 1e-15);
    }
  });

  it('the quadratic law matches a quad Hankel transform of its profile', () => {
    for (const r of COMPONENTS.quadratic) {
      const m = limbDarkenedDisk({ diameter: D, law: quadraticLaw(r.a, r.b) });
      expectClose(`quadratic a=${r.a} b=${r.b} x=${r.x}`, m.visibility(qFor(r.x, D), 0).re, r.v, 1e-10);
    }
  });

  it('the power law matches Gamma(nu+1) (2/x)^nu J_nu(x) from scipy', () => {
    for (const r of COMPONENTS.power) {
      const m = limbDarkenedDisk({ diameter: D, law: powerLaw(r.alpha) });
      expectClose(`power alpha=${r.alpha} x=${r.x}`, m.visibility(0, qFor(r.x, D)).re, r.v, POWER_TOL);
    }
  });

  it('a linearly darkened disk matches a DFT of its rendered image', () => {
    const a = 0.6;
    const R = D / 2;
    const img = render(
      (e, n) => {
        const r2 = (e * e + n * n) / (R * R);
        return r2 >= 1 ? 0 : 1 - a * (1 - Math.sqrt(1 - r2));
      },
      96,
      (1.1 * D) / 96,
      4,
    );
    const m = limbDarkenedDisk({ diameter: D, law: linearLaw(a) });
    for (const x of [0.5, 2, 3.5, 5]) {
      const q = qFor(x, D);
      expectClose(`render x=${x}`, m.visibility(q, 0).re, dft(img, q, 0).re, RENDER_TOL);
    }
  });
});

describe('limb darkening: limits and facts of the trade', () => {
  const qs = Array.from({ length: 60 }, (_, k) => (k + 1) * 4e6);
  const zeros = qs.map(() => 0);

  it('the linear law at a = 0 and the power law at alpha = 0 are the uniform disk', () => {
    const ud = disk({ diameter: D }).vis2(qs, zeros);
    const lin = limbDarkenedDisk({ diameter: D, law: linearLaw(0) }).vis2(qs, zeros);
    const pow = limbDarkenedDisk({ diameter: D, law: powerLaw(0) }).vis2(qs, zeros);
    const quad = limbDarkenedDisk({ diameter: D, law: quadraticLaw(0, 0) }).vis2(qs, zeros);
    for (let i = 0; i < qs.length; i++) {
      expectClose('linear a=0', lin[i]!, ud[i]!, 1e-15);
      expectClose('power alpha=0', pow[i]!, ud[i]!, 1e-13);
      expectClose('quadratic 0,0', quad[i]!, ud[i]!, 1e-15);
    }
  });

  it('the first null moves outward as limb darkening grows (common practice)', () => {
    const firstNull = (m: ReturnType<typeof disk>) => {
      let prev = m.visibility(0, 0).re;
      for (let q = 1e6; q < 3e9; q += 1e6) {
        const v = m.visibility(q, 0).re;
        if (v <= 0 && prev > 0) {
          let lo = q - 1e6;
          let hi = q;
          for (let k = 0; k < 60; k++) {
            const mid = 0.5 * (lo + hi);
            if (m.visibility(mid, 0).re > 0) lo = mid;
            else hi = mid;
          }
          return lo;
        }
        prev = v;
      }
      return Number.NaN;
    };
    const nulls = [0, 0.3, 0.6, 1].map((a) =>
      firstNull(limbDarkenedDisk({ diameter: D, law: linearLaw(a) })),
    );
    for (let k = 1; k < nulls.length; k++) expect(nulls[k]!).toBeGreaterThan(nulls[k - 1]!);
    const pnulls = [0, 0.5, 2].map((al) => firstNull(limbDarkenedDisk({ diameter: D, law: powerLaw(al) })));
    for (let k = 1; k < pnulls.length; k++) expect(pnulls[k]!).toBeGreaterThan(pnulls[k - 1]!);
    // the uniform disk's null at q theta = 1.21967 (CONVENTIONS.md facts)
    expect(nulls[0]! * D * (Math.PI / 648_000_000)).toBeCloseTo(1.21967, 5);
  });

  it('the uniform-disk equivalent gives the same V^2 = 0.5 point and shrinks as darkening grows', () => {
    expect(uniformDiskEquivalent(D, linearLaw(0))).toBeCloseTo(D, 12);
    const eq = [0.2, 0.5, 0.8].map((a) => uniformDiskEquivalent(D, linearLaw(a)));
    for (let k = 1; k < eq.length; k++) expect(eq[k]!).toBeLessThan(eq[k - 1]!);
    const law = quadraticLaw(0.4, 0.2);
    const ld = limbDarkenedDisk({ diameter: D, law });
    const ud = disk({ diameter: uniformDiskEquivalent(D, law) });
    // find the q where the LD disk has V^2 = 0.5 by bisection, then compare the UD there
    let lo = 0;
    let hi = qFor(3, D);
    for (let k = 0; k < 100; k++) {
      const mid = 0.5 * (lo + hi);
      if (ld.vis2([mid], [0])[0]! > 0.5) lo = mid;
      else hi = mid;
    }
    expectClose('UD V^2 at the LD half-power point', ud.vis2([lo], [0])[0]!, 0.5, 1e-12);
    expect(uniformDiskEquivalent(D, powerLaw(0.5))).toBeLessThan(D);
  });
});

describe('limb-darkened disks as models', () => {
  it('validate their coefficients at construction with the model path', () => {
    expect(() => limbDarkenedDisk({ diameter: 2, law: linearLaw(1.2) })).toThrow(
      /linearLimbDarkenedDisk\.a: expected a <= 1/,
    );
    expect(() => limbDarkenedDisk({ diameter: 2, law: quadraticLaw(0.8, 0.5) })).toThrow(
      /quadraticLimbDarkenedDisk\.b: expected coefficients .*a \+ b <= 1/,
    );
    expect(() => limbDarkenedDisk({ diameter: 2, law: powerLaw(-0.5) })).toThrow(/alpha >= 0/);
    expect(() => limbDarkenedDisk({ diameter: -1, law: powerLaw(0.5) })).toThrow(ModelError);
    expect(() => limbDarkenedDisk({ diameter: 1, law: { kind: 'nope' } as never })).toThrow(
      /law must be linearLaw\(a\), quadraticLaw\(a, b\) or powerLaw\(alpha\)/,
    );
  });

  it('print as expressions that rebuild them and take params in their coefficients', () => {
    const m = limbDarkenedDisk({
      diameter: param('d', 2, { min: 0 }),
      law: quadraticLaw(param('a', 0.3), 0.1),
    });
    expect(m.toString()).toBe(
      "limbDarkenedDisk({ diameter: param('d', 2, { min: 0 }), law: quadraticLaw(param('a', 0.3), 0.1) })",
    );
    expect(m.parameters()).toEqual(['d', 'a']);
    const moved = m.at([2.2, 0.5]);
    expect(moved.equals(limbDarkenedDisk({ diameter: 2.2, law: quadraticLaw(0.5, 0.1) }))).toBe(true);
    expect(moved.equals(limbDarkenedDisk({ diameter: 2.2, law: quadraticLaw(0.4, 0.1) }))).toBe(false);
  });

  it('work with the operators: an inclined, shifted darkened disk equals the same chain on its kernel', () => {
    const m = limbDarkenedDisk({ diameter: 3, law: linearLaw(0.5) });
    const chain = m
      .incline(50, 30)
      .shift(1, -2)
      .weight(2)
      .plus(disk({ diameter: 1 }));
    const q = 6e7;
    // along the major axis (pa 30) the inclined disk is the face-on one
    const s = Math.sin((30 * Math.PI) / 180);
    const c = Math.cos((30 * Math.PI) / 180);
    const along = m.incline(50, 30).visibility(q * s, q * c).re;
    expect(along).toBeCloseTo(m.visibility(q, 0).re, 13);
    expect(chain.flux).toBeCloseTo(3, 14);
  });
});
