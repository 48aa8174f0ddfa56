/**
 * Canonical forms of the extended components: each becomes one term whose single factor is a unit-size
 * primitive kind seen through A = size * I. Slot values are read as duals so gradients flow to the Jacobian.
 *
 * @internal
 * @module
 */
import { ModelError, showValue } from '../errors.js';
import { PixelGrid, RadialTable } from '../kernels/tabulated.js';
import type { DualTerm } from './canonical.js';
import type { ComponentNode, PixelImageNode, RadialProfileNode } from './component-nodes.js';
import { apply, constant, type Dual, type Mat2, mul } from './dual.js';
import type { Slot } from './param.js';

/** Kernel kinds of the extended components. */
export type ComponentFactorKind =
  | 'linearLimbDarkened'
  | 'quadraticLimbDarkened'
  | 'powerLawLimbDarkened'
  | 'uniformAnnulus'
  | 'exponential'
  | 'lorentzian'
  | 'background'
  | 'radialTable'
  | 'modulatedRing'
  | 'pixelImage';

/** Facts about each extended factor kind (radial or not; names of its shape parameters). */
export const COMPONENT_FACTOR_KINDS: Readonly<
  Record<ComponentFactorKind, { readonly radial: boolean; readonly shapeNames: readonly string[] }>
> = Object.freeze({
  linearLimbDarkened: { radial: true, shapeNames: ['a'] },
  quadraticLimbDarkened: { radial: true, shapeNames: ['a', 'b'] },
  powerLawLimbDarkened: { radial: true, shapeNames: ['alpha'] },
  uniformAnnulus: { radial: true, shapeNames: ['ratio'] },
  exponential: { radial: true, shapeNames: [] },
  lorentzian: { radial: true, shapeNames: [] },
  background: { radial: true, shapeNames: [] },
  radialTable: { radial: true, shapeNames: [] },
  modulatedRing: { radial: false, shapeNames: ['c1', 'pa1', 'c2', 'pa2'] },
  pixelImage: { radial: false, shapeNames: [] },
});

type Domain = (x: number) => string | null;
type SlotReader = (s: Slot, name: string, domain: Domain, unit: string) => Dual;

const ANY: Domain = () => null;
const NON_NEGATIVE: Domain = (x) => (x >= 0 ? null : 'a number >= 0');
const POSITIVE: Domain = (x) => (x > 0 ? null : 'a number > 0');
const AT_MOST_ONE: Domain = (x) =>
  x <= 1 ? null : 'a <= 1 (so that I(mu) = 1 - a (1 - mu) >= 0 at the limb)';
const ALPHA: Domain = (x) => (x >= 0 ? null : 'alpha >= 0 (I(mu) = mu^alpha darkens towards the limb)');
const AMPLITUDE: Domain = (x) => (x >= 0 && x <= 1 ? null : 'a modulation amplitude in [0, 1]');

const ZERO = constant(0);
const ONE = constant(1);

function unit(kind: ComponentFactorKind, size: Dual, shape: readonly Dual[], data?: unknown): DualTerm[] {
  const a: Mat2 = [size, ZERO, ZERO, size];
  return [
    {
      flux: ONE,
      east: ZERO,
      north: ZERO,
      factors: [data === undefined ? { kind, shape, a } : { kind, shape, a, data }],
    },
  ];
}

const tables = new WeakMap<readonly number[], RadialTable>();
const grids = new WeakMap<readonly number[], PixelGrid>();

/** The Hankel table of a radial-profile node (built once per sample array and kept). */
export function profileTable(
  radii: readonly number[],
  intensity: readonly number[],
  maxFrequency: number,
): RadialTable {
  let t = tables.get(intensity);
  if (t === undefined || t.maxRho < maxFrequency || t.radii.length !== radii.length) {
    t = new RadialTable(radii, intensity, maxFrequency);
    tables.set(intensity, t);
  }
  return t;
}

/** Nodes whose data fields have passed {@link checkProfileData} or {@link checkPixelData}. */
const checkedData = new WeakSet<object>();

function dataError(path: string, problem: string, index?: number): never {
  throw new ModelError(
    `${path}: ${problem}`,
    index === undefined ? { modelPath: path } : { modelPath: path, index },
  );
}

function finiteArray(x: unknown, path: string): readonly number[] {
  if (!Array.isArray(x)) dataError(path, `expected an array of finite numbers, got ${showValue(x)}`);
  for (let i = 0; i < x.length; i++) {
    const t: unknown = x[i];
    if (typeof t !== 'number' || !Number.isFinite(t))
      dataError(`${path}[${i}]`, `expected a finite number, got ${showValue(t)}`, i);
  }
  return x as readonly number[];
}

/**
 * Checks the data of a radial-profile node as `radialProfile` does, whatever built the node (a node read from
 * JSON holds whatever the document held).
 */
function checkProfileData(node: RadialProfileNode, path: string): void {
  if (checkedData.has(node)) return;
  const radii = finiteArray(node.radii, `${path}.radii`);
  const intensity = finiteArray(node.intensity, `${path}.intensity`);
  const f = node.maxFrequency;
  if (typeof f !== 'number' || !(f > 0) || !Number.isFinite(f)) {
    dataError(`${path}.maxFrequency`, `expected a number of cycles per mas > 0, got ${showValue(f)}`);
  }
  if (radii.length < 2 || radii.length !== intensity.length) {
    dataError(
      `${path}.intensity`,
      `expected at least two samples and as many intensities as radii, got ${radii.length} radii and ${intensity.length} intensities`,
    );
  }
  if (radii[0]! < 0) dataError(`${path}.radii[0]`, `expected a radius >= 0 mas, got ${radii[0]}`, 0);
  for (let k = 1; k < radii.length; k++) {
    if (radii[k]! < radii[k - 1]! || (k >= 2 && radii[k] === radii[k - 2])) {
      dataError(
        `${path}.radii[${k}]`,
        `expected radii non-decreasing with no radius given more than twice, got ${radii[k]} after ${radii[k - 1]}`,
        k,
      );
    }
  }
  let flux = 0;
  for (let k = 0; k < intensity.length; k++) {
    if (intensity[k]! < 0) dataError(`${path}.intensity[${k}]`, `expected >= 0, got ${intensity[k]}`, k);
    if (k + 1 < radii.length) {
      const [r0, r1, i0, i1] = [radii[k]!, radii[k + 1]!, intensity[k]!, intensity[k + 1]!];
      flux += (r1 - r0) * (i0 * (2 * r0 + r1) + i1 * (r0 + 2 * r1));
    }
  }
  if (!(flux > 0) || !Number.isFinite(flux)) {
    dataError(
      `${path}.intensity`,
      `the profile has a flux of ${flux}; expected some intensity > 0 inside a radius > 0`,
    );
  }
  checkedData.add(node);
}

/** Checks the data of a pixel-image node as `pixelImage` does, whatever built the node. */
function checkPixelData(node: PixelImageNode, path: string): void {
  if (checkedData.has(node)) return;
  const pixels = finiteArray(node.pixels, `${path}.pixels`);
  for (const key of ['nx', 'ny'] as const) {
    const n = node[key];
    if (!Number.isSafeInteger(n) || n < 1)
      dataError(`${path}.${key}`, `expected a positive integer, got ${showValue(n)}`);
  }
  if (node.nx * node.ny !== pixels.length) {
    dataError(`${path}.pixels`, `${pixels.length} pixels do not fill an ${node.nx} x ${node.ny} grid`);
  }
  let total = 0;
  for (const p of pixels) total += p;
  if (!(Math.abs(total) > 0) || !Number.isFinite(total)) {
    dataError(
      `${path}.pixels`,
      `the pixels sum to ${total}; expected an image of non-zero finite total flux`,
    );
  }
  checkedData.add(node);
}

/** The evaluator of a pixel-image node (built once per pixel array and kept). */
export function pixelGrid(nx: number, ny: number, pixels: readonly number[]): PixelGrid {
  let g = grids.get(pixels);
  if (g === undefined) {
    let total = 0;
    for (const p of pixels) total += p;
    g = new PixelGrid(nx, ny, pixels, total);
    grids.set(pixels, g);
  }
  return g;
}

/**
 * Folds an extended component node into its canonical term.
 *
 * @param node - the component node
 * @param slot - reads a slot of the node as a dual with a domain check
 * @param path - model path of the node
 * @throws ModelError naming the slot when a value (or a combination of values) is invalid
 */
export function canonicaliseComponent(node: ComponentNode, slot: SlotReader, path: string): DualTerm[] {
  switch (node.kind) {
    case 'linearLimbDarkenedDisk': {
      const d = slot(node.diameter, 'diameter', NON_NEGATIVE, ' mas');
      const a = slot(node.a, 'a', AT_MOST_ONE, '');
      return unit('linearLimbDarkened', d, [a]);
    }
    case 'quadraticLimbDarkenedDisk': {
      const d = slot(node.diameter, 'diameter', NON_NEGATIVE, ' mas');
      const a = slot(node.a, 'a', ANY, '');
      const b = slot(node.b, 'b', ANY, '');
      const problem = quadraticProblem(a.v, b.v);
      if (problem !== null) {
        throw new ModelError(`${path}.b: ${problem}, got a = ${a.v}, b = ${b.v}`, { modelPath: `${path}.b` });
      }
      return unit('quadraticLimbDarkened', d, [a, b]);
    }
    case 'powerLawLimbDarkenedDisk': {
      const d = slot(node.diameter, 'diameter', NON_NEGATIVE, ' mas');
      const alpha = slot(node.alpha, 'alpha', ALPHA, '');
      return unit('powerLawLimbDarkened', d, [alpha]);
    }
    case 'annulus': {
      const inner = slot(node.inner, 'inner', NON_NEGATIVE, ' mas');
      const outer = slot(node.outer, 'outer', NON_NEGATIVE, ' mas');
      if (inner.v > outer.v) {
        throw new ModelError(`${path}.inner: expected inner <= outer (${outer.v} mas), got ${inner.v} mas`, {
          modelPath: `${path}.inner`,
        });
      }
      const ratio = outer.v === 0 ? ZERO : mul(inner, apply(outer, 1 / outer.v, -1 / (outer.v * outer.v)));
      return unit('uniformAnnulus', outer, [ratio]);
    }
    case 'modulatedRing': {
      const d = slot(node.diameter, 'diameter', NON_NEGATIVE, ' mas');
      const c1 = slot(node.c1, 'c1', AMPLITUDE, '');
      const pa1 = slot(node.pa1, 'pa1', ANY, ' degrees');
      const c2 = slot(node.c2, 'c2', AMPLITUDE, '');
      const pa2 = slot(node.pa2, 'pa2', ANY, ' degrees');
      if (c1.v + c2.v > 1) {
        throw new ModelError(
          `${path}.c2: expected c1 + c2 <= 1 (which keeps the brightness 1 + c1 cos(theta - pa1) + c2 cos(2 (theta - pa2)) >= 0), got c1 = ${c1.v}, c2 = ${c2.v}`,
          { modelPath: `${path}.c2` },
        );
      }
      return unit('modulatedRing', d, [c1, pa1, c2, pa2]);
    }
    case 'exponential': {
      const w = slot(node.fwhm, 'fwhm', NON_NEGATIVE, ' mas');
      return unit('exponential', w, []);
    }
    case 'lorentzian': {
      const w = slot(node.fwhm, 'fwhm', NON_NEGATIVE, ' mas');
      return unit('lorentzian', w, []);
    }
    case 'background':
      return unit('background', ONE, []);
    case 'radialProfile':
      checkProfileData(node, path);
      return unit('radialTable', ONE, [], profileTable(node.radii, node.intensity, node.maxFrequency));
    case 'pixelImage': {
      checkPixelData(node, path);
      const s = slot(node.scale, 'scale', POSITIVE, ' mas per pixel');
      return unit('pixelImage', s, [], pixelGrid(node.nx, node.ny, node.pixels));
    }
  }
}

/** Why (a, b) is not a valid quadratic law, or null: I(mu) = 1 - a t - b t^2 >= 0 for t = 1 - mu in [0, 1]. */
export function quadraticProblem(a: number, b: number): string | null {
  const what = 'expected coefficients with I(mu) = 1 - a (1 - mu) - b (1 - mu)^2 >= 0 for mu in [0, 1]';
  if (a + b > 1) return `${what} (a + b <= 1)`;
  if (b < 0) {
    const t = -a / (2 * b);
    if (t > 0 && t < 1 && 1 + (a * a) / (4 * b) < 0)
      return `${what} (a^2 <= -4 b when the minimum is inside)`;
  }
  return null;
}
