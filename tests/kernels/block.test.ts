import { readFileSync } from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import wabtInit from 'wabt';
import {
  gaussian,
  gaussianRing,
  limbDarkenedDisk,
  linearLaw,
  param,
  point,
  sum,
  visibilityJacobian,
} from '../../src/index.js';
import {
  BLOCK_POINTS,
  blockColumns,
  loadBlock,
  phaseRampPlain,
  phaseRampSplit,
  useBlockBackend,
} from '../../src/kernels/block.js';
import { BLOCK_WASM_BASE64 } from '../../src/kernels/block-wasm.js';
import { splitHead } from '../../src/kernels/sincos.js';
import { RAD_PER_MAS } from '../../src/units/index.js';
import { exactTurns } from './helpers.js';

/** Absolute error allowed on sin and cos of a phase that is itself exact (a few ulp of 1). */
const SINCOS_TOL = 4e-16;
/** Absolute error allowed on the phase of the split ramp, shifts up to 1 arcsecond, |u| up to 3e8, rad. */
const PHASE_TOL = 1e-12;

const rnd = (() => {
  let s = 2024;
  return () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return s / 2147483648 - 0.5;
  };
})();

const initial = blockColumns().backend;
afterAll(() => {
  useBlockBackend(initial);
});

describe('the WebAssembly module of the block kernels', () => {
  it('is the committed text form block.wat assembled by wabt (the WebAssembly Binary Toolkit)', async () => {
    const wabt = await wabtInit();
    const wat = readFileSync(new URL('../../src/kernels/block.wat', import.meta.url), 'utf8');
    const parsed = wabt.parseWat('block.wat', wat, { simd: true });
    parsed.validate();
    const bytes = Buffer.from(parsed.toBinary({}).buffer).toString('base64');
    parsed.destroy();
    expect(bytes).toBe(BLOCK_WASM_BASE64);
  });

  it('runs here (Node has WebAssembly SIMD), so the evaluation uses it by default', () => {
    expect(initial).toBe('wasm');
  });
});

for (const backend of ['wasm', 'js'] as const) {
  describe(`the ${backend} block kernels`, () => {
    it('give sin and cos of 2 pi (u e + v n) to 4e-16 against Math.sin and Math.cos, for odd and full blocks', () => {
      const rb = useBlockBackend(backend);
      for (const n of [1, 3, 200, BLOCK_POINTS - 1, BLOCK_POINTS]) {
        const u = Float64Array.from({ length: n }, () => rnd() * 6e8);
        const v = Float64Array.from({ length: n }, () => rnd() * 6e8);
        const e0 = 4.5 * RAD_PER_MAS;
        const n0 = -2.2 * RAD_PER_MAS;
        loadBlock(rb, u, v, 0, n);
        phaseRampPlain(rb, n, e0, n0);
        let worst = 0;
        for (let i = 0; i < n; i++) {
          const t = u[i]! * e0 + v[i]! * n0; // the rounded phase the plain ramp is defined on
          const r = t - Math.round(t); // exact
          worst = Math.max(
            worst,
            Math.abs(rb.sin[i]! - Math.sin(2 * Math.PI * r)),
            Math.abs(rb.cos[i]! - Math.cos(2 * Math.PI * r)),
          );
        }
        expect(worst, `n = ${n}`).toBeLessThan(SINCOS_TOL);
      }
    });

    it('read the block from any start in the columns and give exact quarter turns', () => {
      const rb = useBlockBackend(backend);
      // u e = k / 4 turns exactly: e = 2^-30 rad, u = k 2^28
      const k = [0, 1, 2, 3, -1, -2, 5, 4099];
      const u = Float64Array.from([7, 7, ...k.map((x) => x * 2 ** 28)]);
      const v = new Float64Array(u.length);
      loadBlock(rb, u, v, 2, k.length);
      phaseRampPlain(rb, k.length, 2 ** -30, 0);
      k.forEach((x, i) => {
        const q = ((x % 4) + 4) % 4;
        expect(Math.abs(rb.sin[i]! - [0, 1, 0, -1][q]!), `k = ${x}`).toBeLessThan(SINCOS_TOL);
        expect(Math.abs(rb.cos[i]! - [1, 0, -1, 0][q]!), `k = ${x}`).toBeLessThan(SINCOS_TOL);
      });
    });

    it('keep the split phase within 1e-12 rad of the exact phase for shifts up to 1 arcsecond and |u| up to 3e8', () => {
      const rb = useBlockBackend(backend);
      let worst = 0;
      for (let k = 0; k < 20; k++) {
        const e0 = rnd() * 2000 * RAD_PER_MAS;
        const n0 = rnd() * 2000 * RAD_PER_MAS;
        const n = 257;
        const u = Float64Array.from({ length: n }, () => rnd() * 6e8);
        const v = Float64Array.from({ length: n }, () => rnd() * 6e8);
        const eh = splitHead(e0);
        const nh = splitHead(n0);
        loadBlock(rb, u, v, 0, n);
        phaseRampSplit(rb, n, eh, e0 - eh, nh, n0 - nh);
        for (let i = 0; i < n; i++) {
          const exact = 2 * Math.PI * exactTurns(u[i]!, e0, v[i]!, n0);
          let d = Math.atan2(rb.sin[i]!, rb.cos[i]!) - exact;
          d -= 2 * Math.PI * Math.round(d / (2 * Math.PI));
          worst = Math.max(worst, Math.abs(d));
        }
      }
      expect(worst).toBeLessThan(PHASE_TOL);
    });
  });
}

describe('evaluation with either form of the block kernels', () => {
  const model = sum(
    limbDarkenedDisk({ diameter: 1.8, law: linearLaw(0.4) }).shift(0.3, 0.1),
    gaussianRing({ diameter: 6, fwhm: 1 }).incline(50, 30).weight(0.3).shift(-1, 2),
    gaussian({ fwhm: param('fwhm', 3) })
      .incline(40, 10)
      .weight(0.2),
    point().weight(param('companion', 0.05)).shift(param('east', 4.5), param('north', -2)),
    point().weight(0.01).shift(param('far', 900), 400), // far enough out for the split phase
  );
  const n = 2 * BLOCK_POINTS + 77;
  const u = Float64Array.from({ length: n }, () => rnd() * 6e8);
  const v = Float64Array.from({ length: n }, () => rnd() * 6e8);

  it('gives the same visibilities and Jacobians from the WebAssembly and the JavaScript kernels', () => {
    useBlockBackend('wasm');
    const w = model.visibilities(u, v);
    const wj = visibilityJacobian(model, u, v);
    useBlockBackend('js');
    const j = model.visibilities(u, v);
    const jj = visibilityJacobian(model, u, v);
    let worst = 0;
    const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(1, Math.abs(b));
    for (let i = 0; i < n; i++) {
      worst = Math.max(worst, rel(w.re[i]!, j.re[i]!), rel(w.im[i]!, j.im[i]!));
      worst = Math.max(worst, rel(wj.re[i]!, jj.re[i]!), rel(wj.im[i]!, jj.im[i]!));
    }
    expect(wj.cols).toBe(5);
    for (let k = 0; k < n * wj.cols; k++) {
      worst = Math.max(worst, rel(wj.dre[k]!, jj.dre[k]!), rel(wj.dim[k]!, jj.dim[k]!));
    }
    // the two forms differ only where floor(4 t + 1/2) and the int32 truncation pick different quadrants
    expect(worst).toBeLessThan(1e-14);
  });
});
