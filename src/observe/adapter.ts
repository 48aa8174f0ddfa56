/**
 * A model seen at the wavelengths of the data: an object with the evaluation methods of a Model that also take
 * each point's wavelength (and channel width), for wavelength-dependent models and bandwidth smearing.
 *
 * @module
 */
import type { Model } from '../model/model.js';
import type { ChromaticOptions } from './chromatic.js';
import { observableValues } from './jacobian.js';

/** Options of {@link atWavelengths}. */
export interface AtWavelengthsOptions extends ChromaticOptions {
  /** Average over each channel's width (EFF_BAND) as the instrument does; default false. */
  readonly bandwidthSmearing?: boolean;
}

/** Evaluation methods that take wavelengths (metres) and channel widths with the spatial frequencies. */
export interface WavelengthModel {
  /** Marks the extra wavelength arguments (for `simulate`). */
  readonly takesWavelengths: true;
  visibilities(
    u: ArrayLike<number>,
    v: ArrayLike<number>,
    wavelength?: ArrayLike<number>,
    band?: ArrayLike<number>,
  ): { re: Float64Array; im: Float64Array };
  vis2(
    u: ArrayLike<number>,
    v: ArrayLike<number>,
    wavelength?: ArrayLike<number>,
    band?: ArrayLike<number>,
  ): Float64Array;
  closurePhase(
    u1: ArrayLike<number>,
    v1: ArrayLike<number>,
    u2: ArrayLike<number>,
    v2: ArrayLike<number>,
    wavelength?: ArrayLike<number>,
    band?: ArrayLike<number>,
  ): Float64Array;
  t3amp(
    u1: ArrayLike<number>,
    v1: ArrayLike<number>,
    u2: ArrayLike<number>,
    v2: ArrayLike<number>,
    wavelength?: ArrayLike<number>,
    band?: ArrayLike<number>,
  ): Float64Array;
}

/**
 * Wraps a model so that `simulate` (and any code passing wavelengths) evaluates it at each point's own
 * wavelength, optionally averaged over the channel.
 *
 * @param model - any model, wavelength-dependent or not
 * @param options - `bandwidthSmearing` and the number of sub-samples (`samples`)
 * @returns an object with `visibilities`, `vis2`, `closurePhase` and `t3amp` taking (u, v[, wavelength, band])
 *   or (u1, v1, u2, v2[, wavelength, band]), u and v in cycles per radian at EFF_WAVE
 *
 * Notes: without a wavelength it behaves as the model itself (a wavelength-dependent model then throws, saying a
 * wavelength is needed).
 * @example
 * ```ts
 * const sim = simulate(atWavelengths(starWithEnvelope), plan, { noise: true, seed: 3 });
 * ```
 */
export function atWavelengths(model: Model, options: AtWavelengthsOptions = {}): WavelengthModel {
  const smear = options.bandwidthSmearing === true;
  const opts = options.samples === undefined ? undefined : { samples: options.samples };
  const extra = (wavelength?: ArrayLike<number>, band?: ArrayLike<number>) =>
    wavelength === undefined ? {} : smear && band !== undefined ? { wavelength, band } : { wavelength };
  return {
    takesWavelengths: true,
    visibilities(u, v, wavelength, band) {
      const pts = { u, v, ...extra(wavelength, band) };
      return {
        re: observableValues(model, 'visre', pts, undefined, opts),
        im: observableValues(model, 'visim', pts, undefined, opts),
      };
    },
    vis2(u, v, wavelength, band) {
      return observableValues(model, 'vis2', { u, v, ...extra(wavelength, band) }, undefined, opts);
    },
    closurePhase(u1, v1, u2, v2, wavelength, band) {
      return observableValues(
        model,
        't3phi',
        { u1, v1, u2, v2, ...extra(wavelength, band) },
        undefined,
        opts,
      );
    },
    t3amp(u1, v1, u2, v2, wavelength, band) {
      return observableValues(
        model,
        't3amp',
        { u1, v1, u2, v2, ...extra(wavelength, band) },
        undefined,
        opts,
      );
    },
  };
}
