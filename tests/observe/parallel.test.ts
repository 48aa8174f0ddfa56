import { afterAll, describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { disk, gaussianRing, limbDarkenedDisk, linearLaw, type Model, point, sum } from '../../src/index.js';
import { closeParallelPool, parallelVisibilities, sharedFloat64Array } from '../../src/observe/parallel.js';

const N = 50_000;

function columns(n: number): { u: Float64Array; v: Float64Array } {
  const u = new Float64Array(n);
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    u[i] = Math.sin(i * 0.37) * 3e8;
    v[i] = Math.cos(i * 0.11) * 3e8;
  }
  return { u, v };
}

const models: [string, Model][] = [
  [
    'a limb-darkened star, an inclined blurred ring and a shifted point',
    sum(
      limbDarkenedDisk({ diameter: 1.8, law: linearLaw(0.4) }),
      gaussianRing({ diameter: 6, fwhm: 1 }).incline(50, 30).weight(0.3),
      point().weight(0.05).shift(4.5, -2),
    ),
  ],
  ['a shifted uniform disk', disk({ diameter: 2 }).shift(1, -3)],
];

afterAll(async () => {
  await closeParallelPool();
});

describe('parallelVisibilities', () => {
  for (const [name, m] of models) {
    it(`gives exactly the single-thread values for ${name}`, async () => {
      const { u, v } = columns(N);
      const one = m.visibilities(u, v);
      const two = await parallelVisibilities(m, u, v, { threads: 2, minPointsPerThread: 1000 });
      expect(Array.from(two.re)).toEqual(Array.from(one.re));
      expect(Array.from(two.im)).toEqual(Array.from(one.im));
    });
  }

  it('gives the same values with three threads and with a second call that reuses the workers', async () => {
    const m = models[0]![1];
    const { u, v } = columns(N);
    const one = m.visibilities(u, v);
    const a = await parallelVisibilities(m, u, v, { threads: 3, minPointsPerThread: 1000 });
    const b = await parallelVisibilities(m, u, v, { threads: 3, minPointsPerThread: 1000 });
    expect(Array.from(a.re)).toEqual(Array.from(one.re));
    expect(Array.from(b.im)).toEqual(Array.from(one.im));
  });

  it('fills shared output columns in place and leaves the inputs unchanged', async () => {
    const m = models[0]![1];
    const { u, v } = columns(N);
    const su = sharedFloat64Array(N);
    const sv = sharedFloat64Array(N);
    su.set(u);
    sv.set(v);
    const out = { re: sharedFloat64Array(N), im: sharedFloat64Array(N) };
    const r = await parallelVisibilities(m, su, sv, { threads: 2, minPointsPerThread: 1000, out });
    expect(r).toBe(out);
    expect(Array.from(su)).toEqual(Array.from(u));
    expect(Array.from(sv)).toEqual(Array.from(v));
    expect(Array.from(out.re)).toEqual(Array.from(m.visibilities(u, v).re));
  });

  it('copies into ordinary output columns and leaves ordinary inputs unchanged', async () => {
    const m = models[1]![1];
    const { u, v } = columns(N);
    const u0 = Float64Array.from(u);
    const out = { re: new Float64Array(N), im: new Float64Array(N) };
    const r = await parallelVisibilities(m, u, v, { threads: 2, minPointsPerThread: 1000, out });
    expect(r).toBe(out);
    expect(Array.from(u)).toEqual(Array.from(u0));
    expect(Array.from(out.im)).toEqual(Array.from(m.visibilities(u, v).im));
  });

  it('stays on the calling thread for small inputs and gives the same values', async () => {
    const m = models[0]![1];
    const u = [3e7, 0, -2e8];
    const v = [1e7, 5e7, 4e7];
    const r = await parallelVisibilities(m, u, v);
    const one = m.visibilities(u, v);
    expect(Array.from(r.re)).toEqual(Array.from(one.re));
    expect(Array.from(r.im)).toEqual(Array.from(one.im));
  });

  it('rejects columns of unequal length, non-finite values and bad options with InputError', () => {
    const m = models[1]![1];
    expect(() => parallelVisibilities(m, [1, 2], [1])).toThrow(InputError);
    expect(() => parallelVisibilities(m, [1, Number.NaN], [1, 2])).toThrow(/u\[1\] is NaN/);
    expect(() => parallelVisibilities(m, [1], [1], { threads: 0 })).toThrow(/threads/);
    expect(() => parallelVisibilities(m, [1], [1], { threads: 1.5 })).toThrow(InputError);
    expect(() => parallelVisibilities(m, [1], [1], { minPointsPerThread: 0 })).toThrow(/minPointsPerThread/);
    expect(() =>
      parallelVisibilities(m, [1, 2], [1, 2], { out: { re: new Float64Array(1), im: new Float64Array(2) } }),
    ).toThrow(/out\.re/);
    expect(() => sharedFloat64Array(-1)).toThrow(InputError);
  });

  it('rejects a model whose total flux is zero before any worker starts', () => {
    const m = sum(point(), point().weight(-1));
    expect(() => parallelVisibilities(m, [1], [1])).toThrow(/total flux/);
  });
});
