/**
 * Fuzzing with fast-check (fixed seeds, bounded runs; tests/robustness/long-fuzz.ts runs the same properties longer): damaged
 * OIFITS files read or fail with a UvskyError in bounded time and memory, and random model trees over every
 * component kind evaluate to finite values and survive a JSON round trip. The properties and their bounds are
 * in ./properties.ts.
 */
import { describe, expect, it } from 'vitest';
import { fuzzModels, fuzzOifits, READ_TIME_LIMIT_MS, seedFiles } from './properties.js';

/** Damaged copies per seed file (about 0.3 s per 150 on this machine; tests/robustness/long-fuzz.ts runs thousands). */
const RUNS_PER_FILE = 400;
/** Random model trees (about 0.1 s per 150). */
const MODEL_RUNS = 400;

describe('damaged OIFITS files', () => {
  it.each(seedFiles().map(([name, bytes], i) => [name, bytes, 1000 + i] as const))(
    'damaged copies of %s read or throw a UvskyError, in bounded time and memory',
    (_name, good, seed) => {
      const tally = fuzzOifits(good, seed, RUNS_PER_FILE);
      // the damages must reach the reader's error paths, and some copies (flips inside data) still read
      expect(tally.error).toBeGreaterThan(RUNS_PER_FILE / 4);
      expect(tally.read).toBeGreaterThan(0);
      expect(tally.slowestMs).toBeLessThan(READ_TIME_LIMIT_MS);
    },
  );
});

describe('random model trees over every component kind', () => {
  it('evaluate to finite values with |V| <= 1 and survive a JSON round trip', () => {
    fuzzModels(7, MODEL_RUNS);
  });
});
