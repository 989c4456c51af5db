/**
 * Impact detection: the spacecraft crossing the surface (mean or equatorial radius, constants.ts) of
 * the central body or of a perturbing body. Checked at the end of every accepted step and located by
 * bisection on the dense output to 1e-6 s. A pass through a body entirely inside one step is not seen;
 * the step control keeps steps far shorter than a surface crossing near any massive body.
 */
import type { BodyName } from '../types.ts';
import type { Dop853Stepper } from '../integrators/index.ts';
import type { PropagationDynamics } from './propagation-dynamics.ts';

export interface ImpactHit {
  body: BodyName;
  epochTdbS: number;
  distanceKm: number;
}

const TIME_TOLERANCE_S = 1e-6;

/** Finds the first surface crossing (centre or perturbing body, mean radii in km) inside each accepted
 * step, located on the dense output to 1e-6 s (TDB s from J2000). */
export class ImpactWatch {
  private readonly dynamics: PropagationDynamics;
  private readonly cart = new Float64Array(6);
  private readonly bodyPos = new Float64Array(3);
  private readonly dense: Float64Array;

  constructor(dynamics: PropagationDynamics) {
    this.dynamics = dynamics;
    this.dense = new Float64Array(dynamics.initialY.length);
  }

  /** Surface clearance (km, negative inside) of body b (-1: central body) for integration vector y. */
  private clearance(b: number, epochTdbS: number, y: Float64Array): number {
    const forces = this.dynamics.forces;
    this.dynamics.cartesianInto(epochTdbS, y, this.cart);
    let x = this.cart[0];
    let yy = this.cart[1];
    let z = this.cart[2];
    if (b >= 0) {
      forces.bodyPositionInto(b, epochTdbS, this.bodyPos);
      x -= this.bodyPos[0];
      yy -= this.bodyPos[1];
      z -= this.bodyPos[2];
    }
    const radius = b < 0 ? forces.centralRadiusKm : forces.perturbingRadiiKm[b];
    return Math.sqrt(x * x + yy * yy + z * z) - radius;
  }

  /** The first body whose surface the state `y` at `epochTdbS` lies inside, or null. */
  inside(epochTdbS: number, y: Float64Array): ImpactHit | null {
    for (let b = -1; b < this.dynamics.forces.perturbingBodies.length; b++) {
      const c = this.clearance(b, epochTdbS, y);
      if (c < 0) return { body: this.bodyName(b), epochTdbS, distanceKm: c + this.radius(b) };
    }
    return null;
  }

  /** Checks the step just accepted; returns the earliest surface crossing in it, or null. */
  afterStep(stepper: Dop853Stepper): ImpactHit | null {
    let best: ImpactHit | null = null;
    for (let b = -1; b < this.dynamics.forces.perturbingBodies.length; b++) {
      if (this.clearance(b, stepper.t, stepper.y) >= 0) continue;
      const hit = this.locate(b, stepper);
      if (best === null || (hit.epochTdbS - best.epochTdbS) * stepper.direction < 0) best = hit;
    }
    return best;
  }

  private locate(b: number, stepper: Dop853Stepper): ImpactHit {
    if (!stepper.hasDenseOutput) {
      return { body: this.bodyName(b), epochTdbS: stepper.t, distanceKm: this.clearance(b, stepper.t, stepper.y) + this.radius(b) };
    }
    let outside = stepper.tPrevious;
    let inside = stepper.t;
    while (Math.abs(inside - outside) > TIME_TOLERANCE_S) {
      const mid = 0.5 * (outside + inside);
      if (mid === outside || mid === inside) break;
      stepper.denseOutput(mid, this.dense);
      if (this.clearance(b, mid, this.dense) < 0) inside = mid;
      else outside = mid;
    }
    stepper.denseOutput(inside, this.dense);
    const distance = this.clearance(b, inside, this.dense) + this.radius(b);
    return { body: this.bodyName(b), epochTdbS: inside, distanceKm: distance };
  }

  private bodyName(b: number): BodyName {
    return b < 0 ? this.dynamics.forces.centralBody : this.dynamics.forces.perturbingBodies[b];
  }

  private radius(b: number): number {
    return b < 0 ? this.dynamics.forces.centralRadiusKm : this.dynamics.forces.perturbingRadiiKm[b];
  }
}
