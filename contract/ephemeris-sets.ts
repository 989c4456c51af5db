/**
 * Named ephemeris sets of the service (EPHEMERIS_DIR: one sub-folder per set, each holding CCSDS OEM files):
 * the set name a problem chooses, the listing `GET /v1/ephemerides` answers with, and the one comparison of a
 * plan's recorded ephemeris sources with those rebuilt from files (used wherever a plan made on files is
 * used again: OEM export, Monte Carlo samples, `veer export`).
 */
import * as z from 'zod';
import type { PlanEphemerisSource } from './plan-types.ts';

export { ephemerisSetNameSchema } from './ephemeris-set-name.ts';

/** One body a set's file tabulates, over its span (TDB and UTC, ISO text with the scale). */
export const ephemerisSetBodySchema = z.object({
  body: z.string(),
  startTdb: z.string(), endTdb: z.string(),
  startUtc: z.string(), endUtc: z.string(),
});

/** One file of a set: its name in the set's folder, SHA-256 (hex) of its bytes, and the bodies it serves. */
export const ephemerisSetFileSchema = z.object({
  file: z.string(),
  sha256: z.string(),
  bodies: z.array(ephemerisSetBodySchema),
});

export const ephemerisSetSchema = z.object({ name: z.string(), files: z.array(ephemerisSetFileSchema) });

/** `GET /v1/ephemerides`: the sets the service loaded at start-up (none when EPHEMERIS_DIR is unset). */
export const ephemerisSetsResponseSchema = z.object({
  /** What a problem without forceModel.ephemerisSet uses. */
  default: z.literal('built-in'),
  sets: z.array(ephemerisSetSchema),
});

export type EphemerisSetListing = z.infer<typeof ephemerisSetSchema>;

/** One line per source of a plan's bodies (the CCSDS COMMENT text, the CLI report and the console's review show
 * these): each file-served body with its file, SHA-256 and span, then the built-in bodies together. */
export function ephemerisSourceLines(sources: readonly PlanEphemerisSource[]): string[] {
  const builtin = sources.flatMap((e) => (e.source === 'built-in' ? [e] : []));
  return [
    ...sources.flatMap((e) => (e.source === 'oem'
      ? [`ephemeris ${e.body}: OEM ${e.file} sha256 ${e.sha256} covering ${e.startTdb} to ${e.endTdb}`] : [])),
    ...(builtin.length > 0 ? [`ephemeris ${builtin.map((e) => e.body).join(', ')}: built-in ${builtin[0].version}`] : []),
  ];
}

/**
 * How the sources rebuilt from the files at hand differ from the plan's record, body by body (null when they
 * agree): a body the plan took from a file must come from a file with the same SHA-256 (and so the same span),
 * and a body the plan took from the built-in series must not come from a file now.
 */
export function ephemerisSourceMismatch(recorded: readonly PlanEphemerisSource[], rebuilt: readonly PlanEphemerisSource[]): string | null {
  const now = new Map(rebuilt.map((s) => [s.body, s]));
  const differences: string[] = [];
  const describe = (s: PlanEphemerisSource | undefined): string => (s === undefined ? 'nothing'
    : s.source === 'built-in' ? 'the built-in series' : `${s.file} (sha256 ${s.sha256.slice(0, 12)}…)`);
  for (const r of recorded) {
    const n = now.get(r.body);
    const same = n !== undefined && n.source === r.source && (r.source !== 'oem' || (n.source === 'oem' && n.sha256 === r.sha256));
    if (!same) differences.push(`${r.body}: the plan used ${describe(r)}, here ${describe(n)}`);
  }
  return differences.length === 0 ? null : differences.join('; ');
}
