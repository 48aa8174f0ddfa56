/**
 * Reading the astropy-written fixtures (tests/fixtures/oifits/make_fixtures.py, astropy.io.fits from Debian's
 * python3-astropy): every keyword and every column value must equal what astropy reads back (the JSON beside
 * each file, written by dump_fits.py), exactly.
 */
import { describe, expect, it } from 'vitest';
import type { OifitsDataset, OiTable } from '../../src/oifits/index.js';
import { readOifits } from '../../src/oifits/index.js';
import { readOifitsFile } from '../../src/oifits/node.js';
import { type Dump, expected, FIXTURES, fixture, fromJson } from './helpers.js';

function allTables(ds: OifitsDataset): OiTable[] {
  const t = ds.tables;
  return [...t.target, ...t.array, ...t.wavelength, ...t.corr, ...t.vis, ...t.vis2, ...t.t3, ...t.flux];
}

function compareWithAstropy(ds: OifitsDataset, dump: Dump): number {
  let checked = 0;
  for (const t of allTables(ds)) {
    const h = dump.hdus[t.hdu]!;
    expect(h.extname).toBe(t.extname);
    expect(h.nrows).toBe(t.nrows);
    for (const [kw, value] of Object.entries(h.header)) {
      const ours = t.header.get(kw);
      expect(typeof ours === 'string' ? ours : ours, `${t.extname} ${kw}`).toEqual(value);
    }
    expect(t.columns.map((c) => c.name)).toEqual(h.columns!.map((c) => c.name));
    for (const col of t.columns) {
      const want = h.columns!.find((c) => c.name === col.name)!;
      const got = Array.from(col.data as ArrayLike<number | string>);
      const wantValues = want.values.map((v) =>
        typeof v === 'boolean' ? (v ? 1 : 0) : (fromJson(v) as number | string),
      );
      expect(got.length, `${t.extname}.${col.name} length`).toBe(wantValues.length);
      for (let i = 0; i < got.length; i++) {
        // Object.is: exact equality, NaN equal to NaN, -0 distinct from +0.
        if (!Object.is(got[i], wantValues[i])) {
          throw new Error(
            `${t.extname} (HDU ${t.hdu}).${col.name}[${i}]: got ${got[i]}, astropy ${wantValues[i]}`,
          );
        }
        checked++;
      }
      if (want.unit) expect(col.unit).toBe(want.unit);
      if (want.null !== null) expect(col.tnull).toBe(want.null);
    }
  }
  return checked;
}

describe('readOifits on astropy-written OIFITS 2', () => {
  const ds = readOifits(fixture('kestrel_v2.fits'), { name: 'kestrel_v2.fits' });
  const dump = expected('kestrel_v2.json');

  it('returns every keyword and every column value exactly as astropy reads them', () => {
    expect(ds.version).toBe(2);
    const n = compareWithAstropy(ds, dump);
    expect(n).toBeGreaterThan(1000);
  });

  it('joins CONTINUE cards into the long string astropy wrote (FITS 4.0 section 4.2.1.2)', () => {
    expect(ds.primary.get('REFERENC')).toBe(dump.hdus[0]!.header['REFERENC']);
    expect(String(ds.primary.get('REFERENC')).length).toBeGreaterThan(68);
    expect(ds.primary.get('SIMULATD')).toBe(true);
    expect(ds.primary.get('NUM_CHAN')).toBe(8);
    expect(ds.primary.get('WAVELMIN')).toBe(1550);
  });

  it('warns about the extra IMAGE HDU and the extra columns instead of failing', () => {
    expect(ds.warnings.some((w) => w.includes('X_THUMBNAIL') && w.includes('HDU 12'))).toBe(true);
    for (const name of ['X_BYTE', 'X_INT32', 'X_INT64', 'X_CPLX', 'X_DCPLX', 'X_GRID', 'X_NOTE']) {
      expect(ds.warnings.some((w) => w.includes(`extra column ${name}`))).toBe(true);
    }
    expect(ds.warnings.some((w) => w.includes('VISREFMAP'))).toBe(false);
  });

  it('keeps TDIM, TNULL and 64-bit integers (FITS 4.0 section 7.3.2)', () => {
    const t = ds.tables.vis2[0]!;
    const grid = t.columns.find((c) => c.name === 'X_GRID')!;
    expect(grid.dim).toEqual([3, 2]);
    const k = t.columns.find((c) => c.name === 'X_INT64')!;
    expect(k.data[0]).toBe(Number.MAX_SAFE_INTEGER);
    expect(k.data[1]).toBe(-Number.MAX_SAFE_INTEGER);
    expect(t.columns.find((c) => c.name === 'X_INT32')!.tnull).toBe(-99);
  });

  it('flattens OI_VIS2 row-major with u = UCOORD / EFF_WAVE in cycles per radian', () => {
    const v2 = dump.hdus.filter((h) => h.extname === 'OI_VIS2');
    const waves = dump.hdus.filter((h) => h.extname === 'OI_WAVELENGTH');
    let k = 0;
    for (const h of v2) {
      const w = waves.find((x) => x.header['INSNAME'] === h.header['INSNAME'])!;
      const eff = w.columns!.find((c) => c.name === 'EFF_WAVE')!.values as number[];
      const col = (n: string) => h.columns!.find((c) => c.name === n)!.values.map(fromJson);
      const [data, err, u, v, mjd, flag, sta] = [
        'VIS2DATA',
        'VIS2ERR',
        'UCOORD',
        'VCOORD',
        'MJD',
        'FLAG',
        'STA_INDEX',
      ].map(col);
      const nw = eff.length;
      for (let r = 0; r < h.nrows!; r++) {
        for (let c = 0; c < nw; c++, k++) {
          expect(Object.is(ds.vis2.value[k], data![r * nw + c])).toBe(true);
          expect(Object.is(ds.vis2.error[k], err![r * nw + c])).toBe(true);
          expect(ds.vis2.u[k]).toBe((u![r] as number) / eff[c]!);
          expect(ds.vis2.v[k]).toBe((v![r] as number) / eff[c]!);
          expect(ds.vis2.ucoord[k]).toBe(u![r]);
          expect(ds.vis2.wavelength[k]).toBe(eff[c]);
          expect(ds.vis2.mjd[k]).toBe(mjd![r]);
          expect(ds.vis2.flag[k]).toBe(flag![r * nw + c] ? 1 : 0);
          expect(ds.vis2.sta1[k]).toBe(sta![2 * r]);
          expect(ds.vis2.sta2[k]).toBe(sta![2 * r + 1]);
          expect(ds.vis2.row[k]).toBe(r);
          expect(ds.vis2.channel[k]).toBe(c);
        }
      }
    }
    expect(ds.vis2.length).toBe(k);
    expect(ds.vis2.stations[0]).toBe('TG1-TG2');
    expect(ds.vis2.targetName[0]).toBe('Kestrel Minor');
    expect(ds.vis2.targetName[6 * 5]).toBe('Heron Dim');
  });

  it('gives OI_T3 u1 = U1COORD / EFF_WAVE etc. and keeps NaN amplitudes', () => {
    const h = dump.hdus.find((x) => x.extname === 'OI_T3')!;
    const u2 = h.columns!.find((c) => c.name === 'U2COORD')!.values as number[];
    const w = dump.hdus.find(
      (x) => x.extname === 'OI_WAVELENGTH' && x.header['INSNAME'] === h.header['INSNAME'],
    )!;
    const eff = w.columns!.find((c) => c.name === 'EFF_WAVE')!.values as number[];
    expect(ds.t3.u2[eff.length + 1]).toBe(u2[1]! / eff[1]!);
    expect(Number.isNaN(ds.t3.t3amp[2 * eff.length])).toBe(true);
    expect(ds.t3.stations[0]).toBe('TG1-TG2-TG3');
    expect(ds.t3.sta3[0]).toBe(3);
  });

  it('drops flagged entries from the flat views when asked', () => {
    const kept = readOifits(fixture('kestrel_v2.fits'), { dropFlagged: true });
    const flagged = ds.vis2.flag.reduce((s, f) => s + f, 0);
    expect(flagged).toBeGreaterThan(0);
    expect(kept.vis2.length).toBe(ds.vis2.length - flagged);
    expect(kept.vis2.flag.every((f) => f === 0)).toBe(true);
  });

  it('reads from an ArrayBuffer too and never changes the input bytes', () => {
    const bytes = fixture('kestrel_v2.fits');
    const copy = bytes.slice();
    const ab = bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer;
    const again = readOifits(ab);
    expect(again.vis2.length).toBe(ds.vis2.length);
    expect(bytes).toEqual(copy);
  });
});

describe('readOifits on astropy-written OIFITS 1', () => {
  const ds = readOifits(fixture('kestrel_v1.fits'), { name: 'kestrel_v1.fits' });
  it('reads OIFITS 1 (no CONTENT, OI_REVN = 1) with every value exact', () => {
    expect(ds.version).toBe(1);
    expect(compareWithAstropy(ds, expected('kestrel_v1.json'))).toBeGreaterThan(500);
    expect(ds.warnings).toEqual([]);
    expect(ds.vis.length).toBe(6 * 5);
  });
});

describe('readOifitsFile (Node)', () => {
  it('reads a path and names it in errors', async () => {
    const ds = await readOifitsFile(`${FIXTURES}/kestrel_v1.fits`);
    expect(ds.name.endsWith('kestrel_v1.fits')).toBe(true);
    await expect(readOifitsFile(`${FIXTURES}/dump_fits.py`)).rejects.toThrow(
      /dump_fits.py, HDU 0, keyword SIMPLE: this is not a FITS file/,
    );
  });
});
