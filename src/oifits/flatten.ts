/**
 * Builds the flat per-observable views (one entry per (row, channel), row-major, tables in order) from the
 * raw tables of a dataset.
 *
 * @module
 */
import { column, numeric, strings } from './columns.js';
import type {
  FlatCommon,
  FluxView,
  OiTable,
  OiTables,
  T3View,
  TargetInfo,
  Vis2View,
  VisView,
} from './dataset.js';

/** Which entries to keep. */
export interface FlattenOptions {
  /** Leave out flagged entries (FLAG = T). Default false: every entry is kept with its flag. */
  readonly dropFlagged?: boolean;
}

interface Lookup {
  readonly wave: Map<string, { eff: ArrayLike<number>; band: ArrayLike<number> }>;
  readonly stations: Map<string, Map<number, string>>;
  readonly targetNames: Map<number, string>;
}

function lookup(tables: OiTables, targets: readonly TargetInfo[]): Lookup {
  const wave = new Map<string, { eff: ArrayLike<number>; band: ArrayLike<number> }>();
  for (const t of tables.wavelength) {
    wave.set(t.insname ?? '', {
      eff: numeric(column(t, 'EFF_WAVE')!),
      band: numeric(column(t, 'EFF_BAND')!),
    });
  }
  const stations = new Map<string, Map<number, string>>();
  for (const t of tables.array) {
    const idx = numeric(column(t, 'STA_INDEX')!);
    const names = strings(column(t, 'STA_NAME')!);
    const m = new Map<number, string>();
    for (let i = 0; i < t.nrows; i++) m.set(idx[i]!, names[i]!);
    stations.set(t.arrname ?? '', m);
  }
  const targetNames = new Map<number, string>();
  for (const tg of targets) targetNames.set(tg.id, tg.name);
  return { wave, stations, targetNames };
}

interface Index {
  readonly table: Int32Array;
  readonly row: Int32Array;
  readonly channel: Int32Array;
  /** Entry offsets of each table's segment: entries of table t are [starts[t], starts[t + 1]). */
  readonly starts: number[];
}

function nwaveOf(t: OiTable, lk: Lookup): number {
  return lk.wave.get(t.insname ?? '')?.eff.length ?? 0;
}

function buildIndex(tables: readonly OiTable[], lk: Lookup, dropFlagged: boolean): Index {
  let total = 0;
  const flags: ArrayLike<number>[] = [];
  for (const t of tables) {
    const f = numeric(column(t, 'FLAG')!);
    flags.push(f);
    if (!dropFlagged) total += t.nrows * nwaveOf(t, lk);
    else for (let i = 0; i < f.length; i++) if (f[i] !== 1) total++;
  }
  const table = new Int32Array(total);
  const row = new Int32Array(total);
  const channel = new Int32Array(total);
  const starts: number[] = [0];
  let k = 0;
  tables.forEach((t, ti) => {
    const nw = nwaveOf(t, lk);
    const f = flags[ti]!;
    for (let r = 0; r < t.nrows; r++) {
      for (let c = 0; c < nw; c++) {
        if (dropFlagged && f[r * nw + c] === 1) continue;
        table[k] = ti;
        row[k] = r;
        channel[k] = c;
        k++;
      }
    }
    starts.push(k);
  });
  return { table, row, channel, starts };
}

/** Gathers a per-channel column (nwave values per row) of every table into one Float64Array. */
function gatherChannel(tables: readonly OiTable[], ix: Index, name: string, lk: Lookup): Float64Array {
  const out = new Float64Array(ix.row.length);
  tables.forEach((t, ti) => {
    const c = column(t, name);
    const end = ix.starts[ti + 1]!;
    if (!c) {
      out.fill(Number.NaN, ix.starts[ti]!, end);
      return;
    }
    const src = numeric(c);
    const nw = nwaveOf(t, lk);
    for (let k = ix.starts[ti]!; k < end; k++) out[k] = src[ix.row[k]! * nw + ix.channel[k]!]!;
  });
  return out;
}

/** Gathers element `elem` of a per-row column with `per` elements per row. */
function gatherRow(
  tables: readonly OiTable[],
  ix: Index,
  name: string,
  per = 1,
  elem = 0,
  missing = Number.NaN,
): Float64Array {
  const out = new Float64Array(ix.row.length);
  tables.forEach((t, ti) => {
    const c = column(t, name);
    const end = ix.starts[ti + 1]!;
    if (!c) {
      out.fill(missing, ix.starts[ti]!, end);
      return;
    }
    const src = numeric(c);
    const tnull = c.tnull;
    for (let k = ix.starts[ti]!; k < end; k++) {
      const v = src[ix.row[k]! * per + elem]!;
      out[k] = tnull !== undefined && v === tnull ? missing : v;
    }
  });
  return out;
}

function common(tables: readonly OiTable[], ix: Index, lk: Lookup): FlatCommon {
  const n = ix.row.length;
  const wavelength = new Float64Array(n);
  const band = new Float64Array(n);
  const flag = new Uint8Array(n);
  const insname: string[] = new Array<string>(n).fill('');
  tables.forEach((t, ti) => {
    const w = lk.wave.get(t.insname ?? '')!;
    const nw = w.eff.length;
    const f = numeric(column(t, 'FLAG')!);
    const ins = t.insname ?? '';
    for (let k = ix.starts[ti]!; k < ix.starts[ti + 1]!; k++) {
      const c = ix.channel[k]!;
      wavelength[k] = w.eff[c]!;
      band[k] = w.band[c]!;
      flag[k] = f[ix.row[k]! * nw + c] === 1 ? 1 : 0;
    }
    insname.fill(ins, ix.starts[ti]!, ix.starts[ti + 1]!);
  });
  const targetId = new Int32Array(gatherRow(tables, ix, 'TARGET_ID', 1, 0, -1));
  const targetName: string[] = new Array<string>(n).fill('');
  let lastId = Number.NaN;
  let lastName = '';
  for (let k = 0; k < n; k++) {
    const id = targetId[k]!;
    if (id !== lastId) {
      lastId = id;
      lastName = lk.targetNames.get(id) ?? '';
    }
    targetName[k] = lastName;
  }
  return {
    length: n,
    wavelength,
    band,
    mjd: gatherRow(tables, ix, 'MJD'),
    intTime: gatherRow(tables, ix, 'INT_TIME'),
    flag,
    targetId,
    targetName,
    table: ix.table,
    row: ix.row,
    channel: ix.channel,
    insname,
  };
}

function stationColumns(
  tables: readonly OiTable[],
  ix: Index,
  lk: Lookup,
  count: number,
): { sta: Int32Array[]; names: string[] } {
  const sta: Int32Array[] = [];
  for (let s = 0; s < count; s++) sta.push(new Int32Array(gatherRow(tables, ix, 'STA_INDEX', count, s, -1)));
  const names: string[] = new Array<string>(ix.row.length).fill('');
  tables.forEach((t, ti) => {
    const m = lk.stations.get(t.arrname ?? '');
    const rowNames: string[] = new Array<string>(t.nrows).fill('');
    const c = column(t, 'STA_INDEX');
    const src = c ? numeric(c) : [];
    const cache = new Map<number, string>(); // station tuple -> name, since few distinct tuples repeat
    for (let r = 0; r < t.nrows; r++) {
      let key = 0;
      for (let s = 0; s < count; s++) key = key * 65536 + ((src[r * count + s] ?? -1) & 0xffff);
      let name = cache.get(key);
      if (name === undefined) {
        const parts: string[] = [];
        for (let s = 0; s < count; s++) {
          const idx = src[r * count + s];
          parts.push(idx === undefined ? '?' : (m?.get(idx) ?? String(idx)));
        }
        name = parts.join('-');
        cache.set(key, name);
      }
      rowNames[r] = name;
    }
    for (let k = ix.starts[ti]!; k < ix.starts[ti + 1]!; k++) names[k] = rowNames[ix.row[k]!]!;
  });
  return { sta, names };
}

function divide(a: Float64Array, b: Float64Array): Float64Array {
  const out = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i]! / b[i]!;
  return out;
}

/**
 * Builds the four flat views of a dataset from its raw tables.
 *
 * @param tables - validated raw tables (every INSNAME resolves)
 * @param targets - the targets of OI_TARGET
 * @param options - whether to leave out flagged entries
 * @returns the views
 */
export function flattenTables(
  tables: OiTables,
  targets: readonly TargetInfo[],
  options: FlattenOptions = {},
): { vis2: Vis2View; vis: VisView; t3: T3View; flux: FluxView } {
  const lk = lookup(tables, targets);
  const drop = options.dropFlagged === true;

  const ix2 = buildIndex(tables.vis2, lk, drop);
  const c2 = common(tables.vis2, ix2, lk);
  const s2 = stationColumns(tables.vis2, ix2, lk, 2);
  const uc2 = gatherRow(tables.vis2, ix2, 'UCOORD');
  const vc2 = gatherRow(tables.vis2, ix2, 'VCOORD');
  const vis2: Vis2View = {
    ...c2,
    value: gatherChannel(tables.vis2, ix2, 'VIS2DATA', lk),
    error: gatherChannel(tables.vis2, ix2, 'VIS2ERR', lk),
    ucoord: uc2,
    vcoord: vc2,
    u: divide(uc2, c2.wavelength),
    v: divide(vc2, c2.wavelength),
    sta1: s2.sta[0]!,
    sta2: s2.sta[1]!,
    stations: s2.names,
  };

  const ixv = buildIndex(tables.vis, lk, drop);
  const cv = common(tables.vis, ixv, lk);
  const sv = stationColumns(tables.vis, ixv, lk, 2);
  const ucv = gatherRow(tables.vis, ixv, 'UCOORD');
  const vcv = gatherRow(tables.vis, ixv, 'VCOORD');
  const vis: VisView = {
    ...cv,
    visamp: gatherChannel(tables.vis, ixv, 'VISAMP', lk),
    visampError: gatherChannel(tables.vis, ixv, 'VISAMPERR', lk),
    visphi: gatherChannel(tables.vis, ixv, 'VISPHI', lk),
    visphiError: gatherChannel(tables.vis, ixv, 'VISPHIERR', lk),
    ucoord: ucv,
    vcoord: vcv,
    u: divide(ucv, cv.wavelength),
    v: divide(vcv, cv.wavelength),
    sta1: sv.sta[0]!,
    sta2: sv.sta[1]!,
    stations: sv.names,
  };

  const ix3 = buildIndex(tables.t3, lk, drop);
  const c3 = common(tables.t3, ix3, lk);
  const s3 = stationColumns(tables.t3, ix3, lk, 3);
  const u1c = gatherRow(tables.t3, ix3, 'U1COORD');
  const v1c = gatherRow(tables.t3, ix3, 'V1COORD');
  const u2c = gatherRow(tables.t3, ix3, 'U2COORD');
  const v2c = gatherRow(tables.t3, ix3, 'V2COORD');
  const t3: T3View = {
    ...c3,
    t3amp: gatherChannel(tables.t3, ix3, 'T3AMP', lk),
    t3ampError: gatherChannel(tables.t3, ix3, 'T3AMPERR', lk),
    t3phi: gatherChannel(tables.t3, ix3, 'T3PHI', lk),
    t3phiError: gatherChannel(tables.t3, ix3, 'T3PHIERR', lk),
    u1coord: u1c,
    v1coord: v1c,
    u2coord: u2c,
    v2coord: v2c,
    u1: divide(u1c, c3.wavelength),
    v1: divide(v1c, c3.wavelength),
    u2: divide(u2c, c3.wavelength),
    v2: divide(v2c, c3.wavelength),
    sta1: s3.sta[0]!,
    sta2: s3.sta[1]!,
    sta3: s3.sta[2]!,
    stations: s3.names,
  };

  const ixf = buildIndex(tables.flux, lk, drop);
  const cf = common(tables.flux, ixf, lk);
  const flux: FluxView = {
    ...cf,
    value: gatherChannel(tables.flux, ixf, 'FLUXDATA', lk),
    error: gatherChannel(tables.flux, ixf, 'FLUXERR', lk),
    sta1: new Int32Array(gatherRow(tables.flux, ixf, 'STA_INDEX', 1, 0, -1)),
  };
  return { vis2, vis, t3, flux };
}
