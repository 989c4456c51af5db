/**
 * The read-out side of a run about a moving centre (forces/moving-centre.ts): wraps Cowell's or Encke's
 * dynamics, whose Cartesian state is the shifted coordinate y, so that everything downstream (events,
 * impacts, samples, the final state) sees the position and velocity from the central body, y − d and
 * ẏ − ḋ. After each accepted step it re-anchors the centre's cubic when d has grown past a share of the
 * distance from the centre, moving y by −d (an exact change of coordinate: the path in the reference
 * body's frame is untouched), so y stays close to the planet-relative state however long the segment.
 */
import type { ForceModel } from '../forces/index.ts';
import type { MovingCentre } from '../forces/moving-centre.ts';
import type { RhsFunction } from '../integrators/index.ts';
import type { PropagationDynamics } from '../run/propagation-dynamics.ts';
import type { PropagationMethod } from '../run/propagation-types.ts';

/** Re-anchoring threshold, one frozen object that code and docs point to. */
export const MOVING_CENTRE_DEFAULTS = Object.freeze({
  /** Re-anchor when |d| / |position from the centre| exceeds this (dimensionless; our choice, so the step
   * control's error scale, set by |y|, stays within 0.1 % of the one a plain run about the centre uses). */
  reanchorRatio: 1e-3,
});

export class MovingCentreDynamics implements PropagationDynamics {
  readonly initialY: Float64Array;
  readonly rhs: RhsFunction;
  readonly errorComponents: number;
  readonly withStm: boolean;
  readonly forces: ForceModel;
  readonly initialStepS: number | undefined;
  readonly maxStepS: number | undefined;
  readonly method: PropagationMethod | undefined;
  readonly warnings: readonly string[] | undefined;
  /** Re-anchorings of the centre's cubic so far. */
  reanchors = 0;
  private readonly inner: PropagationDynamics;
  private readonly centre: MovingCentre;
  private readonly shift = new Float64Array(6);
  private readonly cart = new Float64Array(6);

  /** `inner` runs over a force model with a moving centre, anchored at the run's start epoch. */
  constructor(inner: PropagationDynamics) {
    const centre = inner.forces.movingCentre;
    if (centre === null || !centre.anchored) throw new Error('MovingCentreDynamics needs a force model with an anchored moving centre');
    this.inner = inner;
    this.centre = centre;
    this.initialY = inner.initialY;
    this.rhs = inner.rhs;
    this.errorComponents = inner.errorComponents;
    this.withStm = inner.withStm;
    this.forces = inner.forces;
    this.initialStepS = inner.initialStepS;
    this.maxStepS = inner.maxStepS;
    this.method = inner.method;
    this.warnings = inner.warnings;
  }

  get rectifications(): number | undefined {
    return this.inner.rectifications;
  }

  /** Position and velocity from the central body (km, km/s, J2000 equatorial) at `epochTdbS`. */
  cartesianInto(epochTdbS: number, y: Float64Array, out: Float64Array): void {
    this.inner.cartesianInto(epochTdbS, y, out);
    this.centre.shiftStateInto(epochTdbS, this.shift);
    for (let i = 0; i < 6; i++) out[i] -= this.shift[i];
  }

  applyImpulse(epochTdbS: number, y: Float64Array, dvKmS: ArrayLike<number>): void {
    this.inner.applyImpulse(epochTdbS, y, dvKmS);
  }

  translate(epochTdbS: number, y: Float64Array, shift: ArrayLike<number>): void {
    this.inner.translate(epochTdbS, y, shift);
  }

  /** Φ is unchanged by the shift of coordinate: the inner formulation's own settling applies. */
  settleStm(epochTdbS: number, y: Float64Array): void {
    this.inner.settleStm?.(epochTdbS, y);
  }

  onFinish(epochTdbS: number, y: Float64Array): void {
    this.inner.onFinish?.(epochTdbS, y);
  }

  /** The inner formulation's own rectification, then the centre's re-anchoring; true when y changed. */
  maybeRectify(epochTdbS: number, y: Float64Array): boolean {
    const rectified = this.inner.maybeRectify?.(epochTdbS, y) ?? false;
    const d = this.shift;
    const c = this.cart;
    this.inner.cartesianInto(epochTdbS, y, c);
    this.centre.shiftStateInto(epochTdbS, d);
    const shiftKm = Math.hypot(d[0], d[1], d[2]);
    const distanceKm = Math.hypot(c[0] - d[0], c[1] - d[1], c[2] - d[2]);
    if (!(shiftKm > MOVING_CENTRE_DEFAULTS.reanchorRatio * distanceKm)) return rectified;
    this.inner.translate(epochTdbS, y, d);
    this.forces.anchorMovingCentre(epochTdbS);
    this.reanchors += 1;
    return true;
  }
}
