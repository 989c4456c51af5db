/**
 * Linear vs non-linear, per burn, by the same check as the plan's linear/Monte Carlo comparison
 * (planner/dispersion/linearity-check.ts: the mean test, χ²(p), and the covariance likelihood-ratio test,
 * χ²(p(p+1)/2), each with its p-value). For burn k the p quantities are its free Δv components along the
 * burn's nominal local axes, m/s. The linear prediction N(μ, Σ) is the linear path's mean and covariance of
 * them over all its samples (the linear path is a linear map of Gaussian draws, up to the Gates errors'
 * scaling with |Δv|); the non-linear samples that did every burn are the sample checked against it.
 * A burn agrees when both p-values are at least the significance (request.agreementSignificance, else the
 * check's own default). Each path's |Δv| mean, σ and Δv99 are reported beside it for reading.
 */
import { InvalidInputError, axesFromInertial, localAxes } from '../../propagator/index.ts';
import { LINEARITY_CHECK_DEFAULTS, checkLinearity } from '../dispersion/linearity-check.ts';
import { sampleCovariance, sampleMean } from '../dispersion/sample-statistics.ts';
import type { BudgetRequest } from '../../contract/budget-schema.ts';
import { distribution } from './budget-statistics.ts';
import type { BudgetAgreement, BudgetNominal, BudgetSample, BurnAgreement, NominalBurn } from '../../contract/budget-types.ts';

const AXIS_NAMES: Record<NominalBurn['frame'], [string, string, string]> = { inertial: ['x', 'y', 'z'], RTN: ['R', 'T', 'N'], VNB: ['V', 'N', 'B'] };

/** Burn k's free Δv components along its nominal local axes, m/s, for each sample. */
function freeComponentsMS(burn: NominalBurn, k: number, samples: readonly BudgetSample[]): number[][] {
  const axes = localAxes(burn.frame, burn.preBurnState.slice(0, 3), burn.preBurnState.slice(3, 6));
  return samples.map((s) => axesFromInertial(axes, s.burns[k].commandedKmS).filter((_, j) => burn.freeComponents[j]).map((v) => v * 1000));
}

const finiteOrNull = (v: number): number | null => (Number.isFinite(v) ? v : null);
const summary = (values: number[]): { mean: number; sigma: number; p99: number } => {
  const d = distribution(values);
  return { mean: d.mean, sigma: d.sigma, p99: d.p99 };
};

function burnAgreement(nominal: BudgetNominal, k: number, linear: readonly BudgetSample[], nonlinear: readonly BudgetSample[], significance: number): BurnAgreement {
  const burn = nominal.burns[k];
  const components = AXIS_NAMES[burn.frame].filter((_, j) => burn.freeComponents[j]).map((a) => `Δv ${a}`);
  const base = {
    label: burn.label, samples: nonlinear.length, components,
    linear: summary(linear.map((s) => s.burns[k].magnitudeMS)), nonlinear: summary(nonlinear.map((s) => s.burns[k].magnitudeMS)),
  };
  const notChecked = (why: string): BurnAgreement => ({
    ...base, checked: false, meanStatistic: null, meanPValue: null, covarianceStatistic: null, covariancePValue: null, sigmaRatios: [],
    passed: false, message: `${burn.label}: not checked — ${why}`,
  });
  const p = components.length;
  if (linear.length < p + 2 || nonlinear.length < p + 2) {
    return notChecked(`needs at least ${p + 2} samples of each path (linear ${linear.length}, non-linear ${nonlinear.length})`);
  }
  const lin = freeComponentsMS(burn, k, linear);
  const mean = sampleMean(lin);
  try {
    const c = checkLinearity(freeComponentsMS(burn, k, nonlinear), mean, sampleCovariance(lin, mean), { significance });
    return {
      ...base, checked: true, meanStatistic: finiteOrNull(c.meanStatistic), meanPValue: c.meanPValue,
      covarianceStatistic: finiteOrNull(c.covarianceStatistic), covariancePValue: c.covariancePValue,
      sigmaRatios: c.sigmaRatios.map((r) => finiteOrNull(r) ?? 0), passed: c.passed, message: `${burn.label}: ${c.message}`,
    };
  } catch (error) {
    // A linear covariance that is not positive definite (a component without dispersion) cannot be tested.
    if (error instanceof InvalidInputError) return notChecked(`the linear covariance of ${components.join(', ')} cannot be used (${error.message})`);
    throw error;
  }
}

/** Checks the non-linear samples against the linear path's prediction, burn by burn; see the file comment. */
export function compareBudgetPaths(request: BudgetRequest, nominal: BudgetNominal, linear: readonly BudgetSample[], nonlinear: readonly BudgetSample[]): BudgetAgreement {
  const n = nominal.burns.length;
  const significance = request.agreementSignificance ?? LINEARITY_CHECK_DEFAULTS.significance;
  const complete = (samples: readonly BudgetSample[]): BudgetSample[] => samples.filter((s) => s.burns.length === n).sort((a, b) => a.index - b.index);
  const lin = complete(linear);
  const non = complete(nonlinear);
  const burns = nominal.burns.map((_, k) => burnAgreement(nominal, k, lin, non, significance));
  const passed = burns.every((b) => b.passed);
  return {
    passed, significance, burns,
    message: passed
      ? `linear and non-linear paths agree on every burn (${non.length} non-linear samples against ${lin.length} linear; p-values ≥ ${significance})`
      : `linear and non-linear paths ${burns.some((b) => b.checked && !b.passed) ? 'disagree' : 'could not be compared'}: ${burns.filter((b) => !b.passed).map((b) => b.message).join('; ')}`,
  };
}
