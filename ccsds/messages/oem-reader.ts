/**
 * Orbit Ephemeris Message reader (CCSDS 502.0-B section 5), KVN or XML: segments of metadata,
 * ephemeris lines and optional covariance blocks. Epochs must increase strictly within a segment and
 * lie inside START_TIME..STOP_TIME; every problem names its line.
 */
import { BUILTIN_LEAP_SECONDS, type LeapSecondTable, type Vec3 } from '../../propagator/index.ts';
import { assertPositiveSemiDefinite, matrixFromLowerTriangle } from './covariance.ts';
import { CcsdsFormatError } from '../errors.ts';
import { frameMeaningFromName } from './frames.ts';
import { readCommonMetadata, readHeader } from './header.ts';
import type { InterpolationMethod, Oem, OemCovariance, OemMetadata, OemSegment, OemState } from './odm-types.ts';
import { readCovarianceKeywords } from './opm-reader.ts';
import { tokenise } from '../syntax/tokenise.ts';
import { TokenCursor } from '../syntax/token-cursor.ts';
import { describeToken } from '../syntax/tokens.ts';
import { parseCcsdsEpoch, parseNumber } from '../syntax/values.ts';

const INTERPOLATIONS: readonly InterpolationMethod[] = ['HERMITE', 'LAGRANGE', 'LINEAR'];

/** Reads an OEM from KVN or XML text (XML when the first non-blank character is `<`); UTC epochs through
 * `leapSeconds` (the built-in table unless the caller loaded a leap-seconds.list). */
export function readOem(text: string, leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS): Oem {
  const cursor = new TokenCursor(tokenise(text, 'OEM'), 'OEM');
  const header = readHeader(cursor, 'OEM');
  const segments: OemSegment[] = [];
  while (!cursor.done()) segments.push(readSegment(cursor, leapSeconds));
  if (segments.length === 0) throw new CcsdsFormatError('META_START', cursor.line(), 'an OEM needs at least one segment');
  return { header, segments };
}

function expectBlock(cursor: TokenCursor, name: 'META_START' | 'META_STOP' | 'COVARIANCE_STOP'): void {
  const t = cursor.peek();
  if (t?.kind === 'block' && t.name === name) { cursor.next(); return; }
  throw new CcsdsFormatError(name, t?.line ?? cursor.line(), `expected ${name}, found ${describeToken(t)}`);
}

function readMetadata(cursor: TokenCursor, leapSeconds: LeapSecondTable): OemMetadata {
  expectBlock(cursor, 'META_START');
  const common = readCommonMetadata(cursor);
  const scale = common.timeSystem;
  const epoch = (keyword: string, required: boolean): { text: string; tdbS: number } | undefined => {
    const t = required ? cursor.expect(keyword) : cursor.optional(keyword);
    return t && { text: t.value, tdbS: parseCcsdsEpoch(keyword, t.line, t.value, scale, leapSeconds) };
  };
  const startLine = cursor.line();
  const start = epoch('START_TIME', true)!;
  const useableStart = epoch('USEABLE_START_TIME', false);
  const useableStop = epoch('USEABLE_STOP_TIME', false);
  const stopLine = cursor.line();
  const stop = epoch('STOP_TIME', true)!;
  if (!(stop.tdbS >= start.tdbS)) {
    throw new CcsdsFormatError('STOP_TIME', stopLine, `STOP_TIME ${stop.text} precedes START_TIME ${start.text} (line ${startLine})`);
  }
  for (const [name, e] of [['USEABLE_START_TIME', useableStart], ['USEABLE_STOP_TIME', useableStop]] as const) {
    if (e && (e.tdbS < start.tdbS || e.tdbS > stop.tdbS)) {
      throw new CcsdsFormatError(name, stopLine, `${name} ${e.text} is outside START_TIME..STOP_TIME`);
    }
  }
  if (useableStart && useableStop && useableStop.tdbS < useableStart.tdbS) {
    throw new CcsdsFormatError('USEABLE_STOP_TIME', stopLine, 'USEABLE_STOP_TIME precedes USEABLE_START_TIME');
  }
  const method = cursor.optional('INTERPOLATION');
  if (method && !(INTERPOLATIONS as readonly string[]).includes(method.value)) {
    throw new CcsdsFormatError('INTERPOLATION', method.line, `interpolation '${method.value}' is not supported `
      + `(supported: ${INTERPOLATIONS.join(', ')})`);
  }
  const degreeToken = cursor.optional('INTERPOLATION_DEGREE');
  const degree = degreeToken && parseNumber('INTERPOLATION_DEGREE', degreeToken.line, degreeToken.value);
  if (degreeToken && (!Number.isInteger(degree) || degree! < 1 || degree! > 32)) {
    throw new CcsdsFormatError('INTERPOLATION_DEGREE', degreeToken.line, `degree '${degreeToken.value}' is not an `
      + 'integer in [1, 32]');
  }
  expectBlock(cursor, 'META_STOP');
  return {
    ...common,
    startTime: start.text, startTdbS: start.tdbS,
    ...(useableStart ? { useableStartTime: useableStart.text, useableStartTdbS: useableStart.tdbS } : {}),
    ...(useableStop ? { useableStopTime: useableStop.text, useableStopTdbS: useableStop.tdbS } : {}),
    stopTime: stop.text, stopTdbS: stop.tdbS,
    ...(method ? { interpolation: method.value as InterpolationMethod } : {}),
    ...(degree !== undefined ? { interpolationDegree: degree } : {}),
  };
}

function readSegment(cursor: TokenCursor, leapSeconds: LeapSecondTable): OemSegment {
  const metadata = readMetadata(cursor, leapSeconds);
  const dataComments = cursor.comments();
  const states: OemState[] = [];
  for (let t = cursor.peek(); t?.kind === 'data'; t = cursor.peek()) {
    cursor.next();
    states.push(readStateLine(t.line, t.fields, metadata, states[states.length - 1], leapSeconds));
  }
  if (states.length === 0) {
    throw new CcsdsFormatError('data', cursor.line(), `segment of ${metadata.objectName} has no ephemeris lines`);
  }
  const covariances: OemCovariance[] = [];
  for (let t = cursor.peek(); t?.kind === 'block' && t.name === 'COVARIANCE_START'; t = cursor.peek()) {
    cursor.next();
    while (cursor.at('EPOCH') || cursor.peek()?.kind === 'comment') covariances.push(readCovariance(cursor, metadata, leapSeconds));
    expectBlock(cursor, 'COVARIANCE_STOP');
  }
  const t = cursor.peek();
  if (t && !(t.kind === 'block' && t.name === 'META_START')) {
    const hint = t.kind === 'comment' ? ' (COMMENT lines are allowed only before the first ephemeris line)' : '';
    throw new CcsdsFormatError('data', t.line, `unexpected ${describeToken(t)} in the data section${hint}`);
  }
  return { metadata, dataComments, states, covariances };
}

function readStateLine(line: number, fields: string[], metadata: OemMetadata, previous: OemState | undefined,
  leapSeconds: LeapSecondTable): OemState {
  if (fields.length !== 7 && fields.length !== 10) {
    throw new CcsdsFormatError('data', line, `an ephemeris line has 7 or 10 fields (epoch, position km, velocity `
      + `km/s, optional acceleration km/s**2); found ${fields.length}`);
  }
  const epochTdbS = parseCcsdsEpoch('EPOCH', line, fields[0], metadata.timeSystem, leapSeconds);
  if (previous && !(epochTdbS > previous.epochTdbS)) {
    throw new CcsdsFormatError('EPOCH', line, `epoch ${fields[0]} does not follow ${previous.epoch} (line `
      + `${previous.line}): epochs must increase within a segment`);
  }
  if (epochTdbS < metadata.startTdbS || epochTdbS > metadata.stopTdbS) {
    throw new CcsdsFormatError('EPOCH', line, `epoch ${fields[0]} is outside START_TIME..STOP_TIME `
      + `(${metadata.startTime}..${metadata.stopTime})`);
  }
  const n = fields.slice(1).map((f, i) => parseNumber(['X', 'Y', 'Z', 'X_DOT', 'Y_DOT', 'Z_DOT', 'X_DDOT', 'Y_DDOT', 'Z_DDOT'][i], line, f));
  const state: OemState = {
    epoch: fields[0], epochTdbS, positionKm: [n[0], n[1], n[2]], velocityKmS: [n[3], n[4], n[5]], line,
  };
  if (n.length === 9) state.accelerationKmS2 = [n[6], n[7], n[8]] as Vec3;
  return state;
}

function readCovariance(cursor: TokenCursor, metadata: OemMetadata, leapSeconds: LeapSecondTable): OemCovariance {
  const comments = cursor.comments();
  const epoch = cursor.expect('EPOCH');
  const epochTdbS = parseCcsdsEpoch('EPOCH', epoch.line, epoch.value, metadata.timeSystem, leapSeconds);
  const frame = cursor.optional('COV_REF_FRAME');
  if (frame) frameMeaningFromName('COV_REF_FRAME', frame.line, frame.value, metadata.centre);
  let matrix: number[][];
  if (cursor.peek()?.kind === 'data') {
    const values: number[] = [];
    const firstLine = cursor.line();
    for (let row = 0; row < 6; row++) {
      const t = cursor.next();
      if (t?.kind !== 'data' || t.fields.length !== row + 1) {
        throw new CcsdsFormatError('covariance', t?.line ?? firstLine, `covariance row ${row + 1} must hold ${row + 1} `
          + `number${row ? 's' : ''} (lower triangle)`);
      }
      t.fields.forEach((f) => values.push(parseNumber('covariance', t.line, f)));
    }
    matrix = matrixFromLowerTriangle(values);
    assertPositiveSemiDefinite(matrix, 'covariance', firstLine);
  } else {
    matrix = readCovarianceKeywords(cursor).matrix;
  }
  return { comments, ...(frame ? { covRefFrame: frame.value } : {}), matrix, epoch: epoch.value, epochTdbS };
}
