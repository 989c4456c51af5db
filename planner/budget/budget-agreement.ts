/**
 * Linear vs non-linear Δv, per burn, on the samples both paths completed. Sample i of both paths shares its
 * draws, so besides the distributions' mean, σ and Δv99 the paths are compared sample by sample (paired
 * RMS difference). A burn agrees when every measure is at most `agreementFraction` of the linear σ (mean,
 * σ, paired RMS) or of the linear Δv99.
 */
import type { BudgetRequest } from '../../contract/budget-schema.ts';
import { distribution } from './budget-statistics.ts';
import type { BudgetAgreement, BudgetNominal, BudgetSample, BurnAgreement } from '../../contract/budget-types.ts';

/** Compares the two paths' samples; see the file comment. */
export function compareBudgetPaths(request: BudgetRequest, nominal: BudgetNominal, linear: readonly BudgetSample[], nonlinear: readonly BudgetSample[]): BudgetAgreement {
  const n = nominal.burns.length;
  const limit = request.agreementFraction;
  const byIndex = new Map(linear.filter((s) => s.burns.length === n).map((s) => [s.index, s]));
  const pairs = nonlinear.filter((s) => s.burns.length === n && byIndex.has(s.index))
    .sort((a, b) => a.index - b.index)
    .map((s) => [byIndex.get(s.index) as BudgetSample, s] as const);
  const burns: BurnAgreement[] = nominal.burns.map((b, k) => {
    const lin = distribution(pairs.map(([l]) => l.burns[k].magnitudeMS));
    const non = distribution(pairs.map(([, q]) => q.burns[k].magnitudeMS));
    const sigma = lin.sigma > 0 ? lin.sigma : Number.MIN_VALUE;
    const paired = pairs.length > 0 ? Math.sqrt(pairs.reduce((acc, [l, q]) => {
      const d = [0, 1, 2].map((i) => l.burns[k].commandedKmS[i] - q.burns[k].commandedKmS[i]);
      return acc + (Math.hypot(...d) * 1000) ** 2;
    }, 0) / pairs.length) / sigma : Number.POSITIVE_INFINITY;
    const meanDifference = Math.abs(lin.mean - non.mean) / sigma;
    const sigmaDifference = Math.abs(lin.sigma - non.sigma) / sigma;
    const p99Difference = lin.p99 > 0 ? Math.abs(lin.p99 - non.p99) / lin.p99 : Math.abs(non.p99) > 0 ? Number.POSITIVE_INFINITY : 0;
    return {
      label: b.label, samples: pairs.length,
      linear: { mean: lin.mean, sigma: lin.sigma, p99: lin.p99 }, nonlinear: { mean: non.mean, sigma: non.sigma, p99: non.p99 },
      meanDifference, sigmaDifference, p99Difference, pairedRms: paired,
      passed: pairs.length >= 2 && Math.max(meanDifference, sigmaDifference, p99Difference, paired) <= limit,
    };
  });
  const passed = burns.every((b) => b.passed);
  const worst = (b: BurnAgreement): string => `${b.label}: mean ${b.meanDifference.toFixed(3)}σ, σ ${b.sigmaDifference.toFixed(3)}σ, Δv99 ${(100 * b.p99Difference).toFixed(1)} %, paired RMS ${b.pairedRms.toFixed(3)}σ`;
  return {
    passed, limit, burns,
    message: passed
      ? `linear and non-linear paths agree on every burn within ${limit} (${pairs.length} paired samples)`
      : `linear and non-linear paths disagree (limit ${limit}): ${burns.filter((b) => !b.passed).map(worst).join('; ')}`,
  };
}
