import { defineConfig } from 'tsup';

export default defineConfig({
  entry: {
    index: 'src/index.ts',
    'oifits/index': 'src/oifits/index.ts',
    'oifits/node': 'src/oifits/node.ts',
    'fit/index': 'src/fit/index.ts',
  },
  format: ['esm', 'cjs'],
  dts: true,
  sourcemap: true,
  clean: true,
  target: 'node20',
  treeshake: true,
  splitting: true,
});
