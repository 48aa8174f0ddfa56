/**
 * A small invented observation shared by the plot and command-line tests: the invented four-station array
 * MOSSBANK at latitude -24 degrees, the invented instrument FERNLIGHT with four channels in the H band, and an
 * invented target, planned with `planObservation` (every name and number here is made up).
 */
import { planObservation } from '../../src/oifits/index.js';

export const STATIONS = [
  { name: 'MB1', east: 0, north: 0 },
  { name: 'MB2', east: 62.5, north: 18.0 },
  { name: 'MB3', east: -21.0, north: 84.0 },
  { name: 'MB4', east: 104.0, north: -41.0 },
] as const;

export const WAVELENGTHS = [1.55e-6, 1.62e-6, 1.69e-6, 1.76e-6];

/** The planned dataset: 3 snapshots, 6 baselines, 4 triangles, 4 channels; placeholder observables. */
export function plannedDataset(hourAngles: readonly number[] = [-1.5, 0, 1.5]) {
  return planObservation({
    target: { name: 'Wren Tertius', ra: 201.3, dec: -31.2 },
    array: { name: 'MOSSBANK', latitude: -24.0, stations: STATIONS },
    instrument: { name: 'FERNLIGHT', wavelengths: WAVELENGTHS, bandwidths: 7e-8 },
    hourAngles,
    mjd: 60400.1,
    date: '2024-04-01T00:00:00',
  });
}
