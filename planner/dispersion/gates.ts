/**
 * Gates execution-error model: C. R. Gates (1963), "A Simplified Model of Midcourse Maneuver Execution
 * Errors", JPL Technical Report 32-504. Four independent 1σ errors: fixed and proportional magnitude along
 * the burn, fixed and proportional pointing across it (each transverse axis).
 */
import { InvalidInputError, type Vec3 } from '../../propagator/index.ts';
import type { Matrix } from '../../propagator/index.ts';
import type { SampleRandom } from './random.ts';

/** 1σ Gates parameters, as in the problem's `executionErrors`. */
export interface GatesErrors {
  /** Fixed magnitude error, m/s (≥ 0). */
  fixedMagnitudeMS: number;
  /** Proportional magnitude error, fraction of |Δv| (≥ 0; 0.01 = 1 %). */
  proportionalMagnitudeFraction: number;
  /** Fixed pointing error as a velocity per transverse axis, m/s (≥ 0). */
  fixedPointingMS: number;
  /** Proportional pointing error, angle per transverse axis, deg (≥ 0, small-angle model). */
  proportionalPointingDeg: number;
}

/** 1σ spreads of one burn: along the burn and per transverse axis, km/s. */
export interface GatesSigmas {
  magnitudeSigmaKmS: number;
  pointingSigmaKmS: number;
  /** Unit vector of the burn (undefined direction → null: the spread is isotropic). */
  directionUnit: Vec3 | null;
}

function checkErrors(errors: GatesErrors): void {
  for (const key of ['fixedMagnitudeMS', 'proportionalMagnitudeFraction', 'fixedPointingMS', 'proportionalPointingDeg'] as const) {
    const v = errors[key];
    if (!Number.isFinite(v) || v < 0) throw new InvalidInputError(`executionErrors.${key}`, `must be a finite number >= 0, got ${v}`);
  }
}

/**
 * Gates 1σ spreads for a burn of Δv (km/s, any inertial frame):
 * σ_mag² = σ_fixed-mag² + (k_mag·|Δv|)², σ_point² = σ_fixed-point² + (θ·|Δv|)² (θ in rad, small angle).
 */
export function gatesSigmas(deltaVKmS: Vec3, errors: GatesErrors): GatesSigmas {
  checkErrors(errors);
  if (!deltaVKmS.every(Number.isFinite)) throw new InvalidInputError('deltaVKmS', 'must be three finite numbers');
  const magnitude = Math.hypot(...deltaVKmS);
  const magnitudeSigmaKmS = Math.hypot(errors.fixedMagnitudeMS / 1000, errors.proportionalMagnitudeFraction * magnitude);
  const pointingSigmaKmS = Math.hypot(errors.fixedPointingMS / 1000, ((errors.proportionalPointingDeg * Math.PI) / 180) * magnitude);
  const directionUnit: Vec3 | null = magnitude > 0
    ? [deltaVKmS[0] / magnitude, deltaVKmS[1] / magnitude, deltaVKmS[2] / magnitude] : null;
  return { magnitudeSigmaKmS, pointingSigmaKmS, directionUnit };
}

/** Two unit vectors completing `u` to a right-handed orthonormal basis (u, e1, e2). */
export function transverseBasis(u: Vec3): [Vec3, Vec3] {
  // Cross with the axis least aligned with u, for conditioning.
  const ax = Math.abs(u[0]);
  const ay = Math.abs(u[1]);
  const az = Math.abs(u[2]);
  const axis: Vec3 = ax <= ay && ax <= az ? [1, 0, 0] : ay <= az ? [0, 1, 0] : [0, 0, 1];
  const c: Vec3 = [u[1] * axis[2] - u[2] * axis[1], u[2] * axis[0] - u[0] * axis[2], u[0] * axis[1] - u[1] * axis[0]];
  const n = Math.hypot(...c);
  const e1: Vec3 = [c[0] / n, c[1] / n, c[2] / n];
  const e2: Vec3 = [u[1] * e1[2] - u[2] * e1[1], u[2] * e1[0] - u[0] * e1[2], u[0] * e1[1] - u[1] * e1[0]];
  return [e1, e2];
}

/**
 * 3x3 execution-error covariance of one burn, km²/s², in the frame of `deltaVKmS`:
 * P = σ_mag²·ûûᵀ + σ_point²·(I − ûûᵀ). For a zero Δv the direction is undefined and P is isotropic with
 * the same trace, (σ_mag² + 2σ_point²)/3 per axis.
 */
export function gatesCovarianceKm2S2(deltaVKmS: Vec3, errors: GatesErrors): Matrix {
  const { magnitudeSigmaKmS: sm, pointingSigmaKmS: sp, directionUnit: u } = gatesSigmas(deltaVKmS, errors);
  const m2 = sm * sm;
  const p2 = sp * sp;
  if (u === null) {
    const v = (m2 + 2 * p2) / 3;
    return [[v, 0, 0], [0, v, 0], [0, 0, v]];
  }
  return [0, 1, 2].map((i) => [0, 1, 2].map((j) => (m2 - p2) * u[i] * u[j] + (i === j ? p2 : 0)));
}

/**
 * One executed Δv drawn from the Gates Gaussian N(Δv, P): three normals from `random`, in the order
 * along-burn, e1, e2 (always three, so the stream layout does not depend on the values).
 * @returns executed Δv, km/s, same frame as `deltaVKmS`.
 */
export function drawExecutedDeltaV(deltaVKmS: Vec3, errors: GatesErrors, random: SampleRandom): Vec3 {
  const n0 = random.normal();
  const n1 = random.normal();
  const n2 = random.normal();
  return executedDeltaV(deltaVKmS, errors, [n0, n1, n2]);
}

/**
 * The executed Δv for three standard normals already drawn (along-burn, e1, e2): Δv + σ_mag·n0·û +
 * σ_point·(n1·e1 + n2·e2); isotropic with the same trace for a zero Δv.
 * @returns executed Δv, km/s, same frame as `deltaVKmS`.
 */
export function executedDeltaV(deltaVKmS: Vec3, errors: GatesErrors, normals: readonly [number, number, number]): Vec3 {
  const [n0, n1, n2] = normals;
  const { magnitudeSigmaKmS: sm, pointingSigmaKmS: sp, directionUnit } = gatesSigmas(deltaVKmS, errors);
  if (directionUnit === null) {
    const s = Math.sqrt((sm * sm + 2 * sp * sp) / 3);
    return [deltaVKmS[0] + s * n0, deltaVKmS[1] + s * n1, deltaVKmS[2] + s * n2];
  }
  const [e1, e2] = transverseBasis(directionUnit);
  return [0, 1, 2].map((k) => deltaVKmS[k] + sm * n0 * directionUnit[k] + sp * (n1 * e1[k] + n2 * e2[k])) as Vec3;
}
