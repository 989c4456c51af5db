/**
 * The one-year heliocentric cruise shared by the Encke-vs-Cowell reference test and `npm run bench:encke`:
 * an invented spacecraft at 2.3 au, 10 % above circular speed, 23° out of the equator (J2000 equatorial,
 * Sun-centred), over a Chebyshev cache of the built-in ephemeris. Epochs TDB s from J2000.
 */
import {
  buildChebyshevEphemeris, createBuiltinEphemeris, GM_KM3_S2, KM_PER_AU, type BodyName, type PropagationRequest,
} from '../../propagator/index.ts';

export const T0 = 9.0e8;
export const T1 = T0 + 365.25 * 86400;
export const ALL: BodyName[] = ['mercury', 'venus', 'earth', 'moon', 'mars', 'jupiter', 'saturn', 'uranus', 'neptune'];
export const GIANTS: BodyName[] = ['jupiter', 'saturn', 'uranus', 'neptune'];
const ephemeris = buildChebyshevEphemeris(createBuiltinEphemeris(), { bodies: ['sun', ...ALL], startTdbS: T0 - 86400, endTdbS: T1 + 86400 });
const A = 2.3 * KM_PER_AU;
const V = 1.1 * Math.sqrt(GM_KM3_S2.sun / A);

/** The cruise from T0 to T1 perturbed by `bodies`; `extra` sets the method, tolerances and the like. */
export const cruise = (bodies: BodyName[], extra: Partial<PropagationRequest>): PropagationRequest => ({
  initial: { epochTdbS: T0, centre: 'sun', frame: 'J2000_EQUATORIAL', positionKm: [A, 0, 0], velocityKmS: [0, V * Math.cos(0.4), V * Math.sin(0.4)] },
  endEpochTdbS: T1, forces: { centralBody: 'sun', perturbingBodies: bodies }, ephemeris, ...extra,
});
