/**
 * `uvsky inspect FILE`: what an OIFITS file holds.
 *
 * @module
 */
import { column, numeric } from '../../oifits/columns.js';
import type { OifitsDataset } from '../../oifits/dataset.js';
import { parse } from './args.js';
import { type CommandIo, EXIT } from './io.js';
import { loadDataset } from './load.js';
import { fmt, formatTable } from './table.js';

export const INSPECT_USAGE = 'uvsky inspect FILE [--json]';

/** The summary `inspect` prints (also its --json output). */
export interface InspectSummary {
  readonly file: string;
  readonly version: 1 | 2;
  readonly targets: readonly { id: number; name: string; ra: number; dec: number }[];
  readonly tables: readonly {
    hdu: number;
    extname: string;
    rows: number;
    insname?: string;
    arrname?: string;
  }[];
  readonly channels: readonly {
    insname: string;
    count: number;
    minWavelength: number;
    maxWavelength: number;
  }[];
  readonly baselines: readonly { stations: string; vis2: number; vis: number }[];
  readonly triangles: readonly { stations: string; t3: number }[];
  readonly counts: readonly { observable: string; entries: number; flagged: number; missing: number }[];
  readonly warnings: readonly string[];
}

function countBy(labels: readonly string[], n: number): Map<string, number> {
  const out = new Map<string, number>();
  for (let i = 0; i < n; i++) out.set(labels[i] ?? '', (out.get(labels[i] ?? '') ?? 0) + 1);
  return out;
}

function flags(flag: Uint8Array): number {
  let f = 0;
  for (const x of flag) f += x;
  return f;
}

function missing(value: Float64Array, flag: Uint8Array): number {
  let m = 0;
  for (let i = 0; i < value.length; i++) if (flag[i] === 0 && !Number.isFinite(value[i]!)) m++;
  return m;
}

/** Summarises a dataset: targets, tables, channels, baselines, triangles and counts of entries and flags. */
export function summarise(ds: OifitsDataset): InspectSummary {
  const all = [
    ...ds.tables.target,
    ...ds.tables.array,
    ...ds.tables.wavelength,
    ...ds.tables.corr,
    ...ds.tables.vis,
    ...ds.tables.vis2,
    ...ds.tables.t3,
    ...ds.tables.flux,
  ].sort((a, b) => a.hdu - b.hdu);
  const tables = all.map((t) => ({
    hdu: t.hdu,
    extname: t.extname,
    rows: t.nrows,
    ...(t.insname !== undefined ? { insname: t.insname } : {}),
    ...(t.arrname !== undefined ? { arrname: t.arrname } : {}),
  }));
  const channels = ds.tables.wavelength.map((t) => {
    const c = column(t, 'EFF_WAVE');
    const w = c ? Array.from(numeric(c)) : [];
    return {
      insname: t.insname ?? '',
      count: w.length,
      minWavelength: w.length ? Math.min(...w) : Number.NaN,
      maxWavelength: w.length ? Math.max(...w) : Number.NaN,
    };
  });
  const v2 = countBy(ds.vis2.stations, ds.vis2.length);
  const vv = countBy(ds.vis.stations, ds.vis.length);
  const names = [...new Set([...v2.keys(), ...vv.keys()])].sort();
  const baselines = names.map((s) => ({ stations: s, vis2: v2.get(s) ?? 0, vis: vv.get(s) ?? 0 }));
  const t3 = countBy(ds.t3.stations, ds.t3.length);
  const triangles = [...t3.keys()].sort().map((s) => ({ stations: s, t3: t3.get(s)! }));
  const counts = [
    {
      observable: 'vis2',
      entries: ds.vis2.length,
      flagged: flags(ds.vis2.flag),
      missing: missing(ds.vis2.value, ds.vis2.flag),
    },
    {
      observable: 'visamp',
      entries: ds.vis.length,
      flagged: flags(ds.vis.flag),
      missing: missing(ds.vis.visamp, ds.vis.flag),
    },
    {
      observable: 'visphi',
      entries: ds.vis.length,
      flagged: flags(ds.vis.flag),
      missing: missing(ds.vis.visphi, ds.vis.flag),
    },
    {
      observable: 't3amp',
      entries: ds.t3.length,
      flagged: flags(ds.t3.flag),
      missing: missing(ds.t3.t3amp, ds.t3.flag),
    },
    {
      observable: 't3phi',
      entries: ds.t3.length,
      flagged: flags(ds.t3.flag),
      missing: missing(ds.t3.t3phi, ds.t3.flag),
    },
    {
      observable: 'flux',
      entries: ds.flux.length,
      flagged: flags(ds.flux.flag),
      missing: missing(ds.flux.value, ds.flux.flag),
    },
  ];
  return {
    file: ds.name,
    version: ds.version,
    targets: ds.targets.map((t) => ({ id: t.id, name: t.name, ra: t.ra, dec: t.dec })),
    tables,
    channels,
    baselines,
    triangles,
    counts,
    warnings: ds.warnings,
  };
}

/** Renders a summary as text. */
export function formatSummary(s: InspectSummary): string {
  const parts: string[] = [`${s.file}: OIFITS ${s.version}`];
  parts.push(
    '\ntargets',
    formatTable(
      [
        { title: 'id', right: true },
        { title: 'name' },
        { title: 'ra (deg)', right: true },
        { title: 'dec (deg)', right: true },
      ],
      s.targets.map((t) => [String(t.id), t.name, fmt(t.ra, 8), fmt(t.dec, 8)]),
    ),
  );
  parts.push(
    '\ntables',
    formatTable(
      [
        { title: 'hdu', right: true },
        { title: 'table' },
        { title: 'rows', right: true },
        { title: 'instrument' },
        { title: 'array' },
      ],
      s.tables.map((t) => [String(t.hdu), t.extname, String(t.rows), t.insname ?? '', t.arrname ?? '']),
    ),
  );
  parts.push(
    '\nchannels',
    formatTable(
      [
        { title: 'instrument' },
        { title: 'channels', right: true },
        { title: 'from (µm)', right: true },
        { title: 'to (µm)', right: true },
      ],
      s.channels.map((c) => [
        c.insname,
        String(c.count),
        fmt(c.minWavelength * 1e6, 5),
        fmt(c.maxWavelength * 1e6, 5),
      ]),
    ),
  );
  if (s.baselines.length > 0) {
    parts.push(
      '\nbaselines (entries)',
      formatTable(
        [{ title: 'stations' }, { title: 'vis2', right: true }, { title: 'vis', right: true }],
        s.baselines.map((b) => [b.stations, String(b.vis2), String(b.vis)]),
      ),
    );
  }
  if (s.triangles.length > 0) {
    parts.push(
      '\ntriangles (entries)',
      formatTable(
        [{ title: 'stations' }, { title: 't3', right: true }],
        s.triangles.map((t) => [t.stations, String(t.t3)]),
      ),
    );
  }
  parts.push(
    '\nobservables',
    formatTable(
      [
        { title: 'observable' },
        { title: 'entries', right: true },
        { title: 'flagged', right: true },
        { title: 'NaN', right: true },
      ],
      s.counts
        .filter((c) => c.entries > 0)
        .map((c) => [c.observable, String(c.entries), String(c.flagged), String(c.missing)]),
    ),
  );
  if (s.warnings.length > 0) parts.push('\nwarnings', ...s.warnings.map((w) => `  ${w}`));
  return `${parts.join('\n')}\n`;
}

/** Runs `uvsky inspect`. */
export async function inspectCommand(argv: readonly string[], io: CommandIo): Promise<number> {
  const { values, positionals } = parse(
    'inspect',
    argv,
    { json: { type: 'boolean' } },
    { min: 1, max: 1, usage: INSPECT_USAGE },
  );
  const summary = summarise(await loadDataset(positionals[0]!, io.cwd));
  io.out(values.json ? `${JSON.stringify(summary, null, 2)}\n` : formatSummary(summary));
  return EXIT.ok;
}
