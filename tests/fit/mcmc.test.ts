/**
 * The affine-invariant ensemble sampler (Goodman & Weare 2010, Comm. App. Math. Comp. Sci. 5:65, stretch move)
 * on targets with known posteriors, and the model sampler against the Levenberg-Marquardt uncertainties of `fit`.
 *
 * Sources of the expected values: the posterior of a linear model y = a + b x with Gaussian errors and flat
 * priors is Gaussian with mean (X^T W X)^-1 X^T W y and covariance (X^T W X)^-1 (weighted least squares,
 * common textbook result); a Gaussian prior of precision P adds P to the posterior precision (conjugate
 * Gaussian update, common practice); the uniform distribution on [0, 1] has mean 1/2 and variance 1/12.
 * Monte Carlo standard errors are sd x sqrt(tau / N) with tau the integrated autocorrelation time.
 */
import { describe, expect, it } from 'vitest';
import { FitError } from '../../src/errors.js';
import { fit } from '../../src/fit/fit.js';
import { coordinateSamples, mcmc, sampleLogProbability } from '../../src/fit/mcmc.js';
import { disk, point, sum } from '../../src/model/model.js';
import { param } from '../../src/model/param.js';
import { planObservation, simulate } from '../../src/oifits/index.js';
import { seededRandom } from '../../src/oifits/random.js';

/** Means must lie within this many Monte Carlo standard errors of the analytic value. */
const MEAN_MCSE = 3;
/** Relative tolerance of sampled covariances (variances relative to themselves, off-diagonals to sqrt(Cii Cjj)). */
const COV_REL = 0.1;
/** Relative tolerance between posterior 16/84 half-widths and LM 1-sigma uncertainties on a near-linear problem. */
const LM_REL = 0.1;

function expectMean(got: number, want: number, mcse: number, what: string): void {
  const diff = Math.abs(got - want);
  if (!(diff <= MEAN_MCSE * mcse)) {
    throw new Error(`${what}: mean ${got}, expected ${want}, diff ${diff}, tol ${MEAN_MCSE} x MCSE ${mcse}`);
  }
}

function expectCovariance(got: readonly (readonly number[])[], want: number[][], what: string): void {
  for (let i = 0; i < want.length; i++) {
    for (let j = 0; j < want.length; j++) {
      const scale = Math.sqrt(want[i]![i]! * want[j]![j]!);
      const diff = Math.abs(got[i]![j]! - want[i]![j]!);
      if (!(diff <= COV_REL * scale)) {
        throw new Error(
          `${what}: covariance[${i}][${j}] = ${got[i]![j]}, expected ${want[i]![j]}, diff ${diff}, tol ${COV_REL * scale}`,
        );
      }
    }
  }
}

/** Inverse of a symmetric 2 x 2 matrix. */
function inverse2(m: number[][]): number[][] {
  const [[a, b], [, d]] = m as [[number, number], [number, number]];
  const det = a * d - b * b;
  return [
    [d / det, -b / det],
    [-b / det, a / det],
  ];
}

describe('sampleLogProbability on known distributions', () => {
  it('recovers the analytic posterior of a straight-line fit with Gaussian errors', () => {
    // invented data: y = 1.5 - 0.7 x plus noise of known, unequal errors
    const rnd = seededRandom(11);
    const xs = Array.from({ length: 25 }, (_, i) => -2 + (6 * i) / 24);
    const sig = xs.map((_, i) => 0.3 + 0.1 * (i % 4));
    const ys = xs.map((x, i) => 1.5 - 0.7 * x + sig[i]! * rnd.normal());
    // normal equations
    let s00 = 0;
    let s01 = 0;
    let s11 = 0;
    let t0 = 0;
    let t1 = 0;
    xs.forEach((x, i) => {
      const w = 1 / sig[i]! ** 2;
      s00 += w;
      s01 += w * x;
      s11 += w * x * x;
      t0 += w * ys[i]!;
      t1 += w * x * ys[i]!;
    });
    const cov = inverse2([
      [s00, s01],
      [s01, s11],
    ]);
    const mean = [cov[0]![0]! * t0 + cov[0]![1]! * t1, cov[1]![0]! * t0 + cov[1]![1]! * t1];
    const logProb = (p: Float64Array) => {
      let c = 0;
      for (let i = 0; i < xs.length; i++) c += ((ys[i]! - p[0]! - p[1]! * xs[i]!) / sig[i]!) ** 2;
      return -0.5 * c;
    };
    const r = sampleLogProbability(logProb, [0, 0], {
      seed: 7,
      walkers: 16,
      burn: 500,
      steps: 3000,
      spread: 0.1,
    });
    for (let d = 0; d < 2; d++) expectMean(r.mean[d]!, mean[d]!, r.mcse[d]!, `line parameter ${d}`);
    expectCovariance(r.covariance, cov, 'line');
    expect(r.autocorrelationReliable).toBe(true);
    expect(r.acceptance).toBeGreaterThan(0.3);
    expect(r.acceptance).toBeLessThan(0.9);
  });

  it('samples a strongly correlated Gaussian with very different scales (affine invariance)', () => {
    const s = [100, 0.01];
    const rho = 0.95;
    const want = [
      [s[0]! ** 2, rho * s[0]! * s[1]!],
      [rho * s[0]! * s[1]!, s[1]! ** 2],
    ];
    const prec = inverse2(want);
    const mu = [3, -5];
    const logProb = (x: Float64Array) => {
      const a = x[0]! - mu[0]!;
      const b = x[1]! - mu[1]!;
      return -0.5 * (prec[0]![0]! * a * a + 2 * prec[0]![1]! * a * b + prec[1]![1]! * b * b);
    };
    const r = sampleLogProbability(logProb, [0, -5], {
      seed: 3,
      walkers: 20,
      burn: 1000,
      steps: 3000,
      spread: [1, 1e-4],
    });
    for (let d = 0; d < 2; d++) expectMean(r.mean[d]!, mu[d]!, r.mcse[d]!, `gaussian coordinate ${d}`);
    expectCovariance(r.covariance, want, 'gaussian');
    // the 16 / 84 percentiles of a Gaussian lie at about mu -/+ 0.9945 sigma
    for (let d = 0; d < 2; d++) {
      const half = 0.5 * (r.upper[d]! - r.lower[d]!);
      expect(Math.abs(half / (0.9945 * s[d]!) - 1)).toBeLessThan(COV_REL);
    }
  });

  it('treats -Infinity as outside the support: a uniform density on [0, 1]', () => {
    const r = sampleLogProbability((x) => (x[0]! >= 0 && x[0]! <= 1 ? 0 : Number.NEGATIVE_INFINITY), [0.5], {
      seed: 2,
      walkers: 16,
      burn: 200,
      steps: 2000,
      spread: 0.1,
    });
    expectMean(r.mean[0]!, 0.5, r.mcse[0]!, 'uniform');
    expect(Math.abs(r.sd[0]! ** 2 * 12 - 1)).toBeLessThan(COV_REL);
    const xs = coordinateSamples(r, 0);
    expect(xs.length).toBe(r.stored * r.walkers);
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...xs)).toBeLessThanOrEqual(1);
  });

  it('reports an autocorrelation time that agrees with a batch-means estimate from the same chain', () => {
    const r = sampleLogProbability((x) => -0.5 * (x[0]! ** 2 + x[1]! ** 2 + x[2]! ** 2), [0, 0, 0], {
      seed: 9,
      walkers: 12,
      burn: 500,
      steps: 6000,
      spread: 1,
    });
    // batch means (common practice): Var(mean of a batch of B steps) ~ sd^2 tau / B for B >> tau
    const B = 300;
    for (let d = 0; d < 3; d++) {
      const means: number[] = [];
      for (let w = 0; w < r.walkers; w++) {
        for (let b = 0; b + B <= r.stored; b += B) {
          let m = 0;
          for (let t = b; t < b + B; t++) m += r.chain[(t * r.walkers + w) * 3 + d]!;
          means.push(m / B);
        }
      }
      const mu = means.reduce((x, y) => x + y, 0) / means.length;
      const v = means.reduce((x, y) => x + (y - mu) ** 2, 0) / (means.length - 1);
      const tauBatch = (v * B) / r.sd[d]! ** 2;
      const tau = r.autocorrelationTime[d]!;
      expect(tau).toBeGreaterThan(1);
      // the two estimators have sampling errors of roughly 15 % each here
      expect(Math.abs(tau / tauBatch - 1)).toBeLessThan(0.35);
    }
  });

  it('is reproducible for a seed and differs between seeds', () => {
    const lp = (x: Float64Array) => -0.5 * x[0]! ** 2;
    const opts = { walkers: 8, burn: 10, steps: 50 };
    const a = sampleLogProbability(lp, [0], { ...opts, seed: 4 });
    const b = sampleLogProbability(lp, [0], { ...opts, seed: 4 });
    const c = sampleLogProbability(lp, [0], { ...opts, seed: 5 });
    expect(Array.from(a.chain)).toEqual(Array.from(b.chain));
    expect(Array.from(a.chain)).not.toEqual(Array.from(c.chain));
  });

  it('thins the stored chain and keeps burn-in out of it', () => {
    const r = sampleLogProbability((x) => -0.5 * x[0]! ** 2, [0], {
      walkers: 8,
      burn: 30,
      steps: 100,
      thin: 7,
    });
    expect(r.stored).toBe(14);
    expect(r.chain.length).toBe(14 * 8);
    expect(r.logProbability.length).toBe(14 * 8);
    for (let i = 0; i < r.chain.length; i++)
      expect(r.logProbability[i]).toBeCloseTo(-0.5 * r.chain[i]! ** 2, 12);
  });

  it('reports progress and stops with a FitError when the signal aborts', () => {
    const ctl = new AbortController();
    const fractions: number[] = [];
    expect(() =>
      sampleLogProbability((x) => -0.5 * x[0]! ** 2, [0], {
        walkers: 8,
        burn: 0,
        steps: 1000,
        progressEvery: 10,
        signal: ctl.signal,
        onProgress: (p) => {
          fractions.push(p.fraction);
          if (p.step >= 200) ctl.abort('enough');
        },
      }),
    ).toThrow(FitError);
    expect(fractions.length).toBe(20);
    expect(fractions[0]).toBeCloseTo(0.01, 12);
    const done: number[] = [];
    sampleLogProbability((x) => -0.5 * x[0]! ** 2, [0], {
      walkers: 8,
      burn: 5,
      steps: 20,
      onProgress: (p) => done.push(p.fraction),
    });
    expect(done.at(-1)).toBe(1);
    expect(done.every((f, i) => i === 0 || f > done[i - 1]!)).toBe(true);
  });

  it('rejects invalid settings with FitError', () => {
    const lp = (x: Float64Array) => -0.5 * x[0]! ** 2;
    expect(() => sampleLogProbability(lp, [0, 0], { walkers: 3 })).toThrow(/walkers must be an integer >= 4/);
    expect(() => sampleLogProbability(lp, [0], { walkers: 9 })).toThrow(/even/);
    expect(() => sampleLogProbability(lp, [0], { stretch: 1 })).toThrow(/stretch/);
    expect(() => sampleLogProbability(lp, [], {})).toThrow(/start/);
    expect(() => sampleLogProbability(() => Number.NaN, [0], { steps: 2 })).toThrow(/NaN/);
    expect(() => sampleLogProbability(() => Number.NEGATIVE_INFINITY, [0], { steps: 2 })).toThrow(
      /initial ball/,
    );
  });
});

describe('mcmc on a model and an OIFITS dataset', () => {
  // an invented array and target; well-resolved disk with a faint unresolved background, high signal-to-noise,
  // so the problem is close to linear over the posterior width
  const planned = planObservation({
    target: { name: 'Kestrel Minor', ra: 150, dec: -20 },
    array: {
      name: 'TALLGRASS',
      latitude: -24.5,
      stations: [
        { name: 'TG1', east: 0, north: 0 },
        { name: 'TG2', east: 60, north: -10 },
        { name: 'TG3', east: -20, north: 85 },
        { name: 'TG4', east: 110, north: 60 },
      ],
    },
    instrument: { name: 'REEDPIPE', wavelengths: [1.5e-6, 1.6e-6, 1.7e-6, 1.8e-6], bandwidths: 5e-8 },
    hourAngles: [-3, -1.5, 0, 1.5, 3],
    mjd: 60400,
    date: '2024-06-01T00:00:00',
    errors: { vis2: 0.01, t3phi: 1 },
  });
  const truth = sum(disk({ diameter: 2.2 }), point().weight(0.1));
  const data = simulate(truth, planned, { noise: true, seed: 21 }).dataset;
  const model = sum(
    disk({ diameter: param('diameter', 2, { min: 0, max: 20 }) }),
    point().weight(param('background', 0.05, { min: 0, max: 1 })),
  );
  const obs = { observables: ['vis2'] as const };
  const best = fit(model, data, obs);

  it('gives posterior percentiles that agree with the LM uncertainties of fit', () => {
    const post = mcmc(model, data, { ...obs, start: best, seed: 5, walkers: 16, burn: 300, steps: 1500 });
    expect(post.parameters).toEqual(['diameter', 'background']);
    for (const name of post.parameters) {
      const s = post.summary[name]!;
      const half = 0.5 * (s.upper - s.lower);
      const sigma = best.uncertainties[name]!;
      if (!(Math.abs(half / sigma - 1) < LM_REL)) {
        throw new Error(`${name}: posterior half-width ${half}, LM sigma ${sigma}, tol ${LM_REL}`);
      }
      // the median sits near the best fit (flat priors, near-linear problem)
      expect(Math.abs(s.median - best.values[name]!)).toBeLessThan(0.2 * sigma);
    }
    // the correlation of the two parameters matches the fit's
    const r = post.covariance[0]![1]! / Math.sqrt(post.covariance[0]![0]! * post.covariance[1]![1]!);
    expect(Math.abs(r - best.correlation[0]![1]!)).toBeLessThan(0.1);
    expect(post.bestChi2).toBeGreaterThanOrEqual(best.chi2 - 1e-6);
    expect(post.bestChi2).toBeLessThan(best.chi2 + 1);
    expect(post.acceptance).toBeGreaterThan(0.3);
    expect(post.count).toBe(data.vis2.length);
  });

  it('adds a user log-prior to the likelihood (a Gaussian prior narrows the posterior as predicted)', () => {
    const sp = best.uncertainties.diameter!;
    const centre = best.values.diameter!;
    const post = mcmc(model, data, {
      ...obs,
      start: best,
      seed: 6,
      walkers: 16,
      burn: 300,
      steps: 1500,
      logPrior: (v) => -0.5 * ((v.diameter! - centre) / sp) ** 2,
    });
    // posterior covariance = (C^-1 + P)^-1 with P = diag(1 / sp^2, 0)
    const prec = inverse2(best.covariance.map((r) => [...r]));
    prec[0]![0] = prec[0]![0]! + 1 / sp ** 2;
    const want = inverse2(prec);
    expectCovariance(post.covariance, want, 'posterior with prior');
  });

  it('keeps walkers inside the bounds (flat prior on the params bounds)', () => {
    // a background bounded to [0, 0.02] far below its best value piles the posterior against the upper bound
    const tight = sum(
      disk({ diameter: param('diameter', 2.2, { min: 0, max: 20 }) }),
      point().weight(param('background', 0.01, { min: 0, max: 0.02 })),
    );
    const post = mcmc(tight, data, { ...obs, seed: 1, walkers: 8, burn: 100, steps: 200 });
    const xs = coordinateSamples(post, 1);
    expect(Math.max(...xs)).toBeLessThanOrEqual(0.02);
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(0);
    expect(post.summary.background!.median).toBeGreaterThan(0.015);
  });

  it('reports progress with the lowest chi2 and stops with a FitError on abort', () => {
    const ctl = new AbortController();
    const seen: number[] = [];
    expect(() =>
      mcmc(model, data, {
        ...obs,
        start: best,
        walkers: 8,
        burn: 0,
        steps: 500,
        progressEvery: 5,
        signal: ctl.signal,
        onProgress: (p) => {
          seen.push(p.bestChi2);
          if (p.step >= 20) ctl.abort();
        },
      }),
    ).toThrow(FitError);
    expect(seen.length).toBe(4);
    expect(seen.every((c) => Number.isFinite(c) && c >= best.chi2 - 1e-6)).toBe(true);
  });

  it('rejects a model without free parameters and unknown spread names', () => {
    expect(() => mcmc(disk({ diameter: 2 }), data)).toThrow(/no free parameters/);
    expect(() => mcmc(model, data, { spread: { size: 1 } })).toThrow(/size/);
  });
});
