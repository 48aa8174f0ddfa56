/** Grid searches, the companion search and bootstrap uncertainties on simulated observations. */
import { describe, expect, it } from 'vitest';
import { bootstrap, companionSearch, fit, gridSearch } from '../../src/fit/index.js';
import { disk, param, point, sum } from '../../src/index.js';
import { simulate } from '../../src/oifits/index.js';
import { tallgrassObservation } from '../helpers/observation.js';

const plan = tallgrassObservation();
const star = () => disk({ diameter: param('diameter', 1.5, { min: 0, max: 10 }) });

describe('grid search', () => {
  it('finds the true binary position among grid starts and keeps the chi2 map', () => {
    const truth = sum(disk({ diameter: 1.2 }), point().weight(0.15).shift(-12, 7));
    const data = simulate(truth, plan, { noise: true, seed: 21 }).dataset;
    const model = sum(
      star(),
      point()
        .weight(param('flux', 0.1, { min: 0, max: 1 }))
        .shift(param('east', 0), param('north', 0)),
    );
    const axis = [-20, -10, 0, 10, 20];
    const g = gridSearch(model, data, { grid: { east: axis, north: axis }, observables: ['vis2', 't3phi'] });
    expect(g.chi2Map).toHaveLength(25);
    expect(g.axes.map((a) => a.name)).toEqual(['east', 'north']);
    const best = g.minima[0]!;
    expect(best.values.east).toBeCloseTo(-12, 1);
    expect(best.values.north).toBeCloseTo(7, 1);
    expect(g.best.values.east).toBe(best.values.east);
    // the map's minimum is the best node
    expect(Math.min(...g.chi2Map)).toBe(best.chi2);
    // other local minima exist and are worse
    expect(g.minima.length).toBeGreaterThan(1);
    expect(g.minima[1]!.chi2).toBeGreaterThan(best.chi2);
  });

  it('rejects a grid over a name that is not a free parameter', () => {
    const data = simulate(disk({ diameter: 1 }), plan).dataset;
    expect(() => gridSearch(star(), data, { grid: { size: [1, 2] } })).toThrow(
      /'size' is not a free parameter/,
    );
  });
});

describe('companion search', () => {
  it('detects a 2 % companion at high significance near its true position', () => {
    const truth = sum(
      disk({ diameter: 1.2 }),
      point()
        .weight(0.02 * 1)
        .shift(9, -14),
    );
    const data = simulate(truth, plan, { noise: true, seed: 5 }).dataset;
    const axis = [-24, -16, -8, 0, 8, 16, 24];
    const c = companionSearch(star(), data, { east: axis, north: axis, observables: ['vis2', 't3phi'] });
    expect(c.significance).toBeGreaterThan(5);
    expect(c.grid.best.values.companionEast).toBeCloseTo(9, 0);
    expect(c.grid.best.values.companionNorth).toBeCloseTo(-14, 0);
    expect(c.grid.best.values.companionFlux).toBeCloseTo(0.02, 2);
    expect(c.upperLimits).toHaveLength(49);
  });

  it('finds no significant companion around a single star and gives finite upper limits', () => {
    const data = simulate(disk({ diameter: 1.2 }), plan, { noise: true, seed: 6 }).dataset;
    const axis = [-20, -10, 10, 20];
    const c = companionSearch(star(), data, {
      east: axis,
      north: axis,
      observables: ['vis2', 't3phi'],
      sigma: 3,
    });
    // Wilks: delta chi2 ~ chi2(3) under no companion; 5 sigma would happen with p ~ 6e-7
    expect(c.significance).toBeLessThan(5);
    for (const f of c.upperLimits) {
      expect(Number.isFinite(f)).toBe(true);
      expect(f).toBeGreaterThan(0);
      expect(f).toBeLessThan(0.1); // closure phases of 0.5 deg exclude companions brighter than a few percent
    }
  });
});

describe('bootstrap', () => {
  it('resampling entries gives an uncertainty close to the covariance one for independent Gaussian errors', () => {
    const data = simulate(disk({ diameter: 2 }), plan, { noise: true, seed: 8 }).dataset;
    const m = star();
    const lm = fit(m, data, { observables: ['vis2'] });
    const b = bootstrap(m, data, { observables: ['vis2'], samples: 150, by: 'entry', seed: 3 });
    expect(b.values.diameter).toBe(lm.values.diameter);
    // bootstrap sd of 150 samples has a relative error of about 1/sqrt(300) = 6 %; allow 25 %
    expect(b.uncertainties.diameter! / lm.uncertainties.diameter!).toBeGreaterThan(0.75);
    expect(b.uncertainties.diameter! / lm.uncertainties.diameter!).toBeLessThan(1.25);
    const [lo, hi] = b.percentiles.diameter!;
    expect(lo).toBeLessThan(lm.values.diameter!);
    expect(hi).toBeGreaterThan(lm.values.diameter!);
    expect(b.samples).toHaveLength(150);
  });

  it('is reproducible with a seed', () => {
    const data = simulate(disk({ diameter: 2 }), plan, { noise: true, seed: 9 }).dataset;
    const a = bootstrap(star(), data, { samples: 5, seed: 4, by: 'record' });
    const b = bootstrap(star(), data, { samples: 5, seed: 4, by: 'record' });
    expect(a.samples).toEqual(b.samples);
  });
});
