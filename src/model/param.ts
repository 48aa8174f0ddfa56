/**
 * Free parameters: named numeric slots of a model that a fitter or sampler may vary.
 *
 * @module
 */
import { ModelError, showValue } from '../errors.js';
import type { ChromaticSlot } from './chromatic-slot.js';

/** Options of {@link param}. */
export interface ParamOptions {
  /** Lower bound (inclusive), in the unit of the slot the parameter fills. Default -Infinity. */
  readonly min?: number;
  /** Upper bound (inclusive), in the unit of the slot the parameter fills. Default +Infinity. */
  readonly max?: number;
  /** When true the parameter keeps its value and is not listed among the free parameters. */
  readonly fixed?: boolean;
}

/**
 * A named parameter that can fill any numeric slot of a model. Frozen plain data.
 * Two slots holding parameters of the same name are tied: they always take the same value.
 */
export interface Param {
  readonly kind: 'param';
  /** Name, unique within a model (tied slots share it). */
  readonly name: string;
  /** Current value, in the unit of the slot. */
  readonly value: number;
  /** Lower bound (inclusive). */
  readonly min: number;
  /** Upper bound (inclusive). */
  readonly max: number;
  /** Whether the value is held fixed. */
  readonly fixed: boolean;
}

/**
 * What a numeric slot of a model may hold: a plain number, a {@link Param}, or a wavelength-dependent value
 * ({@link ChromaticSlot}: `powerLawFlux`, `powerLawSize`, `blackbodyRatio`).
 */
export type Slot = number | Param | ChromaticSlot;

const NAME_RE = /^[A-Za-z_][A-Za-z0-9_.:-]*$/;

/**
 * Creates a free parameter for a numeric slot.
 *
 * @param name - a name unique within the model: a letter or `_` then letters, digits, `_ . : -`
 * @param value - starting value, in the unit of the slot it fills (mas, degrees, or a plain flux)
 * @param options - bounds `min` / `max` (inclusive, in the slot's unit) and `fixed`
 * @returns a frozen {@link Param}
 * @throws ModelError when the name is malformed, a bound is NaN, min > max, or the value lies outside the bounds
 *
 * Notes: bounds are checked here and again whenever values are given (`m.at(values)`); the physical domain of
 * the slot (a diameter cannot be negative) is checked when the model is built and evaluated.
 *
 * @example
 * ```ts
 * const d = param('diameter', 1.2, { min: 0, max: 5 });
 * disk({ diameter: d }).parameters(); // ['diameter']
 * ```
 */
export function param(name: string, value: number, options: ParamOptions = {}): Param {
  if (typeof name !== 'string' || !NAME_RE.test(name)) {
    throw new ModelError(
      `param: name ${showValue(name)} is not valid; use a letter or '_' followed by letters, digits, '_', '.', ':' or '-'`,
      { argument: 'name' },
    );
  }
  const min = options.min ?? Number.NEGATIVE_INFINITY;
  const max = options.max ?? Number.POSITIVE_INFINITY;
  if (typeof min !== 'number' || Number.isNaN(min) || typeof max !== 'number' || Number.isNaN(max)) {
    throw new ModelError(
      `param '${name}': bounds must be numbers, got min ${showValue(min)}, max ${showValue(max)}`,
      {
        parameter: name,
      },
    );
  }
  if (min > max) {
    throw new ModelError(`param '${name}': min ${min} is greater than max ${max}`, { parameter: name });
  }
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new ModelError(`param '${name}': value must be a finite number, got ${showValue(value)}`, {
      parameter: name,
    });
  }
  if (value < min || value > max) {
    throw new ModelError(`param '${name}': value ${value} lies outside its bounds [${min}, ${max}]`, {
      parameter: name,
    });
  }
  return Object.freeze({ kind: 'param', name, value, min, max, fixed: options.fixed === true });
}

/**
 * Returns a copy of a parameter held fixed at its value (or at a new value).
 *
 * @param p - the parameter
 * @param value - optional new value (slot unit); must lie within the bounds
 * @returns a frozen fixed {@link Param} of the same name
 * @example
 * ```ts
 * fixed(param('flux', 0.3)).fixed; // true
 * ```
 */
export function fixed(p: Param, value: number = p.value): Param {
  return param(p.name, value, { min: p.min, max: p.max, fixed: true });
}

/** True when a slot holds a {@link Param}. */
export function isParam(x: unknown): x is Param {
  return typeof x === 'object' && x !== null && (x as { kind?: unknown }).kind === 'param';
}
