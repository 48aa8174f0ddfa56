/**
 * The error family of uvsky. Every error says what went wrong, where (model path, argument and index, or
 * file / table / column / row) and what would have been valid.
 *
 * @module
 */

/** Where an error happened. Every field is optional; the message already contains them in words. */
export interface ErrorLocation {
  /** Path of the offending node inside a model tree, e.g. `plus[1].shift.of.disk.diameter`. */
  readonly modelPath?: string;
  /** Name of the offending function argument. */
  readonly argument?: string;
  /** Index into an input array. */
  readonly index?: number;
  /** File name given by the caller (or `<bytes>`). */
  readonly file?: string;
  /** HDU number (0 = primary) of a FITS file. */
  readonly hdu?: number;
  /** Extension name (EXTNAME) of a FITS table. */
  readonly table?: string;
  /** Column name (TTYPEn) of a FITS table. */
  readonly column?: string;
  /** Row number, counted from 1 as FITS does. */
  readonly row?: number;
  /** Header keyword. */
  readonly keyword?: string;
  /** Name of a free parameter. */
  readonly parameter?: string;
}

/**
 * Base class of every error thrown on purpose by uvsky.
 *
 * @example
 * ```ts
 * try { disk({ diameter: -1 }); } catch (e) { e instanceof UvskyError; } // true
 * ```
 */
export class UvskyError extends Error {
  /** Structured location of the problem. */
  readonly location: ErrorLocation;
  constructor(message: string, location: ErrorLocation = {}) {
    super(message);
    this.name = new.target.name;
    this.location = Object.freeze({ ...location });
  }
}

/** A model was built or used with invalid values (bad parameter, zero total flux, malformed JSON). */
export class ModelError extends UvskyError {}

/** Arguments to an evaluation function were invalid (lengths differ, non-finite coordinate). */
export class InputError extends UvskyError {}

/** A FITS / OIFITS file is malformed or violates the standard. */
export class OifitsError extends UvskyError {}

/** A fit could not be set up or run. */
export class FitError extends UvskyError {}

/** Formats a number for an error message without losing what the caller typed. */
export function showValue(x: unknown): string {
  if (typeof x === 'number') return Number.isNaN(x) ? 'NaN' : String(x);
  if (typeof x === 'string') return JSON.stringify(x);
  if (x === undefined) return 'undefined';
  if (x === null) return 'null';
  if (typeof x === 'object') return Array.isArray(x) ? 'an array' : 'an object';
  return typeof x;
}
