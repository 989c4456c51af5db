/** Output of `veer propagate`: the readable report and the stable JSON contract (documented in README). */
import {
  formatEpoch, isUtcPastLeapSecondExpiry, lastTaiMinusUtcS, type LeapSecondTable, type PropagationResult, type StateVector,
  utcTextOrNull,
} from '../propagator/index.ts';

/** Version tag of the JSON contract; bump on any incompatible change. */
export const PROPAGATE_JSON_SCHEMA = 'veer.propagate.result/1';

/** How a run was set up (the `run` block of the JSON contract); tolerances relative (dimensionless) and
 * absolute (km or km/s); wall time in ms. */
export interface PropagateRunInfo {
  requestFile: string;
  /** The method the request asked for (or the default); the one used is the result's `methodUsed`. */
  method: string;
  ephemerisName: string;
  relativeTolerance: number;
  absoluteTolerance: number;
  centralBody: string;
  perturbingBodies: string[];
  wallTimeMs: number;
  /** The table UTC epochs were read and are shown through. */
  leapSeconds: LeapSecondTable;
}

/** `<UTC> = <TDB>` (TDB alone before 1972, where UTC has no whole-second offset). */
function epochText(tdbS: number, table: LeapSecondTable, digits: number): string {
  const utc = utcTextOrNull(tdbS, table, digits);
  return utc === null ? formatEpoch(tdbS, 'TDB', digits) : `${utc} = ${formatEpoch(tdbS, 'TDB', digits)}`;
}

function stateJson(s: StateVector, table: LeapSecondTable): Record<string, unknown> {
  return {
    epochTdbS: s.epochTdbS, epoch: formatEpoch(s.epochTdbS, 'TDB', 6), utc: utcTextOrNull(s.epochTdbS, table, 6),
    centre: s.centre, frame: s.frame, positionKm: s.positionKm, velocityKmS: s.velocityKmS,
  };
}

/** The `run.leapSeconds` block and, past the table's expiry, the note that UTC there is assumed. */
function leapSecondsJson(table: LeapSecondTable): Record<string, unknown> {
  return { source: table.origin, path: table.path, sha256: table.sha256, expiresUtc: table.expiresUtc };
}

/** The warning shown when epochs lie past the table's expiry (null otherwise). */
function pastExpiryNote(table: LeapSecondTable, tdbS: number[]): string | null {
  if (!tdbS.some((t) => isUtcPastLeapSecondExpiry(t, table))) return null;
  return `UTC past the leap-second table's expiry ${table.expiresUtc} assumes TAI − UTC = ${lastTaiMinusUtcS(table)} s; a leap `
    + 'second announced later would shift those UTC times by 1 s (give a current leap-seconds.list: VEER_LEAP_SECONDS or --leap-seconds)';
}

/** The JSON contract: field names and meanings are stable within one schema tag. */
export function propagateResultJson(result: PropagationResult, info: PropagateRunInfo): Record<string, unknown> {
  return {
    schema: PROPAGATE_JSON_SCHEMA,
    outcome: result.outcome,
    message: result.message ?? null,
    final: stateJson(result.final, info.leapSeconds),
    stm: result.stm ?? null,
    burnSensitivities: result.burnSensitivities ?? null,
    finalMassKg: result.finalMassKg ?? null,
    finiteBurns: result.finiteBurns === undefined ? null : result.finiteBurns.map((b) => (b === null ? null : {
      startTdbS: b.startTdbS, start: formatEpoch(b.startTdbS, 'TDB', 6), endTdbS: b.endTdbS, end: formatEpoch(b.endTdbS, 'TDB', 6),
      massBeforeKg: b.massBeforeKg, massAfterKg: b.massAfterKg, idealDeltaVKmS: b.idealDeltaVKmS,
      directionAtStartInertial: b.directionAtStartInertial, directionAtEndInertial: b.directionAtEndInertial,
    })),
    samples: result.samples.map((s) => stateJson(s, info.leapSeconds)),
    events: result.events.map((e) => ({ kind: e.kind, body: e.body ?? null, epochTdbS: e.epochTdbS,
      epoch: formatEpoch(e.epochTdbS, 'TDB', 6), utc: utcTextOrNull(e.epochTdbS, info.leapSeconds, 6),
      distanceKm: e.distanceKm ?? null, state: stateJson(e.state, info.leapSeconds) })),
    stats: result.stats,
    warnings: [...result.warnings, ...[pastExpiryNote(info.leapSeconds, [result.final.epochTdbS])].filter((w): w is string => w !== null)],
    run: {
      requestFile: info.requestFile, method: info.method, methodUsed: result.methodUsed, ephemeris: info.ephemerisName,
      relativeTolerance: info.relativeTolerance, absoluteTolerance: info.absoluteTolerance,
      centralBody: info.centralBody, perturbingBodies: info.perturbingBodies, wallTimeMs: Math.round(info.wallTimeMs),
      leapSeconds: leapSecondsJson(info.leapSeconds),
    },
  };
}

const fixed = (v: number, digits: number): string => v.toFixed(digits).padStart(22);

/** The readable report for a terminal. */
export function formatPropagateReport(result: PropagationResult, info: PropagateRunInfo, startTdbS: number): string {
  const f = result.final;
  const lines = [
    `veer propagate: ${info.requestFile}`,
    `  method ${info.method}${result.methodUsed === info.method ? '' : ` (used: ${result.methodUsed}; see warnings)`}; central body ${info.centralBody}; perturbers ${info.perturbingBodies.join(', ') || 'none'}`,
    `  tolerance rel ${info.relativeTolerance} / abs ${info.absoluteTolerance}; ephemeris ${info.ephemerisName}`,
    `  start   ${epochText(startTdbS, info.leapSeconds, 3)}`,
    `  reached ${epochText(f.epochTdbS, info.leapSeconds, 3)}   outcome: ${result.outcome}${result.message ? ` (${result.message})` : ''}`,
    '',
    `final state (${f.frame}, relative to ${f.centre}):`,
    `  position km   ${f.positionKm.map((v) => fixed(v, 6)).join('')}   |r| ${Math.hypot(...f.positionKm).toFixed(6)}`,
    `  velocity km/s ${f.velocityKmS.map((v) => fixed(v, 9)).join('')}   |v| ${Math.hypot(...f.velocityKmS).toFixed(9)}`,
    '',
    `statistics: ${result.stats.steps} steps (${result.stats.acceptedSteps} accepted, ${result.stats.rejectedSteps} rejected), `
      + `${result.stats.evaluations} force evaluations, ${result.stats.rectifications} rectifications, `
      + `${result.samples.length} samples, ${Math.round(info.wallTimeMs)} ms`,
  ];
  (result.finiteBurns ?? []).forEach((b, i) => {
    lines.push(b === null ? `finite burn ${i + 1}: not flown to cut-off`
      : `finite burn ${i + 1}: ignition ${epochText(b.startTdbS, info.leapSeconds, 3)}, cut-off ${epochText(b.endTdbS, info.leapSeconds, 3)}, `
        + `mass ${b.massBeforeKg.toFixed(6)} -> ${b.massAfterKg.toFixed(6)} kg, ideal Δv ${(b.idealDeltaVKmS * 1000).toFixed(6)} m/s`);
  });
  if (result.finalMassKg !== undefined) lines.push(`final mass ${result.finalMassKg.toFixed(6)} kg`);
  for (const e of result.events) {
    lines.push(`event: ${e.kind}${e.body ? ` ${e.body}` : ''} at ${epochText(e.epochTdbS, info.leapSeconds, 6)}`
      + `${e.distanceKm !== undefined ? `, distance ${e.distanceKm.toFixed(3)} km` : ''}`);
  }
  for (const sw of result.stats.switches) {
    lines.push(`centre switch: ${sw.from} -> ${sw.to} at ${epochText(sw.epochTdbS, info.leapSeconds, 6)}`);
  }
  const note = pastExpiryNote(info.leapSeconds, [startTdbS, f.epochTdbS]);
  for (const w of [...result.warnings, ...(note === null ? [] : [note])]) lines.push(`warning: ${w}`);
  if (result.stm) {
    lines.push('', 'state transition matrix d(final)/d(initial) (rows x,y,z,vx,vy,vz; km, km/s):');
    for (let i = 0; i < 6; i++) lines.push(`  ${result.stm.slice(6 * i, 6 * i + 6).map((v) => v.toExponential(6).padStart(15)).join('')}`);
  }
  return lines.join('\n');
}
