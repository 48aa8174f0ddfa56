/**
 * The OIFITS table definitions: mandatory keywords and columns per table and revision.
 *
 * Sources and how sure each part is:
 * - Checked against the published tables of the OIFITS 2 paper (Duvert, Young & Hummel 2017, A&A 597:A8,
 *   tables 2, 3, 4, 6, 7 and 8): the primary header keywords (table 2), OI_TARGET rev. 2 (table 3), OI_ARRAY
 *   rev. 2 (table 4), OI_VIS2 rev. 2 (table 6), OI_VIS rev. 2 (table 7), OI_T3 rev. 2 (table 8).
 * - From memory of the same paper (not checked): OI_WAVELENGTH rev. 2 (INSNAME; EFF_WAVE, EFF_BAND), OI_FLUX
 *   rev. 1 (DATE-OBS, INSNAME, ARRNAME optional, CORRNAME optional, FOV / FOVTYPE optional, CALSTAT;
 *   TARGET_ID, MJD, INT_TIME, FLUXDATA, FLUXERR, CORRINDX_FLUXDATA optional, STA_INDEX optional, FLAG),
 *   OI_CORR rev. 1 (CORRNAME, NDATA; IINDX, JINDX, CORR), and that the tables new in OIFITS 2 (OI_FLUX,
 *   OI_CORR, OI_INSPOL) carry OI_REVN = 1.
 * - From memory of the OIFITS 1 paper (Pauls et al. 2005, PASP 117:1255): revision 1 of OI_TARGET,
 *   OI_ARRAY, OI_WAVELENGTH, OI_VIS, OI_VIS2, OI_T3 (as revision 2 without CATEGORY, FOV, FOVTYPE, the
 *   CORRINDX_* / complex-visibility columns and CORRNAME; ARRNAME optional in data tables, OI_ARRAY optional).
 *
 * Column types are checked by class, leniently: a float column may be E or D, an integer column I, J, K or
 * B, a string column any width (the standard's widths, e.g. 16 for TARGET, are what the writer uses).
 *
 * @module
 */

/** Names of the OIFITS tables that uvsky interprets. */
export type OiTableName =
  | 'OI_TARGET'
  | 'OI_ARRAY'
  | 'OI_WAVELENGTH'
  | 'OI_VIS'
  | 'OI_VIS2'
  | 'OI_T3'
  | 'OI_FLUX'
  | 'OI_CORR';

/** All interpreted table names, in the order the writer writes them. */
export const OI_TABLE_NAMES: readonly OiTableName[] = [
  'OI_TARGET',
  'OI_ARRAY',
  'OI_WAVELENGTH',
  'OI_CORR',
  'OI_VIS',
  'OI_VIS2',
  'OI_T3',
  'OI_FLUX',
];

/** Known OIFITS tables that uvsky reads past (kept out of the dataset, with a warning). */
export const OI_OTHER_TABLES: ReadonlySet<string> = new Set(['OI_INSPOL']);

/** The class of values a column holds. */
export type ValueClass = 'float' | 'int' | 'logical' | 'string';

/** One column of a table definition. */
export interface ColumnSpec {
  readonly name: string;
  readonly cls: ValueClass;
  /**
   * Elements per row: a number, `'NWAVE'` (channels of the referenced OI_WAVELENGTH), `'NWAVE2'` (NWAVE x
   * NWAVE), or `'string'`.
   */
  readonly repeat: number | 'NWAVE' | 'NWAVE2' | 'string';
  /** TFORM the writer uses when it has to create the column. */
  readonly tform: string;
  readonly unit?: string;
  readonly optional?: boolean;
}

/** One keyword of a table definition. */
export interface KeywordSpec {
  readonly name: string;
  readonly type: 'string' | 'int' | 'float';
  readonly optional?: boolean;
}

/** A table definition for one revision. */
export interface TableSpec {
  readonly keywords: readonly KeywordSpec[];
  readonly columns: readonly ColumnSpec[];
}

const f = (name: string, repeat: number | 'NWAVE', unit?: string, optional?: boolean): ColumnSpec => ({
  name,
  cls: 'float',
  repeat,
  tform: `${repeat === 'NWAVE' ? '' : repeat}D`,
  ...(unit === undefined ? {} : { unit }),
  ...(optional ? { optional } : {}),
});
const e = (name: string, repeat: number, unit?: string): ColumnSpec => ({
  name,
  cls: 'float',
  repeat,
  tform: `${repeat}E`,
  ...(unit === undefined ? {} : { unit }),
});
const i = (name: string, repeat: number, optional?: boolean): ColumnSpec => ({
  name,
  cls: 'int',
  repeat,
  tform: `${repeat}I`,
  ...(optional ? { optional } : {}),
});
const j = (name: string, optional?: boolean): ColumnSpec => ({
  name,
  cls: 'int',
  repeat: 1,
  tform: '1J',
  ...(optional ? { optional } : {}),
});
const a = (name: string, width: number, optional?: boolean): ColumnSpec => ({
  name,
  cls: 'string',
  repeat: 'string',
  tform: `${width}A`,
  ...(optional ? { optional } : {}),
});
const flag: ColumnSpec = { name: 'FLAG', cls: 'logical', repeat: 'NWAVE', tform: 'L' };
const k = (name: string, type: KeywordSpec['type'], optional?: boolean): KeywordSpec =>
  optional ? { name, type, optional } : { name, type };

const TARGET_COLUMNS: ColumnSpec[] = [
  i('TARGET_ID', 1),
  a('TARGET', 16),
  f('RAEP0', 1, 'deg'),
  f('DECEP0', 1, 'deg'),
  e('EQUINOX', 1, 'yr'),
  f('RA_ERR', 1, 'deg'),
  f('DEC_ERR', 1, 'deg'),
  f('SYSVEL', 1, 'm/s'),
  a('VELTYP', 8),
  a('VELDEF', 8),
  f('PMRA', 1, 'deg/yr'),
  f('PMDEC', 1, 'deg/yr'),
  f('PMRA_ERR', 1, 'deg/yr'),
  f('PMDEC_ERR', 1, 'deg/yr'),
  e('PARALLAX', 1, 'deg'),
  e('PARA_ERR', 1, 'deg'),
  a('SPECTYP', 16),
];

const ARRAY_KEYWORDS: KeywordSpec[] = [
  k('OI_REVN', 'int'),
  k('ARRNAME', 'string'),
  k('FRAME', 'string'),
  k('ARRAYX', 'float'),
  k('ARRAYY', 'float'),
  k('ARRAYZ', 'float'),
];
const ARRAY_COLUMNS: ColumnSpec[] = [
  a('TEL_NAME', 16),
  a('STA_NAME', 16),
  i('STA_INDEX', 1),
  e('DIAMETER', 1, 'm'),
  f('STAXYZ', 3, 'm'),
];

const WAVELENGTH: TableSpec = {
  keywords: [k('OI_REVN', 'int'), k('INSNAME', 'string')],
  columns: [e('EFF_WAVE', 1, 'm'), e('EFF_BAND', 1, 'm')],
};

const dataKeywords = (rev: 1 | 2): KeywordSpec[] => [
  k('OI_REVN', 'int'),
  k('DATE-OBS', 'string'),
  k('ARRNAME', 'string', rev === 1),
  k('INSNAME', 'string'),
  ...(rev === 2 ? [k('CORRNAME', 'string', true)] : []),
];
const timeColumns: ColumnSpec[] = [
  i('TARGET_ID', 1),
  f('TIME', 1, 's'),
  f('MJD', 1, 'day'),
  f('INT_TIME', 1, 's'),
];

const VIS_1: ColumnSpec[] = [
  ...timeColumns,
  f('VISAMP', 'NWAVE'),
  f('VISAMPERR', 'NWAVE'),
  f('VISPHI', 'NWAVE', 'deg'),
  f('VISPHIERR', 'NWAVE', 'deg'),
  f('UCOORD', 1, 'm'),
  f('VCOORD', 1, 'm'),
  i('STA_INDEX', 2),
  flag,
];
const VIS2_1: ColumnSpec[] = [
  ...timeColumns,
  f('VIS2DATA', 'NWAVE'),
  f('VIS2ERR', 'NWAVE'),
  f('UCOORD', 1, 'm'),
  f('VCOORD', 1, 'm'),
  i('STA_INDEX', 2),
  flag,
];
const T3_1: ColumnSpec[] = [
  ...timeColumns,
  f('T3AMP', 'NWAVE'),
  f('T3AMPERR', 'NWAVE'),
  f('T3PHI', 'NWAVE', 'deg'),
  f('T3PHIERR', 'NWAVE', 'deg'),
  f('U1COORD', 1, 'm'),
  f('V1COORD', 1, 'm'),
  f('U2COORD', 1, 'm'),
  f('V2COORD', 1, 'm'),
  i('STA_INDEX', 3),
  flag,
];

/** Table definitions by name and OI_REVN. */
export const SCHEMAS: Readonly<Record<OiTableName, Readonly<Record<number, TableSpec>>>> = {
  OI_TARGET: {
    1: { keywords: [k('OI_REVN', 'int')], columns: TARGET_COLUMNS },
    2: { keywords: [k('OI_REVN', 'int')], columns: [...TARGET_COLUMNS, a('CATEGORY', 3, true)] },
  },
  OI_ARRAY: {
    1: { keywords: ARRAY_KEYWORDS, columns: ARRAY_COLUMNS },
    2: {
      keywords: ARRAY_KEYWORDS,
      columns: [...ARRAY_COLUMNS, f('FOV', 1, 'arcsec'), a('FOVTYPE', 6)],
    },
  },
  OI_WAVELENGTH: { 1: WAVELENGTH, 2: WAVELENGTH },
  OI_VIS: {
    1: { keywords: dataKeywords(1), columns: VIS_1 },
    2: {
      keywords: [
        ...dataKeywords(2),
        k('AMPTYP', 'string', true),
        k('PHITYP', 'string', true),
        k('AMPORDER', 'int', true),
        k('PHIORDER', 'int', true),
      ],
      columns: [
        ...VIS_1,
        j('CORRINDX_VISAMP', true),
        j('CORRINDX_VISPHI', true),
        f('RVIS', 'NWAVE', undefined, true),
        f('RVISERR', 'NWAVE', undefined, true),
        j('CORRINDX_RVIS', true),
        f('IVIS', 'NWAVE', undefined, true),
        f('IVISERR', 'NWAVE', undefined, true),
        j('CORRINDX_IVIS', true),
        { name: 'VISREFMAP', cls: 'logical', repeat: 'NWAVE2', tform: 'L', optional: true },
      ],
    },
  },
  OI_VIS2: {
    1: { keywords: dataKeywords(1), columns: VIS2_1 },
    2: { keywords: dataKeywords(2), columns: [...VIS2_1, j('CORRINDX_VIS2DATA', true)] },
  },
  OI_T3: {
    1: { keywords: dataKeywords(1), columns: T3_1 },
    2: {
      keywords: dataKeywords(2),
      columns: [...T3_1, j('CORRINDX_T3AMP', true), j('CORRINDX_T3PHI', true)],
    },
  },
  OI_FLUX: {
    1: {
      keywords: [
        k('OI_REVN', 'int'),
        k('DATE-OBS', 'string'),
        k('INSNAME', 'string'),
        k('ARRNAME', 'string', true),
        k('CORRNAME', 'string', true),
        k('FOV', 'float', true),
        k('FOVTYPE', 'string', true),
        k('CALSTAT', 'string'),
      ],
      columns: [
        i('TARGET_ID', 1),
        f('MJD', 1, 'day'),
        f('INT_TIME', 1, 's'),
        f('FLUXDATA', 'NWAVE'),
        f('FLUXERR', 'NWAVE'),
        j('CORRINDX_FLUXDATA', true),
        i('STA_INDEX', 1, true),
        flag,
      ],
    },
  },
  OI_CORR: {
    1: {
      keywords: [k('OI_REVN', 'int'), k('CORRNAME', 'string'), k('NDATA', 'int')],
      columns: [j('IINDX'), j('JINDX'), f('CORR', 1)],
    },
  },
};

/** The OI_REVN that the OIFITS 2 writer puts in each table (OI_FLUX, OI_CORR: 1, from memory). */
export const REVISION_V2: Readonly<Record<OiTableName, number>> = {
  OI_TARGET: 2,
  OI_ARRAY: 2,
  OI_WAVELENGTH: 2,
  OI_VIS: 2,
  OI_VIS2: 2,
  OI_T3: 2,
  OI_FLUX: 1,
  OI_CORR: 1,
};

/**
 * Primary-header keywords mandatory in OIFITS 2 besides the FITS structural ones (OIFITS 2 paper, table 2,
 * checked): ORIGIN, DATE, DATE-OBS, CONTENT = 'OIFITS2', TELESCOP, INSTRUME, OBSERVER, OBJECT, INSMODE.
 */
export const PRIMARY_V2_KEYWORDS: readonly string[] = [
  'ORIGIN',
  'DATE',
  'DATE-OBS',
  'CONTENT',
  'TELESCOP',
  'INSTRUME',
  'OBSERVER',
  'OBJECT',
  'INSMODE',
];
