/**
 * Unknown job ids answer 404 whatever their spelling, including the names of the queue's own Redis keys
 * (BullMQ keeps `<prefix>:retarget:id`, `:events`, `:completed`, ... beside the job hashes). Real Redis.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, type TestService } from '../harness/service.ts';
import { schemaValidProblem, submission } from '../queue/fixtures.ts';

let svc: TestService;

beforeAll(async () => {
  svc = await startService();
  // One real job, so the queue's own keys (id counter, events stream, wait list ...) exist in Redis.
  expect((await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(schemaValidProblem()) })).status).toBe(202);
});
afterAll(async () => { await svc?.close(); });

const QUEUE_KEY_NAMES = [
  'id', 'events', 'completed', 'failed', 'stalled-check', 'stalled', 'meta', 'wait', 'paused', 'active', 'prioritized',
  'delayed', 'marker', 'pc', 'de', 'limiter', 'repeat', 'metrics',
];
const OTHER_SPELLINGS = [
  'j-00000000-0000-4000-8000-000000000000', `k-${'0'.repeat(40)}`, 'j-00000000-0000-4000-8000-000000000000-mc-0', 'J-ABC', '1', 'a.b:c',
];

describe('unknown job ids', () => {
  describe('when the id is one of the queue\'s own key names or any other unknown spelling', () => {
    it.each([...QUEUE_KEY_NAMES, ...OTHER_SPELLINGS])('should answer 404 to status, cancel and events for %s', async (id) => {
      const status = await svc.request('GET', `/v1/jobs/${encodeURIComponent(id)}`, { token: svc.tokens.auditor });
      expect(status.status, status.text).toBe(404);
      expect(status.body.error.code).toBe('JOB_NOT_FOUND');
      const cancel = await svc.request('POST', `/v1/jobs/${encodeURIComponent(id)}/cancel`, { token: svc.tokens.admin, body: {} });
      expect(cancel.status, cancel.text).toBe(404);
      const events = await svc.request('GET', `/v1/jobs/${encodeURIComponent(id)}/events`, { token: svc.tokens.auditor });
      expect(events.status, events.text).toBe(404);
    });
  });
});
