/** Shapes of finite burns in the targeting code (see finite-controls.ts); epochs TDB s from J2000, N, kg/s. */
import type { Vec3 } from '../../propagator/index.ts';

/** A finite burn's seed (finite-controls.ts explains it); epochs TDB s from J2000. */
export interface FiniteSeed {
  /** Unit direction in the burn's frame axes, and two unit vectors across it. */
  direction: Vec3;
  across: [Vec3, Vec3];
  startTdbS: number;
  durationS: number;
  thrustN: number;
  massFlowKgS: number;
  /** |Δv| of the impulsive solution that met the same targets, km/s. */
  impulsiveDeltaVKmS: number;
}

/** A finite burn as the evaluator flies it. */
export interface FiniteSetting {
  startTdbS: number;
  durationS: number;
  thrustN: number;
  massFlowKgS: number;
  /** Unit direction in the burn's frame axes, and its partials with respect to the two pointing offsets. */
  directionLocal: Vec3;
  directionPartials: [Vec3, Vec3];
}
