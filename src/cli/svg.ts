/**
 * A small SVG plotter for the demo: scatter points with error bars, model curves and an intensity image, with
 * linear axes, ticks and labels. Plain strings, no dependencies.
 *
 * @module
 */

/** One series of a scatter plot. */
export interface Series {
  readonly x: ArrayLike<number>;
  readonly y: ArrayLike<number>;
  readonly err?: ArrayLike<number>;
  readonly color: string;
  /** 'points' (default) or 'line' (drawn in the order given). */
  readonly kind?: 'points' | 'line';
  readonly label?: string;
  /** Marker radius in pixels (default 2.2). */
  readonly radius?: number;
}

/** Axis and frame options. */
export interface PlotOptions {
  readonly title: string;
  readonly xLabel: string;
  readonly yLabel: string;
  readonly width?: number;
  readonly height?: number;
  readonly yRange?: readonly [number, number];
  readonly xRange?: readonly [number, number];
  /** Draw a horizontal reference line at this y. */
  readonly hline?: number;
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

function niceTicks(lo: number, hi: number, n = 6): number[] {
  const span = hi - lo || 1;
  const raw = span / n;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => span / s <= n) ?? 10 * mag;
  const out: number[] = [];
  for (let t = Math.ceil(lo / step) * step; t <= hi + 1e-9 * span; t += step)
    out.push(Math.abs(t) < 1e-12 * span ? 0 : t);
  return out;
}

function fmt(t: number): string {
  return Number.parseFloat(t.toPrecision(6)).toString();
}

function range(series: readonly Series[], pick: 'x' | 'y'): [number, number] {
  let lo = Number.POSITIVE_INFINITY;
  let hi = Number.NEGATIVE_INFINITY;
  for (const s of series) {
    for (let i = 0; i < s[pick].length; i++) {
      const v = s[pick][i]!;
      const e = pick === 'y' && s.err ? s.err[i]! : 0;
      if (!Number.isFinite(v)) continue;
      lo = Math.min(lo, v - e);
      hi = Math.max(hi, v + e);
    }
  }
  if (!Number.isFinite(lo)) return [0, 1];
  const pad = (hi - lo) * 0.04 || 1;
  return [lo - pad, hi + pad];
}

/**
 * A scatter / line plot as an SVG document.
 * @param series - data and model series
 * @param o - title, axis labels, size and ranges
 * @returns the SVG text
 */
export function scatterSvg(series: readonly Series[], o: PlotOptions): string {
  const W = o.width ?? 640;
  const H = o.height ?? 420;
  const L = 70;
  const R = 20;
  const T = 40;
  const B = 55;
  const [x0, x1] = o.xRange ?? range(series, 'x');
  const [y0, y1] = o.yRange ?? range(series, 'y');
  const sx = (x: number) => L + ((x - x0) / (x1 - x0)) * (W - L - R);
  const sy = (y: number) => H - B - ((y - y0) / (y1 - y0)) * (H - T - B);
  const parts: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="12" role="img">`,
    `<title>${esc(o.title)}</title>`,
    `<rect width="${W}" height="${H}" fill="white"/>`,
    `<text x="${W / 2}" y="22" text-anchor="middle" font-size="15">${esc(o.title)}</text>`,
    `<rect x="${L}" y="${T}" width="${W - L - R}" height="${H - T - B}" fill="none" stroke="#444"/>`,
  ];
  for (const t of niceTicks(x0, x1)) {
    parts.push(`<line x1="${sx(t)}" y1="${H - B}" x2="${sx(t)}" y2="${H - B + 5}" stroke="#444"/>`);
    parts.push(`<text x="${sx(t)}" y="${H - B + 18}" text-anchor="middle">${fmt(t)}</text>`);
  }
  for (const t of niceTicks(y0, y1)) {
    parts.push(`<line x1="${L - 5}" y1="${sy(t)}" x2="${L}" y2="${sy(t)}" stroke="#444"/>`);
    parts.push(`<text x="${L - 8}" y="${sy(t) + 4}" text-anchor="end">${fmt(t)}</text>`);
  }
  parts.push(`<text x="${(L + W - R) / 2}" y="${H - 12}" text-anchor="middle">${esc(o.xLabel)}</text>`);
  parts.push(
    `<text x="16" y="${(T + H - B) / 2}" text-anchor="middle" transform="rotate(-90 16 ${(T + H - B) / 2})">${esc(o.yLabel)}</text>`,
  );
  if (o.hline !== undefined && o.hline >= y0 && o.hline <= y1) {
    parts.push(
      `<line x1="${L}" y1="${sy(o.hline)}" x2="${W - R}" y2="${sy(o.hline)}" stroke="#999" stroke-dasharray="4 3"/>`,
    );
  }
  parts.push(
    `<clipPath id="frame"><rect x="${L}" y="${T}" width="${W - L - R}" height="${H - T - B}"/></clipPath>`,
  );
  parts.push('<g clip-path="url(#frame)">');
  for (const s of series) {
    if (s.kind === 'line') {
      const pts: string[] = [];
      for (let i = 0; i < s.x.length; i++) pts.push(`${sx(s.x[i]!).toFixed(1)},${sy(s.y[i]!).toFixed(1)}`);
      parts.push(`<polyline points="${pts.join(' ')}" fill="none" stroke="${s.color}" stroke-width="1.5"/>`);
    } else {
      for (let i = 0; i < s.x.length; i++) {
        const x = sx(s.x[i]!);
        const y = sy(s.y[i]!);
        if (!Number.isFinite(x) || !Number.isFinite(y)) continue;
        if (s.err) {
          const e = s.err[i]!;
          parts.push(
            `<line x1="${x.toFixed(1)}" y1="${sy(s.y[i]! - e).toFixed(1)}" x2="${x.toFixed(1)}" y2="${sy(s.y[i]! + e).toFixed(1)}" stroke="${s.color}" stroke-opacity="0.5"/>`,
          );
        }
        parts.push(
          `<circle cx="${x.toFixed(1)}" cy="${y.toFixed(1)}" r="${s.radius ?? 2.2}" fill="${s.color}"/>`,
        );
      }
    }
  }
  parts.push('</g>');
  const labelled = series.filter((s) => s.label);
  labelled.forEach((s, k) => {
    const y = T + 16 + 16 * k;
    parts.push(`<rect x="${W - R - 150}" y="${y - 9}" width="10" height="10" fill="${s.color}"/>`);
    parts.push(
      `<text x="${W - R - 135}" y="${y}" paint-order="stroke" stroke="white" stroke-width="3">${esc(s.label!)}</text>`,
    );
  });
  parts.push('</svg>');
  return parts.join('\n');
}

/**
 * An intensity image as an SVG document, north up and east to the left (as the trade draws the sky).
 * @param pixels - row-major, row 0 = southernmost, column 0 = westernmost... see `eastLeft`
 * @param n - pixels per side
 * @param fov - field of view in mas (the image spans -fov/2..fov/2 on both axes)
 * @param title - title text
 * @returns the SVG text
 */
export function imageSvg(pixels: Float64Array, n: number, fov: number, title: string): string {
  const size = 420;
  const L = 60;
  const T = 40;
  const W = L + size + 30;
  const H = T + size + 50;
  let max = 0;
  for (const p of pixels) max = Math.max(max, p);
  const px = size / n;
  const parts: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" font-family="sans-serif" font-size="12" role="img">`,
    `<title>${esc(title)}</title>`,
    `<rect width="${W}" height="${H}" fill="white"/>`,
    `<text x="${W / 2}" y="22" text-anchor="middle" font-size="15">${esc(title)}</text>`,
  ];
  // pixels[j * n + i]: i runs east (increasing east offset), j runs north; east is drawn to the left
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) {
      const v = Math.max(0, pixels[j * n + i]! / (max || 1));
      if (v < 0.002) continue;
      // white sky, the brightest pixels deep orange-brown
      const a = Math.sqrt(v);
      const rgb = [255 - a * (255 - 120), 255 - a * (255 - 50), 255 - a * (255 - 10)].map(Math.round);
      const x = L + (n - 1 - i) * px;
      const y = T + (n - 1 - j) * px;
      parts.push(
        `<rect x="${x.toFixed(2)}" y="${y.toFixed(2)}" width="${(px + 0.3).toFixed(2)}" height="${(px + 0.3).toFixed(2)}" fill="rgb(${rgb.join(',')})"/>`,
      );
    }
  }
  parts.push(`<rect x="${L}" y="${T}" width="${size}" height="${size}" fill="none" stroke="#444"/>`);
  for (const t of niceTicks(-fov / 2, fov / 2, 6)) {
    const x = L + size / 2 - (t / fov) * size; // east to the left
    const y = T + size / 2 - (t / fov) * size;
    parts.push(`<line x1="${x}" y1="${T + size}" x2="${x}" y2="${T + size + 5}" stroke="#444"/>`);
    parts.push(`<text x="${x}" y="${T + size + 18}" text-anchor="middle">${fmt(t)}</text>`);
    parts.push(`<line x1="${L - 5}" y1="${y}" x2="${L}" y2="${y}" stroke="#444"/>`);
    parts.push(`<text x="${L - 8}" y="${y + 4}" text-anchor="end">${fmt(t)}</text>`);
  }
  parts.push(
    `<text x="${L + size / 2}" y="${H - 12}" text-anchor="middle">east offset (mas; east to the left)</text>`,
  );
  parts.push(
    `<text x="16" y="${T + size / 2}" text-anchor="middle" transform="rotate(-90 16 ${T + size / 2})">north offset (mas)</text>`,
  );
  parts.push('</svg>');
  return parts.join('\n');
}
