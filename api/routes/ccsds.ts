/**
 * CCSDS Orbit Data Messages over HTTP: read an OPM into the problem's initial state, and export a plan
 * as an OPM (initial state + maneuvers) or an OEM (predicted trajectory at a chosen step). The format
 * work is in ccsds/; here only lookup, validation and the HTTP shape.
 */
import type { Request, Response } from 'express';
import * as z from 'zod';
import {
  assertExportable, CcsdsExportThreads, CcsdsFormatError, exportPlanAsCcsds, ExportTimeLimitError, readOpmAsInitialState,
  SUPPORTED_TIME_SYSTEMS, type ThreadExportOptions,
} from '../../ccsds/index.ts';
import { ephemerisSetFiles, jobRequestSchema } from '../../queue/index.ts';
import type { AppDeps } from '../deps.ts';
import { type FieldIssue, sendError } from '../errors.ts';
import type { ApiRoutes } from '../route-table.ts';
import { planParamsSchema, REVIEW_NOTICE } from '../../contract/http-schemas.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import { validOf } from '../validate.ts';

const READERS = ['submitter', 'reviewer', 'auditor'] as const;

const opmBodySchema = z.object({
  /** The OPM text, KVN or XML. */
  opm: z.string().min(20).max(200_000),
}).strict();

const exportParamsSchema = planParamsSchema.extend({ kind: z.enum(['opm', 'oem']) });
const exportQuerySchema = z.object({
  encoding: z.enum(['kvn', 'xml']).default('kvn'),
  /** Seconds between OEM lines (required for oem). */
  stepS: z.coerce.number().positive().max(1e7).optional(),
  timeSystem: z.enum(SUPPORTED_TIME_SYSTEMS as ['UTC', 'TAI', 'TT', 'TDB']).default('TDB'),
  maneuverFrame: z.enum(['RTN', 'TNW', 'inertial']).default('RTN'),
  objectId: z.string().min(1).max(40).regex(/^[A-Za-z0-9 ._-]+$/).optional(),
}).strict();

/** An issue of a malformed message: the body path as in every other 400 (`body.opm`), plus the message's
 * keyword and 1-based line (left out when the problem is the end of the text). */
export interface CcsdsFieldIssue extends FieldIssue { keyword?: string; line?: number }

/** Where an export error points: a query option by its name, anything about the stored plan or problem at
 * the plan id. */
function exportIssuePath(field: string): string {
  return field in exportQuerySchema.shape ? `query.${field}` : 'params.planId';
}

/**
 * Sends an InvalidInputError / OutOfSpanError as 400: a CcsdsFormatError with `body.<bodyField>` as the
 * path and its keyword and line as their own fields; any other with the path `pathOf(field)`.
 */
function sendInputError(res: Response, error: unknown, pathOf: (field: string) => string, bodyField?: string): boolean {
  if (!(error instanceof Error) || (error.name !== 'InvalidInputError' && error.name !== 'OutOfSpanError')) return false;
  const field = (error as { field?: string }).field ?? 'input';
  const code = (error as { code?: string }).code ?? 'INVALID_INPUT';
  const issue: CcsdsFieldIssue = error instanceof CcsdsFormatError && bodyField !== undefined
    ? { path: `body.${bodyField}`, message: error.message, code, keyword: field, ...(error.line > 0 ? { line: error.line } : {}) }
    : { path: pathOf(field), message: error.message, code };
  sendError(res, 400, code, error.message, [issue]);
  return true;
}

/** The problem a plan was made from: the archive's job-submitted entry, or the finished job's data. */
async function problemOf(deps: AppDeps, planId: string): Promise<PlanningProblem | undefined> {
  let raw: unknown;
  if (deps.archive) {
    const entries = await deps.archive.history(planId);
    raw = entries.find((e) => e.kind === 'job-submitted')?.payload.problem;
  } else {
    raw = (await deps.queue.findJob(planId))?.data.problem;
  }
  const parsed = jobRequestSchema.shape.problem.safeParse(raw);
  return parsed.success ? parsed.data : undefined;
}

/**
 * `exportThreads`: where OEM exports run (propagation with the STM and up to 200,000 rendered lines), off
 * the HTTP event loop; by default two at a time, two minutes each at most.
 */
export function ccsdsRoutes(routes: ApiRoutes, deps: AppDeps, exportThreads = new CcsdsExportThreads()): void {
  routes.add({
    method: 'post', path: '/v1/ccsds/opm/initial-state', tags: ['ccsds'], roles: ['submitter'],
    summary: 'Read a CCSDS OPM (KVN or XML) into the problem\'s initialState',
    description: 'Strict reading of CCSDS 502.0-B: required keywords, units, time systems UTC/TAI/TT/TDB, frames '
      + 'EME2000/ICRF/GCRF (the standard\'s frame table has no J2000 ecliptic frame, so an ecliptic frame name is refused), '
      + 'centres the propagator knows. A malformed file answers 400 naming the keyword and line.',
    body: opmBodySchema,
    responses: {
      200: { description: 'The initial state (with covariance when the OPM has one), mass, notes' },
      400: { description: 'Malformed or unsupported OPM: the issue has path `body.opm`, the `keyword` and the `line`' },
    },
  }, (_req: Request, res: Response) => {
    const { opm } = validOf<unknown, unknown, z.infer<typeof opmBodySchema>>(res).body;
    try {
      const { initialState, massKg, notes } = readOpmAsInitialState(opm);
      res.json({ initialState, ...(massKg !== undefined ? { massKg } : {}), notes });
    } catch (error) {
      if (!sendInputError(res, error, () => 'body.opm', 'opm')) throw error;
    }
  });

  routes.add({
    method: 'get', path: '/v1/plans/:planId/ccsds/:kind', tags: ['ccsds'], roles: [...READERS],
    summary: 'Export a converged, cross-checked plan as a CCSDS OPM (maneuvers) or OEM (predicted trajectory)',
    description: 'OPM: the initial state, covariance, mass and one maneuver block per burn. OEM: the trajectory propagated '
      + 'with the plan\'s burns, one segment per arc, every `stepS` seconds. Both carry the review statement. '
      + `${REVIEW_NOTICE}`,
    params: exportParamsSchema,
    query: exportQuerySchema,
    responses: {
      200: { description: 'The message text', contentType: 'text/plain' },
      400: { description: 'Bad options, or a plan that did not converge or failed its cross-check' },
      404: { description: 'No such plan, or its problem is not on record' },
      503: { description: 'The OEM export did not finish within the time limit (choose a larger step)' },
    },
  }, async (req: Request, res: Response) => {
    const { params, query } = validOf<z.infer<typeof exportParamsSchema>, z.infer<typeof exportQuerySchema>, unknown>(res);
    const found = await deps.plans.get(params.planId);
    if (!found) { sendError(res, 404, 'PLAN_NOT_FOUND', `no plan ${params.planId}`); return; }
    // Before any lookup or propagation: an unconverged or unconfirmed result never leaves as a plan.
    try {
      assertExportable(found.plan);
    } catch (error) {
      if (!sendInputError(res, error, exportIssuePath)) throw error;
      return;
    }
    const problem = await problemOf(deps, params.planId);
    if (!problem) { sendError(res, 404, 'PROBLEM_NOT_FOUND', `the problem of plan ${params.planId} is not on record`); return; }
    if (params.kind === 'oem' && query.stepS === undefined) {
      sendError(res, 400, 'INVALID_INPUT', 'stepS: an OEM export needs the step between lines, s', [{ path: 'query.stepS', message: 'required for oem' }]);
      return;
    }
    const controller = new AbortController();
    req.on('close', () => { if (!res.writableEnded) controller.abort(); });
    try {
      const { plan } = found;
      const options: ThreadExportOptions = {
        kind: params.kind, encoding: query.encoding, creationDateUtc: new Date().toISOString().slice(0, 19),
        timeSystem: query.timeSystem, maneuverFrame: query.maneuverFrame,
        ...(query.stepS !== undefined ? { stepS: query.stepS } : {}),
        ...(query.objectId ? { objectId: query.objectId } : {}),
      };
      // The OPM is a few lines from the plan as it is; the OEM propagates, so it runs in a thread — on the
      // files of the problem's ephemeris set, checked there against the plan's record.
      const text = params.kind === 'opm' ? await exportPlanAsCcsds(problem, plan, options)
        : await exportThreads.run(problem, plan, options, controller.signal, ephemerisSetFiles(deps.ephemerisSets, problem.forceModel.ephemerisSet));
      const extension = query.encoding === 'xml' ? 'xml' : params.kind;
      res.set('Content-Disposition', `attachment; filename="${params.planId}.${extension}"`);
      res.type(query.encoding === 'xml' ? 'application/xml' : 'text/plain').send(text);
    } catch (error) {
      if (error instanceof Error && error.name === 'CancelledError') return;
      if (error instanceof ExportTimeLimitError) { sendError(res, 503, error.code, error.message); return; }
      if (!sendInputError(res, error, exportIssuePath)) throw error;
    }
  });
}
