/** The one-year, nine-perturber case of bench:ephemeris's cold comparison (invented spacecraft: a = 1.3 au,
 * e = 0.2, i = 3°, from 2031-03-01 TDB; the same orbit as bench:propagator). */
import { GM_KM3_S2, parseEpoch, type BodyName } from '../propagator/index.ts';
import { conicToState } from '../propagator/kepler/index.ts';

const AU_KM = 149597870.7;
const t0 = parseEpoch('2031-03-01T00:00:00 TDB');
const start = conicToState({
  semiLatusRectumKm: 1.3 * AU_KM * (1 - 0.04), semiMajorAxisKm: 1.3 * AU_KM, eccentricity: 0.2, inclinationRad: 0.0524,
  raanRad: 0.7, argPeriapsisRad: 2.0, trueAnomalyRad: 0.4,
}, GM_KM3_S2.sun);

export const COLD_CASE = Object.freeze({
  t0, t1: t0 + 365.25 * 86400,
  x0: Object.freeze([...start.positionKm, ...start.velocityKmS]) as readonly number[],
  perturbers: ['mercury', 'venus', 'earth', 'moon', 'mars', 'jupiter', 'saturn', 'uranus', 'neptune'] as BodyName[],
});
