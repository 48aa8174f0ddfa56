/** Construction, immutability, errors with model paths, printing and parameters of models. */
import { describe, expect, it } from 'vitest';
import {
  disk,
  ellipse,
  fixed,
  gaussian,
  InputError,
  ModelError,
  param,
  point,
  ring,
  sum,
  UvskyError,
} from '../../src/index.js';

describe('models are immutable values', () => {
  it('every model and its node tree are frozen', () => {
    const m = disk({ diameter: 2 }).shift(1, 2).plus(point());
    expect(Object.isFrozen(m)).toBe(true);
    expect(Object.isFrozen(m.node)).toBe(true);
    expect(Object.isFrozen(m.terms())).toBe(true);
    expect(Object.isFrozen(m.terms()[0]!.factors[0]!.matrix)).toBe(true);
  });

  it('operators return new models and leave the original unchanged', () => {
    const a = disk({ diameter: 2 });
    const before = a.toString();
    const b = a.shift(3, 0).weight(2).rotate(10);
    expect(a.toString()).toBe(before);
    expect(b).not.toBe(a);
    expect(a.flux).toBe(1);
    expect(b.flux).toBe(2);
  });

  it('the options object given to a factory is not kept or changed', () => {
    const opts = { diameter: 2 };
    const m = disk(opts);
    opts.diameter = 5;
    expect(m.terms()[0]!.factors[0]!.matrix[0]).toBe(2);
  });
});

describe('bad values fail at construction with the model path', () => {
  it('a negative diameter names disk.diameter', () => {
    expect(() => disk({ diameter: -1 })).toThrow(ModelError);
    expect(() => disk({ diameter: -1 })).toThrow(/disk\.diameter: expected a number >= 0 mas, got -1/);
  });

  it('NaN in a nested operator names the full path', () => {
    const inner = gaussian({ fwhm: 1 });
    try {
      sum(point(), inner.shift(Number.NaN, 0));
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(UvskyError);
      expect((e as ModelError).message).toMatch(/^shift\.east: expected a finite number mas, got NaN/);
    }
    expect(() => sum(point(), inner.shift(1, 0).weight(Number.POSITIVE_INFINITY))).toThrow(/weight\.flux/);
  });

  it('minor > major is an error that says how to fix it', () => {
    expect(() => ellipse({ major: 1, minor: 2, pa: 0 })).toThrow(/ellipse\.minor: expected minor <= major/);
  });

  it('an inclination outside [0, 90] is an error', () => {
    expect(() => disk({ diameter: 1 }).incline(95, 0)).toThrow(
      /incline\.inclination: expected an angle in \[0, 90\]/,
    );
  });

  it('a zero stretch is an error', () => {
    expect(() => ring({ diameter: 1 }).stretch(0, 1)).toThrow(/stretch\.east: expected a non-zero number/);
  });

  it('a missing option is an error, not a NaN', () => {
    expect(() => disk({} as { diameter: number })).toThrow(/disk\.diameter: expected a number or a param/);
  });

  it('a total flux of zero fails at evaluation, not with NaN', () => {
    const m = disk({ diameter: 2 }).plus(disk({ diameter: 2 }).shift(1, 0).weight(-1));
    expect(m.flux).toBe(0);
    expect(() => m.vis2([1], [0])).toThrow(/total flux is 0/);
    // negative weights are fine when the total is not zero: a gap is a ring of negative flux
    const gap = disk({ diameter: 10 }).plus(ring({ diameter: 5 }).weight(-0.2));
    expect(Number.isFinite(gap.vis2([1e7], [0])[0]!)).toBe(true);
  });

  it('sum of nothing and non-models are errors', () => {
    expect(() => sum()).toThrow(/at least one model/);
    expect(() => sum(point(), {} as never)).toThrow(/models\[1\] is not a uvsky Model/);
  });
});

describe('evaluation inputs', () => {
  const m = disk({ diameter: 2 }).shift(1, 0);
  it('mismatched lengths name both lengths', () => {
    expect(() => m.visibilities([1, 2, 3], [1, 2])).toThrow(InputError);
    expect(() => m.visibilities([1, 2, 3], [1, 2])).toThrow(/u has 3 entries but v has 2/);
    expect(() => m.closurePhase([1], [1], [1, 2], [1])).toThrow(/u1 has 1 entries but u2 has 2/);
  });
  it('a NaN coordinate names its index', () => {
    expect(() => m.vis2([1, Number.NaN], [0, 0])).toThrow(/u\[1\] is NaN/);
    expect(() => m.vis2([1, 2], [0, Number.NEGATIVE_INFINITY])).toThrow(/v\[1\] is -Infinity/);
  });
});

describe('printing', () => {
  it('toString is a TypeScript expression that rebuilds the model', () => {
    const m = sum(disk({ diameter: 1.2 }).weight(0.8), point().shift(3, -1)).rotate(10);
    expect(m.toString()).toBe('sum(disk({ diameter: 1.2 }).weight(0.8), point().shift(3, -1)).rotate(10)');
    const d = param('d', 1.5, { min: 0 });
    expect(disk({ diameter: d }).toString()).toBe("disk({ diameter: param('d', 1.5, { min: 0 }) })");
  });
});

describe('parameters', () => {
  const d = param('diameter', 2, { min: 0, max: 10 });
  const f = param('flux', 0.2, { min: 0, max: 1 });
  const e = param('east', 4);
  const m = sum(disk({ diameter: d }), point().weight(f).shift(e, 0), ring({ diameter: d }).weight(f));

  it('lists free parameters once, in order of first appearance', () => {
    expect(m.parameters()).toEqual(['diameter', 'flux', 'east']);
  });

  it('at() replaces parameters by numbers from an array or a record', () => {
    const a = m.at([3, 0.5, -2]);
    expect(a.parameters()).toEqual([]);
    expect(
      a.equals(
        sum(disk({ diameter: 3 }), point().weight(0.5).shift(-2, 0), ring({ diameter: 3 }).weight(0.5)),
      ),
    ).toBe(true);
    const b = m.at({ east: 1 });
    expect(
      b.equals(
        sum(disk({ diameter: 2 }), point().weight(0.2).shift(1, 0), ring({ diameter: 2 }).weight(0.2)),
      ),
    ).toBe(true);
  });

  it('tied slots move together', () => {
    const a = m.at({ diameter: 5 }).terms();
    expect(a[0]!.factors[0]!.matrix[0]).toBe(5);
    expect(a[2]!.factors[0]!.matrix[0]).toBe(5);
  });

  it('values outside the bounds, unknown names and wrong lengths are errors naming the parameter', () => {
    expect(() => m.at([11, 0.5, 0])).toThrow(/parameter 'diameter' = 11 lies outside its bounds \[0, 10\]/);
    expect(() => m.at({ size: 1 })).toThrow(/'size' is not a free parameter/);
    expect(() => m.at([1, 2])).toThrow(/got 2 values but the model has 3 free parameters/);
  });

  it('bad parameter definitions fail at creation', () => {
    expect(() => param('x', 5, { min: 0, max: 1 })).toThrow(/outside its bounds/);
    expect(() => param('x', 0, { min: 2, max: 1 })).toThrow(/min 2 is greater than max 1/);
    expect(() => param('1x', 0)).toThrow(/name "1x" is not valid/);
    expect(() => param('x', Number.NaN)).toThrow(/finite/);
  });

  it('a parameter value outside the slot domain names the slot and the parameter', () => {
    expect(() => disk({ diameter: param('d', -1) })).toThrow(
      /disk\.diameter \(parameter 'd'\): expected a number >= 0 mas/,
    );
    const free = disk({ diameter: param('d', 1) });
    expect(() => free.at([-2])).toThrow(/parameter 'd'/);
  });

  it('two different definitions under one name are an error', () => {
    expect(() => disk({ diameter: param('s', 1) }).plus(ring({ diameter: param('s', 2) }))).toThrow(
      /parameter 's' appears twice with different settings/,
    );
  });

  it('fixed parameters are not free and keep their value', () => {
    const g = sum(disk({ diameter: fixed(d) }), point().weight(f));
    expect(g.parameters()).toEqual(['flux']);
    expect(g.parameterInfo().map((p) => p.name)).toEqual(['diameter', 'flux']);
    expect(g.at([0.4]).terms()[0]!.factors[0]!.matrix[0]).toBe(2);
  });
});
