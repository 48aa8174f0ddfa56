/**
 * Validation of OIFITS tables: mandatory keywords and columns, column shapes, cross-references and values.
 * Every failure is an {@link OifitsError} naming file, HDU, table, column, row and keyword.
 *
 * @module
 */
import { column, numeric, strings } from './columns.js';
import type { OiTable, OiTables, TargetInfo } from './dataset.js';
import type { TableColumn } from './fits/bintable.js';
import { fail, type Warnings, type Where } from './fits/where.js';
import { type ColumnSpec, SCHEMAS, type TableSpec } from './schema.js';

const CLASS_CODES: Record<ColumnSpec['cls'], string> = {
  float: 'ED',
  int: 'BIJK',
  logical: 'L',
  string: 'A',
};
const CLASS_WORDS: Record<ColumnSpec['cls'], string> = {
  float: 'floating point (E or D)',
  int: 'integer (I, J, K or B)',
  logical: 'logical (L)',
  string: 'character (A)',
};

/** The table definition that applies to a table, with a warning when its OI_REVN is not one we know. */
export function specFor(t: OiTable, warnings: Warnings): TableSpec {
  const revs = SCHEMAS[t.extname];
  const spec = revs[t.revision];
  if (spec) return spec;
  const known = Object.keys(revs).map(Number);
  const best = Math.max(...known.filter((r) => r <= t.revision), Math.min(...known));
  warnings.add(
    { hdu: t.hdu, table: t.extname, keyword: 'OI_REVN' },
    `OI_REVN = ${t.revision} is not a revision uvsky knows for ${t.extname} (${known.join(', ')}); read as revision ${best}`,
  );
  return revs[best]!;
}

function where(t: OiTable, extra: Where = {}): Where {
  return { hdu: t.hdu, table: t.extname, ...extra };
}

/**
 * Checks one table against its definition: keywords present with the right type, mandatory columns present
 * with the right type class and fixed repeat counts; extra columns give warnings.
 */
export function checkTableShape(t: OiTable, spec: TableSpec, file: string, warnings: Warnings): void {
  for (const k of spec.keywords) {
    const v = t.header.get(k.name);
    if (v === undefined || v === null) {
      if (k.optional) continue;
      fail(
        file,
        where(t, { keyword: k.name }),
        `the mandatory keyword ${k.name} is missing; ${t.extname} revision ${t.revision} needs it (${k.type})`,
      );
    }
    const ok =
      k.type === 'string'
        ? typeof v === 'string'
        : k.type === 'int'
          ? typeof v === 'number' && Number.isInteger(v)
          : typeof v === 'number';
    if (!ok) {
      fail(
        file,
        where(t, { keyword: k.name }),
        `${k.name} = ${JSON.stringify(typeof v === 'bigint' ? v.toString() : v)} must be ${k.type === 'int' ? 'an integer' : k.type === 'float' ? 'a number' : 'a quoted string'}`,
      );
    }
  }
  const known = new Set(spec.columns.map((c) => c.name));
  for (const c of spec.columns) {
    const col = column(t, c.name);
    if (!col) {
      if (c.optional) continue;
      fail(
        file,
        where(t, { column: c.name }),
        `the mandatory column ${c.name} is missing; ${t.extname} revision ${t.revision} needs it (${CLASS_WORDS[c.cls]}${typeof c.repeat === 'number' ? `, ${c.repeat} per row` : c.repeat === 'NWAVE' ? ', one per channel' : ''})`,
      );
    }
    if (!CLASS_CODES[c.cls].includes(col.tform.code)) {
      fail(
        file,
        where(t, { column: c.name }),
        `column ${c.name} has TFORM ${col.tform.repeat}${col.tform.code}; it must be ${CLASS_WORDS[c.cls]}`,
      );
    }
    if (typeof c.repeat === 'number' && col.tform.repeat !== c.repeat) {
      fail(
        file,
        where(t, { column: c.name }),
        `column ${c.name} has ${col.tform.repeat} elements per row (TFORM ${col.tform.repeat}${col.tform.code}); it must have ${c.repeat}`,
      );
    }
  }
  for (const col of t.columns) {
    if (!known.has(col.name)) {
      warnings.add(
        where(t, { column: col.name }),
        `extra column ${col.name || '(unnamed)'} (not in the standard); kept as read`,
      );
    }
  }
}

function checkNwave(t: OiTable, spec: TableSpec, nwave: number, insname: string, file: string): void {
  for (const c of spec.columns) {
    if (c.repeat !== 'NWAVE' && c.repeat !== 'NWAVE2') continue;
    const want = c.repeat === 'NWAVE' ? nwave : nwave * nwave;
    const col = column(t, c.name);
    if (col && col.tform.repeat !== want) {
      fail(
        file,
        where(t, { column: c.name }),
        `column ${c.name} has ${col.tform.repeat} elements per row (TFORM ${col.tform.repeat}${col.tform.code}), but OI_WAVELENGTH INSNAME = '${insname}' has ${nwave} channels, so it needs ${want}${c.repeat === 'NWAVE2' ? ' (NWAVE x NWAVE)' : ''}`,
      );
    }
  }
}

/** Checks that every unflagged finite value has a positive finite error. */
function checkErrors(
  t: OiTable,
  valueName: string,
  errorName: string,
  nwave: number,
  flags: ArrayLike<number>,
  file: string,
): void {
  const vc = column(t, valueName);
  const ec = column(t, errorName);
  if (!vc || !ec) return;
  const val = numeric(vc);
  const err = numeric(ec);
  for (let r = 0; r < t.nrows; r++) {
    for (let c = 0; c < nwave; c++) {
      const i = r * nwave + c;
      if (flags[i] === 1) continue;
      const v = val[i]!;
      if (Number.isNaN(v)) continue;
      const e = err[i]!;
      if (!(e > 0) || !Number.isFinite(e)) {
        fail(
          file,
          where(t, { column: errorName, row: r + 1 }),
          `channel ${c + 1}: the error ${e} of the unflagged value ${valueName} = ${v} must be a positive finite number (flag the point, or give its error)`,
        );
      }
      if (!Number.isFinite(v)) {
        fail(
          file,
          where(t, { column: valueName, row: r + 1 }),
          `channel ${c + 1}: the unflagged value is ${v}; it must be finite or NaN`,
        );
      }
    }
  }
}

function uniqueNames(
  list: readonly OiTable[],
  key: 'insname' | 'arrname' | 'corrname',
  kw: string,
  file: string,
) {
  const map = new Map<string, OiTable>();
  for (const t of list) {
    const name = t[key];
    if (name === undefined) {
      fail(file, where(t, { keyword: kw }), `the mandatory keyword ${kw} is missing`);
    }
    const prev = map.get(name);
    if (prev) {
      fail(
        file,
        where(t, { keyword: kw }),
        `${kw} = '${name}' is used by HDU ${prev.hdu} too; each ${t.extname} table needs a distinct ${kw}`,
      );
    }
    map.set(name, t);
  }
  return map;
}

function nameList(m: Map<string, OiTable>): string {
  return m.size === 0 ? 'none' : [...m.keys()].map((k) => `'${k}'`).join(', ');
}

/**
 * Validates a complete set of tables: mandatory tables present, names unique, every INSNAME / ARRNAME /
 * CORRNAME / TARGET_ID / STA_INDEX resolved, shapes consistent with the channel count, wavelengths positive,
 * errors positive. Returns the targets.
 *
 * @param tables - tables grouped by kind
 * @param version - OIFITS version of the file (2 makes OI_ARRAY and ARRNAME mandatory)
 * @param file - file name for messages
 * @param warnings - warnings collector
 * @returns the targets of OI_TARGET
 * @throws OifitsError for the first problem found
 */
export function validateTables(
  tables: OiTables,
  version: 1 | 2,
  file: string,
  warnings: Warnings,
): TargetInfo[] {
  const specs = new Map<OiTable, TableSpec>();
  const all = [
    ...tables.target,
    ...tables.array,
    ...tables.wavelength,
    ...tables.corr,
    ...tables.vis,
    ...tables.vis2,
    ...tables.t3,
    ...tables.flux,
  ];
  for (const t of all) {
    const spec = specFor(t, warnings);
    specs.set(t, spec);
    checkTableShape(t, spec, file, warnings);
  }
  if (tables.target.length === 0) {
    fail(
      file,
      { table: 'OI_TARGET' },
      'the mandatory table OI_TARGET is missing; every OIFITS file has exactly one',
    );
  }
  if (tables.target.length > 1) {
    fail(
      file,
      where(tables.target[1]!),
      `a second OI_TARGET table (the first is HDU ${tables.target[0]!.hdu}); an OIFITS file has exactly one`,
    );
  }
  if (tables.vis.length + tables.vis2.length + tables.t3.length + tables.flux.length === 0) {
    fail(
      file,
      {},
      'the file has no data table; an OIFITS file needs at least one of OI_VIS, OI_VIS2, OI_T3, OI_FLUX',
    );
  }
  if (version === 2 && tables.array.length === 0) {
    fail(file, { table: 'OI_ARRAY' }, 'the mandatory table OI_ARRAY is missing; OIFITS 2 needs at least one');
  }

  // Targets.
  const tt = tables.target[0]!;
  const ids = numeric(column(tt, 'TARGET_ID')!);
  const names = strings(column(tt, 'TARGET')!);
  const ra = numeric(column(tt, 'RAEP0')!);
  const dec = numeric(column(tt, 'DECEP0')!);
  const targets: TargetInfo[] = [];
  const idSet = new Set<number>();
  for (let r = 0; r < tt.nrows; r++) {
    const id = ids[r]!;
    if (!(id >= 1)) {
      fail(file, where(tt, { column: 'TARGET_ID', row: r + 1 }), `TARGET_ID = ${id}; it must be >= 1`);
    }
    if (idSet.has(id)) {
      fail(
        file,
        where(tt, { column: 'TARGET_ID', row: r + 1 }),
        `TARGET_ID = ${id} appears twice; ids must be unique`,
      );
    }
    idSet.add(id);
    targets.push({ id, name: names[r]!, ra: ra[r]!, dec: dec[r]! });
  }

  // Arrays.
  const arrays = uniqueNames(tables.array, 'arrname', 'ARRNAME', file);
  const stationSets = new Map<string, Set<number>>();
  for (const [name, t] of arrays) {
    const idx = numeric(column(t, 'STA_INDEX')!);
    const set = new Set<number>();
    for (let r = 0; r < t.nrows; r++) {
      const s = idx[r]!;
      if (!(s >= 1))
        fail(file, where(t, { column: 'STA_INDEX', row: r + 1 }), `STA_INDEX = ${s}; it must be >= 1`);
      if (set.has(s))
        fail(file, where(t, { column: 'STA_INDEX', row: r + 1 }), `STA_INDEX = ${s} appears twice`);
      set.add(s);
    }
    stationSets.set(name, set);
  }

  // Wavelengths.
  const waves = uniqueNames(tables.wavelength, 'insname', 'INSNAME', file);
  for (const t of waves.values()) {
    if (t.nrows === 0) fail(file, where(t), 'OI_WAVELENGTH has no rows; it needs at least one channel');
    const w = numeric(column(t, 'EFF_WAVE')!);
    const b = numeric(column(t, 'EFF_BAND')!);
    for (let r = 0; r < t.nrows; r++) {
      if (!(w[r]! > 0) || !Number.isFinite(w[r]!)) {
        fail(
          file,
          where(t, { column: 'EFF_WAVE', row: r + 1 }),
          `EFF_WAVE = ${w[r]} m; a wavelength must be positive and finite`,
        );
      }
      if (!(b[r]! >= 0) || !Number.isFinite(b[r]!)) {
        fail(
          file,
          where(t, { column: 'EFF_BAND', row: r + 1 }),
          `EFF_BAND = ${b[r]} m; a bandwidth must be >= 0 and finite`,
        );
      }
    }
  }

  // Correlations.
  const corrs = uniqueNames(tables.corr, 'corrname', 'CORRNAME', file);
  for (const t of corrs.values()) {
    const ndata = t.header.get('NDATA') as number;
    for (const name of ['IINDX', 'JINDX']) {
      const v = numeric(column(t, name)!);
      for (let r = 0; r < t.nrows; r++) {
        if (!(v[r]! >= 1 && v[r]! <= ndata)) {
          fail(
            file,
            where(t, { column: name, row: r + 1 }),
            `${name} = ${v[r]}; it must be from 1 to NDATA = ${ndata}`,
          );
        }
      }
    }
  }

  // Data tables.
  const data: Array<[OiTable, number, Array<[string, string]>]> = [
    ...tables.vis.map(
      (t) =>
        [
          t,
          2,
          [
            ['VISAMP', 'VISAMPERR'],
            ['VISPHI', 'VISPHIERR'],
          ],
        ] as [OiTable, number, Array<[string, string]>],
    ),
    ...tables.vis2.map(
      (t) => [t, 2, [['VIS2DATA', 'VIS2ERR']]] as [OiTable, number, Array<[string, string]>],
    ),
    ...tables.t3.map(
      (t) =>
        [
          t,
          3,
          [
            ['T3AMP', 'T3AMPERR'],
            ['T3PHI', 'T3PHIERR'],
          ],
        ] as [OiTable, number, Array<[string, string]>],
    ),
    ...tables.flux.map(
      (t) => [t, 1, [['FLUXDATA', 'FLUXERR']]] as [OiTable, number, Array<[string, string]>],
    ),
  ];
  for (const [t, nsta, pairs] of data) {
    const spec = specs.get(t)!;
    const insname = t.insname;
    if (insname === undefined)
      fail(file, where(t, { keyword: 'INSNAME' }), 'the mandatory keyword INSNAME is missing');
    const wt = waves.get(insname);
    if (!wt) {
      fail(
        file,
        where(t, { keyword: 'INSNAME' }),
        `INSNAME = '${insname}' names no OI_WAVELENGTH table; the file has INSNAME ${nameList(waves)}`,
      );
    }
    const nwave = wt.nrows;
    checkNwave(t, spec, nwave, insname, file);
    let stations: Set<number> | undefined;
    if (t.arrname !== undefined) {
      stations = stationSets.get(t.arrname);
      if (!stations) {
        fail(
          file,
          where(t, { keyword: 'ARRNAME' }),
          `ARRNAME = '${t.arrname}' names no OI_ARRAY table; the file has ARRNAME ${nameList(arrays)}`,
        );
      }
    } else if (version === 2 && t.extname !== 'OI_FLUX') {
      fail(file, where(t, { keyword: 'ARRNAME' }), 'the mandatory keyword ARRNAME is missing (OIFITS 2)');
    }
    if (t.corrname !== undefined && !corrs.has(t.corrname)) {
      fail(
        file,
        where(t, { keyword: 'CORRNAME' }),
        `CORRNAME = '${t.corrname}' names no OI_CORR table; the file has CORRNAME ${nameList(corrs)}`,
      );
    }
    const tid = column(t, 'TARGET_ID')!;
    const tidv = numeric(tid);
    for (let r = 0; r < t.nrows; r++) {
      if (!idSet.has(tidv[r]!)) {
        fail(
          file,
          where(t, { column: 'TARGET_ID', row: r + 1 }),
          `TARGET_ID = ${tidv[r]} is not in OI_TARGET (ids ${[...idSet].join(', ')})`,
        );
      }
    }
    const sc: TableColumn | undefined = column(t, 'STA_INDEX');
    if (sc && stations) {
      const sv = numeric(sc);
      if (sc.tform.repeat !== nsta) {
        fail(
          file,
          where(t, { column: 'STA_INDEX' }),
          `STA_INDEX has ${sc.tform.repeat} elements per row; it must have ${nsta}`,
        );
      }
      for (let q = 0; q < sv.length; q++) {
        const s = sv[q]!;
        if (sc.tnull !== undefined && s === sc.tnull) continue;
        if (!stations.has(s)) {
          fail(
            file,
            where(t, { column: 'STA_INDEX', row: Math.floor(q / nsta) + 1 }),
            `STA_INDEX = ${s} is not a station of OI_ARRAY ARRNAME = '${t.arrname}' (stations ${[...stations].join(', ')})`,
          );
        }
      }
    }
    const flags = numeric(column(t, 'FLAG')!);
    for (const [v, e] of pairs) checkErrors(t, v, e, nwave, flags, file);
  }
  return targets;
}
