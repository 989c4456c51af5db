/**
 * Reads the text of a `leap-seconds.list` as the IERS and the time-zone database publish it:
 *
 *   #$  <NTP seconds>              last update of the list
 *   #@  <NTP seconds>              expiry of the list
 *   <NTP seconds>  <TAI − UTC, s>  [# comment]     one line per step
 *   #h  <five 32-bit hex words>    SHA-1 of the data
 *
 * NTP seconds count from 1900-01-01T00:00:00 UTC ignoring leap seconds. The `#h` hash is SHA-1 over the
 * digits only (white space and comments dropped) of the `#$` line, the `#@` line and the step lines, in
 * file order — the rule the list's own header points to and that NTP's reader implements. Any other `#`
 * line is a comment. Text only: reading the file is the caller's job.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import { buildLeapSecondTable, type LeapSecondStep, type LeapSecondTable, utcDateText } from './leap-second-table.ts';
import { sha1HexOfAscii } from './sha1.ts';

/** Days from 1900-01-01 (the NTP era start) to 2000-01-01. */
const NTP_DAYS_BEFORE_2000 = 36524;

/** A line that breaks the format; `field` names the source, the message starts with the line number. */
function lineError(source: string, line: number, message: string): InvalidInputError {
  return new InvalidInputError(source, `line ${line}: ${message}`, 'LEAP_SECONDS_FORMAT');
}

/** UTC day (from 2000-01-01) of an NTP timestamp. A step must fall on 00:00:00 UTC; the update and expiry
 * times are taken as their day (an expiry inside a day then starts the caveat at that day's start). */
function ntpDay(source: string, line: number, text: string, what: string): number {
  if (!/^\d+$/.test(text)) throw lineError(source, line, `${what} '${text}' is not a whole number of NTP seconds`);
  const seconds = Number(text);
  if (what === 'epoch' && seconds % 86400 !== 0) throw lineError(source, line, `epoch ${text} is not 00:00:00 UTC of a day`);
  return Math.floor(seconds / 86400) - NTP_DAYS_BEFORE_2000;
}

interface RawList {
  steps: { step: LeapSecondStep; line: number }[];
  expires: { day: number; line: number } | null;
  updatedDay: number | null;
  hash: { hex: string; line: number } | null;
  hashedDigits: string;
}

function readLines(text: string, source: string): RawList {
  const raw: RawList = { steps: [], expires: null, updatedDay: null, hash: null, hashedDigits: '' };
  text.split(/\r?\n/).forEach((full, index) => {
    const line = index + 1;
    const body = full.trim();
    if (body === '') return;
    const marker = body.slice(0, 2);
    const value = body.slice(2).trim();
    if (marker === '#$' || marker === '#@') {
      raw.hashedDigits += value.replace(/\D/g, '');
      const day = ntpDay(source, line, value, marker === '#$' ? "'#$' update time" : "'#@' expiry");
      if (marker === '#$') raw.updatedDay = day;
      else raw.expires = { day, line };
    } else if (marker === '#h') {
      const words = value.split(/\s+/);
      if (words.length !== 5 || words.some((w) => !/^[0-9a-fA-F]{1,8}$/.test(w))) {
        throw lineError(source, line, `'#h' must hold five hexadecimal words of up to 8 digits (SHA-1), got '${value}'`);
      }
      raw.hash = { hex: words.map((w) => w.toLowerCase().padStart(8, '0')).join(''), line };
    } else if (!body.startsWith('#')) {
      const data = body.split('#')[0].trim();
      raw.hashedDigits += data.replace(/\D/g, '');
      const fields = data.split(/\s+/);
      if (fields.length !== 2 || !/^\d+$/.test(fields[1])) {
        throw lineError(source, line, `expected '<NTP seconds> <TAI − UTC in whole seconds>', got '${data}'`);
      }
      raw.steps.push({ step: { utcDay: ntpDay(source, line, fields[0], 'epoch'), taiMinusUtcS: Number(fields[1]) }, line });
    }
  });
  return raw;
}

/**
 * Parses and checks the text of a `leap-seconds.list`; `source` (the file path) names it in errors and
 * becomes the table's `path`; `sha256` is the file's SHA-256 when the caller computed it. Verifies the `#h`
 * SHA-1 when present; requires the `#@` expiry, after the last step; refuses dates that do not increase and
 * offsets that do not grow by exactly 1 s. Throws InvalidInputError (code LEAP_SECONDS_FORMAT or
 * LEAP_SECONDS_HASH) naming `source` and the line. Returns an immutable table with origin 'file'.
 */
export function parseLeapSecondsList(text: string, source: string, sha256: string | null = null): LeapSecondTable {
  const raw = readLines(text, source);
  if (raw.expires === null && raw.steps.length > 0) {
    throw new InvalidInputError(source, "no '#@' expiry line: the list cannot say how long it is valid", 'LEAP_SECONDS_FORMAT');
  }
  if (raw.hash !== null) {
    const actual = sha1HexOfAscii(raw.hashedDigits);
    if (actual !== raw.hash.hex) {
      throw new InvalidInputError(source, `line ${raw.hash.line}: '#h' SHA-1 ${raw.hash.hex} does not match the data `
        + `(${actual}): the list was altered or damaged; use an unmodified copy`, 'LEAP_SECONDS_HASH');
    }
  }
  const expiresUtcDay = raw.expires?.day ?? Number.NaN;
  return buildLeapSecondTable({
    steps: raw.steps.map((s) => ({ ...s.step, line: s.line })),
    expiresUtcDay,
    updatedUtcDay: raw.updatedDay,
    origin: 'file',
    description: `${source} (${raw.hash === null ? 'no #h hash' : 'SHA-1 #h verified'}, expires ${utcDateText(expiresUtcDay)})`,
    path: source,
    sha256,
  }, source);
}
