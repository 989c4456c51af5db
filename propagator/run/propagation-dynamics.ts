/**
 * What the generic propagation loop (propagate.ts) needs from a formulation of the equations of motion
 * (Cowell here; Encke plugs in the same way): the integration vector, its right-hand side, how to read
 * the Cartesian state out of it and how to apply an impulsive Δv.
 */
import type { ForceModel } from '../forces/index.ts';
import type { LinearTail, RhsFunction } from '../integrators/index.ts';
import type { PropagationMethod } from './propagation-types.ts';

/** How many leading components of the integration vector cartesianInto reads (in every formulation): a
 * read-out needs only that much of the dense output. */
export const CARTESIAN_LENGTH = 6;

/** Equations of motion of one formulation over a force model (integration vector, RHS, read-out, Δv). */
export interface PropagationDynamics {
  /** Integration vector at the start epoch (the run's stepper copies it). */
  readonly initialY: Float64Array;
  readonly rhs: RhsFunction;
  /** The right-hand side split into the state and the linear STM equations, when the formulation offers it
   * (the stepper then skips the STM in rejected trial steps). */
  readonly linearTail?: LinearTail;
  /** Leading components of the integration vector that enter the step-size error norm. */
  readonly errorComponents: number;
  /** True when y[6..41] carries the 6x6 STM of the Cartesian state (see variational.ts). */
  readonly withStm: boolean;
  readonly forces: ForceModel;
  /**
   * Writes the Cartesian state at `epochTdbS` (km, km/s, J2000 equatorial, from the central body) for
   * integration vector `y` into out[0..5]; reads y[0..CARTESIAN_LENGTH) only.
   */
  cartesianInto(epochTdbS: number, y: Float64Array, out: Float64Array): void;
  /** Adds `dvKmS` (km/s, J2000 equatorial; already signed for the direction of time) to the velocity
   * held in `y` at `epochTdbS`, in place. */
  applyImpulse(epochTdbS: number, y: Float64Array, dvKmS: ArrayLike<number>): void;
  /** Subtracts `shift` (km, km/s: position in [0..2], velocity in [3..5]) from the Cartesian state held
   * in `y` at `epochTdbS`, in place; Φ is kept (a translation has identity Jacobian). Used when the
   * origin of the integration coordinate moves (forces/moving-centre.ts). */
  translate(epochTdbS: number, y: Float64Array, shift: ArrayLike<number>): void;
  /** Encke: after an accepted step, restarts the reference conic when the deviation is past its
   * threshold, rewriting `y` in place; true when it did (the loop then resets the stepper with y). */
  maybeRectify?(epochTdbS: number, y: Float64Array): boolean;
  /** First trial step, s, when the formulation knows a better one than the stepper's estimate (Encke's
   * deviation starts at zero, where that estimate degenerates). */
  readonly initialStepS?: number;
  /** Largest step, s, when the formulation needs one. */
  readonly maxStepS?: number;
  /** Encke with the STM: rewrites `y` in place so that y[6..41] holds Φ itself (it holds Φ's deviation
   * part between restarts of the reference conic); the loop calls it before reading Φ. */
  settleStm?(epochTdbS: number, y: Float64Array): void;
  /** Encke: reference-conic rectifications so far. */
  readonly rectifications?: number;
  /** The formulation these equations implement, reported as the result's `methodUsed`; absent means
   * Cowell (so a fallback from Encke says 'cowell' explicitly). */
  readonly method?: PropagationMethod;
  /** Called once with the final integration vector when the run ends (a thrust arc reads its parameter
   * sensitivities out of it). */
  onFinish?(epochTdbS: number, y: Float64Array): void;
  /** Notes for the result's `warnings` (e.g. a fallback from Encke to Cowell). */
  readonly warnings?: readonly string[];
}
