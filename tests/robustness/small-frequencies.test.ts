/**
 * q = 0 exactly and x = pi * size * q below 1e-8 for every component kind (the series forms near zero), and
 * the second-order behaviour V = 1 - pi^2 q^2 <rho^2> + O(q^4) of a centred image (the Taylor expansion of
 * F(q) = integral of I exp(-2 pi i q.x), whose first-order term vanishes for a centro-symmetric image; <rho^2>
 * is the image's mean squared radius). The second moments are integrals of the intensity laws of
 * CONVENTIONS.md worked out by hand in the comments.
 */
import { describe, expect, it } from 'vitest';
import {
  annulus,
  background,
  disk,
  ellipse,
  exponential,
  gaussian,
  gaussianRing,
  limbDarkenedDisk,
  linearLaw,
  lorentzian,
  type Model,
  modulatedRing,
  pixelImage,
  point,
  powerLaw,
  quadraticLaw,
  radialProfile,
  ring,
} from '../../src/index.js';

const RAD_PER_MAS = Math.PI / 648_000_000;
/** |V - 1| allowed at q = 0: rounding of the normalisation and of tabulated or summed kinds. */
const ZERO_Q_TOL = 4 * Number.EPSILON;
/** |V - 1| allowed where x < 1e-8: (x^2 / 4) plus rounding. */
const SMALL_X_TOL = 1e-15;
/** Relative agreement of 1 - V with pi^2 q^2 <rho^2> at x = 1e-3 (the q^4 term is about x^2 = 1e-6 of it). */
const SERIES_TOL = 1e-5;

const A = 0.4; // linear limb-darkening coefficient
const QA = 0.3; // quadratic law coefficients
const QB = 0.2;
const ALPHA = 0.7; // power law exponent

/** Mean squared radius (mas^2) of a limb-darkened disk of radius R with I(mu) = sum c_k mu^k. */
function ldMoment(radius: number, c: readonly number[]): number {
  // With rho^2 = R^2 (1 - mu^2) and rho d rho = -R^2 mu d mu: int mu^k rho d rho = R^2 / (k + 2) and
  // int mu^k rho^2 rho d rho = R^4 (1/(k + 2) - 1/(k + 4)).
  let num = 0;
  let den = 0;
  c.forEach((ck, k) => {
    num += ck * (1 / (k + 2) - 1 / (k + 4));
    den += ck / (k + 2);
  });
  return (radius * radius * num) / den;
}

/** Each kind with its size (mas, the scale of x) and, for centred symmetric ones, <rho^2> in mas^2. */
const KINDS: ReadonlyArray<{ name: string; m: Model; size: number; moment?: number; firstOrder?: number }> = [
  { name: 'point', m: point(), size: 1, moment: 0 },
  { name: 'disk', m: disk({ diameter: 2 }), size: 2, moment: 0.5 }, // R^2 / 2
  { name: 'gaussian', m: gaussian({ fwhm: 2 }), size: 2, moment: 4 / (4 * Math.LN2) }, // 2 sigma^2 = fwhm^2 / (4 ln 2)
  { name: 'ring', m: ring({ diameter: 2 }), size: 2, moment: 1 }, // R^2
  { name: 'ellipse', m: ellipse({ major: 3, minor: 1, pa: 30 }), size: 3 },
  {
    name: 'linear limb-darkened disk',
    m: limbDarkenedDisk({ diameter: 2, law: linearLaw(A) }),
    size: 2,
    moment: ldMoment(1, [1 - A, A]),
  },
  {
    name: 'quadratic limb-darkened disk',
    m: limbDarkenedDisk({ diameter: 2, law: quadraticLaw(QA, QB) }),
    size: 2,
    // I = (1 - a - b) + (a + 2b) mu - b mu^2
    moment: ldMoment(1, [1 - QA - QB, QA + 2 * QB, -QB]),
  },
  {
    name: 'power-law limb-darkened disk',
    m: limbDarkenedDisk({ diameter: 2, law: powerLaw(ALPHA) }),
    size: 2,
    moment: 2 / (ALPHA + 4), // R^2 * 2 / (alpha + 4)
  },
  { name: 'annulus', m: annulus({ inner: 1, outer: 2 }), size: 2, moment: (1 + 0.25) / 2 }, // (Ro^2 + Ri^2) / 2
  { name: 'thin annulus', m: annulus({ inner: 1.99, outer: 2 }), size: 2, moment: (1 + 0.995 ** 2) / 2 },
  {
    name: 'Gaussian ring',
    m: gaussianRing({ diameter: 2, fwhm: 0.5 }),
    size: 2,
    moment: 1 + 0.25 / (4 * Math.LN2), // moments of a convolution add
  },
  // not centro-symmetric: the m = 1 mode gives Im V = -(c1 / 2) x cos(phi - pa1) to first order
  {
    name: 'modulated ring',
    m: modulatedRing({ diameter: 2, c1: 0.3, pa1: 20, c2: 0.2, pa2: 50 }),
    size: 2,
    firstOrder: 0.3 / 2,
  },
  // I ~ exp(-r/h): <rho^2> = int r^3 e^(-r/h) / int r e^(-r/h) = 6 h^2, h = fwhm / (2 ln 2)
  { name: 'exponential', m: exponential({ fwhm: 2 }), size: 2, moment: 6 * (1 / Math.LN2) ** 2 },
  { name: 'Lorentzian', m: lorentzian({ fwhm: 2 }), size: 2 }, // infinite second moment: V = exp(-2 pi a q)
  { name: 'radial profile', m: radialProfile({ radii: [0, 1, 1], intensity: [1, 1, 0] }), size: 2 },
  // point sources at (+-0.5, 0), (0, +-0.5) of weight 1 and the centre of weight 2: <e^2> = 2 * 0.25 / 6
  {
    name: 'pixel image',
    m: pixelImage({ nx: 3, pixels: [0, 1, 0, 1, 2, 1, 0, 1, 0], scale: 0.5 }),
    size: 1.5,
  },
];

describe('q = 0 exactly', () => {
  it.each(KINDS.map((k) => [k.name, k.m] as const))('%s has V = 1 to rounding', (_name, m) => {
    const r = m.visibilities([0], [0]);
    expect(Math.abs(r.re[0]! - 1)).toBeLessThanOrEqual(ZERO_Q_TOL);
    expect(r.im[0]).toBe(0);
  });

  it('the background has V = 1 at q = 0 and 0 at every q > 0, so it only adds flux', () => {
    const m = point().plus(background());
    const r = m.visibilities([0, 1e-3, 1e6], [0, 0, 0]);
    expect(Array.from(r.re)).toEqual([1, 0.5, 0.5]);
  });
});

describe('x below 1e-8 (the series forms)', () => {
  it.each(KINDS.filter((k) => k.name !== 'Lorentzian').map((k) => [k.name, k] as const))(
    '%s stays within rounding (and its first-order term) of 1 and finite for x from 1e-300 to 1e-8',
    (_name, k) => {
      const xs = [1e-300, 1e-100, 1e-20, 1e-12, 1e-8];
      const q = xs.map((x) => x / (Math.PI * k.size * RAD_PER_MAS));
      for (const angle of [0, 0.7]) {
        const r = k.m.visibilities(
          q.map((x) => x * Math.sin(angle)),
          q.map((x) => x * Math.cos(angle)),
        );
        for (let i = 0; i < q.length; i++) {
          expect(Number.isFinite(r.re[i]!) && Number.isFinite(r.im[i]!)).toBe(true);
          expect(Math.hypot(r.re[i]! - 1, r.im[i]!)).toBeLessThanOrEqual(
            SMALL_X_TOL + (k.firstOrder ?? 0) * xs[i]!,
          );
        }
      }
    },
  );

  it('the Lorentzian falls linearly, V = exp(-2 pi a q), with nothing lost at x = 1e-12', () => {
    const a = 2 / (2 * Math.sqrt(2 ** (2 / 3) - 1)); // mas, for fwhm 2
    const q = 1e-12 / (Math.PI * 2 * RAD_PER_MAS);
    const v = lorentzian({ fwhm: 2 }).visibility(q, 0).re;
    const want = -2 * Math.PI * a * RAD_PER_MAS * q; // V - 1 to first order
    expect(Math.abs(v - 1 - want)).toBeLessThanOrEqual(SMALL_X_TOL * 1e-3 + Math.abs(want) * 1e-3);
  });
});

describe('second order near zero', () => {
  it.each(KINDS.filter((k) => k.moment !== undefined && k.moment > 0).map((k) => [k.name, k] as const))(
    '%s has 1 - V = pi^2 q^2 <rho^2> at x = 1e-3',
    (_name, k) => {
      const q = 1e-3 / (Math.PI * k.size * RAD_PER_MAS);
      const v = k.m.visibility(q * 0.6, q * 0.8).re;
      const want = Math.PI ** 2 * (q * RAD_PER_MAS) ** 2 * k.moment!;
      expect(Math.abs((1 - v) / want - 1)).toBeLessThan(SERIES_TOL);
    },
  );

  it('the pixel image and the ellipse have 1 - V = 2 pi^2 <(q.x)^2> along each axis', () => {
    const img = KINDS.find((k) => k.name === 'pixel image')!.m;
    const q = 1e-3 / (Math.PI * 1.5 * RAD_PER_MAS);
    // <e^2> over the pixel centres: weights 1, 2, 1 at e = -0.5, 0, 0.5 in the middle row, 1 above and below at 0
    const meanE2 = (2 * 0.25) / 6;
    const v = img.visibility(q, 0).re;
    expect(Math.abs((1 - v) / (2 * Math.PI ** 2 * (q * RAD_PER_MAS) ** 2 * meanE2) - 1)).toBeLessThan(
      SERIES_TOL,
    );
    // the ellipse along its major axis (pa 30) is a disk of diameter 3: <(q.x)^2> = q^2 R^2 / 4
    const e = KINDS.find((k) => k.name === 'ellipse')!.m;
    const qe = 1e-3 / (Math.PI * 3 * RAD_PER_MAS);
    const s = Math.PI / 6;
    const ve = e.visibility(qe * Math.sin(s), qe * Math.cos(s)).re;
    expect(
      Math.abs((1 - ve) / (2 * Math.PI ** 2 * (qe * RAD_PER_MAS) ** 2 * (1.5 ** 2 / 4)) - 1),
    ).toBeLessThan(SERIES_TOL);
  });
});
