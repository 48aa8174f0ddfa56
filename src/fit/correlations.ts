/**
 * Correlated errors from OI_CORR: the correlation matrix between data values that an OIFITS 2 file may carry
 * (OI_CORR rows IINDX, JINDX, CORR, with data tables pointing into it through CORRNAME and CORRINDX_<column>).
 *
 * With R the correlation matrix of the normalised residuals r, chi2 = r^T R^-1 r. Each connected group of
 * correlated values is whitened by the Cholesky factor R = L L^T (r' = L^-1 r, J' = L^-1 J), so the least-squares
 * machinery is unchanged. Values without correlations are left alone.
 *
 * @module
 */
import { FitError } from '../errors.js';
import { column, numeric } from '../oifits/columns.js';
import type { OifitsDataset, OiTable } from '../oifits/dataset.js';
import type { DataBlock, FitObservable } from './data.js';

/** Dense Cholesky factors of the correlated groups of a stacked residual vector. */
export interface Whitening {
  readonly groups: readonly { readonly positions: Int32Array; readonly l: Float64Array }[];
  /** Number of residuals that sit in a correlated group. */
  readonly correlated: number;
}

const SOURCE: Record<FitObservable, { kind: 'vis2' | 't3' | 'vis'; column: string }> = {
  vis2: { kind: 'vis2', column: 'CORRINDX_VIS2DATA' },
  t3phi: { kind: 't3', column: 'CORRINDX_T3PHI' },
  t3amp: { kind: 't3', column: 'CORRINDX_T3AMP' },
  visamp: { kind: 'vis', column: 'CORRINDX_VISAMP' },
  visphi: { kind: 'vis', column: 'CORRINDX_VISPHI' },
};

function view(dataset: OifitsDataset, kind: 'vis2' | 't3' | 'vis') {
  return dataset[kind];
}

/**
 * Builds the whitening of the residual vector stacked from `blocks`, or null when the dataset has no usable
 * correlations.
 *
 * @param dataset - the dataset the blocks came from
 * @param blocks - the data blocks in stacking order
 * @throws FitError when a correlation group is not positive definite (naming the OI_CORR table)
 */
export function correlationWhitening(dataset: OifitsDataset, blocks: readonly DataBlock[]): Whitening | null {
  if (dataset.tables.corr.length === 0) return null;
  // correlation index (per CORRNAME) -> stacked position
  const where = new Map<string, Map<number, number>>();
  let offset = 0;
  for (const b of blocks) {
    const src = SOURCE[b.observable];
    const flat = view(dataset, src.kind);
    const tables: readonly OiTable[] = dataset.tables[src.kind];
    for (let k = 0; k < b.index.length; k++) {
      const i = b.index[k]!;
      const t = tables[flat.table[i]!];
      const name = t?.corrname;
      if (!t || !name) continue;
      const c = column(t, src.column);
      if (!c) continue;
      const first = numeric(c)[flat.row[i]!]!;
      if (!(first >= 1)) continue; // CORRINDX absent for this row
      let m = where.get(name);
      if (!m) {
        m = new Map();
        where.set(name, m);
      }
      m.set(first + flat.channel[i]!, offset + k);
    }
    offset += b.data.length;
  }
  // union-find over stacked positions, collecting correlation entries
  const parent = new Map<number, number>();
  const find = (x: number): number => {
    let r = x;
    while (parent.get(r) !== undefined && parent.get(r) !== r) r = parent.get(r)!;
    parent.set(x, r);
    return r;
  };
  const edges: [number, number, number, string][] = [];
  for (const ct of dataset.tables.corr) {
    const m = where.get(ct.corrname ?? '');
    if (!m) continue;
    const ii = column(ct, 'IINDX');
    const jj = column(ct, 'JINDX');
    const cc = column(ct, 'CORR');
    if (!ii || !jj || !cc) continue;
    const iv = numeric(ii);
    const jv = numeric(jj);
    const cv = numeric(cc);
    for (let r = 0; r < iv.length; r++) {
      const a = m.get(iv[r]!);
      const b = m.get(jv[r]!);
      const rho = cv[r]!;
      if (a === undefined || b === undefined || a === b || rho === 0 || !Number.isFinite(rho)) continue;
      if (!parent.has(a)) parent.set(a, a);
      if (!parent.has(b)) parent.set(b, b);
      parent.set(find(a), find(b));
      edges.push([a, b, rho, ct.corrname ?? '']);
    }
  }
  if (edges.length === 0) return null;
  const members = new Map<number, number[]>();
  for (const p of parent.keys()) {
    const r = find(p);
    const list = members.get(r);
    if (list) list.push(p);
    else members.set(r, [p]);
  }
  const byRoot = new Map<number, [number, number, number, string][]>();
  for (const e of edges) {
    const r = find(e[0]);
    const list = byRoot.get(r);
    if (list) list.push(e);
    else byRoot.set(r, [e]);
  }
  const groups: { positions: Int32Array; l: Float64Array }[] = [];
  let correlated = 0;
  for (const [root, list] of members) {
    const positions = Int32Array.from(list.sort((x, y) => x - y));
    const m = positions.length;
    const local = new Map<number, number>();
    for (let k = 0; k < m; k++) local.set(positions[k]!, k);
    const a = new Float64Array(m * m);
    for (let k = 0; k < m; k++) a[k * m + k] = 1;
    let name = '';
    for (const [p, q, rho, n] of byRoot.get(root) ?? []) {
      const x = local.get(p)!;
      const y = local.get(q)!;
      a[x * m + y] = rho;
      a[y * m + x] = rho;
      name = n;
    }
    // Cholesky, lower triangle in place
    for (let j = 0; j < m; j++) {
      let d = a[j * m + j]!;
      for (let k = 0; k < j; k++) d -= a[j * m + k]! ** 2;
      if (!(d > 0)) {
        throw new FitError(
          `fit: the correlations of OI_CORR '${name}' are not positive definite (a group of ${m} values); ` +
            'every correlation matrix must be; check CORR, IINDX and JINDX',
          { table: 'OI_CORR', file: dataset.name },
        );
      }
      const ljj = Math.sqrt(d);
      a[j * m + j] = ljj;
      for (let i = j + 1; i < m; i++) {
        let s = a[i * m + j]!;
        for (let k = 0; k < j; k++) s -= a[i * m + k]! * a[j * m + k]!;
        a[i * m + j] = s / ljj;
      }
      for (let k = j + 1; k < m; k++) a[j * m + k] = 0;
    }
    groups.push({ positions, l: a });
    correlated += m;
  }
  return { groups, correlated };
}

/**
 * Replaces r by L^-1 r in each correlated group (and the Jacobian rows likewise), in place.
 * @param w - the whitening
 * @param r - stacked residuals
 * @param jac - optional row-major Jacobian with `cols` columns
 * @param cols - columns of `jac`
 */
export function whiten(w: Whitening, r: Float64Array, jac?: Float64Array, cols = 0): void {
  for (const g of w.groups) {
    const m = g.positions.length;
    const l = g.l;
    const y = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      let s = r[g.positions[i]!]!;
      for (let k = 0; k < i; k++) s -= l[i * m + k]! * y[k]!;
      y[i] = s / l[i * m + i]!;
    }
    for (let i = 0; i < m; i++) r[g.positions[i]!] = y[i]!;
    if (jac && cols > 0) {
      for (let c = 0; c < cols; c++) {
        for (let i = 0; i < m; i++) {
          let s = jac[g.positions[i]! * cols + c]!;
          for (let k = 0; k < i; k++) s -= l[i * m + k]! * y[k]!;
          y[i] = s / l[i * m + i]!;
        }
        for (let i = 0; i < m; i++) jac[g.positions[i]! * cols + c] = y[i]!;
      }
    }
  }
}
