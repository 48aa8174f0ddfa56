/**
 * Inputs are never mutated: for every public function that takes typed arrays or objects, a deep snapshot of
 * the inputs taken before the call equals one taken after it. Typed arrays cannot be frozen, so these are the
 * inputs a careless kernel could write into (an `out` buffer aliasing an input is the one documented exception,
 * and is not used here).
 */
import { describe, expect, it } from 'vitest';
import { fit, residuals } from '../../src/fit/index.js';
import {
  chromaticBispectrum,
  chromaticClosurePhase,
  chromaticVis2,
  chromaticVisibilities,
  disk,
  modelFromJSON,
  observableJacobian,
  param,
  parameterVector,
  pixelImage,
  point,
  pointsFromFrequencies,
  radialProfile,
  visibilityJacobian,
} from '../../src/index.js';
import {
  concatOifits,
  type PlanObservationOptions,
  planObservation,
  readOifits,
  selectOifits,
  simulate,
  writeOifits,
} from '../../src/oifits/index.js';
import { plannedFile } from './properties.js';

/** A deep, comparable picture of a value: typed arrays element by element (NaN and -0 kept), objects by key. */
function snapshot(x: unknown, seen = new Set<unknown>()): unknown {
  if (typeof x === 'number') return Object.is(x, -0) ? '-0' : Number.isNaN(x) ? 'NaN' : x;
  if (typeof x === 'bigint') return `${x}n`;
  if (typeof x === 'function') return `function ${x.name}`;
  if (x === null || typeof x !== 'object') return x;
  if (seen.has(x)) return '[seen]';
  seen.add(x);
  if (ArrayBuffer.isView(x)) {
    const a = x as unknown as ArrayLike<number>;
    return { type: x.constructor.name, values: Array.from(a, (t) => snapshot(t)) };
  }
  if (Array.isArray(x)) return x.map((t) => snapshot(t, seen));
  if (x instanceof Map) return { map: [...x].map(([k, v]) => [snapshot(k, seen), snapshot(v, seen)]) };
  const out: Record<string, unknown> = { class: x.constructor?.name };
  if ('cards' in x) out['cards'] = snapshot((x as { cards: unknown }).cards, seen); // FitsHeader (private index)
  if (typeof (x as { toJSON?: unknown }).toJSON === 'function') out['json'] = JSON.stringify(x);
  for (const [k, v] of Object.entries(x)) out[k] = snapshot(v, seen);
  return out;
}

/** Calls f on the inputs and checks that none of them changed. */
function unchanged(inputs: readonly unknown[], f: () => unknown): void {
  const before = inputs.map((x) => snapshot(x));
  f();
  const after = inputs.map((x) => snapshot(x));
  expect(after).toEqual(before);
}

const model = disk({ diameter: param('d', 2, { min: 0, max: 10 }) })
  .weight(0.9)
  .plus(point().weight(0.1).shift(param('e', 3), 1));
const u = () => Float64Array.of(1e7, -3e7, 5e7, 0);
const v = () => Float64Array.of(2e7, 4e7, -1e7, 0);

const PLAN: PlanObservationOptions = {
  target: { name: 'Kestrel Minor', ra: 123.456, dec: -45.25 },
  array: {
    name: 'TALLGRASS',
    latitude: -24.5,
    longitude: -70.25,
    altitude: 2600,
    stations: [
      { name: 'TG1', east: 0, north: 0 },
      { name: 'TG2', east: 31.25, north: -4.5 },
      { name: 'TG3', east: -12, north: 57.75 },
    ],
  },
  instrument: {
    name: 'REEDPIPE',
    wavelengths: Float64Array.of(1.6e-6, 1.7e-6),
    bandwidths: Float64Array.of(5e-8, 5e-8),
  },
  hourAngles: Float64Array.of(-1, 0, 1),
  mjd: 60430.9,
  date: '2024-06-01T00:00:00',
};

describe('the snapshot', () => {
  it('sees a change to one element of a typed array held in a frozen object, and a NaN turned into 0', () => {
    const held = Object.freeze({ data: Float64Array.of(1, Number.NaN, 3) });
    expect(() => unchanged([held], () => (held.data[1] = 0))).toThrow();
    expect(() => unchanged([held], () => (held.data[0] = -0))).toThrow();
  });
});

describe('Model methods', () => {
  it('visibilities, vis2, visamp, visphi and their out forms leave u and v unchanged', () => {
    const [a, b] = [u(), v()];
    unchanged([a, b], () => {
      model.visibilities(a, b);
      model.visibilities(a, b, { re: new Float64Array(4), im: new Float64Array(4) });
      model.vis2(a, b);
      model.vis2(a, b, new Float64Array(4));
      model.visamp(a, b);
      model.visphi(a, b);
      model.visibility(a[0]!, b[0]!);
    });
  });

  it('bispectrum, closurePhase and t3amp leave their four columns unchanged', () => {
    const cols = [u(), v(), v(), u()] as const;
    unchanged(cols, () => {
      model.bispectrum(...cols);
      model.closurePhase(...cols);
      model.t3amp(...cols);
      model.closurePhase(...cols, new Float64Array(4));
    });
  });

  it('at, parameterVector and the factories leave their arrays and records unchanged', () => {
    const values = Float64Array.of(2.5, 1);
    const record = { d: 2.5 };
    const radii = [0, 1, 1];
    const intensity = Float64Array.of(1, 1, 0);
    const pixels = Float64Array.of(0, 1, 0, 1, 2, 1);
    unchanged([values, record, radii, intensity, pixels], () => {
      model.at(values);
      model.at(record);
      parameterVector(model, values);
      radialProfile({ radii, intensity, maxFrequency: 0.5 });
      pixelImage({ nx: 3, pixels, scale: 0.5 });
    });
  });

  it('modelFromJSON leaves its document unchanged', () => {
    const doc = JSON.parse(JSON.stringify(model));
    unchanged([doc], () => modelFromJSON(doc));
  });
});

describe('wavelength functions and Jacobians', () => {
  it('chromaticVisibilities, chromaticVis2 and pointsFromFrequencies leave their columns unchanged', () => {
    const points = {
      ucoord: Float64Array.of(10, 20, 30),
      vcoord: [5, -5, 0],
      wavelength: Float64Array.of(2e-6, 2.1e-6, 2e-6),
      band: Float64Array.of(1e-8, 0, 2e-8),
    };
    const [fu, fv, fw, fb] = [
      u(),
      v(),
      Float64Array.of(2e-6, 2e-6, 2e-6, 2e-6),
      Float64Array.of(0, 0, 1e-8, 0),
    ];
    unchanged([points, fu, fv, fw, fb], () => {
      chromaticVisibilities(model, points, { samples: 4 });
      chromaticVis2(model, points);
      pointsFromFrequencies(fu, fv, fw, fb);
    });
  });

  it('chromaticBispectrum and chromaticClosurePhase leave their triangles unchanged', () => {
    const triangles = {
      u1coord: Float64Array.of(10, 20),
      v1coord: Float64Array.of(0, 5),
      u2coord: [0, -5],
      v2coord: Float64Array.of(10, 20),
      wavelength: Float64Array.of(2e-6, 2.2e-6),
      band: Float64Array.of(5e-8, 0),
    };
    unchanged([triangles], () => {
      chromaticBispectrum(model, triangles);
      chromaticClosurePhase(model, triangles);
    });
  });

  it('visibilityJacobian and observableJacobian leave points and parameter values unchanged', () => {
    const points = { u: u(), v: v() };
    const triangles = { u1: u(), v1: v(), u2: v(), v2: u() };
    const values = Float64Array.of(2.2, 2);
    const record = { d: 2.2 };
    unchanged([points, triangles, values, record], () => {
      visibilityJacobian(model, points.u, points.v, values);
      observableJacobian(model, 'vis2', points, record);
      observableJacobian(model, 'visphi', points, values);
      observableJacobian(model, 't3phi', triangles, values);
      observableJacobian(model, 't3amp', triangles);
    });
  });
});

describe('OIFITS functions', () => {
  const bytes = plannedFile();

  it('readOifits leaves the bytes unchanged, as a Uint8Array and as an ArrayBuffer', () => {
    const copy = bytes.slice();
    const buffer = bytes.slice().buffer;
    unchanged([copy, new Uint8Array(buffer)], () => {
      readOifits(copy);
      readOifits(buffer);
    });
  });

  it('planObservation leaves its options unchanged', () => {
    unchanged([PLAN], () => planObservation(PLAN));
  });

  it('writeOifits, selectOifits, concatOifits and simulate leave their datasets and options unchanged', () => {
    const ds = readOifits(bytes.slice(), { name: 'a.fits' });
    const other = planObservation({ ...PLAN, mjd: 60431.9, name: 'b.fits' });
    const selection = { wavelength: [1.5e-6, 1.56e-6] as const, baseline: [0, 80] as const };
    const writeOptions = { date: '2024-06-01T00:00:00' };
    const list = [ds, other];
    unchanged([ds, other, selection, writeOptions, list], () => {
      writeOifits(ds, writeOptions);
      selectOifits(ds, selection);
      concatOifits(list);
      simulate(model.at({ d: 1.5 }), ds, { noise: true, seed: 3, write: writeOptions });
    });
  });

  it('residuals and fit (uvsky/fit) leave the dataset and their options unchanged', () => {
    const truth = model.at({ d: 1.5, e: 2.5 });
    const { dataset } = simulate(truth, readOifits(bytes.slice()), { noise: true, seed: 4 });
    const options = { observables: ['vis2', 't3phi'] as const, maxIterations: 5, start: { d: 1.8 } };
    unchanged([dataset, options], () => {
      residuals(model, dataset, { observables: options.observables });
      fit(model, dataset, options);
    });
  });
});
