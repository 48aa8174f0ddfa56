/**
 * Wavelength-dependent slots: frozen plain-data descriptions of a slot value that changes with wavelength (a
 * power law in wavelength, a ratio of two Planck functions). Any numeric slot of a model may hold one; its
 * coefficients may be numbers or {@link Param}s, so a fitter can vary them and the Jacobian chain-rules through
 * them. A model with such a slot is evaluated with the wavelength functions of `observe/chromatic`.
 *
 * @module
 */
import { ModelError, showValue } from '../errors.js';
import { apply, type Dual, mul } from './dual.js';
import { childrenOf, type ModelNode, SLOT_NAMES } from './nodes.js';
import { isParam, type Param } from './param.js';

/** A coefficient of a wavelength-dependent slot: a number or a {@link Param} (never itself chromatic). */
export type Coefficient = number | Param;

/** value(lambda) = value0 (lambda / lambda0)^index, for a flux (weight) slot. Frozen plain data. */
export interface PowerLawFlux {
  readonly kind: 'powerLawFlux';
  /** Value at lambda0 (plain flux number). */
  readonly value: Coefficient;
  /** Reference wavelength, metres (> 0). */
  readonly lambda0: number;
  /** Power-law index (dimensionless); a Rayleigh-Jeans tail in F_lambda has index -4. */
  readonly index: Coefficient;
}

/** value(lambda) = value0 (lambda / lambda0)^index, for a size slot (mas). Frozen plain data. */
export interface PowerLawSize {
  readonly kind: 'powerLawSize';
  /** Size at lambda0, mas. */
  readonly value: Coefficient;
  /** Reference wavelength, metres (> 0). */
  readonly lambda0: number;
  /** Power-law index (dimensionless). */
  readonly index: Coefficient;
}

/** value(lambda) = scale * B(lambda, t1) / B(lambda, t2) (Planck's law). Frozen plain data. */
export interface BlackbodyRatio {
  readonly kind: 'blackbodyRatio';
  /** Temperature of the component whose flux this slot weighs, kelvin (> 0). */
  readonly t1: Coefficient;
  /** Temperature of the reference component, kelvin (> 0). */
  readonly t2: Coefficient;
  /** Wavelength-independent factor (e.g. a ratio of solid angles), plain number. */
  readonly scale: Coefficient;
}

/** What a numeric slot may hold besides a number or a param: a wavelength-dependent value. */
export type ChromaticSlot = PowerLawFlux | PowerLawSize | BlackbodyRatio;

/** The kind tags of {@link ChromaticSlot}. */
export const CHROMATIC_KINDS: readonly ChromaticSlot['kind'][] = Object.freeze([
  'powerLawFlux',
  'powerLawSize',
  'blackbodyRatio',
]);

/** Names of the coefficient fields of each chromatic kind (the ones that may hold params). */
export const CHROMATIC_COEFFICIENTS: Readonly<Record<ChromaticSlot['kind'], readonly string[]>> =
  Object.freeze({
    powerLawFlux: ['value', 'index'],
    powerLawSize: ['value', 'index'],
    blackbodyRatio: ['t1', 't2', 'scale'],
  });

/**
 * Second radiation constant c2 = h c / k_B, metre kelvin (exact in the 2019 SI: 1.438776877...e-2 m K,
 * CODATA 2018; value from memory of the CODATA table).
 */
export const SECOND_RADIATION_CONSTANT = 0.014387768775039337;

/**
 * The wavelength at which a {@link BlackbodyRatio} slot is checked when a model is built (1 micron). Power
 * laws are checked at their own lambda0. Every evaluation checks the slot again at its actual wavelength.
 */
export const CHECK_WAVELENGTH = 1e-6;

/** True when a slot holds a {@link ChromaticSlot}. */
export function isChromatic(x: unknown): x is ChromaticSlot {
  if (typeof x !== 'object' || x === null) return false;
  const k = (x as { kind?: unknown }).kind;
  return k === 'powerLawFlux' || k === 'powerLawSize' || k === 'blackbodyRatio';
}

function checkCoefficient(fn: string, name: string, x: unknown): Coefficient {
  if (isParam(x)) return x;
  if (typeof x !== 'number' || !Number.isFinite(x)) {
    throw new ModelError(`${fn}: ${name} must be a finite number or a param(...), got ${showValue(x)}`, {
      argument: name,
    });
  }
  return x;
}

function checkLambda0(fn: string, lambda0: unknown): number {
  if (typeof lambda0 !== 'number' || !Number.isFinite(lambda0) || lambda0 <= 0) {
    throw new ModelError(
      `${fn}: lambda0 must be a wavelength in metres > 0 (e.g. 2.2e-6), got ${showValue(lambda0)}`,
      { argument: 'lambda0' },
    );
  }
  return lambda0;
}

/**
 * A flux that follows a power law in wavelength, f0 (lambda / lambda0)^index, for a `weight` slot.
 *
 * @param f0 - flux at lambda0 (plain number or param)
 * @param lambda0 - reference wavelength, metres (> 0)
 * @param index - power-law index (dimensionless; number or param)
 * @returns a frozen {@link PowerLawFlux} slot
 * @throws ModelError when lambda0 is not a positive finite number or a coefficient is not finite
 *
 * Notes: exact (one `Math.pow`); the gradient with respect to `index` is f0 r^index ln r, r = lambda/lambda0.
 *
 * @example
 * ```ts
 * const m = disk({ diameter: 1 }).plus(point().weight(powerLawFlux(0.2, 2.2e-6, -2)));
 * chromaticVis2(m, { ucoord: [50], vcoord: [0], wavelength: [1.65e-6] });
 * ```
 */
/* @__NO_SIDE_EFFECTS__ */
export function powerLawFlux(f0: Coefficient, lambda0: number, index: Coefficient): PowerLawFlux {
  const fn = 'powerLawFlux';
  return Object.freeze({
    kind: 'powerLawFlux',
    value: checkCoefficient(fn, 'f0', f0),
    lambda0: checkLambda0(fn, lambda0),
    index: checkCoefficient(fn, 'index', index),
  });
}

/**
 * A size that follows a power law in wavelength, s0 (lambda / lambda0)^index, for a diameter or FWHM slot.
 *
 * @param s0 - size at lambda0, mas (number or param)
 * @param lambda0 - reference wavelength, metres (> 0)
 * @param index - power-law index (dimensionless; number or param)
 * @returns a frozen {@link PowerLawSize} slot
 * @throws ModelError when lambda0 is not a positive finite number or a coefficient is not finite
 *
 * Notes: exact; the slot's domain (a size >= 0) is checked at lambda0 when the model is built and at every
 * wavelength it is evaluated at.
 *
 * @example
 * ```ts
 * gaussian({ fwhm: powerLawSize(3, 2.2e-6, 1) }); // an envelope growing linearly with wavelength
 * ```
 */
/* @__NO_SIDE_EFFECTS__ */
export function powerLawSize(s0: Coefficient, lambda0: number, index: Coefficient): PowerLawSize {
  const fn = 'powerLawSize';
  return Object.freeze({
    kind: 'powerLawSize',
    value: checkCoefficient(fn, 's0', s0),
    lambda0: checkLambda0(fn, lambda0),
    index: checkCoefficient(fn, 'index', index),
  });
}

/**
 * The flux ratio of two blackbodies, scale * B_lambda(t1) / B_lambda(t2), for a `weight` slot.
 *
 * @param t1 - temperature of the weighted component, kelvin (> 0; number or param)
 * @param t2 - temperature of the reference component, kelvin (> 0; number or param)
 * @param scale - wavelength-independent factor, e.g. the ratio of the two solid angles (default 1)
 * @returns a frozen {@link BlackbodyRatio} slot
 * @throws ModelError when a coefficient is not finite
 *
 * Notes: Planck's law; the prefactors cancel in the ratio, which is
 * expm1(c2 / (lambda t2)) / expm1(c2 / (lambda t1)) with c2 = {@link SECOND_RADIATION_CONSTANT}, the same for
 * B_lambda and B_nu. Computed through logarithms (no overflow for c2 / (lambda T) up to 1e300); relative error
 * a few 1e-16 times c2 / (lambda T).
 *
 * @example
 * ```ts
 * // a 1500 K ring of 16 times the star's solid angle, beside a 6000 K star of flux 1
 * disk({ diameter: 1 }).plus(ring({ diameter: 8 }).weight(blackbodyRatio(1500, 6000, 16)));
 * ```
 */
/* @__NO_SIDE_EFFECTS__ */
export function blackbodyRatio(t1: Coefficient, t2: Coefficient, scale: Coefficient = 1): BlackbodyRatio {
  const fn = 'blackbodyRatio';
  return Object.freeze({
    kind: 'blackbodyRatio',
    t1: checkCoefficient(fn, 't1', t1),
    t2: checkCoefficient(fn, 't2', t2),
    scale: checkCoefficient(fn, 'scale', scale),
  });
}

/** Reads one coefficient as a dual (a reader supplied by canonicalisation). */
export type CoefficientReader = (
  c: Coefficient,
  path: string,
  domain: (x: number) => string | null,
  unit: string,
) => Dual;

const ANY = (): string | null => null;
const POSITIVE = (x: number): string | null => (x > 0 ? null : 'a temperature > 0');

/** ln(expm1(x)) for x > 0, without overflow; and its derivative exp(x) / expm1(x). */
function lnExpm1(x: number): { v: number; d: number } {
  if (x > 1) {
    const e = Math.exp(-x);
    return { v: x + Math.log1p(-e), d: 1 / (1 - e) };
  }
  const m = Math.expm1(x);
  return { v: Math.log(m), d: (m + 1) / m };
}

/**
 * Evaluates a chromatic slot as a dual at a wavelength.
 *
 * @param slot - the chromatic slot
 * @param wavelength - metres, or undefined (then `atReference` decides)
 * @param atReference - when true and no wavelength is given, evaluate at the slot's reference wavelength
 *   (lambda0 of a power law, {@link CHECK_WAVELENGTH} for a blackbody ratio): the check made when a model is built
 * @param path - model path of the slot
 * @param read - reads a coefficient as a dual
 * @throws ModelError when no wavelength is given outside reference mode
 * @internal
 */
export function readChromatic(
  slot: ChromaticSlot,
  wavelength: number | undefined,
  atReference: boolean,
  path: string,
  read: CoefficientReader,
): Dual {
  let lambda = wavelength;
  if (lambda === undefined) {
    if (!atReference) {
      throw new ModelError(
        `${path}: this slot depends on wavelength (${slot.kind}); evaluate the model with the wavelength ` +
          'functions (chromaticVisibilities, chromaticVis2, chromaticBispectrum, ... from uvsky) and give a wavelength per point',
        { modelPath: path },
      );
    }
    lambda = slot.kind === 'blackbodyRatio' ? CHECK_WAVELENGTH : slot.lambda0;
  }
  if (!(lambda > 0) || !Number.isFinite(lambda)) {
    throw new ModelError(
      `${path}: wavelength must be a finite number of metres > 0, got ${showValue(lambda)}`,
      {
        modelPath: path,
      },
    );
  }
  switch (slot.kind) {
    case 'powerLawFlux':
    case 'powerLawSize': {
      const v0 = read(slot.value, `${path}.value`, ANY, slot.kind === 'powerLawSize' ? ' mas' : '');
      const index = read(slot.index, `${path}.index`, ANY, '');
      const r = lambda / slot.lambda0;
      const p = r ** index.v;
      return mul(v0, apply(index, p, p * Math.log(r)));
    }
    case 'blackbodyRatio': {
      const t1 = read(slot.t1, `${path}.t1`, POSITIVE, ' K');
      const t2 = read(slot.t2, `${path}.t2`, POSITIVE, ' K');
      const scale = read(slot.scale, `${path}.scale`, ANY, '');
      const x1 = SECOND_RADIATION_CONSTANT / (lambda * t1.v);
      const x2 = SECOND_RADIATION_CONSTANT / (lambda * t2.v);
      const l1 = lnExpm1(x1);
      const l2 = lnExpm1(x2);
      // ln R = ln expm1(x2) - ln expm1(x1); d lnR / dT1 = L'(x1) x1 / T1, d lnR / dT2 = -L'(x2) x2 / T2
      const r = Math.exp(l2.v - l1.v);
      const f1 = apply(t1, r, (r * l1.d * x1) / t1.v);
      const f2 = apply(t2, 1, (-l2.d * x2) / t2.v);
      // R(T1, T2) = f1 * f2 has value r and the gradient r (dlnR/dT1 dT1 + dlnR/dT2 dT2)
      return mul(scale, mul(f1, f2));
    }
    default: {
      const never: never = slot;
      throw new ModelError(`${path}: unknown slot kind ${showValue((never as { kind?: unknown }).kind)}`, {
        modelPath: path,
      });
    }
  }
}

/** The params held by a chromatic slot's coefficients, with their field names. */
export function chromaticParams(slot: ChromaticSlot): [string, Param][] {
  const out: [string, Param][] = [];
  for (const name of CHROMATIC_COEFFICIENTS[slot.kind]) {
    const c = (slot as unknown as Record<string, unknown>)[name];
    if (isParam(c)) out.push([name, c]);
  }
  return out;
}

/** A copy of a chromatic slot with its params replaced by numbers where `values` names them. */
export function substituteChromatic(slot: ChromaticSlot, values: ReadonlyMap<string, number>): ChromaticSlot {
  const out: Record<string, unknown> = { ...slot };
  for (const name of CHROMATIC_COEFFICIENTS[slot.kind]) {
    const c = out[name];
    if (isParam(c)) out[name] = values.get(c.name) ?? c.value;
  }
  return Object.freeze(out) as unknown as ChromaticSlot;
}

/** A TypeScript expression that rebuilds a chromatic slot, given a printer of coefficients. */
export function chromaticToString(slot: ChromaticSlot, fmt: (c: Coefficient) => string): string {
  switch (slot.kind) {
    case 'powerLawFlux':
    case 'powerLawSize':
      return `${slot.kind}(${fmt(slot.value)}, ${String(slot.lambda0)}, ${fmt(slot.index)})`;
    case 'blackbodyRatio':
      return `blackbodyRatio(${fmt(slot.t1)}, ${fmt(slot.t2)}, ${fmt(slot.scale)})`;
  }
}

/** True when any slot of the tree holds a {@link ChromaticSlot}. */
export function hasChromaticSlot(node: ModelNode): boolean {
  for (const name of SLOT_NAMES[node.kind]) {
    if (isChromatic((node as unknown as Record<string, unknown>)[name])) return true;
  }
  return childrenOf(node).some(hasChromaticSlot);
}
