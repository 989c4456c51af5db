/**
 * The service's named ephemeris sets (EPHEMERIS_DIR): one sub-folder per set, each holding CCSDS OEM files.
 * Loaded and checked once at start-up by the API and by every worker (the same folder, e.g. a shared volume):
 * every file is read, hashed and converted, so a corrupt file stops the start with a ConfigError naming the
 * variable, the file, the line and the keyword. What stays in memory is the listing (bodies, spans, SHA-256)
 * and the paths: the planner threads read the files again and refuse any whose SHA-256 changed since.
 */
import { readdir } from 'node:fs/promises';
import { join } from 'node:path';
import type { Logger } from 'pino';
import { loadEphemerisFiles } from '../../ccsds/index.ts';
import { ConfigError } from '../../contract/env-config.ts';
import { ephemerisSetNameSchema, type EphemerisSetListing } from '../../contract/ephemeris-sets.ts';
import { checkProblem, ephemerisNeeds, type PlanningProblem } from '../../planner/index.ts';
import {
  InvalidInputError, formatEpoch, refuseUncoveredSpan, type BodyName, type LeapSecondTable, type TdbSpan,
} from '../../propagator/index.ts';

/** File names read as OEM in a set's folder; anything else there is refused (no silent skipping). */
const OEM_FILE = /\.(oem|xml|txt|kvn)$/i;

/** A file of a set as the workers need it: where it is and the SHA-256 it had at start-up. */
export interface EphemerisSetFileRef { path: string; sha256: string }

/** One body a set's file tabulates, over which span (TDB s from J2000): what submissions are checked against. */
export interface EphemerisSetSpan { file: string; body: BodyName; span: TdbSpan }

/** A loaded set: its public listing, its files' paths (listing order) and each tabulated body's span. */
export interface EphemerisSet { listing: EphemerisSetListing; files: EphemerisSetFileRef[]; spans: EphemerisSetSpan[] }

/** The sets by name (empty when EPHEMERIS_DIR is unset). */
export type EphemerisSets = ReadonlyMap<string, EphemerisSet>;

/** The field a problem names its set in (400s and job failures point here). */
export const EPHEMERIS_SET_FIELD = 'forceModel.ephemerisSet';

async function entries(dir: string, what: string): Promise<import('node:fs').Dirent[]> {
  try {
    return (await readdir(dir, { withFileTypes: true })).sort((a, b) => a.name.localeCompare(b.name));
  } catch (error) {
    throw new ConfigError([`EPHEMERIS_DIR: cannot read ${what} '${dir}' (${(error as NodeJS.ErrnoException).code ?? (error as Error).message})`]);
  }
}

/** One set: every OEM file of `dir`, converted and described (spans in TDB and, through `leapSeconds`, UTC). */
async function loadSet(name: string, dir: string, leapSeconds: LeapSecondTable): Promise<EphemerisSet> {
  const files = (await entries(dir, 'the set folder')).filter((e) => !e.name.startsWith('.'));
  const refused = files.filter((e) => !e.isFile() || !OEM_FILE.test(e.name)).map((e) => e.name);
  if (refused.length > 0) {
    throw new ConfigError([`EPHEMERIS_DIR: set '${name}' holds ${refused.join(', ')}, which is not a CCSDS OEM file (.oem, .xml, .txt, .kvn)`]);
  }
  if (files.length === 0) throw new ConfigError([`EPHEMERIS_DIR: set '${name}' (${dir}) holds no OEM file`]);
  const set: EphemerisSet = { listing: { name, files: [] }, files: [], spans: [] };
  for (const f of files) {
    const path = join(dir, f.name);
    let tables;
    try {
      tables = await loadEphemerisFiles([path], leapSeconds, EPHEMERIS_SET_FIELD);
    } catch (error) {
      if (!(error instanceof InvalidInputError)) throw error;
      // A CcsdsFormatError's field is the keyword and its message names the file and line.
      throw new ConfigError([`EPHEMERIS_DIR: set '${name}': ${error.message}`]);
    }
    const sha256 = tables[0]?.sha256 ?? '';
    set.files.push({ path, sha256 });
    set.spans.push(...tables.map(({ table }) => ({ file: f.name, body: table.target, span: table.span })));
    set.listing.files.push({
      file: f.name, sha256,
      bodies: tables.map(({ table }) => ({
        body: table.target,
        startTdb: formatEpoch(table.span.startTdbS, 'TDB', 3), endTdb: formatEpoch(table.span.endTdbS, 'TDB', 3),
        startUtc: formatEpoch(table.span.startTdbS, 'UTC', 3, leapSeconds), endUtc: formatEpoch(table.span.endTdbS, 'UTC', 3, leapSeconds),
      })),
    });
  }
  return set;
}

/** Loads every set under `dir` (the EPHEMERIS_DIR value); none when unset. Throws ConfigError for a folder
 * that cannot be read, a set name that is not one, a file that is not OEM or fails the CCSDS reader. */
export async function loadEphemerisSets(dir: string | undefined, leapSeconds: LeapSecondTable): Promise<EphemerisSets> {
  const sets = new Map<string, EphemerisSet>();
  if (dir === undefined) return sets;
  for (const e of (await entries(dir, 'the folder')).filter((x) => !x.name.startsWith('.'))) {
    if (!e.isDirectory()) throw new ConfigError([`EPHEMERIS_DIR: '${e.name}' is not a folder; put each set's OEM files in a sub-folder named after the set`]);
    const named = ephemerisSetNameSchema.safeParse(e.name);
    if (!named.success) throw new ConfigError([`EPHEMERIS_DIR: set folder '${e.name}' ${named.error.issues[0]?.message ?? 'is not a set name'}`]);
    sets.set(e.name, await loadSet(e.name, join(dir, e.name), leapSeconds));
  }
  return sets;
}

/** The start-up log line: each set with its files and bodies (or that only the built-in series is there). */
export function logEphemerisSetsAtStart(sets: EphemerisSets, logger: Logger): void {
  const found = [...sets.values()].map((s) => ({
    name: s.listing.name, files: s.listing.files.map((f) => ({ file: f.file, sha256: f.sha256, bodies: f.bodies.map((b) => b.body) })),
  }));
  logger.info({ ephemerisSets: found }, found.length === 0 ? 'ephemeris sets: none (built-in series only)'
    : `ephemeris sets: ${found.map((s) => `${s.name} (${s.files.flatMap((f) => f.bodies).join(', ')})`).join('; ')}`);
}

/** The files of the set a problem names, or none when it names none; an unknown name is an InvalidInputError
 * under forceModel.ephemerisSet listing the sets there are. */
export function ephemerisSetFiles(sets: EphemerisSets, name: string | undefined): EphemerisSetFileRef[] {
  if (name === undefined) return [];
  const set = sets.get(name);
  if (set === undefined) {
    throw new InvalidInputError(EPHEMERIS_SET_FIELD, `no ephemeris set '${name}' in this service (sets: `
      + `${[...sets.keys()].join(', ') || 'none; EPHEMERIS_DIR is unset'}); GET /v1/ephemerides lists them`);
  }
  return set.files;
}

/** Refuses, at submission, a problem whose named set does not cover the span of a body its plan takes from the
 * set: the planner's own coverage check (OutOfSpanError under forceModel.ephemerisSet naming the file, body and
 * uncovered epochs in TDB and UTC), run on the spans read at start-up, so the job is refused before it is queued.
 * An unknown name throws as {@link ephemerisSetFiles}; no set, or a problem failing its own checks: nothing. */
export function checkEphemerisSetCovers(sets: EphemerisSets, problem: PlanningProblem, leapSeconds: LeapSecondTable): void {
  const name = problem.forceModel.ephemerisSet;
  ephemerisSetFiles(sets, name);
  const set = name === undefined ? undefined : sets.get(name);
  if (set === undefined) return;
  const { bodies, span } = ephemerisNeeds(problem, checkProblem(problem, leapSeconds));
  for (const s of set.spans) {
    if (bodies.includes(s.body)) refuseUncoveredSpan(s.file, s.body, s.span, span, EPHEMERIS_SET_FIELD, leapSeconds);
  }
}
