/**
 * The plain-data nodes of a model tree. Every node is frozen and tagged by `kind`; numeric slots hold a number
 * or a {@link Param}. Units: sizes and offsets in milliarcseconds, angles in degrees, fluxes as plain numbers.
 *
 * @module
 */
import type { ComponentNode } from './component-nodes.js';
import { COMPONENT_SLOT_NAMES } from './component-nodes.js';
import type { Slot } from './param.js';

export type * from './component-nodes.js';

/** A point source of flux 1 at the origin. */
export interface PointNode {
  readonly kind: 'point';
}
/** A uniform disk of flux 1; `diameter` in mas. */
export interface DiskNode {
  readonly kind: 'disk';
  readonly diameter: Slot;
}
/** A circular Gaussian of flux 1; `fwhm` (full width at half maximum) in mas. */
export interface GaussianNode {
  readonly kind: 'gaussian';
  readonly fwhm: Slot;
}
/** An infinitely thin ring of flux 1; `diameter` in mas. */
export interface RingNode {
  readonly kind: 'ring';
  readonly diameter: Slot;
}
/** A uniform elliptical disk of flux 1; `major`, `minor` axes (full lengths) in mas, `pa` of the major axis in degrees. */
export interface EllipseNode {
  readonly kind: 'ellipse';
  readonly major: Slot;
  readonly minor: Slot;
  readonly pa: Slot;
}

/** Nodes of the primitive components. */
export type PrimitiveNode = PointNode | DiskNode | GaussianNode | RingNode | EllipseNode | ComponentNode;

/** Multiplies the flux of `of` by `flux` (may be negative). */
export interface WeightNode {
  readonly kind: 'weight';
  readonly flux: Slot;
  readonly of: ModelNode;
}
/** Moves `of` by `east`, `north` mas. */
export interface ShiftNode {
  readonly kind: 'shift';
  readonly east: Slot;
  readonly north: Slot;
  readonly of: ModelNode;
}
/** Stretches `of` by factors `east` and `north` along the sky axes, keeping its flux. */
export interface StretchNode {
  readonly kind: 'stretch';
  readonly east: Slot;
  readonly north: Slot;
  readonly of: ModelNode;
}
/** Turns `of` by `pa` degrees from north towards east about the origin. */
export interface RotateNode {
  readonly kind: 'rotate';
  readonly pa: Slot;
  readonly of: ModelNode;
}
/** Inclines `of` by `inclination` degrees (0 = face-on) with the major axis at position angle `pa` degrees. */
export interface InclineNode {
  readonly kind: 'incline';
  readonly inclination: Slot;
  readonly pa: Slot;
  readonly of: ModelNode;
}
/** The sum of several models (fluxes add). */
export interface SumNode {
  readonly kind: 'sum';
  readonly of: readonly ModelNode[];
}
/** The convolution of two models (visibilities multiply, fluxes multiply). */
export interface ConvolveNode {
  readonly kind: 'convolve';
  readonly of: readonly [ModelNode, ModelNode];
}

/** Nodes of the operators. */
export type OperatorNode =
  | WeightNode
  | ShiftNode
  | StretchNode
  | RotateNode
  | InclineNode
  | SumNode
  | ConvolveNode;

/** Any node of a model tree. */
export type ModelNode = PrimitiveNode | OperatorNode;

/** The kind tag of any node. */
export type NodeKind = ModelNode['kind'];

/** The numeric slot names of each node kind, in their canonical order. */
export const SLOT_NAMES: Readonly<Record<NodeKind, readonly string[]>> = Object.freeze({
  point: [],
  disk: ['diameter'],
  gaussian: ['fwhm'],
  ring: ['diameter'],
  ellipse: ['major', 'minor', 'pa'],
  weight: ['flux'],
  shift: ['east', 'north'],
  stretch: ['east', 'north'],
  rotate: ['pa'],
  incline: ['inclination', 'pa'],
  sum: [],
  convolve: [],
  ...COMPONENT_SLOT_NAMES,
});

/**
 * Deepest nesting of nodes a model may have (a sum of a shifted disk is 3 deep; real models stay below a few
 * tens). Canonicalisation, JSON and comparison walk the tree recursively, and this bound keeps them well inside
 * the call stack of every runtime, so a deeper tree (for instance from a hostile JSON document) is a
 * ModelError instead of a stack overflow.
 */
export const MAX_MODEL_DEPTH = 500;

/** The children of a node (empty for primitives). */
export function childrenOf(node: ModelNode): readonly ModelNode[] {
  if (!('of' in node)) return [];
  const of = node.of;
  return Array.isArray(of) ? (of as readonly ModelNode[]) : [of as ModelNode];
}
