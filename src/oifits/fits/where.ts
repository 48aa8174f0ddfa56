/**
 * Located errors for the FITS / OIFITS codec: every failure names the file, the HDU, the table, the column,
 * the row and the keyword it concerns, in words and in the structured `location` of {@link OifitsError}.
 *
 * @module
 */
import { type ErrorLocation, OifitsError } from '../../errors.js';

/** Where in a file a problem sits (HDU counted from 0 = primary, row counted from 1 as FITS does). */
export interface Where {
  readonly hdu?: number;
  readonly table?: string;
  readonly column?: string;
  readonly row?: number;
  readonly keyword?: string;
}

/** Describes a place in a file in words, e.g. `demo.fits, HDU 3 (OI_VIS2), column VIS2ERR, row 7`. */
export function describeWhere(file: string, where: Where): string {
  const parts: string[] = [file];
  if (where.hdu !== undefined) {
    parts.push(where.table ? `HDU ${where.hdu} (${where.table})` : `HDU ${where.hdu}`);
  } else if (where.table) {
    parts.push(`table ${where.table}`);
  }
  if (where.keyword !== undefined) parts.push(`keyword ${where.keyword}`);
  if (where.column !== undefined) parts.push(`column ${where.column}`);
  if (where.row !== undefined) parts.push(`row ${where.row}`);
  return parts.join(', ');
}

/** Builds (does not throw) an {@link OifitsError} located at `where` in `file`. */
export function oifitsError(file: string, where: Where, message: string): OifitsError {
  const location: ErrorLocation = { file, ...where };
  return new OifitsError(`${describeWhere(file, where)}: ${message}`, location);
}

/** Throws an {@link OifitsError} located at `where` in `file`. */
export function fail(file: string, where: Where, message: string): never {
  throw oifitsError(file, where, message);
}

/** Collects warnings for a file, each prefixed with its place. */
export class Warnings {
  readonly list: string[] = [];
  constructor(readonly file: string) {}
  add(where: Where, message: string): void {
    this.list.push(`${describeWhere(this.file, where)}: ${message}`);
  }
}
