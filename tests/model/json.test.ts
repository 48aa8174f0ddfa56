/** The JSON form of models: round trips, the document shape, and errors that name the bad field. */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
  disk,
  ellipse,
  fixed,
  gaussian,
  MODEL_JSON_FORMAT,
  MODEL_JSON_VERSION,
  type Model,
  ModelError,
  modelFromJSON,
  param,
  point,
  ring,
  sum,
} from '../../src/index.js';
import { modelToJSON } from '../../src/model/json.js';
import type { ModelNode } from '../../src/model/nodes.js';
import { arbModel } from '../helpers/arbitraries.js';
import { arbParamModel } from '../helpers/arbitraries-params.js';

const SEED = 20240611;
const RUNS = 150;

function viaText(m: Model): Model {
  return modelFromJSON(JSON.parse(JSON.stringify(m)));
}

/** Parameters as plain records, so infinities and flags compare exactly. */
function infoOf(m: Model) {
  return m.parameterInfo().map((p) => ({ ...p }));
}

function deepFreeze<T>(x: T): T {
  if (typeof x === 'object' && x !== null) {
    for (const v of Object.values(x)) deepFreeze(v);
    Object.freeze(x);
  }
  return x;
}

function doc(model: unknown): Record<string, unknown> {
  return { format: 'uvsky-model', version: 1, model };
}

/** Runs modelFromJSON on `input` and returns the ModelError it throws (fails the test if none). */
function errorOf(input: unknown): ModelError {
  try {
    modelFromJSON(input);
  } catch (e) {
    expect(e).toBeInstanceOf(ModelError);
    return e as ModelError;
  }
  return expect.unreachable('modelFromJSON accepted the input');
}

describe('models round-trip through JSON', () => {
  it('random trees with parameters keep equals, toString, parameters and parameterInfo through JSON text', () => {
    fc.assert(
      fc.property(arbParamModel, (m) => {
        const text = JSON.stringify(m);
        const back = modelFromJSON(JSON.parse(text));
        expect(back.equals(m)).toBe(true);
        expect(m.equals(back)).toBe(true);
        expect(back.toString()).toBe(m.toString());
        expect(back.parameters()).toEqual(m.parameters());
        expect(infoOf(back)).toEqual(infoOf(m));
        expect(JSON.stringify(back)).toBe(text);
      }),
      { seed: SEED, numRuns: RUNS },
    );
  });

  it('random numeric trees round-trip through the object form and through the text form', () => {
    fc.assert(
      fc.property(arbModel, (m) => {
        const fromObject = modelFromJSON(m.toJSON());
        const fromText = modelFromJSON(JSON.stringify(m));
        expect(fromObject.equals(m)).toBe(true);
        expect(fromObject.toString()).toBe(m.toString());
        expect(fromText.toString()).toBe(m.toString());
      }),
      { seed: SEED + 1, numRuns: RUNS },
    );
  });

  it('every primitive and operator kind comes back with the same printed form', () => {
    const d = param('d', 2, { min: 0, max: 5 });
    const m = sum(
      disk({ diameter: d }).shift(1.5, -2),
      gaussian({ fwhm: 0.7 }).weight(param('f', 0.25, { min: 0, fixed: true })),
      ring({ diameter: d }).stretch(2, 0.5).rotate(30),
      ellipse({ major: 3, minor: 1, pa: param('pa', 40) }).incline(20, 10),
      point().convolve(gaussian({ fwhm: param('w', 0.3, { max: 1 }) })),
    );
    const back = viaText(m);
    expect(back.toString()).toBe(m.toString());
    expect(back.equals(m)).toBe(true);
    expect(back.parameters()).toEqual(['d', 'pa', 'w']);
    expect(infoOf(back)).toEqual(infoOf(m));
  });

  it('a tied parameter stays tied: one free parameter that moves every slot holding it', () => {
    const d = param('d', 2, { min: 0 });
    const m = disk({ diameter: d }).plus(ring({ diameter: d }).shift(3, 0));
    const back = viaText(m);
    expect(back.parameters()).toEqual(['d']);
    expect(back.at([4]).toString()).toBe('sum(disk({ diameter: 4 }), ring({ diameter: 4 }).shift(3, 0))');
  });

  it('fixed parameters stay fixed and out of the free list', () => {
    const m = disk({ diameter: fixed(param('d', 2, { min: 1, max: 3 })) }).weight(param('f', 1));
    const back = viaText(m);
    expect(back.parameters()).toEqual(['f']);
    expect(back.parameterInfo()[0]).toEqual({
      kind: 'param',
      name: 'd',
      value: 2,
      min: 1,
      max: 3,
      fixed: true,
    });
  });
});

describe('the JSON document', () => {
  it('has a format tag, a version and the node tree with slots in SLOT_NAMES order', () => {
    const m = disk({ diameter: param('d', 2, { min: 0 }) }).shift(1, 0);
    expect(m.toJSON()).toEqual({
      format: 'uvsky-model',
      version: 1,
      model: {
        kind: 'shift',
        east: 1,
        north: 0,
        of: { kind: 'disk', diameter: { kind: 'param', name: 'd', value: 2, min: 0, fixed: false } },
      },
    });
    expect(MODEL_JSON_FORMAT).toBe('uvsky-model');
    expect(MODEL_JSON_VERSION).toBe(1);
  });

  it('JSON.stringify of a model is the text of its toJSON document', () => {
    expect(JSON.stringify(point().weight(2))).toBe(
      '{"format":"uvsky-model","version":1,"model":{"kind":"weight","flux":2,"of":{"kind":"point"}}}',
    );
    const m = sum(point(), disk({ diameter: 1 }));
    expect(JSON.stringify(m)).toBe(JSON.stringify(m.toJSON()));
  });

  it('the doc examples give the results they show', () => {
    const m = disk({ diameter: param('d', 2, { min: 0 }) }).shift(1, 0);
    expect(modelFromJSON(JSON.parse(JSON.stringify(m))).toString()).toBe(
      "disk({ diameter: param('d', 2, { min: 0 }) }).shift(1, 0)",
    );
    expect(() => modelFromJSON(doc({ kind: 'disk', diameter: 'abc' }))).toThrow(
      /^modelFromJSON: model\.diameter: expected a finite number, a param .*, got "abc"/,
    );
  });

  it('infinite bounds are left out, and a bound left out or null reads back as infinite', () => {
    const m = disk({ diameter: param('d', 2, { max: 4 }) }).shift(param('e', 1), 0);
    const j = m.toJSON().model as unknown as { east: object; of: { diameter: object } };
    expect(j.of.diameter).toEqual({ kind: 'param', name: 'd', value: 2, max: 4, fixed: false });
    expect(j.east).toEqual({ kind: 'param', name: 'e', value: 1, fixed: false });
    const nulls = modelFromJSON(
      doc({ kind: 'disk', diameter: { kind: 'param', name: 'd', value: 2, min: null, max: null } }),
    );
    expect(nulls.parameterInfo()[0]).toEqual({
      kind: 'param',
      name: 'd',
      value: 2,
      min: Number.NEGATIVE_INFINITY,
      max: Number.POSITIVE_INFINITY,
      fixed: false,
    });
  });

  it('a param written by JSON.stringify straight from the Param object (bounds as null) reads back', () => {
    const p = param('x', 1.5, { min: 0 });
    const text = `{"format":"uvsky-model","version":1,"model":{"kind":"gaussian","fwhm":${JSON.stringify(p)}}}`;
    expect(modelFromJSON(text).parameterInfo()[0]).toEqual({ ...p });
  });

  it('-0 is written as 0 in the object form, as JSON.stringify writes it', () => {
    const j = point().shift(-0, 1).toJSON().model as unknown as { east: number };
    expect(Object.is(j.east, 0)).toBe(true);
  });

  it('the document is fresh, unfrozen plain data', () => {
    const m = disk({ diameter: 1 });
    const a = m.toJSON();
    expect(Object.isFrozen(a)).toBe(false);
    expect(a).not.toBe(m.toJSON());
    expect(a.model).not.toBe(m.node);
  });

  it('slot expressions are written field by field, with the params inside them written as params', () => {
    const node = {
      kind: 'disk',
      diameter: {
        kind: 'powerLawOf',
        reference: 2.2,
        label: 'K band',
        log: true,
        index: param('beta', -1, { min: -4 }),
        knots: [1, { kind: 'param', name: 'k', value: 0, min: 0, max: 0, fixed: true }],
      },
    } as unknown as ModelNode;
    expect(modelToJSON({ node }).model).toEqual({
      kind: 'disk',
      diameter: {
        kind: 'powerLawOf',
        reference: 2.2,
        label: 'K band',
        log: true,
        index: { kind: 'param', name: 'beta', value: -1, min: -4, fixed: false },
        knots: [1, { kind: 'param', name: 'k', value: 0, min: 0, max: 0, fixed: true }],
      },
    });
  });

  it('writing a node of a kind missing from SLOT_NAMES fails and lists the known kinds', () => {
    const node = { kind: 'sum', of: [{ kind: 'point' }, { kind: 'blob' }] } as unknown as ModelNode;
    expect(() => modelToJSON({ node })).toThrow(
      /^toJSON: model\.of\[1\]\.kind: unknown node kind "blob"; known kinds: point, disk/,
    );
  });

  it('data fields of a node follow its slots, and typed arrays are written as arrays', () => {
    const node = {
      kind: 'disk',
      samples: new Float64Array([0.5, -0]),
      diameter: 1,
    } as unknown as ModelNode;
    const j = modelToJSON({ node }).model;
    expect(Object.keys(j)).toEqual(['kind', 'diameter', 'samples']);
    expect(j['samples']).toEqual([0.5, 0]);
  });

  it('writing a slot expression that holds a non-finite number fails with its path', () => {
    const node = {
      kind: 'weight',
      flux: { kind: 'powerLawOf', index: Number.POSITIVE_INFINITY },
      of: { kind: 'point' },
    } as unknown as ModelNode;
    expect(() => modelToJSON({ node })).toThrow(
      /^toJSON: model\.flux\.index is Infinity, which JSON cannot hold/,
    );
  });
});

describe('malformed JSON fails with a ModelError naming the path', () => {
  const P = { kind: 'point' };
  const cases: ReadonlyArray<readonly [string, unknown, string | undefined, RegExp]> = [
    // non-object input
    ['null', null, undefined, /expected a model document .*got null/],
    ['a number', 3, undefined, /expected a model document .*got 3/],
    ['an array', [P], undefined, /got an array/],
    ['a boolean', true, undefined, /got boolean/],
    ['invalid JSON text', '{"format": ', undefined, /the text is not valid JSON/],
    // the envelope
    ['a wrong format', { ...doc(P), format: 'other' }, 'format', /expected 'uvsky-model', got "other"/],
    ['a missing format', { version: 1, model: P }, 'format', /expected 'uvsky-model', got undefined/],
    [
      'a newer version',
      { ...doc(P), version: 2 },
      'version',
      /expected 1, got 2 \(written by a newer uvsky\?\)/,
    ],
    ['a version given as a string', { ...doc(P), version: '1' }, 'version', /expected 1, got "1"/],
    ['a missing version', { format: 'uvsky-model', model: P }, 'version', /expected 1, got undefined/],
    [
      'a missing model',
      { format: 'uvsky-model', version: 1 },
      'model',
      /missing; expected the root model node/,
    ],
    [
      'an extra top-level field',
      { ...doc(P), comment: 'x' },
      'comment',
      /unexpected field .*format, version, model/,
    ],
    // nodes
    [
      'a node that is a string',
      doc('disk'),
      'model',
      /expected a model node \(\{ kind, \.\.\. \}\), got "disk"/,
    ],
    [
      'a missing kind',
      doc({ diameter: 1 }),
      'model.kind',
      /unknown node kind undefined; known kinds: point, disk/,
    ],
    [
      'an unknown kind',
      doc({ kind: 'blob' }),
      'model.kind',
      /unknown node kind "blob"; known kinds: .*convolve/,
    ],
    ['a kind inherited from Object', doc({ kind: 'toString' }), 'model.kind', /unknown node kind "toString"/],
    ['a kind that is a slot kind', doc({ kind: 'param' }), 'model.kind', /unknown node kind "param"/],
    [
      'a missing slot',
      doc({ kind: 'disk' }),
      'model.diameter',
      /missing from a disk node; expected a finite number/,
    ],
    [
      'a misspelt slot',
      doc({ kind: 'disk', diamter: 1 }),
      'model.diamter',
      /unexpected field .*kind, diameter$/,
    ],
    ['a primitive with children', doc({ kind: 'disk', diameter: 1, of: P }), 'model.of', /unexpected field/],
    [
      'a missing child',
      doc({ kind: 'rotate', pa: 1 }),
      'model.of',
      /expected the model node .*got undefined/,
    ],
    ['a unary child given as an array', doc({ kind: 'rotate', pa: 1, of: [P] }), 'model.of', /got an array/],
    [
      'a sum of nothing',
      doc({ kind: 'sum', of: [] }),
      'model.of',
      /one or more model nodes, got an array of 0/,
    ],
    [
      'a sum of a single node',
      doc({ kind: 'sum', of: P }),
      'model.of',
      /one or more model nodes, got an object/,
    ],
    [
      'a convolution of three',
      doc({ kind: 'convolve', of: [P, P, P] }),
      'model.of',
      /exactly two model nodes, got an array of 3/,
    ],
    [
      'a bad node deep in the tree',
      doc({ kind: 'sum', of: [P, P, { kind: 'rotate', pa: 0, of: { kind: 'ring' } }] }),
      'model.of[2].of.diameter',
      /missing from a ring node/,
    ],
    // slots
    [
      'a string in a slot',
      doc({ kind: 'sum', of: [P, P, { kind: 'shift', east: 'abc', north: 0, of: P }] }),
      'model.of[2].east',
      /for the east slot of a shift node, got "abc" \(numbers are written as JSON numbers, not strings\)/,
    ],
    ['a "NaN" string', doc({ kind: 'disk', diameter: 'NaN' }), 'model.diameter', /got "NaN"/],
    [
      'an "Infinity" string',
      doc({ kind: 'weight', flux: 'Infinity', of: P }),
      'model.flux',
      /got "Infinity"/,
    ],
    ['a number as a string', doc({ kind: 'disk', diameter: '1.5' }), 'model.diameter', /got "1\.5"/],
    ['NaN in the object form', doc({ kind: 'disk', diameter: Number.NaN }), 'model.diameter', /got NaN/],
    ['null in a slot', doc({ kind: 'disk', diameter: null }), 'model.diameter', /got null/],
    ['an array in a slot', doc({ kind: 'disk', diameter: [1] }), 'model.diameter', /got an array/],
    [
      'a slot object with no kind',
      doc({ kind: 'disk', diameter: { value: 1 } }),
      'model.diameter.kind',
      /slot kind/,
    ],
    // params
    [
      'a param with min > max',
      doc({ kind: 'disk', diameter: { kind: 'param', name: 'd', value: 1, min: 3, max: 2 } }),
      'model.diameter.min',
      /3 is greater than max 2; give min <= max/,
    ],
    [
      'a param value outside its bounds',
      doc({ kind: 'disk', diameter: { kind: 'param', name: 'd', value: 5, max: 2 } }),
      'model.diameter',
      /value 5 lies outside its bounds \[-Infinity, 2\]/,
    ],
    [
      'a param with no value',
      doc({ kind: 'disk', diameter: { kind: 'param', name: 'd' } }),
      'model.diameter.value',
      /missing; parameter 'd' needs a finite number/,
    ],
    [
      'a param value given as a string',
      doc({ kind: 'disk', diameter: { kind: 'param', name: 'd', value: '2' } }),
      'model.diameter.value',
      /expected a finite number, got "2"/,
    ],
    [
      'a param with no name',
      doc({ kind: 'disk', diameter: { kind: 'param', value: 2 } }),
      'model.diameter.name',
      /expected a parameter name \(a string\), got undefined/,
    ],
    [
      'a param with a malformed name',
      doc({ kind: 'disk', diameter: { kind: 'param', name: '1d', value: 2 } }),
      'model.diameter',
      /name "1d" is not valid; use a letter/,
    ],
    [
      'a bound given as a string',
      doc({ kind: 'disk', diameter: { kind: 'param', name: 'd', value: 2, min: '0' } }),
      'model.diameter.min',
      /expected a number, or the field left out \(or null\) for no bound, got "0"/,
    ],
    [
      'a fixed flag that is not a boolean',
      doc({ kind: 'disk', diameter: { kind: 'param', name: 'd', value: 2, fixed: 'yes' } }),
      'model.diameter.fixed',
      /expected true, false or the field left out \(false\), got "yes"/,
    ],
    [
      'an extra param field',
      doc({ kind: 'disk', diameter: { kind: 'param', name: 'd', value: 2, step: 1 } }),
      'model.diameter.step',
      /unexpected field in a param; its fields are kind, name, value, min, max, fixed/,
    ],
    [
      'a bad param inside a slot expression',
      doc({
        kind: 'disk',
        diameter: { kind: 'powerLawOf', index: { kind: 'param', name: 'b', value: 1, min: 2 } },
      }),
      'model.diameter.index',
      /value 1 lies outside its bounds \[2, Infinity\]/,
    ],
    [
      'a null inside a slot expression',
      doc({ kind: 'disk', diameter: { kind: 'powerLawOf', index: null } }),
      'model.diameter.index',
      /expected a number, string, boolean, slot or array of these, got null/,
    ],
    // values the model itself refuses, re-rooted at the JSON path
    [
      'a negative diameter',
      doc({ kind: 'sum', of: [P, { kind: 'disk', diameter: -1 }] }),
      'model.of[1].diameter',
      /^modelFromJSON: model\.of\[1\]\.diameter: expected a number >= 0 mas, got -1$/,
    ],
    [
      'tied params with different settings',
      doc({
        kind: 'sum',
        of: [
          { kind: 'disk', diameter: { kind: 'param', name: 'd', value: 1 } },
          { kind: 'disk', diameter: { kind: 'param', name: 'd', value: 2 } },
        ],
      }),
      'model.of[1].diameter',
      /parameter 'd' appears twice with different settings/,
    ],
    [
      'a slot expression the model does not know',
      doc({ kind: 'disk', diameter: { kind: 'notASlotKind', x: 1 } }),
      'model.diameter',
      /^modelFromJSON: model\.diameter: /,
    ],
  ];

  it.each(cases)('%s', (_name, input, path, message) => {
    const e = errorOf(input);
    expect(e.message).toMatch(message);
    expect(e.message.startsWith('modelFromJSON: ')).toBe(true);
    expect(e.location.modelPath).toBe(path);
    if (path !== undefined) expect(e.message).toContain(`modelFromJSON: ${path}: `);
  });

  it('bad params report the parameter name in the location', () => {
    const e = errorOf(
      doc({ kind: 'disk', diameter: { kind: 'param', name: 'd', value: 1, min: 3, max: 2 } }),
    );
    expect(e.location.parameter).toBe('d');
  });
});

describe('reading never changes its input', () => {
  it('a deep-frozen document is read as is, and the model does not share its objects', () => {
    const m = sum(disk({ diameter: param('d', 2, { min: 0 }) }).shift(1, 2), point().weight(0.5));
    const input = deepFreeze(JSON.parse(JSON.stringify(m)));
    const before = JSON.stringify(input);
    const back = modelFromJSON(input);
    expect(JSON.stringify(input)).toBe(before);
    expect(back.equals(m)).toBe(true);
    expect(back.node).not.toBe(input.model);
  });

  it('an unfrozen document is left unfrozen and unchanged', () => {
    const input = JSON.parse(JSON.stringify(disk({ diameter: param('d', 2) }).rotate(10)));
    const copy = structuredClone(input);
    modelFromJSON(input);
    expect(input).toEqual(copy);
    expect(Object.isFrozen(input)).toBe(false);
    expect(Object.isFrozen(input.model.of)).toBe(false);
  });

  it('deep-frozen malformed documents are left as they were when reading fails', () => {
    for (const [, input] of cases()) {
      const frozen = deepFreeze(structuredClone(input));
      const before = JSON.stringify(frozen);
      expect(() => modelFromJSON(frozen)).toThrow(ModelError);
      expect(JSON.stringify(frozen)).toBe(before);
    }
  });

  function cases(): [string, unknown][] {
    const P = { kind: 'point' };
    return [
      ['bad slot', doc({ kind: 'sum', of: [P, { kind: 'shift', east: 'abc', north: 0, of: P }] })],
      ['bad param', doc({ kind: 'disk', diameter: { kind: 'param', name: 'd', value: 1, min: 3, max: 2 } })],
      ['domain', doc({ kind: 'sum', of: [P, { kind: 'disk', diameter: -1 }] })],
      ['kind', doc({ kind: 'sum', of: [P, { kind: 'blob' }] })],
    ];
  }
});
