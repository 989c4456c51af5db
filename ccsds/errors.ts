/**
 * The one error kind of the CCSDS readers: an InvalidInputError (so it is final and classified by name
 * across process boundaries) that also carries the 1-based line number of the offending text.
 */
import { InvalidInputError } from '../propagator/index.ts';
import { failureOf } from '../contract/errors.ts';

/** Malformed or unsupported content in an OPM or OEM. `field` is the keyword (or `file`), `line` the
 * 1-based line number in the text that was read (0 when the problem is the end of the text). */
export class CcsdsFormatError extends InvalidInputError {
  readonly line: number;
  constructor(field: string, line: number, message: string) {
    super(field, `${line > 0 ? `line ${line}` : 'end of file'}: ${message}`, 'CCSDS_FORMAT');
    this.line = line;
  }
}

/** Re-throws an InvalidInputError raised while converting one value (an epoch, a frame) with the line
 * and keyword of the text it came from; other errors pass through. */
export function withLine<T>(field: string, line: number, convert: () => T): T {
  try {
    return convert();
  } catch (error) {
    if (error instanceof CcsdsFormatError) throw error;
    if (error instanceof Error && (error.name === 'InvalidInputError' || error.name === 'OutOfSpanError')) {
      throw new CcsdsFormatError(field, line, failureOf(error).message);
    }
    throw error;
  }
}
