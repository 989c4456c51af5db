/** Header and metadata blocks shared by the OPM and OEM readers (502.0-B tables 3-1/3-2, 5-1/5-2). */
import type { TimeScale } from '../../propagator/index.ts';
import { CcsdsFormatError } from '../errors.ts';
import { centreFromName, inertialFrameFromName } from './frames.ts';
import type { OdmHeader, OdmMetadata } from './odm-types.ts';
import type { TokenCursor } from '../syntax/token-cursor.ts';
import { checkCreationDate, parseTimeSystem } from '../syntax/values.ts';

/** Versions read: 2.0 (502.0-B-2) and 3.0 (502.0-B-3, which adds the optional CLASSIFICATION and
 * MESSAGE_ID header keywords). */
export const SUPPORTED_VERSIONS: readonly string[] = ['2.0', '3.0'];

/** Reads `CCSDS_<kind>_VERS`, comments, CREATION_DATE, ORIGINATOR (and the 3.0 optional keywords). */
export function readHeader(cursor: TokenCursor, kind: 'OPM' | 'OEM'): OdmHeader {
  const versionKeyword = `CCSDS_${kind}_VERS`;
  const first = cursor.peek();
  if (!(first?.kind === 'keyword' && first.keyword === versionKeyword)) {
    throw new CcsdsFormatError(versionKeyword, first?.line ?? 0, `an ${kind} must start with ${versionKeyword}`);
  }
  const version = cursor.expect(versionKeyword);
  if (!SUPPORTED_VERSIONS.includes(version.value)) {
    throw new CcsdsFormatError(versionKeyword, version.line, `version '${version.value}' is not supported `
      + `(supported: ${SUPPORTED_VERSIONS.join(', ')})`);
  }
  const comments = cursor.comments();
  const v3 = version.value === '3.0';
  const classification = v3 ? cursor.optional('CLASSIFICATION')?.value : undefined;
  const created = cursor.expect('CREATION_DATE');
  checkCreationDate(created.line, created.value);
  const originator = cursor.expect('ORIGINATOR').value;
  const messageId = v3 ? cursor.optional('MESSAGE_ID')?.value : undefined;
  return {
    version: version.value, creationDate: created.value, originator, comments,
    ...(classification !== undefined ? { classification } : {}),
    ...(messageId !== undefined ? { messageId } : {}),
  };
}

/** Reads the common metadata keywords, from COMMENT to TIME_SYSTEM, in the standard's order. */
export function readCommonMetadata(cursor: TokenCursor): OdmMetadata {
  const comments = cursor.comments();
  const objectName = cursor.expect('OBJECT_NAME').value;
  const objectId = cursor.expect('OBJECT_ID').value;
  const centreToken = cursor.expect('CENTER_NAME');
  const centre = centreFromName(centreToken.line, centreToken.value);
  const frameToken = cursor.expect('REF_FRAME');
  const frame = inertialFrameFromName('REF_FRAME', frameToken.line, frameToken.value, centre);
  const frameEpoch = cursor.optional('REF_FRAME_EPOCH');
  if (frameEpoch) {
    throw new CcsdsFormatError('REF_FRAME_EPOCH', frameEpoch.line, `frame ${frameToken.value} has its epoch `
      + 'built in (J2000); a frame of another epoch is not supported');
  }
  const scaleToken = cursor.expect('TIME_SYSTEM');
  const timeSystem: TimeScale = parseTimeSystem(scaleToken.line, scaleToken.value);
  return {
    comments, objectName, objectId, centerName: centreToken.value, centre, refFrame: frameToken.value, frame,
    timeSystem,
  };
}
