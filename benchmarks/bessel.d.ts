/** Types of the npm `bessel` package (it ships none); used as a baseline in the benchmarks. */
declare module 'bessel' {
  const bessel: {
    besselj(x: number, n: number): number;
    bessely(x: number, n: number): number;
    besseli(x: number, n: number): number;
    besselk(x: number, n: number): number;
  };
  export default bessel;
}
