/**
 * CLI glue for CCSDS messages: `veer plan --state FILE.opm` (the OPM's state replaces the problem's
 * initial state) and the `veer export` formats `ccsds-opm` / `ccsds-oem` (also `--ccsds opm|oem`), fetched
 * from the API's /v1/plans/:planId/ccsds/:kind.
 */
import { readFile } from 'node:fs/promises';
import { readOpmAsInitialState } from '../../ccsds/index.ts';
import { parseProblem, type PlanningProblem } from '../../planner/index.ts';
import { InvalidInputError } from '../../propagator/index.ts';
import { ApiCallError, type Remote } from './review-http.ts';

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
export async function readProblemFileWithOpmState(problemPath: string, opmPath: string): Promise<PlanningProblem> {
  let json: unknown;
  try {
    json = JSON.parse(await readFile(problemPath, 'utf8'));
  } catch (error) {
    throw new InvalidInputError('problem', `cannot read '${problemPath}' as JSON: ${(error as Error).message}`);
  }
  const { problem, notes } = await problemWithOpmState(json, opmPath);
  for (const note of notes) process.stderr.write(`veer plan: --state: ${note}\n`);
  return parseProblem(problem);
}

/** Options the CCSDS export formats read from the command line. */
export interface CcsdsExportCliOptions {
  toHead: boolean;
  /** Seconds between OEM lines. */
  stepS?: number;
  xml?: boolean;
}

async function fetchText(remote: Remote, path: string): Promise<string> {
  const headers: Record<string, string> = {};
  if (remote.token) headers.authorization = `Bearer ${remote.token}`;
  let res: Response;
  try {
    res = await fetch(remote.url + path, { headers });
  } catch (error) {
    throw new Error(`cannot reach ${remote.url}: ${(error as Error).message}`);
  }
  const text = await res.text();
  if (!res.ok) {
    let body: ApiCallError['body'];
    try { body = JSON.parse(text) as ApiCallError['body']; } catch { body = { error: { message: text.slice(0, 200) } } as ApiCallError['body']; }
    throw new ApiCallError(res.status, body);
  }
  return text;
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
