/**
 * Shared pieces of the kernel tests: the reference fixture and a checker whose failure message prints the input,
 * the result, the expected value, the difference and the tolerance.
 */
import { readFileSync } from 'node:fs';
import { expect } from 'vitest';

/** binary64 machine epsilon, 2^-52. */
export const EPS = 2 ** -52;

/** tests/fixtures/kernels/bessel.json, written by tests/fixtures/kernels/generate_bessel.py. */
export interface KernelFixture {
  comment: string;
  versions: Record<string, string | number>;
  /** rows [x, J0, J1, J2], mpmath at 40 digits */
  j012_near_zero: number[][];
  j012_moderate: number[][];
  j012_large: number[][];
  j012_at_zeros: number[][];
  /** rows [nu, x, J_nu], mpmath at 40 digits, checked against scipy.special.jv by the generator */
  jnu: number[][];
  /** rows [z, Gamma(z), ln|Gamma(z)|], scipy.special.gamma and gammaln */
  gamma: number[][];
}

export const fixture: KernelFixture = JSON.parse(
  readFileSync(new URL('../fixtures/kernels/bessel.json', import.meta.url), 'utf8'),
);

/** A row's column as a number (the fixture is rectangular; a hole is a broken fixture). */
export function col(row: number[], i: number): number {
  const v = row[i];
  if (v === undefined) throw new Error(`fixture row ${JSON.stringify(row)} has no column ${i}`);
  return v;
}

/**
 * Asserts |got - want| <= tol, printing what was compared on failure.
 *
 * @param what - the function and input, e.g. `besselJ0(3.2)`
 * @param source - where `want` comes from, e.g. `mpmath 1.2.1`
 */
export function expectClose(what: string, got: number, want: number, tol: number, source: string): void {
  const diff = Math.abs(got - want);
  if (!(diff <= tol)) {
    expect.fail(
      `${what}: result ${got}, expected ${want} (${source}), difference ${diff.toExponential(3)}, ` +
        `tolerance ${tol.toExponential(3)}`,
    );
  }
}

/**
 * Runs `check` on every input and returns the largest |got - want| seen, failing with the details of the first
 * input outside tol.
 */
export function worstError(
  name: string,
  xs: Iterable<number>,
  got: (x: number) => number,
  want: (x: number) => number,
  tol: (x: number, want: number) => number,
  source: string,
): number {
  let worst = 0;
  for (const x of xs) {
    const g = got(x);
    const w = want(x);
    const t = tol(x, w);
    expectClose(`${name}(${x})`, g, w, t, source);
    worst = Math.max(worst, Math.abs(g - w));
  }
  return worst;
}

/** Evenly spaced points lo, lo + step, ... up to hi. */
export function* range(lo: number, hi: number, step: number): Generator<number> {
  const n = Math.floor((hi - lo) / step + 1e-9);
  for (let i = 0; i <= n; i++) yield lo + i * step;
}

/** Five-point central difference f'(x), error O(h^4). */
export function derivative(f: (x: number) => number, x: number, h: number): number {
  return (f(x - 2 * h) - 8 * f(x - h) + 8 * f(x + h) - f(x + 2 * h)) / (12 * h);
}

/** Exact product a * b as a head and a tail (Dekker / Veltkamp splitting). */
export function twoProduct(a: number, b: number): [number, number] {
  const p = a * b;
  const split = (x: number): [number, number] => {
    const c = 134217729 * x;
    const hi = c - (c - x);
    return [hi, x - hi];
  };
  const [ah, al] = split(a);
  const [bh, bl] = split(b);
  return [p, ah * bh - p + ah * bl + al * bh + al * bl];
}

/** Fraction of u * e + v * n in turns, kept to about 1e-16 turns, as (-1/2, 1/2]. */
export function exactTurns(u: number, e: number, v: number, n: number): number {
  const [p1, e1] = twoProduct(u, e);
  const [p2, e2] = twoProduct(v, n);
  const f1 = p1 - Math.round(p1);
  const f2 = p2 - Math.round(p2);
  const t = f1 + f2 + (e1 + e2);
  return t - Math.round(t);
}
