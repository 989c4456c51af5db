/** `veer propagate <request.json> [--json] [--leap-seconds FILE] [--ephemeris FILE.oem ...]`: one propagation in-process; report or JSON on stdout. */
import {
  BUILTIN_EPHEMERIS_SPAN, createBuiltinEphemeris, InvalidInputError, PROPAGATION_DEFAULTS,
  propagateAsync, type BodyName, type Ephemeris, type LeapSecondTable,
} from '../../propagator/index.ts';
import { cliEphemerisCache } from '../cli-ephemeris-cache.ts';
import type { CliCommand } from '../command.ts';
import {
  checkRequestSpan, parsePropagateRequest, requestSpan, toPropagationRequest, type PropagateRequestFile,
} from '../propagate-request-schema.ts';
import { PropagateProgress } from '../propagate-progress.ts';
import { formatPropagateReport, propagateResultJson, type PropagateRunInfo } from '../propagate-report.ts';
import { readJsonFile } from './read-json-file.ts';
import { LEAP_SECONDS_USAGE, loadCliLeapSeconds } from '../leap-seconds-option.ts';
import { EPHEMERIS_USAGE, loadEphemerisFiles } from '../ephemeris-option.ts';
import { ephemerisWithFiles, type EphemerisFileTable } from '../../planner/index.ts';

const USAGE = `usage: veer propagate <request.json> [--json] [--leap-seconds FILE] [--ephemeris FILE.oem ...]

Propagates an initial state (epoch, centre, frame, position, velocity) under a force model (central
body, perturbing bodies in Battin's f(q) form, optional J2 and solar radiation pressure) over a span,
with optional impulsive or finite burns (mass carried), output samples and the state transition matrix. The request file is
described in README.md ("veer propagate"); see examples/propagate-two-body.json and
examples/propagate-cruise.json. Progress goes to stderr.

  --json   print the stable JSON contract (schema veer.propagate.result/1, see README) instead of the report
${LEAP_SECONDS_USAGE}
${EPHEMERIS_USAGE}

Exit codes: 0 finished; 3 ended early (impact, step-size underflow, max steps, stopped by event,
cancelled); 2 bad usage or invalid request (the field is named); 1 other failures.
Results are predictions for study: any use in operations requires review by qualified flight-dynamics
staff and independent verification under the mission's own procedures.`;

/** Margin added around the span when building the Chebyshev cache, s (narrower only where the
 * built-in span ends closer than this to a requested span that lies inside it). */
const CACHE_MARGIN_S = 86400;

/**
 * The ephemeris a request asks for: the built-in series, or a Chebyshev cache of it over the span, with
 * the bodies of any `files` (--ephemeris) taken from them (their span must cover the request's: OutOfSpanError
 * naming --ephemeris, the file, body and uncovered epochs). When any body other than the central one is
 * consulted, the requested span is first checked against the source's span (OutOfSpanError naming
 * `initial.epoch`, `endEpoch` or `durationS`); `beforeBuild` runs once those checks pass; the cache's
 * blocks are fitted as the propagation reaches them.
 */
export function ephemerisFor(file: PropagateRequestFile, beforeBuild?: () => void, files: readonly EphemerisFileTable[] = []): Ephemeris {
  const builtin = createBuiltinEphemeris();
  const bodies = new Set<BodyName>([file.forces.centralBody, file.initial.centre, ...file.forces.perturbingBodies]);
  if (file.forces.solarPressure !== undefined) bodies.add('sun');
  for (const e of file.events) if (e.kind !== 'epoch') bodies.add(e.body);
  if (bodies.size === 1 && files.length === 0) return builtin;
  checkRequestSpan(file, BUILTIN_EPHEMERIS_SPAN, builtin.name);
  const { startTdbS, endTdbS } = requestSpan(file);
  const span = { startTdbS: Math.min(startTdbS, endTdbS), endTdbS: Math.max(startTdbS, endTdbS) };
  const source = files.length === 0 ? builtin : ephemerisWithFiles(files, span, [...bodies], '--ephemeris').source;
  if (file.ephemeris === 'builtin') return source;
  beforeBuild?.();
  // Fitted block by block as the integration reaches it (the process's shared cache).
  return cliEphemerisCache.ephemerisFor(source, [...bodies], {
    startTdbS: Math.max(source.span.startTdbS, span.startTdbS - CACHE_MARGIN_S),
    endTdbS: Math.min(source.span.endTdbS, span.endTdbS + CACHE_MARGIN_S),
  });
}

async function readRequestFile(path: string, leapSeconds: LeapSecondTable): Promise<PropagateRequestFile> {
  return parsePropagateRequest(await readJsonFile(path, 'request', (field, message) => new InvalidInputError(field, message)), leapSeconds);
}

/** Splits the arguments: the request file, --json, --leap-seconds FILE, --ephemeris FILE (repeatable); a
 * usage message when they do not fit. */
function readArgs(args: string[]): { file: string; json: boolean; leapPath?: string; ephemerisPaths: string[] } | string {
  let json = false;
  let leapPath: string | undefined;
  const files: string[] = [];
  const ephemerisPaths: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (a === '--json') json = true;
    else if (a === '--leap-seconds') {
      leapPath = args[++i];
      if (!leapPath) return '--leap-seconds needs a file name';
    } else if (a === '--ephemeris') {
      const path = args[++i];
      if (!path) return '--ephemeris needs an OEM file name';
      ephemerisPaths.push(path);
    } else if (a.startsWith('-')) return `unknown option '${a}'`;
    else files.push(a);
  }
  if (files.length !== 1) return 'give exactly one request file';
  return { file: files[0], json, ephemerisPaths, ...(leapPath !== undefined ? { leapPath } : {}) };
}

/** The `veer propagate` command (see USAGE above and README). */
export const propagateCommand: CliCommand = {
  name: 'propagate',
  usage: USAGE,
  async run(args: string[]): Promise<number> {
    const parsed = readArgs(args);
    if (typeof parsed === 'string') {
      process.stderr.write(`veer propagate: ${parsed}\n\n${USAGE}\n`);
      return 2;
    }
    const { json } = parsed;
    const files = [parsed.file];
    const leapSeconds = await loadCliLeapSeconds(parsed.leapPath);
    const file = await readRequestFile(files[0], leapSeconds);
    const tables = await loadEphemerisFiles(parsed.ephemerisPaths);
    const progress = new PropagateProgress({ write: (line) => process.stderr.write(line), now: () => performance.now() });
    // 0 % as soon as the request is known good enough to start: before the cache build, after the span check.
    const ephemeris = ephemerisFor(file, () => progress.start(), tables);
    const request = toPropagationRequest(file, ephemeris);
    progress.start();
    const controller = new AbortController();
    const onSigint = (): void => controller.abort();
    process.once('SIGINT', onSigint);
    const started = performance.now();
    try {
      const result = await propagateAsync(request, {
        signal: controller.signal,
        onProgress: (fraction) => progress.update(fraction),
      });
      const info: PropagateRunInfo = {
        requestFile: files[0],
        method: request.method ?? PROPAGATION_DEFAULTS.method,
        ephemerisName: ephemeris.name,
        relativeTolerance: request.relativeTolerance ?? PROPAGATION_DEFAULTS.relativeTolerance,
        absoluteTolerance: request.absoluteTolerance ?? PROPAGATION_DEFAULTS.absoluteTolerance,
        centralBody: request.forces.centralBody,
        perturbingBodies: [...request.forces.perturbingBodies],
        wallTimeMs: performance.now() - started,
        leapSeconds,
      };
      process.stdout.write(json
        ? `${JSON.stringify(propagateResultJson(result, info), null, 2)}\n`
        : `${formatPropagateReport(result, info, request.initial.epochTdbS)}\n`);
      if (result.outcome !== 'finished') process.stderr.write(`veer propagate: ended early: ${result.outcome}${result.message ? ` — ${result.message}` : ''}\n`);
      return result.outcome === 'finished' ? 0 : 3;
    } finally {
      process.removeListener('SIGINT', onSigint);
    }
  },
};
