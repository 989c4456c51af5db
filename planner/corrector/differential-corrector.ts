/**
 * A generic differential corrector: damped Newton iteration on residuals scaled by their tolerances.
 *
 * - Jacobian from the caller (analytic / STM-chained) or by finite differences (fallback and test oracle).
 * - Each step solves J dx = −r with the SVD pseudo-inverse in scaled controls: minimum-norm when controls
 *   outnumber residuals, least squares when residuals outnumber controls (flagged in the result).
 * - Step limiting (the whole step shrinks until no control moves more than its limit), a backtracking line
 *   search on ½‖r‖², and projection onto bounds.
 * - Stops when every |residual| ≤ its tolerance, at the iteration limit, on divergence (no descent along
 *   the Newton direction even with a fresh finite-difference Jacobian), or when an evaluation fails.
 * Not converging is a result, not an exception (outcome + diagnostics, like an ODE solver's status).
 */
import { conditionNumber, norm2, pseudoSolve, svd } from '../../propagator/index.ts';
import type { Matrix } from '../../propagator/index.ts';
import type { IterationRecord } from '../../contract/plan-types.ts';

/** What one evaluation at the controls x gives. `residuals` are unscaled (achieved − requested). */
export type CorrectorEvaluation =
  | { ok: true; residuals: number[]; jacobian?: Matrix }
  | { ok: false; reason: string };

export interface CorrectorSpec {
  /** Initial controls. */
  initial: number[];
  /** Tolerance of each residual (> 0), same units as the residual. */
  tolerances: number[];
  /** Typical size of a change of each control: scales controls for the minimum-norm step and the condition
   * number (km/s for Δv, s for epochs). */
  controlScales: number[];
  /** Largest change of each control in one iteration (> 0). */
  maxStep: number[];
  /** Finite-difference perturbation of each control (> 0). */
  finiteDifferenceStep: number[];
  lower?: number[];
  upper?: number[];
  maxIterations: number;
  /** Evaluate residuals (and, when `withJacobian`, the analytic Jacobian if the caller has one). */
  evaluate(x: number[], withJacobian: boolean): Promise<CorrectorEvaluation>;
  /** Use central differences for the fallback Jacobian (2n evaluations instead of n). */
  centralDifferences?: boolean;
  /** Never use the caller's Jacobian (finite differences only). */
  finiteDifferenceOnly?: boolean;
  /** Called after every iteration record. */
  onIteration?: (record: CorrectorIteration) => void;
}

/** One iteration as the corrector records it: the plan's IterationRecord (contract/plan-types.ts), with the
 * Jacobian's source named from the corrector's side ('analytic': the caller's; the plan calls it 'stm'). */
export type CorrectorIteration = Omit<IterationRecord, 'jacobianSource'> & { jacobianSource: 'analytic' | 'finite-difference' | 'none' };

export type CorrectorOutcome = 'converged' | 'iteration-limit' | 'diverged' | 'singular' | 'evaluation-failed'
  | 'least-squares-stationary';

export interface CorrectorResult {
  outcome: CorrectorOutcome;
  message: string;
  controls: number[];
  residuals: number[];
  /** Last Jacobian (unscaled), when one was formed. */
  jacobian: Matrix | null;
  jacobianSource: 'analytic' | 'finite-difference' | 'none';
  iterations: CorrectorIteration[];
  /** More residuals than controls: the step was a least-squares one. */
  leastSquares: boolean;
  evaluations: number;
}

function clip(x: number[], lower?: number[], upper?: number[]): number[] {
  return x.map((v, i) => Math.min(upper?.[i] ?? Infinity, Math.max(lower?.[i] ?? -Infinity, v)));
}

/**
 * Forward (or central) finite-difference Jacobian of `f` at x; `f0` = f(x) when known. Returns null with
 * the failure reason when an evaluation fails.
 */
export async function finiteDifferenceJacobian(
  f: (x: number[]) => Promise<CorrectorEvaluation>, x: number[], steps: number[], f0?: number[], central = false,
): Promise<{ jacobian: Matrix; evaluations: number } | { failed: string }> {
  let evaluations = 0;
  let base = f0;
  if (!base && !central) {
    const e = await f(x);
    evaluations += 1;
    if (!e.ok) return { failed: e.reason };
    base = e.residuals;
  }
  const columns: number[][] = [];
  for (let j = 0; j < x.length; j++) {
    const h = steps[j];
    const xp = x.slice();
    xp[j] += h;
    const ep = await f(xp);
    evaluations += 1;
    if (!ep.ok) return { failed: ep.reason };
    if (central) {
      const xm = x.slice();
      xm[j] -= h;
      const em = await f(xm);
      evaluations += 1;
      if (!em.ok) return { failed: em.reason };
      columns.push(ep.residuals.map((v, i) => (v - em.residuals[i]) / (2 * h)));
    } else {
      const b = base as number[];
      columns.push(ep.residuals.map((v, i) => (v - b[i]) / h));
    }
  }
  const m = columns[0]?.length ?? 0;
  const jacobian: Matrix = Array.from({ length: m }, (_, i) => columns.map((c) => c[i]));
  return { jacobian, evaluations };
}

function merit(scaled: number[]): number {
  return 0.5 * scaled.reduce((s, v) => s + v * v, 0);
}

/** What the stages of one run share: the spec, the iteration records so far and the evaluation count. */
interface CorrectorRun {
  spec: CorrectorSpec;
  /** More residuals than controls. */
  leastSquares: boolean;
  iterations: CorrectorIteration[];
  evaluations: number;
}

/** Where an iteration starts: controls, residuals scaled by their tolerances, and the largest of them. */
interface IterationStart {
  k: number;
  x: number[];
  rs: number[];
  maxScaled: number;
}

type JacobianSource = CorrectorIteration['jacobianSource'];

function evaluateAt(run: CorrectorRun, x: number[], withJ: boolean): Promise<CorrectorEvaluation> {
  run.evaluations += 1;
  return run.spec.evaluate(x, withJ && !run.spec.finiteDifferenceOnly);
}

function scaled(spec: CorrectorSpec, r: number[]): number[] {
  return r.map((v, i) => v / spec.tolerances[i]);
}

function finish(run: CorrectorRun, outcome: CorrectorOutcome, message: string, x: number[], r: number[], J: Matrix | null,
  src: CorrectorResult['jacobianSource']): CorrectorResult {
  return {
    outcome, message, controls: x, residuals: r, jacobian: J, jacobianSource: src, iterations: run.iterations,
    leastSquares: run.leastSquares, evaluations: run.evaluations,
  };
}

function record(run: CorrectorRun, at: IterationStart, cond: number | null, stepNorm: number, src: JacobianSource, note?: string): void {
  const rec: CorrectorIteration = {
    iteration: at.k, controls: at.x.slice(), scaledResiduals: at.rs, maxScaledResidual: at.maxScaled,
    conditionNumber: cond !== null && Number.isFinite(cond) ? cond : null, stepNorm, jacobianSource: src, note,
  };
  run.iterations.push(rec);
  run.spec.onIteration?.(rec);
}

/** The caller's Jacobian when there is one, else finite differences about x (residuals r there). */
async function jacobianAt(run: CorrectorRun, x: number[], r: number[], analyticJ: Matrix | undefined):
  Promise<{ J: Matrix; src: JacobianSource } | { failed: string }> {
  if (analyticJ) return { J: analyticJ, src: 'analytic' };
  const { spec } = run;
  const fd = await finiteDifferenceJacobian((xx) => evaluateAt(run, xx, false), x, spec.finiteDifferenceStep,
    spec.centralDifferences ? undefined : r, spec.centralDifferences);
  if ('failed' in fd) return fd;
  return { J: fd.jacobian, src: 'finite-difference' };
}

/** The Newton step in the controls' units: the SVD pseudo-inverse of the scaled system (rows by
 * tolerance, columns by control scale), shrunk as a whole until no control moves more than its limit. */
function newtonStep(spec: CorrectorSpec, J: Matrix, rs: number[]): { dx: number[]; cond: number; rank: number; note?: string } {
  const Js = J.map((row, i) => row.map((v, j) => (v * spec.controlScales[j]) / spec.tolerances[i]));
  const d = svd(Js);
  const cond = conditionNumber(d.s);
  const { x: dxs, rank } = pseudoSolve(d, rs.map((v) => -v));
  if (rank === 0) return { dx: [], cond, rank };
  let dx = dxs.map((v, j) => v * spec.controlScales[j]);
  const ratio = Math.max(...dx.map((v, j) => Math.abs(v) / spec.maxStep[j]));
  let note: string | undefined;
  if (ratio > 1) {
    dx = dx.map((v) => v / ratio);
    note = `step limited by ${ratio.toPrecision(3)}x`;
  }
  return { dx, cond, rank, note };
}

/** Backtracking line search on ½‖r_s‖² along dx from x (halving α up to six times). */
async function lineSearch(run: CorrectorRun, x: number[], dx: number[], rs: number[]): Promise<{
  accepted: { x: number[]; ev: Extract<CorrectorEvaluation, { ok: true }> } | null; alpha: number; lastFailure: string;
}> {
  const { spec } = run;
  const f0 = merit(rs);
  let alpha = 1;
  let lastFailure = '';
  for (let trial = 0; trial < 6; trial++) {
    const xt = clip(x.map((v, j) => v + alpha * dx[j]), spec.lower, spec.upper);
    const et = await evaluateAt(run, xt, true);
    if (et.ok && merit(scaled(spec, et.residuals)) < f0 * (1 - 1e-4 * alpha)) return { accepted: { x: xt, ev: et }, alpha, lastFailure };
    if (et.ok && run.leastSquares && trial === 0 && merit(scaled(spec, et.residuals)) <= f0 * (1 + 1e-12)) {
      // At a least-squares minimum the merit cannot fall further.
      lastFailure = 'no further decrease';
    } else if (!et.ok) {
      lastFailure = et.reason;
    }
    alpha *= 0.5;
  }
  return { accepted: null, alpha, lastFailure };
}

/** The result when no step along the Newton direction helps: a least-squares minimum or divergence. */
function noDescent(run: CorrectorRun, at: IterationStart, cond: number, src: JacobianSource, J: Matrix, r: number[],
  lastFailure: string): CorrectorResult {
  const { x, maxScaled } = at;
  if (run.leastSquares) {
    record(run, at, cond, 0, src, 'least-squares minimum: residuals cannot be reduced further');
    return finish(run, 'least-squares-stationary', `the targets outnumber the free variables and cannot all be met; least-squares minimum has largest |residual|/tolerance = ${maxScaled.toPrecision(4)}`, x, r, J, src);
  }
  record(run, at, cond, 0, src, `line search failed${lastFailure ? `: ${lastFailure}` : ''}`);
  return finish(run, 'diverged', `no step along the Newton direction reduces the residuals (largest |residual|/tolerance = ${maxScaled.toPrecision(4)})${lastFailure ? `; ${lastFailure}` : ''}`, x, r, J, src);
}

/** Runs the corrector; see the file comment. */
export async function runCorrector(spec: CorrectorSpec): Promise<CorrectorResult> {
  const run: CorrectorRun = { spec, leastSquares: spec.tolerances.length > spec.initial.length, iterations: [], evaluations: 0 };
  let x = clip(spec.initial.slice(), spec.lower, spec.upper);
  const first = await evaluateAt(run, x, true);
  if (!first.ok) return finish(run, 'evaluation-failed', first.reason, x, [], null, 'none');
  let r = first.residuals;
  let analyticJ = first.jacobian;
  let lastJ: Matrix | null = null;
  let lastSrc: CorrectorResult['jacobianSource'] = 'none';

  for (let k = 0; ; k++) {
    const rs = scaled(spec, r);
    const at: IterationStart = { k, x, rs, maxScaled: Math.max(...rs.map(Math.abs)) };
    if (at.maxScaled <= 1) {
      record(run, at, null, 0, 'none', 'every residual within tolerance');
      return finish(run, 'converged', `every residual within tolerance after ${k} iteration(s)`, x, r, lastJ, lastSrc);
    }
    if (k >= spec.maxIterations) {
      record(run, at, null, 0, 'none', 'iteration limit');
      return finish(run, 'iteration-limit', `iteration limit ${spec.maxIterations} reached; largest |residual|/tolerance = ${at.maxScaled.toPrecision(4)}`, x, r, lastJ, lastSrc);
    }
    const jac = await jacobianAt(run, x, r, analyticJ);
    if ('failed' in jac) {
      record(run, at, null, 0, 'none', jac.failed);
      return finish(run, 'evaluation-failed', `finite-difference Jacobian failed: ${jac.failed}`, x, r, lastJ, lastSrc);
    }
    const { J, src } = jac;
    lastJ = J;
    lastSrc = src;
    const step = newtonStep(spec, J, rs);
    if (step.rank === 0) {
      record(run, at, step.cond, 0, src, 'Jacobian is zero: the targets do not depend on the free variables');
      return finish(run, 'singular', 'the Jacobian is zero: no free variable moves any target', x, r, J, src);
    }
    const { accepted, alpha, lastFailure } = await lineSearch(run, x, step.dx, rs);
    if (!accepted) {
      if (src === 'analytic' && !spec.finiteDifferenceOnly) {
        // The analytic Jacobian may be poor here: retry this iteration with finite differences.
        record(run, at, step.cond, 0, src, 'no descent along the analytic-Jacobian step; retrying with finite differences');
        analyticJ = undefined;
        continue;
      }
      return noDescent(run, at, step.cond, src, J, r, lastFailure);
    }
    const stepNorm = norm2(step.dx.map((v, j) => (alpha * v) / spec.controlScales[j]));
    record(run, at, step.cond, stepNorm, src, alpha < 1 ? `${step.note ? `${step.note}; ` : ''}line search α = ${alpha}` : step.note);
    x = accepted.x;
    r = accepted.ev.residuals;
    analyticJ = spec.finiteDifferenceOnly ? undefined : accepted.ev.jacobian;
  }
}
