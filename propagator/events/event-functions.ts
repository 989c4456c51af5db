/**
 * Event functions g(t, x) whose sign changes mark events; located on the dense output by brentRoot.
 * x is the spacecraft state (km, km/s, J2000 equatorial) relative to the current integration centre;
 * t is TDB seconds from J2000. Bodies' states come from the run's ephemeris relative to that centre.
 *
 * - periapsis / closest-approach: g = (r − r_B)·(v − v_B), crossing − → + (distance has a minimum);
 * - apoapsis: same g, crossing + → −;
 * - altitude: g = |r − r_B| − (R_B + h), either direction;
 * - impact: g = |r − r_B| − R_B, crossing + → − (always on for the centre and every perturbing body);
 * - soi-entry into B: g = |r − r_B| − R_SOI(B), + → −;  soi-exit from the centre: g = |r| − R_SOI, − → +.
 * - epoch: g = t − t_event.
 */
import { RADIUS_KM } from '../constants.ts';
import type { Ephemeris } from '../ephemeris/ephemeris.ts';
import type { EventRecord, EventSpec } from '../run/propagation-types.ts';
import type { BodyName } from '../types.ts';

/** One event function g(t, x) of a segment: t TDB s from J2000, x the Cartesian state (km, km/s,
 * J2000 equatorial, from the segment's centre); the event is where g crosses zero in `direction`. */
export interface ActiveEvent {
  kind: EventRecord['kind'];
  body?: BodyName;
  /** Ends the run (user stop or impact). */
  terminal: boolean;
  /** For soi-entry/exit: the centre to switch to. */
  switchTo?: BodyName;
  /** +1: − to + only; −1: + to − only; 0: both. */
  direction: 1 | -1 | 0;
  g(t: number, x: ArrayLike<number>): number;
}

/** Writes the state of `body` relative to `centre` (zero when they coincide). */
function bodyState(ephemeris: Ephemeris, body: BodyName, centre: BodyName, t: number, out: Float64Array): void {
  if (body === centre) out.fill(0);
  else ephemeris.stateInto(body, centre, t, out, 0);
}

function radialRate(ephemeris: Ephemeris, body: BodyName, centre: BodyName) {
  const b = new Float64Array(6);
  return (t: number, x: ArrayLike<number>): number => {
    bodyState(ephemeris, body, centre, t, b);
    let s = 0;
    for (let i = 0; i < 3; i++) s += (x[i] - b[i]) * (x[3 + i] - b[3 + i]);
    return s;
  };
}

function distanceMinus(ephemeris: Ephemeris, body: BodyName, centre: BodyName, radiusKm: number) {
  const b = new Float64Array(6);
  return (t: number, x: ArrayLike<number>): number => {
    if (body === centre) return Math.hypot(x[0], x[1], x[2]) - radiusKm;
    ephemeris.positionInto(body, centre, t, b, 0);
    return Math.hypot(x[0] - b[0], x[1] - b[1], x[2] - b[2]) - radiusKm;
  };
}

/** The segment an event set is built for (centre, direction of time, impact and sphere-of-influence
 * bodies with radii in km). */
export interface EventSetup {
  ephemeris: Ephemeris;
  centre: BodyName;
  /** +1 forward, −1 backward: a distance minimum shows as − → + of (r·v) in time order, so as + → − when
   * integrating backward; sphere-of-influence crossings keep the integration order (entering is entering). */
  integrationDirection: 1 | -1;
  /** Bodies whose surface ends the run (centre and perturbing bodies). */
  impactBodies: readonly BodyName[];
  /** soi-entry candidates and their radii (km). */
  soiEntries: readonly { body: BodyName; radiusKm: number }[];
  /** soi-exit from the centre to its primary, when it applies. */
  soiExit?: { to: BodyName; radiusKm: number };
}

/** Event functions for one segment of a run (one integration centre). */
export function buildEvents(specs: readonly EventSpec[], setup: EventSetup): ActiveEvent[] {
  const { ephemeris, centre } = setup;
  const dir = setup.integrationDirection;
  const events: ActiveEvent[] = [];
  for (const spec of specs) {
    const stop = spec.stop === true;
    switch (spec.kind) {
      case 'periapsis':
      case 'closest-approach':
        events.push({ kind: spec.kind, body: spec.body, terminal: stop, direction: dir, g: radialRate(ephemeris, spec.body, centre) });
        break;
      case 'apoapsis':
        events.push({ kind: 'apoapsis', body: spec.body, terminal: stop, direction: dir === 1 ? -1 : 1,
          g: radialRate(ephemeris, spec.body, centre) });
        break;
      case 'altitude':
        events.push({ kind: 'altitude', body: spec.body, terminal: stop, direction: 0,
          g: distanceMinus(ephemeris, spec.body, centre, RADIUS_KM[spec.body] + spec.altitudeKm) });
        break;
      case 'epoch': {
        const epoch = spec.epochTdbS;
        events.push({ kind: 'epoch', terminal: stop, direction: 0, g: (t) => t - epoch });
        break;
      }
    }
  }
  for (const body of setup.impactBodies) {
    events.push({ kind: 'impact', body, terminal: true, direction: -1, g: distanceMinus(ephemeris, body, centre, RADIUS_KM[body]) });
  }
  for (const { body, radiusKm } of setup.soiEntries) {
    events.push({ kind: 'soi-entry', body, terminal: false, switchTo: body, direction: -1,
      g: distanceMinus(ephemeris, body, centre, radiusKm) });
  }
  if (setup.soiExit) {
    events.push({ kind: 'soi-exit', body: centre, terminal: false, switchTo: setup.soiExit.to, direction: 1,
      g: distanceMinus(ephemeris, centre, centre, setup.soiExit.radiusKm) });
  }
  return events;
}

/** True when g went from `before` to `after` in the event's direction. */
export function crossed(event: ActiveEvent, before: number, after: number): boolean {
  if (event.direction >= 0 && before < 0 && after >= 0) return true;
  if (event.direction <= 0 && before > 0 && after <= 0) return true;
  return false;
}
