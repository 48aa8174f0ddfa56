/**
 * fast-check generators for the robustness tests and `tests/robustness/long-fuzz.ts`: model trees over every component kind
 * (extending `arbitraries.ts`, which holds the five foundation primitives), and damaged copies of OIFITS files
 * (truncations, bit flips, hostile header values, garbage cards).
 */
import fc from 'fast-check';
import {
  annulus,
  background,
  exponential,
  gaussianRing,
  limbDarkenedDisk,
  linearLaw,
  lorentzian,
  type Model,
  modulatedRing,
  pixelImage,
  powerLaw,
  quadraticLaw,
  radialProfile,
  sum,
} from '../../src/index.js';
import { arbPrimitive } from './arbitraries.js';

const size = fc.double({ min: 0.05, max: 20, noNaN: true });
const offset = fc.double({ min: -50, max: 50, noNaN: true });
const angle = fc.double({ min: -360, max: 360, noNaN: true });
const factor = fc.double({ min: 0.2, max: 5, noNaN: true });
const unit = fc.double({ min: 0, max: 1, noNaN: true });

/**
 * Highest tabulated frequency of the generated radial profiles, cycles per mas. The table costs about
 * (R maxFrequency)^2 Bessel calls to build, so a small value keeps each generated model cheap; points above it
 * go through the direct quadrature, which the properties then exercise too.
 */
const PROFILE_MAX_FREQUENCY = 0.5;

/** Every component kind of the library with flux 1 and random shape values inside their domains. */
export const arbComponent: fc.Arbitrary<Model> = fc.oneof(
  arbPrimitive,
  fc
    .tuple(size, fc.double({ min: -2, max: 1, noNaN: true }))
    .map(([d, a]) => limbDarkenedDisk({ diameter: d, law: linearLaw(a) })),
  // a + b <= 1 with b >= 0 keeps the quadratic law non-negative on [0, 1]
  fc
    .tuple(size, unit, unit)
    .map(([d, a, t]) => limbDarkenedDisk({ diameter: d, law: quadraticLaw(a * (1 - t), a * t) })),
  fc
    .tuple(size, fc.double({ min: 0, max: 8, noNaN: true }))
    .map(([d, alpha]) => limbDarkenedDisk({ diameter: d, law: powerLaw(alpha) })),
  fc.tuple(size, unit).map(([outer, r]) => annulus({ inner: outer * r, outer })),
  fc.tuple(size, size).map(([d, w]) => gaussianRing({ diameter: d, fwhm: w })),
  fc
    .tuple(size, unit, angle, unit, angle)
    .map(([d, c1, pa1, t, pa2]) => modulatedRing({ diameter: d, c1: c1 * (1 - t), pa1, c2: c1 * t, pa2 })),
  size.map((w) => exponential({ fwhm: w })),
  size.map((w) => lorentzian({ fwhm: w })),
  fc.constant(null).map(() => background()),
  fc
    .tuple(fc.double({ min: 0.2, max: 3, noNaN: true }), fc.array(unit, { minLength: 1, maxLength: 4 }))
    .map(([outer, levels]) => {
      const radii = levels.map((_, k) => (outer * k) / levels.length);
      radii.push(outer);
      // a positive value inside keeps the profile's flux above zero
      return radialProfile({
        radii,
        intensity: [...levels.map((x) => x + 0.1), 0],
        maxFrequency: PROFILE_MAX_FREQUENCY,
      });
    }),
  fc
    .tuple(
      fc.integer({ min: 1, max: 4 }),
      fc.integer({ min: 1, max: 4 }),
      fc.double({ min: 0.05, max: 2, noNaN: true }),
    )
    .chain(([nx, ny, scale]) =>
      fc
        .array(unit, { minLength: nx * ny, maxLength: nx * ny })
        .map((p) => pixelImage({ nx, ny, scale, pixels: p.map((x) => x + 0.01) })),
    ),
);

/** Random trees over every component kind and every operator, with positive weights (so |V| <= 1). */
export const arbAnyModel: fc.Arbitrary<Model> = fc.letrec<{ m: Model }>((tie) => ({
  m: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    arbComponent,
    fc.tuple(tie('m'), fc.double({ min: 0.1, max: 3, noNaN: true })).map(([m, w]) => m.weight(w)),
    fc.tuple(tie('m'), offset, offset).map(([m, e, n]) => m.shift(e, n)),
    fc.tuple(tie('m'), factor, factor).map(([m, a, b]) => m.stretch(a, b)),
    fc.tuple(tie('m'), angle).map(([m, p]) => m.rotate(p)),
    fc
      .tuple(tie('m'), fc.double({ min: 0, max: 85, noNaN: true }), angle)
      .map(([m, i, p]) => m.incline(i, p)),
    fc.array(tie('m'), { minLength: 1, maxLength: 3 }).map((ms) => sum(...ms)),
    fc.tuple(tie('m'), tie('m')).map(([a, b]) => a.convolve(b)),
  ),
})).m;

// ---------------------------------------------------------------------------------------------------------
// Damaged OIFITS files

const CARD = 80;
const BLOCK = 2880;

/** Byte offsets of the header cards of every HDU (a header block starts with SIMPLE or XTENSION). */
export function headerCards(bytes: Uint8Array): number[] {
  const out: number[] = [];
  for (let b = 0; b + CARD <= bytes.length; b += BLOCK) {
    const head = String.fromCharCode(...bytes.subarray(b, b + 10));
    if (!/^(SIMPLE {2}=|XTENSION=)/.test(head)) continue;
    for (let p = b; p + CARD <= bytes.length; p += CARD) {
      out.push(p);
      if (String.fromCharCode(...bytes.subarray(p, p + 8)) === 'END     ') break;
    }
  }
  return out;
}

function keywordAt(bytes: Uint8Array, at: number): string {
  return String.fromCharCode(...bytes.subarray(at, at + 8)).trimEnd();
}

function writeCard(bytes: Uint8Array, at: number, text: string): void {
  const c = text.padEnd(CARD, ' ').slice(0, CARD);
  for (let i = 0; i < CARD; i++) bytes[at + i] = c.charCodeAt(i) & 0xff;
}

/** Structural keywords whose values a hostile file would bend. */
const SIZE_KEYWORDS = ['NAXIS', 'NAXIS1', 'NAXIS2', 'PCOUNT', 'GCOUNT', 'TFIELDS', 'BITPIX'];

/** Hostile values for a size keyword, from 0 through 2^40 to beyond the double range, and of wrong types. */
const HOSTILE_NUMBERS = [
  '0',
  '1',
  '-1',
  '2',
  '999',
  '1000',
  '65536',
  String(2 ** 31),
  String(2 ** 40),
  String(2 ** 53),
  '99999999999999999999999',
  '1E400',
  '1.5',
  'NaN',
  'T',
  "'12'",
  '(1, 2)',
  '',
];

/** Hostile TFORM values: huge and zero repeat counts, unknown codes, descriptors, blanks. */
const HOSTILE_TFORMS = [
  '1000000000000E',
  '1000000000000A',
  '0D',
  '0A',
  '99999999999999999999D',
  '1Z',
  'PE(1000000000)',
  'QD(99)',
  '8X',
  'D ',
  '',
  '3',
];

/** Garbage cards: bad keywords, unterminated strings, commentary in odd places, values of every type. */
const GARBAGE_CARDS = [
  'lowercase= 1',
  "STRING  = 'no closing quote",
  'NUMBER  = 1.2.3',
  "CONTINUE  'dangling&'",
  'COMMENT just text',
  "TDIM1   = '(1000000000000,1000000000000)'",
  "TDIM2   = '(0)'",
  "TDIM3   = 'junk'",
  'TNULL1  = 1.5',
  "EXTNAME = 'OI_VIS2 '",
  "EXTNAME = 'OI_T3   '",
  'OI_REVN =                 -2',
  "OI_REVN = '2'",
  "INSNAME = '        '",
  'END',
  '',
  'XTENSION= 5',
  "CONTENT = 'OIFITS9 '",
];

/** One damage applied to a copy of a file. */
export type Damage =
  | { readonly kind: 'truncate'; readonly at: number }
  | { readonly kind: 'flip'; readonly at: number; readonly bit: number }
  | { readonly kind: 'size'; readonly card: number; readonly keyword: string; readonly value: string }
  | { readonly kind: 'tform'; readonly card: number; readonly value: string }
  | { readonly kind: 'garbage'; readonly card: number; readonly text: string }
  | { readonly kind: 'bytes'; readonly at: number; readonly fill: readonly number[] };

/** Applies damages in order to a copy of `good` (card numbers are taken modulo the cards found). */
export function damage(good: Uint8Array, damages: readonly Damage[]): Uint8Array {
  let bytes = good.slice();
  const cards = headerCards(good);
  for (const d of damages) {
    switch (d.kind) {
      case 'truncate':
        bytes = bytes.slice(0, d.at % (bytes.length + 1));
        break;
      case 'flip':
        if (bytes.length > 0) {
          const at = d.at % bytes.length;
          bytes[at] = bytes[at]! ^ (1 << d.bit);
        }
        break;
      case 'size': {
        // rewrite the first card with this keyword, or a random card when the keyword is absent
        const at = cards.find((p) => p + CARD <= bytes.length && keywordAt(bytes, p) === d.keyword);
        const place = at ?? cards[d.card % cards.length]!;
        if (place + CARD <= bytes.length)
          writeCard(bytes, place, `${d.keyword.padEnd(8)}= ${d.value.padStart(20)}`);
        break;
      }
      case 'tform': {
        const tforms = cards.filter(
          (p) => p + CARD <= bytes.length && keywordAt(bytes, p).startsWith('TFORM'),
        );
        if (tforms.length > 0) {
          const at = tforms[d.card % tforms.length]!;
          writeCard(bytes, at, `${keywordAt(bytes, at).padEnd(8)}= '${d.value.padEnd(8)}'`);
        }
        break;
      }
      case 'garbage': {
        const at = cards[d.card % cards.length]!;
        if (at + CARD <= bytes.length) writeCard(bytes, at, d.text);
        break;
      }
      case 'bytes': {
        if (bytes.length > 0) {
          const at = d.at % bytes.length;
          for (let i = 0; i < d.fill.length && at + i < bytes.length; i++) bytes[at + i] = d.fill[i]!;
        }
        break;
      }
    }
  }
  return bytes;
}

/** Random damages for a file of `length` bytes. */
export function arbDamages(length: number): fc.Arbitrary<Damage[]> {
  const at = fc.integer({ min: 0, max: Math.max(0, length - 1) });
  const card = fc.nat({ max: 10_000 });
  const one: fc.Arbitrary<Damage> = fc.oneof(
    at.map((a) => ({ kind: 'truncate', at: a }) as const),
    fc.tuple(at, fc.integer({ min: 0, max: 7 })).map(([a, bit]) => ({ kind: 'flip', at: a, bit }) as const),
    fc
      .tuple(card, fc.constantFrom(...SIZE_KEYWORDS), fc.constantFrom(...HOSTILE_NUMBERS))
      .map(([c, keyword, value]) => ({ kind: 'size', card: c, keyword, value }) as const),
    fc
      .tuple(card, fc.constantFrom(...HOSTILE_TFORMS))
      .map(([c, value]) => ({ kind: 'tform', card: c, value }) as const),
    fc
      .tuple(card, fc.oneof(fc.constantFrom(...GARBAGE_CARDS), fc.string({ maxLength: 80 })))
      .map(([c, text]) => ({ kind: 'garbage', card: c, text }) as const),
    fc
      .tuple(at, fc.array(fc.integer({ min: 0, max: 255 }), { minLength: 1, maxLength: 16 }))
      .map(([a, fill]) => ({ kind: 'bytes', at: a, fill }) as const),
  );
  return fc.array(one, { minLength: 1, maxLength: 4 });
}
