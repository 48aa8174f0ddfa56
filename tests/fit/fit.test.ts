/**
 * Levenberg-Marquardt fits on simulated observations of invented targets: convergence, the result object,
 * bounds, phase wrapping, progress and cancellation.
 */
import { describe, expect, it } from 'vitest';
import { fit, residuals } from '../../src/fit/index.js';
import { writeResiduals } from '../../src/fit/residuals.js';
import { disk, FitError, ModelError, param, point, sum } from '../../src/index.js';
import { simulate } from '../../src/oifits/index.js';
import { tallgrassObservation } from '../helpers/observation.js';

const plan = tallgrassObservation();

describe('fit', () => {
  it('recovers a disk diameter from noiseless data to the solver tolerance', () => {
    const data = simulate(disk({ diameter: 2.4 }), plan).dataset;
    const r = fit(disk({ diameter: param('diameter', 1, { min: 0, max: 20 }) }), data);
    expect(r.values.diameter).toBeCloseTo(2.4, 8);
    expect(r.chi2).toBeLessThan(1e-12);
    expect(r.converged).toBe(true);
    expect(r.dof).toBe(r.residuals.count - 1);
  });

  it('reports values, raw and scaled uncertainties, covariance, correlation and per-observable chi2', () => {
    const truth = sum(disk({ diameter: 2 }), point().weight(0.1).shift(6, -4));
    const data = simulate(truth, plan, { noise: true, seed: 11 }).dataset;
    const m = sum(
      disk({ diameter: param('diameter', 1.8, { min: 0 }) }),
      point()
        .weight(param('flux', 0.08, { min: 0, max: 1 }))
        .shift(param('east', 5.8), param('north', -3.9)),
    );
    const r = fit(m, data);
    expect(r.parameters).toEqual(['diameter', 'flux', 'east', 'north']);
    for (const n of r.parameters) {
      expect(r.uncertainties[n]).toBeGreaterThan(0);
      expect(r.scaledUncertainties[n]! / r.uncertainties[n]!).toBeCloseTo(Math.sqrt(r.reducedChi2), 12);
      expect(
        Math.abs(
          r.values[n]! - ({ diameter: 2, flux: 0.1, east: 6, north: -4 } as Record<string, number>)[n]!,
        ),
      ).toBeLessThan(5 * r.uncertainties[n]!);
    }
    expect(r.correlation[0]![0]).toBeCloseTo(1, 12);
    expect(r.correlation[1]![2]).toBeCloseTo(
      r.covariance[1]![2]! / (r.uncertainties.flux! * r.uncertainties.east!),
      12,
    );
    const observed = Object.keys(r.perObservable).sort();
    expect(observed).toEqual(['t3amp', 't3phi', 'vis2', 'visamp', 'visphi']);
    const total = Object.values(r.perObservable).reduce((a, b) => a + b!.chi2, 0);
    expect(total).toBeCloseTo(r.chi2, 8);
    // reduced chi2 of a correct model is about 1: chi2 has mean dof and sd sqrt(2 dof)
    expect(Math.abs(r.chi2 - r.dof)).toBeLessThan(4 * Math.sqrt(2 * r.dof));
  });

  it('keeps parameters inside their bounds and says which ended on one', () => {
    const data = simulate(disk({ diameter: 3 }), plan).dataset;
    const r = fit(disk({ diameter: param('diameter', 1, { min: 0, max: 2 }) }), data);
    expect(r.values.diameter).toBe(2);
    expect(r.atBound).toEqual(['diameter']);
  });

  it('uses only the chosen observables, with weights', () => {
    const data = simulate(disk({ diameter: 2 }), plan, { noise: true, seed: 2 }).dataset;
    const m = disk({ diameter: param('diameter', 1, { min: 0 }) });
    const r = fit(m, data, { observables: ['vis2'] });
    expect(Object.keys(r.perObservable)).toEqual(['vis2']);
    const w = fit(m, data, { observables: ['vis2'], weights: { vis2: 4 } });
    expect(w.chi2).toBeCloseTo(4 * r.chi2, 6);
    expect(w.uncertainties.diameter).toBeCloseTo(r.uncertainties.diameter! / 2, 6);
  });

  it('reports progress and stops when the signal aborts', () => {
    const data = simulate(disk({ diameter: 2 }), plan, { noise: true, seed: 3 }).dataset;
    const m = disk({ diameter: param('diameter', 0.5, { min: 0 }) });
    const seen: number[] = [];
    fit(m, data, { onProgress: (p) => seen.push(p.fraction) });
    expect(seen.length).toBeGreaterThan(1);
    expect(seen.at(-1)).toBe(1);
    const ac = new AbortController();
    expect(() =>
      fit(m, data, {
        signal: ac.signal,
        onProgress: () => ac.abort('enough'),
      }),
    ).toThrow(/cancelled by the caller's AbortSignal \(enough\)/);
  });

  it('fails clearly without free parameters, without data, or with bad start values', () => {
    const data = simulate(disk({ diameter: 2 }), plan).dataset;
    expect(() => fit(disk({ diameter: 2 }), data)).toThrow(FitError);
    expect(() =>
      fit(disk({ diameter: param('d', 1) }), data, { observables: ['vis2', 'bogus' as never] }),
    ).toThrow(/unknown observable 'bogus'/);
    expect(() => fit(disk({ diameter: param('d', 1, { min: 0 }) }), data, { start: { d: -1 } })).toThrow(
      ModelError,
    );
  });
});

describe('phase residuals', () => {
  it('a model closure phase of 179 degrees against data at -179 gives a residual of 2 degrees, not 358', () => {
    // a binary whose closure phase on the first triangle is near 180: build the data from it, then move it by 2 deg
    const model = sum(point(), point().weight(0.9).shift(3, 1));
    const sim = simulate(model, plan).dataset;
    const cp = sim.t3.t3phi;
    const shifted = Float64Array.from(cp, (x) => {
      const y = x + 2;
      return y > 180 ? y - 360 : y;
    });
    const data = { ...sim, t3: { ...sim.t3, t3phi: shifted } };
    const r = residuals(model, data, { observables: ['t3phi'] });
    const t3 = r.observables[0]!;
    for (let k = 0; k < t3.count; k++)
      expect(Math.abs(t3.normalised[k]! * t3.error[k]! + 2)).toBeLessThan(1e-9);
  });

  it('wraps a model at 179 and data at -179 (and the reverse) to a 2 degree residual', () => {
    const block = {
      observable: 't3phi' as const,
      index: new Int32Array(3),
      data: Float64Array.from([-179, 179, 10]),
      error: Float64Array.from([1, 0.5, 1]),
      weight: 1,
      wavelength: new Float64Array(3),
      record: new Int32Array(3),
      baseline: ['', '', ''],
    };
    const out = new Float64Array(3);
    writeResiduals(block, Float64Array.from([179, -179, 10]), out, 0);
    expect(Array.from(out)).toEqual([-2, 4, 0]);
  });
});
