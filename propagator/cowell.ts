/**
 * Cowell's method: the spacecraft's Cartesian state relative to the central body (km, km/s, J2000
 * equatorial) integrated directly under the full force model, optionally with the 6x6 STM.
 */
import { ForceModel } from './forces/index.ts';
import type { LinearTail, RhsFunction } from './integrators/index.ts';
import type { PropagationDynamics } from './run/propagation-dynamics.ts';
import { resetStm, STATE_WITH_STM_LENGTH, STM_OFFSET, variationalRatesInto } from './variational.ts';

/**
 * Right-hand side of Cowell's equations for `model`: y = [r (km), v (km/s)] or, with the STM,
 * [r, v, Φ (36, row-major)]; t in TDB s from J2000. Does not allocate per call.
 */
export function createCowellRhs(model: ForceModel, withStm: boolean): RhsFunction {
  const acc = new Float64Array(3);
  const gradient = new Float64Array(9);
  return (t, y, dydt) => {
    model.accelerationInto(t, y, acc, withStm ? gradient : null);
    stateRatesInto(y, acc, dydt);
    if (withStm) variationalRatesInto(y, gradient, dydt);
  };
}

/**
 * The same right-hand side split for the stepper (LinearTail): the state's derivative with the gradient
 * G = ∂a/∂r kept per stage, and Φ' = A Φ from the kept G — the arithmetic of createCowellRhs, in two calls.
 */
export function createCowellStmTail(model: ForceModel): LinearTail {
  const acc = new Float64Array(3);
  const gradient = new Float64Array(9);
  // G of stages 0..16 (the stepper uses 2..12), 9 numbers each.
  const kept = new Float64Array(9 * 17);
  return {
    offset: STM_OFFSET,
    head(t, y, dydt, stage) {
      model.accelerationInto(t, y, acc, gradient);
      stateRatesInto(y, acc, dydt);
      kept.set(gradient, 9 * stage);
    },
    tail(y, dydt, stage) {
      variationalRatesInto(y, kept, dydt, 9 * stage);
    },
  };
}

/** Cowell dynamics from a Cartesian state (km, km/s, J2000 equatorial, relative to the model's
 * central body) at the start epoch. */
export function createCowellDynamics(model: ForceModel, state: ArrayLike<number>, withStm: boolean): PropagationDynamics {
  const initialY = new Float64Array(withStm ? STATE_WITH_STM_LENGTH : 6);
  for (let i = 0; i < 6; i++) initialY[i] = state[i];
  if (withStm) resetStm(initialY);
  return {
    initialY,
    rhs: createCowellRhs(model, withStm),
    linearTail: withStm ? createCowellStmTail(model) : undefined,
    errorComponents: 6,
    withStm,
    forces: model,
    cartesianInto(_epochTdbS, y, out) {
      for (let i = 0; i < 6; i++) out[i] = y[i];
    },
    translate(_epochTdbS, y, shift) {
      for (let i = 0; i < 6; i++) y[i] -= shift[i];
    },
    applyImpulse(_epochTdbS, y, dv) {
      y[3] += dv[0];
      y[4] += dv[1];
      y[5] += dv[2];
    },
  };
}

/** (ṙ, v̇) = (v, a): the first six rates of Cowell's state (km/s, km/s²) from y = (r, v) and the acceleration. */
function stateRatesInto(y: Float64Array, acc: Float64Array, dydt: Float64Array): void {
  dydt[0] = y[3];
  dydt[1] = y[4];
  dydt[2] = y[5];
  dydt[3] = acc[0];
  dydt[4] = acc[1];
  dydt[5] = acc[2];
}
