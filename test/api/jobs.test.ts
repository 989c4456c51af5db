/**
 * Submitting, resubmitting with an idempotency key, and cancelling jobs that wait (no worker running, so
 * the jobs stay queued). Real Redis, real SQLite archive. Idempotency-Key semantics: IETF draft
 * "The Idempotency-Key HTTP Header Field" (same key + same request → the first result; same key + other
 * request → 409 Conflict is common practice there).
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, type TestService } from '../harness/service.ts';
import { schemaValidProblem, submission } from '../queue/fixtures.ts';

let svc: TestService;

beforeAll(async () => { svc = await startService(); });
afterAll(async () => { await svc?.close(); });

const post = (body: unknown, token = svc.tokens.submitter, headers: Record<string, string> = {}) =>
  svc.request('POST', '/v1/jobs', { token, body, headers });

describe('job submission', () => {
  describe('when a valid job is submitted', () => {
    it('should answer 202 with the job id, a Location header and a waiting status', async () => {
      const res = await post(submission(schemaValidProblem()));
      expect(res.status).toBe(202);
      expect(res.body.jobId).toMatch(/^j-[0-9a-f-]{36}$/);
      expect(res.headers.get('location')).toBe(`/v1/jobs/${res.body.jobId}`);
      const status = await svc.request('GET', res.body.statusUrl, { token: svc.tokens.reviewer });
      expect(status.status).toBe(200);
      expect(status.body).toEqual(expect.objectContaining({
        id: res.body.jobId, state: 'waiting', submittedBy: 'alice', priority: 'routine', spacecraftName: 'TESTSAT-1',
      }));
      expect(status.body.problemHash).toMatch(/^[0-9a-f]{64}$/);
    });
  });
});

describe('idempotent resubmission', () => {
  describe('when the same key and the same request come again', () => {
    it('should answer 200 with the same job id and create no second job', async () => {
      const body = submission(schemaValidProblem(), { idempotencyKey: 'ops-2031-03-01-tcm1' });
      const first = await post(body);
      const again = await post(body);
      expect(first.status).toBe(202);
      expect(again.status).toBe(200);
      expect(again.body).toEqual(expect.objectContaining({ jobId: first.body.jobId, outcome: 'existing' }));
      const jobs = await svc.request('GET', '/v1/jobs?limit=200', { token: svc.tokens.reviewer });
      expect(jobs.body.jobs.filter((j: { id: string }) => j.id === first.body.jobId)).toHaveLength(1);
    });
  });

  describe('when the key comes in the Idempotency-Key header', () => {
    it('should behave like the body field', async () => {
      const body = submission(schemaValidProblem());
      const first = await post(body, svc.tokens.submitter, { 'Idempotency-Key': 'hdr-key-000001' });
      const again = await post(body, svc.tokens.submitter, { 'Idempotency-Key': 'hdr-key-000001' });
      expect([first.status, again.status]).toEqual([202, 200]);
      expect(again.body.jobId).toBe(first.body.jobId);
    });
  });

  describe('when a Δv budget comes with the Idempotency-Key header', () => {
    it('should behave like the body field there too (same key and request → the first job; other request → 409)', async () => {
      const budget = JSON.parse(readFileSync('examples/flyby-budget-demo.json', 'utf8')) as Record<string, unknown>;
      const postBudget = (request: unknown) => svc.request('POST', '/v1/budgets', { token: svc.tokens.submitter, body: { request, reason: 'service test: budget resubmitted with a header key' }, headers: { 'Idempotency-Key': 'budget-hdr-0001' } });
      const first = await postBudget(budget);
      const again = await postBudget(budget);
      const other = await postBudget({ ...budget, seed: 12345 });
      expect([first.status, again.status, other.status]).toEqual([202, 200, 409]);
      expect(again.body.jobId).toBe(first.body.jobId);
    });
  });

  describe('when the same key comes with a different request', () => {
    it('should answer 409', async () => {
      const first = await post(submission(schemaValidProblem(), { idempotencyKey: 'reuse-key-0001' }));
      const other = schemaValidProblem();
      other.spacecraft.massKg = 501;
      const res = await post(submission(other, { idempotencyKey: 'reuse-key-0001' }));
      expect(first.status).toBe(202);
      expect(res.status).toBe(409);
      expect(res.body.error.code).toBe('IDEMPOTENCY_CONFLICT');
    });
  });

  describe('when another submitter uses the same key', () => {
    it('should create a separate job (keys are per submitter)', async () => {
      const body = submission(schemaValidProblem(), { idempotencyKey: 'shared-key-0001' });
      const a = await post(body, svc.tokens.submitter);
      const b = await post(body, svc.tokens.submitter2);
      expect([a.status, b.status]).toEqual([202, 202]);
      expect(a.body.jobId).not.toBe(b.body.jobId);
    });
  });

  describe('when the key of a job cancelled before it ran comes again', () => {
    it('should answer 200 for the same request and 409 for a different one', async () => {
      const body = submission(schemaValidProblem(), { idempotencyKey: 'cancelled-key-0001' });
      const first = await post(body);
      expect(first.status).toBe(202);
      const cancel = await svc.request('POST', `/v1/jobs/${first.body.jobId}/cancel`, { token: svc.tokens.submitter, body: { reason: 'superseded' } });
      expect(cancel.status).toBe(200);
      const same = await post(body);
      expect(same.status).toBe(200);
      expect(same.body).toEqual(expect.objectContaining({ jobId: first.body.jobId, outcome: 'existing' }));
      const other = schemaValidProblem();
      other.spacecraft.massKg = 502;
      const different = await post(submission(other, { idempotencyKey: 'cancelled-key-0001' }));
      expect(different.status).toBe(409);
      expect(different.body.error.code).toBe('IDEMPOTENCY_CONFLICT');
    });
  });

  describe('when ten identical first submissions race', () => {
    it('should yield one job: one 202 and nine 200', async () => {
      const body = submission(schemaValidProblem(), { idempotencyKey: 'race-key-0001' });
      const results = await Promise.all(Array.from({ length: 10 }, () => post(body)));
      const ids = new Set(results.map((r) => r.body.jobId));
      expect(ids.size).toBe(1);
      expect(results.map((r) => r.status).sort()).toEqual([200, 200, 200, 200, 200, 200, 200, 200, 200, 202]);
    });
  });
});

describe('cancelling a waiting job', () => {
  describe('when its submitter cancels it before any worker took it', () => {
    it('should answer 200, report state cancelled and record the cancellation in the archive', async () => {
      const { body } = await post(submission(schemaValidProblem()));
      const res = await svc.request('POST', `/v1/jobs/${body.jobId}/cancel`, { token: svc.tokens.submitter, body: { reason: 'superseded by new OD' } });
      expect(res.status).toBe(200);
      expect(res.body.state).toBe('cancelled');
      const status = await svc.request('GET', `/v1/jobs/${body.jobId}`, { token: svc.tokens.reviewer });
      expect(status.body.state).toBe('cancelled');
      expect(status.body.error.name).toBe('CancelledError');
      expect((await svc.archive!.getJob(body.jobId))?.state).toBe('cancelled');
      const again = await svc.request('POST', `/v1/jobs/${body.jobId}/cancel`, { token: svc.tokens.submitter, body: {} });
      expect(again.status).toBe(409);
    });
  });

  describe('when someone else tries to cancel it', () => {
    it('should answer 403 to another submitter and 200 to an admin', async () => {
      const { body } = await post(submission(schemaValidProblem()));
      const other = await svc.request('POST', `/v1/jobs/${body.jobId}/cancel`, { token: svc.tokens.submitter2, body: {} });
      expect(other.status).toBe(403);
      const admin = await svc.request('POST', `/v1/jobs/${body.jobId}/cancel`, { token: svc.tokens.admin, body: {} });
      expect(admin.status).toBe(200);
    });
  });
});
