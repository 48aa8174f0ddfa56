/**
 * A bounded Levenberg-Marquardt least-squares solver on ml-matrix.
 *
 * Minimises chi2(p) = |r(p)|^2 given residuals r and their Jacobian J. Each step solves
 * (J^T J + lambda diag(J^T J)) delta = -J^T r (Marquardt 1963, with Fletcher's scaling by the diagonal), projects the
 * trial point onto the bounds, and updates lambda by the gain ratio as in Nielsen (1999), "Damping parameter in
 * Marquardt's method" (IMM-REP-1999-05): on success lambda *= max(1/3, 1 - (2 rho - 1)^3), on failure lambda *= nu,
 * nu *= 2. Parameters at a bound whose gradient points outward are held for that step (active set).
 *
 * @module
 */
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { FitError } from '../errors.js';
import { sumOfSquares } from './stats.js';

/** Why the solver stopped. */
export type StopReason =
  | 'chi2 change below tolerance'
  | 'step below tolerance'
  | 'gradient below tolerance'
  | 'maximum iterations'
  | 'no downhill step (damping overflow)'
  | 'no free parameters';

/** Convergence tolerances. */
export interface Tolerances {
  /** Stop when an accepted step lowers chi2 by less than this fraction of chi2. Default 1e-10. */
  readonly chi2?: number;
  /** Stop when every parameter moves by less than this fraction of (|value| + this). Default 1e-10. */
  readonly step?: number;
  /** Stop when the largest |d chi2 / d p| scaled by the parameter's curvature is below this. Default 1e-10. */
  readonly gradient?: number;
}

/** A least-squares problem. */
export interface LeastSquaresProblem {
  /** Number of residuals. */
  readonly rows: number;
  /** Number of parameters. */
  readonly cols: number;
  /** Residuals at p into r. */
  residuals(p: Float64Array, r: Float64Array): void;
  /** Residuals and Jacobian (rows x cols, row-major) at p. */
  residualsAndJacobian(p: Float64Array, r: Float64Array, jac: Float64Array): void;
}

/** Solver options. */
export interface SolverOptions {
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  readonly maxIterations?: number;
  readonly tolerances?: Tolerances;
  /** Called after every iteration. */
  readonly onIteration?: (iteration: number, chi2: number) => void;
  /** Aborts between iterations. */
  readonly signal?: AbortSignal;
}

/** What the solver found. */
export interface SolverResult {
  readonly p: Float64Array;
  readonly chi2: number;
  readonly iterations: number;
  readonly reason: StopReason;
  /** Residuals and Jacobian at p. */
  readonly residuals: Float64Array;
  readonly jacobian: Float64Array;
  /** J^T J at p (cols x cols). */
  readonly normal: Matrix;
  /** Which parameters ended on a bound. */
  readonly atBound: readonly boolean[];
}

function normalEquations(
  jac: Float64Array,
  r: Float64Array,
  rows: number,
  cols: number,
): { a: Matrix; g: Float64Array } {
  const a = new Matrix(cols, cols);
  const g = new Float64Array(cols);
  const acc = new Float64Array(cols * cols);
  for (let i = 0; i < rows; i++) {
    const o = i * cols;
    const ri = r[i]!;
    for (let j = 0; j < cols; j++) {
      const jj = jac[o + j]!;
      if (jj === 0) continue;
      g[j] = g[j]! + jj * ri;
      for (let k = j; k < cols; k++) acc[j * cols + k] = acc[j * cols + k]! + jj * jac[o + k]!;
    }
  }
  for (let j = 0; j < cols; j++) {
    for (let k = j; k < cols; k++) {
      a.set(j, k, acc[j * cols + k]!);
      a.set(k, j, acc[j * cols + k]!);
    }
  }
  return { a, g };
}

/** Throws the abort reason as a FitError when the signal has fired. */
export function checkAborted(signal: AbortSignal | undefined, what: string): void {
  if (signal?.aborted) {
    throw new FitError(
      `${what}: cancelled by the caller's AbortSignal${signal.reason ? ` (${String(signal.reason)})` : ''}`,
    );
  }
}

/**
 * Runs bounded Levenberg-Marquardt from `p0`.
 *
 * @param problem - residuals and Jacobian
 * @param p0 - starting point (inside the bounds)
 * @param options - bounds, iteration limit, tolerances, progress and cancellation
 * @returns the best point, its chi2, residuals, Jacobian and J^T J, and why it stopped
 */
export function levenbergMarquardt(
  problem: LeastSquaresProblem,
  p0: Float64Array,
  options: SolverOptions,
): SolverResult {
  const { rows, cols } = problem;
  const maxIter = options.maxIterations ?? 200;
  const ftol = options.tolerances?.chi2 ?? 1e-10;
  const xtol = options.tolerances?.step ?? 1e-10;
  const gtol = options.tolerances?.gradient ?? 1e-10;
  const lo = options.lower;
  const hi = options.upper;
  let p = Float64Array.from(p0, (x, i) => Math.min(hi[i]!, Math.max(lo[i]!, x)));
  let r = new Float64Array(rows);
  let jac = new Float64Array(rows * cols);
  problem.residualsAndJacobian(p, r, jac);
  let chi2 = sumOfSquares(r);
  if (!Number.isFinite(chi2))
    throw new FitError(`fit: chi2 at the starting point is ${chi2}; check the starting values`);
  const trialR = new Float64Array(rows);
  let { a, g } = normalEquations(jac, r, rows, cols);
  let lambda = 1e-3;
  let nu = 2;
  let reason: StopReason = cols === 0 ? 'no free parameters' : 'maximum iterations';
  let iter = 0;
  let converged = false;
  while (cols > 0 && iter < maxIter) {
    checkAborted(options.signal, 'fit');
    iter++;
    // active set: hold parameters on a bound whose descent direction points out of the box
    const held: boolean[] = [];
    for (let j = 0; j < cols; j++) {
      held.push((p[j]! <= lo[j]! && g[j]! > 0) || (p[j]! >= hi[j]! && g[j]! < 0));
    }
    // gradient test on the free directions, scaled by curvature
    let gmax = 0;
    for (let j = 0; j < cols; j++) {
      if (held[j]) continue;
      const d = a.get(j, j);
      gmax = Math.max(gmax, d > 0 ? Math.abs(g[j]!) / Math.sqrt(d * Math.max(chi2, 1e-300)) : 0);
    }
    if (gmax < gtol) {
      reason = 'gradient below tolerance';
      break;
    }
    let accepted = false;
    while (!accepted) {
      const m = new Matrix(cols, cols);
      const rhs = new Matrix(cols, 1);
      for (let j = 0; j < cols; j++) {
        for (let k = 0; k < cols; k++) m.set(j, k, held[j] || held[k] ? 0 : a.get(j, k));
        const d = a.get(j, j);
        m.set(j, j, held[j] ? 1 : d + lambda * (d > 0 ? d : 1e-12));
        rhs.set(j, 0, held[j] ? 0 : -g[j]!);
      }
      const chol = new CholeskyDecomposition(m);
      if (!chol.isPositiveDefinite()) {
        lambda *= nu;
        nu *= 2;
        if (lambda > 1e16) break;
        continue;
      }
      const delta = chol.solve(rhs);
      const trial = new Float64Array(cols);
      for (let j = 0; j < cols; j++) trial[j] = Math.min(hi[j]!, Math.max(lo[j]!, p[j]! + delta.get(j, 0)));
      let ok = true;
      try {
        problem.residuals(trial, trialR);
      } catch {
        ok = false; // a trial outside a slot's domain counts as a failed step
      }
      const trialChi2 = ok ? sumOfSquares(trialR) : Number.POSITIVE_INFINITY;
      // predicted reduction for the projected step s: -(2 g.s + s^T A s)
      let gs = 0;
      let sas = 0;
      for (let j = 0; j < cols; j++) {
        const sj = trial[j]! - p[j]!;
        gs += g[j]! * sj;
        for (let k = 0; k < cols; k++) sas += sj * a.get(j, k) * (trial[k]! - p[k]!);
      }
      const predicted = -(2 * gs + sas);
      const actual = chi2 - trialChi2;
      const rho = predicted > 0 ? actual / predicted : actual > 0 ? 1 : -1;
      if (Number.isFinite(trialChi2) && actual > 0 && rho > 0) {
        accepted = true;
        let small = true;
        for (let j = 0; j < cols; j++) {
          if (Math.abs(trial[j]! - p[j]!) > xtol * (Math.abs(p[j]!) + xtol)) small = false;
        }
        const oldChi2 = chi2;
        p = trial;
        const nr = new Float64Array(rows);
        const nj = new Float64Array(rows * cols);
        problem.residualsAndJacobian(p, nr, nj);
        r = nr;
        jac = nj;
        chi2 = sumOfSquares(r);
        ({ a, g } = normalEquations(jac, r, rows, cols));
        lambda *= Math.max(1 / 3, 1 - (2 * rho - 1) ** 3);
        nu = 2;
        options.onIteration?.(iter, chi2);
        if (oldChi2 - chi2 <= ftol * chi2) {
          reason = 'chi2 change below tolerance';
          converged = true;
        } else if (small) {
          reason = 'step below tolerance';
          converged = true;
        }
      } else {
        if (Number.isFinite(trialChi2) && predicted >= 0 && predicted <= ftol * chi2) {
          // the best possible decrease is below the tolerance: we are at the minimum to rounding
          reason = 'chi2 change below tolerance';
          accepted = true;
          converged = true;
          break;
        }
        lambda *= nu;
        nu *= 2;
        if (lambda > 1e16) break;
      }
    }
    if (converged) break;
    if (!accepted) {
      reason = 'no downhill step (damping overflow)';
      break;
    }
  }
  const atBound = Array.from(p, (x, j) => x <= lo[j]! || x >= hi[j]!);
  return { p, chi2, iterations: iter, reason, residuals: r, jacobian: jac, normal: a, atBound };
}
