/**
 * CLI glue for CCSDS messages: `veer plan --state FILE.opm` (the OPM's state replaces the problem's
 * initial state), the `veer export` formats `ccsds-opm` / `ccsds-oem` (also `--ccsds opm|oem`), fetched
 * from the API's /v1/plans/:planId/ccsds/:kind, and the same export without a server from the files
 * `veer plan --out` and the problem (`--plan FILE --problem FILE`).
 */
import { readFile, writeFile } from 'node:fs/promises';
import { basename, extname } from 'node:path';
import { exportPlanAsCcsds, loadEphemerisFiles, readOpmAsInitialState } from '../../ccsds/index.ts';
import {
  leapSecondTableOfPlan, type CheckedProblem, type ManeuverPlan, parseProblem, planLeapSeconds, type PlanningProblem, problemHash,
} from '../../planner/index.ts';
import { BUILTIN_LEAP_SECONDS, InvalidInputError, type LeapSecondTable } from '../../propagator/index.ts';
import { printableText } from '../../contract/free-text.ts';
import { ApiCallError, parseAnswer, PROPOSAL_NOTICE, type Remote, sendToApi, UsageError } from './remote-api.ts';

/**
 * Reads an OPM file and puts its state (epoch, centre, frame, position, velocity, covariance) in place
 * of `problemJson.initialState`. Returns the new JSON (to be validated by the planner) and notes for stderr.
 */
export async function problemWithOpmState(problemJson: unknown, opmPath: string): Promise<{ problem: unknown; notes: string[] }> {
  let text: string;
  try {
    text = await readFile(opmPath, 'utf8');
  } catch (error) {
    throw new InvalidInputError('--state', `cannot read '${opmPath}': ${(error as Error).message}`);
  }
  const { initialState, massKg, notes } = readOpmAsInitialState(text);
  if (typeof problemJson !== 'object' || problemJson === null || Array.isArray(problemJson)) {
    throw new InvalidInputError('problem', 'the problem file must hold a JSON object');
  }
  const problem = { ...(problemJson as Record<string, unknown>), initialState };
  const spacecraft = (problemJson as { spacecraft?: { massKg?: unknown } }).spacecraft;
  const all = [`initial state read from ${opmPath} (epoch ${initialState.epoch}, centre ${initialState.centre}, `
    + `${initialState.covarianceKmKmS ? 'with' : 'without'} covariance)`, ...notes];
  if (massKg !== undefined && spacecraft?.massKg !== undefined && spacecraft.massKg !== massKg) {
    all.push(`the OPM's MASS (${massKg} kg) differs from spacecraft.massKg (${String(spacecraft.massKg)} kg); the problem's value is used`);
  }
  return { problem, notes: all };
}

/** Reads a problem file, replaces its initial state by the OPM's (notes to stderr) and validates it. */
export async function readProblemFileWithOpmState(problemPath: string, opmPath: string, leapSeconds: LeapSecondTable): Promise<CheckedProblem> {
  let json: unknown;
  try {
    json = JSON.parse(await readFile(problemPath, 'utf8'));
  } catch (error) {
    throw new InvalidInputError('problem', `cannot read '${problemPath}' as JSON: ${(error as Error).message}`);
  }
  const { problem, notes } = await problemWithOpmState(json, opmPath);
  for (const note of notes) process.stderr.write(`veer plan: --state: ${note}\n`);
  return parseProblem(problem, leapSeconds);
}

/** Options the CCSDS export formats read from the command line. */
export interface CcsdsExportCliOptions {
  toHead: boolean;
  /** Seconds between OEM lines. */
  stepS?: number;
  xml?: boolean;
}

async function fetchText(remote: Remote, path: string): Promise<string> {
  const res = await sendToApi(remote, path, { headers: {} });
  const text = await res.text();
  if (!res.ok) throw new ApiCallError(res.status, parseAnswer(text) as ApiCallError['body']);
  return printableText(text, { keepLines: true });
}

function ccsdsFormat(kind: 'opm' | 'oem') {
  return {
    summary: kind === 'opm'
      ? 'CCSDS OPM (502.0-B): initial state, covariance, mass and one maneuver block per burn (--xml for NDM/XML)'
      : 'CCSDS OEM (502.0-B): predicted post-burn trajectory, one segment per arc, every --step seconds (--xml for NDM/XML)',
    defaultFileName: (planId: string): string => `${planId}.${kind}`,
    produce: async (remote: Remote, planId: string, options: CcsdsExportCliOptions): Promise<string> => {
      if (kind === 'oem' && options.stepS === undefined) throw new InvalidInputError('--step', 'an OEM export needs --step SECONDS');
      const query = new URLSearchParams();
      if (options.xml) query.set('encoding', 'xml');
      if (kind === 'oem') query.set('stepS', String(options.stepS));
      const q = query.toString();
      return fetchText(remote, `/v1/plans/${encodeURIComponent(planId)}/ccsds/${kind}${q ? `?${q}` : ''}`);
    },
  };
}

/** `veer export` formats for CCSDS messages; spread into EXPORT_FORMATS. */
export const CCSDS_EXPORT_FORMATS = {
  'ccsds-opm': ccsdsFormat('opm'),
  'ccsds-oem': ccsdsFormat('oem'),
};

/** What `veer export --ccsds opm|oem --plan FILE --problem FILE` reads from the command line. */
export interface OfflineCcsdsExport {
  kind: 'opm' | 'oem';
  /** The plan JSON written by `veer plan --out`. */
  planPath: string;
  /** The problem JSON the plan was made from. */
  problemPath: string;
  /** The OPM given to `veer plan --state`, when it was. */
  statePath?: string;
  /** Seconds between OEM lines. */
  stepS?: number;
  xml?: boolean;
  /** The OEM ephemeris files the plan was made with (`veer plan --ephemeris`), for an OEM export. */
  ephemerisPaths?: readonly string[];
}

async function readJson(path: string, field: string): Promise<unknown> {
  try {
    return JSON.parse(await readFile(path, 'utf8'));
  } catch (error) {
    throw new InvalidInputError(field, `cannot read '${path}' as JSON: ${(error as Error).message}`);
  }
}

/** The least a plan file must hold for an export to read it (the rest is the planner's own output). */
function planFromJson(json: unknown, path: string): ManeuverPlan {
  const p = json as Partial<Record<keyof ManeuverPlan, unknown>> | null;
  const missing = ['status', 'problemHash', 'burns', 'crossCheck', 'caveats', 'spacecraftName']
    .filter((k) => p === null || typeof p !== 'object' || p[k as keyof ManeuverPlan] === undefined);
  if (missing.length > 0 || !Array.isArray(p?.burns) || p?.planFormatVersion !== 1) {
    throw new InvalidInputError('--plan', `'${path}' is not a plan written by veer plan --out`
      + `${missing.length > 0 ? ` (missing ${missing.join(', ')})` : ''}`);
  }
  return json as ManeuverPlan;
}

/**
 * The CCSDS export of a plan file, in this process: reads the problem (with the --state OPM when given),
 * checks that the plan was made from exactly this problem (its problem hash), and writes the message.
 * A plan that did not converge or failed its cross-check is refused, as over the API.
 */
export async function exportPlanFilesAsCcsds(o: OfflineCcsdsExport): Promise<{ text: string; defaultFileName: string }> {
  if (o.kind === 'oem' && o.stepS === undefined) throw new InvalidInputError('--step', 'an OEM export needs --step SECONDS');
  const plan = planFromJson(await readJson(o.planPath, '--plan'), o.planPath);
  // The plan's own leap-second table reads the problem's UTC epochs, as when it was planned.
  const leapSeconds = leapSecondTableOfPlan(plan.leapSeconds);
  const problem = o.statePath !== undefined ? await readProblemFileWithOpmState(o.problemPath, o.statePath, leapSeconds)
    : parseProblem(await readJson(o.problemPath, '--problem'), leapSeconds);
  const hash = problemHash(problem, planLeapSeconds(leapSeconds), plan.ephemerisSources);
  if (plan.problemHash !== hash) {
    throw new InvalidInputError('--problem', `the plan in '${o.planPath}' was made from another problem or leap-second table (its problem hash `
      + `${String(plan.problemHash).slice(0, 12)}… differs from ${hash.slice(0, 12)}… of '${o.problemPath}'`
      + `${o.statePath === undefined ? '; if it was planned with --state, give the same --state' : ''})`);
  }
  // The plan's own files again (each body's SHA-256 is checked against the plan's record by the export).
  const ephemerisFiles = await loadEphemerisFiles(o.ephemerisPaths ?? [], leapSeconds);
  const text = await exportPlanAsCcsds(problem, plan, {
    kind: o.kind, encoding: o.xml ? 'xml' : 'kvn', creationDateUtc: new Date().toISOString().slice(0, 19),
    ...(o.stepS !== undefined ? { stepS: o.stepS } : {}), ephemerisFiles,
  });
  const stem = basename(o.planPath, extname(o.planPath));
  return { text, defaultFileName: `${stem}.${o.xml ? 'xml' : o.kind}` };
}

/** The `veer export` options the offline path reads (as parsed by the export command). */
export interface OfflineExportValues {
  plan?: string; problem?: string; state?: string; ccsds?: string; format?: string; step?: string; xml?: boolean;
  out?: string; stdout?: boolean; ephemeris?: string[];
}

/**
 * `veer export --ccsds opm|oem --plan FILE --problem FILE [--state FILE.opm] [--step S] [--xml] [--out FILE |
 * --stdout]`: the CCSDS export without a server. Writes the message and returns the exit code.
 */
export async function runOfflineCcsdsExport(values: OfflineExportValues, positionals: readonly string[]): Promise<number> {
  if (values.plan === undefined || values.problem === undefined) {
    throw new UsageError(values.plan === undefined ? '--plan' : '--problem', 'an export without a server needs both --plan FILE and --problem FILE');
  }
  if (positionals.length > 0) throw new UsageError('planId', 'give either a plan id (API) or --plan/--problem files, not both');
  const kind = values.ccsds ?? values.format?.replace(/^ccsds-/, '');
  if (kind !== 'opm' && kind !== 'oem') {
    throw new UsageError('--ccsds', `an export from files is CCSDS only: --ccsds opm or --ccsds oem (got ${String(kind)})`);
  }
  const stepS = values.step === undefined ? undefined : Number(values.step);
  if (stepS !== undefined && !(stepS > 0 && Number.isFinite(stepS))) throw new UsageError('--step', `'${values.step}' is not a number of seconds > 0`);
  const { text, defaultFileName } = await exportPlanFilesAsCcsds({
    kind, planPath: values.plan, problemPath: values.problem, xml: values.xml ?? false,
    ...(values.state !== undefined ? { statePath: values.state } : {}),
    ...(stepS !== undefined ? { stepS } : {}), ...(values.ephemeris ? { ephemerisPaths: values.ephemeris } : {}),
  });
  if (values.stdout) { process.stdout.write(text); return 0; }
  const file = values.out ?? defaultFileName;
  await writeFile(file, text, 'utf8');
  process.stdout.write(`wrote ${file} (${Buffer.byteLength(text)} bytes)\n${PROPOSAL_NOTICE}\n`);
  return 0;
}
