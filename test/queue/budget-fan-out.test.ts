/**
 * The Δv budget as a service job: its non-linear samples fan out as `budget-samples` child jobs, the parent
 * assembles them, and — sample i depending on (seed, i) only — the study is identical with 1, 2 and 4
 * workers and equals the single-process run exactly. The study is archived once, names no plan, leaves no
 * sample copies in Redis, and can be cancelled. A budget job is a first-class job: listed by `/v1/jobs` with
 * its kind, streamed at its eventsUrl with the budget's own progress stages, counted in the metrics.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseBudgetRequest, runBudget } from '../../planner/index.ts';
import { readEventStream, startService, waitForJob, type TestService } from '../harness/service.ts';
import { keysOf } from './fixtures.ts';

let svc: TestService;
const processedBy = new Map<string, string>();
const workers: { worker: { pause(): Promise<void>; resume(): void } }[] = [];
const demo = JSON.parse(readFileSync(new URL('../../examples/flyby-budget-demo.json', import.meta.url), 'utf8')) as Record<string, unknown>;
const body = (request: Record<string, unknown>) => ({ request, reason: 'service test: Δv budget of the remaining correction burns' });
const BUDGET_STAGES = ['nominal', 'linear', 'nonlinear', 'summary', 'done'];

async function addWorkers(n: number): Promise<void> {
  for (let i = 0; i < n; i++) {
    const w = await svc.startWorkerInProcess({ concurrency: 1, batchSize: 2 });
    workers.push(w);
    w.worker.on('completed', (job) => processedBy.set(String(job.id), w.name));
  }
}

/** Submits `request`, waits for the end, and returns the job id, its final status and its study. */
async function runJob(request: Record<string, unknown>, onSubmitted?: (jobId: string, eventsUrl: string) => void) {
  const res = await svc.request('POST', '/v1/budgets', { token: svc.tokens.submitter, body: body(request) });
  expect(res.status).toBe(202);
  const jobId = res.body.jobId as string;
  onSubmitted?.(jobId, res.body.eventsUrl as string);
  const end = await waitForJob(svc, jobId, (s) => s.state === 'completed' || s.state === 'failed', 240_000, '/v1/budgets');
  expect(end.state, JSON.stringify(end.error)).toBe('completed');
  const fetched = await svc.request('GET', `/v1/budgets/${jobId}/study`, { token: svc.tokens.reviewer });
  expect(fetched.status).toBe(200);
  const workers = new Set([...processedBy].filter(([id]) => id.startsWith(`${jobId}-mc-`)).map(([, name]) => name));
  return { jobId, end, fetched: fetched.body, workers };
}

beforeAll(async () => { svc = await startService(); });
afterAll(async () => { await svc?.close(); });

describe('Δv budget jobs', () => {
  describe('when the same budget runs on 1, 2 and 4 workers', () => {
    it('should fan the non-linear samples out and give identical studies, equal to the single-process run', async () => {
      // 8 non-linear samples in batches of 2: 4 child jobs per run.
      const request = { ...demo, linearSamples: 300, nonlinearSamples: 8 };
      await addWorkers(1);
      const one = await runJob(request);
      await addWorkers(1);
      const two = await runJob(request);
      await addWorkers(2);
      let stream: ReturnType<typeof readEventStream> | null = null;
      const four = await runJob(request, (_id, eventsUrl) => { stream = readEventStream(`${svc.url}${eventsUrl}`, svc.tokens.auditor, 240_000); });

      expect(one.workers.size).toBe(1);
      // Which worker takes which batch is the queue's choice; with idle workers the batches spread out.
      expect(two.workers.size, [...two.workers].join(', ')).toBeGreaterThan(1);
      expect(four.workers.size, [...four.workers].join(', ')).toBeGreaterThan(1);
      const local = JSON.parse(JSON.stringify(await runBudget(parseBudgetRequest(request))));
      for (const run of [one, two, four]) {
        expect(run.end.kind).toBe('delta-v-budget');
        expect(run.end.result.agreementPassed).toBe(true);
        expect([...processedBy.keys()].filter((id) => id.startsWith(`${run.jobId}-mc-`))).toHaveLength(4);
        expect(run.fetched.study).toEqual(local);
      }
      expect(four.fetched.study.caveats[0].code).toBe('PROPOSAL_REQUIRES_REVIEW');
      expect(four.fetched.storedIn).toBe('archive');
      expect((await svc.archive!.getStudyByJob(four.jobId))?.study).toEqual(four.fetched.study);
      expect(await svc.archive!.getPlanByJob(four.jobId)).toBeUndefined();

      // Once combined and stored, no batch job and no copy of the samples stays in Redis (as for a plan's Monte Carlo).
      const redis = svc.api.deps.queue.redis;
      expect(await keysOf(redis, `${svc.prefix}:*-mc-*`)).toEqual([]);
      expect(await keysOf(redis, `${svc.prefix}:*:processed`)).toEqual([]);
      expect(await redis.hget(`${svc.prefix}:retarget:${four.jobId}`, 'data')).not.toContain('"nominal"');

      // First-class job: its own event stream with the budget's stages, listed with its kind, in the metrics.
      const events = (await stream!).events;
      expect(events.at(-1)).toMatchObject({ event: 'end', data: { id: four.jobId, kind: 'delta-v-budget', state: 'completed' } });
      const stages = new Set(events.filter((e) => e.event === 'progress').map((e) => e.data.stage as string));
      expect(stages.size, [...stages].join(', ')).toBeGreaterThan(0);
      for (const stage of stages) expect(BUDGET_STAGES).toContain(stage);
      const listed = (await svc.request('GET', '/v1/jobs?limit=50', { token: svc.tokens.auditor })).body.jobs as { id: string; kind: string }[];
      expect(listed.filter((j) => j.kind === 'delta-v-budget').map((j) => j.id).sort()).toEqual([one.jobId, two.jobId, four.jobId].sort());
      expect(listed.some((j) => j.id.includes('-mc-'))).toBe(false);
      let metrics = '';
      for (let i = 0; i < 50 && !/^veer_job_duration_seconds_count\{kind="delta-v-budget",outcome="completed"\} 3$/m.test(metrics); i++) {
        await new Promise((r) => setTimeout(r, 100));
        metrics = (await svc.request('GET', '/metrics')).text;
      }
      expect(metrics).toMatch(/^veer_job_duration_seconds_count\{kind="delta-v-budget",outcome="completed"\} 3$/m);
      expect(metrics).toMatch(/^veer_job_submissions_total\{kind="delta-v-budget",outcome="created"\} 3$/m);
    }, 600_000);
  });

  describe('when the request is invalid', () => {
    it('should answer 400 naming the field', async () => {
      const res = await svc.request('POST', '/v1/budgets', { token: svc.tokens.submitter, body: body({ ...demo, knowledge: [(demo.knowledge as unknown[])[0]] }) });
      expect(res.status).toBe(400);
      expect(JSON.stringify(res.body)).toContain('request.knowledge');
    });
  });

  describe('when a budget job is cancelled before any worker took it', () => {
    it('should read as a cancelled budget job, not as a retargeting job', async () => {
      await Promise.all(workers.map((w) => w.worker.pause()));
      try {
        const res = await svc.request('POST', '/v1/budgets', { token: svc.tokens.submitter, body: body({ ...demo, linearSamples: 10, nonlinearSamples: 6 }) });
        const jobId = res.body.jobId as string;
        const cancel = await svc.request('POST', `/v1/budgets/${jobId}/cancel`, { token: svc.tokens.submitter, body: { reason: 'test' } });
        expect(cancel.status).toBe(200);
        const status = await svc.request('GET', `/v1/budgets/${jobId}`, { token: svc.tokens.auditor });
        expect(status.status).toBe(200);
        expect(status.body).toMatchObject({ id: jobId, kind: 'delta-v-budget', state: 'cancelled', result: null });
        expect((await svc.request('GET', `/v1/jobs/${jobId}`, { token: svc.tokens.auditor })).status).toBe(404);
      } finally {
        for (const w of workers) w.worker.resume();
      }
    }, 120_000);
  });

  describe('when the job is cancelled while its sample batches run', () => {
    it('should end cancelled', async () => {
      const res = await svc.request('POST', '/v1/budgets', { token: svc.tokens.submitter, body: body({ ...demo, linearSamples: 10, nonlinearSamples: 600 }) });
      const jobId = res.body.jobId as string;
      await waitForJob(svc, jobId, (s) => s.state === 'waiting-children', 120_000, '/v1/budgets');
      const cancel = await svc.request('POST', `/v1/budgets/${jobId}/cancel`, { token: svc.tokens.submitter, body: { reason: 'test' } });
      expect(cancel.status).toBe(202);
      const end = await waitForJob(svc, jobId, (s) => ['cancelled', 'completed', 'failed'].includes(s.state), 120_000, '/v1/budgets');
      expect(end.state).toBe('cancelled');
    }, 300_000);
  });
});
