/**
 * Builds the invented demo problems in examples/ (run: `npm run examples:build`).
 *
 * flyby-demo.json — the invented probe "Saltmarsh" cruising from Earth to a Mars flyby:
 *   1. pick a launch date and flight time on a grid by the smallest sum of departure and arrival v∞
 *      (Izzo Lambert, Earth → Mars, heliocentric, built-in astronomy-engine ephemeris);
 *   2. aim the Lambert arc at Mars' centre + the target B vector at the closest-approach epoch, so the
 *      straight-line asymptote passes the chosen B-plane point (Mars' gravity then bends it into the flyby);
 *   3. carry the arc to 60 days before closest approach (Sun two-body) and add a deliberate
 *      orbit-determination offset, so the spacecraft is off its aim point and a correction burn is needed.
 * two-body-demo.json — the invented Earth-orbiting "Pipit" raising its orbit: one burn, a position target
 *   45 min later taken from a known 25 m/s prograde raise, so the answer is known in advance.
 * Everything here is made up for demonstration; no real mission's data.
 */
import { writeFileSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import {
  GM_KM3_S2, RADIUS_KM, createBuiltinEphemeris, formatEpoch, parseEpoch, propagate, referencePole,
  type Ephemeris, type StateVector, type Vec3,
} from '../propagator/index.ts';
import { solveLambert, type PlanningProblemInput } from '../planner/index.ts';

const DAY_S = 86400;

const sub = (a: Vec3, b: Vec3): Vec3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
const addv = (a: Vec3, b: Vec3): Vec3 => [a[0] + b[0], a[1] + b[1], a[2] + b[2]];
const scale = (a: Vec3, k: number): Vec3 => [a[0] * k, a[1] * k, a[2] * k];
const norm = (a: Vec3): number => Math.hypot(a[0], a[1], a[2]);
const unit = (a: Vec3): Vec3 => scale(a, 1 / norm(a));
const cross = (a: Vec3, b: Vec3): Vec3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const round = (x: number, digits: number): number => Number(x.toFixed(digits));

function bodyState(eph: Ephemeris, body: 'earth' | 'mars', tdbS: number): { r: Vec3; v: Vec3 } {
  const out = new Float64Array(6);
  eph.stateInto(body, 'sun', tdbS, out, 0);
  return { r: [out[0], out[1], out[2]], v: [out[3], out[4], out[5]] };
}

/** Invented scenario parameters (chosen by hand; see examples/README.md). */
export const FLYBY_SCENARIO = Object.freeze({
  launchSearch: { first: '2030-09-01T00:00:00 TDB', days: 360, stepDays: 4 },
  flightDays: { min: 150, max: 320, step: 5 },
  /** Closest approach at this altitude over Mars (km) on the aimed hyperbola, B angle from T toward R. */
  aimAltitudeKm: 2000,
  aimAngleDeg: -20,
  /** Initial state and burn, days before closest approach; span end after it. */
  initialDaysBefore: 60,
  burnDaysBefore: 45,
  endDaysAfter: 2,
  /** Deliberate offset added at the initial epoch (km, km/s, J2000 equatorial): the story is an earlier
   * deep-space burn that over-performed by ~1.8 m/s, found by the latest orbit determination. It moves the
   * uncorrected flyby to |B| ≈ 14 000 km (a miss, not an impact), so TCM-1 has work to do. */
  offsetPositionKm: [300, -150, 120] as Vec3,
  offsetVelocityKmS: [0, 0.00177, -0.00022] as Vec3,
});

/** Grid search of launch date and flight time: smallest departure + arrival v∞ (km/s). */
export function searchTransfer(eph: Ephemeris): { launchTdbS: number; arrivalTdbS: number; vInfDepartureKmS: number; vInfArrivalKmS: number } {
  const s = FLYBY_SCENARIO;
  const first = parseEpoch(s.launchSearch.first);
  const ecliptic = referencePole('ecliptic');
  let best = { launchTdbS: 0, arrivalTdbS: 0, vInfDepartureKmS: Infinity, vInfArrivalKmS: Infinity };
  for (let d = 0; d <= s.launchSearch.days; d += s.launchSearch.stepDays) {
    const launch = first + d * DAY_S;
    const earth = bodyState(eph, 'earth', launch);
    for (let f = s.flightDays.min; f <= s.flightDays.max; f += s.flightDays.step) {
      const arrival = launch + f * DAY_S + 0.5 * DAY_S; // arrive at 12:00 TDB
      const mars = bodyState(eph, 'mars', arrival);
      const sol = solveLambert(earth.r, mars.r, arrival - launch, GM_KM3_S2.sun, { direction: 'prograde', referenceNormal: ecliptic });
      if (!sol.converged) continue;
      const dep = norm(sub(sol.v1KmS, earth.v));
      const arr = norm(sub(sol.v2KmS, mars.v));
      if (dep + arr < best.vInfDepartureKmS + best.vInfArrivalKmS) {
        best = { launchTdbS: launch, arrivalTdbS: arrival, vInfDepartureKmS: dep, vInfArrivalKmS: arr };
      }
    }
  }
  return best;
}

/** B-plane aim (km) for a periapsis altitude at v∞: b = sqrt(rp² + 2μ·rp/v∞²). */
function aimImpactParameterKm(vInfKmS: number): number {
  const rp = RADIUS_KM.mars + FLYBY_SCENARIO.aimAltitudeKm;
  return Math.sqrt(rp * rp + (2 * GM_KM3_S2.mars * rp) / (vInfKmS * vInfKmS));
}

function sunTwoBody(eph: Ephemeris, initial: StateVector, endTdbS: number): StateVector {
  const result = propagate({ initial, endEpochTdbS: endTdbS, forces: { centralBody: 'sun', perturbingBodies: [] }, ephemeris: eph,
    relativeTolerance: 1e-12 });
  if (result.outcome !== 'finished') throw new Error(`two-body propagation ended with ${result.outcome}: ${result.message ?? ''}`);
  return result.final;
}

/** The flyby demo problem and the numbers behind it (for the README). */
export function buildFlybyDemo(eph: Ephemeris = createBuiltinEphemeris()): { problem: PlanningProblemInput; notes: Record<string, number | string> } {
  const s = FLYBY_SCENARIO;
  const transfer = searchTransfer(eph);
  const tca = transfer.arrivalTdbS;
  const earth = bodyState(eph, 'earth', transfer.launchTdbS);
  const mars = bodyState(eph, 'mars', tca);
  // First pass to the centre gives the approach direction; the second aims at the B-plane point.
  const toCentre = solveLambert(earth.r, mars.r, tca - transfer.launchTdbS, GM_KM3_S2.sun, { direction: 'prograde', referenceNormal: referencePole('ecliptic') });
  const vInf = sub(toCentre.v2KmS, mars.v);
  const sHat = unit(vInf);
  const tHat = unit(cross(sHat, referencePole('ecliptic')));
  const rHat = cross(sHat, tHat);
  const b = aimImpactParameterKm(norm(vInf));
  const angle = (s.aimAngleDeg * Math.PI) / 180;
  const bDotTKm = round(b * Math.cos(angle), 1);
  const bDotRKm = round(b * Math.sin(angle), 1);
  const aim = addv(mars.r, addv(scale(tHat, bDotTKm), scale(rHat, bDotRKm)));
  const arc = solveLambert(earth.r, aim, tca - transfer.launchTdbS, GM_KM3_S2.sun, { direction: 'prograde', referenceNormal: referencePole('ecliptic') });
  if (!arc.converged) throw new Error('Lambert arc to the aim point did not converge');
  const t0 = tca - s.initialDaysBefore * DAY_S;
  const atT0 = sunTwoBody(eph, { epochTdbS: transfer.launchTdbS, centre: 'sun', frame: 'J2000_EQUATORIAL', positionKm: earth.r, velocityKmS: arc.v1KmS }, t0);
  const positionKm = addv(atT0.positionKm, s.offsetPositionKm).map((x) => round(x, 3)) as Vec3;
  const velocityKmS = addv(atT0.velocityKmS, s.offsetVelocityKmS).map((x) => round(x, 9)) as Vec3;
  // Invented orbit-determination uncertainty of a cruise state: 3 km and 0.5 mm/s (1σ, per axis, uncorrelated).
  const sigmaR2 = 3 ** 2; // km²
  const sigmaV2 = 0.0000005 ** 2; // km²/s²
  const covariance = [0, 1, 2, 3, 4, 5].map((i) => [0, 1, 2, 3, 4, 5].map((j) => (i === j ? (i < 3 ? sigmaR2 : sigmaV2) : 0)));
  const epoch = (tdbS: number): string => formatEpoch(tdbS, 'TDB', 0);
  const problem: PlanningProblemInput = {
    title: 'Saltmarsh (invented probe): TCM-1 retargeting of the Mars flyby, 45 days out',
    spacecraft: {
      name: 'Saltmarsh', massKg: 612, engine: { ispS: 224, thrustN: 22 },
      solarPressure: { areaM2: 7.5, reflectivityCoefficient: 1.3 },
    },
    initialState: { epoch: epoch(t0), centre: 'sun', frame: 'J2000_EQUATORIAL', positionKm, velocityKmS, covarianceKmKmS: covariance },
    endEpoch: epoch(tca + s.endDaysAfter * DAY_S),
    forceModel: {
      centralBody: 'sun', perturbingBodies: ['venus', 'earth', 'mars', 'jupiter', 'saturn'], centralJ2: false,
      solarPressure: true, method: 'cowell', relativeTolerance: 1e-11, switching: false,
    },
    burns: [{
      label: 'TCM-1', epoch: epoch(tca - s.burnDaysBefore * DAY_S), frame: 'inertial', deltaVGuessKmS: [0, 0, 0],
      freeComponents: [true, true, true],
    }],
    targets: [
      { kind: 'b-plane', body: 'mars', referencePlane: 'ecliptic', bDotTKm, bDotRKm, toleranceKm: 1 },
      { kind: 'closest-approach-epoch', body: 'mars', epoch: epoch(tca), toleranceS: 1 },
    ],
    executionErrors: { fixedMagnitudeMS: 0.01, proportionalMagnitudeFraction: 0.01, fixedPointingMS: 0.01, proportionalPointingDeg: 0.6 },
    dispersion: { samples: 200, seed: 20310 },
    limits: { safeAltitudeKm: 300, impactProbabilityLimit: 1e-4, impulsiveDurationFraction: 0.01, crossCheckToleranceFraction: 0.01, conditionNumberLimit: 1e8 },
  };
  const notes = {
    launch: formatEpoch(transfer.launchTdbS, 'TDB', 0), closestApproach: epoch(tca),
    vInfDepartureKmS: round(transfer.vInfDepartureKmS, 3), vInfArrivalKmS: round(norm(sub(arc.v2KmS, mars.v)), 3),
    aimImpactParameterKm: round(b, 1), aimPeriapsisAltitudeKm: s.aimAltitudeKm,
  };
  return { problem, notes };
}

/** The Earth-centred two-body demo: a 25 m/s prograde raise reaching a known point 45 min later. */
export function buildTwoBodyDemo(eph: Ephemeris = createBuiltinEphemeris()): { problem: PlanningProblemInput; notes: Record<string, number | string> } {
  const t0 = parseEpoch('2030-04-01T00:00:00 TDB');
  const burnT = t0 + 600;
  const targetT = burnT + 2700;
  const mu = GM_KM3_S2.earth;
  // Circular 6978 km (600 km altitude) orbit inclined 28.5° (common practice for an invented low orbit).
  const r0 = 6978.137;
  const inc = (28.5 * Math.PI) / 180;
  const vc = Math.sqrt(mu / r0);
  const initial: StateVector = { epochTdbS: t0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: [r0, 0, 0], velocityKmS: [0, vc * Math.cos(inc), vc * Math.sin(inc)] };
  const twoBody = (state: StateVector, end: number): StateVector => {
    const res = propagate({ initial: state, endEpochTdbS: end, forces: { centralBody: 'earth', perturbingBodies: [] }, ephemeris: eph, relativeTolerance: 1e-13 });
    if (res.outcome !== 'finished') throw new Error(`two-body propagation ended with ${res.outcome}`);
    return res.final;
  };
  const atBurn = twoBody(initial, burnT);
  const raise = scale(unit(atBurn.velocityKmS), 0.025);
  const target = twoBody({ ...atBurn, velocityKmS: addv(atBurn.velocityKmS, raise) }, targetT);
  const epoch = (tdbS: number): string => formatEpoch(tdbS, 'TDB', 0);
  const problem: PlanningProblemInput = {
    title: 'Pipit (invented small satellite): orbit raise to a point 45 min after the burn, two-body',
    spacecraft: { name: 'Pipit', massKg: 180, engine: { ispS: 215, thrustN: 220 } },
    initialState: { epoch: epoch(t0), centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: initial.positionKm, velocityKmS: initial.velocityKmS.map((x) => round(x, 12)) as Vec3 },
    endEpoch: epoch(targetT + 600),
    forceModel: { centralBody: 'earth', perturbingBodies: [], centralJ2: false, solarPressure: false, method: 'cowell', relativeTolerance: 1e-11, switching: false },
    burns: [{ label: 'RAISE-1', epoch: epoch(burnT), frame: 'VNB', deltaVGuessKmS: [0.02, 0, 0], freeComponents: [true, true, true] }],
    targets: [{ kind: 'position', epoch: epoch(targetT), centre: 'earth', positionKm: target.positionKm.map((x) => round(x, 4)) as Vec3, toleranceKm: 0.01 }],
    executionErrors: { fixedMagnitudeMS: 0.02, proportionalMagnitudeFraction: 0.005, fixedPointingMS: 0.02, proportionalPointingDeg: 0.3 },
    dispersion: { samples: 200, seed: 7 },
  };
  return { problem, notes: { knownDeltaVKmS: 0.025, knownDeltaVFrame: 'VNB along V' } };
}

const HERE = fileURLToPath(new URL('.', import.meta.url));

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const eph = createBuiltinEphemeris();
  const flyby = buildFlybyDemo(eph);
  writeFileSync(`${HERE}flyby-demo.json`, `${JSON.stringify(flyby.problem, null, 2)}\n`);
  const twoBody = buildTwoBodyDemo(eph);
  writeFileSync(`${HERE}two-body-demo.json`, `${JSON.stringify(twoBody.problem, null, 2)}\n`);
  process.stdout.write(`flyby-demo.json: ${JSON.stringify(flyby.notes)}\ntwo-body-demo.json: ${JSON.stringify(twoBody.notes)}\n`);
}
