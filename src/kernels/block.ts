/**
 * Block kernels: the phase ramps of shifted terms, sin and cos of 2 pi (u e0 + v n0) for the shift factor
 * exp(-2 pi i q . x0), evaluated for up to {@link BLOCK_POINTS} points at once into columns that the term loops
 * then read.
 *
 * Where WebAssembly with 128-bit SIMD is available (Node >= 16.4, Deno, current browsers) they run in a small
 * generated module (block.wat, two points per instruction); elsewhere, or when a page's content security policy
 * forbids compiling WebAssembly, in JavaScript through {@link sinCosTurns} and {@link sinCosPhase}. Both forms
 * hold the accuracy stated on each function.
 *
 * Use: {@link blockColumns} gives the columns; write the block's u and v into `u` and `v` ({@link loadBlock}),
 * then call {@link phaseRampPlain} or {@link phaseRampSplit} and read `sin` and `cos` before the next call. The
 * columns belong to the running thread and are overwritten by the next call, so a loop reads them before it
 * calls anything that may use them again.
 *
 * @module
 */
import { BLOCK_WASM_BASE64, BLOCK_WASM_POINTS } from './block-wasm.js';
import { SIN_COS, sinCosPhase, sinCosTurns } from './sincos.js';

/** Points per block (the columns hold this many values). */
export const BLOCK_POINTS = BLOCK_WASM_POINTS;

/** The columns of the block kernels and how they run. */
export interface BlockColumns {
  /** Spatial frequencies east of the block, cycles per radian (written by the caller). */
  readonly u: Float64Array;
  /** Spatial frequencies north of the block, cycles per radian (written by the caller). */
  readonly v: Float64Array;
  /** sin of the phase 2 pi (u e0 + v n0) per point (written by the phase ramps). */
  readonly sin: Float64Array;
  /** cos of the phase per point. */
  readonly cos: Float64Array;
  /** 'wasm' when the SIMD module runs the kernels, 'js' otherwise. */
  readonly backend: 'wasm' | 'js';
  /** @internal */
  readonly plain: (n: number, e0: number, n0: number) => void;
  /** @internal */
  readonly split: (n: number, eh: number, el: number, nh: number, nl: number) => void;
}

/** The module's instance, or null where WebAssembly SIMD cannot run here. */
function instantiate(): BlockColumns | null {
  try {
    if (typeof WebAssembly !== 'object' || typeof atob !== 'function') return null;
    const text = atob(BLOCK_WASM_BASE64);
    const bytes = new Uint8Array(text.length);
    for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
    if (!WebAssembly.validate(bytes)) return null; // no SIMD in this engine
    const instance = new WebAssembly.Instance(new WebAssembly.Module(bytes), {});
    const exports = instance.exports as {
      memory: WebAssembly.Memory;
      plain: BlockColumns['plain'];
      split: BlockColumns['split'];
    };
    const buf = exports.memory.buffer;
    const n = BLOCK_POINTS;
    return {
      u: new Float64Array(buf, 0, n),
      v: new Float64Array(buf, 8 * n, n),
      sin: new Float64Array(buf, 16 * n, n),
      cos: new Float64Array(buf, 24 * n, n),
      backend: 'wasm',
      plain: exports.plain,
      split: exports.split,
    };
  } catch {
    return null; // e.g. a content security policy without 'wasm-unsafe-eval'
  }
}

/** The JavaScript form: the same columns as plain arrays, the scalar arithmetic. */
function scalarColumns(): BlockColumns {
  const n = BLOCK_POINTS;
  const u = new Float64Array(n);
  const v = new Float64Array(n);
  const sin = new Float64Array(n);
  const cos = new Float64Array(n);
  return {
    u,
    v,
    sin,
    cos,
    backend: 'js',
    plain(m: number, e0: number, n0: number): void {
      const sc = SIN_COS;
      const turns = sinCosTurns;
      for (let i = 0; i < m; i++) {
        turns(u[i]! * e0 + v[i]! * n0);
        sin[i] = sc[0]!;
        cos[i] = sc[1]!;
      }
    },
    split(m: number, eh: number, el: number, nh: number, nl: number): void {
      const sc = SIN_COS;
      const phase = sinCosPhase;
      for (let i = 0; i < m; i++) {
        phase(u[i]!, v[i]!, eh, el, nh, nl);
        sin[i] = sc[0]!;
        cos[i] = sc[1]!;
      }
    },
  };
}

let current: BlockColumns | null = null;

/**
 * The block columns of this thread, made on the first call (the WebAssembly module when it can run here).
 *
 * @returns the columns and the kernels that fill them
 *
 * Notes: the module is compiled once per thread (a worker has its own); it is 1.6 kB, small enough for the
 * synchronous compilation that browsers allow on their main thread.
 */
export function blockColumns(): BlockColumns {
  if (current === null) current = instantiate() ?? scalarColumns();
  return current;
}

/**
 * Chooses how the block kernels run, for tests and benchmarks that compare the two forms.
 *
 * @param backend - 'js' for the JavaScript loops; 'wasm' for the SIMD module (an error where it cannot run)
 * @returns the columns now in use
 * @throws Error when 'wasm' is asked for and WebAssembly SIMD is not available
 * @internal
 */
export function useBlockBackend(backend: 'wasm' | 'js'): BlockColumns {
  if (backend === 'js') current = scalarColumns();
  else {
    const w = instantiate();
    if (w === null) throw new Error('useBlockBackend: WebAssembly with SIMD is not available here');
    current = w;
  }
  return current;
}

/**
 * Copies u[start..start+n-1] and v[start..start+n-1] into the block's columns.
 *
 * @param bc - the block columns ({@link blockColumns})
 * @param u - spatial frequencies east, cycles per radian
 * @param v - spatial frequencies north, cycles per radian
 * @param start - first point
 * @param n - number of points, at most {@link BLOCK_POINTS}
 */
export function loadBlock(
  bc: BlockColumns,
  u: Float64Array,
  v: Float64Array,
  start: number,
  n: number,
): void {
  // a loop rather than set(subarray(...)), which would make two array objects per block
  const bu = bc.u;
  const bv = bc.v;
  for (let j = 0, i = start; j < n; j++, i++) {
    bu[j] = u[i]!;
    bv[j] = v[i]!;
  }
}

/**
 * sin and cos of 2 pi (u e0 + v n0) for the block's first n points, into `bc.sin` and `bc.cos`.
 *
 * @param bc - the block columns, u and v loaded
 * @param n - number of points (<= BLOCK_POINTS)
 * @param e0 - shift east, rad
 * @param n0 - shift north, rad
 *
 * Notes: the phase u e0 + v n0 is rounded once before it is reduced; the caller uses this form only where
 * |u e0| + |v n0| stays below PLAIN_PHASE_TURNS (phaseNeedsSplit, sincos.ts), so the phase is good to 2.1e-14
 * turns; sin and cos then have an absolute error below 4e-16 (tests/kernels/block.test.ts).
 */
export function phaseRampPlain(bc: BlockColumns, n: number, e0: number, n0: number): void {
  bc.plain(n, e0, n0);
}

/**
 * sin and cos of 2 pi (u e0 + v n0) with the products split as in sinCosPhase (sincos.ts), into `bc.sin` and
 * `bc.cos`: about 1e-16 turns of accuracy whatever the size of the phase.
 *
 * @param bc - the block columns, u and v loaded
 * @param n - number of points (<= BLOCK_POINTS)
 * @param eh - head of the shift east (rad), splitHead(e0)
 * @param el - its tail, e0 - eh
 * @param nh - head of the shift north (rad)
 * @param nl - its tail
 */
export function phaseRampSplit(
  bc: BlockColumns,
  n: number,
  eh: number,
  el: number,
  nh: number,
  nl: number,
): void {
  bc.split(n, eh, el, nh, nl);
}
