/**
 * Analytic Jacobians of every component kind and every wavelength-dependent slot kind against central finite
 * differences of the value path: the compiled plans (model.at(values) and its methods) without wavelengths,
 * and chromaticVisibilities / chromaticVis2 / chromaticBispectrum (src/observe/chromatic.ts) with wavelengths
 * and channel widths. Every slot of every component holds a free parameter; parameter values are drawn with
 * fast-check (fixed seeds, bounded runs). Tolerance from issue 4: relative 1e-6 or absolute 1e-9, whichever is
 * looser, plus an allowance of 1e-8 max(1, |d|) for what is left of the finite difference: the reference is
 * the Richardson extrapolation (4 D(h/2) - D(h)) / 3 of central differences D with h = 2e-5 max(1, |x|), whose
 * truncation is O(h^4) (plain central differences, O(h^2), miss by up to 2e-6 relative on steep closure phases
 * near |V| = 0), and its rounding is about 1e-16 |f| / h.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  annulus,
  background,
  blackbodyRatio,
  chromaticBispectrum,
  chromaticVis2,
  chromaticVisibilities,
  convolve,
  disk,
  exponential,
  gaussian,
  gaussianRing,
  limbDarkenedDisk,
  linearLaw,
  lorentzian,
  type Model,
  ModelError,
  modulatedRing,
  type ObservableName,
  observableJacobian,
  observableValues,
  param,
  pixelImage,
  point,
  pointsFromFrequencies,
  powerLaw,
  powerLawFlux,
  powerLawSize,
  quadraticLaw,
  radialProfile,
  ring,
  sum,
  visibilityJacobian,
} from '../../src/index.js';

const REL = 1e-6;
const ABS = 1e-9;
/** Allowance for the truncation and rounding of the central difference, times max(1, |d|). */
const TRUNCATION = 1e-8;
/** Jacobian-path values against the value path (different loops, same formulas). */
const VALUE_TOL = 1e-9;

const OBSERVABLES: readonly ObservableName[] = [
  'visre',
  'visim',
  'vis2',
  'visamp',
  'visphi',
  't3re',
  't3im',
  't3amp',
  't3phi',
];

const p = (name: string, value: number, min?: number, max?: number) =>
  param(name, value, { ...(min === undefined ? {} : { min }), ...(max === undefined ? {} : { max }) });

// points: short to long baselines (x = pi size q up to about 25, where the power law uses Miller's recurrence),
// and one at q = 0
const U = [3e7, -5e7, 1e8, 2e7, 0, 4e8];
const V = [4e7, 6e7, -2e7, -9e7, 0, -1.5e8];
const U2 = [-6e7, 2e7, 3e7, 5e7, 4e7, -2e8];
const V2 = [1e7, -7e7, 5e7, 3e7, -2e7, 1e8];
/** Two channels, repeated, so points share wavelengths; one point without a width. */
const WAVELENGTH = [1.6e-6, 2.2e-6, 1.6e-6, 2.2e-6, 2.2e-6, 1.6e-6];
const BAND = [4e-8, 1e-7, 4e-8, 1e-7, 0, 4e-8];
/** Sub-samples per channel in the property tests (the default 24 is checked once below). */
const SAMPLES = 6;

interface Spectral {
  readonly wavelength: readonly number[];
  readonly band?: readonly number[];
  readonly samples?: number;
}

const isT3 = (o: ObservableName) => o.startsWith('t3');
const isPhase = (o: ObservableName) => o === 'visphi' || o === 't3phi';
const wrap = (x: number) => ((((x + 180) % 360) + 360) % 360) - 180;

function pick(z: { re: Float64Array; im: Float64Array }, o: ObservableName): Float64Array {
  const out = new Float64Array(z.re.length);
  for (let i = 0; i < out.length; i++) {
    const r = z.re[i]!;
    const m = z.im[i]!;
    if (o === 'visre' || o === 't3re') out[i] = r;
    else if (o === 'visim' || o === 't3im') out[i] = m;
    else if (o === 'visamp' || o === 't3amp') out[i] = Math.hypot(r, m);
    else if (o === 'vis2') out[i] = r * r + m * m;
    else out[i] = (Math.atan2(m, r) * 180) / Math.PI;
  }
  return out;
}

/** The value path: model methods without wavelengths, the chromatic functions with them. */
function valuePath(m: Model, o: ObservableName, spec?: Spectral): Float64Array {
  if (spec === undefined) {
    if (o === 'vis2') return m.vis2(U, V);
    if (isT3(o)) return pick(m.bispectrum(U, V, U2, V2), o);
    return pick(m.visibilities(U, V), o);
  }
  const opts = spec.samples === undefined ? {} : { samples: spec.samples };
  const a = pointsFromFrequencies(U, V, spec.wavelength, spec.band);
  if (!isT3(o)) return o === 'vis2' ? chromaticVis2(m, a, opts) : pick(chromaticVisibilities(m, a, opts), o);
  const b = pointsFromFrequencies(U2, V2, spec.wavelength, spec.band);
  const tri = {
    u1coord: a.ucoord,
    v1coord: a.vcoord,
    u2coord: b.ucoord,
    v2coord: b.vcoord,
    wavelength: a.wavelength,
    ...(a.band === undefined ? {} : { band: a.band }),
  };
  return pick(chromaticBispectrum(m, tri, opts), o);
}

function pointsOf(o: ObservableName, spec?: Spectral) {
  const base = isT3(o) ? { u1: U, v1: V, u2: U2, v2: V2 } : { u: U, v: V };
  if (spec === undefined) return base;
  return { ...base, wavelength: spec.wavelength, ...(spec.band === undefined ? {} : { band: spec.band }) };
}

/** Checks values and every Jacobian column of one observable against the value path; throws with details. */
function check(model: Model, o: ObservableName, values: Record<string, number>, spec?: Spectral): void {
  const names = model.parameters();
  const vec = names.map((n) => {
    const x = values[n];
    if (x === undefined) throw new Error(`test setup: no value drawn for parameter '${n}'`);
    return x;
  });
  const options = spec?.samples === undefined ? undefined : { samples: spec.samples };
  const j = observableJacobian(model, o, pointsOf(o, spec), vec, options);
  const ref = valuePath(model.at(vec), o, spec);
  const fast = observableValues(model, o, pointsOf(o, spec), vec, options);
  for (let r = 0; r < j.rows; r++) {
    const scale = Math.max(1, Math.abs(ref[r]!));
    const d1 = isPhase(o) ? wrap(j.values[r]! - ref[r]!) : j.values[r]! - ref[r]!;
    if (!(Math.abs(d1) <= VALUE_TOL * scale)) {
      throw new Error(`${o} row ${r}: Jacobian-path value ${j.values[r]} vs value path ${ref[r]}`);
    }
    const d2 = isPhase(o) ? wrap(fast[r]! - ref[r]!) : fast[r]! - ref[r]!;
    if (!(Math.abs(d2) <= 1e-12 * scale)) {
      throw new Error(`${o} row ${r}: observableValues ${fast[r]} vs value path ${ref[r]}`);
    }
  }
  const central = (c: number, h: number): Float64Array => {
    const plus = vec.slice();
    const minus = vec.slice();
    plus[c] = vec[c]! + h;
    minus[c] = vec[c]! - h;
    const fp = valuePath(model.at(plus), o, spec);
    const fm = valuePath(model.at(minus), o, spec);
    return fp.map((x, r) => (isPhase(o) ? wrap(x - fm[r]!) : x - fm[r]!) / (2 * h));
  };
  for (let c = 0; c < names.length; c++) {
    const h = 2e-5 * Math.max(1, Math.abs(vec[c]!));
    const dh = central(c, h);
    const dh2 = central(c, h / 2);
    for (let r = 0; r < j.rows; r++) {
      // Richardson: (4 D(h/2) - D(h)) / 3 cancels the h^2 term of the central difference
      const dnum = (4 * dh2[r]! - dh[r]!) / 3;
      const dan = j.jacobian[r * j.cols + c]!;
      const tol = Math.max(ABS, REL * Math.abs(dnum)) + TRUNCATION * Math.max(1, Math.abs(dnum));
      if (!(Math.abs(dan - dnum) <= tol)) {
        throw new Error(
          `${o} d/d${names[c]} row ${r}: analytic ${dan}, finite difference ${dnum}, diff ${dan - dnum}, tol ${tol}`,
        );
      }
    }
  }
}

const num = (min: number, max: number) => fc.double({ min, max, noNaN: true });

// ---------- radial components: limb-darkened disks, annuli (both regimes of the kernel), Gaussian ring ----------

const radialModel = sum(
  // a term of three factors first (a convolution of a Gaussian ring and a disk), before terms of one
  convolve(gaussianRing({ diameter: p('cd', 3, 0), fwhm: 0.5 }), disk({ diameter: p('cdd', 0.7, 0) })).weight(
    0.2,
  ),
  limbDarkenedDisk({ diameter: p('ld', 2, 0), law: linearLaw(p('la', 0.4, -5, 1)) }).shift(
    p('le', 1),
    p('ln', -1),
  ),
  limbDarkenedDisk({ diameter: p('qd', 3, 0), law: quadraticLaw(p('qa', 0.3), p('qb', 0.2)) }).weight(
    p('qw', 0.5),
  ),
  limbDarkenedDisk({ diameter: p('pd', 2.5, 0), law: powerLaw(p('pal', 0.6, 0)) })
    .incline(p('pinc', 30, 0, 90), p('ppa', 10))
    .weight(p('pw', 0.4)),
  // laws with fixed coefficients: only the size moves (no coefficient slopes needed)
  limbDarkenedDisk({ diameter: p('fd', 1.5, 0), law: linearLaw(0.3) })
    .shift(0.5, p('fdn', 1))
    .weight(0.3),
  limbDarkenedDisk({ diameter: p('fq', 2.2, 0), law: quadraticLaw(0.2, 0.1) }).weight(p('fqw', 0.2)),
  annulus({ inner: p('ai', 1, 0), outer: p('ao', 3, 0) })
    .shift(p('ae', -2), 0)
    .weight(p('aw', 0.3)),
  annulus({ inner: p('ti', 2.95, 0), outer: p('to', 3, 0) }).weight(p('tw', 0.2)),
  gaussianRing({ diameter: p('gd', 4, 0), fwhm: p('gf', 0.8, 0) }).weight(p('gw', 0.3)),
);

const radialValues = fc
  .record({
    cd: num(1, 5),
    cdd: num(0.2, 1.5),
    ld: num(0.5, 4),
    la: num(-0.5, 0.99),
    le: num(-5, 5),
    ln: num(-5, 5),
    qd: num(0.5, 4),
    qa: num(0, 0.5),
    qb: num(0, 0.45),
    qw: num(0.2, 1),
    pd: num(0.5, 4),
    pal: num(0.01, 3),
    pinc: num(5, 80),
    ppa: num(-180, 180),
    pw: num(0.2, 1),
    fd: num(0.5, 4),
    fdn: num(-5, 5),
    fq: num(0.5, 4),
    fqw: num(0.1, 0.5),
    ao: num(1, 5),
    aRatio: num(0.05, 0.95),
    ae: num(-5, 5),
    aw: num(0.1, 1),
    to: num(1, 5),
    tRatio: num(0.976, 0.995),
    tw: num(0.1, 1),
    gd: num(1, 5),
    gf: num(0.2, 2),
    gw: num(0.1, 1),
  })
  .map(({ aRatio, tRatio, ...r }) => ({ ...r, ai: r.ao * aRatio, ti: r.to * tRatio }));

// ---------- complex kinds: modulated rings (also convolved), pixel image ----------

const PIXELS = Array.from({ length: 30 }, (_, i) => ((i * 7) % 11) + 1);

const complexModel = sum(
  modulatedRing({
    diameter: p('md', 3, 0),
    c1: p('c1', 0.3, 0, 1),
    pa1: p('pa1', 40),
    c2: p('c2', 0.2, 0, 1),
    pa2: p('pa2', -70),
  })
    .incline(p('minc', 40, 0, 90), p('mpa', 20))
    .shift(p('me', 1), p('mn', -0.5)),
  convolve(
    modulatedRing({ diameter: p('kd', 2, 0), c1: p('kc1', 0.5, 0, 1), pa1: p('kpa1', 10) }),
    gaussian({ fwhm: p('kf', 0.8, 0) }),
  ).weight(p('kw', 0.4)),
  pixelImage({ nx: 6, pixels: PIXELS, scale: p('sc', 0.5, 0.01) })
    .rotate(p('rot', 30))
    .shift(p('pe', 0.4), p('pn', -0.2))
    .weight(p('pxw', 0.3)),
);

const complexValues = fc.record({
  md: num(1, 4),
  c1: num(0.01, 0.5),
  pa1: num(-180, 180),
  c2: num(0.01, 0.45),
  pa2: num(-180, 180),
  minc: num(1, 80),
  mpa: num(-180, 180),
  me: num(-5, 5),
  mn: num(-5, 5),
  kd: num(1, 4),
  kc1: num(0.01, 0.99),
  kpa1: num(-180, 180),
  kf: num(0.2, 2),
  kw: num(0.1, 1),
  sc: num(0.1, 1),
  rot: num(-180, 180),
  pe: num(-3, 3),
  pn: num(-3, 3),
  pxw: num(0.1, 1),
});

// ---------- profiles: exponential, Lorentzian-like, background, tabulated radial profile ----------

const profileModel = sum(
  exponential({ fwhm: p('ef', 2, 0) })
    .stretch(p('es', 0.7), 1)
    .weight(p('ew', 0.5)),
  lorentzian({ fwhm: p('lf', 2, 0) })
    .incline(p('linc', 30, 0, 90), p('lpa', 10))
    .weight(p('lw', 0.5)),
  background().weight(p('bw', 0.3)),
  radialProfile({ intensity: (r: number) => Math.exp(-r * r) * (1 + 0.5 * r), maxRadius: 3, samples: 301 })
    .stretch(p('rs', 0.8), p('rt', 1.1))
    .shift(p('re', 0.5), 0)
    .weight(p('rw', 0.5)),
  point(),
);

const profileValues = fc.record({
  ef: num(0.3, 4),
  es: num(0.3, 2),
  ew: num(0.1, 1),
  lf: num(0.3, 4),
  linc: num(1, 80),
  lpa: num(-180, 180),
  lw: num(0.1, 1),
  bw: num(0, 1),
  rs: num(0.3, 2),
  rt: num(0.3, 2),
  re: num(-3, 3),
  rw: num(0.1, 1),
});

// ---------- wavelength-dependent slots: power-law flux and size, blackbody ratio, all coefficients free ----------

const chromaticModel = sum(
  disk({ diameter: powerLawSize(p('s0', 2, 0), 2.2e-6, p('si', 0.5)) }),
  limbDarkenedDisk({
    diameter: 2,
    law: linearLaw(powerLawFlux(p('la0', 0.4), 2.2e-6, p('lai', -1))),
  }).weight(0.5),
  point()
    .weight(powerLawFlux(p('f0', 0.3), 2.2e-6, p('fi', -2)))
    .shift(p('ce', 3), p('cn', -2)),
  ring({ diameter: 6 }).weight(blackbodyRatio(p('t1', 1500, 1), p('t2', 6000, 1), p('bs', 0.05))),
  modulatedRing({
    diameter: powerLawSize(p('ms', 3, 0), 2.2e-6, p('mi', 1)),
    c1: 0.3,
    pa1: p('mpa', 30),
  }).weight(0.3),
);

const chromaticValues = fc.record({
  s0: num(0.5, 3),
  si: num(-1, 1),
  la0: num(0, 0.6),
  lai: num(-1, 1),
  f0: num(0.05, 1),
  fi: num(-4, 2),
  ce: num(-5, 5),
  cn: num(-5, 5),
  t1: num(800, 3000),
  t2: num(3000, 10000),
  bs: num(0.01, 1),
  ms: num(1, 4),
  mi: num(-1, 1.5),
  mpa: num(-180, 180),
});

const GROUPS = [
  { name: 'limb-darkened disks, annuli and the Gaussian ring', model: radialModel, values: radialValues },
  { name: 'modulated rings and the pixel image', model: complexModel, values: complexValues },
  {
    name: 'exponential, Lorentzian, background and radial-profile',
    model: profileModel,
    values: profileValues,
  },
] as const;

describe('Jacobians of every component kind against finite differences', () => {
  for (const g of GROUPS) {
    it(`for the ${g.name}: all observables, every slot a parameter`, () => {
      fc.assert(
        fc.property(g.values, (values) => {
          for (const o of OBSERVABLES) check(g.model, o, values);
        }),
        { seed: 4141, numRuns: 5, endOnFailure: true },
      );
    });
    it(`for the ${g.name}: all observables averaged over channels (wavelength and band)`, () => {
      fc.assert(
        fc.property(g.values, (values) => {
          for (const o of OBSERVABLES)
            check(g.model, o, values, { wavelength: WAVELENGTH, band: BAND, samples: SAMPLES });
        }),
        { seed: 4242, numRuns: 2, endOnFailure: true },
      );
    });
  }
});

describe('Jacobians through wavelength-dependent slots', () => {
  it('power-law flux and size and blackbody-ratio coefficients, at one wavelength per point', () => {
    fc.assert(
      fc.property(chromaticValues, (values) => {
        for (const o of OBSERVABLES) check(chromaticModel, o, values, { wavelength: WAVELENGTH });
      }),
      { seed: 4343, numRuns: 4, endOnFailure: true },
    );
  });
  it('power-law flux and size and blackbody-ratio coefficients, averaged over channels', () => {
    fc.assert(
      fc.property(chromaticValues, (values) => {
        for (const o of OBSERVABLES) {
          check(chromaticModel, o, values, { wavelength: WAVELENGTH, band: BAND, samples: SAMPLES });
        }
      }),
      { seed: 4444, numRuns: 2, endOnFailure: true },
    );
  });
  it('with the default number of sub-samples the values are those of the chromatic functions', () => {
    const values = {
      s0: 2,
      si: 0.5,
      la0: 0.4,
      lai: -1,
      f0: 0.3,
      fi: -2,
      ce: 3,
      cn: -2,
      t1: 1500,
      t2: 6000,
      bs: 0.05,
    };
    for (const o of ['vis2', 'visphi', 't3phi', 't3amp'] as const) {
      check(chromaticModel, o, { ...values, ms: 3, mi: 1, mpa: 30 }, { wavelength: WAVELENGTH, band: BAND });
    }
  });
});

describe('wavelength columns', () => {
  const m = radialModel;
  it('a wavelength without a band changes nothing for a model without wavelength-dependent slots', () => {
    for (const o of OBSERVABLES) {
      const a = observableJacobian(m, o, pointsOf(o));
      const b = observableJacobian(m, o, pointsOf(o, { wavelength: WAVELENGTH }));
      expect(b.values).toEqual(a.values);
      expect(b.jacobian).toEqual(a.jacobian);
      expect(observableValues(m, o, pointsOf(o, { wavelength: WAVELENGTH }))).toEqual(
        observableValues(m, o, pointsOf(o)),
      );
    }
  });
  it('bands of zero width are no channel average', () => {
    const zero = WAVELENGTH.map(() => 0);
    const a = observableJacobian(m, 'vis2', pointsOf('vis2'));
    const b = observableJacobian(m, 'vis2', pointsOf('vis2', { wavelength: WAVELENGTH, band: zero }));
    expect(b.jacobian).toEqual(a.jacobian);
  });
  it('a band smears VIS2 below |mean V|^2 only through the spread of V over the channel', () => {
    // mean |V|^2 >= |mean V|^2 (Cauchy-Schwarz), with equality only when V is constant over the channel
    const spec = { wavelength: WAVELENGTH, band: BAND.map((b) => 10 * b) };
    const v2 = observableJacobian(m, 'vis2', pointsOf('vis2', spec)).values;
    const amp = observableJacobian(m, 'visamp', pointsOf('visamp', spec)).values;
    for (let i = 0; i < v2.length; i++) {
      if (U[i] === 0 && V[i] === 0) continue;
      expect(v2[i]! - amp[i]! ** 2).toBeGreaterThan(0);
    }
  });
  it('a model with wavelength-dependent slots asks for wavelengths, naming the column', () => {
    expect(() => observableJacobian(chromaticModel, 'vis2', { u: U, v: V })).toThrow(
      /give points\.wavelength/,
    );
    expect(() => observableValues(chromaticModel, 'vis2', { u: U, v: V })).toThrow(/give points\.wavelength/);
    expect(() => visibilityJacobian(chromaticModel, U, V)).toThrow(ModelError);
  });
  it('rejects malformed wavelength columns, naming the column, the entry and what is valid', () => {
    expect(() => observableJacobian(m, 'vis2', { u: U, v: V, wavelength: [1e-6] })).toThrow(
      /points\.wavelength has 1 entries but there are 6 points/,
    );
    const bad = WAVELENGTH.slice();
    bad[2] = -1;
    expect(() => observableJacobian(m, 'vis2', { u: U, v: V, wavelength: bad })).toThrow(
      /points\.wavelength\[2\] is -1; expected a finite number of metres > 0/,
    );
    expect(() => observableValues(m, 'vis2', { u: U, v: V, band: BAND })).toThrow(
      /points\.band needs points\.wavelength/,
    );
    const wide = BAND.slice();
    wide[1] = 5e-6;
    expect(() => observableJacobian(m, 'vis2', { u: U, v: V, wavelength: WAVELENGTH, band: wide })).toThrow(
      /points\.band\[1\] = 0\.000005 m reaches a wavelength of .* smaller than twice the wavelength/,
    );
    expect(() =>
      observableJacobian(m, 'vis2', { u: U, v: V, wavelength: WAVELENGTH }, undefined, { samples: 0 }),
    ).toThrow(/options\.samples must be an integer in \[1, 10000\], got 0/);
  });
  it('a slot that leaves its domain at some wavelength is an error naming the slot', () => {
    // a = 0.9 (lambda / 2.2 um)^-2 exceeds 1 at 1.6 um
    const ld = limbDarkenedDisk({ diameter: 2, law: linearLaw(powerLawFlux(p('a0', 0.9), 2.2e-6, -2)) });
    expect(() => observableJacobian(ld, 'vis2', { u: U, v: V, wavelength: WAVELENGTH })).toThrow(
      /\.a.*a <= 1/,
    );
  });
});

describe('observableValues', () => {
  it('equals the model methods for every observable at the parameters given', () => {
    const values = { ld: 2.2, la: 0.3, le: 0.5, ln: -0.5, qd: 2, qa: 0.2, qb: 0.1, qw: 0.6, pd: 3, pal: 1 };
    const at = radialModel.at(values);
    expect(observableValues(radialModel, 'vis2', { u: U, v: V }, values)).toEqual(at.vis2(U, V));
    expect(observableValues(radialModel, 'visphi', { u: U, v: V }, values)).toEqual(at.visphi(U, V));
    expect(observableValues(radialModel, 'visamp', { u: U, v: V }, values)).toEqual(at.visamp(U, V));
    expect(observableValues(radialModel, 'visre', { u: U, v: V }, values)).toEqual(at.visibilities(U, V).re);
    expect(observableValues(radialModel, 't3phi', { u1: U, v1: V, u2: U2, v2: V2 }, values)).toEqual(
      at.closurePhase(U, V, U2, V2),
    );
    expect(observableValues(radialModel, 't3amp', { u1: U, v1: V, u2: U2, v2: V2 }, values)).toEqual(
      at.t3amp(U, V, U2, V2),
    );
    expect(observableValues(radialModel, 't3im', { u1: U, v1: V, u2: U2, v2: V2 }, values)).toEqual(
      at.bispectrum(U, V, U2, V2).im,
    );
  });
  it('uses the current parameter values when none are given', () => {
    expect(observableValues(complexModel, 'vis2', { u: U, v: V })).toEqual(complexModel.vis2(U, V));
  });
  it('gives phases in degrees wrapped to (-180, 180]', () => {
    const m = point().shift(param('e', 0.5), 0);
    // u e = 0.5 turn exactly: the phase is -180 degrees before wrapping
    const u = 0.5 / (Math.PI / 648_000_000) / 0.5;
    const phi = observableValues(m, 'visphi', { u: [u], v: [0] })[0]!;
    expect(phi).toBeGreaterThan(-180);
    expect(phi).toBeLessThanOrEqual(180);
    expect(Math.abs(Math.abs(phi) - 180)).toBeLessThan(1e-6);
  });
  it('asks for triangles for closure quantities and for baselines for visibilities', () => {
    expect(() => observableValues(radialModel, 't3phi', { u: U, v: V })).toThrow(/needs triangles/);
    expect(() => observableValues(radialModel, 'vis2', { u1: U, v1: V, u2: U, v2: V })).toThrow(
      /needs baselines/,
    );
  });
});

describe('the per-point loop', () => {
  // 300 points: two full blocks of 128 and a partial one
  const n = 300;
  const u = Float64Array.from({ length: n }, (_, i) => Math.sin(i * 0.37) * 4e8);
  const v = Float64Array.from({ length: n }, (_, i) => Math.cos(i * 0.11) * 4e8);
  it('gives every point of a long column exactly what it gives that point alone', () => {
    for (const m of [radialModel, complexModel, profileModel]) {
      const all = visibilityJacobian(m, u, v);
      for (const i of [0, 127, 128, 200, 255, 256, 299]) {
        const one = visibilityJacobian(m, [u[i]!], [v[i]!]);
        expect(all.re[i]).toBe(one.re[0]);
        expect(all.im[i]).toBe(one.im[0]);
        expect(Array.from(all.dre.subarray(i * all.cols, (i + 1) * all.cols))).toEqual(Array.from(one.dre));
        expect(Array.from(all.dim.subarray(i * all.cols, (i + 1) * all.cols))).toEqual(Array.from(one.dim));
      }
    }
  });
  it('gives a disk the values of the compiled plan to rounding, on both sides of x = 2 and past x = 12', () => {
    // x = pi d q up to about 40: the near-zero series, the unit-interval polynomials and Hankel's form; the
    // loops differ only in the order of the products in q^T M q (one rounding)
    const m = disk({ diameter: param('d', 3) });
    const q = Float64Array.from({ length: n }, (_, i) => i * 3e6);
    const zero = new Float64Array(n);
    const a = visibilityJacobian(m, q, zero).re;
    const b = m.visibilities(q, zero).re;
    for (let i = 0; i < n; i++) expect(Math.abs(a[i]! - b[i]!)).toBeLessThan(1e-15);
  });
  it('fills the buffers it is given, returns them, and leaves the inputs unchanged', () => {
    const cols = radialModel.parameters().length;
    const out = {
      re: new Float64Array(n),
      im: new Float64Array(n),
      dre: new Float64Array(n * cols),
      dim: new Float64Array(n * cols),
    };
    const u0 = u.slice();
    const j = visibilityJacobian(radialModel, u, v, undefined, out);
    expect(j.re).toBe(out.re);
    expect(j.dim).toBe(out.dim);
    expect(u).toEqual(u0);
    expect(Array.from(out.dre)).toEqual(Array.from(visibilityJacobian(radialModel, u, v).dre));
    expect(() => visibilityJacobian(radialModel, u, v, undefined, { dre: new Float64Array(3) })).toThrow(
      new RegExp(`out\\.dre must be a Float64Array of length ${n * cols}`),
    );
  });
});
