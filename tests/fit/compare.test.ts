/**
 * Model comparison by information criteria: AIC = chi2 + 2k (Akaike 1974, IEEE Trans. Autom. Control 19:716)
 * and BIC = chi2 + k ln n (Schwarz 1978, Ann. Stat. 6:461), and the ready-made archetypes ranked on simulated
 * data of each archetype.
 */
import { describe, expect, it } from 'vitest';
import { FitError } from '../../src/errors.js';
import {
  ARCHETYPE_NAMES,
  archetypeGuesses,
  archetypes,
  compareArchetypes,
} from '../../src/fit/archetypes.js';
import { compare } from '../../src/fit/compare.js';
import { fit } from '../../src/fit/fit.js';
import { residuals } from '../../src/fit/residuals.js';
import { disk, gaussian, point, sum } from '../../src/model/model.js';
import { param } from '../../src/model/param.js';
import { simulate } from '../../src/oifits/index.js';
import { OBSERVABLES, plannedObservation, TRUTHS } from './archetypes-fixture.js';

/** Agreement of chi2 values computed along two routes through the same solver. */
const CHI2_TOL = 1e-9; // relative
const planned = plannedObservation();
const obs = { observables: OBSERVABLES };

describe('compare', () => {
  const data = simulate(TRUTHS.disk, planned, { noise: true, seed: 4 }).dataset;
  const diskModel = disk({ diameter: param('diameter', 2, { min: 0 }) });
  const gaussModel = gaussian({ fwhm: param('fwhm', 1.5, { min: 0 }) });

  it('computes AIC = chi2 + 2k and BIC = chi2 + k ln n and ranks by BIC by default', () => {
    const table = compare(
      [
        { name: 'gaussian', model: gaussModel },
        { name: 'disk', model: diskModel },
        { name: 'point', model: point() },
      ],
      data,
      obs,
    );
    expect(table.criterion).toBe('bic');
    expect(table.rows.map((r) => r.name)).toEqual(['disk', 'gaussian', 'point']);
    expect(table.rows.map((r) => r.rank)).toEqual([1, 2, 3]);
    expect(table.best.name).toBe('disk');
    const n = data.vis2.length + data.t3.length;
    for (const r of table.rows) {
      expect(r.n).toBe(n);
      expect(r.dof).toBe(n - r.k);
      expect(r.aic).toBe(r.chi2 + 2 * r.k);
      expect(r.bic).toBe(r.chi2 + r.k * Math.log(n));
      expect(r.reducedChi2).toBeCloseTo(r.chi2 / r.dof, 12);
      expect(r.deltaBic).toBeCloseTo(r.bic - table.best.bic, 9);
    }
    expect(table.rows[0]!.deltaBic).toBe(0);
    expect(table.rows.map((r) => r.k)).toEqual([1, 1, 0]);
    const wsum = table.rows.reduce((s, r) => s + r.weight, 0);
    expect(wsum).toBeCloseTo(1, 12);
    expect(table.rows[0]!.weight).toBeGreaterThan(table.rows[1]!.weight);
    // the fitted values and chi2 are those of fit() from the same start
    const f = fit(diskModel, data, obs);
    const row = table.rows[0]!;
    expect(Math.abs(row.chi2 - f.chi2)).toBeLessThan(CHI2_TOL * f.chi2);
    expect(row.values.diameter).toBeCloseTo(f.values.diameter!, 8);
    expect(row.uncertainties!.diameter).toBeCloseTo(f.uncertainties.diameter!, 8);
    expect(row.fit).not.toBeNull();
    // a model without free parameters is evaluated: its chi2 is that of residuals()
    const pt = table.rows[2]!;
    expect(Math.abs(pt.chi2 - residuals(point(), data, obs).chi2)).toBeLessThan(CHI2_TOL * pt.chi2);
    expect(pt.values).toEqual({});
  });

  it('ranks by AIC when asked: a small chi2 gain can pass the AIC penalty and fail the BIC one', () => {
    // point-source data (seed 72, found by a scan of seeds) where a fitted disk lowers chi2 by about 3.2:
    // more than the AIC penalty of 2 per parameter, less than the BIC penalty ln n ~ 5.3
    const flat = simulate(TRUTHS.point, planned, { noise: true, seed: 72 }).dataset;
    const cands = { point: point(), disk: diskModel };
    const byAic = compare(cands, flat, { ...obs, criterion: 'aic' });
    const byBic = compare(cands, flat, { ...obs, criterion: 'bic' });
    const gain =
      byAic.rows.find((r) => r.name === 'point')!.chi2 - byAic.rows.find((r) => r.name === 'disk')!.chi2;
    expect(gain).toBeGreaterThan(2);
    expect(gain).toBeLessThan(Math.log(byAic.n));
    expect(byAic.criterion).toBe('aic');
    expect(byAic.best.name).toBe('disk');
    expect(byBic.best.name).toBe('point');
    expect(byAic.rows[1]!.deltaAic).toBeCloseTo(gain - 2, 9);
    expect(byBic.rows[1]!.deltaBic).toBeCloseTo(Math.log(byBic.n) - gain, 9);
  });

  it('starts from a grid, keeps the lowest chi2, and screens starts with keep', () => {
    let calls = 0;
    const table = compare(
      {
        disk: {
          model: disk({ diameter: param('diameter', 0.5, { min: 0 }) }),
          grid: { diameter: [0.5, 2.4] },
        },
      },
      data,
      { ...obs, onProgress: () => calls++ },
    );
    expect(table.best.starts).toBe(2);
    expect(table.best.values.diameter).toBeCloseTo(fit(diskModel, data, obs).values.diameter!, 6);
    expect(calls).toBeGreaterThanOrEqual(2);
    const screened = compare(
      [
        {
          name: 'disk',
          model: disk({ diameter: param('diameter', 0.5, { min: 0 }) }),
          grid: { diameter: [0.2, 0.5, 2.4, 2.6] },
          keep: 1,
        },
      ],
      data,
      obs,
    );
    expect(screened.best.starts).toBe(1);
    expect(Math.abs(screened.best.values.diameter! - 2.5)).toBeLessThan(0.05);
  });

  it('still ranks a nested model whose extra parameters end unconstrained, without uncertainties', () => {
    // disk data: a companion bounded to flux 0 leaves its position without any curvature of chi2
    const binary = sum(
      disk({ diameter: param('diameter', 2.4, { min: 0 }) }),
      point()
        .weight(param('companionFlux', 0, { min: 0, max: 0 }))
        .shift(param('companionEast', 3), param('companionNorth', 1)),
    );
    const table = compare({ disk: diskModel, binary }, data, obs);
    const b = table.rows.find((r) => r.name === 'binary')!;
    expect(b.uncertainties).toBeNull();
    expect(b.fit).toBeNull();
    expect(b.note).toMatch(/no uncertainties/);
    expect(Math.abs(b.chi2 - table.rows.find((r) => r.name === 'disk')!.chi2)).toBeLessThan(1e-6);
    expect(table.best.name).toBe('disk');
    expect(b.deltaBic).toBeCloseTo(3 * Math.log(b.n), 5);
  });

  it('rejects bad candidates and stops on abort', () => {
    expect(() => compare([], data)).toThrow(FitError);
    expect(() =>
      compare(
        [
          { name: 'a', model: diskModel },
          { name: 'a', model: gaussModel },
        ],
        data,
      ),
    ).toThrow(/unique/);
    expect(() => compare([{ name: 'a', model: diskModel, grid: { size: [1] } }], data)).toThrow(/size/);
    expect(() => compare({ a: diskModel }, data, { criterion: 'dic' as 'aic' })).toThrow(/criterion/);
    const ctl = new AbortController();
    ctl.abort();
    expect(() => compare({ a: diskModel }, data, { signal: ctl.signal })).toThrow(/cancelled/);
  });
});

describe('archetypes', () => {
  it('guesses sizes from the half-power frequency of noiseless data, and flags unresolved data', () => {
    for (const [name, truth, key, size] of [
      ['disk', TRUTHS.disk, 'diameter', 2.5],
      ['gaussian', TRUTHS.gaussian, 'fwhm', 1.6],
      ['ring', TRUTHS.ring, 'ringDiameter', 1.8],
    ] as const) {
      const g = archetypeGuesses(simulate(truth, planned).dataset, obs);
      expect(g.regime).toBe('resolved');
      // the Gaussian-shaped extrapolation to V^2 = 0.5 is exact for the Gaussian and close for the others
      const rel = Math.abs(g[key] / size - 1);
      if (!(rel < 0.15)) throw new Error(`${name}: guess ${g[key]} mas, true ${size} mas`);
    }
    const g = archetypeGuesses(simulate(TRUTHS.point, planned).dataset, obs);
    expect(g.regime).toBe('unresolved');
    expect(g.separations.length % 2).toBe(1);
    expect(g.separations[(g.separations.length - 1) / 2]).toBe(0);
    expect(g.qMax).toBeGreaterThan(g.qMin);
  });

  it('builds the five candidates with our parameter names', () => {
    const cands = archetypes(simulate(TRUTHS.disk, planned).dataset, obs);
    expect(cands.map((c) => c.name)).toEqual([...ARCHETYPE_NAMES]);
    expect(cands.map((c) => c.model.parameters())).toEqual([
      [],
      ['diameter'],
      ['fwhm'],
      ['diameter'],
      ['diameter', 'companionFlux', 'companionEast', 'companionNorth'],
    ]);
    expect(archetypes(planned, { ...obs, include: ['ring'] }).map((c) => c.name)).toEqual(['ring']);
    expect(() => archetypes(planned, { include: ['blob' as 'ring'] })).toThrow(/blob/);
  });

  // Ranking success on simulated data of each archetype (fixture: tests/fit/archetypes-fixture.ts; VIS2 errors
  // 0.01, closure-phase errors 1 degree, 200 values). The issue asks for the true archetype first in >= 95 % of
  // 100 noise seeds; 100 seeds x 5 archetypes take minutes here, so they run in benchmarks/archetype-ranking.ts
  // (`npx tsx benchmarks/archetype-ranking.ts 100`) and this test runs seeds 1..20 per archetype, requiring
  // at least 19 of 20 (>= 95 % observed). As a binomial bound: were the true rate only 85 %, passing 19 of 20
  // would have probability 0.18, and passing all five archetypes (95 of 100 or more) well below 0.1.
  const SEEDS = 20;
  const REQUIRED = 19;
  for (const name of ARCHETYPE_NAMES) {
    it(`ranks the true archetype (${name}) first by BIC in at least ${REQUIRED} of ${SEEDS} noise seeds`, () => {
      const misses: string[] = [];
      for (let seed = 1; seed <= SEEDS; seed++) {
        const data = simulate(TRUTHS[name], planned, { noise: true, seed }).dataset;
        const table = compareArchetypes(data, obs);
        if (table.best.name !== name) {
          const row = table.rows.find((r) => r.name === name)!;
          misses.push(
            `seed ${seed}: ${table.best.name} first, ${name} at delta BIC ${row.deltaBic.toFixed(2)}`,
          );
        }
      }
      if (SEEDS - misses.length < REQUIRED) throw new Error(misses.join('\n'));
    });
  }
});
