/**
 * CCSDS OEM files as ephemeris sources: each file (KVN or XML, one or more segments, one or more bodies told
 * apart by OBJECT_NAME) becomes one tabulated source per body, with the file's name and SHA-256. Used by every
 * door that plans on files — the CLI's --ephemeris, the service's ephemeris sets (start-up, planner threads,
 * CCSDS export threads). Every error names the file, and for its content the line and keyword.
 */
import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { basename } from 'node:path';
import { BUILTIN_LEAP_SECONDS, InvalidInputError, type EphemerisFileTable, type LeapSecondTable } from '../../propagator/index.ts';
import { CcsdsFormatError } from '../errors.ts';
import type { Oem } from './odm-types.ts';
import { oemToEphemeris } from './oem-ephemeris.ts';
import { readOem } from './oem-reader.ts';

/** The file's text as one OEM per body (segments grouped by OBJECT_NAME, in file order). */
function byObject(oem: Oem): Oem[] {
  const names = [...new Set(oem.segments.map((s) => s.metadata.objectName))];
  return names.map((name) => ({ header: oem.header, segments: oem.segments.filter((s) => s.metadata.objectName === name) }));
}

/** Re-throws an error about `path`'s content with the file named (line and keyword kept); other input errors
 * under `field`. */
function naming<T>(path: string, field: string, read: () => T): T {
  try {
    return read();
  } catch (error) {
    if (error instanceof CcsdsFormatError) {
      throw new CcsdsFormatError(error.field, error.line, `${path}: ${error.message.replace(/^[^:]*: (line \d+|end of file): /, '')}`);
    }
    if (error instanceof InvalidInputError) throw new InvalidInputError(field, `${path}: ${error.message}`);
    throw error;
  }
}

/** SHA-256 (hex) of a file's bytes, as plans record it. */
export function fileSha256(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/** The tables of one OEM file's bytes (`path` names it in errors and, by its base name, in the plan). An OEM
 * written in UTC is read through `leapSeconds`. */
export function oemFileTables(bytes: Uint8Array, path: string, leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS,
  field = '--ephemeris'): EphemerisFileTable[] {
  const sha256 = fileSha256(bytes);
  const oem = naming(path, field, () => readOem(Buffer.from(bytes).toString('utf8'), leapSeconds));
  return byObject(oem).map((one) => {
    const objectName = one.segments[0].metadata.objectName;
    const table = naming(path, field, () => oemToEphemeris(one, { name: `OEM ${objectName} from ${basename(path)} (sha256 ${sha256.slice(0, 12)})` }));
    return { table, file: basename(path), sha256 };
  });
}

/** Reads `path` (an unreadable file is an InvalidInputError under `field` naming the path). */
export async function readEphemerisFileBytes(path: string, field = '--ephemeris'): Promise<Buffer> {
  try {
    return await readFile(path);
  } catch (error) {
    throw new InvalidInputError(field, `cannot read '${path}': ${(error as NodeJS.ErrnoException).code ?? (error as Error).message}`);
  }
}

/** Loads every file; one table per body, its name unique by the file's SHA-256. When `expectedSha256` is given
 * (one per path), a file whose bytes changed since it was checked is refused under `field`. */
export async function loadEphemerisFiles(paths: readonly string[], leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS,
  field = '--ephemeris', expectedSha256?: readonly string[]): Promise<EphemerisFileTable[]> {
  const tables: EphemerisFileTable[] = [];
  for (const [i, path] of paths.entries()) {
    const bytes = await readEphemerisFileBytes(path, field);
    const expected = expectedSha256?.[i];
    if (expected !== undefined && fileSha256(bytes) !== expected) {
      throw new InvalidInputError(field, `${path} changed since it was checked (SHA-256 was ${expected.slice(0, 12)}…, is now `
        + `${fileSha256(bytes).slice(0, 12)}…); restart the service to check the set again`);
    }
    tables.push(...oemFileTables(bytes, path, leapSeconds, field));
  }
  return tables;
}
