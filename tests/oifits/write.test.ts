/**
 * Writing OIFITS 2: read -> write -> read is exact for every table and column; the written files pass
 * fitsverify (HEASARC, Debian package fitsverify) with no errors, and astropy.io.fits reads back every value.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { type OifitsDataset, type OiTable, readOifits, writeOifits } from '../../src/oifits/index.js';
import { astropyDump, fixture, fromJson, hasAstropy, hasFitsverify } from './helpers.js';

const DATE = '2024-06-01T00:00:00';

function tablesOf(ds: OifitsDataset): OiTable[] {
  const t = ds.tables;
  return [...t.target, ...t.array, ...t.wavelength, ...t.corr, ...t.vis, ...t.vis2, ...t.t3, ...t.flux];
}

function expectSameTables(a: OifitsDataset, b: OifitsDataset): void {
  const ta = tablesOf(a);
  const tb = tablesOf(b);
  expect(tb.map((t) => t.extname)).toEqual(ta.map((t) => t.extname));
  ta.forEach((x, i) => {
    const y = tb[i]!;
    expect(y.nrows).toBe(x.nrows);
    expect(y.revision).toBe(x.revision);
    expect(y.columns.map((c) => [c.name, c.tform, c.unit, c.dim, c.tnull])).toEqual(
      x.columns.map((c) => [c.name, c.tform, c.unit, c.dim, c.tnull]),
    );
    x.columns.forEach((c, k) => {
      const d = y.columns[k]!.data as ArrayLike<unknown>;
      const e = c.data as ArrayLike<unknown>;
      expect(d.constructor).toBe(e.constructor);
      for (let q = 0; q < e.length; q++) {
        if (!Object.is(d[q], e[q])) throw new Error(`${x.extname}.${c.name}[${q}]: ${d[q]} != ${e[q]}`);
      }
    });
    for (const card of x.header.cards) {
      if (card.kind === 'commentary' || /^(EXTVER|NAXIS1|TFORM|TTYPE)/.test(card.keyword)) continue;
      expect(y.header.get(card.keyword), `${x.extname} ${card.keyword}`).toEqual(card.value);
    }
  });
}

describe('writeOifits', () => {
  const v2 = readOifits(fixture('kestrel_v2.fits'), { name: 'kestrel_v2.fits' });
  const v1 = readOifits(fixture('kestrel_v1.fits'), { name: 'kestrel_v1.fits' });

  it('round-trips read -> write -> read exactly for every table, column and keyword', () => {
    const back = readOifits(writeOifits(v2, { date: DATE }));
    expectSameTables(v2, back);
    for (const key of ['value', 'error', 'u', 'v', 'mjd', 'flag'] as const) {
      expect(Array.from(back.vis2[key])).toEqual(Array.from(v2.vis2[key]));
    }
    expect(back.primary.get('REFERENC')).toBe(v2.primary.get('REFERENC'));
    expect(back.primary.get('OBSERVER')).toBe('A. Nobody');
  });

  it('writes a file whose second write is byte-identical (a fixed point)', () => {
    const once = writeOifits(v2, { date: DATE });
    const twice = writeOifits(readOifits(once), { date: DATE });
    expect(Buffer.from(twice).equals(Buffer.from(once))).toBe(true);
    expect(once.length % 2880).toBe(0);
  });

  it('upgrades OIFITS 1 to OIFITS 2 with the mandatory primary keywords and OI_REVN = 2', () => {
    const back = readOifits(writeOifits(v1, { date: DATE, primary: { OBSERVER: 'B. Somebody' } }));
    expect(back.version).toBe(2);
    for (const kw of [
      'ORIGIN',
      'DATE',
      'DATE-OBS',
      'CONTENT',
      'TELESCOP',
      'INSTRUME',
      'OBSERVER',
      'OBJECT',
      'INSMODE',
    ]) {
      expect(typeof back.primary.get(kw)).toBe('string');
    }
    expect(back.primary.get('CONTENT')).toBe('OIFITS2');
    expect(back.primary.get('OBSERVER')).toBe('B. Somebody');
    expect(back.primary.get('TELESCOP')).toBe('TALLGRASS');
    expect(back.primary.get('OBJECT')).toBe('MULTI');
    expect(back.tables.vis2[0]!.revision).toBe(2);
    expect(back.tables.array[0]!.columns.map((c) => c.name)).toContain('FOVTYPE');
    expect(Array.from(back.vis2.value)).toEqual(Array.from(v1.vis2.value));
  });

  it('does not change the dataset it writes', () => {
    const before = Array.from(v2.vis2.value);
    writeOifits(v2, { date: DATE });
    expect(Array.from(v2.vis2.value)).toEqual(before);
  });
});

describe.skipIf(!hasFitsverify)(
  'fitsverify on written files (skipped: fitsverify not installed; apt-get install fitsverify)',
  () => {
    it.each(['kestrel_v2.fits', 'kestrel_v1.fits'])(
      '%s rewritten by uvsky verifies with 0 errors and 0 warnings',
      (name) => {
        const dir = mkdtempSync(join(tmpdir(), 'uvsky-oifits-'));
        const path = join(dir, `out_${name}`);
        writeFileSync(path, writeOifits(readOifits(fixture(name)), { date: DATE }));
        const r = spawnSync('fitsverify', ['-q', path], { encoding: 'utf8' });
        expect(r.stdout + r.stderr).toMatch(/verification OK/);
      },
    );
  },
);

describe.skipIf(!hasAstropy)(
  'astropy reads back what uvsky writes (skipped: /usr/bin/python3 with astropy absent)',
  () => {
    it.each(['kestrel_v2.fits', 'kestrel_v1.fits'])(
      "every column of %s rewritten equals astropy's reading",
      (name) => {
        const ds = readOifits(fixture(name));
        const bytes = writeOifits(ds, { date: DATE });
        const dir = mkdtempSync(join(tmpdir(), 'uvsky-oifits-'));
        const path = join(dir, `out_${name}`);
        writeFileSync(path, bytes);
        const dump = astropyDump(path);
        const ours = readOifits(bytes);
        let n = 0;
        for (const t of tablesOf(ours)) {
          const h = dump.hdus[t.hdu]!;
          expect(h.extname).toBe(t.extname);
          for (const c of t.columns) {
            const want = h
              .columns!.find((x) => x.name === c.name)!
              .values.map((v) => (typeof v === 'boolean' ? (v ? 1 : 0) : fromJson(v)));
            const got = Array.from(c.data as ArrayLike<number | string>);
            expect(got.length).toBe(want.length);
            for (let i = 0; i < got.length; i++) {
              if (!Object.is(got[i], want[i]))
                throw new Error(`${t.extname}.${c.name}[${i}]: ${got[i]} vs astropy ${want[i]}`);
              n++;
            }
          }
        }
        expect(n).toBeGreaterThan(500);
        expect(dump.hdus[0]!.header['CONTENT']).toBe('OIFITS2');
      },
    );
  },
);
