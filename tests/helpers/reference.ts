/**
 * Outside references shared by the tests: Cephes-derived Bessel functions from @stdlib and a direct numerical
 * Fourier transform of rendered images (written here from the definition in CONVENTIONS.md, independent of the
 * library's canonical form).
 */
import besselj0 from '@stdlib/math-base-special-besselj0';
import besselj1 from '@stdlib/math-base-special-besselj1';

export const RAD_PER_MAS_REF = Math.PI / (180 * 3600 * 1000);

export const refJ0: (x: number) => number = besselj0;
export const refJ1: (x: number) => number = besselj1;

/** 2 J1(x)/x with the limit 1 at x = 0, from @stdlib's J1. */
export function refDisk(x: number): number {
  return x === 0 ? 1 : (2 * refJ1(x)) / x;
}

/** An image on a square grid centred on the origin: pixel (i, j) sits at east = (i - (n-1)/2) * step. */
export interface Rendered {
  readonly n: number;
  readonly step: number; // mas
  readonly pixels: Float64Array; // row j (north), column i (east): pixels[j * n + i]
}

/**
 * Renders an intensity function I(east, north) (mas) on an n x n grid, averaging `sub` x `sub` samples per pixel.
 */
export function render(
  f: (east: number, north: number) => number,
  n: number,
  step: number,
  sub = 1,
): Rendered {
  const pixels = new Float64Array(n * n);
  const c = (n - 1) / 2;
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      let acc = 0;
      for (let a = 0; a < sub; a++) {
        for (let b = 0; b < sub; b++) {
          const e = (i - c + (a + 0.5) / sub - 0.5) * step;
          const no = (j - c + (b + 0.5) / sub - 0.5) * step;
          acc += f(e, no);
        }
      }
      pixels[j * n + i] = acc / (sub * sub);
    }
  }
  return { n, step, pixels };
}

/**
 * Normalised visibility of a rendered image by a direct discrete Fourier transform,
 * V(u, v) = sum I exp(-2 pi i (u e + v n)) / sum I, with e, n in radians (the OIFITS sign convention).
 */
export function dft(img: Rendered, u: number, v: number): { re: number; im: number } {
  const { n, step, pixels } = img;
  const c = (n - 1) / 2;
  let re = 0;
  let im = 0;
  let tot = 0;
  for (let j = 0; j < n; j++) {
    const no = (j - c) * step * RAD_PER_MAS_REF;
    for (let i = 0; i < n; i++) {
      const p = pixels[j * n + i]!;
      if (p === 0) continue;
      const e = (i - c) * step * RAD_PER_MAS_REF;
      const ph = -2 * Math.PI * (u * e + v * no);
      re += p * Math.cos(ph);
      im += p * Math.sin(ph);
      tot += p;
    }
  }
  return { re: re / tot, im: im / tot };
}
