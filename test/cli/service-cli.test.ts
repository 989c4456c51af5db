/**
 * `veer submit|status|watch|cancel` against the real service (test/harness/service.ts: real Redis, API on a free
 * port, in-process worker, SQLite archive). The event stream is read as the WHATWG HTML Living Standard §9.2
 * event-stream format describes. Exit codes are this CLI's own contract (cli/commands/job-outcome.ts).
 * Whether the demo plan converges is not asserted from a published value here — the planner's own tests do
 * that; these tests check that the CLI reports what the service stored, byte for byte the plan id and flags.
 */
import { spawn } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runVeer } from '../harness/run-cli.ts';
import { startService, type TestService } from '../harness/service.ts';

const ROOT = resolve(import.meta.dirname, '../..');
const DEMO = join(ROOT, 'examples/two-body-demo.json');
const NOTICE = /review and approval by qualified flight-dynamics staff and independent\s+verification/;

interface Run { code: number; out: string; err: string }

/** Runs `veer ...args` in-process; captures stdout and stderr (`onErr` sees stderr as it is written). */
const veer = runVeer;

/** Runs `veer ...args` from the sources (cli/run.ts, the process bin/veer.js runs compiled) as a child process (the real exit code and streams). */
function veerProcess(args: string[], env: Record<string, string>): Promise<Run> {
  return new Promise((done, fail) => {
    const child = spawn(process.execPath, ['--import', 'tsx', join(ROOT, 'cli/run.ts'), ...args], { cwd: ROOT, env: { ...process.env, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
    let out = '';
    let err = '';
    child.stdout.on('data', (c: Buffer) => { out += c.toString(); });
    child.stderr.on('data', (c: Buffer) => { err += c.toString(); });
    child.once('error', fail);
    child.once('exit', (code) => done({ code: code ?? -1, out, err }));
  });
}

let svc: TestService;
let work: string;
let worker: Promise<unknown> | null = null;
const ensureWorker = (): Promise<unknown> => (worker ??= svc.startWorkerInProcess({ concurrency: 1 }));
const as = (role: keyof TestService['tokens']): string[] => ['--url', svc.url, '--token', svc.tokens[role]];
const jobCount = async (): Promise<number> =>
  (await svc.request('GET', '/v1/jobs?limit=200', { token: svc.tokens.auditor })).body.jobs.length as number;
/** The demo problem with `edit` applied, written to a temp file. */
function demoWith(name: string, edit: (p: Record<string, any>) => void): string {
  const problem = JSON.parse(readFileSync(DEMO, 'utf8')) as Record<string, any>;
  edit(problem);
  const path = join(work, name);
  writeFileSync(path, JSON.stringify(problem));
  return path;
}

beforeAll(async () => {
  svc = await startService();
  work = mkdtempSync(join(tmpdir(), 'veer-service-cli-'));
});
afterAll(async () => {
  await svc?.close();
  if (work) rmSync(work, { recursive: true, force: true });
});

describe('veer submit, status, watch and cancel', () => {
  describe('when the problem file is invalid', () => {
    it('should exit 2 naming the field, and send nothing', async () => {
      const bad = demoWith('bad-epoch.json', (p) => { p.burns[0].epoch = 'yesterday'; });
      const before = await jobCount();
      const run = await veer(['submit', bad, '--reason', 'raise the orbit', ...as('submitter')]);
      expect(run.code).toBe(2);
      expect(run.err).toContain('problem.burns[0].epoch');
      expect(run.err).toContain('nothing was sent');
      expect(await jobCount()).toBe(before);
    });
  });

  describe('when the server refuses the request', () => {
    it('should exit 2 and list the failing field paths the server gave', async () => {
      const run = await veer(['submit', DEMO, '--reason', 'ab', '--idempotency-key', 'bad key!', ...as('submitter')]);
      expect(run.code).toBe(2);
      expect(run.err).toMatch(/the server refused the job: HTTP 400/);
      expect(run.err).toContain('body.reason');
      expect(run.err).toContain('body.idempotencyKey');
    });

    it('should exit 2 with the 403 when the token lacks the submitter role', async () => {
      const run = await veer(['submit', DEMO, '--reason', 'raise the orbit', ...as('auditor')]);
      expect(run.code).toBe(2);
      expect(run.err).toMatch(/HTTP 403/);
    });
  });

  describe('when no worker runs yet (the job waits)', () => {
    let jobId = '';

    it('should submit an urgent job and return the same job for the same idempotency key', async () => {
      const args = ['submit', DEMO, '--reason', 'raise the orbit', '--urgent', '--idempotency-key', 'cli-test-urgent-1', ...as('submitter')];
      const first = await veer(args);
      expect(first.code).toBe(0);
      jobId = /job (\S+) submitted \(urgent\)/.exec(first.out)?.[1] ?? '';
      expect(jobId).toMatch(/^k-/); // keyed jobs get an id derived from submitter and key
      const again = await veer(args);
      expect(again.code).toBe(0);
      expect(again.out).toContain(`job ${jobId} already exists`);
      const status = await veer(['status', jobId, '--json', ...as('reviewer')]);
      expect(status.code).toBe(0);
      expect(JSON.parse(status.out)).toEqual(expect.objectContaining({ id: jobId, state: 'waiting', priority: 'urgent', submittedBy: 'alice', reason: 'raise the orbit' }));
    });

    it('should cancel it, and veer watch should then exit 4', async () => {
      const cancelled = await veer(['cancel', jobId, '--reason', 'superseded by a newer orbit solution', ...as('submitter')]);
      expect(cancelled.code).toBe(0);
      expect(cancelled.out).toContain(`job ${jobId} cancelled`);
      const watched = await veer(['watch', jobId, ...as('submitter')]);
      expect(watched.code).toBe(4);
      expect(watched.out).toMatch(/CANCELLED: .*superseded by a newer orbit solution/);
      const again = await veer(['cancel', jobId, ...as('submitter')]);
      expect(again.code).toBe(2);
      expect(again.err).toMatch(/HTTP 409 JOB_FINISHED/);
    });
  });

  describe('when a worker runs the job', () => {
    let jobId = '';

    it('should draw progress from the event stream and exit 0 with the proposed plan id and the review notice', async () => {
      const submitted = await veer(['submit', DEMO, '--reason', 'raise the orbit', ...as('submitter')]);
      jobId = /job (\S+) submitted/.exec(submitted.out)?.[1] ?? '';
      expect(jobId).toMatch(/^j-/);
      // The worker starts once the stream shows the waiting job, so every progress report arrives live.
      const run = await veer(['watch', jobId, ...as('submitter')], (text) => { if (text.includes('waiting')) void ensureWorker(); });
      const stored = (await svc.request('GET', `/v1/jobs/${jobId}`, { token: svc.tokens.auditor })).body;
      expect(stored.state).toBe('completed');
      const planId = stored.result.planId as string;
      const plan = (await svc.request('GET', `/v1/plans/${planId}`, { token: svc.tokens.auditor })).body.summary;
      expect([plan.converged, plan.crossCheckPassed]).toEqual([true, true]);
      expect(run.code).toBe(0);
      expect(run.err).toMatch(/veer watch: +\d+% correcting/);
      expect(run.err).toContain(`job ${jobId} active`);
      expect(run.out).toContain(`plan ${planId} PROPOSED (converged, cross-check passed`);
      expect(run.out).toMatch(NOTICE);
    });

    it('should show the finished job with its plan id in veer status', async () => {
      const run = await veer(['status', jobId, ...as('auditor')]);
      expect(run.code).toBe(0);
      const planId = (await svc.request('GET', `/v1/jobs/${jobId}`, { token: svc.tokens.auditor })).body.result.planId as string;
      expect(run.out).toContain(`job ${jobId} — completed`);
      expect(run.out).toContain(`plan ${planId} PROPOSED`);
      expect(run.out).toMatch(NOTICE);
    });

    it('should take the server and token from VEER_URL and VEER_TOKEN in a real process and exit by outcome', async () => {
      const run = await veerProcess(['watch', jobId], { VEER_URL: svc.url, VEER_TOKEN: svc.tokens.submitter });
      expect(run.code).toBe(0);
      expect(run.out).toContain('PROPOSED');
      expect(run.out).toMatch(NOTICE);
    });

    it('should exit 3 for a completed job whose plan did not converge, and never call it proposed', async () => {
      // One corrector iteration cannot meet the 10 m position target from the 20 m/s guess (checked with veer plan).
      const capped = demoWith('one-iteration.json', (p) => { p.corrector = { maxIterations: 1, maxStepKmS: 0.05, maxEpochStepS: 3600 }; });
      await ensureWorker();
      const run = await veer(['submit', capped, '--reason', 'iteration cap check', '--watch', ...as('submitter')]);
      expect(run.code).toBe(3);
      expect(run.out).toMatch(/is not a usable plan: NOT CONVERGED[^;]*; it can never be approved/);
      expect(run.out).not.toContain('PROPOSED');
      expect(run.out).toMatch(NOTICE);
    });
  });

  describe('when the job fails', () => {
    it('should exit 1 naming the error, with no plan', async () => {
      // A second service on the same Redis whose worker has a 50 ms time limit: the planner needs longer.
      const limited = await startService({ redis: svc.redis });
      try {
        await limited.startWorkerInProcess({ jobTimeLimitS: 0.05 });
        const run = await veer(['submit', DEMO, '--reason', 'time limit check', '--watch', '--url', limited.url, '--token', limited.tokens.submitter]);
        expect(run.code).toBe(1);
        expect(run.out).toMatch(/FAILED: TimeLimitError: /);
        expect(run.out).toContain('No plan was produced.');
        expect(run.out).not.toMatch(/plan-/);
      } finally {
        await limited.close();
      }
    });
  });

  describe('when the job or the token is unknown', () => {
    it('should exit 2 with the 404 for an unknown job', async () => {
      const run = await veer(['status', 'j-no-such-job', ...as('auditor')]);
      expect(run.code).toBe(2);
      expect(run.err).toMatch(/HTTP 404 JOB_NOT_FOUND/);
    });

    it('should exit 2 with the 401 when watching with a bad token', async () => {
      const run = await veer(['watch', 'j-no-such-job', '--url', svc.url, '--token', 'veer_not-a-real-token']);
      expect(run.code).toBe(2);
      expect(run.err).toMatch(/HTTP 401/);
    });
  });
});
