/**
 * `npm run demo`: fits the bundled invented observation docs/demo/kestrel-minor.fits (the invented star
 * "Kestrel Minor" seen by the invented array TALLGRASS; made by docs/demo/make-demo-data.ts), prints the fit
 * report and writes SVG plots beside the file: V^2 against spatial frequency, closure phase against the longest
 * baseline of each triangle, normalised residuals, and the fitted model's image.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { companionSearch, type FitResult, fit } from '../fit/index.js';
import { renderImage } from '../image/render.js';
import { limbDarkenedDisk, linearLaw, param, point, sum } from '../index.js';
import { readOifits } from '../oifits/index.js';
import { imageSvg, scatterSvg } from './svg.js';

const here = dirname(fileURLToPath(import.meta.url));
const file = resolve(here, '../../docs/demo/kestrel-minor.fits');
const outDir = dirname(file);
const data = readOifits(readFileSync(file), { name: 'kestrel-minor.fits' });

console.log(`uvsky demo: ${data.name}`);
console.log(
  `  target ${data.targets.map((t) => t.name).join(', ')}; ${data.vis2.length} V^2, ${data.t3.length} closure phases, ` +
    `${new Set(Array.from(data.vis2.wavelength)).size} channels`,
);

// 1. is there a companion? search a grid around a single star; the limb-darkening coefficient is held at a
//    value a model atmosphere would give (invented here), as is common practice for marginally resolved stars
const LIMB = linearLaw(0.35);
const star = limbDarkenedDisk({ diameter: param('diameter', 1.5, { min: 0, max: 10 }), law: LIMB });
const axis = [-9, -6, -3, 0, 3, 6, 9];
const search = companionSearch(star, data, { east: axis, north: axis, observables: ['vis2', 't3phi'] });
console.log(
  `\ncompanion search (${axis.length}x${axis.length} starts, V^2 + T3PHI): chi2 single ${search.single.chi2.toFixed(1)}, ` +
    `binary ${search.grid.best.chi2.toFixed(1)}, delta chi2 ${search.deltaChi2.toFixed(1)} -> ` +
    `${Number.isFinite(search.significance) ? search.significance.toFixed(1) : '> 37'} sigma (chi2 with 3 dof)`,
);

// 2. refine the binary from the best grid node with every observable
const b = search.grid.best.values;
const binary = sum(
  limbDarkenedDisk({ diameter: param('diameter', b.diameter!, { min: 0, max: 10 }), law: LIMB }),
  point()
    .weight(param('flux', b.companionFlux!, { min: 0, max: 1 }))
    .shift(param('east', b.companionEast!), param('north', b.companionNorth!)),
);
const result = fit(binary, data);
printReport(result);

// 3. plots
const best = result.model;
const res = result.residuals;
const colours = ['#3b6fb6', '#2f9e8f', '#7fb13b', '#d9a21b', '#d9651b', '#b6303b'];
const waves = [...new Set(Array.from(data.vis2.wavelength))].sort();
const colourOf = (w: number) => colours[Math.max(0, waves.indexOf(w)) % colours.length]!;

const vis2 = res.observables.find((o) => o.observable === 'vis2')!;
const q = (i: number) => Math.hypot(data.vis2.u[i]!, data.vis2.v[i]!) / 1e6;
const series = waves.map((w) => {
  const idx = Array.from(vis2.index).filter((i) => data.vis2.wavelength[i] === w);
  return {
    x: idx.map(q),
    y: idx.map((i) => data.vis2.value[i]!),
    err: idx.map((i) => data.vis2.error[i]!),
    color: colourOf(w),
    label: `${(w * 1e6).toFixed(2)} micron`,
  };
});
const order = Array.from(vis2.index).sort((a, c) => q(a) - q(c));
writeFileSync(
  join(outDir, 'vis2.svg'),
  scatterSvg(
    [
      ...series,
      {
        x: order.map(q),
        y: order.map((i) => vis2.model[Array.from(vis2.index).indexOf(i)]!),
        color: '#222',
        kind: 'line',
      },
    ],
    {
      title: 'Kestrel Minor: V^2 by channel and the fitted model (black)',
      xLabel: 'spatial frequency (Mcycles/rad)',
      yLabel: 'V^2',
    },
  ),
);

const t3 = res.observables.find((o) => o.observable === 't3phi')!;
const qmax = (i: number) => {
  const { u1, v1, u2, v2 } = data.t3;
  return (
    Math.max(
      Math.hypot(u1[i]!, v1[i]!),
      Math.hypot(u2[i]!, v2[i]!),
      Math.hypot(u1[i]! + u2[i]!, v1[i]! + v2[i]!),
    ) / 1e6
  );
};
const tIdx = Array.from(t3.index);
writeFileSync(
  join(outDir, 'closure-phase.svg'),
  scatterSvg(
    [
      {
        x: tIdx.map(qmax),
        y: tIdx.map((i) => data.t3.t3phi[i]!),
        err: tIdx.map((i) => data.t3.t3phiError[i]!),
        color: '#3b6fb6',
        label: 'data',
      },
      { x: tIdx.map(qmax), y: Array.from(t3.model), color: '#222', label: 'model', radius: 1.2 },
    ],
    {
      title: 'Kestrel Minor: closure phases',
      xLabel: 'longest baseline of the triangle (Mcycles/rad)',
      yLabel: 'T3PHI (degrees)',
      hline: 0,
    },
  ),
);

writeFileSync(
  join(outDir, 'residuals.svg'),
  scatterSvg(
    res.observables.map((o, k) => ({
      x: Array.from(o.normalised, (_, i) => i + res.observables.slice(0, k).reduce((a, p) => a + p.count, 0)),
      y: o.normalised,
      color: colours[k % colours.length]!,
      label: o.observable.toUpperCase(),
    })),
    {
      title: 'Normalised residuals (model - data) / error',
      xLabel: 'data point',
      yLabel: 'residual (sigma)',
      hline: 0,
    },
  ),
);

const fov = 24;
const n = 128;
writeFileSync(
  join(outDir, 'model-image.svg'),
  imageSvg(
    renderImage(best, { pixels: n, fov, smoothing: 0.6 }).intensity,
    n,
    fov,
    'Fitted model seen with a 0.6 mas beam (north up, east left)',
  ),
);
console.log(`\nwrote vis2.svg, closure-phase.svg, residuals.svg, model-image.svg in ${outDir}`);

function printReport(r: FitResult): void {
  console.log(`\nfit: ${r.model.toString()}`);
  console.log(`  stopped: ${r.reason} after ${r.iterations} iterations`);
  console.log(`  chi2 ${r.chi2.toFixed(2)}, dof ${r.dof}, reduced chi2 ${r.reducedChi2.toFixed(3)}`);
  for (const [o, s] of Object.entries(r.perObservable)) {
    console.log(
      `    ${o.padEnd(7)} chi2 ${s!.chi2.toFixed(1).padStart(8)} over ${String(s!.count).padStart(4)} points`,
    );
  }
  console.log('\n  parameter        value     +- (errors as given)   +- (scaled by reduced chi2)');
  for (const p of r.parameters) {
    console.log(
      `  ${p.padEnd(10)} ${r.values[p]!.toFixed(5).padStart(11)} ${r.uncertainties[p]!.toExponential(2).padStart(20)} ${r.scaledUncertainties[p]!.toExponential(2).padStart(28)}`,
    );
  }
  console.log('\n  correlation');
  console.log(`  ${''.padEnd(10)}${r.parameters.map((p) => p.padStart(10)).join('')}`);
  r.parameters.forEach((p, i) => {
    console.log(`  ${p.padEnd(10)}${r.correlation[i]!.map((c) => c.toFixed(3).padStart(10)).join('')}`);
  });
}
