/**
 * Small helpers to reach the columns and keywords of decoded tables.
 *
 * @module
 */
import { type BinaryTable, findColumn, type TableColumn } from './fits/bintable.js';
import type { FitsHeader } from './fits/header.js';

/** The column named `name`, or undefined. */
export function column(table: Pick<BinaryTable, 'columns'>, name: string): TableColumn | undefined {
  return findColumn(table, name);
}

/**
 * The physical numeric values of a column: the stored numbers, scaled by TZERO + TSCAL * raw when those
 * keywords are present (FITS 4.0 section 7.3.2). Logical columns give 1/0 (and 255 for null).
 *
 * @param c - a numeric or logical column
 * @returns the values (the column's own array when no scaling applies; never to be written to)
 */
export function numeric(c: TableColumn): ArrayLike<number> {
  if (typeof c.data[0] === 'string' || Array.isArray(c.data)) {
    throw new TypeError(`column ${c.name} holds strings, not numbers`);
  }
  const d = c.data as ArrayLike<number>;
  const s = c.tscal ?? 1;
  const z = c.tzero ?? 0;
  if (s === 1 && z === 0) return d;
  const out = new Float64Array(d.length);
  for (let i = 0; i < d.length; i++) out[i] = z + s * d[i]!;
  return out;
}

/** The strings of an `A` column. */
export function strings(c: TableColumn): readonly string[] {
  if (!Array.isArray(c.data)) throw new TypeError(`column ${c.name} holds numbers, not strings`);
  return c.data as readonly string[];
}

/** A string keyword with trailing blanks removed, or undefined when absent or not a string. */
export function keywordString(h: FitsHeader, kw: string): string | undefined {
  const v = h.get(kw);
  return typeof v === 'string' ? v.trimEnd() : undefined;
}
