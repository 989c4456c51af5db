/** Output of `veer propagate`: the readable report and the stable JSON contract (documented in README). */
import { formatEpoch, type PropagationResult, type StateVector } from '../propagator/index.ts';

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
}

function stateJson(s: StateVector): Record<string, unknown> {
  return {
    epochTdbS: s.epochTdbS, epoch: formatEpoch(s.epochTdbS, 'TDB', 6), centre: s.centre, frame: s.frame,
    positionKm: s.positionKm, velocityKmS: s.velocityKmS,
  };
}

/** The JSON contract: field names and meanings are stable within one schema tag. */
export function propagateResultJson(result: PropagationResult, info: PropagateRunInfo): Record<string, unknown> {
  return {
    schema: PROPAGATE_JSON_SCHEMA,
    outcome: result.outcome,
    message: result.message ?? null,
    final: stateJson(result.final),
    stm: result.stm ?? null,
    burnSensitivities: result.burnSensitivities ?? null,
    samples: result.samples.map(stateJson),
    events: result.events.map((e) => ({ kind: e.kind, body: e.body ?? null, epochTdbS: e.epochTdbS,
      epoch: formatEpoch(e.epochTdbS, 'TDB', 6), distanceKm: e.distanceKm ?? null, state: stateJson(e.state) })),
    stats: result.stats,
    warnings: result.warnings,
    run: {
      requestFile: info.requestFile, method: info.method, methodUsed: result.methodUsed, ephemeris: info.ephemerisName,
      relativeTolerance: info.relativeTolerance, absoluteTolerance: info.absoluteTolerance,
      centralBody: info.centralBody, perturbingBodies: info.perturbingBodies, wallTimeMs: Math.round(info.wallTimeMs),
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
    `  start   ${formatEpoch(startTdbS, 'TDB', 3)}`,
    `  reached ${formatEpoch(f.epochTdbS, 'TDB', 3)}   outcome: ${result.outcome}${result.message ? ` (${result.message})` : ''}`,
    '',
    `final state (${f.frame}, relative to ${f.centre}):`,
    `  position km   ${f.positionKm.map((v) => fixed(v, 6)).join('')}   |r| ${Math.hypot(...f.positionKm).toFixed(6)}`,
    `  velocity km/s ${f.velocityKmS.map((v) => fixed(v, 9)).join('')}   |v| ${Math.hypot(...f.velocityKmS).toFixed(9)}`,
    '',
    `statistics: ${result.stats.steps} steps (${result.stats.acceptedSteps} accepted, ${result.stats.rejectedSteps} rejected), `
      + `${result.stats.evaluations} force evaluations, ${result.stats.rectifications} rectifications, `
      + `${result.samples.length} samples, ${Math.round(info.wallTimeMs)} ms`,
  ];
  for (const e of result.events) {
    lines.push(`event: ${e.kind}${e.body ? ` ${e.body}` : ''} at ${formatEpoch(e.epochTdbS, 'TDB', 6)}`
      + `${e.distanceKm !== undefined ? `, distance ${e.distanceKm.toFixed(3)} km` : ''}`);
  }
  for (const sw of result.stats.switches) {
    lines.push(`centre switch: ${sw.from} -> ${sw.to} at ${formatEpoch(sw.epochTdbS, 'TDB', 6)}`);
  }
  for (const w of result.warnings) lines.push(`warning: ${w}`);
  if (result.stm) {
    lines.push('', 'state transition matrix d(final)/d(initial) (rows x,y,z,vx,vy,vz; km, km/s):');
    for (let i = 0; i < 6; i++) lines.push(`  ${result.stm.slice(6 * i, 6 * i + 6).map((v) => v.toExponential(6).padStart(15)).join('')}`);
  }
  return lines.join('\n');
}
