/**
 * Error ellipses in the B-plane from a 2×2 covariance of (B·T, B·R).
 */
import { InvalidInputError } from '../../propagator/index.ts';
import type { BPlaneEllipse } from '../../contract/plan-types.ts';
import { requireCovariance, type Matrix } from '../../propagator/index.ts';

/**
 * 1σ ellipse of a 2×2 B-plane covariance [[TT, TR], [RT, RR]] (km²): semi-axes are the square roots of
 * the eigenvalues (km); orientation is the major axis's angle from T toward R, deg in (−90, 90].
 */
export function bPlaneEllipse(covarianceKm2: Matrix): BPlaneEllipse {
  requireCovariance('covarianceKm2', covarianceKm2, 2);
  const a = covarianceKm2[0][0];
  const b = (covarianceKm2[0][1] + covarianceKm2[1][0]) / 2;
  const d = covarianceKm2[1][1];
  const mean = (a + d) / 2;
  const half = Math.hypot((a - d) / 2, b);
  const major = mean + half;
  const minor = mean - half;
  if (minor < -1e-9 * Math.max(major, 1e-300)) {
    throw new InvalidInputError('covarianceKm2', `not positive semi-definite (eigenvalue ${minor})`);
  }
  let orientationDeg = (0.5 * Math.atan2(2 * b, a - d) * 180) / Math.PI;
  if (orientationDeg <= -90) orientationDeg += 180;
  return {
    semiMajorKm: Math.sqrt(Math.max(0, major)),
    semiMinorKm: Math.sqrt(Math.max(0, minor)),
    orientationDeg,
    covarianceKm2: [[a, b], [b, d]],
  };
}

/** Axes of the k-σ ellipse (k·1σ semi-axes), km. For 2-D Gaussian errors it holds a fraction
 * 1 − exp(−k²/2) of the probability (k = 1: 39.3 %, k = 3: 98.9 %). */
export function scaledEllipse(ellipse: BPlaneEllipse, k: number): { semiMajorKm: number; semiMinorKm: number } {
  return { semiMajorKm: k * ellipse.semiMajorKm, semiMinorKm: k * ellipse.semiMinorKm };
}

/** Probability inside the k-σ ellipse of a 2-D Gaussian: 1 − exp(−k²/2). */
export function ellipseProbability(k: number): number {
  return -Math.expm1((-k * k) / 2);
}

/**
 * How far a sample ellipse is from the linear one: largest relative semi-axis difference, and the
 * orientation difference in deg folded to [0, 90]. A near-circular ellipse has no meaningful orientation,
 * so the difference is null when the linear axes differ by less than 10 %. With `samples` (N) given, also
 * the standard error of a sample ellipse's orientation under the linear model, from the asymptotic
 * variance of a principal axis, λ1·λ2/((N − 1)(λ1 − λ2)²) rad² (T. W. Anderson 1963, "Asymptotic theory
 * for principal component analysis", Ann. Math. Statist. 34; from memory) — compare the difference with it.
 */
export function compareEllipses(linear: BPlaneEllipse, sample: BPlaneEllipse, samples?: number): {
  axisRatioError: number; orientationErrorDeg: number | null; orientationStandardErrorDeg: number | null;
} {
  const majorError = Math.abs(sample.semiMajorKm / linear.semiMajorKm - 1);
  const minorError = linear.semiMinorKm > 0 ? Math.abs(sample.semiMinorKm / linear.semiMinorKm - 1) : Number.POSITIVE_INFINITY;
  let angle = Math.abs(sample.orientationDeg - linear.orientationDeg) % 180;
  if (angle > 90) angle = 180 - angle;
  const elongated = linear.semiMinorKm < 0.9 * linear.semiMajorKm;
  const l1 = linear.semiMajorKm ** 2;
  const l2 = linear.semiMinorKm ** 2;
  const orientationStandardErrorDeg = samples !== undefined && samples > 1 && l1 > l2
    ? (Math.sqrt((l1 * l2) / (samples - 1)) / (l1 - l2)) * (180 / Math.PI) : null;
  return { axisRatioError: Math.max(majorError, minorError), orientationErrorDeg: elongated ? angle : null, orientationStandardErrorDeg };
}
