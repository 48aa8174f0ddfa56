/**
 * NaN and infinite coordinates at every evaluation entry point: Model methods, the wavelength functions of
 * src/observe/chromatic.ts, and the Jacobians. Each must throw an InputError whose location names the argument
 * and the index of the bad entry (and whose message says it), never return NaN.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import {
  chromaticBispectrum,
  chromaticClosurePhase,
  chromaticVis2,
  chromaticVisibilities,
  disk,
  observableJacobian,
  param,
  pointsFromFrequencies,
  visibilityJacobian,
} from '../../src/index.js';
import { MAX_SPATIAL_FREQUENCY } from '../../src/units/index.js';

const m = disk({ diameter: param('d', 2) }).shift(1, 0.5);
const BAD = [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY] as const;
/** The index at which the bad value is put. */
const AT = 2;

/** Four finite entries with `bad` at index AT. */
function column(bad?: number): number[] {
  const c = [1e7, -2e7, 3e7, 4e7];
  if (bad !== undefined) c[AT] = bad;
  return c;
}

function inputErrorOf(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('no error');
}

type Entry = readonly [string, readonly string[], (cols: Record<string, number[]>) => unknown];

const B = (n = 4) => Array.from({ length: n }, (_, i) => 10 + i); // baselines, metres
const W = () => [2e-6, 2.1e-6, 2.2e-6, 2.3e-6];

const ENTRIES: readonly Entry[] = [
  ['Model.visibilities', ['u', 'v'], (c) => m.visibilities(c['u']!, c['v']!)],
  ['Model.vis2', ['u', 'v'], (c) => m.vis2(c['u']!, c['v']!)],
  ['Model.visamp', ['u', 'v'], (c) => m.visamp(c['u']!, c['v']!)],
  ['Model.visphi', ['u', 'v'], (c) => m.visphi(c['u']!, c['v']!)],
  ['Model.bispectrum', ['u1', 'v1', 'u2', 'v2'], (c) => m.bispectrum(c['u1']!, c['v1']!, c['u2']!, c['v2']!)],
  [
    'Model.closurePhase',
    ['u1', 'v1', 'u2', 'v2'],
    (c) => m.closurePhase(c['u1']!, c['v1']!, c['u2']!, c['v2']!),
  ],
  ['Model.t3amp', ['u1', 'v1', 'u2', 'v2'], (c) => m.t3amp(c['u1']!, c['v1']!, c['u2']!, c['v2']!)],
  [
    'chromaticVisibilities',
    ['ucoord', 'vcoord', 'wavelength', 'band'],
    (c) =>
      chromaticVisibilities(m, {
        ucoord: c['ucoord']!,
        vcoord: c['vcoord']!,
        wavelength: c['wavelength']!,
        band: c['band']!,
      }),
  ],
  [
    'chromaticVis2',
    ['ucoord', 'vcoord', 'wavelength', 'band'],
    (c) =>
      chromaticVis2(m, {
        ucoord: c['ucoord']!,
        vcoord: c['vcoord']!,
        wavelength: c['wavelength']!,
        band: c['band']!,
      }),
  ],
  [
    'chromaticBispectrum',
    ['u1coord', 'v1coord', 'u2coord', 'v2coord', 'wavelength', 'band'],
    (c) =>
      chromaticBispectrum(m, {
        u1coord: c['u1coord']!,
        v1coord: c['v1coord']!,
        u2coord: c['u2coord']!,
        v2coord: c['v2coord']!,
        wavelength: c['wavelength']!,
        band: c['band']!,
      }),
  ],
  [
    'chromaticClosurePhase',
    ['u1coord', 'v1coord', 'u2coord', 'v2coord', 'wavelength'],
    (c) =>
      chromaticClosurePhase(m, {
        u1coord: c['u1coord']!,
        v1coord: c['v1coord']!,
        u2coord: c['u2coord']!,
        v2coord: c['v2coord']!,
        wavelength: c['wavelength']!,
      }),
  ],
  [
    'pointsFromFrequencies',
    ['u', 'v', 'wavelength'],
    (c) => pointsFromFrequencies(c['u']!, c['v']!, c['wavelength']!),
  ],
  ['visibilityJacobian', ['u', 'v'], (c) => visibilityJacobian(m, c['u']!, c['v']!)],
  ['observableJacobian (vis2)', ['u', 'v'], (c) => observableJacobian(m, 'vis2', { u: c['u']!, v: c['v']! })],
  [
    'observableJacobian (visphi)',
    ['u', 'v'],
    (c) => observableJacobian(m, 'visphi', { u: c['u']!, v: c['v']! }),
  ],
  [
    'observableJacobian (t3phi)',
    ['u1', 'v1', 'u2', 'v2'],
    (c) => observableJacobian(m, 't3phi', { u1: c['u1']!, v1: c['v1']!, u2: c['u2']!, v2: c['v2']! }),
  ],
];

/** Finite columns for an entry: wavelengths in metres, bands small, baselines in metres, frequencies otherwise. */
function goodColumns(names: readonly string[]): Record<string, number[]> {
  const out: Record<string, number[]> = {};
  for (const n of names) {
    out[n] =
      n === 'wavelength' ? W() : n === 'band' ? [1e-8, 1e-8, 0, 2e-8] : n.includes('coord') ? B() : column();
  }
  return out;
}

describe('non-finite coordinates', () => {
  it.each(ENTRIES)('%s evaluates the finite columns', (_name, names, call) => {
    expect(() => call(goodColumns(names))).not.toThrow();
  });

  it.each(ENTRIES)(
    '%s throws an InputError naming the argument and the index of NaN or an infinity',
    (_n, names, call) => {
      for (const name of names) {
        for (const bad of BAD) {
          const cols = goodColumns(names);
          cols[name]![AT] = bad;
          const e = inputErrorOf(() => call(cols));
          expect(e.location.argument).toBe(name);
          expect(e.location.index).toBe(AT);
          expect(e.message).toContain(`${name}[${AT}]`);
        }
      }
    },
  );
});

describe('spatial frequencies beyond any baseline', () => {
  // entries that take u and v in cycles per radian (the wavelength functions take metres and wavelengths)
  const direct = ENTRIES.filter(([, names]) =>
    names.every((n) => !n.includes('coord') && n !== 'wavelength'),
  );

  it('cover every entry that takes frequencies', () => {
    expect(direct.length).toBe(11);
  });

  it.each(direct)(
    '%s throws an InputError naming the argument and the index of a frequency beyond MAX_SPATIAL_FREQUENCY',
    (_n, names, call) => {
      for (const name of names) {
        for (const huge of [1.0001 * MAX_SPATIAL_FREQUENCY, -1e170, 1e300]) {
          const cols = goodColumns(names);
          cols[name]![AT] = huge;
          const e = inputErrorOf(() => call(cols));
          expect(e.location.argument).toBe(name);
          expect(e.location.index).toBe(AT);
          expect(e.message).toContain(`${name}[${AT}]`);
          expect(e.message).toContain('cycles per radian');
        }
      }
    },
  );

  it('accepts frequencies up to the bound, with finite visibilities', () => {
    const r = m.visibilities([MAX_SPATIAL_FREQUENCY, 3e10], [-MAX_SPATIAL_FREQUENCY, 1e10]);
    expect(Array.from(r.re).every(Number.isFinite)).toBe(true);
    expect(Array.from(r.im).every(Number.isFinite)).toBe(true);
  });
});

describe('baselines over wavelengths beyond any spatial frequency', () => {
  const chromatic = ENTRIES.filter(([name]) => name.startsWith('chromatic'));

  it('cover the four wavelength functions', () => {
    expect(chromatic.length).toBe(4);
  });

  it.each(chromatic)(
    '%s throws an InputError naming the point when a baseline over its wavelength passes MAX_SPATIAL_FREQUENCY',
    (_n, names, call) => {
      for (const [what, value] of [
        ['wavelength', 1e-30], // 10 m over 1e-30 m
        [names[0]!, 1e25], // a baseline of 1e25 m at 2 micrometres
      ] as const) {
        const cols = goodColumns(names);
        cols[what]![AT] = value;
        if (what === 'wavelength' && cols['band'] !== undefined) cols['band'][AT] = 0;
        const e = inputErrorOf(() => call(cols));
        expect(e.location.argument).toBe('wavelength');
        expect(e.location.index).toBe(AT);
        expect(e.message).toContain(`point ${AT}`);
        expect(e.message).toContain('cycles per radian');
      }
    },
  );
});
