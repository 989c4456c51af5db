/**
 * Local orbital frames of a burn as three axis vectors (J2000 equatorial), from propagator/frames'
 * RTN / VNB matrices (rows = axes), taken at the burn state relative to the integration centre.
 */
import { localFrameMatrix } from '../../propagator/index.ts';
import type { Vec3 } from '../../propagator/index.ts';

/** The local axes in J2000 equatorial: Δv_inertial = Σ_j axes[j] · Δv_local[j]. */
export type Rotation3 = [Vec3, Vec3, Vec3];

/** Axes of a local frame at the state (r km, v km/s, J2000 equatorial); 'inertial' gives the identity. */
export function localAxes(frame: 'inertial' | 'RTN' | 'VNB', positionKm: Vec3, velocityKmS: Vec3): Rotation3 {
  if (frame === 'inertial') return [[1, 0, 0], [0, 1, 0], [0, 0, 1]];
  const m = localFrameMatrix(frame, positionKm, velocityKmS);
  return [[m[0], m[1], m[2]], [m[3], m[4], m[5]], [m[6], m[7], m[8]]];
}

/** Δv_inertial = Σ_j axes[j] · local[j] (km/s, J2000 equatorial). */
export function localToInertial(axes: Rotation3, local: Vec3): Vec3 {
  return [0, 1, 2].map((i) => axes[0][i] * local[0] + axes[1][i] * local[1] + axes[2][i] * local[2]) as Vec3;
}

/** Δv_local[j] = axes[j] · Δv_inertial (the axes are orthonormal). */
export function inertialToLocal(axes: Rotation3, inertial: Vec3): Vec3 {
  return axes.map((a) => a[0] * inertial[0] + a[1] * inertial[1] + a[2] * inertial[2]) as Vec3;
}
