/**
 * Cowell's equations during a finite burn: r'' = a_forces(t, r) + (F/m(t))·d(r, v), with constant thrust F
 * along the direction d of thrust-direction.ts and the mass m(t) = m_ign − ṁ·(t − t_ign) falling linearly
 * (constant mass flow, so the mass needs no integration). With the STM the integration vector is
 *   y = [r (3), v (3), Φ (36), ψ_u (6x3), ψ_m (6)]  (66 numbers, row-major blocks),
 * where Φ = ∂x/∂x(t_ign) obeys Φ' = A Φ with A = [[0, I], [G + k ∂d/∂r, k ∂d/∂v]], k = F/m, G = ∂a/∂r;
 * ψ_u = ∂x/∂u (the direction components as given) obeys ψ_u' = A ψ_u + [0; k Mᵀ] and ψ_m = ∂x/∂m_ign obeys
 * ψ_m' = A ψ_m + [0; −(k/m) d], both zero at ignition (sensitivity equations of a parameter-dependent ODE,
 * e.g. Montenbruck & Gill, Satellite Orbits, §7.1). The SRP term scales with 1/m through
 * ForceModel.srpMassScale; its mass dependence is left out of ψ_m (see FiniteBurnSensitivity).
 * Units: km, s, km/s, kg, N; J2000 equatorial relative to the force model's central body; TDB s.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { AddedAcceleration } from '../encke/encke-dynamics.ts';
import type { ForceModel } from '../forces/index.ts';
import type { PropagationDynamics } from '../run/propagation-dynamics.ts';
import type { ThrustAxes } from '../run/propagation-types.ts';
import type { Vec3 } from '../types.ts';
import { resetStm, STATE_WITH_STM_LENGTH, STM_OFFSET } from '../variational.ts';
import { ThrustDirection } from './thrust-direction.ts';

/** Offset of ψ_u (6x3) and ψ_m (6) in the integration vector with the STM. */
export const DIRECTION_SENSITIVITY_OFFSET = STATE_WITH_STM_LENGTH;
export const MASS_SENSITIVITY_OFFSET = STATE_WITH_STM_LENGTH + 18;
/** Length of a thrust arc's integration vector with the STM. */
export const ARC_WITH_STM_LENGTH = STATE_WITH_STM_LENGTH + 24;

/** One thrust arc as the dynamics need it; the arc writes its end sensitivities back into `end`. */
export interface ThrustArc {
  /** Ignition, TDB s from J2000. */
  startTdbS: number;
  thrustN: number;
  massFlowKgS: number;
  /** Mass at ignition, kg. */
  massAtStartKg: number;
  axes: ThrustAxes;
  direction: Vec3;
  /** Filled when the run ends: ψ_u (18) and ψ_m (6) at the final epoch (with the STM). */
  end?: { directionSensitivity: number[]; massSensitivity: number[] };
}

/** Mass at `epochTdbS` during the arc, kg. */
export function arcMassKg(arc: ThrustArc, epochTdbS: number): number {
  return arc.massAtStartKg - arc.massFlowKgS * (epochTdbS - arc.startTdbS);
}

/** Thrust acceleration, km/s^2, J2000 equatorial, at `epochTdbS` for the state y[0..5] into out[0..2]. */
export function thrustAccelerationInto(arc: ThrustArc, epochTdbS: number, y: ArrayLike<number>, out: Float64Array): void {
  const dir = new ThrustDirection(arc.axes, arc.direction);
  dir.update(y, false);
  const k = arc.thrustN / 1000 / arcMassKg(arc, epochTdbS);
  for (let i = 0; i < 3; i++) out[i] = k * dir.inertial[i];
}

/** The arc's thrust as an acceleration added to another formulation's force model (Encke without the STM):
 * F/m(t) along the direction at the true state, km/s², J2000 equatorial; it also sets the model's SRP mass
 * scale for the epoch, as the Cowell arc below does. */
export function thrustAddedAcceleration(forces: ForceModel, arc: ThrustArc): AddedAcceleration {
  const dir = new ThrustDirection(arc.axes, arc.direction);
  return {
    accelerationInto(epochTdbS, state, out) {
      const m = arcMassKg(arc, epochTdbS);
      forces.srpMassScale = arc.massAtStartKg / m;
      dir.update(state, false);
      const k = arc.thrustN / 1000 / m;
      for (let i = 0; i < 3; i++) out[i] = k * dir.inertial[i];
    },
  };
}

/**
 * out = A·block for a 6 x c row-major block at y[offset..], A as in the file comment (gradient g: 3x3 of the
 * forces plus k·∂d/∂r; dv: k·∂d/∂v, 3x3 each).
 */
function applyA(y: Float64Array, dydt: Float64Array, offset: number, c: number, g: Float64Array, dv: Float64Array): void {
  for (let j = 0; j < 3 * c; j++) dydt[offset + j] = y[offset + 3 * c + j];
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < c; j++) {
      let s = 0;
      for (let p = 0; p < 3; p++) s += g[3 * i + p] * y[offset + c * p + j] + dv[3 * i + p] * y[offset + c * (3 + p) + j];
      dydt[offset + c * (3 + i) + j] = s;
    }
  }
}

/** Thrust-arc dynamics from a Cartesian state (km, km/s, J2000 equatorial, from the model's central body)
 * at ignition; see the file comment. */
export function createThrustArcDynamics(forces: ForceModel, state: ArrayLike<number>, withStm: boolean, arc: ThrustArc): PropagationDynamics {
  const initialY = new Float64Array(withStm ? ARC_WITH_STM_LENGTH : 6);
  for (let i = 0; i < 6; i++) initialY[i] = state[i];
  if (withStm) resetStm(initialY);
  const dir = new ThrustDirection(arc.axes, arc.direction);
  const acc = new Float64Array(3);
  const grad = new Float64Array(9);
  const g = new Float64Array(9);
  const dv = new Float64Array(9);
  const local = arc.axes !== 'inertial';
  const rhs = (t: number, y: Float64Array, dydt: Float64Array): void => {
    const m = arcMassKg(arc, t);
    forces.srpMassScale = arc.massAtStartKg / m;
    forces.accelerationInto(t, y, acc, withStm ? grad : null);
    dir.update(y, withStm && local);
    const k = arc.thrustN / 1000 / m;
    for (let i = 0; i < 3; i++) {
      dydt[i] = y[3 + i];
      dydt[3 + i] = acc[i] + k * dir.inertial[i];
    }
    if (!withStm) return;
    for (let i = 0; i < 3; i++) {
      for (let p = 0; p < 3; p++) {
        g[3 * i + p] = grad[3 * i + p] + (local ? k * dir.jacobian[6 * i + p] : 0);
        dv[3 * i + p] = local ? k * dir.jacobian[6 * i + 3 + p] : 0;
      }
    }
    applyA(y, dydt, STM_OFFSET, 6, g, dv);
    applyA(y, dydt, DIRECTION_SENSITIVITY_OFFSET, 3, g, dv);
    applyA(y, dydt, MASS_SENSITIVITY_OFFSET, 1, g, dv);
    for (let i = 0; i < 3; i++) {
      // ∂(k Mᵀu)/∂u_j = k e_j (column j of Mᵀ = row j of M); ∂k/∂m_ign = −k/m.
      for (let j = 0; j < 3; j++) dydt[DIRECTION_SENSITIVITY_OFFSET + 3 * (3 + i) + j] += k * dir.axesRows[3 * j + i];
      dydt[MASS_SENSITIVITY_OFFSET + 3 + i] -= (k / m) * dir.inertial[i];
    }
  };
  return {
    initialY,
    rhs,
    errorComponents: 6,
    withStm,
    forces,
    cartesianInto(_epochTdbS, y, out) {
      for (let i = 0; i < 6; i++) out[i] = y[i];
    },
    applyImpulse() {
      throw new InvalidInputError('burns', 'an impulsive burn cannot be applied inside a finite burn');
    },
    translate(_epochTdbS, y, shift) {
      for (let i = 0; i < 6; i++) y[i] -= shift[i];
    },
    onFinish(_epochTdbS, y) {
      forces.srpMassScale = 1;
      if (!withStm) return;
      arc.end = {
        directionSensitivity: Array.from(y.subarray(DIRECTION_SENSITIVITY_OFFSET, DIRECTION_SENSITIVITY_OFFSET + 18)),
        massSensitivity: Array.from(y.subarray(MASS_SENSITIVITY_OFFSET, MASS_SENSITIVITY_OFFSET + 6)),
      };
    },
  };
}
