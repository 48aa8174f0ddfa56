/**
 * uvsky: a typed, immutable sky-model algebra for long-baseline interferometry.
 *
 * @module
 */
export * from './errors.js';
export * from './units/index.js';
