/**
 * Hostile model documents and trees: nesting deep enough to overflow a recursive walk, and radial-profile or
 * pixel-image nodes whose data a JSON document can set to anything. Each must be a ModelError naming the place,
 * never a RangeError or TypeError, and a valid tabulated model must equal its JSON copy.
 */
import { describe, expect, it } from 'vitest';
import { ModelError } from '../../src/errors.js';
import { disk, modelFromJSON, pixelImage, point, radialProfile } from '../../src/index.js';
import { MAX_MODEL_DEPTH } from '../../src/model/nodes.js';

function doc(model: unknown) {
  return { format: 'uvsky-model', version: 1, model };
}

function nested(depth: number): unknown {
  let node: unknown = { kind: 'point' };
  for (let i = 0; i < depth; i++) node = { kind: 'weight', flux: 1, of: node };
  return node;
}

function modelErrorOf(f: () => unknown): ModelError {
  try {
    f();
  } catch (e) {
    if (e instanceof ModelError) return e;
    throw e;
  }
  throw new Error('no error');
}

describe('deep nesting', () => {
  it(`a document nested ${MAX_MODEL_DEPTH - 1} deep reads; deeper ones (up to 100 000) are a ModelError`, () => {
    expect(modelFromJSON(doc(nested(MAX_MODEL_DEPTH - 1))).flux).toBe(1);
    for (const depth of [MAX_MODEL_DEPTH + 1, 3000, 100_000]) {
      expect(modelErrorOf(() => modelFromJSON(doc(nested(depth)))).message).toMatch(/deep/);
    }
  });

  it('a slot expression nested 100 000 arrays deep is a ModelError', () => {
    let field: unknown = 1;
    for (let i = 0; i < 100_000; i++) field = [field];
    const e = modelErrorOf(() =>
      modelFromJSON(
        doc({ kind: 'disk', diameter: { kind: 'powerLawSize', value: 1, reference: 2e-6, index: field } }),
      ),
    );
    expect(e.message).toMatch(/deep/);
  });

  it('chaining operators past the bound through the API is a ModelError naming the bound', () => {
    let m = disk({ diameter: 1 });
    for (let i = 1; i < MAX_MODEL_DEPTH; i++) m = m.weight(1);
    expect(modelErrorOf(() => m.shift(1, 0)).message).toContain(`more than ${MAX_MODEL_DEPTH}`);
  });
});

describe('tabulated components read from JSON', () => {
  const profile = (extra: object) =>
    doc({ kind: 'radialProfile', radii: [0, 1, 1], intensity: [1, 1, 0], maxFrequency: 0.5, ...extra });
  const image = (extra: object) =>
    doc({ kind: 'pixelImage', nx: 2, ny: 1, scale: 1, pixels: [1, 1], ...extra });

  it.each([
    ['radii out of order', profile({ radii: [1, 0, 2] }), 'model.radii[1]'],
    ['a negative intensity', profile({ intensity: [1, -1, 0] }), 'model.intensity[1]'],
    ['zero flux', profile({ intensity: [0, 0, 0] }), 'model.intensity'],
    ['lengths that differ', profile({ intensity: [1, 0] }), 'model.intensity'],
    ['a string sample', profile({ intensity: ['a', 1, 0] }), 'model.intensity[0]'],
    ['maxFrequency -1', profile({ maxFrequency: -1 }), 'model.maxFrequency'],
    ['no samples', doc({ kind: 'radialProfile' }), 'model.radii'],
    ['a grid that the pixels do not fill', image({ nx: 3 }), 'model.pixels'],
    ['nx = 0.5', image({ nx: 0.5, ny: 4 }), 'model.nx'],
    ['pixels summing to zero', image({ pixels: [1, -1] }), 'model.pixels'],
    ['pixels as a string', image({ pixels: 'ab' }), 'model.pixels'],
    ['no pixels', doc({ kind: 'pixelImage', scale: 1 }), 'model.pixels'],
  ])('%s is a ModelError at %s', (_what, d, path) => {
    const e = modelErrorOf(() => modelFromJSON(d));
    expect(e.location.modelPath).toBe(path);
  });

  it('a radial profile and a pixel image equal their JSON copies (compared by content, not identity)', () => {
    for (const m of [
      radialProfile({ radii: [0, 1, 1], intensity: [1, 1, 0], maxFrequency: 0.5 }).shift(1, 2),
      pixelImage({ nx: 3, pixels: [0, 1, 0, 1, 2, 1], scale: 0.5 }).plus(point()),
    ]) {
      const back = modelFromJSON(JSON.stringify(m));
      expect(back.equals(m)).toBe(true);
      expect(m.equals(back)).toBe(true);
    }
    const a = radialProfile({ radii: [0, 1, 1], intensity: [1, 1, 0], maxFrequency: 0.5 });
    const b = radialProfile({ radii: [0, 1, 1], intensity: [1, 0.5, 0], maxFrequency: 0.5 });
    expect(a.equals(b)).toBe(false);
  });
});
