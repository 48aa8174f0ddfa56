/**
 * Makes the demo's data file docs/demo/kestrel-minor.fits: an invented observation of the invented star
 * "Kestrel Minor" (a 2.1 mas limb-darkened disk, linear law a = 0.35, with a 5 % companion 5.4 mas east and 3.3 mas south) by the invented
 * four-station array TALLGRASS with the invented instrument REEDPIPE, with Gaussian noise from a fixed seed.
 * Every name and number here is invented.
 *
 * Run: node --import tsx docs/demo/make-demo-data.ts
 */
import { writeFileSync } from 'node:fs';
import { limbDarkenedDisk, linearLaw, point, sum } from '../../src/index.js';
import { planObservation, simulate } from '../../src/oifits/index.js';

const plan = planObservation({
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
  instrument: {
    name: 'REEDPIPE',
    wavelengths: [1.5e-6, 1.55e-6, 1.6e-6, 1.65e-6, 1.7e-6, 1.75e-6],
    bandwidths: 5e-8,
  },
  hourAngles: [-3.5, -2.5, -1.5, -0.5, 0.5, 1.5, 2.5, 3.5],
  mjd: 61200.05,
  errors: { vis2: 0.012, t3phi: 0.7, t3amp: 0.03, visamp: 0.015, visphi: 0.8 },
  date: '2026-11-20',
});
const truth = sum(
  limbDarkenedDisk({ diameter: 2.1, law: linearLaw(0.35) }),
  point().weight(0.05).shift(5.4, -3.3),
);
const { bytes } = simulate(truth, plan, { noise: true, seed: 20261120, write: { date: '2026-11-20' } });
writeFileSync(new URL('./kestrel-minor.fits', import.meta.url), bytes);
console.log(`wrote docs/demo/kestrel-minor.fits (${bytes.length} bytes): ${truth.toString()}`);
