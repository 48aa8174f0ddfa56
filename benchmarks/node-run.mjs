/**
 * Runs one benchmark of this directory against the built package, the way its users run it: plain node, the
 * library imported as 'uvsky' (the package's own exports, so dist/ as npm ships it, split into its chunks).
 *
 * The benchmark's TypeScript is bundled by esbuild with 'uvsky' and every npm package left external, so only
 * the benchmark's own code (and the few internal kernels a floor loop calls, from src/) is compiled here.
 * Running the TypeScript through a loader instead (tsx) measured the library 10 to 20 % slower, and unevenly
 * so between workloads, which would skew the ratios. `npm run build` must have run first (npm run bench does it).
 *
 * Usage: node benchmarks/node-run.mjs benchmarks/<file>.ts [arguments for the benchmark]
 */
import { spawnSync } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import { build } from 'esbuild';

const [file, ...args] = process.argv.slice(2);
if (file === undefined || !file.endsWith('.ts') || !existsSync(file)) {
  console.error('usage: node benchmarks/node-run.mjs benchmarks/<file>.ts [arguments]');
  process.exit(2);
}
if (!existsSync(new URL('../dist/index.js', import.meta.url))) {
  console.error('dist/ is missing: run `npm run build` first (npm run bench does)');
  process.exit(2);
}
// beside the source, so that import.meta.dirname in the benchmark still names benchmarks/
const out = file.replace(/\.ts$/, '.built.mjs');
await build({
  entryPoints: [file],
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  packages: 'external',
  external: ['uvsky', 'uvsky/*'],
  outfile: out,
  logLevel: 'warning',
});
try {
  const r = spawnSync(process.execPath, ['--expose-gc', out, ...args], { stdio: 'inherit' });
  process.exitCode = r.status ?? 1;
} finally {
  rmSync(out, { force: true });
}
