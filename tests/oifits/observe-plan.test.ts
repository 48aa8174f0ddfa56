/**
 * planObservation(): a synthetic OIFITS 2 observation built from a target, an array, an instrument and hour
 * angles. The geometry checks are facts of the rotation (common practice, no single source): a target at the
 * zenith sees every horizontal baseline at full length; a rotation keeps lengths, so a projection never
 * exceeds the physical baseline; baselines add (AC = AB + BC) at every instant; an east-west baseline traces
 * an ellipse u = L cos H, v = L sin(dec) sin H (the textbook east-west track, e.g. Thompson, Moran & Swenson
 * chapter 4, quoted from memory). Everything named here (Kestrel Minor, TALLGRASS, TG1..TG4, REEDPIPE) is
 * invented.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import {
  type OifitsDataset,
  type OiTable,
  type PlanObservationOptions,
  planObservation,
  projectBaseline,
  readOifits,
  type SimulationModel,
  simulate,
  writeOifits,
} from '../../src/oifits/index.js';
import { hasFitsverify } from './helpers.js';

const DATE = '2024-06-01T00:00:00';
const LENGTH_TOL = 1e-9; // m, rounding of a rotation of baselines of ~100 m
const RAD = Math.PI / 180;

const STATIONS = [
  { name: 'TG1', east: 0, north: 0 },
  { name: 'TG2', east: 31.25, north: -4.5, up: 0.125 },
  { name: 'TG3', east: -12, north: 57.75, up: 0.5, diameter: 1.8 },
  { name: 'TG4', east: 48.5, north: 36, up: -0.25, diameter: 8.2, telescope: 'BIGDISH' },
];

const BASE: PlanObservationOptions = {
  target: { name: 'Kestrel Minor', ra: 123.456789012345, dec: -45.25 },
  array: { name: 'TALLGRASS', latitude: -24.5, longitude: -70.25, altitude: 2600, stations: STATIONS },
  instrument: {
    name: 'REEDPIPE',
    wavelengths: new Float64Array([1.55e-6, 1.65e-6, 1.75e-6]),
    bandwidths: [5e-8, 5e-8, 6e-8],
  },
  hourAngles: [-2, -0.5, 0, 1.25, 3],
  mjd: 60430.9,
  date: DATE,
};

function plan(over: Partial<PlanObservationOptions> = {}): OifitsDataset {
  return planObservation({ ...BASE, ...over });
}

function tablesOf(ds: OifitsDataset): OiTable[] {
  const t = ds.tables;
  return [...t.target, ...t.array, ...t.wavelength, ...t.corr, ...t.vis, ...t.vis2, ...t.t3, ...t.flux];
}

function col(t: OiTable, name: string): ArrayLike<number> {
  return t.columns.find((c) => c.name === name)!.data as ArrayLike<number>;
}

/** The error planObservation throws for these options. */
function errorOf(over: Record<string, unknown>): InputError {
  try {
    planObservation({ ...BASE, ...over } as PlanObservationOptions);
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error(`no error for ${JSON.stringify(over)}`);
}

describe('planObservation', () => {
  const ds = plan();

  it('builds OI_TARGET, OI_ARRAY, OI_WAVELENGTH, OI_VIS, OI_VIS2 and OI_T3 with one row per snapshot and baseline', () => {
    expect(ds.version).toBe(2);
    expect(ds.warnings).toEqual([]);
    expect(tablesOf(ds).map((t) => t.extname)).toEqual([
      'OI_TARGET',
      'OI_ARRAY',
      'OI_WAVELENGTH',
      'OI_VIS',
      'OI_VIS2',
      'OI_T3',
    ]);
    expect(ds.targets).toEqual([{ id: 1, name: 'Kestrel Minor', ra: 123.456789012345, dec: -45.25 }]);
    // 5 snapshots x 6 pairs, 5 x 4 triangles, 3 channels each.
    expect(ds.tables.vis2[0]!.nrows).toBe(30);
    expect(ds.tables.t3[0]!.nrows).toBe(20);
    expect(ds.vis2.length).toBe(90);
    expect(ds.vis.length).toBe(90);
    expect(ds.t3.length).toBe(60);
    // Default order: pairs i < j, triangles i < j < k, snapshot after snapshot.
    expect(ds.vis2.stations.slice(0, 18).filter((_, k) => k % 3 === 0)).toEqual([
      'TG1-TG2',
      'TG1-TG3',
      'TG1-TG4',
      'TG2-TG3',
      'TG2-TG4',
      'TG3-TG4',
    ]);
    expect(ds.t3.stations.slice(0, 12).filter((_, k) => k % 3 === 0)).toEqual([
      'TG1-TG2-TG3',
      'TG1-TG2-TG4',
      'TG1-TG3-TG4',
      'TG2-TG3-TG4',
    ]);
    expect(ds.primary.get('TELESCOP')).toBe('TALLGRASS');
    expect(ds.primary.get('INSTRUME')).toBe('REEDPIPE');
    expect(ds.primary.get('OBJECT')).toBe('Kestrel Minor');
    expect(ds.primary.get('DATE')).toBe(DATE);
    const arr = ds.tables.array[0]!;
    expect(arr.columns.find((c) => c.name === 'TEL_NAME')!.data).toEqual(['TG1', 'TG2', 'TG3', 'BIGDISH']);
    expect(Array.from(col(arr, 'DIAMETER')).slice(2)).toEqual([Math.fround(1.8), Math.fround(8.2)]);
    expect(Number.isNaN(col(arr, 'DIAMETER')[0]!)).toBe(true);
  });

  it('fills the observables with placeholders and the given errors, none flagged', () => {
    const e = plan({ errors: { vis2: 0.03, t3phi: 2, t3amp: 0.1, visamp: 0.04, visphi: 3 } });
    expect(e.vis2.value.every((x) => x === 1)).toBe(true);
    expect(e.vis2.error.every((x) => x === 0.03)).toBe(true);
    expect(e.vis.visamp.every((x) => x === 1)).toBe(true);
    expect(e.vis.visampError.every((x) => x === 0.04)).toBe(true);
    expect(e.vis.visphi.every((x) => x === 0)).toBe(true);
    expect(e.vis.visphiError.every((x) => x === 3)).toBe(true);
    expect(e.t3.t3amp.every((x) => x === 1)).toBe(true);
    expect(e.t3.t3ampError.every((x) => x === 0.1)).toBe(true);
    expect(e.t3.t3phi.every((x) => x === 0)).toBe(true);
    expect(e.t3.t3phiError.every((x) => x === 2)).toBe(true);
    expect(e.vis2.flag.every((x) => x === 0) && e.t3.flag.every((x) => x === 0)).toBe(true);
    // Defaults: 0.02, 1 deg, 0.05, 0.02, 1 deg.
    expect(ds.vis2.error[0]).toBe(0.02);
    expect(ds.t3.t3phiError[0]).toBe(1);
    expect(ds.t3.t3ampError[0]).toBe(0.05);
    expect(ds.vis.visampError[0]).toBe(0.02);
    expect(ds.vis.visphiError[0]).toBe(1);
  });

  it('passes writeOifits and reads back the same tables, keywords and views', () => {
    const bytes = writeOifits(ds);
    expect(bytes.length % 2880).toBe(0);
    const back = readOifits(bytes);
    expect(back.version).toBe(2);
    expect(back.warnings).toEqual([]);
    const a = tablesOf(ds);
    const b = tablesOf(back);
    expect(b.map((t) => t.extname)).toEqual(a.map((t) => t.extname));
    a.forEach((x, i) => {
      const y = b[i]!;
      expect(y.nrows).toBe(x.nrows);
      expect(y.revision).toBe(x.revision);
      expect([y.insname, y.arrname]).toEqual([x.insname, x.arrname]);
      expect(y.columns.map((c) => [c.name, c.tform, c.unit])).toEqual(
        x.columns.map((c) => [c.name, c.tform, c.unit]),
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
        if (card.kind !== 'commentary') expect(y.header.get(card.keyword), card.keyword).toEqual(card.value);
      }
    });
    for (const card of ds.primary.cards) {
      if (card.kind !== 'commentary')
        expect(back.primary.get(card.keyword), card.keyword).toEqual(card.value);
    }
    for (const key of ['u', 'v', 'mjd', 'wavelength', 'band', 'value', 'error'] as const) {
      expect(Array.from(back.vis2[key])).toEqual(Array.from(ds.vis2[key]));
    }
    for (const key of ['u1', 'v1', 'u2', 'v2', 't3phi', 't3amp'] as const) {
      expect(Array.from(back.t3[key])).toEqual(Array.from(ds.t3[key]));
    }
    expect(back.targets).toEqual(ds.targets);
  });

  it('sees a pure east-west baseline at full length and v = 0 at hour angle 0 when dec = latitude', () => {
    // The target is at the zenith: the sky plane is the horizontal plane, east on the sky is local east.
    for (const lat of [-30, 0, 19.75, 52]) {
      const p = planObservation({
        ...BASE,
        target: { name: 'Kestrel Minor', ra: 10, dec: lat },
        array: {
          name: 'TALLGRASS',
          latitude: lat,
          stations: [
            { name: 'TG1', east: -20, north: 0 },
            { name: 'TG2', east: 80, north: 0 },
          ],
        },
        hourAngles: [0],
      });
      expect(p.tables.vis2[0]!.nrows).toBe(1);
      for (let k = 0; k < p.vis2.length; k++) {
        expect(Math.abs(p.vis2.vcoord[k]!)).toBeLessThan(LENGTH_TOL);
        expect(Math.abs(p.vis2.ucoord[k]! - 100)).toBeLessThan(LENGTH_TOL);
        // u = UCOORD / EFF_WAVE, with EFF_WAVE as stored (a 32-bit float, TFORM E).
        expect(p.vis2.u[k]).toBeCloseTo(100 / Math.fround(BASE.instrument.wavelengths[k]!), 3);
        expect(p.vis2.u[k]! / (100 / BASE.instrument.wavelengths[k]!)).toBeCloseTo(1, 6);
      }
    }
  });

  it('sees a north-south baseline on the meridian foreshortened by the zenith distance, cos(dec - latitude)', () => {
    for (const [lat, dec] of [
      [-30, -60],
      [-30, 10],
      [45, 80],
    ] as const) {
      const p = projectBaseline(0, 50, 0, lat, dec, 0);
      expect(Math.abs(p.u)).toBeLessThan(LENGTH_TOL);
      expect(p.v).toBeCloseTo(50 * Math.cos((dec - lat) * RAD), 12);
    }
  });

  it('traces the ellipse u = L cos H, v = L sin(dec) sin H with an east-west baseline', () => {
    const L = 120;
    for (const dec of [-70, -20, 35]) {
      for (const h of [-4, -1.5, 0.5, 2, 5.75]) {
        const p = projectBaseline(L, 0, 0, -24.5, dec, h);
        expect(p.u).toBeCloseTo(L * Math.cos(h * 15 * RAD), 10);
        expect(p.v).toBeCloseTo(L * Math.sin(dec * RAD) * Math.sin(h * 15 * RAD), 10);
      }
    }
  });

  it('orients u east and v north for a target rising on the eastern horizon (equator, dec 0, H = -6 h)', () => {
    // Hour angle = sidereal time - RA, so a smaller hour angle (larger RA) lies further east, here below the
    // horizon: east on the sky points down (u of a vertical baseline is -L), north on the sky is local north
    // (the pole is on the northern horizon), and the line of sight is local east (w of an east baseline is L).
    const up = projectBaseline(0, 0, 40, 0, 0, -6);
    expect(up.u).toBeCloseTo(-40, 12);
    expect(Math.abs(up.v)).toBeLessThan(LENGTH_TOL);
    const north = projectBaseline(0, 40, 0, 0, 0, -6);
    expect(north.v).toBeCloseTo(40, 12);
    expect(Math.abs(north.u)).toBeLessThan(LENGTH_TOL);
    const east = projectBaseline(40, 0, 0, 0, 0, -6);
    expect(east.w).toBeCloseTo(40, 12);
    expect(Math.hypot(east.u, east.v)).toBeLessThan(LENGTH_TOL);
  });

  it('never projects a baseline longer than the physical one; u^2 + v^2 + w^2 is its squared length', () => {
    for (const dec of [-90, -45.25, -10, 0, 30, 89, 90]) {
      const p = plan({
        target: { name: 'Kestrel Minor', ra: 0, dec },
        hourAngles: [-6, -3, -1, 0, 2, 4.5, 8],
      });
      const sta = STATIONS;
      for (let k = 0; k < p.vis2.length; k++) {
        const a = sta[p.vis2.sta1[k]! - 1]!;
        const b = sta[p.vis2.sta2[k]! - 1]!;
        const de = b.east - a.east;
        const dn = b.north - a.north;
        const du = (b.up ?? 0) - (a.up ?? 0);
        const physical = Math.hypot(de, dn, du);
        expect(Math.hypot(p.vis2.ucoord[k]!, p.vis2.vcoord[k]!)).toBeLessThanOrEqual(physical + LENGTH_TOL);
      }
    }
    const p = projectBaseline(31.25, -4.5, 0.125, -24.5, -45.25, 1.7);
    expect(Math.hypot(p.u, p.v, p.w)).toBeCloseTo(Math.hypot(31.25, -4.5, 0.125), 12);
  });

  it('closes every triangle: u, v of (i, k) equal the sums over (i, j) and (j, k)', () => {
    const per = 6 * 3; // baselines x channels per snapshot
    const at = (snap: number, i: number, j: number) => {
      const rows = ds.vis2;
      for (let k = snap * per; k < (snap + 1) * per; k += 3) {
        if (rows.sta1[k] === i && rows.sta2[k] === j) return [rows.ucoord[k]!, rows.vcoord[k]!] as const;
      }
      throw new Error(`no baseline ${i}-${j}`);
    };
    let checked = 0;
    for (let s = 0; s < 5; s++) {
      for (let i = 1; i <= 4; i++)
        for (let j = i + 1; j <= 4; j++)
          for (let k = j + 1; k <= 4; k++) {
            const ij = at(s, i, j);
            const jk = at(s, j, k);
            const ik = at(s, i, k);
            expect(Math.abs(ij[0] + jk[0] - ik[0])).toBeLessThan(LENGTH_TOL);
            expect(Math.abs(ij[1] + jk[1] - ik[1])).toBeLessThan(LENGTH_TOL);
            checked++;
          }
    }
    expect(checked).toBe(20);
  });

  it('gives OI_T3 the VIS2 baselines AB as U1/V1 and BC as U2/V2, at the same MJD', () => {
    const v2 = ds.tables.vis2[0]!;
    const t3 = ds.tables.t3[0]!;
    const vs = col(v2, 'STA_INDEX');
    const ts = col(t3, 'STA_INDEX');
    const find = (mjd: number, a: number, b: number) => {
      for (let r = 0; r < v2.nrows; r++) {
        if (col(v2, 'MJD')[r] === mjd && vs[2 * r] === a && vs[2 * r + 1] === b) return r;
      }
      throw new Error(`no VIS2 row ${a}-${b} at ${mjd}`);
    };
    for (let r = 0; r < t3.nrows; r++) {
      const mjd = col(t3, 'MJD')[r]!;
      const ab = find(mjd, ts[3 * r]!, ts[3 * r + 1]!);
      const bc = find(mjd, ts[3 * r + 1]!, ts[3 * r + 2]!);
      expect(col(t3, 'U1COORD')[r]).toBe(col(v2, 'UCOORD')[ab]);
      expect(col(t3, 'V1COORD')[r]).toBe(col(v2, 'VCOORD')[ab]);
      expect(col(t3, 'U2COORD')[r]).toBe(col(v2, 'UCOORD')[bc]);
      expect(col(t3, 'V2COORD')[r]).toBe(col(v2, 'VCOORD')[bc]);
    }
    // The same uv coverage in OI_VIS as in OI_VIS2.
    expect(Array.from(ds.vis.ucoord)).toEqual(Array.from(ds.vis2.ucoord));
    expect(Array.from(ds.vis.vcoord)).toEqual(Array.from(ds.vis2.vcoord));
  });

  it('keeps a polar target on a circle: u^2 + v^2 is the same at every hour angle when dec = 90', () => {
    const p = plan({ target: { name: 'Kestrel Minor', ra: 0, dec: 90 }, hourAngles: [-5, -1, 0, 2, 7] });
    const first = Math.hypot(p.vis2.ucoord[0]!, p.vis2.vcoord[0]!);
    for (let s = 1; s < 5; s++) {
      const k = s * 18; // TG1-TG2 of snapshot s
      expect(Math.abs(Math.hypot(p.vis2.ucoord[k]!, p.vis2.vcoord[k]!) - first)).toBeLessThan(LENGTH_TOL);
    }
  });

  it('dates snapshots by sidereal hours after the first, and sets DATE-OBS to the earliest', () => {
    const p = plan({ hourAngles: [1, 0, 3], mjd: 60430.5 });
    const mjd = p.tables.vis2[0]!;
    const rows = col(mjd, 'MJD');
    const sidereal = 1 / 1.00273790935; // mean solar days per sidereal day (from memory)
    expect(rows[0]).toBe(60430.5);
    expect(rows[6]).toBeCloseTo(60430.5 - sidereal / 24, 12);
    expect(rows[12]).toBeCloseTo(60430.5 + (2 * sidereal) / 24, 12);
    // MJD 60430 is 2024-04-30 (MJD 40587 = 1970-01-01).
    const earliest = 60430.5 - sidereal / 24;
    const iso = new Date((earliest - 40587) * 86_400_000).toISOString().slice(0, 19);
    expect(mjd.header.get('DATE-OBS')).toBe(iso);
    expect(iso.startsWith('2024-04-30T11:')).toBe(true);
    expect(col(mjd, 'TIME')[0]).toBeCloseTo(0.5 * 86400, 6);
    expect(col(mjd, 'INT_TIME')[0]).toBe(60);
  });

  it('uses the given baselines and triangles: a reversed pair flips u and v; two stations have no OI_T3', () => {
    const p = plan({ baselines: [['TG2', 'TG1']], triangles: [['TG3', 'TG1', 'TG4']] });
    expect(p.tables.vis2[0]!.nrows).toBe(5);
    expect(p.vis2.stations[0]).toBe('TG2-TG1');
    expect(p.vis2.ucoord[0]).toBeCloseTo(-ds.vis2.ucoord[0]!, 12);
    expect(p.vis2.vcoord[0]).toBeCloseTo(-ds.vis2.vcoord[0]!, 12);
    expect(p.t3.stations[0]).toBe('TG3-TG1-TG4');
    const two = plan({
      array: { name: 'TALLGRASS', latitude: -24.5, stations: STATIONS.slice(0, 2) },
    });
    expect(two.tables.t3).toEqual([]);
    expect(two.t3.length).toBe(0);
    expect(readOifits(writeOifits(two)).tables.t3).toEqual([]);
  });

  it('gives a dataset that simulate fills with a model', () => {
    const unresolved: SimulationModel = {
      visibilities: (u) => ({ re: new Float64Array(u.length).fill(1), im: new Float64Array(u.length) }),
      vis2: (u) => new Float64Array(u.length).fill(0.5),
      closurePhase: (u1) => new Float64Array(u1.length).fill(10),
      t3amp: (u1) => new Float64Array(u1.length).fill(0.25),
    };
    const { dataset } = simulate(unresolved, ds, { noise: true, seed: 3 });
    expect(dataset.vis2.length).toBe(ds.vis2.length);
    expect(dataset.vis2.value.some((x) => x !== 0.5)).toBe(true);
    expect(Array.from(dataset.vis2.u)).toEqual(Array.from(ds.vis2.u));
  });

  it('refuses bad options with an InputError naming the field and what is valid', () => {
    const cases: Array<[Record<string, unknown>, string, RegExp]> = [
      [{ target: { name: 'Kestrel Minor', ra: 10, dec: 95 } }, 'target.dec', /\[-90, 90\]/],
      [{ target: { name: 'Kestrel Minor', ra: 360, dec: 0 } }, 'target.ra', /\[0, 360\)/],
      [{ target: { name: '', ra: 10, dec: 0 } }, 'target.name', /non-empty/],
      [{ target: { name: 'Kestrel Minör', ra: 10, dec: 0 } }, 'target.name', /ASCII/],
      [
        { array: { name: 'TALLGRASS', latitude: 0, stations: [STATIONS[0]] } },
        'array.stations',
        /at least 2 stations/,
      ],
      [
        {
          array: { name: 'TALLGRASS', latitude: 0, stations: [STATIONS[0], { ...STATIONS[1], name: 'TG1' }] },
        },
        'array.stations[1].name',
        /unique/,
      ],
      [
        {
          array: {
            name: 'TALLGRASS',
            latitude: 0,
            stations: [STATIONS[0], { ...STATIONS[1], east: Number.NaN }],
          },
        },
        'array.stations[1].east',
        /finite/,
      ],
      [{ array: { name: 'TALLGRASS', latitude: -91, stations: STATIONS } }, 'array.latitude', /\[-90, 90\]/],
      [
        { instrument: { name: 'REEDPIPE', wavelengths: [2e-6, -1e-6], bandwidths: 1e-7 } },
        'instrument.wavelengths[1]',
        /positive/,
      ],
      [
        { instrument: { name: 'REEDPIPE', wavelengths: [], bandwidths: 1e-7 } },
        'instrument.wavelengths',
        /non-empty/,
      ],
      [
        { instrument: { name: 'REEDPIPE', wavelengths: [2e-6, 2.1e-6], bandwidths: [1e-7] } },
        'instrument.bandwidths',
        /one per wavelength/,
      ],
      [{ hourAngles: [0, Number.POSITIVE_INFINITY] }, 'hourAngles[1]', /finite/],
      [{ hourAngles: [] }, 'hourAngles', /non-empty/],
      [{ mjd: Number.NaN }, 'mjd', /days/],
      [{ errors: { vis2: 0 } }, 'errors.vis2', /positive/],
      [{ errors: { t3phi: -1 } }, 'errors.t3phi', /positive.*degrees/],
      [{ baselines: [['TG1', 'TG9']] }, 'baselines[0][1]', /not a station.*TG1, TG2, TG3, TG4/],
      [{ baselines: [['TG1', 'TG1']] }, 'baselines[0]', /two different stations/],
      [
        {
          baselines: [
            ['TG1', 'TG2'],
            ['TG2', 'TG1'],
          ],
        },
        'baselines[1]',
        /each once/,
      ],
      [{ triangles: [['TG1', 'TG2', 'TG2']] }, 'triangles[0]', /three different stations/],
    ];
    for (const [over, field, what] of cases) {
      const e = errorOf(over);
      expect(e.location.argument, field).toBe(field);
      expect(e.message).toContain(field);
      expect(e.message).toMatch(what);
    }
  });
});

describe.skipIf(!hasFitsverify)(
  'fitsverify on a planned observation (skipped: fitsverify not installed; apt-get install fitsverify)',
  () => {
    it('the written file verifies with 0 errors and 0 warnings', () => {
      const dir = mkdtempSync(join(tmpdir(), 'uvsky-plan-'));
      const path = join(dir, 'planned.fits');
      writeFileSync(path, writeOifits(planObservation(BASE)));
      const r = spawnSync('fitsverify', ['-q', path], { encoding: 'utf8' });
      expect(r.stdout + r.stderr).toMatch(/verification OK/);
    });
  },
);
