/**
 * Robustness: truncated and bit-flipped copies of the astropy fixtures either read or throw a UvskyError,
 * never another exception (and never hang: every loop of the reader is bounded by the file's length).
 * fast-check with fixed seeds and bounded runs.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { UvskyError } from '../../src/errors.js';
import { readOifits } from '../../src/oifits/index.js';
import { fixture } from './helpers.js';

function readsOrThrowsUvsky(bytes: Uint8Array): 'read' | 'error' {
  try {
    readOifits(bytes, { name: 'fuzz.fits' });
    return 'read';
  } catch (e) {
    if (e instanceof UvskyError) return 'error';
    throw e;
  }
}

describe.each(['kestrel_v2.fits', 'kestrel_v1.fits'])('damaged copies of %s', (name) => {
  const good = fixture(name);

  it('every truncation reads or throws a UvskyError', () => {
    const outcomes = new Set<string>();
    fc.assert(
      fc.property(fc.integer({ min: 0, max: good.length - 1 }), (n) => {
        outcomes.add(readsOrThrowsUvsky(good.slice(0, n)));
      }),
      { seed: 1234, numRuns: 150 },
    );
    expect(outcomes.has('error')).toBe(true);
  });

  it('bit flips read or throw a UvskyError', () => {
    const outcomes = new Set<string>();
    fc.assert(
      fc.property(
        fc.array(fc.tuple(fc.integer({ min: 0, max: good.length - 1 }), fc.integer({ min: 0, max: 7 })), {
          minLength: 1,
          maxLength: 8,
        }),
        (flips) => {
          const bytes = good.slice();
          for (const [at, bit] of flips) bytes[at] = bytes[at]! ^ (1 << bit);
          outcomes.add(readsOrThrowsUvsky(bytes));
        },
      ),
      { seed: 4321, numRuns: 300 },
    );
    // Flips in the data mostly still read; flips in headers mostly fail: both must occur.
    expect(outcomes).toEqual(new Set(['read', 'error']));
  });

  it('flips confined to the headers read or throw a UvskyError', () => {
    const text = Buffer.from(good).toString('latin1');
    const headerBytes: number[] = [];
    // Header blocks are the ones starting with a keyword card such as SIMPLE or XTENSION.
    for (let b = 0; b < good.length; b += 2880) {
      if (/^(SIMPLE {2}=|XTENSION=)/.test(text.slice(b, b + 10)))
        for (let i = 0; i < 2880 * 2 && b + i < good.length; i++) headerBytes.push(b + i);
    }
    fc.assert(
      fc.property(fc.constantFrom(...headerBytes), fc.integer({ min: 0, max: 7 }), (at, bit) => {
        const bytes = good.slice();
        bytes[at] = bytes[at]! ^ (1 << bit);
        readsOrThrowsUvsky(bytes);
      }),
      { seed: 99, numRuns: 300 },
    );
  });
});
