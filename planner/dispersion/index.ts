/** Dispersion: Gates execution errors, linear covariance mapping, B-plane ellipses, impact probability,
 * seeded Monte Carlo sampling and the linear-versus-sample check. Internal to planner/. */
export { gatesCovarianceKm2S2, gatesSigmas, drawExecutedDeltaV, executedDeltaV, transverseBasis } from './gates.ts';
export type { GatesErrors, GatesSigmas } from './gates.ts';
export { mapCovariance, linearTargetCovariance, standardDeviations } from './linear-mapping.ts';
export type { BurnCovarianceInput, InitialStateCovarianceInput, LinearTargetCovariance } from './linear-mapping.ts';
export { bPlaneEllipse, scaledEllipse, ellipseProbability, compareEllipses } from './ellipse.ts';
export { impactRadiusKm, probabilityInsideDisc, binomialEstimate } from './impact-probability.ts';
export { sampleRandom, splitMix64 } from './random.ts';
export type { SampleRandom } from './random.ts';
export { createDispersionSampler, runSampleRange } from './monte-carlo.ts';
export type { DispersionModel, DispersionSampler, DrawnSample, SampleRangeOptions } from './monte-carlo.ts';
export { mergeSampleBatches, sampleBatches, sampleMean, sampleCovariance } from './sample-statistics.ts';
export { checkLinearity, LINEARITY_CHECK_DEFAULTS } from './linearity-check.ts';
export type { LinearityCheck } from './linearity-check.ts';
export { erfc, normalUpperTail, normalInterval, lnGamma, gammaQ, chiSquareSurvival } from './special-functions.ts';
export { subMatrix, choleskySemidefinite, type Matrix } from '../../propagator/index.ts';
