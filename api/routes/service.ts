/** Liveness, readiness (Redis answers, a worker is connected), Prometheus metrics, the OpenAPI document. */
import * as z from 'zod';
import { leapSecondsExpired, QUEUE_RETRY_AFTER_S } from '../../queue/index.ts';
import type { AppDeps } from '../deps.ts';
import { buildOpenApi } from '../openapi.ts';
import type { ApiRoutes } from '../route-table.ts';
import { healthSchema, readySchema } from '../../contract/http-schemas.ts';

export function serviceRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'get', path: '/health', tags: ['service'], summary: 'Liveness: the process answers',
    responses: { 200: { description: 'Alive', schema: healthSchema } },
  }, (_req, res) => { res.json({ status: 'ok' }); });

  routes.add({
    method: 'get', path: '/ready', tags: ['service'], summary: 'Readiness: Redis reachable and at least one worker seen (with the leap-second table in use and its expiry)',
    responses: { 200: { description: 'Ready', schema: readySchema }, 503: { description: 'Not ready', schema: readySchema } },
  }, async (_req, res) => {
    let redis: z.infer<typeof readySchema>['redis'];
    let workers = 0;
    try {
      const latencyMs = await withTimeout(deps.queue.ping(), 2_000);
      redis = { ok: true, latencyMs: Math.round(latencyMs * 100) / 100 };
      workers = await withTimeout(deps.queue.workerCount(), 2_000);
    } catch (e) {
      redis = { ok: false, latencyMs: null, error: e instanceof Error ? e.message : 'unreachable' };
    }
    const table = deps.queue.leapSeconds;
    const leapSeconds = {
      source: table.origin, path: table.path, sha256: table.sha256, expiresUtc: table.expiresUtc,
      expired: leapSecondsExpired(table, new Date()),
    };
    const body = { ready: redis.ok && workers > 0, redis, workers: { ok: workers > 0, count: workers }, leapSeconds };
    if (!body.ready) res.set('Retry-After', String(QUEUE_RETRY_AFTER_S));
    res.status(body.ready ? 200 : 503).json(body);
  });

  routes.add({
    method: 'get', path: '/metrics', tags: ['service'], summary: 'Prometheus metrics',
    responses: { 200: { description: 'Prometheus text exposition', schema: z.string(), contentType: 'text/plain' } },
  }, async (_req, res) => {
    const text = await deps.metrics.registry.metrics();
    res.type(deps.metrics.registry.contentType).send(text);
  });

  routes.add({
    method: 'get', path: '/openapi.json', tags: ['service'], summary: 'This API as an OpenAPI 3.1 document',
    responses: { 200: { description: 'OpenAPI 3.1 document', schema: z.record(z.string(), z.unknown()) } },
  }, (_req, res) => {
    res.json(buildOpenApi(routes.specs, {
      title: 'veer API', version: deps.version,
      description: 'Retargeting jobs and proposed maneuver plans. Every plan is a proposal that qualified flight-dynamics '
        + 'staff must review and approve, and verify independently, under the mission\'s own procedures.',
    }));
  });
}

function withTimeout<T>(p: Promise<T>, ms: number): Promise<T> {
  return Promise.race([p, new Promise<T>((_, reject) => setTimeout(() => reject(new Error(`no answer within ${ms} ms`)), ms).unref())]);
}
