/**
 * Nothing lost: (1) a worker process killed with SIGKILL in the middle of a job — another worker takes the
 * job over after its lock expires (BullMQ stalled-job check) and the archive holds exactly one plan for it;
 * (2) Redis stopped and restarted (append-only file on) while jobs wait — every job is still there and runs;
 * (3) the same after Redis is killed with SIGKILL (a crash: `appendfsync always`, as in docker-compose.yml,
 * so every job the API acknowledged with 202 is on disk).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startRedis, type TestRedis } from '../harness/redis.ts';
import { startService, waitForJob, type TestService } from '../harness/service.ts';
import { reachableProblem, submission } from './fixtures.ts';

let svc: TestService;
let redis: TestRedis;

// A Redis of the file's own even when REDIS_URL names one: the tests below restart and crash it.
beforeAll(async () => { redis = await startRedis({ own: true }); svc = await startService({ redis }); });
afterAll(async () => { await svc?.close(); await redis?.stop(); });

// A dead worker's job is taken over about 5 s after its last lock renewal; the 5 s lock leaves the live worker
// 2.5 s of slack for its renewals on a loaded machine. The fan-out threshold is out of reach so the whole
// Monte Carlo run stays inside the one job (a fanned-out parent is active only for a few milliseconds).
const FAST_STALL = {
  LOCK_DURATION_MS: '5000', STALLED_INTERVAL_MS: '1000', WORKER_CONCURRENCY: '1', MC_FANOUT_MIN_SAMPLES: '1000000',
};

/** True for a worker log line (pino JSON) about exactly this job with this message. */
const logged = (line: string, jobId: string, msg: string): boolean => {
  try {
    const entry = JSON.parse(line) as { jobId?: unknown; msg?: unknown };
    return entry.jobId === jobId && entry.msg === msg;
  } catch {
    return false;
  }
};

describe('worker crash', () => {
  describe('when the worker running a job is killed with SIGKILL', () => {
    it('should let another worker complete the job and store exactly one plan', async () => {
      const first = await svc.startWorkerProcess(FAST_STALL);
      // 30 000 samples: some 6 s of Monte Carlo on an idle core (longer when loaded), in one job.
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(reachableProblem({ samples: 30_000, name: 'CRASHSAT' })) });
      expect(res.status).toBe(202);
      const jobId = res.body.jobId as string;
      // Killed only once the first worker is inside the Monte Carlo stage of this very job.
      const running = await waitForJob(svc, jobId, (s) => s.state === 'active' && s.progress?.stage === 'dispersion', 120_000);
      expect(running.attemptsMade).toBe(0);
      await first.kill('SIGKILL');
      expect(first.child.signalCode).toBe('SIGKILL');
      const second = await svc.startWorkerProcess(FAST_STALL);
      const end = await waitForJob(svc, jobId, (s) => s.state === 'completed' || s.state === 'failed', 180_000);
      expect(end.state).toBe('completed');
      expect(end.result.planStatus).toBe('converged');
      expect(second.logs.some((l) => logged(l, jobId, 'job completed'))).toBe(true);
      expect(first.logs.some((l) => logged(l, jobId, 'job completed'))).toBe(false);
      expect(first.logs.some((l) => logged(l, jobId, 'plan stored'))).toBe(false);
      const plans = (await svc.archive!.listPlans({ spacecraftName: 'CRASHSAT' })).filter((p) => p.jobId === jobId);
      expect(plans).toHaveLength(1);
      const history = await svc.archive!.history(plans[0]!.planId);
      expect(history.filter((e) => e.kind === 'plan-proposed')).toHaveLength(1);
      expect(end.result.planId).toBe(plans[0]!.planId);
      await second.stop();
    }, 360_000);
  });
});

describe('Redis restart', () => {
  describe('when Redis restarts while jobs wait (append-only file on)', () => {
    it('should lose no job: all are still queued and then complete', async () => {
      const ids: string[] = [];
      for (let i = 0; i < 4; i++) {
        const res = await svc.request('POST', '/v1/jobs', {
          token: svc.tokens.submitter,
          body: submission(reachableProblem({ samples: 0, name: `RESTART-${i}` }), i === 3 ? { priority: 'urgent' } : {}),
        });
        ids.push(res.body.jobId);
      }
      await svc.redis.restart();
      for (const id of ids) {
        const s = await waitForJob(svc, id, (j) => j.state === 'waiting', 20_000);
        expect(s.state).toBe('waiting');
      }
      const worker = await svc.startWorkerInProcess({ concurrency: 2 });
      for (const id of ids) expect((await waitForJob(svc, id, (j) => j.state === 'completed', 60_000)).result.planStatus).toBe('converged');
      await worker.close();
    });
  });

  describe('when Redis is killed with SIGKILL while jobs wait (append-only file, fsync always)', () => {
    it('should lose no acknowledged job: all are still queued and then complete', async () => {
      const ids: string[] = [];
      for (let i = 0; i < 4; i++) {
        const res = await svc.request('POST', '/v1/jobs', {
          token: svc.tokens.submitter,
          body: submission(reachableProblem({ samples: 0, name: `CRASH-REDIS-${i}` }), i === 3 ? { priority: 'urgent' } : {}),
        });
        expect(res.status).toBe(202);
        ids.push(res.body.jobId);
      }
      await svc.redis.crash();
      for (const id of ids) {
        const s = await waitForJob(svc, id, (j) => j.state === 'waiting', 30_000);
        expect(s.state).toBe('waiting');
      }
      const worker = await svc.startWorkerInProcess({ concurrency: 2 });
      for (const id of ids) expect((await waitForJob(svc, id, (j) => j.state === 'completed', 90_000)).result.planStatus).toBe('converged');
      await worker.close();
    }, 180_000);
  });
});
