/** Selection by target, wavelength, baseline, MJD and flags; concatenation of datasets. */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { concatOifits, readOifits, selectOifits, writeOifits } from '../../src/oifits/index.js';
import { fixture } from './helpers.js';

const ds = readOifits(fixture('kestrel_v2.fits'), { name: 'a.fits' });
const v1 = readOifits(fixture('kestrel_v1.fits'), { name: 'b.fits' });

describe('selectOifits', () => {
  it('keeps exactly the entries that meet every criterion (checked against the flat view of the whole)', () => {
    const crit = {
      wavelength: [1.6e-6, 2.16e-6] as const,
      baseline: [0, 50] as const,
      mjd: [60430.9, 60431] as const,
    };
    const sel = selectOifits(ds, { ...crit, target: 'Kestrel Minor' });
    const v = ds.vis2;
    const want: number[] = [];
    for (let k = 0; k < v.length; k++) {
      const b = Math.hypot(v.ucoord[k]!, v.vcoord[k]!);
      if (v.wavelength[k]! < crit.wavelength[0] || v.wavelength[k]! > crit.wavelength[1]) continue;
      if (b < crit.baseline[0] || b > crit.baseline[1]) continue;
      if (v.mjd[k]! < crit.mjd[0] || v.mjd[k]! > crit.mjd[1]) continue;
      if (v.targetName[k] !== 'Kestrel Minor') continue;
      want.push(v.value[k]!);
    }
    expect(want.length).toBeGreaterThan(0);
    expect(want.length).toBeLessThan(v.length);
    expect(Array.from(sel.vis2.value)).toEqual(want);
  });

  it('cuts OI_WAVELENGTH and per-channel columns, and the result writes and reads back', () => {
    const sel = selectOifits(ds, { wavelength: [2.0e-6, 2.3e-6] });
    const lo = sel.tables.wavelength.find((t) => t.insname === 'REEDPIPE_LO')!;
    expect(lo.nrows).toBe(2);
    const back = readOifits(writeOifits(sel, { date: '2024-01-01T00:00:00' }));
    expect(Array.from(back.vis2.wavelength)).toEqual(Array.from(sel.vis2.wavelength));
    expect(Array.from(back.t3.t3phi)).toEqual(Array.from(sel.t3.t3phi));
    expect(sel.vis2.wavelength.every((w) => w >= 2.0e-6 && w <= 2.3e-6)).toBe(true);
    // VISREFMAP (NWAVE x NWAVE) is cut along both axes.
    const refmap = sel.tables.vis[0]!.columns.find((c) => c.name === 'VISREFMAP')!;
    expect(refmap.tform.repeat).toBe(4);
    expect(refmap.dim).toEqual([2, 2]);
  });

  it('requires all three baselines of a triangle in the range', () => {
    const sel = selectOifits(ds, { baseline: [0, 60] });
    for (let k = 0; k < sel.t3.length; k++) {
      const w = sel.t3.wavelength[k]!;
      const [u1, v1, u2, v2] = [sel.t3.u1[k]! * w, sel.t3.v1[k]! * w, sel.t3.u2[k]! * w, sel.t3.v2[k]! * w];
      expect(
        Math.max(Math.hypot(u1, v1), Math.hypot(u2, v2), Math.hypot(u1 + u2, v1 + v2)),
      ).toBeLessThanOrEqual(60);
    }
    expect(sel.t3.length).toBeLessThan(ds.t3.length);
  });

  it('drops flagged entries from the views when asked', () => {
    const sel = selectOifits(ds, { flagged: 'drop' });
    expect(sel.vis2.flag.every((f) => f === 0)).toBe(true);
    expect(sel.vis2.length).toBe(ds.vis2.length - ds.vis2.flag.reduce((s, f) => s + f, 0));
  });

  it('refuses malformed ranges and unknown targets', () => {
    expect(() => selectOifits(ds, { wavelength: [2e-6, 1e-6] })).toThrow(InputError);
    expect(() => selectOifits(ds, { target: 'Nobody' })).toThrow(
      /no target "Nobody"; it has 1 "Kestrel Minor", 2 "Heron Dim"/,
    );
  });
});

describe('concatOifits', () => {
  it('shares identical named tables, renames different ones, merges targets by name', () => {
    const all = concatOifits([ds, v1]);
    expect(all.vis2.length).toBe(ds.vis2.length + v1.vis2.length);
    expect(all.targets.map((t) => t.name)).toEqual(['Kestrel Minor', 'Heron Dim']);
    // v1's OI_ARRAY lacks FOV/FOVTYPE, so it differs from v2's and is renamed.
    expect(all.tables.array.map((t) => t.arrname)).toEqual(['TALLGRASS', 'TALLGRASS_2']);
    // The two REEDPIPE_LO wavelength tables are identical except OI_REVN: content equal, so shared.
    expect(all.tables.wavelength.map((t) => t.insname)).toEqual(['REEDPIPE_LO', 'REEDPIPE_HI']);
    expect(Array.from(all.vis2.value.subarray(ds.vis2.length))).toEqual(Array.from(v1.vis2.value));
    expect(all.vis2.stations.slice(ds.vis2.length, ds.vis2.length + 1)).toEqual(['TG1-TG2']);
    const back = readOifits(writeOifits(all, { date: '2024-01-01T00:00:00' }));
    expect(Array.from(back.vis2.value)).toEqual(Array.from(all.vis2.value));
    expect(Array.from(back.vis2.targetId)).toEqual(Array.from(all.vis2.targetId));
  });
  it('refuses an empty list', () => {
    expect(() => concatOifits([])).toThrow(InputError);
  });
});
