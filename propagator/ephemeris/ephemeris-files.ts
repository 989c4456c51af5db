/**
 * Ephemeris files (CCSDS OEM, read by a door: CLI or service) as the source of the bodies they tabulate,
 * layered over the built-in series for everything else. The span each file covers is checked against the
 * problem's (a file that does not cover it is refused naming the file, the body and the uncovered epochs —
 * never extrapolated), and the plan records which source served each body. Pure (the doors read the files);
 * here so the planner and the CCSDS export build a plan's ephemeris the same way.
 */
import { formatEpoch } from '../time/epoch-text.ts';
import { InvalidInputError, OutOfSpanError } from '../../contract/errors.ts';
import type { BodyName } from '../../contract/bodies.ts';
import type { PlanEphemerisSource } from '../../contract/plan-types.ts';
import type { LeapSecondTable } from '../time/leap-second-table.ts';
import { createBuiltinEphemeris } from './astronomy-engine-ephemeris.ts';
import type { Ephemeris, TdbSpan } from './ephemeris.ts';
import { layerEphemerides } from './layered-ephemeris.ts';
import type { TabulatedEphemeris } from './tabulated-ephemeris.ts';

/** One body a file tabulates: the propagator's tabulated source and where it came from. */
export interface EphemerisFileTable {
  table: TabulatedEphemeris;
  /** The file's name as given (shown in errors and recorded in the plan). */
  file: string;
  /** SHA-256 (hex) of the file's bytes. */
  sha256: string;
}

const tdbText = (tdbS: number): string => formatEpoch(tdbS, 'TDB', 3);

/** The uncovered parts of `needed` outside `have`, as text (TDB, then UTC through `leapSeconds`). */
function uncovered(have: TdbSpan, needed: TdbSpan, leapSeconds?: LeapSecondTable): string {
  const utc = (tdbS: number): string => formatEpoch(tdbS, 'UTC', 3, leapSeconds);
  const parts: TdbSpan[] = [];
  if (needed.startTdbS < have.startTdbS) parts.push({ startTdbS: needed.startTdbS, endTdbS: Math.min(have.startTdbS, needed.endTdbS) });
  if (needed.endTdbS > have.endTdbS) parts.push({ startTdbS: Math.max(have.endTdbS, needed.startTdbS), endTdbS: needed.endTdbS });
  return parts.map((p) => `${tdbText(p.startTdbS)} to ${tdbText(p.endTdbS)} (${utc(p.startTdbS)} to ${utc(p.endTdbS)})`).join(' and ');
}

/**
 * Refuses a file's tabulated span `have` of `body` unless it covers `needed` (TDB s from J2000: the problem's
 * first to last epoch): OutOfSpanError (field `field`) naming the file, the body and the uncovered epochs in
 * TDB and UTC (through `leapSeconds`, built-in when absent). The one coverage check of the planner, the CLI
 * and the service's submission check.
 */
export function refuseUncoveredSpan(file: string, body: BodyName, have: TdbSpan, needed: TdbSpan, field: string,
  leapSeconds?: LeapSecondTable): void {
  if (have.startTdbS <= needed.startTdbS && have.endTdbS >= needed.endTdbS) return;
  throw new OutOfSpanError(field, `${file}: ${body} is tabulated from ${tdbText(have.startTdbS)} to `
    + `${tdbText(have.endTdbS)}, which does not cover ${uncovered(have, needed, leapSeconds)} (the problem runs from `
    + `${tdbText(needed.startTdbS)} to ${tdbText(needed.endTdbS)}); files are never extrapolated`);
}

/**
 * The ephemeris of a plan over `span` (TDB s from J2000: the problem's first to last epoch) for `bodies`:
 * each file's bodies from the file, the rest from the built-in series. Throws OutOfSpanError (field
 * `field`) when a file does not cover the span of a body the plan uses, InvalidInputError when two files
 * tabulate the same body. UTC in messages through `leapSeconds` (built-in when absent).
 */
export function ephemerisWithFiles(files: readonly EphemerisFileTable[], span: TdbSpan, bodies: readonly BodyName[],
  field = 'ephemeris', leapSeconds?: LeapSecondTable): { source: Ephemeris; sources: PlanEphemerisSource[] } {
  const builtin = createBuiltinEphemeris();
  const byBody = new Map<BodyName, EphemerisFileTable>();
  for (const f of files) {
    const other = byBody.get(f.table.target);
    if (other !== undefined) {
      throw new InvalidInputError(field, `${f.table.target} is tabulated by both ${other.file} and ${f.file}; give one source per body`);
    }
    byBody.set(f.table.target, f);
  }
  let source: Ephemeris = builtin;
  const sources: PlanEphemerisSource[] = [];
  for (const body of [...new Set(bodies)].sort()) {
    const f = byBody.get(body);
    if (f === undefined) {
      sources.push({ body, source: 'built-in', version: builtin.name });
      continue;
    }
    const have = f.table.span;
    refuseUncoveredSpan(f.file, body, have, span, field, leapSeconds);
    source = layerEphemerides(f.table, source);
    sources.push({ body, source: 'oem', file: f.file, sha256: f.sha256, startTdb: tdbText(have.startTdbS), endTdb: tdbText(have.endTdbS) });
  }
  return { source, sources };
}
