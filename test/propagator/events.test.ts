import { describe, expect, it } from 'vitest';
import {
  brentRoot, conicToState, createBuiltinEphemeris, GM_KM3_S2, InvalidInputError, keplerPropagate, propagate,
  RADIUS_KM, type PropagationRequest, type Vec3,
} from '../../propagator/index.ts';

const MU = GM_KM3_S2.earth;
const A = 12000;
const E = 0.3;
const NU0 = 1.0;
const PERIOD = 2 * Math.PI * Math.sqrt(A ** 3 / MU);
const T0 = 8.0e8;
const s0 = conicToState({ semiLatusRectumKm: A * (1 - E * E), semiMajorAxisKm: A, eccentricity: E,
  inclinationRad: 0.5, raanRad: 0.3, argPeriapsisRad: 1.1, trueAnomalyRad: NU0 }, MU);
/** Time from the start to the next periapsis, from Kepler's equation (analytic). */
const E0 = 2 * Math.atan(Math.sqrt((1 - E) / (1 + E)) * Math.tan(NU0 / 2));
const M0 = E0 - E * Math.sin(E0);
const TO_PERIAPSIS = ((2 * Math.PI - M0) / (2 * Math.PI)) * PERIOD;
const TO_APOAPSIS = ((Math.PI - M0) / (2 * Math.PI)) * PERIOD;

const ephemeris = createBuiltinEphemeris();
function request(extra: Partial<PropagationRequest>): PropagationRequest {
  return {
    initial: { epochTdbS: T0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: s0.positionKm, velocityKmS: s0.velocityKmS },
    endEpochTdbS: T0 + 2 * PERIOD, forces: { centralBody: 'earth', perturbingBodies: [] }, ephemeris,
    relativeTolerance: 1e-13, absoluteTolerance: 1e-10, ...extra,
  };
}

describe('Brent root finder', () => {
  describe('when the root is bracketed', () => {
    it('should find cos x = x to the requested tolerance', () => {
      const r = brentRoot((x) => Math.cos(x) - x, 0, 1, 1, Math.cos(1) - 1, 1e-13);
      expect(Math.abs(r.x - 0.7390851332151607)).toBeLessThan(1e-13);
    });
    it('should keep 1e-7 s resolution at epochs near 1e9 s', () => {
      const root = 1.0e9 + 123.4567891;
      const r = brentRoot((t) => Math.tanh(t - root), 1.0e9, 1.0e9 + 1000, Math.tanh(-123.4567891), Math.tanh(1000 - 123.4567891), 1e-7);
      expect(Math.abs(r.x - root)).toBeLessThan(2.5e-7);
    });
  });
  describe('when the signs do not differ', () => {
    it('should throw InvalidInputError', () => {
      expect(() => brentRoot((x) => x * x + 1, -1, 1, 2, 2, 1e-9)).toThrow(InvalidInputError);
    });
  });
});

describe('events on the dense output', () => {
  describe('when asking for periapsis, apoapsis and an altitude crossing on a two-body orbit', () => {
    const result = propagate(request({ events: [
      { kind: 'periapsis', body: 'earth' }, { kind: 'apoapsis', body: 'earth' },
      { kind: 'altitude', body: 'earth', altitudeKm: A - RADIUS_KM.earth },
    ] }));
    it('should locate every periapsis and apoapsis within 1e-6 s of Kepler\'s equation', () => {
      const peri = result.events.filter((e) => e.kind === 'periapsis').map((e) => e.epochTdbS);
      const apo = result.events.filter((e) => e.kind === 'apoapsis').map((e) => e.epochTdbS);
      expect(peri.length).toBe(2);
      expect(apo.length).toBe(2);
      peri.forEach((t, k) => expect(Math.abs(t - (T0 + TO_PERIAPSIS + k * PERIOD)), `periapsis ${k}`).toBeLessThan(1e-6));
      apo.forEach((t, k) => expect(Math.abs(t - (T0 + TO_APOAPSIS + k * PERIOD)), `apoapsis ${k}`).toBeLessThan(1e-6));
      const rp = result.events.find((e) => e.kind === 'periapsis')!.distanceKm!;
      expect(Math.abs(rp - A * (1 - E))).toBeLessThan(1e-6);
    });
    it('should find the altitude crossings where r = a, four in two periods', () => {
      const hits = result.events.filter((e) => e.kind === 'altitude');
      expect(hits.length).toBe(4);
      for (const h of hits) expect(Math.abs(h.distanceKm! - A)).toBeLessThan(1e-6);
    });
    it('should list the events in time order', () => {
      const t = result.events.map((e) => e.epochTdbS);
      expect(t).toEqual([...t].sort((a, b) => a - b));
    });
  });

  describe('when propagating backward in time', () => {
    it('should find the same periapsis and apoapsis epochs', () => {
      const end = T0 + 2 * PERIOD;
      const fwd = propagate(request({}));
      const back = propagate(request({ initial: fwd.final, endEpochTdbS: T0,
        events: [{ kind: 'periapsis', body: 'earth' }, { kind: 'apoapsis', body: 'earth' }] }));
      const peri = back.events.filter((e) => e.kind === 'periapsis').map((e) => e.epochTdbS).sort((a, b) => a - b);
      const apo = back.events.filter((e) => e.kind === 'apoapsis').map((e) => e.epochTdbS).sort((a, b) => a - b);
      expect(peri.length).toBe(2);
      expect(apo.length).toBe(2);
      peri.forEach((t, k) => expect(Math.abs(t - (T0 + TO_PERIAPSIS + k * PERIOD))).toBeLessThan(1e-6));
      apo.forEach((t, k) => expect(Math.abs(t - (T0 + TO_APOAPSIS + k * PERIOD))).toBeLessThan(1e-6));
      expect(fwd.final.epochTdbS).toBe(end);
    });
  });

  describe('when an event asks to stop', () => {
    it('should end the run there with outcome stopped-by-event', () => {
      const r = propagate(request({ events: [{ kind: 'apoapsis', body: 'earth', stop: true }] }));
      expect(r.outcome).toBe('stopped-by-event');
      expect(Math.abs(r.final.epochTdbS - (T0 + TO_APOAPSIS))).toBeLessThan(1e-6);
      expect(Math.abs(Math.hypot(...r.final.positionKm) - A * (1 + E))).toBeLessThan(1e-6);
    });
  });

  describe('when the trajectory reaches the surface during a run with events', () => {
    it('should end with outcome impact and record it after the earlier events', () => {
      // Periapsis 1000 km below the surface: an altitude crossing at 500 km, then the impact.
      const rp = 6378.1366 - 1000;
      const a = 9000;
      const e = 1 - rp / a;
      const s = conicToState({ semiLatusRectumKm: a * (1 - e * e), semiMajorAxisKm: a, eccentricity: e,
        inclinationRad: 0.4, raanRad: 0, argPeriapsisRad: 0, trueAnomalyRad: -2.0 }, MU);
      const r = propagate(request({
        initial: { epochTdbS: T0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: s.positionKm, velocityKmS: s.velocityKmS },
        events: [{ kind: 'altitude', body: 'earth', altitudeKm: 500 }],
      }));
      expect(r.outcome).toBe('impact');
      expect(r.events.map((ev) => ev.kind)).toEqual(['altitude', 'impact']);
      expect(Math.abs(r.events[1].distanceKm! - RADIUS_KM.earth)).toBeLessThan(1e-3);
    });
  });

  describe('when an event is a given epoch', () => {
    it('should record the state at that epoch (against the Kepler solver)', () => {
      const at = T0 + 1234.5;
      const r = propagate(request({ events: [{ kind: 'epoch', epochTdbS: at }] }));
      const ev = r.events.find((e) => e.kind === 'epoch')!;
      expect(Math.abs(ev.epochTdbS - at)).toBeLessThan(1e-6);
      const k = keplerPropagate(s0.positionKm, s0.velocityKmS, 1234.5, MU);
      const d = Math.hypot(...ev.state.positionKm.map((x, i) => x - k.positionKm[i]));
      expect(d).toBeLessThan(1e-6);
    });
  });

  describe('when asking for the closest approach to the Moon', () => {
    it('should report a local minimum of the distance with its state relative to the Moon', () => {
      const r = propagate(request({
        initial: { epochTdbS: T0, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: [7000, 0, 0], velocityKmS: [0, 10.6, 1.0] },
        endEpochTdbS: T0 + 6 * 86400, forces: { centralBody: 'earth', perturbingBodies: ['moon', 'sun'] },
        events: [{ kind: 'closest-approach', body: 'moon' }], relativeTolerance: 1e-12, absoluteTolerance: 1e-9,
      }));
      const ca = r.events.filter((e) => e.kind === 'closest-approach');
      expect(ca.length).toBeGreaterThan(0);
      const ev = ca[0];
      expect(ev.state.centre).toBe('moon');
      const pos: Vec3 = ev.state.positionKm;
      const vel: Vec3 = ev.state.velocityKmS;
      // At a distance minimum the relative radial velocity vanishes.
      const radial = (pos[0] * vel[0] + pos[1] * vel[1] + pos[2] * vel[2]) / Math.hypot(...pos);
      expect(Math.abs(radial)).toBeLessThan(1e-9);
      expect(Math.abs(ev.distanceKm! - Math.hypot(...pos))).toBeLessThan(1e-9);
    });
  });
});

describe('event requests', () => {
  describe('when an altitude event lies below the surface (altitudeKm < 0)', () => {
    it('should be rejected before any work with InvalidInputError naming events[i].altitudeKm', () => {
      const attempt = (): unknown => propagate(request({ events: [
        { kind: 'periapsis', body: 'earth' }, { kind: 'altitude', body: 'earth', altitudeKm: -50 },
      ] }));
      expect(attempt).toThrow(InvalidInputError);
      expect(attempt).toThrow(/^events\[1\]\.altitudeKm: must be >= 0 km/);
    });
  });

  describe('when an altitude is not a finite number', () => {
    it('should name the field', () => {
      expect(() => propagate(request({ events: [{ kind: 'altitude', body: 'earth', altitudeKm: Number.NaN }] })))
        .toThrow(/^events\[0\]\.altitudeKm: must be a finite number/);
    });
  });

  describe('when the altitude is exactly the surface (0 km)', () => {
    it('should be accepted', () => {
      expect(propagate(request({ endEpochTdbS: T0 + 600, events: [{ kind: 'altitude', body: 'earth', altitudeKm: 0 }] })).outcome)
        .toBe('finished');
    });
  });
});
