/**
 * Orbit Parameter Message reader (CCSDS 502.0-B section 3), KVN or XML: every block in the standard's
 * order, required keywords, units where written, values converted and checked; any problem is a
 * CcsdsFormatError naming the keyword and the line.
 */
import type { Vec3 } from '../../propagator/index.ts';
import {
  assertPositiveSemiDefinite, COVARIANCE_KEYWORDS, covarianceUnit, matrixFromLowerTriangle,
} from './covariance.ts';
import { CcsdsFormatError } from '../errors.ts';
import { frameMeaningFromName } from './frames.ts';
import { readCommonMetadata, readHeader } from './header.ts';
import type {
  OdmCovariance, OdmMetadata, Opm, OpmKeplerianElements, OpmManeuver, OpmSpacecraftParameters, OpmStateVector,
} from './odm-types.ts';
import { tokenise } from '../syntax/tokenise.ts';
import { TokenCursor } from '../syntax/token-cursor.ts';
import { describeToken } from '../syntax/tokens.ts';
import { parseCcsdsEpoch } from '../syntax/values.ts';

/** Reads an OPM from KVN or XML text (XML when the first non-blank character is `<`). */
export function readOpm(text: string): Opm {
  const cursor = new TokenCursor(tokenise(text, 'OPM'), 'OPM');
  const header = readHeader(cursor, 'OPM');
  const metadata = readCommonMetadata(cursor);
  const state = readStateVector(cursor, metadata);
  const opm: Opm = { header, metadata, state, maneuvers: [], userDefined: [] };
  // Optional blocks, each at most once and in this order; maneuvers repeat.
  const order = ['keplerian', 'spacecraft', 'covariance', 'maneuver', 'user'] as const;
  let stage = -1;
  while (!cursor.done()) {
    const comments = cursor.comments();
    const t = cursor.peek();
    if (t?.kind !== 'keyword') {
      throw new CcsdsFormatError('file', t?.line ?? cursor.line(), `OPM: expected a data block keyword, found `
        + `${t ? describeToken(t) : 'the end of the file after a COMMENT'}`);
    }
    const block = blockOf(t.keyword);
    if (!block) {
      throw new CcsdsFormatError(t.keyword, t.line, `keyword ${t.keyword} is not allowed here in an OPM`);
    }
    const index = order.indexOf(block);
    if (index < stage || (index === stage && block !== 'maneuver' && block !== 'user')) {
      throw new CcsdsFormatError(t.keyword, t.line, `the ${block} block is repeated or out of the standard's order `
        + '(state vector, Keplerian elements, spacecraft parameters, covariance, maneuvers, user-defined)');
    }
    stage = index;
    if (block === 'keplerian') opm.keplerian = readKeplerian(cursor, comments);
    else if (block === 'spacecraft') opm.spacecraft = readSpacecraft(cursor, comments);
    else if (block === 'covariance') opm.covariance = readCovariance(cursor, comments, metadata);
    else if (block === 'maneuver') opm.maneuvers.push(readManeuver(cursor, comments, metadata));
    else {
      if (comments.length > 0) {
        throw new CcsdsFormatError(t.keyword, t.line, 'COMMENT lines are not allowed before user-defined parameters');
      }
      opm.userDefined.push([t.keyword.slice('USER_DEFINED_'.length), t.value]);
      cursor.next();
    }
  }
  if (opm.maneuvers.length > 0 && opm.spacecraft?.massKg === undefined) {
    throw new CcsdsFormatError('MASS', cursor.line(), 'the OPM has maneuvers, so MASS is required (502.0-B 3.2.4.9)');
  }
  return opm;
}

function blockOf(keyword: string): 'keplerian' | 'spacecraft' | 'covariance' | 'maneuver' | 'user' | undefined {
  if (keyword === 'SEMI_MAJOR_AXIS') return 'keplerian';
  if (['MASS', 'SOLAR_RAD_AREA', 'SOLAR_RAD_COEFF', 'DRAG_AREA', 'DRAG_COEFF'].includes(keyword)) return 'spacecraft';
  if (keyword === 'COV_REF_FRAME' || keyword === 'CX_X') return 'covariance';
  if (keyword === 'MAN_EPOCH_IGNITION') return 'maneuver';
  if (/^USER_DEFINED_[A-Z0-9_]+$/.test(keyword)) return 'user';
  return undefined;
}

function readVec(cursor: TokenCursor, names: [string, string, string], unit: string): Vec3 {
  return [cursor.number(names[0], unit), cursor.number(names[1], unit), cursor.number(names[2], unit)];
}

function readStateVector(cursor: TokenCursor, metadata: OdmMetadata): OpmStateVector {
  const comments = cursor.comments();
  const epoch = cursor.expect('EPOCH');
  const epochTdbS = parseCcsdsEpoch('EPOCH', epoch.line, epoch.value, metadata.timeSystem);
  const positionKm = readVec(cursor, ['X', 'Y', 'Z'], 'km');
  const velocityKmS = readVec(cursor, ['X_DOT', 'Y_DOT', 'Z_DOT'], 'km/s');
  return { comments, epoch: epoch.value, epochTdbS, positionKm, velocityKmS };
}

function readKeplerian(cursor: TokenCursor, comments: string[]): OpmKeplerianElements {
  const semiMajorAxisKm = cursor.number('SEMI_MAJOR_AXIS', 'km');
  const eLine = cursor.line();
  const eccentricity = cursor.number('ECCENTRICITY');
  if (eccentricity < 0) throw new CcsdsFormatError('ECCENTRICITY', eLine, `eccentricity ${eccentricity} must be >= 0`);
  const inclinationDeg = cursor.number('INCLINATION', 'deg');
  const raOfAscNodeDeg = cursor.number('RA_OF_ASC_NODE', 'deg');
  const argOfPericenterDeg = cursor.number('ARG_OF_PERICENTER', 'deg');
  const kind = cursor.at('MEAN_ANOMALY') ? 'mean' : 'true';
  const deg = cursor.number(kind === 'mean' ? 'MEAN_ANOMALY' : 'TRUE_ANOMALY', 'deg');
  const gmKm3S2 = cursor.number('GM', 'km**3/s**2');
  if (!(gmKm3S2 > 0)) throw new CcsdsFormatError('GM', cursor.line(), `GM ${gmKm3S2} must be > 0`);
  return {
    comments, semiMajorAxisKm, eccentricity, inclinationDeg, raOfAscNodeDeg, argOfPericenterDeg,
    anomaly: { kind, deg }, gmKm3S2,
  };
}

function readSpacecraft(cursor: TokenCursor, comments: string[]): OpmSpacecraftParameters {
  const out: OpmSpacecraftParameters = { comments };
  const fields: [string, Exclude<keyof OpmSpacecraftParameters, 'comments'>, string | undefined][] = [
    ['MASS', 'massKg', 'kg'], ['SOLAR_RAD_AREA', 'solarRadAreaM2', 'm**2'], ['SOLAR_RAD_COEFF', 'solarRadCoeff', undefined],
    ['DRAG_AREA', 'dragAreaM2', 'm**2'], ['DRAG_COEFF', 'dragCoeff', undefined],
  ];
  for (const [keyword, key, unit] of fields) {
    const line = cursor.line();
    const value = cursor.optionalNumber(keyword, unit);
    if (value === undefined) continue;
    if (value < 0 || (keyword === 'MASS' && value === 0)) {
      throw new CcsdsFormatError(keyword, line, `${keyword} = ${value} must be ${keyword === 'MASS' ? '> 0' : '>= 0'}`);
    }
    out[key] = value;
  }
  return out;
}

/** Reads the 21 lower-triangle covariance keywords in order and checks positive semi-definiteness. */
export function readCovarianceKeywords(cursor: TokenCursor): { matrix: number[][]; line: number } {
  const line = cursor.line();
  const values: number[] = [];
  let k = 0;
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j <= i; j++) values.push(cursor.number(COVARIANCE_KEYWORDS[k++], covarianceUnit(i, j)));
  }
  const matrix = matrixFromLowerTriangle(values);
  assertPositiveSemiDefinite(matrix, 'CX_X', line);
  return { matrix, line };
}

function readCovariance(cursor: TokenCursor, comments: string[], metadata: OdmMetadata): OdmCovariance {
  const frameToken = cursor.optional('COV_REF_FRAME');
  if (frameToken) frameMeaningFromName('COV_REF_FRAME', frameToken.line, frameToken.value, metadata.centre);
  const { matrix } = readCovarianceKeywords(cursor);
  return { comments, ...(frameToken ? { covRefFrame: frameToken.value } : {}), matrix };
}

function readManeuver(cursor: TokenCursor, comments: string[], metadata: OdmMetadata): OpmManeuver {
  const ignition = cursor.expect('MAN_EPOCH_IGNITION');
  const epochIgnitionTdbS = parseCcsdsEpoch('MAN_EPOCH_IGNITION', ignition.line, ignition.value, metadata.timeSystem);
  const durationLine = cursor.line();
  const durationS = cursor.number('MAN_DURATION', 's');
  if (durationS < 0) throw new CcsdsFormatError('MAN_DURATION', durationLine, `duration ${durationS} s must be >= 0`);
  const massLine = cursor.line();
  const deltaMassKg = cursor.number('MAN_DELTA_MASS', 'kg');
  if (deltaMassKg > 0) {
    throw new CcsdsFormatError('MAN_DELTA_MASS', massLine, `mass change ${deltaMassKg} kg must be negative `
      + '(502.0-B 3.2.4.7)');
  }
  const frame = cursor.expect('MAN_REF_FRAME');
  frameMeaningFromName('MAN_REF_FRAME', frame.line, frame.value, metadata.centre);
  const deltaVKmS = readVec(cursor, ['MAN_DV_1', 'MAN_DV_2', 'MAN_DV_3'], 'km/s');
  return {
    comments, epochIgnition: ignition.value, epochIgnitionTdbS, durationS, deltaMassKg, manRefFrame: frame.value,
    deltaVKmS,
  };
}
