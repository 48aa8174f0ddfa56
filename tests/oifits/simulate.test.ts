/**
 * simulate(): a dataset's observables replaced by a model's predictions. The model here is a hand-written
 * point source at an offset (CONVENTIONS.md: V = exp(-2 pi i (u e0 + v n0)), e0, n0 in radians), so that
 * the expected values are computed independently of the code under test.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { readOifits, type SimulationModel, seededRandom, simulate } from '../../src/oifits/index.js';
import { fixture } from './helpers.js';

const MAS = Math.PI / 648_000_000; // rad per mas
const E0 = 3 * MAS;
const N0 = -1.5 * MAS;

/** A point source with flux 1 at (E0, N0). */
const pointAtOffset: SimulationModel = {
  visibilities(u, v) {
    const re = new Float64Array(u.length);
    const im = new Float64Array(u.length);
    for (let i = 0; i < u.length; i++) {
      const p = -2 * Math.PI * (u[i]! * E0 + v[i]! * N0);
      re[i] = Math.cos(p);
      im[i] = Math.sin(p);
    }
    return { re, im };
  },
  vis2: (u) => new Float64Array(u.length).fill(1),
  closurePhase: (u1) => new Float64Array(u1.length),
  t3amp: (u1) => new Float64Array(u1.length).fill(1),
};

const PHASE_TOL = 1e-9; // degrees

const wrap = (d: number) => {
  let r = d % 360;
  if (r > 180) r -= 360;
  else if (r <= -180) r += 360;
  return r;
};

describe('simulate', () => {
  const observed = readOifits(fixture('kestrel_v2.fits'), { name: 'obs.fits' });

  it('without noise writes the model values exactly where the data had values', () => {
    const { dataset, bytes } = simulate(pointAtOffset, observed);
    const back = readOifits(bytes);
    const v = back.vis;
    for (let k = 0; k < v.length; k++) {
      const phase = wrap((-2 * Math.PI * (v.u[k]! * E0 + v.v[k]! * N0) * 180) / Math.PI);
      expect(Math.abs(wrap(v.visphi[k]! - phase))).toBeLessThan(PHASE_TOL);
      expect(v.visamp[k]).toBeCloseTo(1, 14);
    }
    for (let k = 0; k < back.vis2.length; k++) {
      if (Number.isNaN(observed.vis2.value[k]!)) expect(Number.isNaN(back.vis2.value[k]!)).toBe(true);
      else expect(back.vis2.value[k]).toBe(1);
    }
    // Closure phase of a point source is zero; NaN amplitudes (no measurement) stay NaN.
    expect(back.t3.t3phi.every((x) => x === 0)).toBe(true);
    expect(back.t3.t3amp.filter((x) => Number.isNaN(x)).length).toBe(
      observed.t3.t3amp.filter((x) => Number.isNaN(x)).length,
    );
    // Errors and flags are kept; coherent-flux columns are removed.
    expect(Array.from(back.vis2.error)).toEqual(Array.from(observed.vis2.error));
    expect(Array.from(back.vis2.flag)).toEqual(Array.from(observed.vis2.flag));
    expect(dataset.tables.vis[0]!.columns.some((c) => c.name === 'RVIS')).toBe(false);
    // The input is unchanged.
    expect(observed.vis2.value[0]).not.toBe(1);
  });

  it('with noise draws residuals with the stated errors as standard deviations, reproducibly by seed', () => {
    const a = simulate(pointAtOffset, observed, { noise: true, seed: 5 }).dataset;
    const b = simulate(pointAtOffset, observed, { noise: true, seed: 5 }).dataset;
    const c = simulate(pointAtOffset, observed, { noise: true, seed: 6 }).dataset;
    expect(Array.from(a.vis2.value)).toEqual(Array.from(b.vis2.value));
    expect(Array.from(a.vis2.value)).not.toEqual(Array.from(c.vis2.value));
    const z: number[] = [];
    for (let k = 0; k < a.vis2.length; k++) {
      if (Number.isFinite(a.vis2.value[k]!)) z.push((a.vis2.value[k]! - 1) / a.vis2.error[k]!);
    }
    const mean = z.reduce((s, x) => s + x, 0) / z.length;
    const sd = Math.sqrt(z.reduce((s, x) => s + (x - mean) ** 2, 0) / (z.length - 1));
    // 95 samples: mean within ~4 sigma/sqrt(n), sd within 30%.
    expect(Math.abs(mean)).toBeLessThan(4 / Math.sqrt(z.length));
    expect(sd).toBeGreaterThan(0.7);
    expect(sd).toBeLessThan(1.3);
    expect(a.t3.t3phi.every((x) => x > -180 && x <= 180)).toBe(true);
  });

  it('refuses a model without the needed methods or with non-finite output', () => {
    expect(() => simulate({} as SimulationModel, observed)).toThrow(InputError);
    const bad = {
      ...pointAtOffset,
      vis2: (u: ArrayLike<number>) => new Float64Array(u.length).fill(Number.NaN),
    };
    expect(() => simulate(bad, observed)).toThrow(/model.vis2 returned NaN at entry 0/);
  });
});

describe('seededRandom', () => {
  it('gives standard normal deviates (mean 0, variance 1) and uniform deviates in (0, 1)', () => {
    const r = seededRandom(123);
    const n = 20000;
    let s = 0;
    let s2 = 0;
    for (let i = 0; i < n; i++) {
      const x = r.normal();
      s += x;
      s2 += x * x;
    }
    expect(Math.abs(s / n)).toBeLessThan(0.04);
    expect(Math.abs(s2 / n - 1)).toBeLessThan(0.05);
    const u = seededRandom(9);
    for (let i = 0; i < 1000; i++) {
      const x = u.uniform();
      expect(x > 0 && x < 1).toBe(true);
    }
  });
});
