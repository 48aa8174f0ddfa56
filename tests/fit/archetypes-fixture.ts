/**
 * The simulated observations of the archetype-ranking checks, shared by tests/fit/compare.test.ts and
 * benchmarks/archetype-ranking.ts: an invented four-station array (TALLGRASS, stations TG1..TG4) observing an
 * invented target (Kestrel Minor) at five hour angles in four channels, and one true model per archetype.
 *
 * Signal-to-noise: VIS2 errors 0.01 (absolute) and closure-phase errors 1 degree; VIS2 and T3PHI are used,
 * 120 + 80 = 200 values.
 */
import type { ArchetypeName } from '../../src/fit/archetypes.js';
import type { FitObservable } from '../../src/fit/data.js';
import { disk, gaussian, type Model, point, ring, sum } from '../../src/model/model.js';
import { type OifitsDataset, planObservation } from '../../src/oifits/index.js';

/** The planned observation (placeholder observables, to be filled by `simulate`). */
export function plannedObservation(): OifitsDataset {
  return planObservation({
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
}

/** Observables of the checks. */
export const OBSERVABLES: readonly FitObservable[] = Object.freeze(['vis2', 't3phi']);

/**
 * One true model per archetype. Sizes put the longest baselines (about 2.3 mas fringe spacing) on the main
 * lobe of each shape, past V^2 = 0.5, where the shapes differ; the binary's companion (flux 0.3 of a 1.2 mas
 * disk, at 3.5 mas east and 2.2 mas south) lies inside the default separation grid but off its nodes.
 */
export const TRUTHS: Readonly<Record<ArchetypeName, Model>> = Object.freeze({
  point: point(),
  disk: disk({ diameter: 2.5 }),
  gaussian: gaussian({ fwhm: 1.6 }),
  ring: ring({ diameter: 1.8 }),
  binary: sum(disk({ diameter: 1.2 }), point().weight(0.3).shift(3.5, -2.2)),
});
