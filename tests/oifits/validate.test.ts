/**
 * Bad input: every class of problem gets an OifitsError (a UvskyError) naming file, HDU / table, column, row
 * and keyword, with what was expected. The invalid files are built from the astropy fixture with the raw FITS
 * encoder (no OIFITS checks), one defect each.
 */
import { describe, expect, it } from 'vitest';
import { OifitsError, UvskyError } from '../../src/errors.js';
import type { TableColumn } from '../../src/oifits/fits/bintable.js';
import type { HeaderCard } from '../../src/oifits/fits/header.js';
import { readOifits } from '../../src/oifits/index.js';
import { buildRaw, fixture, type RawTable, rawFromOi } from './helpers.js';

const base = readOifits(fixture('kestrel_v2.fits'), { name: 'kestrel_v2.fits' });
const t = base.tables;
const ordered = [
  ...t.target,
  ...t.array,
  ...t.wavelength,
  ...t.corr,
  ...t.vis,
  ...t.vis2,
  ...t.t3,
  ...t.flux,
];

/** The fixture's tables as raw tables, in file order (HDU k = index k - 1). */
function raw(): RawTable[] {
  return [...ordered].sort((a, b) => a.hdu - b.hdu).map(rawFromOi);
}
const find = (tables: RawTable[], extname: string, nth = 0) =>
  tables.filter((x) => x.cards.find((c) => c.keyword === 'EXTNAME')?.value === extname)[nth]!;

function setCard(
  r: RawTable,
  kw: string,
  value: HeaderCard['value'],
  kind: HeaderCard['kind'] = 'string',
): RawTable {
  const cards = r.cards.filter((c) => c.keyword !== kw);
  return { ...r, cards: value === undefined ? cards : [...cards, { keyword: kw, kind, value }] };
}
function mapColumn(r: RawTable, name: string, f: (c: TableColumn) => TableColumn | undefined): RawTable {
  return {
    ...r,
    columns: r.columns
      .map((c) => (c.name === name ? f(c) : c))
      .filter((c): c is TableColumn => c !== undefined),
  };
}
function withValue(c: TableColumn, index: number, value: number): TableColumn {
  const C = (c.data as Float64Array).constructor as new (a: ArrayLike<number>) => Float64Array;
  const d = new C(c.data as Float64Array);
  d[index] = value;
  return { ...c, data: d };
}

function build(
  edit: (tables: RawTable[]) => RawTable[],
  primary: readonly HeaderCard[] = base.primary.cards,
) {
  return buildRaw(primary, edit(raw()));
}

function expectError(bytes: Uint8Array, where: Record<string, unknown>, message: RegExp): OifitsError {
  let err: unknown;
  try {
    readOifits(bytes, { name: 'bad.fits' });
  } catch (e) {
    err = e;
  }
  expect(err).toBeInstanceOf(OifitsError);
  expect(err).toBeInstanceOf(UvskyError);
  const e = err as OifitsError;
  expect(e.location).toMatchObject({ file: 'bad.fits', ...where });
  expect(e.message).toMatch(message);
  expect(e.message.startsWith('bad.fits')).toBe(true);
  return e;
}

describe('the raw builder itself', () => {
  it('rebuilds a valid file from the unchanged fixture tables (so each defect below is the only one)', () => {
    const ds = readOifits(build((x) => x));
    expect(ds.vis2.length).toBe(base.vis2.length);
  });
});

describe('missing mandatory parts', () => {
  it('a missing OI_TARGET table', () => {
    expectError(
      build((x) => x.filter((r) => r !== find(x, 'OI_TARGET'))),
      { table: 'OI_TARGET' },
      /mandatory table OI_TARGET is missing/,
    );
  });
  it('a missing OI_ARRAY table in OIFITS 2', () => {
    expectError(
      build((x) => x.filter((r) => r !== find(x, 'OI_ARRAY'))),
      { table: 'OI_ARRAY' },
      /OI_ARRAY is missing/,
    );
  });
  it('no data table at all', () => {
    const keep = new Set(['OI_TARGET', 'OI_ARRAY', 'OI_WAVELENGTH', 'OI_CORR']);
    expectError(
      build((x) => x.filter((r) => keep.has(String(r.cards.find((c) => c.keyword === 'EXTNAME')!.value)))),
      {},
      /no data table/,
    );
  });
  it('a missing table keyword (INSNAME of OI_VIS2)', () => {
    expectError(
      build((x) => x.map((r) => (r === find(x, 'OI_VIS2') ? setCard(r, 'INSNAME', undefined) : r))),
      { hdu: 7, table: 'OI_VIS2', keyword: 'INSNAME' },
      /mandatory keyword INSNAME is missing/,
    );
  });
  it('a missing OI_REVN', () => {
    expectError(
      build((x) => x.map((r) => (r === find(x, 'OI_T3') ? setCard(r, 'OI_REVN', undefined) : r))),
      { hdu: 9, table: 'OI_T3', keyword: 'OI_REVN' },
      /OI_REVN is missing/,
    );
  });
  it('a missing primary keyword of OIFITS 2 (OBSERVER, Duvert et al. 2017 table 2)', () => {
    const primary = base.primary.cards.filter((c) => c.keyword !== 'OBSERVER');
    expectError(
      build((x) => x, primary),
      { hdu: 0, keyword: 'OBSERVER' },
      /OBSERVER is missing/,
    );
  });
  it('OI_REVN = 2 tables without CONTENT = OIFITS2', () => {
    const primary = base.primary.cards.filter((c) => c.keyword !== 'CONTENT');
    expectError(
      build((x) => x, primary),
      { hdu: 0, keyword: 'CONTENT' },
      /requires CONTENT = 'OIFITS2'/,
    );
  });
  it('a missing mandatory column (VIS2ERR)', () => {
    expectError(
      build((x) => x.map((r) => (r === find(x, 'OI_VIS2') ? mapColumn(r, 'VIS2ERR', () => undefined) : r))),
      { hdu: 7, table: 'OI_VIS2', column: 'VIS2ERR' },
      /mandatory column VIS2ERR is missing/,
    );
  });
});

describe('wrong shapes and types', () => {
  it('a per-channel column whose size differs from the channel count of its OI_WAVELENGTH', () => {
    const e = expectError(
      build((x) =>
        x.map((r) =>
          r === find(x, 'OI_VIS2', 1)
            ? setCard(r, 'INSNAME', 'REEDPIPE_LO')
            : r === find(x, 'OI_VIS2', 0)
              ? r
              : r,
        ),
      ),
      { table: 'OI_VIS2', column: 'VIS2DATA' },
      /has 3 elements per row .* has 5 channels/,
    );
    expect(e.location.hdu).toBe(8);
  });
  it('a fixed-size column with the wrong repeat (STAXYZ with 2 elements)', () => {
    expectError(
      build((x) =>
        x.map((r) =>
          r === find(x, 'OI_ARRAY')
            ? mapColumn(r, 'STAXYZ', (c) => ({
                ...c,
                tform: { ...c.tform, repeat: 2, bytes: 16 },
                data: (c.data as Float64Array).filter((_, i) => i % 3 !== 2),
              }))
            : r,
        ),
      ),
      { hdu: 2, table: 'OI_ARRAY', column: 'STAXYZ' },
      /must have 3/,
    );
  });
  it('a column of the wrong type class (FLAG stored as integers)', () => {
    expectError(
      build((x) =>
        x.map((r) =>
          r === find(x, 'OI_T3')
            ? mapColumn(r, 'FLAG', (c) => ({
                ...c,
                tform: { ...c.tform, code: 'B' },
                data: new Uint8Array(c.data as Uint8Array),
              }))
            : r,
        ),
      ),
      { table: 'OI_T3', column: 'FLAG' },
      /must be logical \(L\)/,
    );
  });
});

describe('dangling references', () => {
  const cases: Array<[string, string, number, string, RegExp]> = [
    [
      'INSNAME',
      'OI_VIS2',
      7,
      'NO_SUCH_INSTRUMENT',
      /names no OI_WAVELENGTH table; the file has INSNAME 'REEDPIPE_LO', 'REEDPIPE_HI'/,
    ],
    ['ARRNAME', 'OI_VIS', 6, 'NO_SUCH_ARRAY', /names no OI_ARRAY table; the file has ARRNAME 'TALLGRASS'/],
    ['CORRNAME', 'OI_VIS2', 7, 'NO_SUCH_CORR', /names no OI_CORR table/],
  ];
  it.each(cases)('%s of %s pointing nowhere', (kw, table, hdu, value, msg) => {
    expectError(
      build((x) => x.map((r) => (r === find(x, table) ? setCard(r, kw, value) : r))),
      { hdu, table, keyword: kw },
      msg,
    );
  });
  it('a TARGET_ID that OI_TARGET does not have', () => {
    expectError(
      build((x) =>
        x.map((r) => (r === find(x, 'OI_T3') ? mapColumn(r, 'TARGET_ID', (c) => withValue(c, 2, 99)) : r)),
      ),
      { hdu: 9, table: 'OI_T3', column: 'TARGET_ID', row: 3 },
      /TARGET_ID = 99 is not in OI_TARGET/,
    );
  });
  it('a STA_INDEX that OI_ARRAY does not have', () => {
    expectError(
      build((x) =>
        x.map((r) => (r === find(x, 'OI_VIS2') ? mapColumn(r, 'STA_INDEX', (c) => withValue(c, 5, 9)) : r)),
      ),
      { hdu: 7, table: 'OI_VIS2', column: 'STA_INDEX', row: 3 },
      /STA_INDEX = 9 is not a station of OI_ARRAY ARRNAME = 'TALLGRASS'/,
    );
  });
});

describe('bad values', () => {
  it.each([0, -0.01, Number.NaN])('an unflagged VIS2ERR of %s', (bad) => {
    // Entry 2 (row 1, channel 3) is unflagged in the fixture.
    expectError(
      build((x) =>
        x.map((r) => (r === find(x, 'OI_VIS2') ? mapColumn(r, 'VIS2ERR', (c) => withValue(c, 2, bad)) : r)),
      ),
      { hdu: 7, table: 'OI_VIS2', column: 'VIS2ERR', row: 1 },
      /channel 3: the error .* must be a positive finite number/,
    );
  });
  it('a flagged point may have any error', () => {
    // Row 2, channel 1 of the first OI_VIS2 is flagged in the fixture (index 5).
    expect(base.vis2.flag[5]).toBe(1);
    const ds = readOifits(
      build((x) =>
        x.map((r) => (r === find(x, 'OI_VIS2') ? mapColumn(r, 'VIS2ERR', (c) => withValue(c, 5, -1)) : r)),
      ),
    );
    expect(ds.vis2.error[5]).toBe(-1);
  });
  it.each([0, -2e-6])('a wavelength EFF_WAVE of %s', (bad) => {
    expectError(
      build((x) =>
        x.map((r) =>
          r === find(x, 'OI_WAVELENGTH', 1) ? mapColumn(r, 'EFF_WAVE', (c) => withValue(c, 1, bad)) : r,
        ),
      ),
      { hdu: 4, table: 'OI_WAVELENGTH', column: 'EFF_WAVE', row: 2 },
      /a wavelength must be positive and finite/,
    );
  });
  it('a duplicate TARGET_ID', () => {
    expectError(
      build((x) =>
        x.map((r) => (r === find(x, 'OI_TARGET') ? mapColumn(r, 'TARGET_ID', (c) => withValue(c, 1, 1)) : r)),
      ),
      { hdu: 1, table: 'OI_TARGET', column: 'TARGET_ID', row: 2 },
      /appears twice/,
    );
  });
});

describe('damaged files', () => {
  const good = fixture('kestrel_v2.fits');
  it('a file cut inside a table is reported as truncated, before any allocation of that table', () => {
    const e = expectError(good.slice(0, 2880 * 10 + 100), {}, /truncated/);
    expect(e.location.hdu).toBeGreaterThan(0);
  });
  it('a file cut inside a header has no END card', () => {
    expectError(good.slice(0, 2880 + 1000), { hdu: 1 }, /no END card .* truncated/);
  });
  it('a file shorter than one block', () => {
    expectError(good.slice(0, 100), { hdu: 0 }, /at least one 2880-byte block/);
  });
  it('a declared size far beyond the file (NAXIS2 = 999999999) is refused without allocating it', () => {
    const s = Buffer.from(good).toString('latin1');
    const at = s.indexOf('NAXIS2  =', 2880 * 2);
    const bytes = good.slice();
    const card = `NAXIS2  = ${'999999999'.padStart(20)}`.padEnd(80);
    for (let i = 0; i < 80; i++) bytes[at + i] = card.charCodeAt(i);
    expectError(bytes, {}, /declares \d+ bytes of data .* truncated/);
  });
  it('bytes that are not FITS', () => {
    expectError(new TextEncoder().encode('hello '.repeat(1000)), { hdu: 0 }, /SIMPLE = T/);
  });
});
