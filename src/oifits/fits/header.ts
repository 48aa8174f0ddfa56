/**
 * FITS header cards: parsing and formatting of 80-character keyword records.
 *
 * Sources (checked against the FITS standard 4.0 text as far as stated; the rest from memory of it):
 * - 4.1: a header is a sequence of 80-character ASCII cards (bytes 0x20..0x7E) ending with `END`, padded with
 *   blank cards to a multiple of 2880 bytes.
 * - 4.1.2: keyword in columns 1-8 (upper-case letters, digits, `-`, `_`), value indicator `= ` in columns 9-10.
 * - 4.2.1: character strings in single quotes, a quote inside doubled, trailing blanks not significant;
 *   4.2.1.2 long strings continued with a trailing `&` and `CONTINUE` cards.
 * - 4.2.2 logical `T`/`F`, 4.2.3 integers, 4.2.4 floats (exponent letter `E` or `D`), 4.2.5/4.2.6 complex
 *   values in parentheses, an empty value field means an undefined value.
 * - 4.4.2.4 commentary keywords `COMMENT`, `HISTORY` and the blank keyword carry free text in columns 9-80.
 * - Fixed format (from memory of 4.2): strings start in column 11, logicals and numbers end in column 30.
 *
 * @module
 */
import { fail, type Where } from './where.js';

/** Length of one header card in bytes. */
export const CARD_LENGTH = 80;
/** Length of one FITS block in bytes. */
export const BLOCK_LENGTH = 2880;

/** The value of a header card. `null` is an undefined value (a `=` with an empty value field). */
export type CardValue = string | number | bigint | boolean | null;

/** How the value of a card was written, kept so that a header is written back as it was read. */
export type CardKind = 'string' | 'logical' | 'integer' | 'float' | 'complex' | 'undefined' | 'commentary';

/** One keyword record (after joining CONTINUE cards). */
export interface HeaderCard {
  /** Keyword, upper case, at most 8 characters (`''` for a blank-keyword comment card). */
  readonly keyword: string;
  /** The kind of value; `commentary` cards (COMMENT, HISTORY, blank, or no value indicator) carry only text. */
  readonly kind: CardKind;
  /**
   * The value: a string (trailing blanks removed), a boolean, a number (an integer beyond the safe range is a
   * bigint), the raw text of a complex value such as `(1.0, 2.0)`, or null for an undefined value; absent for
   * commentary cards.
   */
  readonly value?: CardValue;
  /** The comment after `/`, or the text of a commentary card. */
  readonly comment?: string;
}

/**
 * An immutable FITS header: the ordered cards (without `END`) and a keyword lookup.
 *
 * @example
 * ```ts
 * const h = new FitsHeader([{ keyword: 'NAXIS', kind: 'integer', value: 0 }]);
 * h.get('NAXIS'); // 0
 * ```
 */
export class FitsHeader {
  /** The cards in file order, CONTINUE cards joined into their string card. */
  readonly cards: readonly HeaderCard[];
  readonly #index: Map<string, HeaderCard>;

  constructor(cards: readonly HeaderCard[]) {
    this.cards = Object.freeze(cards.map((c) => Object.freeze({ ...c })));
    this.#index = new Map();
    for (const card of this.cards) {
      if (card.kind !== 'commentary' && !this.#index.has(card.keyword)) this.#index.set(card.keyword, card);
    }
  }

  /** The first card with this keyword (value cards only), or undefined. */
  card(keyword: string): HeaderCard | undefined {
    return this.#index.get(keyword);
  }

  /** The value of the first card with this keyword, or undefined when the keyword is absent. */
  get(keyword: string): CardValue | undefined {
    return this.#index.get(keyword)?.value;
  }

  /** Whether a value card with this keyword is present. */
  has(keyword: string): boolean {
    return this.#index.has(keyword);
  }

  /** A new header with `keyword` set to `value` (the first such card replaced in place, else appended). */
  with(
    keyword: string,
    kind: Exclude<CardKind, 'commentary'>,
    value: CardValue,
    comment?: string,
  ): FitsHeader {
    const card: HeaderCard =
      comment === undefined ? { keyword, kind, value } : { keyword, kind, value, comment: comment };
    const at = this.cards.findIndex((c) => c.kind !== 'commentary' && c.keyword === keyword);
    if (at < 0) return new FitsHeader([...this.cards, card]);
    const old = this.cards[at]!;
    const merged =
      comment === undefined && old.comment !== undefined ? { ...card, comment: old.comment } : card;
    return new FitsHeader([...this.cards.slice(0, at), merged, ...this.cards.slice(at + 1)]);
  }

  /** A new header without any value card whose keyword passes `drop`. */
  without(drop: (keyword: string) => boolean): FitsHeader {
    return new FitsHeader(this.cards.filter((c) => c.kind === 'commentary' || !drop(c.keyword)));
  }
}

const KEYWORD_RE = /^[A-Z0-9_-]*$/;
const INT_RE = /^[+-]?[0-9]+$/;
const FLOAT_RE = /^[+-]?(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[EeDd][+-]?[0-9]+)?$/;
const COMMENTARY = new Set(['COMMENT', 'HISTORY', '']);

/** Result of parsing one header. */
export interface ParsedHeader {
  readonly header: FitsHeader;
  /** Byte offset just after the header's last 2880-byte block. */
  readonly end: number;
}

/**
 * Parses the header that starts at `offset` (a block boundary) of `bytes`.
 *
 * @param bytes - the whole file
 * @param offset - byte offset of the first card
 * @param file - file name for error messages
 * @param hdu - HDU number for error messages
 * @returns the header and the offset of the data that follows it
 * @throws OifitsError when the header has no END card before the end of the file, or a card is malformed
 */
export function parseHeader(bytes: Uint8Array, offset: number, file: string, hdu: number): ParsedHeader {
  const cards: HeaderCard[] = [];
  // A long string continued over CONTINUE cards (FITS 4.0 section 4.2.1.2) is kept in pieces and joined once
  // it ends, so that the time taken stays linear in the number of cards (joining card by card copies the
  // whole string each time).
  let open: { pieces: string[]; comment: string | undefined } | null = null;
  const close = (): void => {
    if (open === null) return;
    const first = cards[cards.length - 1]!;
    const value = open.pieces.join('');
    cards[cards.length - 1] =
      open.comment === undefined
        ? { keyword: first.keyword, kind: 'string', value }
        : { keyword: first.keyword, kind: 'string', value, comment: open.comment };
    open = null;
  };
  let pos = offset;
  let cardNo = 0;
  for (;;) {
    if (pos + CARD_LENGTH > bytes.length) {
      fail(
        file,
        { hdu },
        `the header has no END card before the end of the file (byte ${bytes.length}); the file is truncated or is not FITS (FITS 4.0 section 4.1)`,
      );
    }
    cardNo++;
    const text = cardText(bytes, pos, file, hdu, cardNo);
    pos += CARD_LENGTH;
    const keyword = text.slice(0, 8).trimEnd();
    if (keyword === 'END' && text.slice(8).trim() === '') break;
    if (!KEYWORD_RE.test(keyword) || (keyword.length > 0 && text.slice(0, keyword.length).includes(' '))) {
      fail(
        file,
        { hdu, keyword },
        `header card ${cardNo} has the keyword ${JSON.stringify(keyword)}; a keyword holds only upper-case letters, digits, '-' and '_' (FITS 4.0 section 4.1.2.1)`,
      );
    }
    const where: Where = { hdu, keyword };
    if (keyword === 'CONTINUE') {
      const prev = cards[cards.length - 1];
      const last: string | undefined =
        open !== null
          ? open.pieces[open.pieces.length - 1]!
          : prev && prev.kind === 'string' && typeof prev.value === 'string'
            ? prev.value
            : undefined;
      if (prev && last?.endsWith('&')) {
        const cont = parseValueField(text.slice(8), file, where, cardNo);
        if (cont.kind === 'string') {
          if (open === null) open = { pieces: [last], comment: prev.comment };
          open.pieces[open.pieces.length - 1] = last.slice(0, -1);
          open.pieces.push(cont.value as string);
          const c = open.comment;
          open.comment =
            c !== undefined || cont.comment !== undefined
              ? `${c ?? ''}${c && cont.comment ? ' ' : ''}${cont.comment ?? ''}`
              : undefined;
          continue;
        }
      }
      close();
      cards.push({ keyword, kind: 'commentary', comment: text.slice(8).trimEnd() });
      continue;
    }
    close();
    if (COMMENTARY.has(keyword) || text.slice(8, 10) !== '= ') {
      cards.push({ keyword, kind: 'commentary', comment: text.slice(8).trimEnd() });
      continue;
    }
    cards.push({ keyword, ...parseValueField(text.slice(10), file, where, cardNo) });
  }
  close();
  const end = offset + Math.ceil((pos - offset) / BLOCK_LENGTH) * BLOCK_LENGTH;
  if (end > bytes.length) {
    fail(
      file,
      { hdu },
      `the header ends at byte ${pos} but its last 2880-byte block is cut off at byte ${bytes.length}; the file is truncated (FITS 4.0 section 3.1)`,
    );
  }
  return { header: new FitsHeader(cards), end };
}

function cardText(bytes: Uint8Array, pos: number, file: string, hdu: number, cardNo: number): string {
  let s = '';
  for (let i = 0; i < CARD_LENGTH; i++) {
    const b = bytes[pos + i]!;
    if (b < 0x20 || b > 0x7e) {
      fail(
        file,
        { hdu },
        `header card ${cardNo} holds the byte 0x${b.toString(16).padStart(2, '0')} at column ${i + 1}; header cards hold only printable ASCII 0x20-0x7E (FITS 4.0 section 4.1.1)`,
      );
    }
    s += String.fromCharCode(b);
  }
  return s;
}

type ParsedValue = Omit<HeaderCard, 'keyword'>;

function parseValueField(field: string, file: string, where: Where, cardNo: number): ParsedValue {
  let i = 0;
  while (i < field.length && field[i] === ' ') i++;
  if (field[i] === "'") {
    let s = '';
    let j = i + 1;
    for (;;) {
      if (j >= field.length) {
        fail(
          file,
          where,
          `header card ${cardNo} has a string value without its closing quote (FITS 4.0 section 4.2.1)`,
        );
      }
      const ch = field[j]!;
      if (ch === "'") {
        if (field[j + 1] === "'") {
          s += "'";
          j += 2;
          continue;
        }
        j++;
        break;
      }
      s += ch;
      j++;
    }
    return withComment({ kind: 'string', value: s.trimEnd() }, field.slice(j), file, where, cardNo);
  }
  const slash = field.indexOf('/', i);
  const token = (slash < 0 ? field.slice(i) : field.slice(i, slash)).trim();
  const rest = slash < 0 ? '' : field.slice(slash);
  let parsed: ParsedValue;
  if (token === '') parsed = { kind: 'undefined', value: null };
  else if (token === 'T' || token === 'F') parsed = { kind: 'logical', value: token === 'T' };
  else if (INT_RE.test(token)) {
    const n = Number(token);
    parsed = { kind: 'integer', value: Number.isSafeInteger(n) ? n : BigInt(token) };
  } else if (FLOAT_RE.test(token)) {
    parsed = { kind: 'float', value: Number(token.replace(/[Dd]/, 'E')) };
  } else if (token.startsWith('(') && token.endsWith(')')) {
    parsed = { kind: 'complex', value: token };
  } else {
    fail(
      file,
      where,
      `header card ${cardNo} has the value ${JSON.stringify(token)}, which is none of: a quoted string, T or F, an integer, a floating-point number, a complex (re, im) pair (FITS 4.0 section 4.2)`,
    );
  }
  return withComment(parsed, rest, file, where, cardNo);
}

function withComment(v: ParsedValue, rest: string, file: string, where: Where, cardNo: number): ParsedValue {
  const t = rest.trim();
  if (t === '') return v;
  if (!t.startsWith('/')) {
    fail(
      file,
      where,
      `header card ${cardNo} has ${JSON.stringify(t)} after its value; only a comment starting with '/' may follow (FITS 4.0 section 4.1.2.3)`,
    );
  }
  return { ...v, comment: t.slice(1).trim() };
}

// ---------------------------------------------------------------------------------------------------------
// Formatting

/**
 * Formats a number as a FITS floating-point value that reads back as exactly the same double.
 *
 * @param x - a finite number
 * @returns the shortest round-tripping decimal form with an upper-case exponent and a decimal point
 * @throws RangeError for NaN or an infinity, which a FITS header cannot hold
 */
export function formatFloat(x: number): string {
  if (!Number.isFinite(x)) throw new RangeError(`a FITS header value cannot be ${x}`);
  let s = Object.is(x, -0) ? '-0.0' : String(x).toUpperCase();
  if (!s.includes('.')) {
    const e = s.indexOf('E');
    s = e < 0 ? `${s}.0` : `${s.slice(0, e)}.0${s.slice(e)}`;
  }
  return s.replace('E+', 'E');
}

function quote(s: string): string {
  return `'${s.replace(/'/g, "''")}'`;
}

function assertAscii(s: string, what: string): void {
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c < 0x20 || c > 0x7e) {
      throw new RangeError(
        `${what} holds the character code ${c} at position ${i}; FITS headers hold only printable ASCII 0x20-0x7E`,
      );
    }
  }
}

function pad80(s: string): string {
  return s.length >= CARD_LENGTH ? s.slice(0, CARD_LENGTH) : s + ' '.repeat(CARD_LENGTH - s.length);
}

function withCardComment(body: string, comment: string | undefined): string {
  if (comment === undefined || comment === '') return pad80(body);
  const room = CARD_LENGTH - body.length - 3;
  return room > 0 ? pad80(`${body} / ${comment.slice(0, room)}`) : pad80(body);
}

/**
 * Formats one card as one or more 80-character records (a long string uses `&` and CONTINUE cards,
 * FITS 4.0 section 4.2.1.2).
 *
 * @param card - the card to write
 * @returns the records, each exactly 80 characters
 * @throws RangeError when the keyword or text is not printable ASCII or a number is not finite
 */
export function formatCard(card: HeaderCard): string[] {
  const kw = card.keyword;
  if (kw.length > 8 || !KEYWORD_RE.test(kw)) {
    throw new RangeError(`the FITS keyword ${JSON.stringify(kw)} is not 1-8 of A-Z, 0-9, '-', '_'`);
  }
  const key = kw.padEnd(8, ' ');
  if (card.kind === 'commentary') {
    const text = card.comment ?? '';
    assertAscii(text, `the ${kw || 'blank'} card`);
    const out: string[] = [];
    for (let i = 0; i < Math.max(1, text.length); i += 72) out.push(pad80(key + text.slice(i, i + 72)));
    return out;
  }
  if (card.comment !== undefined) assertAscii(card.comment, `the comment of ${kw}`);
  const v = card.value;
  switch (card.kind) {
    case 'string': {
      const s = String(v ?? '');
      assertAscii(s, `the value of ${kw}`);
      const q = quote(s.padEnd(8, ' '));
      if (q.length <= 70) return [withCardComment(`${key}= ${q}`, card.comment)];
      // Long string: split into pieces of at most 67 characters (after quote doubling), each but the last
      // ending in '&', never splitting a doubled quote.
      const pieces: string[] = [];
      let cur = '';
      for (const ch of s) {
        const add = ch === "'" ? 2 : 1;
        if (cur.length + add > 67) {
          pieces.push(cur);
          cur = '';
        }
        cur += ch === "'" ? "''" : ch;
      }
      pieces.push(cur);
      const out: string[] = [];
      pieces.forEach((p, i) => {
        const last = i === pieces.length - 1;
        const body = `${i === 0 ? key : 'CONTINUE'}${i === 0 ? '= ' : '  '}'${p}${last ? '' : '&'}'`;
        out.push(last ? withCardComment(body, card.comment) : pad80(body));
      });
      return out;
    }
    case 'logical':
      return [withCardComment(`${key}= ${(v ? 'T' : 'F').padStart(20, ' ')}`, card.comment)];
    case 'integer':
      return [withCardComment(`${key}= ${String(v).padStart(20, ' ')}`, card.comment)];
    case 'float':
      return [withCardComment(`${key}= ${formatFloat(Number(v)).padStart(20, ' ')}`, card.comment)];
    case 'complex': {
      const s = String(v);
      assertAscii(s, `the value of ${kw}`);
      return [withCardComment(`${key}= ${s.padStart(20, ' ')}`, card.comment)];
    }
    case 'undefined':
      return [withCardComment(`${key}=`, card.comment)];
  }
}

/**
 * Formats a whole header (cards, END, blank padding) into bytes, a multiple of 2880 long.
 *
 * @param cards - the cards in order (without END)
 * @returns the ASCII bytes of the header
 */
export function formatHeader(cards: readonly HeaderCard[]): Uint8Array {
  const records: string[] = [];
  for (const c of cards) records.push(...formatCard(c));
  records.push(pad80('END'));
  const n = Math.ceil((records.length * CARD_LENGTH) / BLOCK_LENGTH) * BLOCK_LENGTH;
  const out = new Uint8Array(n).fill(0x20);
  let pos = 0;
  for (const r of records) {
    for (let i = 0; i < CARD_LENGTH; i++) out[pos + i] = r.charCodeAt(i);
    pos += CARD_LENGTH;
  }
  return out;
}
