import { describe, expect, it } from 'vitest';
import { finiteDifferenceJacobian, runCorrector } from '../../planner/corrector/differential-corrector.ts';
import type { CorrectorEvaluation, CorrectorSpec } from '../../planner/corrector/differential-corrector.ts';
import { conditionNumber, multiply, pseudoSolve, svd, transpose } from '../../propagator/index.ts';

type Fn = (x: number[]) => { r: number[]; J: number[][] };

function spec(fn: Fn, initial: number[], tolerances: number[], extra: Partial<CorrectorSpec> = {}): CorrectorSpec {
  return {
    initial, tolerances,
    controlScales: initial.map(() => 1), maxStep: initial.map(() => 10), finiteDifferenceStep: initial.map(() => 1e-7),
    maxIterations: 30,
    evaluate: async (x: number[], withJ: boolean): Promise<CorrectorEvaluation> => {
      const { r, J } = fn(x);
      return { ok: true, residuals: r, jacobian: withJ ? J : undefined };
    },
    ...extra,
  };
}

// Analytic test functions (closed-form roots; no external source needed beyond algebra).
const rosenbrockSystem: Fn = ([a, b]) => ({ r: [10 * (b - a * a), 1 - a], J: [[-20 * a, 10], [-1, 0]] });

describe('differential corrector', () => {
  describe('when the system is square and has a root', () => {
    it('should converge with the analytic Jacobian to the root (1, 1) of the Rosenbrock system', async () => {
      const res = await runCorrector(spec(rosenbrockSystem, [-1.2, 1], [1e-10, 1e-10]));
      expect(res.outcome).toBe('converged');
      expect(res.controls[0]).toBeCloseTo(1, 9);
      expect(res.controls[1]).toBeCloseTo(1, 9);
      expect(res.iterations.at(-1)?.maxScaledResidual).toBeLessThanOrEqual(1);
      expect(res.iterations[0].jacobianSource).toBe('analytic');
      expect(res.iterations[0].conditionNumber).toBeGreaterThan(1);
    });
    it('should converge with finite differences only', async () => {
      const res = await runCorrector(spec(rosenbrockSystem, [-1.2, 1], [1e-8, 1e-8], { finiteDifferenceOnly: true }));
      expect(res.outcome).toBe('converged');
      expect(res.controls[0]).toBeCloseTo(1, 6);
      expect(res.iterations[0].jacobianSource).toBe('finite-difference');
    });
  });

  describe('when free variables outnumber targets', () => {
    it('should take the minimum-norm step (x = a b / |a|² for one linear equation)', async () => {
      const a = [1, 2, 2];
      const res = await runCorrector(spec((x) => ({ r: [a[0] * x[0] + a[1] * x[1] + a[2] * x[2] - 9], J: [a] }), [0, 0, 0], [1e-12]));
      expect(res.outcome).toBe('converged');
      expect(res.leastSquares).toBe(false);
      expect(res.controls[0]).toBeCloseTo(1, 12);
      expect(res.controls[1]).toBeCloseTo(2, 12);
      expect(res.controls[2]).toBeCloseTo(2, 12);
    });
  });

  describe('when targets outnumber free variables', () => {
    it('should converge and flag least squares when the equations are consistent', async () => {
      const res = await runCorrector(spec(([x]) => ({ r: [x - 1, 2 * x - 2], J: [[1], [2]] }), [5], [1e-9, 1e-9]));
      expect(res.outcome).toBe('converged');
      expect(res.leastSquares).toBe(true);
      expect(res.controls[0]).toBeCloseTo(1, 9);
    });
    it('should stop at the least-squares minimum, not converged, when they are inconsistent', async () => {
      const res = await runCorrector(spec(([x]) => ({ r: [x - 1, x - 3], J: [[1], [1]] }), [0], [0.1, 0.1]));
      expect(res.outcome).toBe('least-squares-stationary');
      expect(res.controls[0]).toBeCloseTo(2, 9);
    });
  });

  describe('when no root exists', () => {
    it('should end not converged (x² + 1 = 0 has no real root)', async () => {
      const res = await runCorrector(spec(([x]) => ({ r: [x * x + 1], J: [[2 * x]] }), [0.5], [1e-6]));
      expect(res.outcome).not.toBe('converged');
      expect(res.iterations.length).toBeGreaterThan(1);
    });
    it('should report a singular Jacobian when the target ignores the controls', async () => {
      const res = await runCorrector(spec(() => ({ r: [5], J: [[0, 0]] }), [0, 0], [1]));
      expect(res.outcome).toBe('singular');
    });
  });

  describe('when bounds and step limits apply', () => {
    it('should keep the controls inside the bounds and not converge when the root lies outside', async () => {
      const res = await runCorrector(spec(([x]) => ({ r: [x - 5], J: [[1]] }), [0], [1e-6], { upper: [3], maxIterations: 5 }));
      expect(res.outcome).not.toBe('converged');
      for (const it of res.iterations) expect(it.controls[0]).toBeLessThanOrEqual(3);
    });
    it('should never move a control by more than its step limit', async () => {
      const res = await runCorrector(spec(([x]) => ({ r: [x - 1], J: [[1]] }), [0], [1e-9], { maxStep: [0.1] }));
      expect(res.outcome).toBe('converged');
      expect(res.iterations.length).toBeGreaterThanOrEqual(11);
      for (let i = 1; i < res.iterations.length; i++) {
        expect(Math.abs(res.iterations[i].controls[0] - res.iterations[i - 1].controls[0])).toBeLessThanOrEqual(0.1 + 1e-15);
      }
    });
  });

  describe('when an evaluation fails', () => {
    it('should end with outcome evaluation-failed and the reason', async () => {
      const res = await runCorrector({ ...spec(rosenbrockSystem, [0, 0], [1e-9, 1e-9]), evaluate: async () => ({ ok: false, reason: 'impact' }) });
      expect(res.outcome).toBe('evaluation-failed');
      expect(res.message).toContain('impact');
    });
  });
});

describe('finite-difference Jacobian', () => {
  describe('when the function is smooth', () => {
    it('should agree with the analytic Jacobian (central differences, relative 1e-8)', async () => {
      const f = (x: number[]) => ({ r: [Math.sin(x[0]) * x[1], Math.exp(x[0] - x[1])], J: [[Math.cos(x[0]) * x[1], Math.sin(x[0])], [Math.exp(x[0] - x[1]), -Math.exp(x[0] - x[1])]] });
      const x = [0.3, 0.7];
      const fd = await finiteDifferenceJacobian(async (xx) => ({ ok: true, residuals: f(xx).r }), x, [1e-5, 1e-5], undefined, true);
      if ('failed' in fd) throw new Error(fd.failed);
      const J = f(x).J;
      for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) expect(Math.abs(fd.jacobian[i][j] - J[i][j])).toBeLessThan(1e-8 * Math.max(1, Math.abs(J[i][j])));
      expect(fd.evaluations).toBe(4);
    });
  });
});

describe('singular value decomposition', () => {
  describe('when given a rectangular matrix', () => {
    it('should reconstruct it and give orthonormal factors', () => {
      const a = [[1, 2, 3], [4, 5, 6.5], [-1, 0.5, 2], [0, 1, -1]];
      for (const m of [a, transpose(a)]) {
        const d = svd(m);
        const us = d.u.map((row) => row.map((v, k) => v * d.s[k]));
        const back = multiply(us, transpose(d.v));
        m.forEach((row, i) => row.forEach((v, j) => expect(back[i][j]).toBeCloseTo(v, 12)));
        const vtv = multiply(transpose(d.v), d.v);
        vtv.forEach((row, i) => row.forEach((v, j) => expect(v).toBeCloseTo(i === j ? 1 : 0, 12)));
      }
    });
    it('should give the condition number of a diagonal matrix as the ratio of its entries', () => {
      expect(conditionNumber(svd([[1, 0], [0, 1e-3]]).s)).toBeCloseTo(1e3, 6);
      expect(conditionNumber(svd([[1, 1], [1, 1]]).s)).toBeGreaterThan(1e14);
    });
    it('should solve a least-squares line fit exactly (normal equations by hand)', () => {
      // Fit y = c0 + c1 t to (0,1), (1,3), (2,4): normal equations give c1 = 1.5, c0 = 7/6.
      const { x } = pseudoSolve(svd([[1, 0], [1, 1], [1, 2]]), [1, 3, 4]);
      expect(x[0]).toBeCloseTo(7 / 6, 12);
      expect(x[1]).toBeCloseTo(1.5, 12);
    });
  });
});
