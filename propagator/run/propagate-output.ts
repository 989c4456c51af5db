/** Output helpers of a propagation run: state vectors and samples at a fixed output step. */
import type { Dop853Stepper } from '../integrators/index.ts';
import { CARTESIAN_LENGTH, type PropagationDynamics } from './propagation-dynamics.ts';
import type { BodyName, StateVector } from '../types.ts';

/** A J2000 equatorial StateVector from a Cartesian 6-vector (km, km/s) relative to `centre`. */
export function stateVector(epochTdbS: number, centre: BodyName, cart: ArrayLike<number>): StateVector {
  return {
    epochTdbS,
    centre,
    frame: 'J2000_EQUATORIAL',
    positionKm: [cart[0], cart[1], cart[2]],
    velocityKmS: [cart[3], cart[4], cart[5]],
  };
}

/**
 * Emits states at start + k·stepS (k = 0, 1, ...) strictly before the end epoch; the run appends the
 * final state itself. A sample that falls on a burn epoch is the state before the burn.
 */
export class OutputSampler {
  readonly samples: StateVector[] = [];
  private next = 0;
  private readonly cart = new Float64Array(6);
  private readonly dense: Float64Array;

  constructor(
    private readonly dynamics: PropagationDynamics,
    private readonly startTdbS: number,
    private readonly endTdbS: number,
    private readonly stepS: number,
    private readonly direction: 1 | -1,
  ) {
    this.dense = new Float64Array(dynamics.initialY.length);
  }

  private epochOf(k: number): number {
    return this.startTdbS + this.direction * k * this.stepS;
  }

  /** True while sample k lies strictly before the end (by more than a microsecond). */
  private beforeEnd(epoch: number): boolean {
    return (this.endTdbS - epoch) * this.direction > 1e-6;
  }

  /** Emits the sample at the start epoch from the initial integration vector. */
  emitStart(y: Float64Array): void {
    if (!this.beforeEnd(this.startTdbS)) return;
    this.push(this.startTdbS, y);
    this.next = 1;
  }

  /** Emits every sample inside the last accepted step up to `limitTdbS` (inclusive). */
  emitThrough(stepper: Dop853Stepper, limitTdbS: number): void {
    for (;;) {
      const epoch = this.epochOf(this.next);
      if ((epoch - limitTdbS) * this.direction > 0 || !this.beforeEnd(epoch)) return;
      if (epoch === stepper.t || !stepper.hasDenseOutput) {
        this.push(epoch, stepper.y);
      } else {
        stepper.denseOutput(epoch, this.dense, CARTESIAN_LENGTH);
        this.push(epoch, this.dense);
      }
      this.next += 1;
    }
  }

  /** Appends the final state (the end of the run, or where it stopped). */
  finish(final: StateVector): void {
    this.samples.push(final);
  }

  private push(epoch: number, y: Float64Array): void {
    this.dynamics.cartesianInto(epoch, y, this.cart);
    this.samples.push(stateVector(epoch, this.dynamics.forces.centralBody, this.cart));
  }
}
