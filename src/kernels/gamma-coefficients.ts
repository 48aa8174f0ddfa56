// generated: do not edit.
// Written by src/kernels/generate-coefficients.py with
// Python 3.11.2, mpmath 1.2.1, working precision 50 digits.
// RECIPROCAL_GAMMA: degree 17 in w = z - 3/2, largest error 1.64e-17

/** RECIPROCAL_GAMMA: 1 / Gamma(z) on 1 <= z <= 2, w = z - 3/2. */
export function reciprocalGammaOneTwo(w: number): number {
  const e0_0 = 1.1283791670955126 + -0.0411745264452831 * w;
  const e0_1 = -0.5266544355255445 + 0.17510202604393457 * w;
  const e0_2 = 0.050966860247706226 + -0.04215516936853564 * w;
  const e0_3 = 0.006612897826817975 + 0.002120731442574106 * w;
  const e0_4 = -0.0011107302544683206 + 0.00015235762074722388 * w;
  const e0_5 = 2.5355203461127087e-5 + -1.3896805511493172e-5 * w;
  const e0_6 = 2.1562132200415612e-6 + 5.7941368337736726e-8 * w;
  const e0_7 = -8.917479916008154e-8 + 1.7108133746882574e-8 * w;
  const e0_8 = -8.47528328709373e-10 + -2.7742280790863684e-10 * w;
  const w2 = w * w;
  const e1_0 = e0_0 + e0_1 * w2;
  const e1_1 = e0_2 + e0_3 * w2;
  const e1_2 = e0_4 + e0_5 * w2;
  const e1_3 = e0_6 + e0_7 * w2;
  const w4 = w2 * w2;
  const e2_0 = e1_0 + e1_1 * w4;
  const e2_1 = e1_2 + e1_3 * w4;
  const w8 = w4 * w4;
  const e3_0 = e2_0 + e2_1 * w8;
  const w16 = w8 * w8;
  const e4_0 = e3_0 + e0_8 * w16;
  return e4_0;
}
