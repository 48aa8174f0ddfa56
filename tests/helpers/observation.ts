/**
 * An invented observation shared by the fit tests: the four-station array TALLGRASS observing the invented
 * target "Kestrel Minor" at five hour angles in four H-band-like channels.
 */
import type { OifitsDataset } from '../../src/oifits/index.js';
import { planObservation } from '../../src/oifits/index.js';

export interface ObservationErrors {
  readonly vis2?: number;
  readonly t3phi?: number;
  readonly t3amp?: number;
  readonly visamp?: number;
  readonly visphi?: number;
}

export function tallgrassObservation(
  errors: ObservationErrors = {},
  hourAngles = [-3, -1.5, 0, 1.5, 3],
): OifitsDataset {
  return planObservation({
    target: { name: 'Kestrel Minor', ra: 201.5, dec: -22 },
    array: {
      name: 'TALLGRASS',
      latitude: -30,
      stations: [
        { name: 'TG1', east: 0, north: 0 },
        { name: 'TG2', east: 62, north: 18 },
        { name: 'TG3', east: -25, north: 95 },
        { name: 'TG4', east: 130, north: -48 },
      ],
    },
    instrument: { name: 'REEDPIPE', wavelengths: [1.55e-6, 1.62e-6, 1.69e-6, 1.76e-6], bandwidths: 7e-8 },
    hourAngles,
    mjd: 61000.1,
    errors: { vis2: 0.01, t3phi: 0.5, t3amp: 0.02, visamp: 0.01, visphi: 0.5, ...errors },
  });
}
