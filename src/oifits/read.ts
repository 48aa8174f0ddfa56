/**
 * Reading OIFITS files (version 2, and version 1) from bytes.
 *
 * @module
 */
import { InputError } from '../errors.js';
import { keywordString } from './columns.js';
import type { OifitsDataset, OiTable, OiTables } from './dataset.js';
import { decodeTable, type FitsHeader, tableLayout } from './fits/bintable.js';
import { splitHdus } from './fits/hdu.js';
import { fail, Warnings } from './fits/where.js';
import { flattenTables } from './flatten.js';
import { OI_OTHER_TABLES, OI_TABLE_NAMES, type OiTableName, PRIMARY_V2_KEYWORDS } from './schema.js';
import { validateTables } from './validate.js';

/** Options of {@link readOifits}. */
export interface ReadOifitsOptions {
  /** Name of the file, used in error messages and warnings (default `<bytes>`). */
  readonly name?: string;
  /** Leave flagged entries out of the flat views (default false: keep them, with `flag` = 1). */
  readonly dropFlagged?: boolean;
}

const OI_NAMES: ReadonlySet<string> = new Set(OI_TABLE_NAMES);

const KIND: Record<OiTableName, keyof OiTables> = {
  OI_TARGET: 'target',
  OI_ARRAY: 'array',
  OI_WAVELENGTH: 'wavelength',
  OI_CORR: 'corr',
  OI_VIS: 'vis',
  OI_VIS2: 'vis2',
  OI_T3: 't3',
  OI_FLUX: 'flux',
};

/** The key of `OiTables` that holds tables of this EXTNAME. */
export function tableKind(extname: OiTableName): keyof OiTables {
  return KIND[extname];
}

/** Builds an {@link OiTable} from a decoded table's header (reads OI_REVN, INSNAME, ARRNAME, CORRNAME). */
export function asOiTable(
  extname: OiTableName,
  hdu: number,
  header: FitsHeader,
  nrows: number,
  columns: OiTable['columns'],
  file: string,
): OiTable {
  const revn = header.get('OI_REVN');
  if (typeof revn !== 'number' || !Number.isInteger(revn) || revn < 1) {
    fail(
      file,
      { hdu, table: extname, keyword: 'OI_REVN' },
      revn === undefined
        ? 'the mandatory keyword OI_REVN is missing; every OIFITS table has it (2 for OIFITS 2, 1 for OIFITS 1)'
        : `OI_REVN = ${JSON.stringify(typeof revn === 'bigint' ? revn.toString() : revn)} must be an integer >= 1`,
    );
  }
  const t: {
    extname: OiTableName;
    revision: number;
    hdu: number;
    header: FitsHeader;
    nrows: number;
    columns: OiTable['columns'];
    insname?: string;
    arrname?: string;
    corrname?: string;
  } = { extname, revision: revn, hdu, header, nrows, columns };
  const ins = keywordString(header, 'INSNAME');
  if (ins !== undefined) t.insname = ins;
  const arr = keywordString(header, 'ARRNAME');
  if (arr !== undefined) t.arrname = arr;
  const corr = keywordString(header, 'CORRNAME');
  if (corr !== undefined) t.corrname = corr;
  return Object.freeze(t);
}

/**
 * Reads an OIFITS file (version 2 or 1) from its bytes.
 *
 * @param bytes - the whole file; it is only read, never changed
 * @param options - `name` for messages; `dropFlagged` to leave flagged entries out of the flat views
 * @returns the dataset: raw tables and headers, flat views per observable (u, v in cycles per radian,
 *   UCOORD / VCOORD in metres, wavelengths in metres, phases in degrees as stored), and warnings
 * @throws OifitsError (a UvskyError) naming file, HDU, table, column, row and keyword for a
 *   truncated or malformed file, a missing mandatory table / keyword / column, a wrong column shape, a
 *   dangling INSNAME / ARRNAME / CORRNAME / TARGET_ID / STA_INDEX, a non-positive error of an unflagged value,
 *   or a wavelength that is not positive
 * @throws InputError when `bytes` is neither a Uint8Array nor an ArrayBuffer
 *
 * Notes: FITS structure after the FITS standard 4.0 (sections 3, 4, 7.3); the OIFITS tables after Pauls et
 * al. 2005 (PASP 117:1255) and Duvert, Young & Hummel 2017 (A&A 597:A8), see `schema.ts` for which parts
 * were checked against the papers' tables and which are from memory. Declared sizes are compared with the
 * file's length before any column is allocated. Extra HDUs and extra columns give warnings. Columns are
 * decoded with one DataView pass each into typed arrays (no per-row objects).
 *
 * @example
 * ```ts
 * const ds = readOifits(bytes, { name: 'night1.fits' });
 * ds.vis2.length;   // entries = rows x channels of all OI_VIS2 tables
 * ds.vis2.u[0];     // UCOORD / EFF_WAVE of the first entry, cycles per radian
 * ```
 */
export function readOifits(bytes: Uint8Array | ArrayBuffer, options: ReadOifitsOptions = {}): OifitsDataset {
  const file = options.name ?? '<bytes>';
  let u8: Uint8Array;
  if (bytes instanceof Uint8Array) u8 = bytes;
  else if (bytes instanceof ArrayBuffer) u8 = new Uint8Array(bytes);
  else {
    throw new InputError(`readOifits: bytes must be a Uint8Array or an ArrayBuffer, got ${typeof bytes}`, {
      argument: 'bytes',
      file,
    });
  }
  const warnings = new Warnings(file);
  const hdus = splitHdus(u8, file, warnings);
  const primary = hdus[0]!.header;
  if (hdus[0]!.dataBytes > 0)
    warnings.add({ hdu: 0 }, 'the primary HDU holds a data array; OIFITS does not use it (ignored)');

  const groups: Record<keyof OiTables, OiTable[]> = {
    target: [],
    array: [],
    wavelength: [],
    corr: [],
    vis: [],
    vis2: [],
    t3: [],
    flux: [],
  };
  for (const hdu of hdus.slice(1)) {
    const name = hdu.extname;
    if (hdu.xtension !== 'BINTABLE' || name === undefined || !OI_NAMES.has(name)) {
      const what =
        name === undefined ? `an unnamed ${hdu.xtension} extension` : `${hdu.xtension} extension ${name}`;
      const why =
        name !== undefined && OI_OTHER_TABLES.has(name)
          ? 'an OIFITS table uvsky does not interpret'
          : 'not an OIFITS table';
      warnings.add({ hdu: hdu.index }, `${what} is ${why}; skipped`);
      continue;
    }
    const extname = name as OiTableName;
    const where = { hdu: hdu.index, table: extname };
    const layout = tableLayout(hdu.header, file, where);
    if (layout.rowBytes * layout.nrows + layout.heapBytes > hdu.dataBytes) {
      fail(file, where, `the table declares more bytes than its data part holds`);
    }
    if (layout.rowBytes === 0 && layout.nrows > 0) {
      // Rows of zero bytes would let NAXIS2 run beyond anything the file holds; every OIFITS table has
      // mandatory columns of at least one element, so such a table cannot be OIFITS.
      fail(
        file,
        { ...where, keyword: 'NAXIS2' },
        `NAXIS2 = ${layout.nrows} rows of NAXIS1 = 0 bytes each; an OIFITS table has columns, so its rows cannot be empty`,
      );
    }
    if (layout.heapBytes > 0)
      warnings.add(where, `a heap of ${layout.heapBytes} bytes (variable-length arrays) is ignored`);
    const decoded = decodeTable(u8, hdu.dataOffset, hdu.header, layout, file, where);
    const columns = decoded.columns.filter((c) => {
      if (c.tform.code === 'P' || c.tform.code === 'Q') {
        warnings.add(
          { ...where, column: c.name },
          `variable-length column ${c.name} (TFORM ${c.tform.code}) is dropped`,
        );
        return false;
      }
      return true;
    });
    const t = asOiTable(extname, hdu.index, hdu.header, decoded.nrows, columns, file);
    groups[KIND[extname]].push(t);
  }

  const content = keywordString(primary, 'CONTENT');
  const classic = [
    ...groups.target,
    ...groups.array,
    ...groups.wavelength,
    ...groups.vis,
    ...groups.vis2,
    ...groups.t3,
  ];
  let version: 1 | 2;
  if (content === 'OIFITS2') {
    version = 2;
    for (const kw of PRIMARY_V2_KEYWORDS) {
      const v = primary.get(kw);
      if (typeof v !== 'string') {
        fail(
          file,
          { hdu: 0, keyword: kw },
          v === undefined
            ? `the mandatory primary-header keyword ${kw} is missing (OIFITS 2, Duvert et al. 2017 table 2)`
            : `${kw} must be a quoted string (OIFITS 2 table 2)`,
        );
      }
    }
    for (const t of classic) {
      if (t.revision < 2)
        warnings.add(
          { hdu: t.hdu, table: t.extname },
          `OI_REVN = ${t.revision} in an OIFITS 2 file (expected 2)`,
        );
    }
  } else {
    const v2 = classic.find((t) => t.revision >= 2);
    if (v2) {
      fail(
        file,
        { hdu: 0, keyword: 'CONTENT' },
        `HDU ${v2.hdu} (${v2.extname}) has OI_REVN = ${v2.revision}, an OIFITS 2 table, but the primary header has ${content === undefined ? 'no CONTENT keyword' : `CONTENT = '${content}'`}; OIFITS 2 requires CONTENT = 'OIFITS2'`,
      );
    }
    if (content !== undefined)
      warnings.add(
        { hdu: 0, keyword: 'CONTENT' },
        `CONTENT = '${content}' is not 'OIFITS2'; read as OIFITS 1`,
      );
    version = 1;
  }
  const tables: OiTables = Object.freeze({ ...groups });
  const targets = validateTables(tables, version, file, warnings);
  const views = flattenTables(tables, targets, { dropFlagged: options.dropFlagged === true });
  return Object.freeze({
    name: file,
    version,
    primary,
    tables,
    targets: Object.freeze(targets),
    ...views,
    warnings: Object.freeze([...warnings.list]),
  });
}
