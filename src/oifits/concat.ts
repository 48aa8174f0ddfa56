/**
 * Concatenating several OIFITS datasets into one.
 *
 * @module
 */
import { InputError } from '../errors.js';
import { column, numeric, strings } from './columns.js';
import type { OifitsDataset, OiTable, OiTables, TargetInfo } from './dataset.js';
import { rebuild, replaceColumn, setKeyword, subsetTable } from './edit.js';
import type { TableColumn } from './fits/bintable.js';
import { flattenTables } from './flatten.js';

function sameData(a: OiTable, b: OiTable): boolean {
  if (a.nrows !== b.nrows || a.columns.length !== b.columns.length) return false;
  for (const ca of a.columns) {
    const cb = column(b, ca.name);
    if (!cb || cb.tform.code !== ca.tform.code || cb.tform.repeat !== ca.tform.repeat) return false;
    const x = ca.data as ArrayLike<unknown>;
    const y = cb.data as ArrayLike<unknown>;
    for (let i = 0; i < x.length; i++) if (!Object.is(x[i], y[i])) return false;
  }
  return true;
}

type NameKey = 'insname' | 'arrname' | 'corrname';
const KEYWORD: Record<NameKey, string> = { insname: 'INSNAME', arrname: 'ARRNAME', corrname: 'CORRNAME' };

/** Merges named tables (OI_WAVELENGTH, OI_ARRAY, OI_CORR); returns the merged list and per-dataset renames. */
function mergeNamed(
  lists: readonly (readonly OiTable[])[],
  key: NameKey,
): { tables: OiTable[]; renames: Map<string, string>[] } {
  const tables: OiTable[] = [];
  const renames: Map<string, string>[] = [];
  for (const list of lists) {
    const map = new Map<string, string>();
    for (const t of list) {
      const name = t[key] ?? '';
      const same = tables.find((x) => x[key] === name);
      if (same && sameData(same, t)) {
        map.set(name, name);
        continue;
      }
      let newName = name;
      for (let k = 2; tables.some((x) => x[key] === newName); k++) newName = `${name}_${k}`;
      tables.push(newName === name ? t : setKeyword(t, KEYWORD[key], 'string', newName));
      map.set(name, newName);
    }
    renames.push(map);
  }
  return { tables, renames };
}

/**
 * Concatenates datasets into one: targets are merged by name (TARGET_ID renumbered 1..n in order of first
 * appearance), OI_WAVELENGTH / OI_ARRAY / OI_CORR tables with the same name and identical content are shared,
 * and ones with the same name but different content are renamed (`NAME_2`, `NAME_3`, ...) together with every
 * data table that refers to them.
 *
 * @param datasets - one or more datasets (not changed)
 * @returns the combined dataset (version 2 if any input is version 2); its primary header is the first
 *   input's; warnings of all inputs are kept
 * @throws InputError when no dataset is given
 *
 * @example
 * ```ts
 * const all = concatOifits([readOifits(a, { name: 'a.fits' }), readOifits(b, { name: 'b.fits' })]);
 * ```
 */
export function concatOifits(datasets: readonly OifitsDataset[]): OifitsDataset {
  if (!(datasets as unknown[])?.length) {
    throw new InputError('concatOifits: give a non-empty array of datasets', { argument: 'datasets' });
  }
  if (datasets.length === 1) return datasets[0]!;
  // Targets by name.
  const targets: TargetInfo[] = [];
  const targetRows: Array<{ table: OiTable; row: number }> = [];
  const idMaps: Map<number, number>[] = [];
  for (const ds of datasets) {
    const m = new Map<number, number>();
    const tt = ds.tables.target[0]!;
    const ids = numeric(column(tt, 'TARGET_ID')!);
    const names = strings(column(tt, 'TARGET')!);
    for (let r = 0; r < tt.nrows; r++) {
      let at = targets.findIndex((t) => t.name === names[r]);
      if (at < 0) {
        at = targets.length;
        const info = ds.targets.find((t) => t.id === ids[r])!;
        targets.push({ ...info, id: at + 1 });
        targetRows.push({ table: tt, row: r });
      }
      m.set(ids[r]!, at + 1);
    }
    idMaps.push(m);
  }
  // Merged OI_TARGET: rows gathered from the inputs; the columns of the first table define the layout.
  const first = datasets[0]!.tables.target[0]!;
  const merged = first.columns.map((c): TableColumn => {
    const parts = targetRows.map(({ table, row }) => {
      const one = subsetTable(table, [row]);
      return column(one, c.name);
    });
    const per = parts[0] ? (parts[0].data as ArrayLike<unknown>).length : 0;
    if (
      parts.some((p) => !p || p.tform.code !== c.tform.code || (p.data as ArrayLike<unknown>).length !== per)
    ) {
      throw new InputError(
        `concatOifits: OI_TARGET column ${c.name} differs in type or size between the datasets; they cannot be merged`,
        { argument: 'datasets' },
      );
    }
    const data = Array.isArray(c.data)
      ? parts.flatMap((p) => p!.data as string[])
      : (() => {
          const C = (c.data as Float64Array).constructor as new (n: number) => Float64Array;
          const out = new C(parts.length * per);
          parts.forEach((p, i) => {
            out.set(p!.data as Float64Array, i * per);
          });
          return out;
        })();
    if (c.name === 'TARGET_ID') {
      const d = data as unknown as { [i: number]: number };
      targets.forEach((t, i) => {
        d[i] = t.id;
      });
    }
    return { ...c, data: data as TableColumn['data'] };
  });
  const targetTable = rebuild(first, { columns: merged, nrows: targets.length });

  const arrays = mergeNamed(
    datasets.map((d) => d.tables.array),
    'arrname',
  );
  const waves = mergeNamed(
    datasets.map((d) => d.tables.wavelength),
    'insname',
  );
  const corrs = mergeNamed(
    datasets.map((d) => d.tables.corr),
    'corrname',
  );
  const dataKind = (kind: 'vis' | 'vis2' | 't3' | 'flux'): OiTable[] =>
    datasets.flatMap((ds, i) =>
      ds.tables[kind].map((t) => {
        let out = t;
        const ins = waves.renames[i]!.get(t.insname ?? '');
        if (ins !== undefined && ins !== t.insname) out = setKeyword(out, 'INSNAME', 'string', ins);
        const arr = t.arrname !== undefined ? arrays.renames[i]!.get(t.arrname) : undefined;
        if (arr !== undefined && arr !== t.arrname) out = setKeyword(out, 'ARRNAME', 'string', arr);
        const corr = t.corrname !== undefined ? corrs.renames[i]!.get(t.corrname) : undefined;
        if (corr !== undefined && corr !== t.corrname) out = setKeyword(out, 'CORRNAME', 'string', corr);
        const tc = column(out, 'TARGET_ID')!;
        const src = tc.data as Int16Array;
        const C = src.constructor as new (n: number) => Int16Array;
        const ids = new C(src.length);
        for (let r = 0; r < src.length; r++) ids[r] = idMaps[i]!.get(src[r]!) ?? src[r]!;
        return replaceColumn(out, tc.name, ids);
      }),
    );
  const tables: OiTables = Object.freeze({
    target: [targetTable],
    array: arrays.tables,
    wavelength: waves.tables,
    corr: corrs.tables,
    vis: dataKind('vis'),
    vis2: dataKind('vis2'),
    t3: dataKind('t3'),
    flux: dataKind('flux'),
  });
  const views = flattenTables(tables, targets);
  return Object.freeze({
    name: datasets.map((d) => d.name).join('+'),
    version: datasets.some((d) => d.version === 2) ? 2 : 1,
    primary: datasets[0]!.primary,
    tables,
    targets: Object.freeze(targets),
    ...views,
    warnings: Object.freeze(datasets.flatMap((d) => d.warnings)),
  });
}
