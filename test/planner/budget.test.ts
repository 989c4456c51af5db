/**
 * The Δv budget's own behaviour: request checks naming the field, the one-burn / no-navigation-error case
 * against the plan-level Monte Carlo, partition invariance, linear vs non-linear on the demo flyby with two
 * correction burns, cancellation. The χ₃ law is in test/reference/budget-maxwell.test.ts.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import {
  assembleBudget, parseBudgetRequest, planManeuvers, prepareBudget, runBudget, runBudgetSamples, runDispersionSamples,
  summariseDispersion,
} from '../../planner/index.ts';
import { LINEARITY_CHECK_DEFAULTS } from '../../planner/dispersion/index.ts';
import type { BudgetRequestInput, BudgetSample } from '../../planner/index.ts';

const demo = (): BudgetRequestInput => JSON.parse(readFileSync(new URL('../../examples/flyby-budget-demo.json', import.meta.url), 'utf8')) as BudgetRequestInput;

function fieldOf(input: unknown): string {
  try {
    parseBudgetRequest(input);
  } catch (error) {
    expect((error as Error).name).toBe('InvalidInputError');
    return (error as { field: string }).field;
  }
  throw new Error('expected InvalidInputError');
}

describe('budget request', () => {
  describe('when a field is wrong', () => {
    it('should name it', () => {
      const r = demo();
      expect(fieldOf({ ...r, knowledge: r.knowledge.slice(0, 1) })).toBe('knowledge');
      const bad = structuredClone(r);
      bad.knowledge[1].covarianceKmKmS[0][1] = 5;
      expect(fieldOf(bad)).toBe('knowledge[1].covarianceKmKmS[0][1]');
      const neg = structuredClone(r);
      // Each pair's correlation is 0.975, but (x, y, z) together are not a covariance.
      const c = neg.knowledge[0].covarianceKmKmS;
      [[0, 1, 3.9], [0, 2, 3.9], [1, 2, -3.9]].forEach(([i, j, v]) => { c[i][j] = v; c[j][i] = v; });
      expect(fieldOf(neg)).toBe('knowledge[0].covarianceKmKmS');
      expect(fieldOf({ ...r, seed: -1 })).toBe('seed');
      expect(fieldOf({ ...r, problem: { ...r.problem, burns: [r.problem.burns[1], r.problem.burns[0]] } })).toBe('problem.burns[1].epoch');
      expect(fieldOf({ ...r, linearSamples: 0, nonlinearSamples: 0 })).toBe('linearSamples');
      // A finite burn is accepted and kept finite (budget-finite.test.ts runs finite budgets); a bad engine
      // for it is still named.
      const finite = structuredClone(r);
      (finite.problem.burns[1] as { model?: string }).model = 'finite';
      expect(parseBudgetRequest(finite).problem.burns[1].model).toBe('finite');
      finite.problem.spacecraft.engine.thrustN = -1;
      expect(fieldOf(finite)).toBe('problem.spacecraft.engine.thrustN');
    });
  });
});

describe('budget samples', () => {
  describe('when the sequence is one burn with no navigation error and no initial dispersion', () => {
    it('should deliver exactly the plan-level Monte Carlo samples for the same seed', async () => {
      const one = JSON.parse(readFileSync(new URL('../../examples/flyby-demo.json', import.meta.url), 'utf8')) as BudgetRequestInput['problem'];
      delete (one.initialState as { covarianceKmKmS?: unknown }).covarianceKmKmS;
      const zero = Array.from({ length: 6 }, () => [0, 0, 0, 0, 0, 0]);
      const request = parseBudgetRequest({ problem: one, knowledge: [{ covarianceKmKmS: zero }], linearSamples: 0, nonlinearSamples: 12, seed: 20310 });
      const { plan, nominal } = await prepareBudget(request);
      const budget = await runBudgetSamples(request, nominal!, { path: 'nonlinear', firstIndex: 0, count: 12 });
      const plain = await planManeuvers(request.problem, { monteCarlo: 'skip' });
      const today = await runDispersionSamples(request.problem, plain, { seed: 20310, firstIndex: 0, count: 12 });
      const bp = nominal!.bPlane!;
      budget.forEach((s, i) => {
        expect(s.burns[0].commandedKmS).toEqual(plan.burns[0].deltaVInertialKmS);
        expect(s.delivered[bp.bDotT]).toBe(today[i].bDotTKm);
        expect(s.delivered[bp.bDotR]).toBe(today[i].bDotRKm);
        expect(s.delivered.slice(0, nominal!.targetCount)).toEqual(today[i].achieved);
      });
      const mc = summariseDispersion(request.problem, plain, today);
      const summary = assembleBudget(request, plan, nominal, [], budget).nonlinear!;
      expect(summary.delivery.bPlane).toEqual(mc.bPlane);
      expect(summary.delivery.closestApproachSigmaS).toBe(mc.closestApproachSigmaS);
    });
  });

  describe('when the samples are split into 1, 2 or 4 batches', () => {
    it('should give identical samples and summaries on both paths', async () => {
      const request = parseBudgetRequest({ ...demo(), linearSamples: 400, nonlinearSamples: 8 });
      const { plan, nominal } = await prepareBudget(request);
      const run = async (path: 'linear' | 'nonlinear', total: number, parts: number): Promise<BudgetSample[]> => {
        const size = total / parts;
        const batches = await Promise.all(Array.from({ length: parts }, (_, p) => runBudgetSamples(request, nominal!, { path, firstIndex: p * size, count: size })));
        return batches.reverse().flat(); // any order: the summary sorts by index
      };
      const results = [];
      for (const parts of [1, 2, 4]) {
        results.push(assembleBudget(request, plan, nominal, await run('linear', 400, parts), await run('nonlinear', 8, parts)));
      }
      expect(results[1]).toEqual(results[0]);
      expect(results[2]).toEqual(results[0]);
      expect(results[0].nonlinear!.used).toBe(8);
    });
  });

  describe('when the demo flyby has two correction burns', () => {
    it('should have the linear and non-linear paths agree burn by burn', async () => {
      const result = await runBudget(parseBudgetRequest({ ...demo(), linearSamples: 2000, nonlinearSamples: 40 }));
      expect(result.agreement).not.toBeNull();
      const a = result.agreement!;
      // The plan's linear/Monte Carlo check per burn (mean χ² and covariance likelihood-ratio p-values).
      expect(a.significance).toBe(LINEARITY_CHECK_DEFAULTS.significance);
      expect(a.passed, a.message).toBe(true);
      for (const b of a.burns) {
        expect(b.samples).toBe(40);
        expect(b.checked).toBe(true);
        expect(b.components).toEqual(['Δv x', 'Δv y', 'Δv z']);
        expect(b.meanPValue!).toBeGreaterThanOrEqual(a.significance);
        expect(b.covariancePValue!).toBeGreaterThanOrEqual(a.significance);
      }
      expect(result.nonlinear!.notConverged.count).toBe(0);
      expect(result.caveats[0].code).toBe('PROPOSAL_REQUIRES_REVIEW');
      expect(result.caveats.map((c) => c.code)).toContain('BUDGET_IS_A_STUDY');
      // Total Δv99 comes from per-sample totals: never above the sum of the burns' Δv99.
      const l = result.linear!;
      expect(l.total.deltaVMS.p99).toBeLessThanOrEqual(l.burns[0].deltaVMS.p99 + l.burns[1].deltaVMS.p99);
      expect(l.burns[1].propellantKg.p99).toBeGreaterThan(0);
    });
  });

  describe('when the non-linear samples do not follow the linear prediction', () => {
    it('should fail the burn by the p-values of the linear/Monte Carlo check, and say when it cannot check', async () => {
      const request = parseBudgetRequest({ ...demo(), linearSamples: 2000, nonlinearSamples: 0 });
      const { plan, nominal } = await prepareBudget(request);
      const linear = await runBudgetSamples(request, nominal!, { path: 'linear', firstIndex: 0, count: 2000 });
      const mean = [0, 1, 2].map((i) => linear.reduce((acc, s) => acc + s.burns[1].commandedKmS[i], 0) / linear.length);
      // Stand-ins for non-linear samples: the linear path's own first 60, with TCM-2's spread about its mean
      // stretched by 1.5 (the covariance test must fail) — TCM-1 untouched (must pass).
      const stretched = linear.slice(0, 60).map((s) => ({
        ...s, burns: [s.burns[0], { ...s.burns[1], commandedKmS: [0, 1, 2].map((i) => mean[i] + 1.5 * (s.burns[1].commandedKmS[i] - mean[i])) as [number, number, number] }],
      }));
      const a = assembleBudget(request, plan, nominal, linear, stretched).agreement!;
      expect(a.passed).toBe(false);
      expect(a.burns[0].passed, a.burns[0].message).toBe(true);
      expect(a.burns[1].checked).toBe(true);
      expect(a.burns[1].passed).toBe(false);
      expect(a.burns[1].covariancePValue!).toBeLessThan(a.significance);
      // Control: the same 60 samples unstretched pass, and stretching scales each σ ratio by exactly 1.5.
      const plain = assembleBudget(request, plan, nominal, linear, linear.slice(0, 60)).agreement!;
      expect(plain.passed, plain.message).toBe(true);
      a.burns[1].sigmaRatios.forEach((r, i) => expect(Math.abs(r / plain.burns[1].sigmaRatios[i] - 1.5)).toBeLessThan(1e-9));
      const few = assembleBudget(request, plan, nominal, linear, linear.slice(0, 4));
      expect(few.agreement!.burns[0].checked).toBe(false);
      expect(few.agreement!.message).toContain('could not be compared');
      expect(few.caveats.map((c) => c.code)).toContain('BUDGET_PATHS_DISAGREE');
    });
  });

  describe('when cancelled', () => {
    it('should reject with CancelledError', async () => {
      const controller = new AbortController();
      const run = runBudget(parseBudgetRequest({ ...demo(), linearSamples: 100, nonlinearSamples: 50 }), {
        signal: controller.signal, onProgress: (p) => { if (p.stage === 'nonlinear') controller.abort(); },
      });
      await expect(run).rejects.toMatchObject({ name: 'CancelledError' });
    });
  });
});
