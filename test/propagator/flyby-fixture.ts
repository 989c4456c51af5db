/**
 * A Mars flyby in a dynamically consistent Sun–Mars system for the switching tests: Mars on the circular
 * two-body orbit of the Sun–Mars pair (period from GM_sun + GM_mars), so heliocentric and Mars-centred
 * integrations describe the same restricted three-body physics exactly. The approach hyperbola is built
 * from an invented periapsis (300 km altitude, v∞ = 3 km/s) and moved back with the Kepler solver.
 */
import { changeCentre, GM_KM3_S2, keplerPropagate, MEAN_SEMI_MAJOR_AXIS_KM, RADIUS_KM, type StateVector } from '../../propagator/index.ts';
import { circularEphemeris } from './forces-test-ephemeris.ts';

const A_MARS_KM = MEAN_SEMI_MAJOR_AXIS_KM.mars!;
export const PERIAPSIS_EPOCH = 9.5e8;
export const flybyEphemeris = circularEphemeris([{
  body: 'mars', radiusKm: A_MARS_KM, phaseRad: 0.3, phaseEpochTdbS: PERIAPSIS_EPOCH,
  periodS: 2 * Math.PI * Math.sqrt(A_MARS_KM ** 3 / (GM_KM3_S2.sun + GM_KM3_S2.mars)),
}]);
export const PERIAPSIS_RADIUS_KM = RADIUS_KM.mars + 300;
export const V_INFINITY_KMS = 3;

/** The flyby state `daysBefore` days before periapsis, relative to Mars and to the Sun. */
export function flybyStart(daysBefore: number): { relMars: StateVector; helio: StateVector } {
  const mu = GM_KM3_S2.mars;
  const vp = Math.sqrt(V_INFINITY_KMS ** 2 + (2 * mu) / PERIAPSIS_RADIUS_KM);
  const back = keplerPropagate([0.6 * PERIAPSIS_RADIUS_KM, 0, 0.8 * PERIAPSIS_RADIUS_KM], [0, vp, 0], -daysBefore * 86400, mu);
  const relMars: StateVector = { epochTdbS: PERIAPSIS_EPOCH - daysBefore * 86400, centre: 'mars', frame: 'J2000_EQUATORIAL',
    positionKm: back.positionKm, velocityKmS: back.velocityKmS };
  return { relMars, helio: changeCentre(relMars, 'sun', flybyEphemeris) };
}

export const forcesAbout = (centre: 'sun' | 'mars') => ({
  centralBody: centre, perturbingBodies: centre === 'sun' ? ['mars' as const] : ['sun' as const],
});
