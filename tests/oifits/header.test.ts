/**
 * FITS header cards (FITS standard 4.0 section 4): parsing and formatting. Card layouts below are written
 * by hand from the standard's rules (fixed format from memory of section 4.2: strings from column 11,
 * numbers and logicals ending in column 30).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { OifitsError } from '../../src/errors.js';
import { parseTform } from '../../src/oifits/fits/bintable.js';
import { formatCard, formatFloat, formatHeader, parseHeader } from '../../src/oifits/fits/header.js';

function headerBytes(cards: string[]): Uint8Array {
  const text = [...cards, 'END'].map((c) => c.padEnd(80)).join('');
  const n = Math.ceil(text.length / 2880) * 2880;
  const out = new Uint8Array(n).fill(0x20);
  for (let i = 0; i < text.length; i++) out[i] = text.charCodeAt(i);
  return out;
}
const parse = (cards: string[]) => parseHeader(headerBytes(cards), 0, 't.fits', 0).header;

describe('parseHeader', () => {
  it('reads strings with doubled quotes and drops trailing blanks only (section 4.2.1)', () => {
    const h = parse(["OBJECT  = 'O''Brien''s  ' / a comment", "BLANK   = '        '", "LEAD    = '  x'"]);
    expect(h.get('OBJECT')).toBe("O'Brien's");
    expect(h.card('OBJECT')!.comment).toBe('a comment');
    expect(h.get('BLANK')).toBe('');
    expect(h.get('LEAD')).toBe('  x');
  });
  it('joins CONTINUE cards of a long string (section 4.2.1.2)', () => {
    const h = parse(["LONG    = 'first part &'", "CONTINUE  'second part&'", "CONTINUE  ' end' / note"]);
    expect(h.get('LONG')).toBe('first part second part end');
  });
  it('reads logical, integer, float (E and D exponents), complex and undefined values (sections 4.2.2-4.2.6)', () => {
    const h = parse([
      'SIMPLE  =                    T',
      'EXTEND  =                    F',
      'NAXIS   =                   -12',
      'BIG     =  123456789012345678901',
      'X       =             1.5E-07',
      'Y       =             -2.25D+3',
      'Z       =                  .5',
      'C       = (1.0, -2.0)',
      'U       =',
      'HISTORY some history',
      'COMMENT   a comment card',
    ]);
    expect(h.get('SIMPLE')).toBe(true);
    expect(h.get('EXTEND')).toBe(false);
    expect(h.get('NAXIS')).toBe(-12);
    expect(h.get('BIG')).toBe(123456789012345678901n);
    expect(h.get('X')).toBe(1.5e-7);
    expect(h.get('Y')).toBe(-2250);
    expect(h.get('Z')).toBe(0.5);
    expect(h.card('C')!.kind).toBe('complex');
    expect(h.get('U')).toBeNull();
    expect(h.cards.filter((c) => c.kind === 'commentary').map((c) => c.comment)).toEqual([
      'some history',
      '  a comment card',
    ]);
  });
  it('refuses a non-ASCII byte, naming the card and column (section 4.1.1)', () => {
    const b = headerBytes(["OBJECT  = 'x'"]);
    b[15] = 0xe9;
    expect(() => parseHeader(b, 0, 't.fits', 0)).toThrow(/card 1 holds the byte 0xe9 at column 16/);
  });
  it('refuses an unterminated string and junk after a value', () => {
    expect(() => parse(["OBJECT  = 'abc"])).toThrow(OifitsError);
    expect(() => parse(["OBJECT  = 'abc' junk"])).toThrow(/only a comment starting with '\/'/);
    expect(() => parse(['NAXIS   =                    2 junk'])).toThrow(/is none of: a quoted string/);
  });
});

describe('formatCard', () => {
  it('writes fixed-format cards of exactly 80 characters', () => {
    expect(formatCard({ keyword: 'NAXIS', kind: 'integer', value: 2 })).toEqual([
      `NAXIS   = ${'2'.padStart(20)}`.padEnd(80),
    ]);
    expect(formatCard({ keyword: 'SIMPLE', kind: 'logical', value: true })[0]!.slice(0, 30)).toBe(
      `SIMPLE  = ${'T'.padStart(20)}`,
    );
    expect(formatCard({ keyword: 'EXTNAME', kind: 'string', value: 'OI_T3' })[0]!.slice(0, 20)).toBe(
      "EXTNAME = 'OI_T3   '",
    );
  });
  it('splits long strings into CONTINUE cards that read back to the same string', () => {
    fc.assert(
      fc.property(
        fc.string({ unit: fc.constantFrom('a', "'", ' ', '&', 'Z', '/'), minLength: 0, maxLength: 300 }),
        (s) => {
          const value = s.trimEnd();
          const cards = formatCard({ keyword: 'LONG', kind: 'string', value, comment: 'c' });
          for (const c of cards) expect(c.length).toBe(80);
          const h = parseHeader(formatHeader([{ keyword: 'LONG', kind: 'string', value }]), 0, 't', 0).header;
          expect(h.get('LONG')).toBe(value);
        },
      ),
      { seed: 7, numRuns: 200 },
    );
  });
  it('formats floats that read back as the same double', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), (x) => {
        const h = parseHeader(formatHeader([{ keyword: 'X', kind: 'float', value: x }]), 0, 't', 0).header;
        expect(Object.is(h.get('X'), x)).toBe(true);
        expect(h.card('X')!.kind).toBe('float');
      }),
      { seed: 11, numRuns: 500 },
    );
    expect(formatFloat(2000)).toBe('2000.0');
    expect(formatFloat(1e-7)).toBe('1.0E-7');
    expect(() => formatFloat(Number.NaN)).toThrow(RangeError);
  });
});

describe('parseTform (FITS 4.0 section 7.3.1, table 18)', () => {
  it.each([
    ['1D', 1, 'D', 8],
    ['D', 1, 'D', 8],
    ['16A', 16, 'A', 16],
    ['3I', 3, 'I', 6],
    ['2C', 2, 'C', 16],
    ['M', 1, 'M', 16],
    ['5L', 5, 'L', 5],
    ['12X', 12, 'X', 2],
    ['1PE(20)', 1, 'P', 8],
  ])('%s has repeat %i, code %s and %i bytes', (text, repeat, code, bytes) => {
    expect(parseTform(text)).toMatchObject({ repeat, code, bytes });
  });
  it('refuses what is not a TFORM', () => {
    expect(parseTform('Z')).toBeUndefined();
    expect(parseTform('3')).toBeUndefined();
  });
});
