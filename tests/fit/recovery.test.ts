/**
 * Recovery on simulated data (issue 6): across 200 noise seeds, the pulls (fit - truth) / sigma of every
 * parameter have mean about 0 and standard deviation about 1, so the reported uncertainties are honest.
 *
 * Statistical tolerances for N = 200 independent pulls from N(0, 1): the mean has standard error
 * 1/sqrt(200) = 0.071 and the sample standard deviation about 1/sqrt(2 * 200) = 0.05; we allow 4 of each
 * (|mean| < 0.28, |sd - 1| < 0.2), so a correct fitter fails this test with probability below about 1e-4.
 */
import { describe, expect, it } from 'vitest';
import { fit } from '../../src/fit/index.js';
import { disk, type Model, param, point, ring, sum } from '../../src/index.js';
import { simulate } from '../../src/oifits/index.js';
import { tallgrassObservation } from '../helpers/observation.js';

const SEEDS = 200;
const MEAN_TOL = 4 / Math.sqrt(SEEDS);
const SD_TOL = 4 / Math.sqrt(2 * SEEDS);

function pulls(truth: Model, free: Model, truthValues: Record<string, number>, seedBase: number) {
  const plan = tallgrassObservation();
  const out: Record<string, number[]> = {};
  for (const n of free.parameters()) out[n] = [];
  for (let s = 0; s < SEEDS; s++) {
    const data = simulate(truth, plan, { noise: true, seed: seedBase + s }).dataset;
    const r = fit(free, data, { observables: ['vis2', 't3phi'] });
    expect(r.converged, `seed ${seedBase + s}: ${r.reason}`).toBe(true);
    for (const n of r.parameters) out[n]!.push((r.values[n]! - truthValues[n]!) / r.uncertainties[n]!);
  }
  return out;
}

function checkPulls(p: Record<string, number[]>) {
  for (const [name, xs] of Object.entries(p)) {
    const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
    const sd = Math.sqrt(xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (xs.length - 1));
    expect(Math.abs(mean), `${name}: mean pull ${mean}`).toBeLessThan(MEAN_TOL);
    expect(Math.abs(sd - 1), `${name}: pull sd ${sd}`).toBeLessThan(SD_TOL);
  }
}

describe('pulls of fits to simulated data', () => {
  it('a star diameter has unbiased pulls with unit spread', () => {
    const truth = { diameter: 2.2 };
    checkPulls(
      pulls(disk({ diameter: 2.2 }), disk({ diameter: param('diameter', 2, { min: 0 }) }), truth, 1000),
    );
  });

  it('a binary (disk plus point) has unbiased pulls with unit spread in all four parameters', () => {
    const truth = { diameter: 1.5, flux: 0.2, east: 8, north: -5 };
    const model = (d: number | ReturnType<typeof param>, f: typeof d, e: typeof d, n: typeof d) =>
      sum(disk({ diameter: d }), point().weight(f).shift(e, n));
    checkPulls(
      pulls(
        model(1.5, 0.2, 8, -5),
        model(
          param('diameter', 1.4, { min: 0 }),
          param('flux', 0.18, { min: 0, max: 1 }),
          param('east', 7.9),
          param('north', -5.1),
        ),
        truth,
        5000,
      ),
    );
  });

  it('an inclined ring around a star has unbiased pulls with unit spread', () => {
    const truth = { diameter: 6, inclination: 50, pa: 30, ringFlux: 0.5 };
    const model = (d: number | ReturnType<typeof param>, i: typeof d, pa: typeof d, f: typeof d) =>
      sum(point(), ring({ diameter: d }).incline(i, pa).weight(f));
    checkPulls(
      pulls(
        model(6, 50, 30, 0.5),
        model(
          param('diameter', 5.9, { min: 0 }),
          param('inclination', 48, { min: 0, max: 90 }),
          param('pa', 32),
          param('ringFlux', 0.45, { min: 0 }),
        ),
        truth,
        9000,
      ),
    );
  });
});
