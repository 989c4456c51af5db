/**
 * The Δv budget of finite burns on the two-body LEO fixture (two-body-fixture.ts; 500 kg, Isp 220 s):
 * - an 8 N engine (a burn of about 15 minutes for the fixture's 14 m/s): the nominal sequence is the plan's
 *   finite burn, and the linear path (gains from the finite arc's STM) and the non-linear path (a corrector
 *   run on pointing and duration per sample, execution errors as duration and pointing errors) agree by the
 *   plan's linear/Monte Carlo check (mean χ² and covariance likelihood-ratio p-values, linearity-check.ts);
 *   also with a second finite burn, which carries the first burn's Δv change through its arc;
 * - partition invariance: samples depend on (seed, i) only, on both paths;
 * - a short finite burn's budget approaches the impulsive budget of the same problem as the burn shortens
 *   (a finite burn tends to the impulse as its duration goes to zero: common practice).
 */
import { describe, expect, it } from 'vitest';
import { assembleBudget, parseBudgetRequest, prepareBudget, runBudgetSamples } from '../../planner/index.ts';
import type { BudgetRequestInput, BudgetResult } from '../../planner/index.ts';
import { LINEARITY_CHECK_DEFAULTS } from '../../planner/dispersion/index.ts';
import { formatEpoch, parseEpoch } from '../../propagator/index.ts';
import { T0_TEXT, twoBodyProblem } from './two-body-fixture.ts';

/** Diagonal knowledge covariance: σ per position axis (km) and per velocity axis (km/s). */
const knowledge = (sPosKm: number, sVelKmS: number): number[][] => Array.from({ length: 6 }, (_, i) => Array.from({ length: 6 }, (_, j) => (i === j ? (i < 3 ? sPosKm : sVelKmS) ** 2 : 0)));

function request(thrustN: number, model: 'finite' | 'impulsive', twoBurns: boolean, linearSamples: number, nonlinearSamples: number): BudgetRequestInput {
  const base = twoBodyProblem({ dispersion: { samples: 0, seed: 1 } });
  const t0 = parseEpoch(T0_TEXT);
  const second = { label: 'TCM-2', epoch: formatEpoch(t0 + 2400, 'TDB', 3), frame: 'VNB' as const, deltaVGuessKmS: [0, 0, 0] as [number, number, number], model };
  const burns = [{ ...base.burns[0], model }, ...(twoBurns ? [second] : [])];
  return {
    problem: { ...base, spacecraft: { ...base.spacecraft, engine: { ispS: 220, thrustN } }, burns },
    knowledge: burns.map(() => ({ covarianceKmKmS: knowledge(0.05, 5e-5) })),
    linearSamples, nonlinearSamples, seed: 99,
  };
}

async function budget(input: BudgetRequestInput): Promise<BudgetResult> {
  const r = parseBudgetRequest(input);
  const { plan, nominal } = await prepareBudget(r);
  expect(nominal).not.toBeNull();
  const lin = await runBudgetSamples(r, nominal!, { path: 'linear', firstIndex: 0, count: r.linearSamples });
  const non = await runBudgetSamples(r, nominal!, { path: 'nonlinear', firstIndex: 0, count: r.nonlinearSamples });
  return assembleBudget(r, plan, nominal, lin, non);
}

function expectAgreement(result: BudgetResult, samples: number): void {
  const a = result.agreement!;
  expect(a.significance).toBe(LINEARITY_CHECK_DEFAULTS.significance);
  expect(a.passed, a.message).toBe(true);
  for (const b of a.burns) {
    expect(b.checked).toBe(true);
    expect(b.samples).toBe(samples);
    // Duration and two pointing angles move the equivalent Δv in all three local directions.
    expect(b.components).toEqual(['Δv V', 'Δv N', 'Δv B']);
  }
}

describe('Δv budget of finite burns', () => {
  describe('when the one correction burn is a 15-minute finite burn', () => {
    it('should plan it as finite and have the linear and non-linear paths agree', async () => {
      const r = parseBudgetRequest(request(8, 'finite', false, 2000, 30));
      expect(r.problem.burns[0].model).toBe('finite');
      const result = await budget(request(8, 'finite', false, 2000, 30));
      expect(result.nominal.status).toBe('converged');
      // Measured: p-values 0.32 (mean) and 0.37 (covariance); |Δv| mean 14.08 m/s linear, 14.04 non-linear.
      expectAgreement(result, 30);
      expect(result.nonlinear!.notConverged.count).toBe(0);
      const l = result.linear!.burns[0];
      expect(l.propellantKg.p99).toBeGreaterThan(0);
      // Rocket equation (Tsiolkovsky) at 99 %: m_p ≤ m0·(1 − exp(−Δv99_executed/(Isp·g0))) — the commanded Δv99
      // plus the execution error's few cm/s; bounded here with 0.1 m/s of room.
      expect(l.propellantKg.p99).toBeLessThan(500 * -Math.expm1(-(l.deltaVMS.p99 + 0.1) / (220 * 9.80665)));
    }, 120_000);
  });

  describe('when a second finite burn follows the first', () => {
    it('should carry the first burn through its arc and still agree burn by burn', async () => {
      const result = await budget(request(8, 'finite', true, 2000, 30));
      // Measured: p-values 0.86 / 0.75 (TCM-1) and 0.66 / 0.52 (TCM-2); 1 of 30 samples' TCM-2 re-plan
      // diverged (counted, left out of the statistics, and named in a caveat).
      expectAgreement(result, 30 - result.nonlinear!.notConverged.count);
      expect(result.nonlinear!.notConverged.count).toBeLessThan(30 * 0.1);
      if (result.nonlinear!.notConverged.count > 0) expect(result.caveats.map((c) => c.code)).toContain('BUDGET_REPLAN_NOT_CONVERGED');
    }, 120_000);
  });

  describe('when the samples are split into batches', () => {
    it('should give identical samples on both paths', async () => {
      const r = parseBudgetRequest(request(8, 'finite', false, 200, 4));
      const { nominal } = await prepareBudget(r);
      for (const path of ['linear', 'nonlinear'] as const) {
        const n = path === 'linear' ? 200 : 4;
        const whole = await runBudgetSamples(r, nominal!, { path, firstIndex: 0, count: n });
        const halves = [
          ...await runBudgetSamples(r, nominal!, { path, firstIndex: 0, count: n / 2 }),
          ...await runBudgetSamples(r, nominal!, { path, firstIndex: n / 2, count: n / 2 }),
        ];
        expect(halves).toEqual(whole);
      }
    }, 120_000);
  });

  describe('when the finite burn gets short', () => {
    it('should approach the impulsive budget of the same problem', async () => {
      const linear = async (thrustN: number, model: 'finite' | 'impulsive'): Promise<number[]> => {
        const r = parseBudgetRequest(request(thrustN, model, false, 2000, 0));
        const { plan, nominal } = await prepareBudget(r);
        const res = assembleBudget(r, plan, nominal, await runBudgetSamples(r, nominal!, { path: 'linear', firstIndex: 0, count: 2000 }), []);
        const b = res.linear!.burns[0];
        return [b.deltaVMS.mean, b.deltaVMS.sigma, b.deltaVMS.p99, b.propellantKg.p99];
      };
      const impulsive = await linear(2000, 'impulsive');
      const relative = (v: number[]): number[] => v.map((x, i) => Math.abs(x / impulsive[i] - 1));
      const long = relative(await linear(100, 'finite')); // a 70 s burn
      const short = relative(await linear(2000, 'finite')); // a 3.5 s burn
      // Measured (same seed, same draws), relative to the impulsive budget — 3.5 s burn: mean 1.4e-5, σ 1.7e-3,
      // Δv99 1.2e-4, propellant99 2.0e-4; 70 s burn: 1.8e-4, 3.3e-2, 2.0e-3, 2.6e-3. Limits ~4x above the short burn's.
      [6e-5, 7e-3, 5e-4, 8e-4].forEach((limit, i) => expect(short[i], `quantity ${i}`).toBeLessThan(limit));
      // The difference shrinks with the duration (σ: 19x for a burn 20x shorter).
      expect(long[1]).toBeGreaterThan(5 * short[1]);
    }, 120_000);

    it('should command nearly the impulsive re-plan, sample by sample, on the non-linear path', async () => {
      const commanded = async (thrustN: number, model: 'finite' | 'impulsive'): Promise<number[][]> => {
        // Re-plans to 3 mm (fraction 0.03 of the 0.1 m tolerance): at the default 1 mm, 4 of 20 re-plans of the
        // 3.5 s burn stopped at 1.3–1.9x that tolerance (the arc's numerical floor, measured), none at 3 mm.
        const r = parseBudgetRequest({ ...request(thrustN, model, false, 0, 10), replanToleranceFraction: 0.03 });
        const { nominal } = await prepareBudget(r);
        const samples = await runBudgetSamples(r, nominal!, { path: 'nonlinear', firstIndex: 0, count: 10 });
        expect(samples.every((s) => s.stopReason === null)).toBe(true);
        return samples.map((s) => s.burns[0].commandedKmS);
      };
      const impulsive = await commanded(2000, 'impulsive');
      const largestMS = (c: number[][]): number => Math.max(...c.map((v, i) => Math.hypot(v[0] - impulsive[i][0], v[1] - impulsive[i][1], v[2] - impulsive[i][2]) * 1000));
      const short = largestMS(await commanded(2000, 'finite'));
      const long = largestMS(await commanded(100, 'finite'));
      // Measured: largest difference 0.028 m/s for the 3.5 s burn (of 14 m/s), 0.57 m/s for the 70 s burn.
      expect(short).toBeLessThan(0.1);
      expect(long).toBeGreaterThan(5 * short);
    }, 120_000);
  });
});
