/**
 * Is the linear (STM) dispersion consistent with the Monte Carlo samples? Two classical tests of a
 * Gaussian sample against the linear prediction N(μ, Σ):
 * - mean: N·(x̄ − μ)ᵀΣ⁻¹(x̄ − μ) ~ χ²(p) (known-covariance test of a mean);
 * - covariance: the likelihood-ratio statistic for H0: Σ_true = Σ with unknown mean,
 *   n·[tr(Σ⁻¹S) − ln det(Σ⁻¹S) − p], n = N − 1, times Bartlett's correction 1 − (2p + 1 − 2/(p + 1))/(6n),
 *   ~ χ²(p(p+1)/2) (T. W. Anderson, An Introduction to Multivariate Statistical Analysis, ch. 10; from
 *   memory).
 * The check fails when either tail probability is below the significance (default 1e-3: a linear model
 * that is right trips it about once in a thousand seeds). Non-linearity shows as a shifted mean (curvature
 * bias) and a stretched or bent spread.
 */
import { InvalidInputError } from '../../propagator/index.ts';
import { determinant, invert, multiply, requireCovariance, trace, type Matrix } from '../../propagator/index.ts';
import { sampleCovariance, sampleMean } from './sample-statistics.ts';
import { chiSquareSurvival } from './special-functions.ts';

/** Frozen defaults of the linearity check. */
export const LINEARITY_CHECK_DEFAULTS = Object.freeze({ significance: 1e-3 });

export interface LinearityCheck {
  passed: boolean;
  significance: number;
  samples: number;
  dimensions: number;
  meanStatistic: number;
  meanPValue: number;
  covarianceStatistic: number;
  covariancePValue: number;
  /** sqrt(det S / det Σ): ratio of ellipse areas for p = 2 (volumes in general). */
  volumeRatio: number;
  /** Per-quantity ratio of sample to linear standard deviation. */
  sigmaRatios: number[];
  message: string;
}

/**
 * Compares N samples of p target quantities with the linear prediction.
 * @param samples N × p (N ≥ p + 2), same units as `nominal` and `linearCovariance`.
 * @param nominal the linear-model mean: the targets reached by the unperturbed burns.
 * @param linearCovariance p × p, positive definite.
 */
export function checkLinearity(
  samples: readonly (readonly number[])[], nominal: readonly number[], linearCovariance: Matrix,
  options: { significance?: number } = {},
): LinearityCheck {
  const significance = options.significance ?? LINEARITY_CHECK_DEFAULTS.significance;
  const p = nominal.length;
  requireCovariance('linearCovariance', linearCovariance, p);
  const count = samples.length;
  if (count < p + 2) throw new InvalidInputError('samples', `need at least ${p + 2} samples, got ${count}`);
  if (!(significance > 0 && significance < 1)) throw new InvalidInputError('options.significance', 'must be in (0, 1)');
  const mean = sampleMean(samples);
  const s = sampleCovariance(samples, mean);
  const inverse = invert(linearCovariance, 'linearCovariance');
  const dm = mean.map((v, i) => v - nominal[i]);
  const meanStatistic = count * dm.reduce((acc, di, i) => acc + di * dm.reduce((q, dj, j) => q + inverse[i][j] * dj, 0), 0);
  const n = count - 1;
  const ratio = multiply(inverse, s);
  const detRatio = determinant(ratio);
  const bartlett = 1 - (2 * p + 1 - 2 / (p + 1)) / (6 * n);
  const covarianceStatistic = detRatio > 0
    ? bartlett * n * (trace(ratio) - Math.log(detRatio) - p) : Number.POSITIVE_INFINITY;
  const meanPValue = chiSquareSurvival(meanStatistic, p);
  const covariancePValue = chiSquareSurvival(covarianceStatistic, (p * (p + 1)) / 2);
  const passed = meanPValue >= significance && covariancePValue >= significance;
  const sigmaRatios = s.map((row, i) => Math.sqrt(row[i] / linearCovariance[i][i]));
  const volumeRatio = Math.sqrt(Math.max(0, determinant(s) / determinant(linearCovariance)));
  const message = passed
    ? `linear and Monte Carlo dispersions agree (p-values mean ${meanPValue.toPrecision(3)}, covariance ${covariancePValue.toPrecision(3)} ≥ ${significance})`
    : `linear dispersion disagrees with ${count} Monte Carlo samples: p-value of the mean ${meanPValue.toPrecision(3)}, `
      + `of the covariance ${covariancePValue.toPrecision(3)} (limit ${significance}); sample/linear σ ratios `
      + `${sigmaRatios.map((r) => r.toFixed(3)).join(', ')}`;
  return {
    passed, significance, samples: count, dimensions: p, meanStatistic, meanPValue, covarianceStatistic,
    covariancePValue, volumeRatio, sigmaRatios, message,
  };
}
