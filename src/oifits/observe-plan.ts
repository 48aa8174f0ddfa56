/**
 * Planned (synthetic) observations: an OIFITS 2 dataset built from a target, an array of stations, an
 * instrument's channels and a list of hour angles, with the uv coverage of Earth-rotation synthesis and
 * placeholder observables, ready for `simulate` or for a proposal's coverage plot.
 *
 * @module
 */
import { InputError, showValue } from '../errors.js';
import type { OifitsDataset, OiTable, OiTables } from './dataset.js';
import { type ColumnData, parseTform, type TableColumn } from './fits/bintable.js';
import { FitsHeader, type HeaderCard } from './fits/header.js';
import { Warnings } from './fits/where.js';
import { flattenTables } from './flatten.js';
import { asOiTable } from './read.js';
import { type OiTableName, REVISION_V2, SCHEMAS } from './schema.js';
import { validateTables } from './validate.js';

/** One station of a planned array: its position relative to the array centre in local coordinates. */
export interface PlanStation {
  /** STA_NAME (printable ASCII, unique within the array), e.g. `TG1`. */
  readonly name: string;
  /** Offset towards local east, metres. */
  readonly east: number;
  /** Offset towards local (geodetic) north, metres. */
  readonly north: number;
  /** Offset towards the local zenith, metres (default 0). */
  readonly up?: number;
  /** Aperture DIAMETER, metres (default NaN: unknown). */
  readonly diameter?: number;
  /** TEL_NAME (default the station name). */
  readonly telescope?: string;
}

/** The array of a planned observation. */
export interface PlanArray {
  /** ARRNAME (also TELESCOP of the primary header), e.g. `TALLGRASS`. */
  readonly name: string;
  /** Geodetic latitude of the array centre, degrees in [-90, 90] (north positive). */
  readonly latitude: number;
  /** Longitude of the array centre, degrees east in [-360, 360] (default 0); used only for OI_ARRAY. */
  readonly longitude?: number;
  /** Height of the array centre above the reference ellipsoid, metres (default 0); used only for OI_ARRAY. */
  readonly altitude?: number;
  /** At least two stations. */
  readonly stations: readonly PlanStation[];
}

/** The target of a planned observation. */
export interface PlanTarget {
  /** TARGET name (printable ASCII), e.g. `Kestrel Minor`. */
  readonly name: string;
  /** Right ascension RAEP0, degrees in [0, 360). */
  readonly ra: number;
  /** Declination DECEP0, degrees in [-90, 90]. */
  readonly dec: number;
}

/** The instrument of a planned observation. */
export interface PlanInstrument {
  /** INSNAME (also INSTRUME of the primary header), e.g. `REEDPIPE`. */
  readonly name: string;
  /** EFF_WAVE of each channel, metres (positive, at least one). */
  readonly wavelengths: ArrayLike<number>;
  /** EFF_BAND, metres (>= 0): one value for every channel, or one per channel. */
  readonly bandwidths: number | ArrayLike<number>;
}

/** Errors given to the placeholder observables (each a positive finite number). */
export interface PlanErrors {
  /** VIS2ERR, absolute (default 0.02). */
  readonly vis2?: number;
  /** T3PHIERR, degrees (default 1). */
  readonly t3phi?: number;
  /** T3AMPERR (default 0.05). */
  readonly t3amp?: number;
  /** VISAMPERR (default 0.02). */
  readonly visamp?: number;
  /** VISPHIERR, degrees (default 1). */
  readonly visphi?: number;
}

/** Options of {@link planObservation}. */
export interface PlanObservationOptions {
  readonly target: PlanTarget;
  readonly array: PlanArray;
  readonly instrument: PlanInstrument;
  /** Hour angles of the snapshots, hours (finite, at least one), in the order the rows are written. */
  readonly hourAngles: ArrayLike<number>;
  /** MJD of the first snapshot (the one at `hourAngles[0]`), days (UTC). */
  readonly mjd: number;
  /**
   * Baselines of OI_VIS2 and OI_VIS as pairs of station names, UCOORD / VCOORD from the first station to the
   * second (default: every pair i < j in station order).
   */
  readonly baselines?: readonly (readonly [string, string])[];
  /**
   * Triangles of OI_T3 as station-name triples (A, B, C), U1/V1 = baseline AB, U2/V2 = baseline BC (default:
   * every triple i < j < k in station order). An empty list (the default for two stations) leaves OI_T3 out.
   */
  readonly triangles?: readonly (readonly [string, string, string])[];
  /** Errors of the placeholder observables. */
  readonly errors?: PlanErrors;
  /** INT_TIME of every record, seconds (default 60, a placeholder). */
  readonly intTime?: number;
  /** Name of the dataset, used in messages (default `<planned>`). */
  readonly name?: string;
  /** DATE of the primary header (ISO 8601 `YYYY-MM-DDThh:mm:ss`), default the current time. */
  readonly date?: string;
}

/** A projected baseline: components in metres along u (east on the sky), v (north) and w (to the target). */
export interface ProjectedBaseline {
  readonly u: number;
  readonly v: number;
  readonly w: number;
}

const RAD = Math.PI / 180;
/**
 * Mean solar days per sidereal day (1 / 1.00273790935, the ratio of the mean solar to the sidereal day, from
 * memory): the hour angle of a fixed star grows by 24 h in this many days.
 */
const SOLAR_PER_SIDEREAL = 1 / 1.00273790935;
/** MJD of 1970-01-01T00:00:00 UTC (the Unix epoch). */
const MJD_UNIX_EPOCH = 40587;
/** Largest MJD whose calendar year has four digits (9999-12-31T23:59:59). */
const MJD_MAX = 2973483.99998;
/** WGS84 semi-major axis, metres, and flattening (from memory). */
const WGS84_A = 6378137;
const WGS84_F = 1 / 298.257223563;

const DEFAULT_ERRORS: Required<PlanErrors> = { vis2: 0.02, t3phi: 1, t3amp: 0.05, visamp: 0.02, visphi: 1 };

function bad(field: string, message: string, index?: number): never {
  throw new InputError(
    `planObservation: ${field} ${message}`,
    index === undefined ? { argument: field } : { argument: field, index },
  );
}

function finite(x: unknown, field: string, what = 'a finite number'): number {
  if (typeof x !== 'number' || !Number.isFinite(x)) bad(field, `= ${showValue(x)}; it must be ${what}`);
  return x;
}

function inRange(x: unknown, field: string, lo: number, hi: number, unit: string, openHigh = false): number {
  const v = finite(x, field, `a number in [${lo}, ${hi}${openHigh ? ')' : ']'} ${unit}`);
  if (v < lo || (openHigh ? v >= hi : v > hi)) {
    bad(field, `= ${v}; it must be in [${lo}, ${hi}${openHigh ? ')' : ']'} ${unit}`);
  }
  return v;
}

function positive(x: unknown, field: string, unit: string): number {
  const v = finite(x, field, `a positive finite number (${unit})`);
  if (!(v > 0)) bad(field, `= ${v}; it must be a positive finite number (${unit})`);
  return v;
}

/** A name that FITS keeps as given: printable ASCII, not empty, no trailing blank (FITS drops those). */
function asciiName(x: unknown, field: string): string {
  if (typeof x !== 'string' || x.trim() === '')
    bad(field, `= ${showValue(x)}; it must be a non-empty string`);
  for (let i = 0; i < x.length; i++) {
    const c = x.charCodeAt(i);
    if (c < 0x20 || c > 0x7e) {
      bad(field, `= ${JSON.stringify(x)} holds character code ${c}; FITS strings are printable ASCII`);
    }
  }
  if (x.endsWith(' ')) bad(field, `= ${JSON.stringify(x)} ends with a blank, which FITS does not keep`);
  return x;
}

function arrayLike(x: unknown, field: string, what: string): ArrayLike<number> {
  const ok =
    Array.isArray(x) || (ArrayBuffer.isView(x) && !(x instanceof DataView) && !(x instanceof BigInt64Array));
  if (!ok || (x as ArrayLike<number>).length === 0) {
    bad(field, `must be a non-empty array (or typed array) of ${what}, got ${showValue(x)}`);
  }
  return x as ArrayLike<number>;
}

/**
 * Projects a baseline given in local coordinates onto the (u, v, w) frame of a target at an hour angle.
 *
 * @param east - baseline component towards local east, metres
 * @param north - baseline component towards local (geodetic) north, metres
 * @param up - baseline component towards the local zenith, metres
 * @param latitude - geodetic latitude of the array, degrees
 * @param dec - declination of the target, degrees
 * @param hourAngle - hour angle of the target, hours (positive west of the meridian)
 * @returns u (towards east on the sky), v (towards north) and w (towards the target), metres; the
 *   projected baseline is sqrt(u^2 + v^2), and u^2 + v^2 + w^2 equals the squared baseline length
 *
 * Notes: a rotation, exact to rounding. Both steps are the textbook ones, written from memory of Thompson,
 * Moran & Swenson, "Interferometry and Synthesis in Radio Astronomy" (chapter 4, eqs. 4.1-4.3 and the
 * local-to-equatorial rotation), not checked against the book here. Local (E, N, U) at latitude phi to
 * equatorial (X towards hour angle 0 and declination 0, Y towards hour angle -6 h, Z towards the north
 * celestial pole): X = -sin(phi) N + cos(phi) U, Y = E, Z = cos(phi) N + sin(phi) U. Then, with hour angle H
 * and declination dec: u = sin(H) X + cos(H) Y, v = -sin(dec) cos(H) X + sin(dec) sin(H) Y + cos(dec) Z,
 * w = cos(dec) cos(H) X - cos(dec) sin(H) Y + sin(dec) Z. No aberration, precession, refraction or polar
 * motion is applied.
 *
 * @example
 * ```ts
 * projectBaseline(100, 0, 0, -30, -30, 0); // { u: 100, v: 0, w: 0 }: target at the zenith
 * ```
 */
export function projectBaseline(
  east: number,
  north: number,
  up: number,
  latitude: number,
  dec: number,
  hourAngle: number,
): ProjectedBaseline {
  const sp = Math.sin(latitude * RAD);
  const cp = Math.cos(latitude * RAD);
  const X = -sp * north + cp * up;
  const Y = east;
  const Z = cp * north + sp * up;
  return projectEquatorial(X, Y, Z, Math.sin(dec * RAD), Math.cos(dec * RAD), hourAngle * 15 * RAD);
}

function projectEquatorial(
  X: number,
  Y: number,
  Z: number,
  sd: number,
  cd: number,
  h: number,
): ProjectedBaseline {
  const sh = Math.sin(h);
  const ch = Math.cos(h);
  return {
    u: sh * X + ch * Y,
    v: -sd * ch * X + sd * sh * Y + cd * Z,
    w: cd * ch * X - cd * sh * Y + sd * Z,
  };
}

/** Typed storage matching a TFORM code, as the reader decodes it (I Int16, E Float32, D Float64, L Uint8). */
function typed(code: string, values: ArrayLike<number>): ColumnData {
  switch (code) {
    case 'I':
      return Int16Array.from(values);
    case 'J':
      return Int32Array.from(values);
    case 'E':
      return Float32Array.from(values);
    case 'D':
      return Float64Array.from(values);
    case 'L':
      return Uint8Array.from(values);
    default:
      throw new Error(`observe-plan: no numeric storage for TFORM code ${code}`);
  }
}

/**
 * Builds a table whose columns follow the OIFITS 2 definition in `schema.ts` (order, TFORM, TUNIT); `data`
 * gives every mandatory column (and the optional ones to include) by name.
 */
function buildTable(
  extname: OiTableName,
  keywords: readonly HeaderCard[],
  nrows: number,
  nwave: number,
  data: Readonly<Record<string, ArrayLike<number> | readonly string[]>>,
  file: string,
): OiTable {
  const revision = REVISION_V2[extname];
  const spec = SCHEMAS[extname][revision]!;
  const columns: TableColumn[] = [];
  for (const c of spec.columns) {
    const values = data[c.name];
    if (values === undefined) {
      if (c.optional) continue;
      throw new Error(`observe-plan: internal error, ${extname} column ${c.name} is not built`);
    }
    let text = c.tform;
    if (c.repeat === 'NWAVE') text = `${nwave}${c.tform}`;
    else if (c.repeat === 'string') {
      // The standard's width (e.g. 16A), widened when a name is longer.
      const width = Math.max(
        Number.parseInt(c.tform, 10),
        ...(values as readonly string[]).map((s) => s.length),
      );
      text = `${width}A`;
    }
    const tform = parseTform(text)!;
    const columnData =
      c.cls === 'string'
        ? [...(values as readonly string[])]
        : typed(tform.code, values as ArrayLike<number>);
    columns.push(
      Object.freeze(
        c.unit === undefined
          ? { name: c.name, tform, data: columnData }
          : { name: c.name, tform, unit: c.unit, data: columnData },
      ),
    );
  }
  const header = new FitsHeader([
    { keyword: 'EXTNAME', kind: 'string', value: extname },
    { keyword: 'OI_REVN', kind: 'integer', value: revision },
    ...keywords,
  ]);
  return asOiTable(extname, -1, header, nrows, columns, file);
}

/** ISO 8601 date and time (to the second, truncated) of an MJD. */
function isoOfMjd(mjd: number): string {
  return new Date(Math.floor((mjd - MJD_UNIX_EPOCH) * 86_400_000)).toISOString().slice(0, 19);
}

/** Geocentric (Earth-centred, Earth-fixed) position of a point on the WGS84 ellipsoid, metres. */
function geocentric(latitude: number, longitude: number, altitude: number): [number, number, number] {
  const e2 = WGS84_F * (2 - WGS84_F);
  const sp = Math.sin(latitude * RAD);
  const cp = Math.cos(latitude * RAD);
  const n = WGS84_A / Math.sqrt(1 - e2 * sp * sp);
  return [
    (n + altitude) * cp * Math.cos(longitude * RAD),
    (n + altitude) * cp * Math.sin(longitude * RAD),
    (n * (1 - e2) + altitude) * sp,
  ];
}

function stationIndex(names: ReadonlyMap<string, number>, x: unknown, field: string): number {
  const k = typeof x === 'string' ? names.get(x) : undefined;
  if (k === undefined) {
    bad(field, `= ${showValue(x)} is not a station of the array (stations ${[...names.keys()].join(', ')})`);
  }
  return k;
}

/**
 * Builds a synthetic OIFITS 2 observation: the uv coverage of a target observed by an array at given hour
 * angles, with placeholder observables, as a dataset of the same shape `readOifits` returns.
 *
 * @param options - `target` (name; ra, dec in degrees), `array` (name; latitude, longitude in degrees;
 *   altitude and station east / north / up offsets in metres), `instrument` (name; wavelengths and
 *   bandwidths in metres), `hourAngles` (hours), `mjd` of the first snapshot (days), optional `baselines`
 *   and `triangles` (station names), `errors` (VIS2, T3AMP, VISAMP absolute; T3PHI, VISPHI degrees),
 *   `intTime` (seconds), `name`, `date`; see {@link PlanObservationOptions}
 * @returns an OIFITS 2 dataset with OI_TARGET (one target, TARGET_ID 1), OI_ARRAY, OI_WAVELENGTH, OI_VIS,
 *   OI_VIS2 and OI_T3 (left out when there is no triangle): one row per (snapshot, baseline) or (snapshot,
 *   triangle), snapshot after snapshot; VIS2DATA = 1, VISAMP = 1, VISPHI = 0, T3AMP = 1, T3PHI = 0 with the
 *   given errors and FLAG false. `writeOifits` accepts it, and `readOifits(writeOifits(ds))` gives back the
 *   same tables
 * @throws InputError naming the option (e.g. `target.dec`, `array.stations[2].name`) and what is valid: at
 *   least two stations with unique names, positive finite wavelengths, bandwidths >= 0, finite hour angles,
 *   a declination in [-90, 90], positive errors, baselines and triangles of distinct known stations
 *
 * Notes: UCOORD, VCOORD (baseline from the first to the second station of STA_INDEX) and U1COORD .. V2COORD
 * (AB, BC) are the u and v of {@link projectBaseline} (Earth-rotation synthesis after Thompson, Moran &
 * Swenson, chapter 4, from memory), so that u = UCOORD / EFF_WAVE points east and v north on the sky. The
 * MJD of snapshot k is `mjd + (hourAngles[k] - hourAngles[0]) / 24 * 0.99726957` days (a sidereal hour in
 * mean solar days, from memory), an approximation that ignores the equation of the equinoxes; DATE-OBS is
 * the earliest snapshot's MJD as UTC, and TIME the seconds since 0 h UTC of that day. Whether the target is
 * above the horizon or within reach of delay lines is not checked. EFF_WAVE and EFF_BAND are 32-bit floats
 * (TFORM E, as the standard defines them), so the views' wavelengths are the given ones rounded to float32.
 * STAXYZ holds the station offsets rotated into the geocentric frame (FRAME = 'GEOCENTRIC'), ARRAYX..Z the
 * array centre on the WGS84 ellipsoid (a = 6378137 m, 1/f = 298.257223563, from memory). OI_TARGET gets
 * EQUINOX 2000, zero velocities, proper motions, parallax and errors, VELTYP 'UNKNOWN', VELDEF 'OPTICAL',
 * SPECTYP 'UNKNOWN' and CATEGORY 'SCI'. The primary header has the mandatory OIFITS 2 keywords (OBSERVER and
 * INSMODE 'UNKNOWN'; set others with `writeOifits(ds, { primary })`).
 *
 * @example
 * ```ts
 * const ds = planObservation({
 *   target: { name: 'Kestrel Minor', ra: 123.4, dec: -30 },
 *   array: { name: 'TALLGRASS', latitude: -30, stations: [
 *     { name: 'TG1', east: 0, north: 0 }, { name: 'TG2', east: 100, north: 0 }, { name: 'TG3', east: 0, north: 50 },
 *   ] },
 *   instrument: { name: 'REEDPIPE', wavelengths: [2e-6], bandwidths: 1e-7 },
 *   hourAngles: [0, 1], mjd: 60400.25,
 * });
 * ds.vis2.length;  // 6: 2 snapshots x 3 baselines x 1 channel
 * ds.vis2.u[0];    // 5.00000001e7 cycles per radian: TG1-TG2 at hour angle 0 (100 m / float32(2 um)); v = 0
 * ds.t3.length;    // 2
 * ```
 */
export function planObservation(options: PlanObservationOptions): OifitsDataset {
  if (typeof options !== 'object' || options === null)
    bad('options', `= ${showValue(options)}; give an object`);
  const file = options.name === undefined ? '<planned>' : asciiName(options.name, 'name');

  // Target.
  const target = options.target;
  if (typeof target !== 'object' || target === null) bad('target', 'must be an object { name, ra, dec }');
  const targetName = asciiName(target.name, 'target.name');
  const ra = inRange(target.ra, 'target.ra', 0, 360, 'degrees', true);
  const dec = inRange(target.dec, 'target.dec', -90, 90, 'degrees');

  // Array.
  const array = options.array;
  if (typeof array !== 'object' || array === null) {
    bad('array', 'must be an object { name, latitude, stations }');
  }
  const arrname = asciiName(array.name, 'array.name');
  const latitude = inRange(array.latitude, 'array.latitude', -90, 90, 'degrees');
  const longitude =
    array.longitude === undefined ? 0 : inRange(array.longitude, 'array.longitude', -360, 360, 'degrees');
  const altitude =
    array.altitude === undefined ? 0 : finite(array.altitude, 'array.altitude', 'a finite number of metres');
  const stations = array.stations;
  if (!Array.isArray(stations) || stations.length < 2) {
    bad(
      'array.stations',
      `must be an array of at least 2 stations { name, east, north, up? }, got ${Array.isArray(stations) ? `${stations.length}` : showValue(stations)}`,
    );
  }
  const nsta = stations.length;
  const names = new Map<string, number>();
  const enu: Array<[number, number, number]> = [];
  const diameters: number[] = [];
  const telNames: string[] = [];
  stations.forEach((s: PlanStation, k) => {
    const at = `array.stations[${k}]`;
    if (typeof s !== 'object' || s === null) bad(at, 'must be an object { name, east, north, up? }', k);
    const name = asciiName(s.name, `${at}.name`);
    if (names.has(name)) {
      bad(
        `${at}.name`,
        `= ${JSON.stringify(name)} is also station ${names.get(name)}; names must be unique`,
        k,
      );
    }
    names.set(name, k);
    enu.push([
      finite(s.east, `${at}.east`, 'a finite number of metres'),
      finite(s.north, `${at}.north`, 'a finite number of metres'),
      s.up === undefined ? 0 : finite(s.up, `${at}.up`, 'a finite number of metres'),
    ]);
    diameters.push(s.diameter === undefined ? Number.NaN : positive(s.diameter, `${at}.diameter`, 'metres'));
    telNames.push(s.telescope === undefined ? name : asciiName(s.telescope, `${at}.telescope`));
  });

  // Instrument.
  const instrument = options.instrument;
  if (typeof instrument !== 'object' || instrument === null) {
    bad('instrument', 'must be an object { name, wavelengths, bandwidths }');
  }
  const insname = asciiName(instrument.name, 'instrument.name');
  const waves = arrayLike(instrument.wavelengths, 'instrument.wavelengths', 'wavelengths in metres');
  const nwave = waves.length;
  const effWave = new Float64Array(nwave);
  for (let c = 0; c < nwave; c++) {
    const w = positive(waves[c], `instrument.wavelengths[${c}]`, 'metres');
    const f32 = Math.fround(w);
    if (!(f32 > 0) || !Number.isFinite(f32)) {
      bad(`instrument.wavelengths[${c}]`, `= ${w} m is outside the range of a 32-bit float (TFORM E)`);
    }
    effWave[c] = w;
  }
  const effBand = new Float64Array(nwave);
  const bw = instrument.bandwidths;
  if (typeof bw === 'number') {
    const b = finite(bw, 'instrument.bandwidths', 'a finite number of metres >= 0');
    if (b < 0) bad('instrument.bandwidths', `= ${b}; a bandwidth must be >= 0 metres`);
    effBand.fill(b);
  } else {
    const list = arrayLike(bw, 'instrument.bandwidths', 'bandwidths in metres (or one number)');
    if (list.length !== nwave) {
      bad(
        'instrument.bandwidths',
        `has ${list.length} values; give one number or one per wavelength (${nwave})`,
      );
    }
    for (let c = 0; c < nwave; c++) {
      const b = finite(list[c], `instrument.bandwidths[${c}]`, 'a finite number of metres >= 0');
      if (b < 0) bad(`instrument.bandwidths[${c}]`, `= ${b}; a bandwidth must be >= 0 metres`);
      effBand[c] = b;
    }
  }

  // Snapshots.
  const has = arrayLike(options.hourAngles, 'hourAngles', 'hour angles in hours');
  const nsnap = has.length;
  const hourAngles = new Float64Array(nsnap);
  for (let k = 0; k < nsnap; k++)
    hourAngles[k] = finite(has[k], `hourAngles[${k}]`, 'a finite number of hours');
  const mjd0 = inRange(options.mjd, 'mjd', 0, MJD_MAX, 'days');
  const mjds = new Float64Array(nsnap);
  for (let k = 0; k < nsnap; k++) {
    mjds[k] = mjd0 + ((hourAngles[k]! - hourAngles[0]!) / 24) * SOLAR_PER_SIDEREAL;
    if (!(mjds[k]! >= 0 && mjds[k]! <= MJD_MAX)) {
      bad(
        `hourAngles[${k}]`,
        `= ${hourAngles[k]} puts the snapshot at MJD ${mjds[k]}, outside [0, ${MJD_MAX}]`,
        k,
      );
    }
  }
  const intTime =
    options.intTime === undefined ? 60 : finite(options.intTime, 'intTime', 'a number of seconds >= 0');
  if (intTime < 0) bad('intTime', `= ${intTime}; it must be >= 0 seconds`);

  // Baselines and triangles.
  let pairs: Array<[number, number]>;
  if (options.baselines === undefined) {
    pairs = [];
    for (let i = 0; i < nsta; i++) for (let j = i + 1; j < nsta; j++) pairs.push([i, j]);
  } else {
    if (!Array.isArray(options.baselines) || options.baselines.length === 0) {
      bad('baselines', 'must be a non-empty array of station-name pairs, e.g. [["TG1", "TG2"]]');
    }
    const seen = new Set<string>();
    pairs = options.baselines.map((p: readonly [string, string], k): [number, number] => {
      if (!Array.isArray(p) || p.length !== 2) bad(`baselines[${k}]`, 'must be a pair of station names', k);
      const a = stationIndex(names, p[0], `baselines[${k}][0]`);
      const b = stationIndex(names, p[1], `baselines[${k}][1]`);
      if (a === b) bad(`baselines[${k}]`, `joins station ${p[0]} to itself; give two different stations`, k);
      const key = `${Math.min(a, b)},${Math.max(a, b)}`;
      if (seen.has(key)) bad(`baselines[${k}]`, `repeats the baseline ${p[0]}-${p[1]}; give each once`, k);
      seen.add(key);
      return [a, b];
    });
  }
  let triples: Array<[number, number, number]>;
  if (options.triangles === undefined) {
    triples = [];
    for (let i = 0; i < nsta; i++)
      for (let j = i + 1; j < nsta; j++) for (let k = j + 1; k < nsta; k++) triples.push([i, j, k]);
  } else {
    if (!Array.isArray(options.triangles)) {
      bad('triangles', 'must be an array of station-name triples, e.g. [["TG1", "TG2", "TG3"]]');
    }
    triples = options.triangles.map((t: readonly [string, string, string], k): [number, number, number] => {
      if (!Array.isArray(t) || t.length !== 3) bad(`triangles[${k}]`, 'must be a triple of station names', k);
      const a = stationIndex(names, t[0], `triangles[${k}][0]`);
      const b = stationIndex(names, t[1], `triangles[${k}][1]`);
      const c = stationIndex(names, t[2], `triangles[${k}][2]`);
      if (a === b || b === c || a === c) bad(`triangles[${k}]`, 'must name three different stations', k);
      return [a, b, c];
    });
  }

  // Errors.
  const errors = { ...DEFAULT_ERRORS };
  if (options.errors !== undefined) {
    if (typeof options.errors !== 'object' || options.errors === null) {
      bad('errors', 'must be an object { vis2?, t3phi?, t3amp?, visamp?, visphi? }');
    }
    for (const key of Object.keys(DEFAULT_ERRORS) as (keyof PlanErrors)[]) {
      const e = options.errors[key];
      if (e !== undefined) {
        errors[key] = positive(
          e,
          `errors.${key}`,
          key === 't3phi' || key === 'visphi' ? 'degrees' : 'absolute',
        );
      }
    }
  }

  // Geometry: station positions in the equatorial frame (a rotation of the local one, so baselines are
  // differences of station positions), then per snapshot and station the (u, v) projection.
  const sp = Math.sin(latitude * RAD);
  const cp = Math.cos(latitude * RAD);
  const xyz = enu.map(([e, n, up]): [number, number, number] => [-sp * n + cp * up, e, cp * n + sp * up]);
  const sd = Math.sin(dec * RAD);
  const cd = Math.cos(dec * RAD);
  const baselineUv = (h: number, a: number, b: number): ProjectedBaseline =>
    projectEquatorial(
      xyz[b]![0] - xyz[a]![0],
      xyz[b]![1] - xyz[a]![1],
      xyz[b]![2] - xyz[a]![2],
      sd,
      cd,
      h * 15 * RAD,
    );

  const mjdStart = Math.min(...mjds);
  const dateObs = isoOfMjd(mjdStart);
  const midnight = Math.floor(mjdStart);
  const dataKeywords: HeaderCard[] = [
    { keyword: 'DATE-OBS', kind: 'string', value: dateObs },
    { keyword: 'ARRNAME', kind: 'string', value: arrname },
    { keyword: 'INSNAME', kind: 'string', value: insname },
  ];
  const flags = (rows: number) => new Uint8Array(rows * nwave);
  const filled = (rows: number, x: number) => new Float64Array(rows * nwave).fill(x);
  const timeColumns = (rows: number, per: number) => {
    const time = new Float64Array(rows);
    const mjd = new Float64Array(rows);
    for (let r = 0; r < rows; r++) {
      mjd[r] = mjds[Math.floor(r / per)]!;
      time[r] = (mjd[r]! - midnight) * 86400;
    }
    return {
      TARGET_ID: new Int16Array(rows).fill(1),
      TIME: time,
      MJD: mjd,
      INT_TIME: new Float64Array(rows).fill(intTime),
    };
  };

  // OI_VIS2 and OI_VIS rows: snapshot after snapshot, baselines in the given order.
  const nb = nsnap * pairs.length;
  const ucoord = new Float64Array(nb);
  const vcoord = new Float64Array(nb);
  const sta2 = new Int16Array(2 * nb);
  for (let s = 0, r = 0; s < nsnap; s++) {
    for (const [a, b] of pairs) {
      const p = baselineUv(hourAngles[s]!, a, b);
      ucoord[r] = p.u;
      vcoord[r] = p.v;
      sta2[2 * r] = a + 1;
      sta2[2 * r + 1] = b + 1;
      r++;
    }
  }
  const vis2 = buildTable(
    'OI_VIS2',
    dataKeywords,
    nb,
    nwave,
    {
      ...timeColumns(nb, pairs.length),
      VIS2DATA: filled(nb, 1),
      VIS2ERR: filled(nb, errors.vis2),
      UCOORD: ucoord,
      VCOORD: vcoord,
      STA_INDEX: sta2,
      FLAG: flags(nb),
    },
    file,
  );
  const vis = buildTable(
    'OI_VIS',
    dataKeywords,
    nb,
    nwave,
    {
      ...timeColumns(nb, pairs.length),
      VISAMP: filled(nb, 1),
      VISAMPERR: filled(nb, errors.visamp),
      VISPHI: filled(nb, 0),
      VISPHIERR: filled(nb, errors.visphi),
      UCOORD: ucoord,
      VCOORD: vcoord,
      STA_INDEX: sta2,
      FLAG: flags(nb),
    },
    file,
  );

  // OI_T3 rows: U1/V1 = AB, U2/V2 = BC.
  const nt = nsnap * triples.length;
  const u1 = new Float64Array(nt);
  const v1 = new Float64Array(nt);
  const u2 = new Float64Array(nt);
  const v2 = new Float64Array(nt);
  const sta3 = new Int16Array(3 * nt);
  for (let s = 0, r = 0; s < nsnap; s++) {
    for (const [a, b, c] of triples) {
      const ab = baselineUv(hourAngles[s]!, a, b);
      const bc = baselineUv(hourAngles[s]!, b, c);
      u1[r] = ab.u;
      v1[r] = ab.v;
      u2[r] = bc.u;
      v2[r] = bc.v;
      sta3[3 * r] = a + 1;
      sta3[3 * r + 1] = b + 1;
      sta3[3 * r + 2] = c + 1;
      r++;
    }
  }
  const t3 =
    nt === 0
      ? []
      : [
          buildTable(
            'OI_T3',
            dataKeywords,
            nt,
            nwave,
            {
              ...timeColumns(nt, triples.length),
              T3AMP: filled(nt, 1),
              T3AMPERR: filled(nt, errors.t3amp),
              T3PHI: filled(nt, 0),
              T3PHIERR: filled(nt, errors.t3phi),
              U1COORD: u1,
              V1COORD: v1,
              U2COORD: u2,
              V2COORD: v2,
              STA_INDEX: sta3,
              FLAG: flags(nt),
            },
            file,
          ),
        ];

  // OI_TARGET, OI_ARRAY, OI_WAVELENGTH.
  const targetTable = buildTable(
    'OI_TARGET',
    [],
    1,
    nwave,
    {
      TARGET_ID: [1],
      TARGET: [targetName],
      RAEP0: [ra],
      DECEP0: [dec],
      EQUINOX: [2000],
      RA_ERR: [0],
      DEC_ERR: [0],
      SYSVEL: [0],
      VELTYP: ['UNKNOWN'],
      VELDEF: ['OPTICAL'],
      PMRA: [0],
      PMDEC: [0],
      PMRA_ERR: [0],
      PMDEC_ERR: [0],
      PARALLAX: [0],
      PARA_ERR: [0],
      SPECTYP: ['UNKNOWN'],
      CATEGORY: ['SCI'],
    },
    file,
  );
  // Equatorial (X to the local meridian, Y east) to geocentric (X to longitude 0, Y to longitude 90 E).
  const sl = Math.sin(longitude * RAD);
  const cl = Math.cos(longitude * RAD);
  const staxyz = new Float64Array(3 * nsta);
  xyz.forEach(([x, y, z], k) => {
    staxyz[3 * k] = cl * x - sl * y;
    staxyz[3 * k + 1] = sl * x + cl * y;
    staxyz[3 * k + 2] = z;
  });
  const [ax, ay, az] = geocentric(latitude, longitude, altitude);
  const arrayTable = buildTable(
    'OI_ARRAY',
    [
      { keyword: 'ARRNAME', kind: 'string', value: arrname },
      { keyword: 'FRAME', kind: 'string', value: 'GEOCENTRIC' },
      { keyword: 'ARRAYX', kind: 'float', value: ax, comment: '[m] array centre, geocentric' },
      { keyword: 'ARRAYY', kind: 'float', value: ay, comment: '[m]' },
      { keyword: 'ARRAYZ', kind: 'float', value: az, comment: '[m]' },
    ],
    nsta,
    nwave,
    {
      TEL_NAME: telNames,
      STA_NAME: [...names.keys()],
      STA_INDEX: Array.from({ length: nsta }, (_, k) => k + 1),
      DIAMETER: diameters,
      STAXYZ: staxyz,
      FOV: new Float64Array(nsta).fill(Number.NaN),
      FOVTYPE: new Array<string>(nsta).fill('FWHM'),
    },
    file,
  );
  const wavelengthTable = buildTable(
    'OI_WAVELENGTH',
    [{ keyword: 'INSNAME', kind: 'string', value: insname }],
    nwave,
    nwave,
    { EFF_WAVE: effWave, EFF_BAND: effBand },
    file,
  );

  const tables: OiTables = Object.freeze({
    target: Object.freeze([targetTable]),
    array: Object.freeze([arrayTable]),
    wavelength: Object.freeze([wavelengthTable]),
    corr: Object.freeze([]),
    vis: Object.freeze([vis]),
    vis2: Object.freeze([vis2]),
    t3: Object.freeze(t3),
    flux: Object.freeze([]),
  });
  const primary = new FitsHeader([
    { keyword: 'SIMPLE', kind: 'logical', value: true, comment: 'conforms to FITS standard' },
    { keyword: 'BITPIX', kind: 'integer', value: 8, comment: 'array data type' },
    { keyword: 'NAXIS', kind: 'integer', value: 0, comment: 'no primary data array' },
    { keyword: 'EXTEND', kind: 'logical', value: true, comment: 'extensions follow' },
    { keyword: 'ORIGIN', kind: 'string', value: 'uvsky' },
    {
      keyword: 'DATE',
      kind: 'string',
      value:
        options.date === undefined ? new Date().toISOString().slice(0, 19) : asciiName(options.date, 'date'),
    },
    { keyword: 'DATE-OBS', kind: 'string', value: dateObs },
    { keyword: 'CONTENT', kind: 'string', value: 'OIFITS2' },
    { keyword: 'TELESCOP', kind: 'string', value: arrname },
    { keyword: 'INSTRUME', kind: 'string', value: insname },
    { keyword: 'OBSERVER', kind: 'string', value: 'UNKNOWN' },
    { keyword: 'OBJECT', kind: 'string', value: targetName },
    { keyword: 'INSMODE', kind: 'string', value: 'UNKNOWN' },
    { keyword: 'COMMENT', kind: 'commentary', comment: 'Planned observation: placeholder observables.' },
  ]);
  const warnings = new Warnings(file);
  const targets = validateTables(tables, 2, file, warnings);
  const views = flattenTables(tables, targets);
  return Object.freeze({
    name: file,
    version: 2 as const,
    primary,
    tables,
    targets: Object.freeze(targets),
    ...views,
    warnings: Object.freeze([...warnings.list]),
  });
}
