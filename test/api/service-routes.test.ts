/**
 * Health, readiness, Prometheus metrics and the OpenAPI document.
 * OpenAPI checks follow the OpenAPI Specification 3.1.0 (OAS §4.8: required `openapi`, `info.title`,
 * `info.version`; path templating: every `{name}` in a path has a required `in: path` parameter; JSON Schema
 * dialect draft 2020-12). Metrics text follows the Prometheus exposition format (# HELP / # TYPE lines).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, type TestService } from '../harness/service.ts';
import { schemaValidProblem, submission } from '../queue/fixtures.ts';

let svc: TestService;

beforeAll(async () => { svc = await startService({ planSink: 'job-result' }); });
afterAll(async () => { await svc?.close(); });

describe('readiness', () => {
  describe('when Redis answers but no worker is connected', () => {
    it('should answer 503 with workers.count 0', async () => {
      const res = await svc.request('GET', '/ready');
      expect(res.status).toBe(503);
      expect(res.body.redis.ok).toBe(true);
      expect(res.body.workers.count).toBe(0);
    });
  });
  describe('when a worker is connected', () => {
    it('should answer 200', async () => {
      const worker = await svc.startWorkerInProcess();
      const res = await svc.request('GET', '/ready');
      expect(res.status).toBe(200);
      expect(res.body.workers.count).toBeGreaterThanOrEqual(1);
      await worker.close();
    });
  });
  describe('when asked for liveness', () => {
    it('should answer 200 ok', async () => {
      expect((await svc.request('GET', '/health')).body).toEqual({ status: 'ok' });
    });
  });
});

describe('metrics', () => {
  describe('when jobs wait in the queue', () => {
    it('should expose jobs by state, queue depth, worker count and the duration histogram', async () => {
      await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(schemaValidProblem()) });
      const res = await svc.request('GET', '/metrics');
      expect(res.status).toBe(200);
      expect(res.headers.get('content-type')).toMatch(/text\/plain/);
      expect(res.text).toMatch(/^# TYPE veer_jobs gauge$/m);
      expect(res.text).toMatch(/^veer_jobs\{state="waiting"\} [1-9]\d*$/m);
      expect(res.text).toMatch(/^veer_queue_depth [1-9]\d*$/m);
      expect(res.text).toMatch(/^veer_workers \d+$/m);
      expect(res.text).toMatch(/^# TYPE veer_job_duration_seconds histogram$/m);
      expect(res.text).toMatch(/^veer_job_submissions_total\{kind="retarget",outcome="created"\} [1-9]/m);
    });
  });
});

describe('OpenAPI document', () => {
  describe('when fetched', () => {
    it('should be OpenAPI 3.1 with info, paths and bearer security', async () => {
      const res = await svc.request('GET', '/openapi.json');
      expect(res.status).toBe(200);
      const doc = res.body;
      expect(doc.openapi).toMatch(/^3\.1\.\d+$/);
      expect(typeof doc.info.title).toBe('string');
      expect(typeof doc.info.version).toBe('string');
      expect(doc.jsonSchemaDialect).toBe('https://json-schema.org/draft/2020-12/schema');
      expect(doc.components.securitySchemes.bearerAuth).toEqual(expect.objectContaining({ type: 'http', scheme: 'bearer' }));
      expect(Object.keys(doc.paths)).toEqual(expect.arrayContaining([
        '/v1/jobs', '/v1/jobs/{jobId}', '/v1/jobs/{jobId}/events', '/v1/jobs/{jobId}/cancel', '/v1/plans', '/v1/plans/{planId}',
        '/health', '/ready', '/metrics',
      ]));
    });

    it('should declare every path template variable as a required path parameter', async () => {
      const doc = (await svc.request('GET', '/openapi.json')).body;
      for (const [path, item] of Object.entries<Record<string, any>>(doc.paths)) {
        const names = [...path.matchAll(/\{([^}]+)\}/g)].map((m) => m[1]);
        for (const op of Object.values<any>(item)) {
          for (const name of names) {
            expect(op.parameters, `${path} ${name}`).toEqual(expect.arrayContaining([expect.objectContaining({ name, in: 'path', required: true })]));
          }
        }
      }
    });

    it('should carry the planner problem schema in the submission body, generated from zod', async () => {
      const doc = (await svc.request('GET', '/openapi.json')).body;
      const body = doc.paths['/v1/jobs'].post.requestBody.content['application/json'].schema;
      expect(body.required).toEqual(expect.arrayContaining(['problem', 'reason']));
      const problem = body.properties.problem;
      expect(problem.properties.spacecraft.properties.massKg.type).toBe('number');
      expect(problem.properties.burns.minItems).toBe(1);
      expect(problem.required).toEqual(expect.arrayContaining(['spacecraft', 'initialState', 'burns', 'targets']));
      // Input side: fields with defaults are optional for the client.
      expect(problem.required).not.toContain('dispersion');
      expect(doc.paths['/v1/jobs'].post.responses).toEqual(expect.objectContaining({ 202: expect.anything(), 400: expect.anything(), 409: expect.anything(), 413: expect.anything() }));
    });
  });
});
