/**
 * What the problem hash covers of a plan's ephemeris files. The files themselves are layered over the
 * built-in series by propagator/ephemeris/ephemeris-files.ts (re-exported here for the planner's callers).
 */
import type { PlanEphemerisSource } from '../contract/plan-types.ts';

export { ephemerisWithFiles, type EphemerisFileTable } from '../propagator/index.ts';

/** What the problem hash covers of the plan's sources: each file's body, SHA-256 and span (not its path);
 * null when every body is built-in (so such problems hash as before files could be given). */
export function ephemerisIdentity(sources: readonly PlanEphemerisSource[] | undefined): Record<string, unknown>[] | null {
  const files = (sources ?? []).flatMap((s) => (s.source === 'oem'
    ? [{ body: s.body, sha256: s.sha256, startTdb: s.startTdb, endTdb: s.endTdb }] : []));
  return files.length === 0 ? null : files;
}
