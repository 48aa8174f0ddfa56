/**
 * FITS BINTABLE codec: TFORM parsing, column decoding from big-endian rows into typed arrays, and encoding
 * back.
 *
 * Sources: FITS standard 4.0 section 7.3 (binary table extension): 7.3.1 mandatory keywords (XTENSION,
 * BITPIX = 8, NAXIS = 2, NAXIS1 = bytes per row, NAXIS2 = rows, PCOUNT, GCOUNT = 1, TFIELDS, TFORMn), 7.3.2
 * TTYPE/TUNIT/TNULL/TSCAL/TZERO/TDIM/TDISP, 7.3.3 data types (table 18, from memory: L logical 1 byte, X bit,
 * B unsigned byte, I int16, J int32, K int64, A character, E float32, D float64, C complex float32 pair,
 * M complex float64 pair, P/Q array descriptors 8/16 bytes), big-endian two's complement integers and IEEE
 * floats; 7.3.3.1 logical fields hold 'T', 'F' or 0 (null); character fields may end at an ASCII NUL.
 *
 * @module
 */
import { FitsHeader, type HeaderCard } from './header.js';
import { fail, type Where } from './where.js';

/** A TFORM type code this codec knows. */
export type TformCode = 'L' | 'X' | 'B' | 'I' | 'J' | 'K' | 'A' | 'E' | 'D' | 'C' | 'M' | 'P' | 'Q';

/** A parsed TFORMn value. */
export interface Tform {
  /** Repeat count r (elements per row; bits for X). */
  readonly repeat: number;
  /** Type code. */
  readonly code: TformCode;
  /** Anything written after the code (e.g. the `w` of `rAw`, or `E(100)` of a `P` descriptor). */
  readonly suffix: string;
  /** Bytes per row taken by the field. */
  readonly bytes: number;
}

const ELEMENT_BYTES: Record<TformCode, number> = {
  L: 1,
  X: 0,
  B: 1,
  I: 2,
  J: 4,
  K: 8,
  A: 1,
  E: 4,
  D: 8,
  C: 8,
  M: 16,
  P: 8,
  Q: 16,
};

const TFORM_RE = /^([0-9]*)([LXBIJKAEDCMPQ])(.*)$/;

/**
 * Parses a TFORMn value such as `1D`, `16A`, `3D`, `PE(12)`.
 *
 * @param text - the TFORM value (blanks around are ignored)
 * @returns the repeat count, type code and field width in bytes, or undefined when it is not a TFORM
 */
export function parseTform(text: string): Tform | undefined {
  const m = TFORM_RE.exec(text.trim());
  if (!m) return undefined;
  const repeat = m[1] === '' ? 1 : Number(m[1]);
  if (!Number.isSafeInteger(repeat)) return undefined;
  const code = m[2] as TformCode;
  const bytes = code === 'X' ? Math.ceil(repeat / 8) : repeat * ELEMENT_BYTES[code];
  return { repeat, code, suffix: m[3] ?? '', bytes };
}

/** Column values: numbers in typed arrays (one entry per element, row-major), or strings for `A` columns. */
export type ColumnData =
  | Float64Array
  | Float32Array
  | Int32Array
  | Int16Array
  | Uint8Array
  | readonly string[];

/** One column of a binary table with its data decoded. */
export interface TableColumn {
  /** TTYPEn (upper case as written; `''` when absent). */
  readonly name: string;
  /** TFORMn parsed. */
  readonly tform: Tform;
  /** TUNITn, when present. */
  readonly unit?: string;
  /** TDIMn axes (first axis varies fastest), when present. */
  readonly dim?: readonly number[];
  /** TNULLn (integer columns), when present. */
  readonly tnull?: number;
  /** TSCALn, when present (values are stored raw; physical = TZERO + TSCAL * raw). */
  readonly tscal?: number;
  /** TZEROn, when present. */
  readonly tzero?: number;
  /** TDISPn, when present. */
  readonly disp?: string;
  /**
   * Values, one row after the other: L as Uint8Array (1 = T, 0 = F, 255 = null byte), X and P/Q as their
   * raw bytes (Uint8Array), B Uint8Array, I Int16Array, J Int32Array, K Float64Array (exact: values beyond
   * +-(2^53 - 1) are refused), E Float32Array, D Float64Array, C Float32Array and M Float64Array as
   * interleaved (re, im) pairs, A as one string per (row, string) where a string is `dim[0]` (else `repeat`)
   * characters, cut at the first NUL and with trailing blanks removed.
   */
  readonly data: ColumnData;
}

/** Number of strings per row of an `A` column. */
export function stringsPerRow(col: Pick<TableColumn, 'tform' | 'dim'>): number {
  const w = stringWidth(col);
  return w === 0 ? 0 : Math.floor(col.tform.repeat / w);
}

/** Characters per string of an `A` column (TDIM's first axis, or the whole repeat count). */
export function stringWidth(col: Pick<TableColumn, 'tform' | 'dim'>): number {
  const d0 = col.dim?.[0];
  return d0 !== undefined && d0 > 0 && d0 <= col.tform.repeat ? d0 : col.tform.repeat;
}

/** Number of stored values per row of a column (`C`/`M` count two numbers per element). */
export function valuesPerRow(col: Pick<TableColumn, 'tform' | 'dim'>): number {
  const t = col.tform;
  switch (t.code) {
    case 'A':
      return stringsPerRow(col);
    case 'C':
    case 'M':
      return 2 * t.repeat;
    case 'X':
    case 'P':
    case 'Q':
      return t.bytes;
    default:
      return t.repeat;
  }
}

/** A decoded binary table: its header and its columns. */
export interface BinaryTable {
  /** The whole header as read (structural keywords included). */
  readonly header: FitsHeader;
  /** Number of rows (NAXIS2). */
  readonly nrows: number;
  /** Columns in TFIELDS order. */
  readonly columns: readonly TableColumn[];
}

/** Layout of a binary-table HDU read from its header, checked but not yet decoded. */
export interface TableLayout {
  readonly rowBytes: number;
  readonly nrows: number;
  readonly heapBytes: number;
  readonly fields: readonly FieldLayout[];
}

interface FieldLayout {
  readonly index: number;
  readonly name: string;
  readonly tform: Tform;
  readonly offset: number;
  readonly unit?: string;
  readonly dim?: readonly number[];
  readonly tnull?: number;
  readonly tscal?: number;
  readonly tzero?: number;
  readonly disp?: string;
}

function intKeyword(h: FitsHeader, kw: string, file: string, where: Where, min: number): number {
  const v = h.get(kw);
  if (typeof v !== 'number' || !Number.isInteger(v) || v < min) {
    fail(
      file,
      { ...where, keyword: kw },
      `${kw} must be an integer >= ${min} (FITS 4.0 section 7.3.1), got ${v === undefined ? 'no such keyword' : JSON.stringify(typeof v === 'bigint' ? v.toString() : v)}`,
    );
  }
  return v;
}

/**
 * Reads and checks the layout of a BINTABLE header: NAXIS1 equals the sum of the field widths, every TFORM
 * parses, TDIM fits in its repeat count.
 *
 * @param header - the extension header
 * @param file - file name for messages
 * @param where - HDU and table name for messages
 * @returns the row width, row count, heap size and the fields
 * @throws OifitsError on any inconsistency
 */
export function tableLayout(header: FitsHeader, file: string, where: Where): TableLayout {
  const bitpix = header.get('BITPIX');
  if (bitpix !== 8) {
    fail(
      file,
      { ...where, keyword: 'BITPIX' },
      `a BINTABLE has BITPIX = 8 (FITS 4.0 section 7.3.1), got ${bitpix}`,
    );
  }
  const naxis = header.get('NAXIS');
  if (naxis !== 2) {
    fail(
      file,
      { ...where, keyword: 'NAXIS' },
      `a BINTABLE has NAXIS = 2 (FITS 4.0 section 7.3.1), got ${naxis}`,
    );
  }
  const rowBytes = intKeyword(header, 'NAXIS1', file, where, 0);
  const nrows = intKeyword(header, 'NAXIS2', file, where, 0);
  const heapBytes = intKeyword(header, 'PCOUNT', file, where, 0);
  const gcount = header.get('GCOUNT');
  if (gcount !== 1) {
    fail(
      file,
      { ...where, keyword: 'GCOUNT' },
      `a BINTABLE has GCOUNT = 1 (FITS 4.0 section 7.3.1), got ${gcount}`,
    );
  }
  const tfields = intKeyword(header, 'TFIELDS', file, where, 0);
  if (tfields > 999) {
    fail(
      file,
      { ...where, keyword: 'TFIELDS' },
      `TFIELDS must be at most 999 (FITS 4.0 section 7.3.1), got ${tfields}`,
    );
  }
  const fields: FieldLayout[] = [];
  let offset = 0;
  for (let i = 1; i <= tfields; i++) {
    const tformText = header.get(`TFORM${i}`);
    const nameV = header.get(`TTYPE${i}`);
    const name = typeof nameV === 'string' ? nameV.trim() : '';
    const fw: Where = { ...where, keyword: `TFORM${i}`, ...(name ? { column: name } : {}) };
    if (typeof tformText !== 'string') {
      fail(file, fw, `TFORM${i} is missing or not a string; every field needs one (FITS 4.0 section 7.3.1)`);
    }
    const tform = parseTform(tformText);
    if (!tform) {
      fail(
        file,
        fw,
        `TFORM${i} = ${JSON.stringify(tformText)} is not rT with T one of L X B I J K A E D C M P Q (FITS 4.0 section 7.3.1, table 18)`,
      );
    }
    const field: {
      index: number;
      name: string;
      tform: Tform;
      offset: number;
      unit?: string;
      dim?: readonly number[];
      tnull?: number;
      tscal?: number;
      tzero?: number;
      disp?: string;
    } = { index: i, name, tform, offset };
    const unit = header.get(`TUNIT${i}`);
    if (typeof unit === 'string') field.unit = unit;
    const disp = header.get(`TDISP${i}`);
    if (typeof disp === 'string') field.disp = disp;
    const tdim = header.get(`TDIM${i}`);
    if (tdim !== undefined) {
      const m = typeof tdim === 'string' ? /^\s*\(([0-9 ,]+)\)\s*$/.exec(tdim) : null;
      const dims = m ? m[1]!.split(',').map((s) => Number(s.trim())) : [];
      const prod = dims.reduce((a, b) => a * b, 1);
      if (!m || dims.some((d) => !Number.isInteger(d) || d < 1) || prod > tform.repeat) {
        fail(
          file,
          { ...fw, keyword: `TDIM${i}` },
          `TDIM${i} = ${JSON.stringify(tdim)} must be '(n1,n2,...)' of positive integers whose product is at most the repeat count ${tform.repeat} (FITS 4.0 section 7.3.2)`,
        );
      }
      field.dim = dims;
    }
    const tnull = header.get(`TNULL${i}`);
    if (tnull !== undefined) {
      if (typeof tnull !== 'number' || !Number.isInteger(tnull)) {
        fail(
          file,
          { ...fw, keyword: `TNULL${i}` },
          `TNULL${i} must be an integer (FITS 4.0 section 7.3.2), got ${tnull}`,
        );
      }
      field.tnull = tnull;
    }
    const tscal = header.get(`TSCAL${i}`);
    if (typeof tscal === 'number') field.tscal = tscal;
    const tzero = header.get(`TZERO${i}`);
    if (typeof tzero === 'number') field.tzero = tzero;
    fields.push(field);
    offset += tform.bytes;
  }
  if (offset !== rowBytes) {
    fail(
      file,
      { ...where, keyword: 'NAXIS1' },
      `NAXIS1 = ${rowBytes} bytes per row, but the TFORMs add up to ${offset} bytes; they must agree (FITS 4.0 section 7.3.1)`,
    );
  }
  return { rowBytes, nrows, heapBytes, fields };
}

/**
 * Decodes the columns of a binary table whose main data starts at `dataOffset` of `bytes`. The caller has
 * checked that `rowBytes * nrows` bytes are present.
 *
 * @param bytes - the file
 * @param dataOffset - byte offset of the first row
 * @param header - the table header
 * @param layout - from {@link tableLayout}
 * @param file - file name for messages
 * @param where - HDU and table for messages
 * @returns the decoded table
 * @throws OifitsError for a logical byte other than T, F, 0 or a K value beyond the safe integer range
 */
export function decodeTable(
  bytes: Uint8Array,
  dataOffset: number,
  header: FitsHeader,
  layout: TableLayout,
  file: string,
  where: Where,
): BinaryTable {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const { rowBytes, nrows } = layout;
  const columns: TableColumn[] = [];
  for (const f of layout.fields) {
    const r = f.tform.repeat;
    const n = nrows * r;
    // a field of zero width holds nothing: skip its rows, so decoding costs time in bytes, not in rows x fields
    const rows = f.tform.bytes === 0 ? 0 : nrows;
    let data: ColumnData;
    let p0 = dataOffset + f.offset;
    switch (f.tform.code) {
      case 'D': {
        const a = new Float64Array(n);
        let k = 0;
        for (let row = 0; row < rows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < r; j++, p += 8) a[k++] = dv.getFloat64(p, false);
        }
        data = a;
        break;
      }
      case 'E': {
        const a = new Float32Array(n);
        let k = 0;
        for (let row = 0; row < rows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < r; j++, p += 4) a[k++] = dv.getFloat32(p, false);
        }
        data = a;
        break;
      }
      case 'M': {
        const a = new Float64Array(2 * n);
        let k = 0;
        for (let row = 0; row < rows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < 2 * r; j++, p += 8) a[k++] = dv.getFloat64(p, false);
        }
        data = a;
        break;
      }
      case 'C': {
        const a = new Float32Array(2 * n);
        let k = 0;
        for (let row = 0; row < rows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < 2 * r; j++, p += 4) a[k++] = dv.getFloat32(p, false);
        }
        data = a;
        break;
      }
      case 'J': {
        const a = new Int32Array(n);
        let k = 0;
        for (let row = 0; row < rows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < r; j++, p += 4) a[k++] = dv.getInt32(p, false);
        }
        data = a;
        break;
      }
      case 'I': {
        const a = new Int16Array(n);
        let k = 0;
        for (let row = 0; row < rows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < r; j++, p += 2) a[k++] = dv.getInt16(p, false);
        }
        data = a;
        break;
      }
      case 'K': {
        const a = new Float64Array(n);
        let k = 0;
        for (let row = 0; row < rows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < r; j++, p += 8) {
            const hi = dv.getInt32(p, false);
            const v = hi * 4294967296 + dv.getUint32(p + 4, false);
            if (hi < -2097152 || hi >= 2097152 || !Number.isSafeInteger(v)) {
              fail(
                file,
                { ...where, column: f.name, row: row + 1 },
                `the 64-bit integer ${dv.getBigInt64(p, false)} is beyond the exactly representable range +-(2^53 - 1) of a JavaScript number`,
              );
            }
            a[k++] = v;
          }
        }
        data = a;
        break;
      }
      case 'B': {
        const a = new Uint8Array(n);
        let k = 0;
        for (let row = 0; row < rows; row++, p0 += rowBytes) {
          a.set(bytes.subarray(p0, p0 + r), k);
          k += r;
        }
        data = a;
        break;
      }
      case 'L': {
        const a = new Uint8Array(n);
        let k = 0;
        for (let row = 0; row < rows; row++, p0 += rowBytes) {
          for (let j = 0; j < r; j++) {
            const b = bytes[p0 + j]!;
            if (b === 0x54) a[k++] = 1;
            else if (b === 0x46) a[k++] = 0;
            else if (b === 0) a[k++] = 255;
            else {
              fail(
                file,
                { ...where, column: f.name, row: row + 1 },
                `element ${j + 1} of a logical (L) field holds the byte 0x${b.toString(16).padStart(2, '0')}; it must be 'T', 'F' or 0 for null (FITS 4.0 section 7.3.3.1)`,
              );
            }
          }
        }
        data = a;
        break;
      }
      case 'A': {
        const w = stringWidth(f);
        const per = w === 0 ? 0 : Math.floor(r / w);
        const out: string[] = new Array(nrows * per);
        let k = 0;
        for (let row = 0; row < rows; row++, p0 += rowBytes) {
          for (let s = 0; s < per; s++) out[k++] = readString(bytes, p0 + s * w, w);
        }
        data = out;
        break;
      }
      default: {
        // X, P, Q: kept as raw bytes (OIFITS uses none of them).
        const wb = f.tform.bytes;
        const a = new Uint8Array(nrows * wb);
        for (let row = 0, k = 0; row < rows; row++, p0 += rowBytes, k += wb)
          a.set(bytes.subarray(p0, p0 + wb), k);
        data = a;
      }
    }
    const col: Record<string, unknown> = { name: f.name, tform: f.tform, data };
    for (const key of ['unit', 'dim', 'tnull', 'tscal', 'tzero', 'disp'] as const) {
      if (f[key] !== undefined) col[key] = f[key];
    }
    columns.push(Object.freeze(col) as unknown as TableColumn);
  }
  return { header, nrows, columns };
}

function readString(bytes: Uint8Array, p: number, w: number): string {
  let end = p;
  const stop = p + w;
  while (end < stop && bytes[end] !== 0) end++;
  while (end > p && bytes[end - 1] === 0x20) end--;
  let s = '';
  for (let i = p; i < end; i++) s += String.fromCharCode(bytes[i]!);
  return s;
}

/** Keywords that the encoder writes itself from the columns (any in the input header are replaced). */
export function isStructuralKeyword(kw: string): boolean {
  return (
    /^(XTENSION|BITPIX|NAXIS|NAXIS[0-9]+|PCOUNT|GCOUNT|TFIELDS|THEAP|END)$/.test(kw) ||
    /^T(TYPE|FORM|UNIT|DIM|NULL|SCAL|ZERO|DISP)[0-9]+$/.test(kw)
  );
}

/**
 * Encodes a binary table as a complete HDU (header blocks and zero-padded data blocks).
 *
 * @param extra - non-structural header cards to write after the structural ones (EXTNAME, OI_REVN, ...);
 *   structural keywords among them are ignored
 * @param columns - the columns; every column must hold `nrows * valuesPerRow` values
 * @param nrows - number of rows
 * @returns the cards to write (structural first) and the data bytes (padded)
 * @throws RangeError when a column's data length does not match `nrows`, a string is too long or not ASCII,
 *   or a K value is not a safe integer
 */
export function encodeTable(
  extra: readonly HeaderCard[],
  columns: readonly TableColumn[],
  nrows: number,
): { cards: HeaderCard[]; data: Uint8Array } {
  const rowBytes = columns.reduce((s, c) => s + c.tform.bytes, 0);
  const cards: HeaderCard[] = [
    { keyword: 'XTENSION', kind: 'string', value: 'BINTABLE', comment: 'binary table extension' },
    { keyword: 'BITPIX', kind: 'integer', value: 8, comment: 'array data type' },
    { keyword: 'NAXIS', kind: 'integer', value: 2, comment: 'number of array dimensions' },
    { keyword: 'NAXIS1', kind: 'integer', value: rowBytes, comment: 'length of a row in bytes' },
    { keyword: 'NAXIS2', kind: 'integer', value: nrows, comment: 'number of rows' },
    { keyword: 'PCOUNT', kind: 'integer', value: 0, comment: 'size of special data area' },
    { keyword: 'GCOUNT', kind: 'integer', value: 1, comment: 'one data group' },
    { keyword: 'TFIELDS', kind: 'integer', value: columns.length, comment: 'number of columns' },
  ];
  columns.forEach((c, k) => {
    const i = k + 1;
    if (c.name !== '') cards.push({ keyword: `TTYPE${i}`, kind: 'string', value: c.name });
    cards.push({
      keyword: `TFORM${i}`,
      kind: 'string',
      value: `${c.tform.repeat}${c.tform.code}${c.tform.suffix}`,
    });
    if (c.unit !== undefined) cards.push({ keyword: `TUNIT${i}`, kind: 'string', value: c.unit });
    if (c.dim !== undefined)
      cards.push({ keyword: `TDIM${i}`, kind: 'string', value: `(${c.dim.join(',')})` });
    if (c.tnull !== undefined) cards.push({ keyword: `TNULL${i}`, kind: 'integer', value: c.tnull });
    if (c.tscal !== undefined) cards.push({ keyword: `TSCAL${i}`, kind: 'float', value: c.tscal });
    if (c.tzero !== undefined) cards.push({ keyword: `TZERO${i}`, kind: 'float', value: c.tzero });
    if (c.disp !== undefined) cards.push({ keyword: `TDISP${i}`, kind: 'string', value: c.disp });
  });
  for (const c of extra) if (c.kind === 'commentary' || !isStructuralKeyword(c.keyword)) cards.push(c);

  const main = rowBytes * nrows;
  const data = new Uint8Array(Math.ceil(main / 2880) * 2880);
  const dv = new DataView(data.buffer);
  let colOffset = 0;
  for (const c of columns) {
    const per = valuesPerRow(c);
    const len = c.data.length;
    if (len !== per * nrows) {
      throw new RangeError(
        `column ${c.name || '(unnamed)'} holds ${len} values; ${nrows} rows of TFORM ${c.tform.repeat}${c.tform.code} need ${per * nrows}`,
      );
    }
    let p0 = colOffset;
    const d = c.data;
    switch (c.tform.code) {
      case 'D':
      case 'M':
        for (let row = 0, k = 0; row < nrows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < per; j++, p += 8) dv.setFloat64(p, (d as Float64Array)[k++]!, false);
        }
        break;
      case 'E':
      case 'C':
        for (let row = 0, k = 0; row < nrows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < per; j++, p += 4) dv.setFloat32(p, (d as Float32Array)[k++]!, false);
        }
        break;
      case 'J':
        for (let row = 0, k = 0; row < nrows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < per; j++, p += 4) dv.setInt32(p, (d as Int32Array)[k++]!, false);
        }
        break;
      case 'I':
        for (let row = 0, k = 0; row < nrows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < per; j++, p += 2) dv.setInt16(p, (d as Int16Array)[k++]!, false);
        }
        break;
      case 'K':
        for (let row = 0, k = 0; row < nrows; row++, p0 += rowBytes) {
          for (let j = 0, p = p0; j < per; j++, p += 8) {
            const v = (d as Float64Array)[k++]!;
            if (!Number.isSafeInteger(v)) {
              throw new RangeError(`column ${c.name}: the K (int64) value ${v} is not a safe integer`);
            }
            dv.setBigInt64(p, BigInt(v), false);
          }
        }
        break;
      case 'L':
        for (let row = 0, k = 0; row < nrows; row++, p0 += rowBytes) {
          for (let j = 0; j < per; j++) {
            const v = (d as Uint8Array)[k++]!;
            data[p0 + j] = v === 255 ? 0 : v ? 0x54 : 0x46;
          }
        }
        break;
      case 'A': {
        const w = stringWidth(c);
        const strings = d as readonly string[];
        for (let row = 0, k = 0; row < nrows; row++, p0 += rowBytes) {
          for (let s = 0; s < per; s++) {
            const str = strings[k++]!;
            if (str.length > w) {
              throw new RangeError(
                `column ${c.name}, row ${row + 1}: the string ${JSON.stringify(str)} is longer than the ${w} characters of TFORM ${c.tform.repeat}A`,
              );
            }
            for (let q = 0; q < str.length; q++) {
              const code = str.charCodeAt(q);
              if (code < 0x20 || code > 0x7e) {
                throw new RangeError(
                  `column ${c.name}, row ${row + 1}: character code ${code} is not printable ASCII (FITS 4.0 section 7.3.3.1)`,
                );
              }
              data[p0 + s * w + q] = code;
            }
          }
        }
        break;
      }
      default:
        // B, X, P, Q: raw bytes.
        for (let row = 0, k = 0; row < nrows; row++, p0 += rowBytes, k += per) {
          data.set((d as Uint8Array).subarray(k, k + per), p0);
        }
    }
    colOffset += c.tform.bytes;
  }
  return { cards, data };
}

/** Looks a column up by TTYPE (exact, then case-insensitive). */
export function findColumn(table: Pick<BinaryTable, 'columns'>, name: string): TableColumn | undefined {
  return (
    table.columns.find((c) => c.name === name) ?? table.columns.find((c) => c.name.toUpperCase() === name)
  );
}

export { FitsHeader };
