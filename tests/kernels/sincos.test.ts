import { describe, expect, it } from 'vitest';
import { exponential, lorentzian, point, visibilityJacobian } from '../../src/index.js';
import { PLAIN_PHASE_TURNS, phaseNeedsSplit, SIN_COS, sinCosTurns } from '../../src/kernels/sincos.js';
import { RAD_PER_MAS } from '../../src/units/index.js';
import { exactTurns } from './helpers.js';

/** Absolute error allowed on sin and cos of a reduced phase (a few ulp of 1). */
const SINCOS_TOL = 4e-16;
/** Absolute error allowed on the phase ramp of a shift up to 1 arcsecond, rad. */
const PHASE_TOL = 1e-12;

describe('sinCosTurns', () => {
  it('matches Math.sin and Math.cos of the reduced phase to 4e-16 over many turns and all quadrants', () => {
    let s = 7;
    let worst = 0;
    for (let k = 0; k < 20000; k++) {
      s = (s * 1103515245 + 12345) % 2147483648;
      const t = (s / 2147483648 - 0.5) * 2000;
      sinCosTurns(t);
      const r = t - Math.round(t); // exact
      worst = Math.max(
        worst,
        Math.abs(SIN_COS[0]! - Math.sin(2 * Math.PI * r)),
        Math.abs(SIN_COS[1]! - Math.cos(2 * Math.PI * r)),
      );
    }
    expect(worst).toBeLessThan(SINCOS_TOL);
  });

  it('gives exact values at the quarter turns and the right signs in each quadrant', () => {
    const cases: [number, number, number][] = [
      [0, 0, 1],
      [0.25, 1, 0],
      [0.5, 0, -1],
      [0.75, -1, 0],
      [-0.25, -1, 0],
      [3.125, Math.SQRT1_2, Math.SQRT1_2],
    ];
    for (const [t, sin, cos] of cases) {
      sinCosTurns(t);
      expect(Math.abs(SIN_COS[0]! - sin)).toBeLessThan(SINCOS_TOL);
      expect(Math.abs(SIN_COS[1]! - cos)).toBeLessThan(SINCOS_TOL);
    }
  });

  it('keeps the whole turns of phases beyond 2^28 turns out of the reduction', () => {
    sinCosTurns(2 ** 30 + 0.25);
    expect(Math.abs(SIN_COS[0]! - 1)).toBeLessThan(SINCOS_TOL);
  });
});

describe('the phase ramp of a shifted point', () => {
  it('is within 1e-12 rad of the exact phase for shifts up to 1 arcsecond and |u|, |v| up to 3e8', () => {
    let s = 99;
    const rnd = () => {
      s = (s * 1103515245 + 12345) % 2147483648;
      return s / 2147483648 - 0.5;
    };
    let worst = 0;
    for (let k = 0; k < 20; k++) {
      const east = rnd() * 2000; // mas, up to 1 arcsecond either way
      const north = rnd() * 2000;
      const u = Float64Array.from({ length: 500 }, () => rnd() * 6e8);
      const v = Float64Array.from({ length: 500 }, () => rnd() * 6e8);
      const r = point().shift(east, north).visibilities(u, v);
      const e0 = east * RAD_PER_MAS;
      const n0 = north * RAD_PER_MAS;
      for (let i = 0; i < u.length; i++) {
        const exact = -2 * Math.PI * exactTurns(u[i]!, e0, v[i]!, n0);
        let d = Math.atan2(r.im[i]!, r.re[i]!) - exact;
        d -= 2 * Math.PI * Math.round(d / (2 * Math.PI));
        worst = Math.max(worst, Math.abs(d));
      }
    }
    expect(worst).toBeLessThan(PHASE_TOL);
  });
});

describe('the choice between the plain and the split phase', () => {
  it('takes the split phase once |u e| + |v n| can pass PLAIN_PHASE_TURNS, and for non-finite bounds', () => {
    expect(phaseNeedsSplit(1e8, 1e8, 0, 0)).toBe(false);
    expect(phaseNeedsSplit(1e8, 0, PLAIN_PHASE_TURNS / 1e8, 0)).toBe(false);
    expect(phaseNeedsSplit(1e8, 0, (1.001 * PLAIN_PHASE_TURNS) / 1e8, 0)).toBe(true);
    expect(phaseNeedsSplit(1e8, 1e8, 0.4e-6, -0.4e-6)).toBe(true);
    expect(phaseNeedsSplit(Number.NaN, 0, 1e-9, 0)).toBe(true);
  });

  const rnd = (() => {
    let s = 5;
    return () => {
      s = (s * 1103515245 + 12345) % 2147483648;
      return s / 2147483648 - 0.5;
    };
  })();
  /** Largest |phase of (V_shifted / V) - exact phase ramp| over the points where |V| > 1e-3, rad. */
  function worstRampError(
    east: number,
    north: number,
    m: typeof point,
    u: Float64Array,
    v: Float64Array,
  ): number {
    const shifted = m().shift(east, north).visibilities(u, v);
    const plain = m().visibilities(u, v);
    let worst = 0;
    for (let i = 0; i < u.length; i++) {
      const a = plain.re[i]!;
      if (Math.abs(a) < 1e-3 || plain.im[i] !== 0) continue;
      const exact = -2 * Math.PI * exactTurns(u[i]!, east * RAD_PER_MAS, v[i]!, north * RAD_PER_MAS);
      let d = Math.atan2(shifted.im[i]! / a, shifted.re[i]! / a) - exact;
      d -= 2 * Math.PI * Math.round(d / (2 * Math.PI));
      worst = Math.max(worst, Math.abs(d));
    }
    return worst;
  }

  it('keeps the plain phase of small shifts within 2e-13 rad (3 roundings of at most 64 turns)', () => {
    const u = Float64Array.from({ length: 2000 }, () => rnd() * 6e8);
    const v = Float64Array.from({ length: 2000 }, () => rnd() * 6e8);
    // |u e| + |v n| <= 3e8 * 2 * 4.5 mas = 65 turns at most; most blocks stay on the plain path
    expect(worstRampError(4.5, -4.4, point, u, v)).toBeLessThan(2e-13);
  });

  it('holds the 1e-12 rad phase ramps of extended components shifted by up to 1 arcsecond', () => {
    const u = Float64Array.from({ length: 2000 }, () => rnd() * 2e7);
    const v = Float64Array.from({ length: 2000 }, () => rnd() * 2e7);
    const wide = Float64Array.from({ length: 2000 }, () => rnd() * 6e8);
    for (const m of [() => exponential({ fwhm: 1 }), () => lorentzian({ fwhm: 0.5 })]) {
      expect(worstRampError(999, -731, m as typeof point, u, v)).toBeLessThan(PHASE_TOL);
    }
    expect(worstRampError(999, -731, () => point(), wide, wide.slice().reverse())).toBeLessThan(PHASE_TOL);
  });

  it('gives the Jacobian path the same split phase as the value path', () => {
    const u = Float64Array.from({ length: 1000 }, () => rnd() * 6e8);
    const v = Float64Array.from({ length: 1000 }, () => rnd() * 6e8);
    const m = point().shift(999, -731);
    const j = visibilityJacobian(m, u, v);
    const r = m.visibilities(u, v);
    let worst = 0;
    for (let i = 0; i < u.length; i++) {
      const exact = -2 * Math.PI * exactTurns(u[i]!, 999 * RAD_PER_MAS, v[i]!, -731 * RAD_PER_MAS);
      for (const d0 of [Math.atan2(j.im[i]!, j.re[i]!) - exact, Math.atan2(r.im[i]!, r.re[i]!) - exact]) {
        const d = d0 - 2 * Math.PI * Math.round(d0 / (2 * Math.PI));
        worst = Math.max(worst, Math.abs(d));
      }
    }
    expect(worst).toBeLessThan(PHASE_TOL);
  });
});
