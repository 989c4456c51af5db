/**
 * Options and result of the Lambert solver (planner/lambert). Frame: any inertial frame, the same for
 * both position vectors; units km, s, km/s, km^3/s^2.
 */
import type { Vec3 } from '../../propagator/index.ts';

/** Sense of the transfer about the reference normal (default the frame's +z axis). */
export type LambertDirection = 'prograde' | 'retrograde';

export interface LambertOptions {
  /** 'prograde': the transfer's angular momentum has a positive component along `referenceNormal`
   * (transfer angle in (0, π) when r1 × r2 points along it, else in (π, 2π)); 'retrograde' the opposite. */
  direction: LambertDirection;
  /** Unit-free direction defining "prograde", same inertial frame as r1 and r2.
   * @defaultValue [0, 0, 1] */
  referenceNormal?: Vec3;
  /** Complete revolutions before arrival (integer ≥ 0). @defaultValue 0 */
  revolutions?: number;
  /** For revolutions > 0, which of the two solutions: Izzo's 'left' branch (x below the minimum-time
   * point) or 'right' branch (x above it). Ignored for 0 revolutions. @defaultValue 'left' */
  branch?: 'left' | 'right';
  /** Convergence tolerance on the Izzo variable x (dimensionless). @defaultValue 1e-12 */
  tolerance?: number;
  /** Householder iteration limit. @defaultValue 25 */
  maxIterations?: number;
}

/** Frozen defaults that code and docs both point to. */
export const LAMBERT_DEFAULTS = Object.freeze({
  referenceNormal: [0, 0, 1] as Readonly<Vec3>,
  tolerance: 1e-12,
  maxIterations: 25,
  revolutions: 0,
  branch: 'left' as const,
});

/** Outcome of one Lambert solve. Not converging is data (converged: false), not an exception. */
export interface LambertSolution {
  /** Velocity at r1 on the transfer orbit, km/s, same frame as the inputs. */
  v1KmS: Vec3;
  /** Velocity at r2 on the transfer orbit, km/s, same frame as the inputs. */
  v2KmS: Vec3;
  /** Householder iterations used. */
  iterations: number;
  converged: boolean;
  /** Transfer angle swept from r1 to r2 in the chosen direction, rad in (0, 2π). */
  transferAngleRad: number;
  /** Izzo's variable x at the solution (x < 1 ellipse, x = 1 parabola, x > 1 hyperbola). */
  x: number;
  /** Complete revolutions of this solution. */
  revolutions: number;
  /** |T(x) − T| at the solution in Izzo's non-dimensional time. */
  residual: number;
  /** Name of the published method used. */
  method: 'izzo-2015-householder';
}
