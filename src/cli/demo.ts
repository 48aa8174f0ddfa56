/**
 * `npm run demo`: the invented star "Kestrel Minor" (a 1.8 mas uniform disk with a faint companion) observed by
 * the invented four-station array TALLGRASS at 1.65 micron, printed as tables of V^2 and closure phases.
 * Every name and number here is invented for the demonstration.
 */
import { disk, point, spatialFrequency, sum } from '../index.js';

/** Station positions (east, north) in metres on the invented TALLGRASS site. */
const STATIONS: Record<string, readonly [number, number]> = {
  TG1: [0, 0],
  TG2: [46.2, 12.5],
  TG3: [-18.4, 71.9],
  TG4: [88.1, -35.3],
};
const WAVELENGTH = 1.65e-6; // m

const star = disk({ diameter: 1.8 });
const companion = point().weight(0.03).shift(4.5, -2.0);
const model = sum(star, companion);

function baseline(a: string, b: string): [number, number] {
  const [ea, na] = STATIONS[a]!;
  const [eb, nb] = STATIONS[b]!;
  // baseline from the first to the second station (second minus first)
  return [spatialFrequency(eb - ea, WAVELENGTH), spatialFrequency(nb - na, WAVELENGTH)];
}

const names = Object.keys(STATIONS);
console.log(
  'Kestrel Minor (invented): a 1.8 mas uniform disk and a 3 % companion 4.5 mas east, 2.0 mas south',
);
console.log(`model: ${model.toString()}`);
console.log(`\nV^2 on the TALLGRASS baselines at ${WAVELENGTH * 1e6} micron`);
console.log('baseline   u (Mcyc/rad)   v (Mcyc/rad)     V^2');
const pairs: [string, string][] = [];
for (let i = 0; i < names.length; i++)
  for (let j = i + 1; j < names.length; j++) pairs.push([names[i]!, names[j]!]);
const uv = pairs.map(([a, b]) => baseline(a, b));
const v2 = model.vis2(
  uv.map((x) => x[0]),
  uv.map((x) => x[1]),
);
pairs.forEach(([a, b], k) => {
  const [u, v] = uv[k]!;
  console.log(
    `${`${a}-${b}`.padEnd(9)} ${(u / 1e6).toFixed(3).padStart(13)} ${(v / 1e6).toFixed(3).padStart(14)} ${v2[k]!.toFixed(5).padStart(9)}`,
  );
});

console.log('\nclosure phases (T3PHI, degrees) of the triangles');
console.log('triangle        T3PHI      T3AMP');
const triangles: [string, string, string][] = [];
for (let i = 0; i < names.length; i++)
  for (let j = i + 1; j < names.length; j++)
    for (let k = j + 1; k < names.length; k++) triangles.push([names[i]!, names[j]!, names[k]!]);
const ab = triangles.map(([a, b]) => baseline(a, b));
const bc = triangles.map(([, b, c]) => baseline(b, c));
const args = [ab.map((x) => x[0]), ab.map((x) => x[1]), bc.map((x) => x[0]), bc.map((x) => x[1])] as const;
const cp = model.closurePhase(...args);
const t3 = model.t3amp(...args);
triangles.forEach((t, k) => {
  console.log(`${t.join('-').padEnd(13)} ${cp[k]!.toFixed(3).padStart(8)} ${t3[k]!.toFixed(5).padStart(10)}`);
});
