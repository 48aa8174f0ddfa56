/**
 * Writing OIFITS 2 files.
 *
 * @module
 */
import { keywordString } from './columns.js';
import type { OifitsDataset, OiTable, OiTables } from './dataset.js';
import { rebuild, setKeyword } from './edit.js';
import { encodeTable, type TableColumn } from './fits/bintable.js';
import { type HduOut, joinHdus } from './fits/hdu.js';
import type { HeaderCard } from './fits/header.js';
import { fail, Warnings } from './fits/where.js';
import { tableKind } from './read.js';
import { OI_TABLE_NAMES, PRIMARY_V2_KEYWORDS, REVISION_V2 } from './schema.js';
import { validateTables } from './validate.js';

/** Options of {@link writeOifits}. */
export interface WriteOifitsOptions {
  /**
   * Primary-header values to set (strings), overriding the dataset's: e.g. `{ OBSERVER: 'A. Person',
   * INSMODE: 'LOW' }`. Mandatory keywords that neither the options nor the dataset give get defaults:
   * ORIGIN 'uvsky', DATE now, DATE-OBS from the first data table, TELESCOP the ARRNAME (or 'MULTI'),
   * INSTRUME the INSNAME (or 'MULTI'), OBJECT the target (or 'MULTI'), OBSERVER and INSMODE 'UNKNOWN'.
   */
  readonly primary?: Readonly<Record<string, string>>;
  /** The DATE written into the primary header (ISO 8601 `YYYY-MM-DDThh:mm:ss`), default the current time. */
  readonly date?: string;
}

const PRIMARY_STRUCTURAL = /^(SIMPLE|BITPIX|NAXIS[0-9]*|EXTEND|END|PCOUNT|GCOUNT|GROUPS)$/;

function uniqueOrMulti(values: readonly (string | undefined)[], fallback: string): string {
  const set = new Set(values.filter((v): v is string => v !== undefined && v !== ''));
  if (set.size === 1) return [...set][0]!;
  return set.size === 0 ? fallback : 'MULTI';
}

function primaryCards(ds: OifitsDataset, tables: OiTables, options: WriteOifitsOptions): HeaderCard[] {
  const old = ds.primary;
  const data = [...tables.vis, ...tables.vis2, ...tables.t3, ...tables.flux];
  const defaults: Record<string, string> = {
    ORIGIN: 'uvsky',
    DATE: options.date ?? new Date().toISOString().slice(0, 19),
    'DATE-OBS':
      data.map((t) => keywordString(t.header, 'DATE-OBS')).find((d) => d !== undefined) ?? 'UNKNOWN',
    CONTENT: 'OIFITS2',
    TELESCOP: uniqueOrMulti(
      tables.array.map((t) => t.arrname),
      'UNKNOWN',
    ),
    INSTRUME: uniqueOrMulti(
      tables.wavelength.map((t) => t.insname),
      'UNKNOWN',
    ),
    OBSERVER: 'UNKNOWN',
    OBJECT: uniqueOrMulti(
      ds.targets.map((t) => t.name),
      'UNKNOWN',
    ),
    INSMODE: 'UNKNOWN',
  };
  const cards: HeaderCard[] = [
    { keyword: 'SIMPLE', kind: 'logical', value: true, comment: 'conforms to FITS standard' },
    { keyword: 'BITPIX', kind: 'integer', value: 8, comment: 'array data type' },
    { keyword: 'NAXIS', kind: 'integer', value: 0, comment: 'no primary data array' },
    { keyword: 'EXTEND', kind: 'logical', value: true, comment: 'extensions follow' },
  ];
  for (const kw of PRIMARY_V2_KEYWORDS) {
    const given =
      kw === 'CONTENT'
        ? 'OIFITS2'
        : (options.primary?.[kw] ?? (kw === 'DATE' && options.date ? options.date : keywordString(old, kw)));
    const card = old.card(kw);
    const value = given ?? defaults[kw]!;
    cards.push(
      card?.comment !== undefined
        ? { keyword: kw, kind: 'string', value, comment: card.comment }
        : { keyword: kw, kind: 'string', value },
    );
  }
  const done = new Set(PRIMARY_V2_KEYWORDS);
  for (const [kw, value] of Object.entries(options.primary ?? {})) {
    if (!done.has(kw) && !old.has(kw)) {
      cards.push({ keyword: kw, kind: 'string', value });
      done.add(kw);
    }
  }
  for (const c of old.cards) {
    if (c.kind === 'commentary') {
      cards.push(c);
      continue;
    }
    if (PRIMARY_STRUCTURAL.test(c.keyword) || PRIMARY_V2_KEYWORDS.includes(c.keyword)) continue;
    const o = options.primary?.[c.keyword];
    cards.push(o === undefined ? c : { keyword: c.keyword, kind: 'string', value: o });
  }
  const long = cards.some((c) => c.kind === 'string' && String(c.value).length > 68);
  if (long && !old.has('LONGSTRN')) {
    // The long-string (CONTINUE) convention; fitsverify asks for this keyword when CONTINUE is used.
    cards.push({
      keyword: 'LONGSTRN',
      kind: 'string',
      value: 'OGIP 1.0',
      comment: 'CONTINUE long strings are used',
    });
  }
  return cards;
}

/** Brings a table to its OIFITS 2 revision (adding what revision 2 requires), or returns it unchanged. */
function upgrade(t: OiTable, arrays: readonly OiTable[], file: string): OiTable {
  const target = REVISION_V2[t.extname];
  let out = t;
  if (t.revision < target) {
    out = setKeyword(out, 'OI_REVN', 'integer', target);
    if (t.extname === 'OI_ARRAY') {
      const add: TableColumn[] = [];
      if (!out.columns.some((c) => c.name === 'FOV')) {
        // Revision 1 has no field of view; NaN says "unknown" (FOV D(1), arcsec, OIFITS 2 table 4).
        add.push({
          name: 'FOV',
          tform: { repeat: 1, code: 'D', suffix: '', bytes: 8 },
          unit: 'arcsec',
          data: new Float64Array(t.nrows).fill(Number.NaN),
        });
      }
      if (!out.columns.some((c) => c.name === 'FOVTYPE')) {
        add.push({
          name: 'FOVTYPE',
          tform: { repeat: 6, code: 'A', suffix: '', bytes: 6 },
          data: new Array<string>(t.nrows).fill('FWHM'),
        });
      }
      out = rebuild(out, { columns: [...out.columns, ...add] });
    }
  }
  const isData = t.extname === 'OI_VIS' || t.extname === 'OI_VIS2' || t.extname === 'OI_T3';
  if (isData && out.arrname === undefined) {
    if (arrays.length !== 1) {
      fail(
        file,
        { hdu: t.hdu, table: t.extname, keyword: 'ARRNAME' },
        `OIFITS 2 requires ARRNAME in every ${t.extname} table, and this one has none; with ${arrays.length} OI_ARRAY tables in the dataset it cannot be inferred: set it before writing`,
      );
    }
    out = setKeyword(out, 'ARRNAME', 'string', arrays[0]!.arrname!);
  }
  return out;
}

function tableHdu(t: OiTable, extver: number, file: string): HduOut {
  // EXTVER numbers tables of the same EXTNAME (FITS 4.0 section 4.4.2.6), which fitsverify asks for.
  const own = new Set(['EXTNAME', 'EXTVER', 'OI_REVN']);
  const extra: HeaderCard[] = [
    { keyword: 'EXTNAME', kind: 'string', value: t.extname, comment: 'OIFITS table' },
    { keyword: 'EXTVER', kind: 'integer', value: extver, comment: 'number among tables of this EXTNAME' },
    { keyword: 'OI_REVN', kind: 'integer', value: t.revision, comment: 'revision of the table definition' },
    ...t.header.cards.filter((c) => c.kind === 'commentary' || !own.has(c.keyword)),
  ];
  try {
    const { cards, data } = encodeTable(extra, t.columns, t.nrows);
    return { cards, data };
  } catch (e) {
    if (e instanceof RangeError) fail(file, { table: t.extname }, `cannot be written: ${e.message}`);
    throw e;
  }
}

/**
 * Writes a dataset as an OIFITS 2 file.
 *
 * @param dataset - a dataset from {@link readOifits}, `select`, `concatOifits` or `simulate`; not changed
 * @param options - primary-header values and the DATE to write
 * @returns the file bytes (a multiple of 2880 long)
 * @throws OifitsError when the tables do not make a valid OIFITS 2 file (they are validated as the reader
 *   validates, before writing), e.g. a revision-1 data table without ARRNAME and no single OI_ARRAY to name
 *
 * Notes: the primary header gets the mandatory OIFITS 2 keywords of Duvert et al. 2017 table 2 (CONTENT =
 * 'OIFITS2'); every table gets its OI_REVN (2; 1 for OI_FLUX and OI_CORR, from memory of the paper); tables
 * of revision 1 are upgraded (OI_ARRAY gains FOV = NaN, FOVTYPE = 'FWHM'). Tables are written in the order
 * OI_TARGET, OI_ARRAY, OI_WAVELENGTH, OI_CORR, OI_VIS, OI_VIS2, OI_T3, OI_FLUX; every column (extra columns
 * too) is written with its TFORM, TUNIT, TDIM, TNULL as read, so that read -> write -> read is exact.
 *
 * @example
 * ```ts
 * const bytes = writeOifits(readOifits(input), { date: '2024-01-01T00:00:00' });
 * bytes.length % 2880; // 0
 * ```
 */
export function writeOifits(dataset: OifitsDataset, options: WriteOifitsOptions = {}): Uint8Array {
  const file = dataset.name;
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
  for (const name of OI_TABLE_NAMES) {
    const kind = tableKind(name);
    for (const t of dataset.tables[kind]) groups[kind].push(upgrade(t, dataset.tables.array, file));
  }
  const tables: OiTables = groups;
  validateTables(tables, 2, file, new Warnings(file));
  const hdus: HduOut[] = [{ cards: primaryCards(dataset, tables, options), data: new Uint8Array(0) }];
  for (const name of OI_TABLE_NAMES) {
    tables[tableKind(name)].forEach((t, i) => {
      hdus.push(tableHdu(t, i + 1, file));
    });
  }
  return joinHdus(hdus);
}
