/**
 * Names the Orbit Data Messages use for centres and frames, mapped onto the propagator's bodies and
 * frames only where the meaning is the same; anything else is refused with the line.
 *
 * Inertial frames (502.0-B 3.2.3.3): EME2000 and ICRF both map to J2000_EQUATORIAL, which this project
 * defines as ICRF-aligned. The EME2000–ICRF frame bias (tens of milliarcseconds, IERS Conventions 2010
 * ch. 5, from memory) is ignored: it is below the accuracy of the built-in ephemerides. GCRF (the ICRF
 * axes at the Earth) is accepted with CENTER_NAME = EARTH only. The standard's frame table has no J2000
 * ecliptic frame, so no ecliptic name is read or written: a state the project holds in J2000_ECLIPTIC is
 * rotated to EME2000 before it is written, and a file naming an ecliptic frame is refused with its line.
 *
 * Local frames for maneuvers and covariance (502.0-B 3.2.4.11): RSW and RTN are the same frame as our
 * RTN. TNW (T along velocity, W along angular momentum, N = W × T) is our VNB with the axes permuted:
 * V = T, N = W, B = V × N = −N(TNW). That permutation is exact, so TNW is accepted.
 */
import { type BodyName, InvalidInputError, type LocalFrame, type Vec3 } from '../../propagator/index.ts';
import { CcsdsFormatError } from '../errors.ts';

/** CENTER_NAME values (annex B / SANA body names) for the bodies the propagator knows. The outer planets'
 * names in this project denote their system barycentres, so only `<PLANET> BARYCENTER` maps to them. */
const CENTRE_BY_NAME: Readonly<Record<string, BodyName>> = Object.freeze({
  SUN: 'sun',
  MERCURY: 'mercury',
  VENUS: 'venus',
  EARTH: 'earth',
  MOON: 'moon',
  MARS: 'mars',
  'JUPITER BARYCENTER': 'jupiter',
  'SATURN BARYCENTER': 'saturn',
  'URANUS BARYCENTER': 'uranus',
  'NEPTUNE BARYCENTER': 'neptune',
});

/** The CENTER_NAME written for each body. */
export const CENTRE_NAME_OF_BODY: Readonly<Record<BodyName, string>> = Object.freeze(
  Object.fromEntries(Object.entries(CENTRE_BY_NAME).map(([name, body]) => [body, name])) as Record<BodyName, string>,
);

/** The only inertial axes a message is read in or written in: the project's J2000_EQUATORIAL. */
export type MessageFrame = 'J2000_EQUATORIAL';

/** REF_FRAME values accepted for inertial axes (all J2000 equatorial, see above). */
const INERTIAL_BY_NAME: Readonly<Record<string, MessageFrame>> = Object.freeze({
  EME2000: 'J2000_EQUATORIAL',
  ICRF: 'J2000_EQUATORIAL',
  GCRF: 'J2000_EQUATORIAL',
});

/** The REF_FRAME (and inertial MAN_REF_FRAME / COV_REF_FRAME) written: EME2000, the name most partners expect. */
export const WRITTEN_FRAME_NAME = 'EME2000';

/** Any frame name that speaks of the ecliptic (none is in the standard's table). */
const ECLIPTIC_NAME = /ECLIP/i;

/** Maps a CENTER_NAME onto a body; throws CcsdsFormatError with the line for any other name. */
export function centreFromName(line: number, name: string): BodyName {
  const body = CENTRE_BY_NAME[name];
  if (body) return body;
  const hint = /^(JUPITER|SATURN|URANUS|NEPTUNE)$/.test(name)
    ? ` (this project models the ${name.toLowerCase()} system barycentre: write '${name} BARYCENTER')` : '';
  throw new CcsdsFormatError('CENTER_NAME', line, `centre '${name}' is not one the propagator knows${hint}; `
    + `supported: ${Object.keys(CENTRE_BY_NAME).join(', ')}`);
}

/** Maps a REF_FRAME (or the inertial value of MAN_REF_FRAME / COV_REF_FRAME) onto an inertial frame;
 * throws CcsdsFormatError with the line for any other name (an ecliptic one with its own explanation). */
export function inertialFrameFromName(keyword: string, line: number, name: string, centre: BodyName): MessageFrame {
  const frame = INERTIAL_BY_NAME[name];
  if (frame && (name !== 'GCRF' || centre === 'earth')) return frame;
  if (ECLIPTIC_NAME.test(name)) throw eclipticFrameError(keyword, line, name);
  const why = name === 'GCRF' ? 'GCRF is geocentric: it needs CENTER_NAME = EARTH'
    : `frame '${name}' is not supported`;
  throw new CcsdsFormatError(keyword, line, `${why}; supported inertial frames: `
    + `${Object.keys(INERTIAL_BY_NAME).join(', ')} (GCRF with EARTH only)`);
}

function eclipticFrameError(keyword: string, line: number, name: string): CcsdsFormatError {
  return new CcsdsFormatError(keyword, line, `frame '${name}' is refused: the reference-frame table of CCSDS 502.0-B `
    + 'has no J2000 ecliptic frame; the file should give its states in EME2000 or ICRF');
}

/** What a MAN_REF_FRAME or COV_REF_FRAME names: inertial axes, or a local orbital frame given by the
 * axes it is exactly equivalent to (TNW is VNB with permuted axes). */
export type FrameMeaning =
  | { kind: 'inertial'; frame: MessageFrame }
  | { kind: 'local'; frame: LocalFrame; ccsdsName: 'RTN' | 'RSW' | 'TNW' };

/** Interprets a MAN_REF_FRAME / COV_REF_FRAME value. */
export function frameMeaningFromName(keyword: string, line: number, name: string, centre: BodyName): FrameMeaning {
  if (name === 'RTN' || name === 'RSW') return { kind: 'local', frame: 'RTN', ccsdsName: name };
  if (name === 'TNW') return { kind: 'local', frame: 'VNB', ccsdsName: 'TNW' };
  if (ECLIPTIC_NAME.test(name)) throw eclipticFrameError(keyword, line, name);
  try {
    return { kind: 'inertial', frame: inertialFrameFromName(keyword, line, name, centre) };
  } catch {
    throw new CcsdsFormatError(keyword, line, `frame '${name}' is not supported; supported: RTN, RSW, TNW, `
      + `${Object.keys(INERTIAL_BY_NAME).join(', ')}`);
  }
}

/** Refuses, before anything is written, a frame name the readers would refuse (so what is written can be
 * read back): InvalidInputError naming `field` (e.g. `metadata.refFrame`). `local` allows RTN/RSW/TNW. */
export function assertWritableFrame(field: string, name: string, centre: BodyName, local: boolean): void {
  try {
    if (local) frameMeaningFromName(field, 0, name, centre);
    else inertialFrameFromName(field, 0, name, centre);
  } catch (error) {
    const detail = (error as Error).message.replace(/^[^:]*: end of file: /, '');
    throw new InvalidInputError(field, `not written: ${detail}`);
  }
}
