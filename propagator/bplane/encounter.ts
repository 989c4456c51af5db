/**
 * B-plane of a flyby found in a propagation: takes the closest approach to the body located by the
 * run's events and computes the B-plane of the osculating conic there (any state on the hyperbola gives
 * the same S, B, θ; the time to periapsis is then ~0).
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { EventRecord } from '../run/propagation-types.ts';
import type { BodyName } from '../types.ts';
import { bPlanePartials, type BPlanePartials } from './b-plane.ts';
import type { BPlaneReference } from './reference-plane.ts';

/**
 * B-plane (with partials w.r.t. the state at the closest approach) of the closest approach to `body`.
 * @param events the run's events; needs a 'closest-approach' (or 'periapsis') event for `body`
 * @param muKm3S2 the body's GM, km^3/s^2
 * @throws InvalidInputError (field `body`) when no approach was recorded, or when the closest approach found
 *   is not on a hyperbola about the body — the message gives its epoch, distance and eccentricity
 */
export function bPlaneOfEncounter(events: readonly EventRecord[], body: BodyName, muKm3S2: number,
  referencePlane: BPlaneReference = 'ecliptic'): BPlanePartials & { approach: EventRecord } {
  const approaches = events.filter((e) => (e.kind === 'closest-approach' || e.kind === 'periapsis') && e.body === body);
  if (approaches.length === 0) {
    throw new InvalidInputError('body', `no closest approach to ${body} was recorded in the run `
      + `(ask for a 'closest-approach' event for ${body})`);
  }
  const closest = approaches.reduce((a, b) => ((b.distanceKm ?? Infinity) < (a.distanceKm ?? Infinity) ? b : a));
  const s = closest.state;
  const state = [...s.positionKm, ...s.velocityKmS];
  const r = Math.hypot(...s.positionKm);
  const v2 = s.velocityKmS.reduce((acc, x) => acc + x * x, 0);
  if (!(v2 - (2 * muKm3S2) / r > 0)) {
    const rv = s.positionKm.reduce((acc, x, i) => acc + x * s.velocityKmS[i], 0);
    const c = v2 - muKm3S2 / r;
    const e = Math.hypot(...s.positionKm.map((x, i) => c * x - rv * s.velocityKmS[i])) / muKm3S2;
    throw new InvalidInputError('body', `${body} is never approached on a hyperbola: closest approach found at `
      + `${closest.epochTdbS} TDB s, distance ${r.toFixed(3)} km, eccentricity ${e.toFixed(6)} (bound orbit)`);
  }
  return { ...bPlanePartials(state, muKm3S2, referencePlane, body), approach: closest };
}
