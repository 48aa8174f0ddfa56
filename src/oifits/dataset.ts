/**
 * The typed OIFITS dataset: raw tables (every keyword and column as read) and flat per-observable views with
 * one entry per (row, channel) in row-major order.
 *
 * @module
 */
import type { BinaryTable, FitsHeader } from './fits/bintable.js';
import type { OiTableName } from './schema.js';

/** One interpreted OIFITS table: a decoded binary table with its OIFITS identity. */
export interface OiTable extends BinaryTable {
  /** EXTNAME. */
  readonly extname: OiTableName;
  /** OI_REVN. */
  readonly revision: number;
  /** HDU number in the file it was read from (0-based, primary = 0), or -1 for a table built in memory. */
  readonly hdu: number;
  /** INSNAME keyword (OI_WAVELENGTH and data tables). */
  readonly insname?: string;
  /** ARRNAME keyword (OI_ARRAY and data tables). */
  readonly arrname?: string;
  /** CORRNAME keyword (OI_CORR and data tables). */
  readonly corrname?: string;
}

/** The raw tables of a dataset, by kind, each in file order. */
export interface OiTables {
  readonly target: readonly OiTable[];
  readonly array: readonly OiTable[];
  readonly wavelength: readonly OiTable[];
  readonly corr: readonly OiTable[];
  readonly vis: readonly OiTable[];
  readonly vis2: readonly OiTable[];
  readonly t3: readonly OiTable[];
  readonly flux: readonly OiTable[];
}

/** A target of OI_TARGET. */
export interface TargetInfo {
  /** TARGET_ID (>= 1). */
  readonly id: number;
  /** TARGET name. */
  readonly name: string;
  /** RAEP0, degrees. */
  readonly ra: number;
  /** DECEP0, degrees. */
  readonly dec: number;
}

/** Columns shared by every flat observable view. Entry k belongs to (table[k], row[k], channel[k]). */
export interface FlatCommon {
  /** Number of entries. */
  readonly length: number;
  /** Effective wavelength EFF_WAVE of the entry's channel, metres. */
  readonly wavelength: Float64Array;
  /** Effective bandwidth EFF_BAND of the channel, metres. */
  readonly band: Float64Array;
  /** MJD of the record, days. */
  readonly mjd: Float64Array;
  /** Integration time INT_TIME, seconds. */
  readonly intTime: Float64Array;
  /** 1 = flagged (FLAG true), 0 = good. A null logical reads as 0, as astropy reads it as false. */
  readonly flag: Uint8Array;
  /** TARGET_ID of the record. */
  readonly targetId: Int32Array;
  /** TARGET name of the record (one shared string per target). */
  readonly targetName: readonly string[];
  /** Index of the record's table in `dataset.tables.<kind>`. */
  readonly table: Int32Array;
  /** Row of the record in its table, counted from 0 (FITS row = row + 1). */
  readonly row: Int32Array;
  /** Spectral channel, counted from 0, in the table's OI_WAVELENGTH. */
  readonly channel: Int32Array;
  /** INSNAME of the record's table. */
  readonly insname: readonly string[];
}

/** Two-station baseline columns (OI_VIS, OI_VIS2). */
export interface BaselineColumns {
  /** u = UCOORD / EFF_WAVE, cycles per radian. */
  readonly u: Float64Array;
  /** v = VCOORD / EFF_WAVE, cycles per radian. */
  readonly v: Float64Array;
  /** UCOORD, metres. */
  readonly ucoord: Float64Array;
  /** VCOORD, metres. */
  readonly vcoord: Float64Array;
  /** First and second STA_INDEX. */
  readonly sta1: Int32Array;
  readonly sta2: Int32Array;
  /** Station names joined by '-', e.g. `TG1-TG2` (STA_NAME from OI_ARRAY, or the indices when there is none). */
  readonly stations: readonly string[];
}

/** Flat OI_VIS2 view. */
export interface Vis2View extends FlatCommon, BaselineColumns {
  /** VIS2DATA. NaN means no measurement. */
  readonly value: Float64Array;
  /** VIS2ERR. */
  readonly error: Float64Array;
}

/** Flat OI_VIS view. Phases in degrees as stored. */
export interface VisView extends FlatCommon, BaselineColumns {
  readonly visamp: Float64Array;
  readonly visampError: Float64Array;
  /** VISPHI, degrees. */
  readonly visphi: Float64Array;
  /** VISPHIERR, degrees. */
  readonly visphiError: Float64Array;
}

/** Flat OI_T3 view. Phases in degrees as stored. */
export interface T3View extends FlatCommon {
  readonly t3amp: Float64Array;
  readonly t3ampError: Float64Array;
  /** T3PHI (closure phase), degrees. */
  readonly t3phi: Float64Array;
  /** T3PHIERR, degrees. */
  readonly t3phiError: Float64Array;
  /** u1 = U1COORD / EFF_WAVE (baseline AB), cycles per radian; likewise v1, u2, v2 (baseline BC). */
  readonly u1: Float64Array;
  readonly v1: Float64Array;
  readonly u2: Float64Array;
  readonly v2: Float64Array;
  /** U1COORD .. V2COORD, metres. */
  readonly u1coord: Float64Array;
  readonly v1coord: Float64Array;
  readonly u2coord: Float64Array;
  readonly v2coord: Float64Array;
  readonly sta1: Int32Array;
  readonly sta2: Int32Array;
  readonly sta3: Int32Array;
  /** Station names joined by '-', e.g. `TG1-TG2-TG3`. */
  readonly stations: readonly string[];
}

/** Flat OI_FLUX view. */
export interface FluxView extends FlatCommon {
  /** FLUXDATA. */
  readonly value: Float64Array;
  /** FLUXERR. */
  readonly error: Float64Array;
  /** STA_INDEX, or -1 when the table has none (calibrated total flux). */
  readonly sta1: Int32Array;
}

/** A read (or built) OIFITS dataset. */
export interface OifitsDataset {
  /** File name given to the reader (or `<bytes>`). */
  readonly name: string;
  /** 2 for an OIFITS 2 file (CONTENT = 'OIFITS2'), 1 for OIFITS 1. */
  readonly version: 1 | 2;
  /** The primary header as read. */
  readonly primary: FitsHeader;
  /** The raw tables. */
  readonly tables: OiTables;
  /** The targets of OI_TARGET, in table order. */
  readonly targets: readonly TargetInfo[];
  /** Flat views. */
  readonly vis2: Vis2View;
  readonly vis: VisView;
  readonly t3: T3View;
  readonly flux: FluxView;
  /** Notes on unusual but valid content (extra columns, extra HDUs, ...). */
  readonly warnings: readonly string[];
}
