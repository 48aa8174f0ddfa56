/**
 * Splitting a FITS file into its HDUs (header-data units), with every declared size checked against the
 * file's length before anything is allocated.
 *
 * Sources: FITS standard 4.0 sections 3.1-3.3 (2880-byte blocks; primary HDU; extensions follow), 4.4.1
 * (mandatory keywords SIMPLE, BITPIX, NAXIS, NAXISn, EXTEND; XTENSION, PCOUNT, GCOUNT in extensions) and
 * 7.3 (BINTABLE); the size formula |BITPIX| / 8 * GCOUNT * (PCOUNT + NAXIS1 * ... * NAXISm) of section 4.4.1.1
 * (from memory).
 *
 * @module
 */
import { BLOCK_LENGTH, type FitsHeader, formatHeader, type HeaderCard, parseHeader } from './header.js';
import { fail, type Warnings } from './where.js';

/** One HDU located in a file. */
export interface Hdu {
  /** 0 for the primary HDU, then 1, 2, ... */
  readonly index: number;
  /** The header. */
  readonly header: FitsHeader;
  /** XTENSION value (`'PRIMARY'` for HDU 0). */
  readonly xtension: string;
  /** EXTNAME, when present. */
  readonly extname?: string;
  /** Byte offset of the data in the file. */
  readonly dataOffset: number;
  /** Bytes of data (without padding). */
  readonly dataBytes: number;
}

const VALID_BITPIX = new Set([8, 16, 32, 64, -32, -64]);

function dataSize(h: FitsHeader, file: string, hdu: number, primary: boolean): number {
  const bitpix = h.get('BITPIX');
  if (typeof bitpix !== 'number' || !VALID_BITPIX.has(bitpix)) {
    fail(
      file,
      { hdu, keyword: 'BITPIX' },
      `BITPIX must be one of 8, 16, 32, 64, -32, -64 (FITS 4.0 section 4.4.1.1), got ${bitpix}`,
    );
  }
  const naxis = h.get('NAXIS');
  if (typeof naxis !== 'number' || !Number.isInteger(naxis) || naxis < 0 || naxis > 999) {
    fail(
      file,
      { hdu, keyword: 'NAXIS' },
      `NAXIS must be an integer from 0 to 999 (FITS 4.0 section 4.4.1.1), got ${naxis}`,
    );
  }
  if (naxis === 0) return 0;
  let prod = 1;
  const groups = primary && h.get('GROUPS') === true;
  for (let i = 1; i <= naxis; i++) {
    const n = h.get(`NAXIS${i}`);
    if (typeof n !== 'number' || !Number.isInteger(n) || n < 0) {
      fail(
        file,
        { hdu, keyword: `NAXIS${i}` },
        `NAXIS${i} must be a non-negative integer (FITS 4.0 section 4.4.1.1), got ${n}`,
      );
    }
    if (groups && i === 1) continue;
    prod *= n;
  }
  let pcount = 0;
  let gcount = 1;
  if (!primary || groups) {
    const p = h.get('PCOUNT');
    const g = h.get('GCOUNT');
    if (typeof p !== 'number' || !Number.isInteger(p) || p < 0) {
      fail(
        file,
        { hdu, keyword: 'PCOUNT' },
        `PCOUNT must be a non-negative integer (FITS 4.0 section 4.4.1.2), got ${p}`,
      );
    }
    if (typeof g !== 'number' || !Number.isInteger(g) || g < 0) {
      fail(
        file,
        { hdu, keyword: 'GCOUNT' },
        `GCOUNT must be a non-negative integer (FITS 4.0 section 4.4.1.2), got ${g}`,
      );
    }
    pcount = p;
    gcount = g;
  }
  const bytes = (Math.abs(bitpix) / 8) * gcount * (pcount + prod);
  if (!Number.isSafeInteger(bytes)) {
    fail(
      file,
      { hdu, keyword: 'NAXIS' },
      `the declared data size (${bytes} bytes) is not representable; the header is corrupt`,
    );
  }
  return bytes;
}

/**
 * Locates every HDU of a FITS file.
 *
 * @param bytes - the whole file
 * @param file - name for messages
 * @param warnings - collects notes on unusual but readable structure
 * @returns the HDUs in order
 * @throws OifitsError when the file is not FITS, a header is malformed, or a declared data size runs past the
 *   end of the file (checked before any table is decoded)
 */
export function splitHdus(bytes: Uint8Array, file: string, warnings: Warnings): Hdu[] {
  if (bytes.length < BLOCK_LENGTH) {
    fail(
      file,
      { hdu: 0 },
      `a FITS file is at least one 2880-byte block long, this one has ${bytes.length} bytes (FITS 4.0 section 3.1); the file is truncated or not FITS`,
    );
  }
  if (String.fromCharCode(...bytes.subarray(0, 10)) !== 'SIMPLE  = ') {
    fail(
      file,
      { hdu: 0, keyword: 'SIMPLE' },
      'this is not a FITS file: a FITS file starts with the card SIMPLE = T (FITS 4.0 section 4.4.1.1)',
    );
  }
  const hdus: Hdu[] = [];
  let offset = 0;
  while (offset < bytes.length) {
    const index = hdus.length;
    if (index > 0 && isAllZeroOrBlank(bytes, offset)) {
      warnings.add(
        {},
        `${bytes.length - offset} bytes of zero or blank padding follow the last HDU; ignored`,
      );
      break;
    }
    const { header, end } = parseHeader(bytes, offset, file, index);
    let xtension: string;
    if (index === 0) {
      if (header.cards[0]?.keyword !== 'SIMPLE' || header.get('SIMPLE') !== true) {
        fail(
          file,
          { hdu: 0, keyword: 'SIMPLE' },
          `a FITS file starts with SIMPLE = T (FITS 4.0 section 4.4.1.1)`,
        );
      }
      xtension = 'PRIMARY';
    } else {
      const x = header.get('XTENSION');
      if (header.cards[0]?.keyword !== 'XTENSION' || typeof x !== 'string') {
        fail(
          file,
          { hdu: index, keyword: 'XTENSION' },
          `an extension header starts with XTENSION = '<type>' (FITS 4.0 section 4.4.1.2), found ${header.cards[0]?.keyword ?? 'nothing'}`,
        );
      }
      xtension = x.trim();
    }
    const dataBytes = dataSize(header, file, index, index === 0);
    const padded = Math.ceil(dataBytes / BLOCK_LENGTH) * BLOCK_LENGTH;
    if (end + dataBytes > bytes.length) {
      const extname = header.get('EXTNAME');
      fail(
        file,
        { hdu: index, ...(typeof extname === 'string' ? { table: extname.trim() } : {}) },
        `the header declares ${dataBytes} bytes of data starting at byte ${end}, but the file ends at byte ${bytes.length}; the file is truncated`,
      );
    }
    const extnameV = header.get('EXTNAME');
    const hdu: Hdu =
      typeof extnameV === 'string'
        ? { index, header, xtension, extname: extnameV.trim(), dataOffset: end, dataBytes }
        : { index, header, xtension, dataOffset: end, dataBytes };
    hdus.push(hdu);
    if (end + padded > bytes.length) {
      warnings.add(
        { hdu: index },
        `the data padding to a 2880-byte block is cut short (file length ${bytes.length} is not a multiple of 2880)`,
      );
      break;
    }
    offset = end + padded;
  }
  return hdus;
}

function isAllZeroOrBlank(bytes: Uint8Array, from: number): boolean {
  for (let i = from; i < bytes.length; i++) {
    const b = bytes[i];
    if (b !== 0 && b !== 0x20) return false;
  }
  return true;
}

/** One HDU to write: its cards (without END) and its data (already padded or not). */
export interface HduOut {
  readonly cards: readonly HeaderCard[];
  readonly data: Uint8Array;
}

/**
 * Joins HDUs into a FITS file: each header padded with blanks and each data part with zeros to 2880 bytes.
 *
 * @param hdus - primary first
 * @returns the file bytes, a multiple of 2880 long
 */
export function joinHdus(hdus: readonly HduOut[]): Uint8Array {
  const parts: Uint8Array[] = [];
  let total = 0;
  for (const h of hdus) {
    const head = formatHeader(h.cards);
    parts.push(head);
    total += head.length;
    const padded = Math.ceil(h.data.length / BLOCK_LENGTH) * BLOCK_LENGTH;
    parts.push(h.data);
    total += padded;
    if (padded > h.data.length) parts.push(new Uint8Array(padded - h.data.length));
  }
  const out = new Uint8Array(total);
  let pos = 0;
  for (const p of parts) {
    out.set(p, pos);
    pos += p.length;
  }
  return out;
}
