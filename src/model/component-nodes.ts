/**
 * Plain-data nodes of the extended component set (limb-darkened disks, annuli, modulated rings, smooth
 * profiles, a flat background, tabulated radial profiles and pixel images). Every node is frozen and tagged by
 * `kind`; numeric slots hold a number, a param or a wavelength-dependent slot. Units: sizes in mas, angles in
 * degrees from north towards east.
 *
 * @module
 */
import type { Slot } from './param.js';

/** A linearly limb-darkened disk of flux 1, I(mu) = 1 - a (1 - mu); `diameter` in mas, `a` dimensionless. */
export interface LinearLimbDarkenedDiskNode {
  readonly kind: 'linearLimbDarkenedDisk';
  readonly diameter: Slot;
  readonly a: Slot;
}
/** A quadratically limb-darkened disk of flux 1, I(mu) = 1 - a (1 - mu) - b (1 - mu)^2. */
export interface QuadraticLimbDarkenedDiskNode {
  readonly kind: 'quadraticLimbDarkenedDisk';
  readonly diameter: Slot;
  readonly a: Slot;
  readonly b: Slot;
}
/** A power-law limb-darkened disk of flux 1, I(mu) = mu^alpha (Hestroffer 1997). */
export interface PowerLawLimbDarkenedDiskNode {
  readonly kind: 'powerLawLimbDarkenedDisk';
  readonly diameter: Slot;
  readonly alpha: Slot;
}
/** A uniform annulus of flux 1 between the diameters `inner` and `outer` (mas). */
export interface AnnulusNode {
  readonly kind: 'annulus';
  readonly inner: Slot;
  readonly outer: Slot;
}
/**
 * A thin ring of flux 1 and `diameter` (mas) whose brightness along the ring is
 * 1 + c1 cos(theta - pa1) + c2 cos(2 (theta - pa2)), theta the position angle of the point (degrees, north to east).
 */
export interface ModulatedRingNode {
  readonly kind: 'modulatedRing';
  readonly diameter: Slot;
  readonly c1: Slot;
  readonly pa1: Slot;
  readonly c2: Slot;
  readonly pa2: Slot;
}
/** A circular exponential profile of flux 1, I(r) proportional to exp(-r / h); `fwhm` = 2 h ln 2, mas. */
export interface ExponentialNode {
  readonly kind: 'exponential';
  readonly fwhm: Slot;
}
/** A circular Lorentzian-like profile of flux 1, I(r) proportional to (1 + (r/a)^2)^(-3/2); `fwhm` in mas. */
export interface LorentzianNode {
  readonly kind: 'lorentzian';
  readonly fwhm: Slot;
}
/** A fully resolved background of flux 1: V = 0 at every q > 0. */
export interface BackgroundNode {
  readonly kind: 'background';
}
/**
 * A circular profile of flux 1 given by samples: intensity I(r) linear between the points (radii[k],
 * intensity[k]), radii in mas (non-decreasing; a radius repeated once is a step), zero beyond the last.
 */
export interface RadialProfileNode {
  readonly kind: 'radialProfile';
  readonly radii: readonly number[];
  readonly intensity: readonly number[];
  /** Highest spatial frequency (cycles per mas at unit scale) covered by the precomputed table. */
  readonly maxFrequency: number;
}
/**
 * An image of flux 1 on a pixel grid: `pixels[j * nx + i]` with column i increasing towards EAST and row j
 * increasing towards NORTH (so, drawn with i to the right, east is on the right: the mirror of the usual sky
 * display). The grid centre ((nx - 1) / 2, (ny - 1) / 2) sits at the origin; `scale` is mas per pixel.
 */
export interface PixelImageNode {
  readonly kind: 'pixelImage';
  readonly nx: number;
  readonly ny: number;
  readonly scale: Slot;
  readonly pixels: readonly number[];
}

/** Nodes of the extended component set. */
export type ComponentNode =
  | LinearLimbDarkenedDiskNode
  | QuadraticLimbDarkenedDiskNode
  | PowerLawLimbDarkenedDiskNode
  | AnnulusNode
  | ModulatedRingNode
  | ExponentialNode
  | LorentzianNode
  | BackgroundNode
  | RadialProfileNode
  | PixelImageNode;

/** The numeric slot names of each component kind, in their canonical order. */
export const COMPONENT_SLOT_NAMES: Readonly<Record<ComponentNode['kind'], readonly string[]>> = Object.freeze(
  {
    linearLimbDarkenedDisk: ['diameter', 'a'],
    quadraticLimbDarkenedDisk: ['diameter', 'a', 'b'],
    powerLawLimbDarkenedDisk: ['diameter', 'alpha'],
    annulus: ['inner', 'outer'],
    modulatedRing: ['diameter', 'c1', 'pa1', 'c2', 'pa2'],
    exponential: ['fwhm'],
    lorentzian: ['fwhm'],
    background: [],
    radialProfile: [],
    pixelImage: ['scale'],
  },
);

function fmtList(xs: readonly number[]): string {
  return `[${xs.map((x) => (Object.is(x, -0) ? '0' : String(x))).join(', ')}]`;
}

/**
 * A TypeScript expression that rebuilds a component node with uvsky's factories.
 * @param node - the component node
 * @param s - prints the slot of the given name
 */
export function componentToString(node: ComponentNode, s: (name: string) => string): string {
  switch (node.kind) {
    case 'linearLimbDarkenedDisk':
      return `limbDarkenedDisk({ diameter: ${s('diameter')}, law: linearLaw(${s('a')}) })`;
    case 'quadraticLimbDarkenedDisk':
      return `limbDarkenedDisk({ diameter: ${s('diameter')}, law: quadraticLaw(${s('a')}, ${s('b')}) })`;
    case 'powerLawLimbDarkenedDisk':
      return `limbDarkenedDisk({ diameter: ${s('diameter')}, law: powerLaw(${s('alpha')}) })`;
    case 'annulus':
      return `annulus({ inner: ${s('inner')}, outer: ${s('outer')} })`;
    case 'modulatedRing':
      return `modulatedRing({ diameter: ${s('diameter')}, c1: ${s('c1')}, pa1: ${s('pa1')}, c2: ${s('c2')}, pa2: ${s('pa2')} })`;
    case 'exponential':
    case 'lorentzian':
      return `${node.kind}({ fwhm: ${s('fwhm')} })`;
    case 'background':
      return 'background()';
    case 'radialProfile':
      return `radialProfile({ radii: ${fmtList(node.radii)}, intensity: ${fmtList(node.intensity)}, maxFrequency: ${node.maxFrequency} })`;
    case 'pixelImage':
      return `pixelImage({ nx: ${node.nx}, ny: ${node.ny}, scale: ${s('scale')}, pixels: ${fmtList(node.pixels)} })`;
  }
}
