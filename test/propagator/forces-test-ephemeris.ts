/**
 * A tiny analytic ephemeris for tests: the Sun fixed at the origin and each listed body on a circular
 * orbit in the J2000 equatorial x-y plane (radius km, period s, phase at t = 0). Exact by construction,
 * so force and propagation tests do not depend on any real ephemeris. Like every source it refuses
 * epochs outside its span (OutOfSpanError).
 */
import type { Ephemeris } from '../../propagator/ephemeris/ephemeris.ts';
import { assertInSpan } from '../../propagator/ephemeris/index.ts';
import type { BodyName } from '../../propagator/types.ts';

export interface CircularBody {
  body: BodyName;
  radiusKm: number;
  periodS: number;
  phaseRad?: number;
  /** Epoch (TDB s from J2000) at which the phase is phaseRad; the angle is n (t − epoch) + phase, so
   * near this epoch it carries no rounding of a large n·t (at t ~ 1e9 s that rounding moves Mars by
   * ~3e-6 km, noise a run that follows the tabulated planet would feel). @defaultValue 0 */
  phaseEpochTdbS?: number;
}

export function circularEphemeris(orbits: CircularBody[], span = { startTdbS: -1e10, endTdbS: 1e10 }): Ephemeris {
  const byName = new Map(orbits.map((o) => [o.body, o]));
  const into = (body: BodyName, t: number, sign: number, out: Float64Array, offset: number, withVelocity: boolean): void => {
    const orbit = byName.get(body);
    if (orbit === undefined) return; // the Sun, at rest at the origin
    const n = (2 * Math.PI) / orbit.periodS;
    const angle = n * (t - (orbit.phaseEpochTdbS ?? 0)) + (orbit.phaseRad ?? 0);
    out[offset] += sign * orbit.radiusKm * Math.cos(angle);
    out[offset + 1] += sign * orbit.radiusKm * Math.sin(angle);
    if (withVelocity) {
      out[offset + 3] += -sign * orbit.radiusKm * n * Math.sin(angle);
      out[offset + 4] += sign * orbit.radiusKm * n * Math.cos(angle);
    }
  };
  return {
    name: 'circular test ephemeris',
    span,
    bodies: ['sun', ...orbits.map((o) => o.body)],
    stateInto(target, centre, t, out, offset = 0) {
      assertInSpan('circular test ephemeris', span, t);
      for (let i = 0; i < 6; i++) out[offset + i] = 0;
      into(target, t, 1, out, offset, true);
      into(centre, t, -1, out, offset, true);
    },
    positionInto(target, centre, t, out, offset = 0) {
      assertInSpan('circular test ephemeris', span, t);
      for (let i = 0; i < 3; i++) out[offset + i] = 0;
      into(target, t, 1, out, offset, false);
      into(centre, t, -1, out, offset, false);
    },
  };
}
