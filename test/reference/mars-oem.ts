/**
 * A CCSDS OEM (CCSDS 502.0-B-3, KVN layout from the standard's annex examples, from memory) tabulating Mars
 * relative to the Sun from astronomy-engine (npm 2.1.19) moved by a known constant offset: an ephemeris that
 * differs from the built-in series by exactly that offset (for the ephemeris-file tests).
 */
import { AstroTime, Body, HelioState } from 'astronomy-engine';
import { formatEpoch } from '../../propagator/index.ts';

const KM_PER_AU = 149597870.7; // IAU 2012 Resolution B2 (exact)
const DAY_S = 86400;

/** An OEM (KVN) of `objectName` relative to the Sun over [startTdbS, endTdbS] (TDB s from J2000): astronomy-engine's
 * Mars plus `offsetKm` (J2000 equatorial), every 6 h, Lagrange degree 7. */
export function marsOemText(objectName: string, startTdbS: number, endTdbS: number, offsetKm: readonly number[]): string {
  const lines = ['CCSDS_OEM_VERS = 2.0', 'CREATION_DATE = 2031-08-01T00:00:00', 'ORIGINATOR = VEER-TEST', '',
    'META_START', `OBJECT_NAME = ${objectName}`, 'OBJECT_ID = 499', 'CENTER_NAME = SUN', 'REF_FRAME = EME2000',
    'TIME_SYSTEM = TDB', `START_TIME = ${formatEpoch(startTdbS, 'TDB', 3).replace(' TDB', '')}`,
    `STOP_TIME = ${formatEpoch(endTdbS, 'TDB', 3).replace(' TDB', '')}`, 'INTERPOLATION = LAGRANGE',
    'INTERPOLATION_DEGREE = 7', 'META_STOP', ''];
  const k = KM_PER_AU / DAY_S;
  for (let t = startTdbS; t <= endTdbS; t += 6 * 3600) {
    const s = HelioState(Body.Mars, AstroTime.FromTerrestrialTime(t / DAY_S)); // TT ≈ TDB (< 2 ms)
    const p = [s.x * KM_PER_AU + offsetKm[0], s.y * KM_PER_AU + offsetKm[1], s.z * KM_PER_AU + offsetKm[2]];
    lines.push(`${formatEpoch(t, 'TDB', 3).replace(' TDB', '')} ${p.map((x) => x.toFixed(6)).join(' ')} `
      + `${[s.vx * k, s.vy * k, s.vz * k].map((v) => v.toFixed(9)).join(' ')}`);
  }
  return `${lines.join('\n')}\n`;
}

