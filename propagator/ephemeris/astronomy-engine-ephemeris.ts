/**
 * The built-in ephemeris: the general-purpose astronomy-engine npm package (v2.1.19, MIT,
 * github.com/cosinekitty/astronomy), needing no download.
 *
 * Accuracy: the package states its calculations agree with NOVAS and JPL Horizons to within about
 * ±1 arcminute (its README; from memory). Planets come from truncated VSOP87 series, the Moon from a
 * truncated lunar theory (Chapront-based, after Montenbruck & Pfleger), Pluto excluded here. Expect
 * position errors of order 1e-4 relative to the distance (hundreds to thousands of km for planets, a few
 * km for the Moon relative to the Earth) — adequate for planning studies and for tests of the machinery,
 * not for navigation-grade work; use a tabulated source (CCSDS OEM from a real ephemeris) for that.
 *
 * Bodies: 'earth' and 'moon' are the bodies' centres; 'mercury', 'venus', 'mars' the planets; for
 * 'jupiter'..'neptune' the series carry no moon terms, so they describe the planet-system barycentre to
 * this source's accuracy (the planet-centre offset, ~100 km for Jupiter, is far below its error). This
 * matches the convention of BODY_NAMES in propagator/types.ts.
 *
 * Time: epochs arrive in TDB; we convert them to TT by our own series (ttFromTdb) before calling the
 * package, which takes TT. The package itself treats TT and TDB as the same in its models (≤ 1.7 ms
 * apart), which moves the Moon by at most ~2 m, far below its stated accuracy.
 *
 * Span: chosen [1800-01-01T00:00:00, 2200-01-01T00:00:00] TDB, the range over which the package's series
 * are documented and tested as a whole (the JPL approximate-elements table used in test/reference covers
 * 1800–2050). OutOfSpanError outside.
 *
 * Smoothness: the package takes time as float64 days (~2e-7 s resolution), so positions are smooth only
 * to ~1 cm; its lunar velocity is a central difference over ±0.864 s (GeoMoonState), good to ~3e-7 km/s.
 *
 * Units: the package works in au and au/day with its own KM_PER_AU (149597870.69098932 km, ~9 m off the
 * IAU 2012 value); we convert with the package's own constant because its series are in its au.
 */
import * as Astronomy from 'astronomy-engine';
import { SECONDS_PER_DAY } from '../constants.ts';
import type { BodyName } from '../types.ts';
import { BODY_NAMES } from '../types.ts';
import { calendarSecondsFromJ2000 } from '../time/calendar.ts';
import { ttFromTdb } from '../time/tdb.ts';
import type { Ephemeris, TdbSpan } from './ephemeris.ts';
import { assertRequest } from './ephemeris-checks.ts';

/** Span of the built-in source, TDB seconds from J2000: [1800-01-01, 2200-01-01] TDB. */
export const BUILTIN_EPHEMERIS_SPAN: Readonly<TdbSpan> = Object.freeze({
  startTdbS: calendarSecondsFromJ2000(1800, 1, 1, 0, 0, 0),
  endTdbS: calendarSecondsFromJ2000(2200, 1, 1, 0, 0, 0),
});

const KM_PER_AU_SOURCE = Astronomy.KM_PER_AU;
const KM_S_PER_AU_DAY = Astronomy.KM_PER_AU / SECONDS_PER_DAY;

const SOURCE_BODY: Readonly<Record<BodyName, Astronomy.Body>> = Object.freeze({
  sun: Astronomy.Body.Sun,
  mercury: Astronomy.Body.Mercury,
  venus: Astronomy.Body.Venus,
  earth: Astronomy.Body.Earth,
  moon: Astronomy.Body.Moon,
  mars: Astronomy.Body.Mars,
  jupiter: Astronomy.Body.Jupiter,
  saturn: Astronomy.Body.Saturn,
  uranus: Astronomy.Body.Uranus,
  neptune: Astronomy.Body.Neptune,
});

function timeOf(epochTdbS: number): Astronomy.AstroTime {
  return Astronomy.AstroTime.FromTerrestrialTime(ttFromTdb(epochTdbS) / SECONDS_PER_DAY);
}

/** Heliocentric state (au, au/day, EQJ) of a body; the Sun is the origin. */
function helioState(body: BodyName, time: Astronomy.AstroTime): Astronomy.StateVector | null {
  if (body === 'sun') return null;
  return Astronomy.HelioState(SOURCE_BODY[body], time);
}

class AstronomyEngineEphemeris implements Ephemeris {
  readonly name = 'astronomy-engine 2.1.19';
  readonly span: TdbSpan = BUILTIN_EPHEMERIS_SPAN;
  readonly bodies: readonly BodyName[] = BODY_NAMES;

  stateInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset = 0): void {
    this.check(target, centre, epochTdbS);
    if (target === centre) {
      out.fill(0, offset, offset + 6);
      return;
    }
    const time = timeOf(epochTdbS);
    if ((target === 'moon' && centre === 'earth') || (target === 'earth' && centre === 'moon')) {
      const s = Astronomy.GeoMoonState(time);
      const sign = target === 'moon' ? 1 : -1;
      writeState(out, offset, sign, s.x, s.y, s.z, s.vx, s.vy, s.vz);
      return;
    }
    const t = helioState(target, time);
    const c = helioState(centre, time);
    writeState(out, offset, 1,
      (t?.x ?? 0) - (c?.x ?? 0), (t?.y ?? 0) - (c?.y ?? 0), (t?.z ?? 0) - (c?.z ?? 0),
      (t?.vx ?? 0) - (c?.vx ?? 0), (t?.vy ?? 0) - (c?.vy ?? 0), (t?.vz ?? 0) - (c?.vz ?? 0));
  }

  positionInto(target: BodyName, centre: BodyName, epochTdbS: number, out: Float64Array, offset = 0): void {
    this.check(target, centre, epochTdbS);
    if (target === centre) {
      out.fill(0, offset, offset + 3);
      return;
    }
    const time = timeOf(epochTdbS);
    if ((target === 'moon' && centre === 'earth') || (target === 'earth' && centre === 'moon')) {
      const v = Astronomy.GeoMoon(time);
      const k = (target === 'moon' ? 1 : -1) * KM_PER_AU_SOURCE;
      out[offset] = k * v.x;
      out[offset + 1] = k * v.y;
      out[offset + 2] = k * v.z;
      return;
    }
    const t = target === 'sun' ? null : Astronomy.HelioVector(SOURCE_BODY[target], time);
    const c = centre === 'sun' ? null : Astronomy.HelioVector(SOURCE_BODY[centre], time);
    out[offset] = KM_PER_AU_SOURCE * ((t?.x ?? 0) - (c?.x ?? 0));
    out[offset + 1] = KM_PER_AU_SOURCE * ((t?.y ?? 0) - (c?.y ?? 0));
    out[offset + 2] = KM_PER_AU_SOURCE * ((t?.z ?? 0) - (c?.z ?? 0));
  }

  private check(target: BodyName, centre: BodyName, epochTdbS: number): void {
    assertRequest(this, target, centre, epochTdbS);
  }
}

function writeState(
  out: Float64Array, offset: number, sign: number,
  x: number, y: number, z: number, vx: number, vy: number, vz: number,
): void {
  const k = sign * KM_PER_AU_SOURCE;
  const kv = sign * KM_S_PER_AU_DAY;
  out[offset] = k * x;
  out[offset + 1] = k * y;
  out[offset + 2] = k * z;
  out[offset + 3] = kv * vx;
  out[offset + 4] = kv * vy;
  out[offset + 5] = kv * vz;
}

/**
 * The built-in ephemeris over astronomy-engine: states of the Sun, Moon and planets in J2000 equatorial
 * (EQJ, ICRF-aligned) axes, km and km/s, at TDB epochs (s from J2000) within BUILTIN_EPHEMERIS_SPAN.
 * Accuracy about 1 arcminute (see the file comment); each call allocates inside the package, so wrap it
 * in buildChebyshevEphemeris for integration.
 */
export function createBuiltinEphemeris(): Ephemeris {
  return new AstronomyEngineEphemeris();
}
