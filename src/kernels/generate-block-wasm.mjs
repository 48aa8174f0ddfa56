// Generates src/kernels/block.wat and src/kernels/block-wasm.ts: the WebAssembly (128-bit SIMD) form of the
// block kernels of src/kernels/block.ts (phase ramps and Gaussians), two points per instruction.
//
// Run from the repository root:  node src/kernels/generate-block-wasm.mjs
// It needs the development dependency `wabt` (the WebAssembly Binary Toolkit compiled to JavaScript), which
// assembles the text form into bytes; the bytes are written as base64 into block-wasm.ts, stamped
// "generated: do not edit". tests/kernels/block.test.ts assembles block.wat again and checks that the
// committed bytes are the same.
//
// Phase ramps: the arithmetic of sinCosTurns and sinCosPhase (sincos.ts), term for term and in the same order,
// with one change: the quadrant q = floor(4 t + 1/2) comes from f64x2.floor (exact for every finite t), where
// the scalar code truncates 4 t + 1/2 + 2^30 and removes whole turns first when |t| > 2^26.
//
// Gaussians exp(-k r^2): Cody and Waite's reduction x = t ln 2 + r with t = nearest(x / ln 2) and ln 2 in two
// parts (the head has 21 trailing zero bits, so t ln2_hi is exact for |t| < 2^21; the split of fdlibm's e_exp.c,
// from memory, checked below), exp(r) for |r| <= ln 2 / 2 from its Taylor series to r^13 (next term below 4e-18), and 2^t put
// back as two factors 2^t1 2^t2 built from their exponent bits, so that results down to the subnormal range
// (x >= -745.2) come out right and x below -746 gives 0.
import { execFileSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import wabtInit from 'wabt';

const here = dirname(fileURLToPath(import.meta.url));

/** A binary64 constant as a WebAssembly literal (JavaScript's shortest round-trip form). */
const lit = (x) => `(f64.const ${x})`;
const splat = (x) => `(f64x2.splat ${lit(x)})`;
const g = (name) => `(local.get $${name})`;
const add = (a, b) => `(f64x2.add ${a} ${b})`;
const sub = (a, b) => `(f64x2.sub ${a} ${b})`;
const mul = (a, b) => `(f64x2.mul ${a} ${b})`;
const floor = (a) => `(f64x2.floor ${a})`;
const set = (name, value) => `(local.set $${name} ${value})`;

// Taylor coefficients of sin and cos, as in sincos.ts
const S3 = -1 / 6;
const S5 = 1 / 120;
const S7 = -1 / 5040;
const S9 = 1 / 362880;
const S11 = -1 / 39916800;
const S13 = 1 / 6227020800;
const S15 = -1 / 1307674368000;
const C2 = -1 / 2;
const C4 = 1 / 24;
const C6 = -1 / 720;
const C8 = 1 / 40320;
const C10 = -1 / 3628800;
const C12 = 1 / 479001600;
const C14 = -1 / 87178291200;
const C16 = 1 / 20922789888000;
const SPLITTER = 134217729;

// Memory layout (bytes): five columns of BLOCK binary64 values, u, v, sin, cos, gauss.
const BLOCK = 1024;
const U = 0;
const V = 8 * BLOCK;
const SIN = 16 * BLOCK;
const COS = 24 * BLOCK;
const GAUSS = 32 * BLOCK;

// ln 2 in two parts (fdlibm's ln2_hi, ln2_lo) and 1 / ln 2
const LN2_HI = 0.6931471803691238;
const LN2_LO = 1.9082149292705877e-10;
const LOG2E = Math.LOG2E;
{
  // the head must end in 21 zero bits (32 significant bits, so t LN2_HI is exact for |t| < 2^21) and head +
  // tail must be ln 2
  const bits = new DataView(new ArrayBuffer(8));
  bits.setFloat64(0, LN2_HI);
  if ((bits.getUint32(4) & 0x1fffff) !== 0) throw new Error('LN2_HI does not end in 21 zero bits');
  if (Math.abs(LN2_HI + LN2_LO - Math.LN2) > 1e-16) throw new Error('LN2_HI + LN2_LO is not ln 2');
}

const SINCOS_LOCALS = ['t', 'q', 'r', 'x', 'x2', 'x4', 'x8', 's', 'c', 'k', 'h', 'odd', 'even', 'sign'];

/** sin and cos of 2 pi t for the two lanes of $t, stored at SIN + $j and COS + $j. */
function sinCosBody() {
  return [
    set('q', floor(add(mul(g('t'), splat(4)), splat(0.5)))),
    set('r', sub(g('t'), mul(g('q'), splat(0.25)))),
    set('x', mul(splat(2 * Math.PI), g('r'))),
    set('x2', mul(g('x'), g('x'))),
    set('x4', mul(g('x2'), g('x2'))),
    set('x8', mul(g('x4'), g('x4'))),
    // s = x + x * (x2 S3 + (x4 (S5 + x2 S7) + x8 (S9 + x2 S11 + x4 (S13 + x2 S15))))
    set(
      's',
      add(
        g('x'),
        mul(
          g('x'),
          add(
            mul(g('x2'), splat(S3)),
            add(
              mul(g('x4'), add(splat(S5), mul(g('x2'), splat(S7)))),
              mul(
                g('x8'),
                add(
                  add(splat(S9), mul(g('x2'), splat(S11))),
                  mul(g('x4'), add(splat(S13), mul(g('x2'), splat(S15)))),
                ),
              ),
            ),
          ),
        ),
      ),
    ),
    // c = 1 + (x2 C2 + (x4 (C4 + x2 C6) + x8 (C8 + x2 C10 + x4 (C12 + x2 C14) + x8 C16)))
    set(
      'c',
      add(
        splat(1),
        add(
          mul(g('x2'), splat(C2)),
          add(
            mul(g('x4'), add(splat(C4), mul(g('x2'), splat(C6)))),
            mul(
              g('x8'),
              add(
                add(
                  add(splat(C8), mul(g('x2'), splat(C10))),
                  mul(g('x4'), add(splat(C12), mul(g('x2'), splat(C14)))),
                ),
                mul(g('x8'), splat(C16)),
              ),
            ),
          ),
        ),
      ),
    ),
    // k = q mod 4 in {0, 1, 2, 3}; h = floor(k / 2); odd = k - 2 h; sign = 1 - 2 h (k & 2 of the scalar code)
    set('k', sub(g('q'), mul(floor(mul(g('q'), splat(0.25))), splat(4)))),
    set('h', floor(mul(g('k'), splat(0.5)))),
    set('odd', sub(g('k'), add(g('h'), g('h')))),
    set('even', sub(splat(1), g('odd'))),
    set('sign', sub(splat(1), add(g('h'), g('h')))),
    `(v128.store offset=${SIN} (local.get $j) ${mul(g('sign'), add(mul(g('s'), g('even')), mul(g('c'), g('odd'))))})`,
    `(v128.store offset=${COS} (local.get $j) ${mul(g('sign'), sub(mul(g('c'), g('even')), mul(g('s'), g('odd'))))})`,
  ].join('\n      ');
}

/** A loop over the lanes 0..2 ceil(n / 2) - 1, with `phase` setting $t from the loaded $u, $v first. */
function loopFunction(name, params, extraLocals, prologue, phase, body = sinCosBody()) {
  const locals = [...SINCOS_LOCALS, 'u', 'v', ...extraLocals].map((l) => `(local $${l} v128)`).join(' ');
  return `  (func (export "${name}") (param $n i32) ${params.map((p) => `(param $${p} f64)`).join(' ')}
    (local $j i32) (local $end i32) ${locals}
    ${prologue.join('\n    ')}
    ;; bytes to cover: 16 per pair of lanes, the last pair may run one lane past n (its results are not read)
    (local.set $end (i32.shl (i32.shr_u (i32.add (local.get $n) (i32.const 1)) (i32.const 1)) (i32.const 4)))
    (block $done
      (loop $next
        (br_if $done (i32.ge_u (local.get $j) (local.get $end)))
        (local.set $u (v128.load offset=${U} (local.get $j)))
        (local.set $v (v128.load offset=${V} (local.get $j)))
        ${phase.join('\n        ')}
        ${body}
        (local.set $j (i32.add (local.get $j) (i32.const 16)))
        (br $next))))`;
}

// plain: t = u e + v n (sinCosTurns(u * e0 + v * n0) of the scalar loops)
const plain = loopFunction(
  'plain',
  ['e', 'nn'],
  ['ev', 'nv'],
  [set('ev', '(f64x2.splat (local.get $e))'), set('nv', '(f64x2.splat (local.get $nn))')],
  [set('t', add(mul(g('u'), g('ev')), mul(g('v'), g('nv'))))],
);

// split: sinCosPhase(u, v, eh, el, nh, nl) of sincos.ts
const split = loopFunction(
  'split',
  ['eh', 'el', 'nh', 'nl'],
  ['ehv', 'elv', 'nhv', 'nlv', 'esum', 'nsum', 'uh', 'vh', 'p', 'pq', 'small'],
  [
    set('ehv', '(f64x2.splat (local.get $eh))'),
    set('elv', '(f64x2.splat (local.get $el))'),
    set('nhv', '(f64x2.splat (local.get $nh))'),
    set('nlv', '(f64x2.splat (local.get $nl))'),
    set('esum', add(g('ehv'), g('elv'))),
    set('nsum', add(g('nhv'), g('nlv'))),
  ],
  [
    // Veltkamp's split: uh = c - (c - u) with c = SPLITTER u
    set('uh', mul(splat(SPLITTER), g('u'))),
    set('uh', sub(g('uh'), sub(g('uh'), g('u')))),
    set('vh', mul(splat(SPLITTER), g('v'))),
    set('vh', sub(g('vh'), sub(g('vh'), g('v')))),
    set('p', mul(g('uh'), g('ehv'))),
    set('pq', mul(g('vh'), g('nhv'))),
    set(
      'small',
      add(
        add(add(mul(g('uh'), g('elv')), mul(sub(g('u'), g('uh')), g('esum'))), mul(g('vh'), g('nlv'))),
        mul(sub(g('v'), g('vh')), g('nsum')),
      ),
    ),
    set(
      't',
      add(
        add(sub(g('p'), floor(add(g('p'), splat(0.5)))), sub(g('pq'), floor(add(g('pq'), splat(0.5))))),
        g('small'),
      ),
    ),
  ],
);

// gauss: exp(-k (m11 u^2 + m12x2 u v + m22 v^2)) with the quadratic form clamped at 0 (as the scalar loops)
const i64 = (x) => `(i64x2.splat (i64.const ${x}))`;
/** 2^t for integral t in [-540, 540], from its exponent bits. */
const pow2 = (t) =>
  `(i64x2.shl (i64x2.add (i64x2.extend_low_i32x4_s (i32x4.trunc_sat_f64x2_s_zero ${t})) ${i64(1023)}) (i32.const 52))`;
const gauss = loopFunction(
  'gauss',
  ['m11', 'm12x2', 'm22', 'gk'],
  ['a11', 'a12', 'a22', 'nk', 'y', 'tt', 'rr', 'r2', 'r4', 'tail', 'p', 't1'],
  [
    set('a11', '(f64x2.splat (local.get $m11))'),
    set('a12', '(f64x2.splat (local.get $m12x2))'),
    set('a22', '(f64x2.splat (local.get $m22))'),
    set('nk', '(f64x2.neg (f64x2.splat (local.get $gk)))'),
  ],
  [
    // r^2 = m11 u u + m12x2 u v + m22 v v, in the order of the scalar loops, then max(r^2, 0)
    set(
      'y',
      add(
        add(mul(mul(g('a11'), g('u')), g('u')), mul(mul(g('a12'), g('u')), g('v'))),
        mul(mul(g('a22'), g('v')), g('v')),
      ),
    ),
    set('y', `(f64x2.max ${g('y')} ${splat(0)})`),
    // x = -k r^2, kept above -746 (below, the result is 0 all the same)
    set('y', `(f64x2.max ${mul(g('nk'), g('y'))} ${splat(-746)})`),
  ],
  [
    set('tt', `(f64x2.nearest ${mul(g('y'), splat(LOG2E))})`),
    set('rr', sub(sub(g('y'), mul(g('tt'), splat(LN2_HI))), mul(g('tt'), splat(LN2_LO)))),
    set('r2', mul(g('rr'), g('rr'))),
    set('r4', mul(g('r2'), g('r2'))),
    // tail = (1/2 + r/6) + r^2 (1/24 + r/120) + r^4 (1/720 + r/5040 + r^2 (1/8! + r/9!))
    //        + r^8 (1/10! + r/11! + r^2 (1/12! + r/13!))
    set(
      'tail',
      add(
        add(
          add(
            add(splat(1 / 2), mul(g('rr'), splat(1 / 6))),
            mul(g('r2'), add(splat(1 / 24), mul(g('rr'), splat(1 / 120)))),
          ),
          mul(
            g('r4'),
            add(
              add(splat(1 / 720), mul(g('rr'), splat(1 / 5040))),
              mul(g('r2'), add(splat(1 / 40320), mul(g('rr'), splat(1 / 362880)))),
            ),
          ),
        ),
        mul(
          mul(g('r4'), g('r4')),
          add(
            add(splat(1 / 3628800), mul(g('rr'), splat(1 / 39916800))),
            mul(g('r2'), add(splat(1 / 479001600), mul(g('rr'), splat(1 / 6227020800)))),
          ),
        ),
      ),
    ),
    // exp(r) = 1 + (r + r^2 tail): the small parts first, the leading 1 last
    set('p', add(splat(1), add(g('rr'), mul(g('r2'), g('tail'))))),
    // 2^t = 2^t1 2^(t - t1) with t1 = floor(t / 2): both factors normal for t >= -1078
    set('t1', floor(mul(g('tt'), splat(0.5)))),
    `(v128.store offset=${GAUSS} (local.get $j) ${mul(mul(g('p'), pow2(g('t1'))), pow2(sub(g('tt'), g('t1'))))})`,
  ].join('\n        '),
);

const wat = `;; generated by src/kernels/generate-block-wasm.mjs: do not edit
;; Block kernels (block.ts), two lanes per instruction: phase ramps sin(2 pi t), cos(2 pi t) and Gaussians.
;; Memory: u at ${U}, v at ${V}, sin at ${SIN}, cos at ${COS}, gauss at ${GAUSS} (bytes), ${BLOCK} binary64 values each.
(module
  (memory (export "memory") 1)
${plain}
${split}
${gauss}
)
`;

const wabt = await wabtInit();
const parsed = wabt.parseWat('block.wat', wat, { simd: true });
parsed.validate();
const { buffer } = parsed.toBinary({});
parsed.destroy();
const base64 = Buffer.from(buffer).toString('base64');
const version = JSON.parse(readFileSync(join(here, '../../node_modules/wabt/package.json'), 'utf8')).version;

writeFileSync(join(here, 'block.wat'), wat);
const lines = base64.match(/.{1,100}/g).map((l) => `  '${l}'`);
writeFileSync(
  join(here, 'block-wasm.ts'),
  `// generated by src/kernels/generate-block-wasm.mjs from block.wat with wabt ${version}: do not edit
/**
 * The WebAssembly module of the block kernels (block.wat), as base64.
 * @internal
 */
export const BLOCK_WASM_BASE64 =
${lines.join(' +\n')};

/** Points per column of the module's memory (u, v, sin, cos and gauss). @internal */
export const BLOCK_WASM_POINTS = ${BLOCK};
`,
);
execFileSync('npx', ['biome', 'format', '--write', join(here, 'block-wasm.ts')], { stdio: 'ignore' });
console.log(`block.wat and block-wasm.ts written: ${buffer.length} bytes of WebAssembly (wabt ${version})`);
