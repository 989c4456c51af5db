/**
 * Ranges of the retargeting problem's numbers, written once for every door (API, CLI, console, worker) and
 * for the propagator's own request check, so what the worker would refuse the door refuses first, naming the
 * field. Each range is an engineering envelope (common practice, not a published table): wide enough for any
 * planetary mission, narrow enough that the numerics stay finite (|r|², r × v and STM products of the largest
 * values do not overflow a double) and that a tolerance is one the corrector can reach.
 */

/** Relative tolerance of the integrators' step control (DOP853, RK4), dimensionless, in [min, max]. Below
 * 1e-14 the error estimate is at the level of double rounding (ε ≈ 2.2e-16 times the step's terms). */
export const RELATIVE_TOLERANCE_RANGE = Object.freeze({ min: 1e-14, max: 1e-3 });

export const PROBLEM_BOUNDS = Object.freeze({
  /** Largest |component| of a position, km: 1e11 km ≈ 670 au, beyond every body of the built-in ephemeris. */
  positionKm: 1e11,
  /** Largest |component| of a velocity, km/s (spacecraft heliocentric speeds stay below ~200 km/s). */
  velocityKmS: 1e3,
  /** Largest |component| of a Δv guess or bound, and of the corrector's step, km/s. */
  deltaVKmS: 100,
  /** Largest spacecraft mass, kg. */
  massKg: 1e7,
  /** Largest specific impulse, s (electric propulsion reaches ~1e4 s). */
  ispS: 1e5,
  /** Largest thrust, N. */
  thrustN: 1e7,
  /** Largest solar-pressure area, m². */
  areaM2: 1e6,
  /** Position tolerance of a target, km: [1e-6 (1 mm), 1e9]. Finer than 1 mm chases integration noise. */
  toleranceKm: Object.freeze({ min: 1e-6, max: 1e9 }),
  /** Epoch tolerance of a target, s. */
  toleranceS: Object.freeze({ min: 1e-3, max: 1e8 }),
  /** Angle tolerance of a target, deg. */
  toleranceDeg: Object.freeze({ min: 1e-6, max: 180 }),
  /** Velocity tolerance of a target, km/s (1e-9 km/s = 1 µm/s). */
  velocityToleranceKmS: Object.freeze({ min: 1e-9, max: 1e3 }),
  /** Largest |B·T|, |B·R|, periapsis radius or altitude, km. */
  distanceKm: 1e10,
  /** Largest |entry| of the initial covariance, km², km²/s or km²/s² ((1e11 km)² for positions). */
  covarianceEntry: 1e22,
  /** Largest fixed execution error, m/s. */
  executionErrorMS: 1e3,
  /** Largest burn-epoch step of the corrector, s (about 3 years). */
  maxEpochStepS: 1e8,
  /** Jacobian condition-number limit, dimensionless. */
  conditionNumberLimit: Object.freeze({ min: 1, max: 1e16 }),
});
