// Generates src/kernels/block.wat and src/kernels/block-wasm.ts: the WebAssembly (128-bit SIMD) form of the
// block kernels of src/kernels/block.ts (phase ramps), two points per instruction.
//
// Run from the repository root:  node src/kernels/generate-block-wasm.mjs
// It needs the development dependency `wabt` (the WebAssembly Binary Toolkit compiled to JavaScript), which
// assembles the text form into bytes; the bytes are written as base64 into block-wasm.ts, stamped
// "generated: do not edit". tests/kernels/block.test.ts assembles block.wat again and checks that the
// committed bytes are the same.
//
// The arithmetic is that of sinCosTurns and sinCosPhase (sincos.ts), term for term and in the same order, with
// one change: the quadrant q = floor(4 t + 1/2) comes from f64x2.floor (exact for every finite t), where the
// scalar code truncates 4 t + 1/2 + 2^30 and removes whole turns first when |t| > 2^26.
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

// Taylor coefficients of sin and cos, as in sincos.ts: (-1)^k / n! (n! is exact in binary64 up to 18!)
const factorial = (n) => (n <= 1 ? 1 : n * factorial(n - 1));
const taylor = (n) => (n % 4 < 2 ? 1 : -1) / factorial(n);
const [S3, S5, S7, S9, S11, S13, S15] = [3, 5, 7, 9, 11, 13, 15].map(taylor);
const [C2, C4, C6, C8, C10, C12, C14, C16] = [2, 4, 6, 8, 10, 12, 14, 16].map(taylor);
const SPLITTER = 134217729;

// Memory layout (bytes): four columns of BLOCK binary64 values, u, v, sin, cos.
const BLOCK = 1024;
const U = 0;
const V = 8 * BLOCK;
const SIN = 16 * BLOCK;
const COS = 24 * BLOCK;

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
function loopFunction(name, params, extraLocals, prologue, phase) {
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
        ${sinCosBody()}
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

const wat = `;; generated by src/kernels/generate-block-wasm.mjs: do not edit
;; Block kernels (block.ts), two lanes per instruction: phase ramps sin(2 pi t), cos(2 pi t).
;; Memory: u at ${U}, v at ${V}, sin at ${SIN}, cos at ${COS} (bytes), ${BLOCK} binary64 values each.
(module
  (memory (export "memory") 1)
${plain}
${split}
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

/** Points per column of the module's memory (u, v, sin and cos). @internal */
export const BLOCK_WASM_POINTS = ${BLOCK};
`,
);
execFileSync('npx', ['biome', 'format', '--write', join(here, 'block-wasm.ts')], { stdio: 'ignore' });
console.log(`block.wat and block-wasm.ts written: ${buffer.length} bytes of WebAssembly (wabt ${version})`);
