/**
 * Propellant, burn duration and Δv axes of impulsive burns.
 * Rocket equation (Tsiolkovsky): Δv = Isp·g0·ln(m0/m1), g0 = 9.80665 m/s² exactly (3rd CGPM, 1901).
 * Burn duration assumes constant thrust and constant mass flow ṁ = F/(Isp·g0) (common practice for a
 * first estimate of a chemical engine's burn).
 * Δv axes: inertial (the state's frame, J2000 equatorial in the planner) and the local RTN / VNB frames of
 * propagator/frames, taken at the pre-burn state relative to the integration centre.
 */
import {
  InvalidInputError, STANDARD_GRAVITY_M_S2, inertialToLocal, localToInertial, type LocalFrame, type Vec3,
} from '../propagator/index.ts';

function requirePositive(field: string, value: number): void {
  if (!Number.isFinite(value) || value <= 0) throw new InvalidInputError(field, `must be a finite number > 0, got ${value}`);
}

function requireNonNegative(field: string, value: number): void {
  if (!Number.isFinite(value) || value < 0) throw new InvalidInputError(field, `must be a finite number >= 0, got ${value}`);
}

/** Effective exhaust velocity Isp·g0, km/s, for a specific impulse in s (> 0). */
export function exhaustVelocityKmS(specificImpulseS: number): number {
  requirePositive('specificImpulseS', specificImpulseS);
  return (specificImpulseS * STANDARD_GRAVITY_M_S2) / 1000;
}

/**
 * Propellant used by an impulsive burn: m_p = m0·(1 − exp(−Δv/(Isp·g0))).
 * @param deltaVKmS burn magnitude, km/s, in [0, ∞).
 * @param initialMassKg mass before the burn, kg, > 0.
 * @param specificImpulseS engine specific impulse, s, > 0.
 * @returns propellant mass, kg, in [0, initialMassKg).
 */
export function propellantMassKg(deltaVKmS: number, initialMassKg: number, specificImpulseS: number): number {
  requireNonNegative('deltaVKmS', deltaVKmS);
  requirePositive('initialMassKg', initialMassKg);
  // -expm1(-x) keeps full precision for the small Δv of correction burns.
  return -initialMassKg * Math.expm1(-deltaVKmS / exhaustVelocityKmS(specificImpulseS));
}

/**
 * Δv given by burning `propellantKg` from `initialMassKg`: Δv = Isp·g0·ln(m0/(m0 − m_p)), km/s.
 * @param propellantKg in [0, initialMassKg).
 */
export function deltaVFromPropellantKmS(propellantKg: number, initialMassKg: number, specificImpulseS: number): number {
  requirePositive('initialMassKg', initialMassKg);
  requireNonNegative('propellantKg', propellantKg);
  if (propellantKg >= initialMassKg) {
    throw new InvalidInputError('propellantKg', `must be below the initial mass ${initialMassKg} kg, got ${propellantKg}`);
  }
  return -exhaustVelocityKmS(specificImpulseS) * Math.log1p(-propellantKg / initialMassKg);
}

/** Mass flow of a constant-thrust engine, ṁ = F/(Isp·g0), kg/s; thrust in N (> 0), Isp in s (> 0). */
export function massFlowRateKgS(thrustN: number, specificImpulseS: number): number {
  requirePositive('thrustN', thrustN);
  requirePositive('specificImpulseS', specificImpulseS);
  return thrustN / (specificImpulseS * STANDARD_GRAVITY_M_S2);
}

/**
 * Duration of a constant-thrust burn delivering Δv: t = m_p/ṁ = (m0·Isp·g0/F)·(1 − exp(−Δv/(Isp·g0))), s.
 * @param deltaVKmS burn magnitude, km/s, ≥ 0; @param initialMassKg kg, > 0; @param specificImpulseS s, > 0;
 * @param thrustN N, > 0.
 */
export function burnDurationS(deltaVKmS: number, initialMassKg: number, specificImpulseS: number, thrustN: number): number {
  return propellantMassKg(deltaVKmS, initialMassKg, specificImpulseS) / massFlowRateKgS(thrustN, specificImpulseS);
}

/** One burn's share of a sequence: masses before/after (kg), propellant (kg), duration (s). */
export interface BurnBudget {
  deltaVKmS: number;
  massBeforeKg: number;
  propellantKg: number;
  massAfterKg: number;
  durationS: number;
}

/**
 * Propellant and durations of burns executed in order by one engine, the mass dropping after each.
 * @param deltaVMagnitudesKmS burn magnitudes in execution order, km/s, each ≥ 0.
 * @param initialMassKg wet mass before the first burn, kg.
 */
export function budgetBurns(
  deltaVMagnitudesKmS: readonly number[], initialMassKg: number, specificImpulseS: number, thrustN: number,
): BurnBudget[] {
  let mass = initialMassKg;
  return deltaVMagnitudesKmS.map((deltaVKmS, i) => {
    if (!Number.isFinite(deltaVKmS) || deltaVKmS < 0) {
      throw new InvalidInputError(`deltaVMagnitudesKmS[${i}]`, `must be a finite number >= 0, got ${deltaVKmS}`);
    }
    const propellantKg = propellantMassKg(deltaVKmS, mass, specificImpulseS);
    const budget: BurnBudget = {
      deltaVKmS, massBeforeKg: mass, propellantKg, massAfterKg: mass - propellantKg,
      durationS: propellantKg / massFlowRateKgS(thrustN, specificImpulseS),
    };
    mass -= propellantKg;
    return budget;
  });
}

/** Axes a burn's Δv may be given in: the inertial frame of the state, or a local frame built from it. */
export type BurnAxes = 'inertial' | LocalFrame;

function requireVec3(field: string, v: readonly number[]): void {
  if (!Array.isArray(v) || v.length !== 3 || !v.every(Number.isFinite)) {
    throw new InvalidInputError(field, `must be three finite numbers, got ${JSON.stringify(v)}`);
  }
}

/**
 * Δv given in `axes` → inertial components (km/s, the frame of positionKm/velocityKmS).
 * @param positionKm, velocityKmS the pre-burn state (km, km/s) relative to the integration centre.
 */
export function deltaVToInertialKmS(deltaVKmS: Vec3, axes: BurnAxes, positionKm: Vec3, velocityKmS: Vec3): Vec3 {
  requireVec3('deltaVKmS', deltaVKmS);
  if (axes === 'inertial') return [deltaVKmS[0], deltaVKmS[1], deltaVKmS[2]];
  return localToInertial(deltaVKmS, axes, positionKm, velocityKmS);
}

/** Inertial Δv (km/s) → components in `axes` at the pre-burn state (km, km/s). */
export function deltaVFromInertialKmS(deltaVInertialKmS: Vec3, axes: BurnAxes, positionKm: Vec3, velocityKmS: Vec3): Vec3 {
  requireVec3('deltaVInertialKmS', deltaVInertialKmS);
  if (axes === 'inertial') return [deltaVInertialKmS[0], deltaVInertialKmS[1], deltaVInertialKmS[2]];
  return inertialToLocal(deltaVInertialKmS, axes, positionKm, velocityKmS);
}

/** One inertial Δv (km/s) expressed in every axes set a plan reports, plus its magnitude in m/s. */
export function deltaVInAllAxes(deltaVInertialKmS: Vec3, positionKm: Vec3, velocityKmS: Vec3): {
  inertialKmS: Vec3; rtnKmS: Vec3; vnbKmS: Vec3; magnitudeMS: number;
} {
  requireVec3('deltaVInertialKmS', deltaVInertialKmS);
  return {
    inertialKmS: [deltaVInertialKmS[0], deltaVInertialKmS[1], deltaVInertialKmS[2]],
    rtnKmS: inertialToLocal(deltaVInertialKmS, 'RTN', positionKm, velocityKmS),
    vnbKmS: inertialToLocal(deltaVInertialKmS, 'VNB', positionKm, velocityKmS),
    magnitudeMS: Math.hypot(...deltaVInertialKmS) * 1000,
  };
}
