/**
 * The progress stream ends even when its final event is lost: each heartbeat re-reads the job's state.
 * The event listener is shut down mid-stream (as if it missed events during a Redis reconnect); the stream
 * must still end with the final status once the job completes.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readEventStream, startService, waitForJob, type SseEvent, type TestService } from '../harness/service.ts';
import { reachableProblem, submission } from '../queue/fixtures.ts';

let svc: TestService;

beforeAll(async () => { svc = await startService({ apiEnv: { SSE_HEARTBEAT_S: '1' } }); });
afterAll(async () => { await svc?.close(); });

describe('progress stream', () => {
  describe('when the final event never reaches the API', () => {
    it('should still end with the final status at a heartbeat', async () => {
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(reachableProblem({ samples: 0, name: 'MISSEDSAT' })) });
      expect(res.status).toBe(202);
      const jobId = res.body.jobId as string;
      let opened!: () => void;
      const firstEvent = new Promise<void>((r) => { opened = r; });
      const stream = readEventStream(`${svc.url}/v1/jobs/${jobId}/events`, svc.tokens.submitter, 60_000, (e: SseEvent) => {
        if (e.event === 'status') opened();
      });
      await firstEvent;
      // No more queue events reach this API process from here on.
      await svc.api.deps.events.close();
      const worker = await svc.startWorkerInProcess({ concurrency: 1 });
      const done = await waitForJob(svc, jobId, (s) => s.state === 'completed' || s.state === 'failed', 90_000);
      expect(done.state).toBe('completed');
      const { events } = await stream;
      expect(events.at(-1)?.event).toBe('end');
      expect(events.at(-1)?.data.state).toBe('completed');
      await worker.close();
    }, 150_000);
  });
});
