/**
 * A small seeded pseudo-random generator for simulated noise: a 32-bit Weyl sequence (step 0x9E3779B9, the
 * golden-ratio increment) passed through the MurmurHash3 32-bit finaliser, and Box-Muller for Gaussian
 * deviates. Not for cryptography; the same seed gives the same sequence on every platform.
 *
 * @module
 */

/** A seeded source of uniform and Gaussian deviates. */
export interface Random {
  /** Uniform deviate in (0, 1). */
  uniform(): number;
  /** Standard normal deviate (mean 0, standard deviation 1). */
  normal(): number;
}

/**
 * Creates a seeded generator.
 *
 * @param seed - any integer (taken modulo 2^32)
 * @returns the generator
 * @example
 * ```ts
 * const r = seededRandom(42);
 * r.normal(); // the same number on every run
 * ```
 */
export function seededRandom(seed: number): Random {
  let state = seed >>> 0;
  let spare: number | undefined;
  const next32 = (): number => {
    state = (state + 0x9e3779b9) >>> 0;
    let z = state;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
    return (z ^ (z >>> 16)) >>> 0;
  };
  const uniform = (): number => (next32() + 0.5) / 4294967296;
  return {
    uniform,
    normal(): number {
      if (spare !== undefined) {
        const s = spare;
        spare = undefined;
        return s;
      }
      const r = Math.sqrt(-2 * Math.log(uniform()));
      const t = 2 * Math.PI * uniform();
      spare = r * Math.sin(t);
      return r * Math.cos(t);
    },
  };
}
