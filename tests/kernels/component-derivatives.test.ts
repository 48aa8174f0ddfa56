/**
 * The derivative kernels of the extended components (src/kernels/component-derivatives.ts,
 * src/kernels/bessel-jnu-order.ts, RadialTable.derivatives): their values are the value path's, and their
 * slopes match Richardson-extrapolated central differences of the value kernels. L_{5/2} and L_3 are checked
 * against powerLawAmplitude at orders 5/2 and 3 (itself checked against mpmath in bessel-jnu.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { besselJ1, powerLawAmplitude } from '../../src/kernels/bessel.js';
import { powerLawOrderDerivative } from '../../src/kernels/bessel-jnu-order.js';
import {
  annulusDerivatives,
  l3,
  l52,
  modulatedRingDerivatives,
  pixelImageDerivatives,
} from '../../src/kernels/component-derivatives.js';
import { annulusAmplitude, modulatedRingAt } from '../../src/kernels/components.js';
import { PixelGrid, RadialTable } from '../../src/kernels/tabulated.js';

/** (4 D(h/2) - D(h)) / 3 with D the central difference: truncation O(h^4). */
function richardson(f: (x: number) => number, x: number, h: number): number {
  const d = (s: number) => (f(x + s) - f(x - s)) / (2 * s);
  return (4 * d(h / 2) - d(h)) / 3;
}

const out = new Float64Array(16);

describe('power-law amplitude: derivative in the order', () => {
  it('matches differences in nu of powerLawAmplitude in the series and recurrence regimes, x up to 200', () => {
    const TOL = 1e-9; // absolute; the differences' rounding is about 1e-13 / h = 1e-10
    for (const nu of [0.2, 1, 1.3, 2.7, 6, 15]) {
      for (let x = 0.05; x < 200; x *= 1.45) {
        const ref = richardson((n) => powerLawAmplitude(n, x), nu, 2e-3);
        const got = powerLawOrderDerivative(nu, x);
        if (!(Math.abs(got - ref) <= TOL)) {
          throw new Error(`nu ${nu} x ${x}: got ${got}, expected ${ref}, diff ${got - ref}, tol ${TOL}`);
        }
      }
    }
  });
  it('is 0 at x = 0, even in x, and refuses orders outside [0, 1000)', () => {
    expect(powerLawOrderDerivative(1.5, 0)).toBe(0);
    expect(powerLawOrderDerivative(1.5, -3)).toBe(powerLawOrderDerivative(1.5, 3));
    expect(() => powerLawOrderDerivative(-0.5, 1)).toThrow(/order nu = -0.5 must be in \[0, 1000\)/);
    expect(Number.isNaN(powerLawOrderDerivative(1, Number.NaN))).toBe(true);
  });
  it('has the value of its doc example, from the series of A&S 9.1.10 summed here', () => {
    // d/dnu sum_k (-1/4)^k / (k! (nu+1)_k) at nu = 1 = -sum_k t_k H_k, H_k = sum_{j<=k} 1/(1+j)
    let t = 1;
    let h = 0;
    let ref = 0;
    for (let k = 1; k < 30; k++) {
      t *= -0.25 / (k * (1 + k));
      h += 1 / (1 + k);
      ref -= t * h;
    }
    expect(Math.abs(powerLawOrderDerivative(1, 1) - ref)).toBeLessThan(1e-16);
    expect(powerLawOrderDerivative(1, 1)).toBeCloseTo(0.05827554706222183, 15);
  });
});

describe('normalised Bessel helpers of the limb-darkening slopes', () => {
  it('L_{5/2} and L_3 agree with powerLawAmplitude at orders 5/2 and 3 on both sides of x = 2', () => {
    for (let x = 0; x < 60; x += 0.173) {
      expect(Math.abs(l52(x) - powerLawAmplitude(2.5, x))).toBeLessThan(1e-13);
      expect(Math.abs(l3(x) - powerLawAmplitude(3, x))).toBeLessThan(1e-13);
    }
    for (const x of [1.9999999, 2, 2.0000001]) {
      expect(Math.abs(l52(x) - powerLawAmplitude(2.5, x))).toBeLessThan(1e-14);
      expect(Math.abs(l3(x) - powerLawAmplitude(3, x))).toBeLessThan(1e-14);
    }
  });
});

describe('annulus slopes', () => {
  const rho2Slope = (rho2: number, r: number) => {
    annulusDerivatives(rho2, Float64Array.of(r), out);
    return out[1]!;
  };
  const ratioSlope = (rho2: number, r: number) => {
    annulusDerivatives(rho2, Float64Array.of(r), out);
    return out[2]!;
  };
  it('match differences of annulusAmplitude in rho^2 and in the ratio, in both regimes of the kernel', () => {
    for (const r of [0, 0.3, 0.9, 0.97, 0.976, 0.99, 0.999]) {
      for (const rho of [0, 0.1, 0.5, 1.3, 4, 11]) {
        const rho2 = rho * rho;
        annulusDerivatives(rho2, Float64Array.of(r), out);
        expect(out[0]).toBe(annulusAmplitude(Math.PI * rho, r));
        const hr = Math.min(1e-4, (1 - r) / 4);
        const ref = richardson((s) => annulusAmplitude(Math.PI * rho, s), r, hr);
        if (r > 0)
          expect(Math.abs(ratioSlope(rho2, r) - ref)).toBeLessThan(1e-8 * Math.max(1, Math.abs(ref)));
        if (rho > 0) {
          const ref2 = richardson((q) => annulusAmplitude(Math.PI * Math.sqrt(q), r), rho2, 1e-3 * rho2);
          expect(Math.abs(rho2Slope(rho2, r) - ref2)).toBeLessThan(1e-8 * Math.max(1, Math.abs(ref2)));
        }
      }
    }
  });
  it('tend to the thin ring at ratio 1: -(pi^2/4) 2 J1(x)/x and -x J1(x)/2 (A&S 9.1.28)', () => {
    for (const rho of [0.2, 1, 3]) {
      const x = Math.PI * rho;
      annulusDerivatives(rho * rho, Float64Array.of(1), out);
      expect(out[1]).toBeCloseTo((-(Math.PI * Math.PI) / 4) * ((2 * besselJ1(x)) / x), 14);
      expect(out[2]).toBeCloseTo(-0.5 * x * besselJ1(x), 14);
      annulusDerivatives(rho * rho, Float64Array.of(1 - 1e-7), out);
      expect(out[2]).toBeCloseTo(-0.5 * x * besselJ1(x), 5);
    }
  });
});

describe('complex kernels', () => {
  const p = Float64Array.of(0.2, -0.1, 0.15, 0.05);
  it('the modulated ring has the value of modulatedRingAt and slopes that match its differences', () => {
    const ref = new Float64Array(2);
    for (const [w1, w2] of [
      [0, 0],
      [0.3, -0.2],
      [1.1, 0.7],
      [-2.5, 3.1],
    ] as const) {
      modulatedRingDerivatives(w1, w2, p, out);
      modulatedRingAt(w1, w2, p, ref);
      expect(Math.abs(out[0]! - ref[0]!)).toBeLessThan(1e-15);
      expect(Math.abs(out[1]! - ref[1]!)).toBeLessThan(1e-15);
      for (const part of [0, 1]) {
        const at = (a: number, b: number) => {
          modulatedRingAt(a, b, p, ref);
          return ref[part]!;
        };
        modulatedRingDerivatives(w1, w2, p, out);
        const d1 = out[2 + part]!;
        const d2 = out[4 + part]!;
        expect(Math.abs(d1 - richardson((a) => at(a, w2), w1, 1e-3))).toBeLessThan(1e-9);
        expect(Math.abs(d2 - richardson((b) => at(w1, b), w2, 1e-3))).toBeLessThan(1e-9);
      }
    }
  });
  it('the pixel image has the value of PixelGrid.at and gradients that match its differences', () => {
    const nx = 40;
    const ny = 35; // more than 32 columns and rows: the phase recurrences are re-seeded
    const pixels = Array.from({ length: nx * ny }, (_, i) => 1 + Math.sin(i * 0.37) ** 2);
    const total = pixels.reduce((a, b) => a + b, 0);
    const g = new PixelGrid(nx, ny, pixels, total);
    const ref = new Float64Array(2);
    for (const [w1, w2] of [
      [0, 0],
      [0.013, -0.021],
      [0.21, 0.17],
    ] as const) {
      pixelImageDerivatives(w1, w2, new Float64Array(0), out, g);
      g.at(w1, w2, ref);
      expect(Math.abs(out[0]! - ref[0]!)).toBeLessThan(1e-14);
      expect(Math.abs(out[1]! - ref[1]!)).toBeLessThan(1e-14);
      const grad = out.slice(2, 6);
      for (const part of [0, 1]) {
        const at = (a: number, b: number) => {
          g.at(a, b, ref);
          return ref[part]!;
        };
        expect(Math.abs(grad[part]! - richardson((a) => at(a, w2), w1, 1e-4))).toBeLessThan(1e-8);
        expect(Math.abs(grad[2 + part]! - richardson((b) => at(w1, b), w2, 1e-4))).toBeLessThan(1e-8);
      }
    }
  });
});

describe('radial table: derivatives of the interpolant', () => {
  // a Gaussian-like profile on [0, 3]; table up to rho = 2 cycles per unit, direct quadrature beyond
  const radii = Array.from({ length: 61 }, (_, k) => k * 0.05);
  const intensity = radii.map((r) => Math.exp(-r * r));
  const t = new RadialTable(radii, intensity, 2);
  it('reads the value of at() and a slope in rho^2 that matches differences of at() in and beyond the table', () => {
    for (const rho of [1e-4, 0.001, 0.0013, 0.37, 1.234, 1.99, 2.5, 3.7]) {
      t.derivatives(rho, out);
      expect(out[0]).toBe(t.at(rho));
      // in the first cell V moves by only ~10 rho^2, so a narrow step would leave rounding in the reference
      const rel = rho < t.step ? 0.2 : 1e-3;
      const ref = richardson((q) => t.at(Math.sqrt(q)), rho * rho, rel * rho * rho);
      expect(Math.abs(out[1]! - ref)).toBeLessThan(1e-7 * Math.max(1, Math.abs(ref)));
    }
  });
  it('has a finite slope at rho = 0, the limit of the first cell', () => {
    t.derivatives(0, out);
    const near = new Float64Array(2);
    t.derivatives(1e-9, near);
    expect(out[0]).toBe(t.at(0));
    expect(Number.isFinite(out[1]!)).toBe(true);
    expect(Math.abs(out[1]! - near[1]!)).toBeLessThan(1e-6 * Math.abs(out[1]!));
  });
});
