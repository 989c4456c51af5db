/**
 * Admission control at the door: with small limits (QUEUE_LIMIT_ROUTINE 3, QUEUE_LIMIT_PER_SUBMITTER 2) and no
 * worker, a submitter past their limit gets 429 and the routine queue past its depth gets 503, both with
 * Retry-After and the numbers; urgent work has its own limit; a finished job no longer counts against its
 * submitter. Status codes: RFC 6585 §4 (429) and RFC 9110 §15.6.4 (503), Retry-After RFC 9110 §10.2.3.
 * Real Redis (test/harness/service.ts).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, type TestService } from '../harness/service.ts';
import { schemaValidProblem, submission } from '../queue/fixtures.ts';

let svc: TestService;
beforeAll(async () => {
  svc = await startService({ apiEnv: { QUEUE_LIMIT_ROUTINE: '3', QUEUE_LIMIT_URGENT: '5', QUEUE_LIMIT_PER_SUBMITTER: '2', QUEUE_FULL_RETRY_AFTER_S: '7' } });
});
afterAll(async () => { await svc?.close(); });

const submit = (token: string, priority = 'routine') =>
  svc.request('POST', '/v1/jobs', { token, body: submission(schemaValidProblem(), { priority }) });

describe('admission control', () => {
  describe('when a submitter reaches their limit of unfinished jobs', () => {
    it('should answer 429 with Retry-After and the numbers, and count a cancelled job no more', async () => {
      const first = await submit(svc.tokens.submitter);
      expect((await submit(svc.tokens.submitter)).status).toBe(202);
      const refused = await submit(svc.tokens.submitter);
      expect(refused.status).toBe(429);
      expect(refused.headers.get('retry-after')).toBe('7');
      expect(refused.body.error).toMatchObject({ code: 'SUBMITTER_QUEUE_FULL', unfinished: 2, limit: 2, retryAfterS: 7 });
      // A cancelled (removed) job is finished: the submitter may submit again.
      expect((await svc.request('POST', `/v1/jobs/${first.body.jobId}/cancel`, { token: svc.tokens.submitter, body: {} })).status).toBe(200);
      expect((await submit(svc.tokens.submitter)).status).toBe(202);
    });
  });

  describe('when the routine queue reaches its depth limit', () => {
    it('should answer 503 with Retry-After and the numbers, while urgent work still gets in', async () => {
      expect((await submit(svc.tokens.submitter2)).status).toBe(202); // the 3rd routine job waiting
      const refused = await submit(svc.tokens.submitter2);
      expect(refused.status).toBe(503);
      expect(refused.headers.get('retry-after')).toBe('7');
      expect(refused.body.error).toMatchObject({ code: 'QUEUE_FULL', priority: 'routine', waiting: 3, limit: 3 });
      expect((await submit(svc.tokens.submitter2, 'urgent')).status).toBe(202);
    });
  });
});
