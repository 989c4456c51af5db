/**
 * `veer watch` when the server goes away mid-watch: the job's state is unknown, not failed — exit 5 (this
 * CLI's own contract, cli/commands/job-outcome.ts), naming the job and how to resume, and the job is still
 * there afterwards. Real Redis and API (test/harness/service.ts); the API's HTTP server is closed under the
 * watcher, while Redis and its queue connection stay.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JOB_EXIT } from '../../cli/commands/job-outcome.ts';
import { runVeer } from '../harness/run-cli.ts';
import { startService, type TestService } from '../harness/service.ts';
import { schemaValidProblem, submission } from '../queue/fixtures.ts';

let svc: TestService;
beforeAll(async () => { svc = await startService(); });
afterAll(async () => { await svc?.close(); });

describe('veer watch', () => {
  describe('when contact with the server is lost while the job waits', () => {
    it('should exit 5 (state unknown), name the job and say how to resume; the job is unharmed', async () => {
      const submitted = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(schemaValidProblem()) });
      const jobId = submitted.body.jobId as string;
      let cut = false;
      const run = await runVeer(['watch', jobId, '--url', svc.url, '--token', svc.tokens.submitter], (text) => {
        if (!cut && text.includes(`job ${jobId} waiting`)) {
          cut = true;
          svc.api.server.closeAllConnections();
          svc.api.server.close();
        }
      });
      expect(cut).toBe(true);
      expect(run.code, run.err).toBe(JOB_EXIT.lostContact);
      expect(run.code).not.toBe(JOB_EXIT.failed);
      expect(run.err).toContain(`following job ${jobId}`);
      expect(run.err).toMatch(/state is UNKNOWN/);
      expect(run.err).toContain(`veer watch ${jobId}`);
      // The job is still waiting in Redis: a resubmission would have duplicated it.
      expect((await svc.api.deps.queue.status(jobId))?.state).toBe('waiting');
    }, 60_000);
  });
});
