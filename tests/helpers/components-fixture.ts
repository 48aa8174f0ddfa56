/** Reads the scipy reference values of tests/fixtures/components/components.json (generate_components.py). */
import { readFileSync } from 'node:fs';

export interface ComponentsFixture {
  readonly versions: Record<string, string>;
  readonly linear: readonly { a: number; x: number; v: number; quad: number }[];
  readonly quadratic: readonly { a: number; b: number; x: number; v: number }[];
  readonly power: readonly { alpha: number; x: number; v: number; quad: number }[];
  readonly annulus: readonly { ratio: number; x: number; v: number }[];
  readonly exponential: readonly { x: number; v: number; quad: number }[];
  readonly lorentzian: readonly { x: number; v: number; quad: number | null }[];
  readonly modulatedRing: readonly {
    c1: number;
    pa1: number;
    c2: number;
    pa2: number;
    x: number;
    phi: number;
    re: number;
    im: number;
  }[];
}

export const COMPONENTS: ComponentsFixture = JSON.parse(
  readFileSync(new URL('../fixtures/components/components.json', import.meta.url), 'utf8'),
);

/** The spatial frequency (cycles / rad) at which x = pi * size * q for a size in mas. */
export function qFor(x: number, sizeMas: number): number {
  return x / (Math.PI * sizeMas * (Math.PI / 648_000_000));
}

/** Throws a readable error when |got - expected| > tol. */
export function expectClose(what: string, got: number, expected: number, tol: number): void {
  const diff = Math.abs(got - expected);
  if (!(diff <= tol)) {
    throw new Error(`${what}: got ${got} expected ${expected} diff ${diff} tol ${tol}`);
  }
}
