/** The grid search on worker threads gives the serial grid search's result. */
import { describe, expect, it } from 'vitest';
import { gridSearch, parallelGridSearch } from '../../src/fit/index.js';
import { disk, FitError, param, point, sum } from '../../src/index.js';
import { simulate } from '../../src/oifits/index.js';
import { tallgrassObservation } from '../helpers/observation.js';

const plan = tallgrassObservation();
const data = simulate(sum(disk({ diameter: 1.2 }), point().weight(0.15).shift(-12, 7)), plan, {
  noise: true,
  seed: 21,
}).dataset;
const model = sum(
  disk({ diameter: param('diameter', 1.5, { min: 0, max: 10 }) }),
  point()
    .weight(param('flux', 0.1, { min: 0, max: 1 }))
    .shift(param('east', 0), param('north', 0)),
);
const axis = [-20, -10, 0, 10, 20];
const options = { grid: { east: axis, north: axis }, observables: ['vis2', 't3phi'] as ('vis2' | 't3phi')[] };

describe('parallel grid search', () => {
  it('gives the same chi2 map, nodes and best fit as the serial search on two threads', async () => {
    const serial = gridSearch(model, data, options);
    const fractions: number[] = [];
    const par = await parallelGridSearch(model, data, {
      ...options,
      threads: 2,
      onProgress: (p) => fractions.push(p.fraction),
    });
    expect(Array.from(par.chi2Map)).toEqual(Array.from(serial.chi2Map));
    expect(par.nodes.map((n) => n.values)).toEqual(serial.nodes.map((n) => n.values));
    expect(par.minima.map((n) => n.chi2)).toEqual(serial.minima.map((n) => n.chi2));
    expect(par.best.values).toEqual(serial.best.values); // the same fit, from the same start
    expect(fractions.at(-1)).toBe(1);
  }, 120_000);

  it('stays on the calling thread for small grids and rejects unknown grid parameters', async () => {
    const small = await parallelGridSearch(model, data, { grid: { east: [-12], north: [7] }, threads: 2 });
    expect(small.nodes).toHaveLength(1);
    await expect(
      parallelGridSearch(model, data, { grid: { size: axis, north: axis }, threads: 2 }),
    ).rejects.toThrow(FitError);
  });
});
