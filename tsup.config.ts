import { readFileSync } from 'node:fs';
import { defineConfig } from 'tsup';

const { version } = JSON.parse(readFileSync('package.json', 'utf8')) as { version: string };

export default defineConfig({
  entry: {
    index: 'src/index.ts',
    'oifits/index': 'src/oifits/index.ts',
    'oifits/node': 'src/oifits/node.ts',
    'fit/index': 'src/fit/index.ts',
    // worker threads import this module by its own URL, so it is a file of its own in dist
    'observe/parallel': 'src/observe/parallel.ts',
    'plots/index': 'src/plots/index.ts',
    // the `uvsky` bin (package.json "bin"); its shebang line is kept by the bundler
    'cli/uvsky': 'src/cli/uvsky.ts',
  },
  format: ['esm', 'cjs'],
  dts: true,
  sourcemap: true,
  clean: true,
  target: 'node20',
  treeshake: true,
  splitting: true,
  // optional dependencies, imported only when toSvg is called
  external: ['vega', 'vega-lite'],
  define: { __UVSKY_VERSION__: JSON.stringify(version) },
});
