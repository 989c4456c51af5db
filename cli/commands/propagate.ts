/** `veer propagate <request.json> [--json]`: one propagation in-process; report or JSON on stdout. */
import {
  BUILTIN_EPHEMERIS_SPAN, createBuiltinEphemeris, InvalidInputError, PROPAGATION_DEFAULTS,
  propagateAsync, type BodyName, type Ephemeris,
} from '../../propagator/index.ts';
import { cliEphemerisCache } from '../cli-ephemeris-cache.ts';
import type { CliCommand } from '../command.ts';
import {
  checkRequestSpan, parsePropagateRequest, requestSpan, toPropagationRequest, type PropagateRequestFile,
} from '../propagate-request-schema.ts';
import { PropagateProgress } from '../propagate-progress.ts';
import { formatPropagateReport, propagateResultJson, type PropagateRunInfo } from '../propagate-report.ts';
import { readJsonFile } from './read-json-file.ts';

const USAGE = `usage: veer propagate <request.json> [--json]

Propagates an initial state (epoch, centre, frame, position, velocity) under a force model (central
body, perturbing bodies in Battin's f(q) form, optional J2 and solar radiation pressure) over a span,
with optional impulsive burns, output samples and the state transition matrix. The request file is
described in README.md ("veer propagate"); see examples/propagate-two-body.json and
examples/propagate-cruise.json. Progress goes to stderr.

  --json   print the stable JSON contract (schema veer.propagate.result/1, see README) instead of the report

Exit codes: 0 finished; 3 ended early (impact, step-size underflow, max steps, stopped by event,
cancelled); 2 bad usage or invalid request (the field is named); 1 other failures.
Results are predictions for study: any use in operations requires review by qualified flight-dynamics
staff and independent verification under the mission's own procedures.`;

/** Margin added around the span when building the Chebyshev cache, s (narrower only where the
 * built-in span ends closer than this to a requested span that lies inside it). */
const CACHE_MARGIN_S = 86400;

/**
 * The ephemeris a request asks for: the built-in series, or a Chebyshev cache of it over the span.
 * When any body other than the central one is consulted, the requested span is first checked against
 * the built-in span (OutOfSpanError naming `initial.epoch`, `endEpoch` or `durationS`); `beforeBuild`
 * runs once those checks pass; the cache's blocks are fitted as the propagation reaches them.
 */
export function ephemerisFor(file: PropagateRequestFile, beforeBuild?: () => void): Ephemeris {
  const builtin = createBuiltinEphemeris();
  const bodies = new Set<BodyName>([file.forces.centralBody, file.initial.centre, ...file.forces.perturbingBodies]);
  if (file.forces.solarPressure !== undefined) bodies.add('sun');
  for (const e of file.events) if (e.kind !== 'epoch') bodies.add(e.body);
  if (bodies.size === 1) return builtin;
  checkRequestSpan(file, BUILTIN_EPHEMERIS_SPAN, builtin.name);
  if (file.ephemeris === 'builtin') return builtin;
  const { startTdbS, endTdbS } = requestSpan(file);
  beforeBuild?.();
  // Fitted block by block as the integration reaches it (the process's shared cache).
  return cliEphemerisCache.ephemerisFor(builtin, [...bodies], {
    startTdbS: Math.max(BUILTIN_EPHEMERIS_SPAN.startTdbS, Math.min(startTdbS, endTdbS) - CACHE_MARGIN_S),
    endTdbS: Math.min(BUILTIN_EPHEMERIS_SPAN.endTdbS, Math.max(startTdbS, endTdbS) + CACHE_MARGIN_S),
  });
}

async function readRequestFile(path: string): Promise<PropagateRequestFile> {
  return parsePropagateRequest(await readJsonFile(path, 'request', (field, message) => new InvalidInputError(field, message)));
}

/** The `veer propagate` command (see USAGE above and README). */
export const propagateCommand: CliCommand = {
  name: 'propagate',
  usage: USAGE,
  async run(args: string[]): Promise<number> {
    const json = args.includes('--json');
    const unknown = args.find((a) => a.startsWith('-') && a !== '--json');
    const files = args.filter((a) => !a.startsWith('-'));
    if (unknown !== undefined || files.length !== 1) {
      process.stderr.write(`veer propagate: ${unknown ? `unknown option '${unknown}'` : 'give exactly one request file'}\n\n${USAGE}\n`);
      return 2;
    }
    const file = await readRequestFile(files[0]);
    const progress = new PropagateProgress({ write: (line) => process.stderr.write(line), now: () => performance.now() });
    // 0 % as soon as the request is known good enough to start: before the cache build, after the span check.
    const ephemeris = ephemerisFor(file, () => progress.start());
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
