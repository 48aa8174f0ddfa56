/**
 * Parameter vectors: the free parameters of a model as a Float64Array in the order of `m.parameters()`.
 *
 * @module
 */
import { ModelError } from '../errors.js';
import type { Model } from '../model/model.js';

/**
 * The free-parameter vector of a model, from its current values or from given ones, with bounds checked.
 *
 * @param model - the model
 * @param values - optional: an array in the order of `model.parameters()` or a record by name (missing names keep
 *   their current value)
 * @returns a new Float64Array of length `model.parameters().length`
 * @throws ModelError when a value is outside its bounds, not finite, a name is unknown, or the length is wrong
 * @example
 * ```ts
 * parameterVector(disk({ diameter: param('d', 2) }), { d: 3 }); // Float64Array [3]
 * ```
 */
export function parameterVector(
  model: Model,
  values?: ArrayLike<number> | Readonly<Record<string, number>>,
): Float64Array {
  const free = model.parameterInfo().filter((p) => !p.fixed);
  const vec = Float64Array.from(free, (p) => p.value);
  if (values === undefined) return vec;
  if (typeof (values as ArrayLike<number>).length === 'number') {
    const arr = values as ArrayLike<number>;
    if (arr.length !== free.length) {
      throw new ModelError(
        `got ${arr.length} parameter values but the model has ${free.length} free parameters (${free.map((p) => p.name).join(', ')})`,
        { argument: 'values' },
      );
    }
    for (let i = 0; i < free.length; i++) vec[i] = arr[i]!;
  } else {
    const rec = values as Readonly<Record<string, number>>;
    for (const name of Object.keys(rec)) {
      const i = free.findIndex((p) => p.name === name);
      if (i < 0) {
        throw new ModelError(
          `'${name}' is not a free parameter of this model; free parameters: ${free.map((p) => p.name).join(', ') || 'none'}`,
          { parameter: name },
        );
      }
      vec[i] = rec[name]!;
    }
  }
  for (let i = 0; i < free.length; i++) {
    const p = free[i]!;
    const x = vec[i]!;
    if (!Number.isFinite(x) || x < p.min || x > p.max) {
      throw new ModelError(`parameter '${p.name}' = ${x} lies outside its bounds [${p.min}, ${p.max}]`, {
        parameter: p.name,
      });
    }
  }
  return vec;
}
