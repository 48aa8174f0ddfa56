// Node ESM smoke test of the built package, imported by its package name through the exports map.
import { disk, point, sum } from 'uvsky';

const v2 = sum(disk({ diameter: 2 }), point().weight(0.1).shift(3, 0)).vis2([0, 5e7], [0, 0]);
if (Math.abs(v2[0] - 1) > 1e-12 || !(v2[1] > 0 && v2[1] < 1))
  throw new Error(`node ESM smoke test: V^2 ${v2}`);
console.log('node ESM smoke test passed');
