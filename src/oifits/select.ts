/**
 * Selecting part of a dataset by target, wavelength, baseline, MJD and flags.
 *
 * @module
 */
import { InputError } from '../errors.js';
import { column, numeric } from './columns.js';
import type { OifitsDataset, OiTable, OiTables } from './dataset.js';
import { rebuild, subsetTable } from './edit.js';
import { flattenTables } from './flatten.js';

/** A closed interval [min, max]. */
export type Range = readonly [number, number];

/** Criteria of {@link selectOifits}; every one given must hold (they combine with AND). */
export interface OifitsSelection {
  /** Targets to keep, by TARGET name or TARGET_ID. */
  readonly target?: string | number | readonly (string | number)[];
  /** Channels with EFF_WAVE in [min, max], metres. */
  readonly wavelength?: Range;
  /**
   * Records whose projected baseline length sqrt(UCOORD^2 + VCOORD^2) lies in [min, max], metres; for OI_T3
   * all three baselines of the triangle (AB, BC and AC = AB + BC) must lie in the range; OI_FLUX records
   * have no baseline and are kept.
   */
  readonly baseline?: Range;
  /** Records with MJD in [min, max], days. */
  readonly mjd?: Range;
  /** `'drop'` leaves flagged entries out of the flat views; `'keep'` (default) keeps them with flag = 1. */
  readonly flagged?: 'keep' | 'drop';
}

function checkRange(r: Range | undefined, name: string): void {
  if (r === undefined) return;
  if (!Array.isArray(r) || r.length !== 2 || !(r[0] <= r[1]) || Number.isNaN(r[0]) || Number.isNaN(r[1])) {
    throw new InputError(
      `selectOifits: ${name} must be a [min, max] pair of numbers with min <= max, got ${JSON.stringify(r)}`,
      { argument: name },
    );
  }
}

const inRange = (x: number, r: Range | undefined) => r === undefined || (x >= r[0] && x <= r[1]);

/**
 * Selects part of a dataset. Rows (records) and channels that fail the criteria are removed from the raw
 * tables (OI_WAVELENGTH tables lose the channels outside the wavelength range, and every data table with
 * them), so that the result can be written and read back; flagged entries can also be left out of the flat
 * views.
 *
 * @param dataset - the dataset (not changed)
 * @param selection - criteria (wavelength and baseline in metres, MJD in days)
 * @returns a new dataset; data tables left with no channel are dropped, correlation indices (CORRINDX_*,
 *   CORRNAME) of tables that lost channels are removed since they no longer apply
 * @throws InputError for a malformed range or a target that the dataset does not have
 *
 * Notes: OI_TARGET, OI_ARRAY and OI_CORR are kept whole.
 *
 * @example
 * ```ts
 * const k = selectOifits(ds, { wavelength: [2.0e-6, 2.4e-6], baseline: [0, 100], flagged: 'drop' });
 * ```
 */
export function selectOifits(dataset: OifitsDataset, selection: OifitsSelection): OifitsDataset {
  checkRange(selection.wavelength, 'wavelength');
  checkRange(selection.baseline, 'baseline');
  checkRange(selection.mjd, 'mjd');
  let ids: Set<number> | undefined;
  if (selection.target !== undefined) {
    const list = Array.isArray(selection.target) ? selection.target : [selection.target];
    ids = new Set();
    for (const t of list as (string | number)[]) {
      const found = dataset.targets.find((x) => x.id === t || x.name === t);
      if (!found) {
        throw new InputError(
          `selectOifits: the dataset has no target ${JSON.stringify(t)}; it has ${dataset.targets.map((x) => `${x.id} ${JSON.stringify(x.name)}`).join(', ')}`,
          { argument: 'target' },
        );
      }
      ids.add(found.id);
    }
  }
  const warnings = [...dataset.warnings];
  // Channels kept per INSNAME.
  const keepChannels = new Map<string, number[]>();
  const nwave = new Map<string, number>();
  const wavelength: OiTable[] = [];
  for (const t of dataset.tables.wavelength) {
    const w = numeric(column(t, 'EFF_WAVE')!);
    const keep: number[] = [];
    for (let i = 0; i < t.nrows; i++) if (inRange(w[i]!, selection.wavelength)) keep.push(i);
    keepChannels.set(t.insname ?? '', keep);
    nwave.set(t.insname ?? '', t.nrows);
    if (keep.length === 0) continue;
    wavelength.push(keep.length === t.nrows ? t : subsetTable(t, keep));
  }
  const selectData = (list: readonly OiTable[]): OiTable[] => {
    const out: OiTable[] = [];
    for (const t of list) {
      const ins = t.insname ?? '';
      const keep = keepChannels.get(ins) ?? [];
      const nw = nwave.get(ins) ?? 0;
      if (keep.length === 0) continue;
      const tid = numeric(column(t, 'TARGET_ID')!);
      const mjd = numeric(column(t, 'MJD')!);
      const base = baselineCheck(t, selection.baseline);
      const rows: number[] = [];
      for (let r = 0; r < t.nrows; r++) {
        if (ids && !ids.has(tid[r]!)) continue;
        if (!inRange(mjd[r]!, selection.mjd)) continue;
        if (!base(r)) continue;
        rows.push(r);
      }
      const allChannels = keep.length === nw;
      let s =
        rows.length === t.nrows && allChannels
          ? t
          : subsetTable(t, rows, allChannels ? undefined : { nwave: nw, keep });
      if (
        !allChannels &&
        (s.corrname !== undefined || s.columns.some((c) => c.name.startsWith('CORRINDX_')))
      ) {
        s = rebuild(s, {
          header: s.header.without((k) => k === 'CORRNAME'),
          columns: s.columns.filter((c) => !c.name.startsWith('CORRINDX_')),
        });
        warnings.push(
          `${dataset.name}: ${t.extname} (HDU ${t.hdu}) lost channels in a selection; its correlation indices were removed`,
        );
      }
      out.push(s);
    }
    return out;
  };
  const tables: OiTables = Object.freeze({
    target: dataset.tables.target,
    array: dataset.tables.array,
    wavelength,
    corr: dataset.tables.corr,
    vis: selectData(dataset.tables.vis),
    vis2: selectData(dataset.tables.vis2),
    t3: selectData(dataset.tables.t3),
    flux: selectData(dataset.tables.flux),
  });
  const views = flattenTables(tables, dataset.targets, { dropFlagged: selection.flagged === 'drop' });
  return Object.freeze({ ...dataset, tables, ...views, warnings: Object.freeze(warnings) });
}

function baselineCheck(t: OiTable, range: Range | undefined): (row: number) => boolean {
  if (range === undefined || t.extname === 'OI_FLUX') return () => true;
  if (t.extname === 'OI_T3') {
    const u1 = numeric(column(t, 'U1COORD')!);
    const v1 = numeric(column(t, 'V1COORD')!);
    const u2 = numeric(column(t, 'U2COORD')!);
    const v2 = numeric(column(t, 'V2COORD')!);
    return (r) =>
      inRange(Math.hypot(u1[r]!, v1[r]!), range) &&
      inRange(Math.hypot(u2[r]!, v2[r]!), range) &&
      inRange(Math.hypot(u1[r]! + u2[r]!, v1[r]! + v2[r]!), range);
  }
  const u = numeric(column(t, 'UCOORD')!);
  const v = numeric(column(t, 'VCOORD')!);
  return (r) => inRange(Math.hypot(u[r]!, v[r]!), range);
}
