/**
 * Plain-text tables for the terminal: columns padded to their widest cell, numbers right-aligned.
 *
 * @module
 */

/** One column: its heading and whether its cells are right-aligned (numbers). */
export interface Column {
  readonly title: string;
  readonly right?: boolean;
}

/** Formats rows of cells under headings, two spaces between columns, a rule under the headings. */
export function formatTable(columns: readonly Column[], rows: readonly (readonly string[])[]): string {
  const widths = columns.map((c, k) => Math.max(c.title.length, ...rows.map((r) => (r[k] ?? '').length)));
  const line = (cells: readonly string[]) =>
    cells
      .map((s, k) => (columns[k]!.right ? s.padStart(widths[k]!) : s.padEnd(widths[k]!)))
      .join('  ')
      .trimEnd();
  return [line(columns.map((c) => c.title)), line(widths.map((w) => '-'.repeat(w))), ...rows.map(line)].join(
    '\n',
  );
}

/** A number with `digits` significant digits, or '-' for NaN and infinities. */
export function fmt(x: number, digits = 6): string {
  if (!Number.isFinite(x)) return '-';
  if (x !== 0 && (Math.abs(x) >= 1e7 || Math.abs(x) < 1e-4)) return x.toExponential(digits - 1);
  return Number(x.toPrecision(digits)).toString();
}
