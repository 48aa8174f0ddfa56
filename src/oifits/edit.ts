/**
 * Building new tables from old ones without touching the old ones: replacing columns and keywords, keeping
 * a subset of rows and channels.
 *
 * @module
 */
import type { OiTable } from './dataset.js';
import { type ColumnData, type TableColumn, type Tform, valuesPerRow } from './fits/bintable.js';
import type { CardKind, CardValue, FitsHeader } from './fits/header.js';
import { asOiTable } from './read.js';
import { SCHEMAS } from './schema.js';

/** A new table with other columns, row count or header (OI identity re-read from the header). */
export function rebuild(
  t: OiTable,
  changes: { columns?: readonly TableColumn[]; nrows?: number; header?: FitsHeader },
): OiTable {
  const header = changes.header ?? t.header;
  return asOiTable(
    t.extname,
    t.hdu,
    header,
    changes.nrows ?? t.nrows,
    changes.columns ?? t.columns,
    '<memory>',
  );
}

/** A new table with one keyword set. */
export function setKeyword(
  t: OiTable,
  kw: string,
  kind: Exclude<CardKind, 'commentary'>,
  value: CardValue,
): OiTable {
  return rebuild(t, { header: t.header.with(kw, kind, value) });
}

/** A new table with the data of column `name` replaced (same TFORM; the caller gives the right length). */
export function replaceColumn(t: OiTable, name: string, data: ColumnData): OiTable {
  return rebuild(t, { columns: t.columns.map((c) => (c.name === name ? { ...c, data } : c)) });
}

function allocLike(data: ColumnData, n: number): ColumnData {
  if (Array.isArray(data)) return new Array<string>(n);
  const C = (data as Float64Array).constructor as new (n: number) => Float64Array;
  return new C(n);
}

/** Whether a column holds one value per spectral channel (by the table definition, or by its size). */
export function isPerChannel(t: OiTable, c: TableColumn, nwave: number): boolean {
  const spec = Object.values(SCHEMAS[t.extname])
    .flatMap((s) => s.columns)
    .find((s) => s.name === c.name);
  if (spec) return spec.repeat === 'NWAVE';
  return c.tform.code !== 'A' && c.tform.repeat === nwave && nwave > 1;
}

const ELEMENT_BYTES: Record<string, number> = { L: 1, B: 1, I: 2, J: 4, K: 8, E: 4, D: 8, C: 8, M: 16, A: 1 };

/**
 * A new table with only the given rows, and (for per-channel columns) only the given channels.
 *
 * @param t - the table
 * @param rows - rows to keep (0-based, in the order given)
 * @param channels - channels to keep and the table's channel count, or undefined to keep all
 * @returns the new table; `VISREFMAP` (NWAVE x NWAVE) is cut along both axes
 */
export function subsetTable(
  t: OiTable,
  rows: ArrayLike<number>,
  channels?: { readonly nwave: number; readonly keep: readonly number[] },
): OiTable {
  const columns = t.columns.map((c): TableColumn => {
    const per = valuesPerRow(c);
    const nw = channels?.nwave ?? 0;
    const square = channels && c.name === 'VISREFMAP' && c.tform.repeat === nw * nw;
    const perChannel = channels && !square && isPerChannel(t, c, nw) && c.tform.repeat === nw;
    let pick: number[];
    if (square) {
      pick = [];
      for (const j of channels.keep) for (const i of channels.keep) pick.push(j * nw + i);
    } else if (perChannel) {
      const mult = per / nw; // 2 for complex C/M columns
      pick = [];
      for (const ch of channels.keep) for (let m = 0; m < mult; m++) pick.push(ch * mult + m);
    } else {
      pick = Array.from({ length: per }, (_, i) => i);
    }
    const out = allocLike(c.data, rows.length * pick.length) as { [i: number]: number | string };
    const src = c.data as ArrayLike<number | string>;
    let k = 0;
    for (let r = 0; r < rows.length; r++) {
      const base = rows[r]! * per;
      for (const p of pick) out[k++] = src[base + p]!;
    }
    if (!square && !perChannel) return { ...c, data: out as unknown as ColumnData };
    const repeat = square ? channels.keep.length ** 2 : channels!.keep.length;
    const tform: Tform = { ...c.tform, repeat, bytes: repeat * (ELEMENT_BYTES[c.tform.code] ?? 1) };
    const next: TableColumn = { ...c, tform, data: out as unknown as ColumnData };
    if (c.dim) {
      const { dim: _dim, ...rest } = next;
      return square ? { ...rest, dim: [channels.keep.length, channels.keep.length] } : rest;
    }
    return next;
  });
  return rebuild(t, { columns, nrows: rows.length });
}
