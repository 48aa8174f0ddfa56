/**
 * Fits of wavelength-dependent models: a star with an envelope whose size and flux follow power laws of
 * wavelength, simulated at each channel's own wavelength (and averaged over the channel width), then fitted.
 */
import { describe, expect, it } from 'vitest';
import { fit } from '../../src/fit/index.js';
import { atWavelengths, disk, gaussian, param, powerLawFlux, powerLawSize, sum } from '../../src/index.js';
import { simulate } from '../../src/oifits/index.js';
import { tallgrassObservation } from '../helpers/observation.js';

const plan = tallgrassObservation();
const LAMBDA0 = 1.65e-6;
const truth = sum(
  disk({ diameter: 1.1 }),
  gaussian({ fwhm: powerLawSize(4, LAMBDA0, 1) }).weight(powerLawFlux(0.3, LAMBDA0, 2)),
);
const free = sum(
  disk({ diameter: param('diameter', 1, { min: 0 }) }),
  gaussian({ fwhm: powerLawSize(param('size', 3.5, { min: 0 }), LAMBDA0, param('sizeIndex', 0.5)) }).weight(
    powerLawFlux(param('flux', 0.25, { min: 0 }), LAMBDA0, param('fluxIndex', 1)),
  ),
);
const TRUE = { diameter: 1.1, size: 4, sizeIndex: 1, flux: 0.3, fluxIndex: 2 };

describe('fits of wavelength-dependent models', () => {
  it('recovers power-law size and flux indices from noiseless chromatic data', () => {
    const data = simulate(atWavelengths(truth), plan).dataset;
    const r = fit(free, data, { observables: ['vis2', 't3phi'] });
    for (const [k, v] of Object.entries(TRUE)) expect(r.values[k], k).toBeCloseTo(v, 6);
    expect(r.chi2).toBeLessThan(1e-10);
  });

  it('a model without the wavelength dependence cannot fit the same data', () => {
    const data = simulate(atWavelengths(truth), plan).dataset;
    const grey = sum(
      disk({ diameter: param('diameter', 1, { min: 0 }) }),
      gaussian({ fwhm: param('size', 4, { min: 0 }) }).weight(param('flux', 0.3, { min: 0 })),
    );
    expect(fit(grey, data, { observables: ['vis2', 't3phi'] }).chi2).toBeGreaterThan(100);
  });

  it('with bandwidth smearing in the data, the fit that smears the model recovers the truth and the one that does not is biased', () => {
    // wide channels (R ~ 25) and a shifted companion make smearing matter
    const wide = tallgrassObservation({}, [-3, -1.5, 0, 1.5, 3]);
    const smeared = simulate(atWavelengths(truth, { bandwidthSmearing: true }), wide).dataset;
    const withSmearing = fit(free, smeared, { observables: ['vis2'], bandwidthSmearing: true });
    for (const [k, v] of Object.entries(TRUE)) expect(withSmearing.values[k], k).toBeCloseTo(v, 5);
    const without = fit(free, smeared, { observables: ['vis2'] });
    expect(without.chi2).toBeGreaterThan(withSmearing.chi2);
  });
});
