/**
 * Extracting the ```ts code blocks of Markdown files and running each as its own ES module under tsx, with the
 * package's import specifiers ('uvsky', 'uvsky/oifits', ...) pointed at the sources. Every block must be
 * self-contained: it imports what it uses and builds its own data.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

/** The package's sub-paths and the source files they are built from (tsup.config.ts). */
export const SPECIFIERS: Record<string, string> = {
  uvsky: join(ROOT, 'src', 'index.ts'),
  'uvsky/oifits': join(ROOT, 'src', 'oifits', 'index.ts'),
  'uvsky/oifits/node': join(ROOT, 'src', 'oifits', 'node.ts'),
  'uvsky/fit': join(ROOT, 'src', 'fit', 'index.ts'),
  'uvsky/plots': join(ROOT, 'src', 'plots', 'index.ts'),
};

/** A code block: the file it is in, the line its fence opens on (from 1), and its text. */
export interface CodeBlock {
  readonly file: string;
  readonly line: number;
  readonly code: string;
}

/** The ```ts (or ```typescript) blocks of a Markdown text, in order. Other languages are left alone. */
export function extractBlocks(markdown: string, file: string): CodeBlock[] {
  const out: CodeBlock[] = [];
  const lines = markdown.split('\n');
  for (let i = 0; i < lines.length; i++) {
    const open = /^(\s*)(```+|~~~+)\s*(ts|typescript)\s*$/.exec(lines[i]!);
    if (!open) continue;
    const fence = open[2]!;
    const body: string[] = [];
    let j = i + 1;
    while (j < lines.length && lines[j]!.trim() !== fence) body.push(lines[j++]!);
    if (j >= lines.length) throw new Error(`${file}:${i + 1}: code block is not closed`);
    out.push({ file, line: i + 1, code: body.join('\n') });
    i = j;
  }
  return out;
}

/** Replaces the package's import specifiers by absolute paths of the sources. */
export function rewriteImports(code: string): string {
  return code.replace(
    /(from\s+|import\s*\(\s*)(['"])(uvsky(?:\/[\w/]+)?)\2/g,
    (_all, pre: string, q: string, spec: string) => {
      const target = SPECIFIERS[spec];
      if (target === undefined)
        throw new Error(`unknown import specifier '${spec}'; known: ${Object.keys(SPECIFIERS).join(', ')}`);
      return `${pre}${q}${target}${q}`;
    },
  );
}

/** The outcome of running a block. */
export interface BlockRun {
  readonly status: number | null;
  readonly stdout: string;
  readonly stderr: string;
}

const TSX = join(ROOT, 'node_modules', '.bin', 'tsx');

/** Runs a block as an ES module (.mts, so top-level await works) in a fresh temporary directory. */
export function runBlock(block: CodeBlock): BlockRun {
  const dir = mkdtempSync(join(tmpdir(), 'uvsky-doc-'));
  const file = join(dir, 'block.mts');
  writeFileSync(file, `${rewriteImports(block.code)}\n`);
  const r = spawnSync(TSX, [file], { cwd: dir, encoding: 'utf8', timeout: 120_000 });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}
