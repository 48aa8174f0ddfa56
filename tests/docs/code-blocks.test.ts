/**
 * Every ```ts code block of README.md and docs/*.md (not docs/api, which typedoc writes) runs and exits 0, so
 * the documentation cannot drift from the code. Blocks check their own results with node:assert. The runner
 * itself is tested on blocks made here: a failing block must fail.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { extractBlocks, ROOT, rewriteImports, runBlock } from './code-blocks.js';

const files = [
  'README.md',
  ...readdirSync(join(ROOT, 'docs'))
    .filter((f) => f.endsWith('.md'))
    .sort()
    .map((f) => join('docs', f)),
];
const blocks = files.flatMap((f) => extractBlocks(readFileSync(join(ROOT, f), 'utf8'), f));

describe('the code-block runner', () => {
  it('finds ts blocks only, with the line of their fence', () => {
    const md = [
      '# t',
      '```sh',
      'npm test',
      '```',
      '',
      '```ts',
      'const a = 1;',
      '```',
      '```typescript',
      'a;',
      '```',
    ].join('\n');
    const found = extractBlocks(md, 'x.md');
    expect(found.map((b) => [b.line, b.code])).toEqual([
      [6, 'const a = 1;'],
      [9, 'a;'],
    ]);
  });

  it('points the package specifiers at the sources and refuses unknown ones', () => {
    expect(rewriteImports("import { disk } from 'uvsky';")).toMatch(/from '.*src\/index\.ts'/);
    expect(rewriteImports('import { fit } from "uvsky/fit";')).toMatch(/from ".*src\/fit\/index\.ts"/);
    expect(() => rewriteImports("import x from 'uvsky/nowhere';")).toThrow(/unknown import specifier/);
  });

  it('reports a block that throws as a failure', () => {
    const r = runBlock({
      file: 'made-here.md',
      line: 1,
      code: "import assert from 'node:assert/strict';\nassert.equal(1, 2);",
    });
    expect(r.status).not.toBe(0);
    expect(r.stderr).toContain('AssertionError');
  });
});

describe('documentation code blocks', () => {
  it('finds blocks in the README and in every guide', () => {
    for (const f of ['README.md', 'docs/getting-started.md', 'docs/cookbook.md']) {
      expect(
        blocks.some((b) => b.file === f),
        f,
      ).toBe(true);
    }
  });

  it.each(blocks.map((b) => [`${b.file}:${b.line}`, b] as const))('%s runs', (_, block) => {
    const r = runBlock(block);
    if (r.status !== 0) {
      throw new Error(`${block.file}:${block.line} exited ${r.status}\n${r.stderr}\n${r.stdout}`);
    }
  });
});
