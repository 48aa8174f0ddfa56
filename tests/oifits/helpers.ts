/** Shared helpers of the OIFITS tests: fixtures, astropy's expected values, raw (unvalidated) file building. */
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { OiTable } from '../../src/oifits/dataset.js';
import { encodeTable } from '../../src/oifits/fits/bintable.js';
import { type HduOut, joinHdus } from '../../src/oifits/fits/hdu.js';
import type { HeaderCard } from '../../src/oifits/fits/header.js';

export const FIXTURES = join(dirname(fileURLToPath(import.meta.url)), '..', 'fixtures', 'oifits');

export function fixture(name: string): Uint8Array {
  const b = readFileSync(join(FIXTURES, name));
  return new Uint8Array(b.buffer, b.byteOffset, b.byteLength);
}

export interface DumpColumn {
  name: string;
  format: string;
  unit: string | null;
  dim: string | null;
  null: number | null;
  values: Array<number | string | boolean>;
}
export interface DumpHdu {
  index: number;
  xtension: string;
  extname: string | null;
  header: Record<string, string | number | boolean>;
  nrows?: number;
  columns?: DumpColumn[];
}
export interface Dump {
  astropy: string;
  hdus: DumpHdu[];
}

export function expected(name: string): Dump {
  return JSON.parse(readFileSync(join(FIXTURES, name), 'utf8')) as Dump;
}

/** JSON stand-ins of astropy's dump for non-finite floats. */
export function fromJson(x: number | string | boolean): number | string | boolean {
  if (x === 'NaN') return Number.NaN;
  if (x === 'Infinity') return Number.POSITIVE_INFINITY;
  if (x === '-Infinity') return Number.NEGATIVE_INFINITY;
  return x;
}

export const PYTHON = '/usr/bin/python3';
export const hasAstropy =
  existsSync(PYTHON) && spawnSync(PYTHON, ['-c', 'import astropy'], { encoding: 'utf8' }).status === 0;
export const hasFitsverify = spawnSync('which', ['fitsverify'], { encoding: 'utf8' }).status === 0;

/** Runs astropy (dump_fits.py) on a file and returns its dump. */
export function astropyDump(path: string): Dump {
  const r = spawnSync(PYTHON, [join(FIXTURES, 'dump_fits.py'), path], {
    encoding: 'utf8',
    maxBuffer: 1 << 28,
  });
  if (r.status !== 0) throw new Error(`dump_fits.py failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as Dump;
}

/** A table to write without any validation. */
export interface RawTable {
  readonly cards: readonly HeaderCard[];
  readonly columns: OiTable['columns'];
  readonly nrows: number;
}

export function rawFromOi(t: OiTable): RawTable {
  return {
    cards: [
      { keyword: 'EXTNAME', kind: 'string', value: t.extname },
      ...t.header.cards.filter((c) => c.kind === 'commentary' || c.keyword !== 'EXTNAME'),
    ],
    columns: t.columns,
    nrows: t.nrows,
  };
}

/** Builds a FITS file from a primary header and tables, bypassing every OIFITS check of the writer. */
export function buildRaw(primary: readonly HeaderCard[], tables: readonly RawTable[]): Uint8Array {
  const hdus: HduOut[] = [{ cards: primary, data: new Uint8Array(0) }];
  for (const t of tables) hdus.push(encodeTable(t.cards, t.columns, t.nrows));
  return joinHdus(hdus);
}
