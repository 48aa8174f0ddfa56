// generated: do not edit.
// Written by src/kernels/generate-coefficients.py with
// Python 3.11.2, mpmath 1.2.1, working precision 50 digits.
// RECIPROCAL_GAMMA: degree 17 in w = z - 3/2, largest error 1.64e-17

/** RECIPROCAL_GAMMA: 1 / Gamma(z) on 1 <= z <= 2, w = z - 3/2. */
export function reciprocalGammaOneTwo(w: number): number {
  let r = -2.7742280790863684e-10;
  r = r * w + -8.47528328709373e-10;
  r = r * w + 1.7108133746882574e-8;
  r = r * w + -8.917479916008154e-8;
  r = r * w + 5.7941368337736726e-8;
  r = r * w + 2.1562132200415612e-6;
  r = r * w + -1.3896805511493172e-5;
  r = r * w + 2.5355203461127087e-5;
  r = r * w + 0.00015235762074722388;
  r = r * w + -0.0011107302544683206;
  r = r * w + 0.002120731442574106;
  r = r * w + 0.006612897826817975;
  r = r * w + -0.04215516936853564;
  r = r * w + 0.050966860247706226;
  r = r * w + 0.17510202604393457;
  r = r * w + -0.5266544355255445;
  r = r * w + -0.0411745264452831;
  r = r * w + 1.1283791670955126;
  return r;
}
