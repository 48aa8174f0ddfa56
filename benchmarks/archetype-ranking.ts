/**
 * How often `compareArchetypes` ranks the true archetype first, over many noise seeds.
 *
 * Run: `npx tsx benchmarks/archetype-ranking.ts [seeds=100] [criterion=bic]`. For each archetype of
 * tests/fit/archetypes-fixture.ts (same array, target, errors and observables as the unit test), simulates
 * `seeds` noisy datasets (seeds 1..N), runs `compareArchetypes` and counts the datasets where the true
 * archetype has rank 1. Prints the success rate per archetype with the one-sided 95 % lower bound on the true
 * rate (Clopper-Pearson, found by bisection on the binomial tail), the failures, and the time per dataset.
 */
import { compareArchetypes } from '../src/fit/archetypes.js';
import type { InformationCriterion } from '../src/fit/compare.js';
import { simulate } from '../src/oifits/index.js';
import { OBSERVABLES, plannedObservation, TRUTHS } from '../tests/fit/archetypes-fixture.js';

/** P(X >= k) for X ~ Binomial(n, p). */
function upperTail(k: number, n: number, p: number): number {
  let term = (1 - p) ** n;
  let sum = k <= 0 ? term : 0;
  for (let i = 1; i <= n; i++) {
    term *= ((n - i + 1) / i) * (p / (1 - p));
    if (i >= k) sum += term;
  }
  return sum;
}

/** One-sided 95 % lower confidence bound on p after k successes in n trials (Clopper-Pearson). */
function lowerBound(k: number, n: number): number {
  if (k === 0) return 0;
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (lo + hi);
    if (upperTail(k, n, mid) < 0.05) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

const seeds = Number(process.argv[2] ?? 100);
const criterion = (process.argv[3] ?? 'bic') as InformationCriterion;
const planned = plannedObservation();
console.log(
  `archetype ranking: ${seeds} seeds per archetype, criterion ${criterion}, observables ${OBSERVABLES.join(', ')}`,
);
for (const [name, truth] of Object.entries(TRUTHS)) {
  let ok = 0;
  const failures: string[] = [];
  const t0 = performance.now();
  for (let seed = 1; seed <= seeds; seed++) {
    const data = simulate(truth, planned, { noise: true, seed }).dataset;
    const table = compareArchetypes(data, { observables: OBSERVABLES, criterion });
    if (table.best.name === name) ok++;
    else {
      const row = table.rows.find((r) => r.name === name)!;
      failures.push(
        `seed ${seed}: ${table.best.name} first, ${name} at delta ${criterion} ${(criterion === 'bic' ? row.deltaBic : row.deltaAic).toFixed(2)}`,
      );
    }
  }
  const ms = (performance.now() - t0) / seeds;
  console.log(
    `${name.padEnd(9)} ${ok}/${seeds} first (${((100 * ok) / seeds).toFixed(1)} %, 95 % lower bound ${(100 * lowerBound(ok, seeds)).toFixed(1)} %), ${ms.toFixed(0)} ms per dataset`,
  );
  for (const f of failures) console.log(`    ${f}`);
}
