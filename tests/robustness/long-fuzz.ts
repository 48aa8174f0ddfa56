/**
 * A longer run of the robustness fuzz properties (tests/robustness/properties.ts): damaged OIFITS files must
 * read or throw a UvskyError within the time and memory bounds, and random model trees must evaluate to finite
 * values and survive a JSON round trip.
 *
 * Usage: npm run fuzz -- [seed] [runs]
 *   seed - fast-check seed (default: the current time, printed so that a failure can be replayed)
 *   runs - cases per seed file and for the models (default 2000)
 *
 * Exits with status 1 and fast-check's counterexample (seed and path) on the first failing case.
 */
import { fuzzModels, fuzzOifits, seedFiles } from './properties.js';

function argInt(text: string | undefined, fallback: number, what: string): number {
  if (text === undefined) return fallback;
  const n = Number(text);
  if (!Number.isSafeInteger(n)) {
    console.error(`fuzz: ${what} must be an integer, got ${JSON.stringify(text)}`);
    process.exit(2);
  }
  return n;
}

const seed = argInt(process.argv[2], Date.now() % 2 ** 31, 'seed');
const runs = argInt(process.argv[3], 2000, 'runs');
console.log(`fuzz: seed ${seed}, ${runs} cases per property`);
let failed = false;
for (const [name, bytes] of seedFiles()) {
  const t0 = performance.now();
  try {
    const t = fuzzOifits(bytes, seed, runs);
    console.log(
      `  ${name}: ${t.read} read, ${t.error} UvskyError; slowest ${t.slowestMs.toFixed(0)} ms, most typed-array memory ${t.largestArrayBuffers} bytes (file ${bytes.length}); ${((performance.now() - t0) / 1000).toFixed(1)} s`,
    );
  } catch (e) {
    failed = true;
    console.error(`  ${name}: FAILED\n${(e as Error).message}`);
  }
}
const t0 = performance.now();
try {
  fuzzModels(seed, runs);
  console.log(`  models: ${runs} trees passed; ${((performance.now() - t0) / 1000).toFixed(1)} s`);
} catch (e) {
  failed = true;
  console.error(`  models: FAILED\n${(e as Error).message}`);
}
process.exit(failed ? 1 : 0);
