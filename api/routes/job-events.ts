/**
 * Live progress of a job as server-sent events: `status` (the full status, first and on every state
 * change), `progress` (stage, fraction, iteration, samples), then `end` (final status) and the stream closes.
 * A comment line every SSE_HEARTBEAT_S keeps proxies from closing an idle stream; at each one the job's
 * state is read again, so the stream ends even when the final event was missed (Redis reconnect).
 */
import type { Response } from 'express';
import * as z from 'zod';
import type { AnyJobStatus, JobEvent } from '../../queue/index.ts';
import type { AppDeps } from '../deps.ts';
import { sendError } from '../errors.ts';
import type { ApiRoutes } from '../route-table.ts';
import { FINAL_JOB_STATES } from '../../contract/job-types.ts';
import { jobParamsSchema } from '../../contract/http-schemas.ts';
import { validOf } from '../validate.ts';

function write(res: Response, event: string, data: unknown): void {
  res.write(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
}

export function jobEventRoutes(routes: ApiRoutes, deps: AppDeps): void {
  eventStreamRoute(routes, deps, { path: '/v1/jobs/:jobId/events', tag: 'jobs', kind: 'retargeting', statusOf: (id) => deps.queue.status(id) });
  eventStreamRoute(routes, deps, { path: '/v1/budgets/:jobId/events', tag: 'budgets', kind: 'Δv budget', statusOf: (id) => deps.queue.budgetStatus(id) });
}

/** The progress stream of one job kind: `statusOf` reads a job of that kind (undefined for any other). */
function eventStreamRoute(routes: ApiRoutes, deps: AppDeps, door: {
  path: string; tag: string; kind: string; statusOf: (jobId: string) => Promise<AnyJobStatus | undefined>;
}): void {
  routes.add({
    method: 'get', path: door.path, tags: [door.tag], roles: ['submitter', 'reviewer', 'auditor'],
    summary: `Live progress stream of a ${door.kind} job (server-sent events)`,
    description: 'Events: `status` (the job status JSON), `progress` (JobProgress JSON: stages of this job kind), `end` (final status); then the stream closes.',
    params: jobParamsSchema,
    responses: {
      200: { description: 'text/event-stream of status, progress and end events', schema: z.string(), contentType: 'text/event-stream' },
      404: { description: `No such ${door.kind} job` },
    },
  }, async (req, res) => {
    const { jobId } = validOf<z.infer<typeof jobParamsSchema>, unknown, unknown>(res).params;
    const first = await door.statusOf(jobId);
    if (!first) { sendError(res, 404, 'JOB_NOT_FOUND', `no job ${jobId}`); return; }
    res.status(200).set({
      'Content-Type': 'text/event-stream; charset=utf-8', 'Cache-Control': 'no-cache, no-transform',
      Connection: 'keep-alive', 'X-Accel-Buffering': 'no',
    });
    res.flushHeaders();
    res.write('retry: 2000\n\n');
    let closed = false;
    let lastState = first.state;
    const cleanups: (() => void)[] = [];
    const close = (): void => {
      if (closed) return;
      closed = true;
      for (const c of cleanups) c();
      res.end();
    };
    const refresh = async (): Promise<AnyJobStatus | undefined> => {
      const s = await door.statusOf(jobId);
      if (closed) return s;
      if (!s) { close(); return s; } // expired or removed meanwhile: nothing more will come
      if (FINAL_JOB_STATES.has(s.state)) { write(res, 'end', s); close(); return s; }
      if (s.state !== lastState) { lastState = s.state; write(res, 'status', s); }
      if (s.state === 'waiting-children' && s.progress) write(res, 'progress', s.progress);
      return s;
    };
    write(res, 'status', first);
    if (FINAL_JOB_STATES.has(first.state)) { write(res, 'end', first); close(); return; }
    const onEvent = (e: JobEvent): void => {
      if (closed) return;
      if (e.type === 'progress') { write(res, 'progress', e.data); return; }
      void refresh().catch((err: unknown) => deps.logger.warn({ err, jobId }, 'progress stream refresh failed'));
    };
    cleanups.push(deps.events.subscribe(jobId, onEvent));
    // Sample batches of a fanned-out run report on their parent's stream.
    const childPrefix = `${jobId}-mc-`;
    cleanups.push(deps.events.subscribe('*', (e) => {
      if (e.type === 'completed' && e.jobId.startsWith(childPrefix)) onEvent({ type: 'waiting-children', jobId });
    }));
    // Each heartbeat also re-reads the job: an end event missed while the event listener reconnected to
    // Redis would otherwise leave the stream open for ever.
    const heartbeat = setInterval(() => {
      if (closed) return;
      res.write(': keep-alive\n\n');
      void refresh().catch((err: unknown) => deps.logger.warn({ err, jobId }, 'progress stream refresh failed'));
    }, deps.limits.sseHeartbeatMs);
    cleanups.push(() => clearInterval(heartbeat));
    res.on('close', close);
    // The job may have moved on between the first read and the subscription.
    await refresh();
  });
}
