/**
 * Overload benchmark (second part of npm run bench:service; writes bench/results/service-overload.md): the
 * queue-depth limits at work. Four submitters fire submissions far faster than one worker drains them, with a
 * routine depth limit and a per-submitter limit set low. Recorded: how many were accepted (202), refused 429
 * (submitter) or 503 (queue full), any 5xx (there must be none), whether every accepted job completed, and the
 * deepest waiting queue seen. Counts and times are what this run measured. Uses REDIS_URL when set, else a
 * private redis-server in a temp folder; API and worker in this process (statuses, not latency, are measured).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import { join, resolve } from 'node:path';
import { pino } from 'pino';
import { loadApiConfig, startApiServer } from '../api/index.ts';
import { openTokenStore } from '../api/auth/index.ts';
import { ArchivePlanSink, startLocalRedis, startRetargetWorker, type LocalRedis } from '../queue/index.ts';
import { reachableProblem } from '../test/queue/fixtures.ts';
import { codeVersion, machineLine } from './bench-stats.ts';

const ROOT = resolve(import.meta.dirname, '..');
const SUBMITTERS = 4;
const PER_SUBMITTER = 150;
const CONCURRENCY_PER_SUBMITTER = 10;
const LIMITS = { QUEUE_LIMIT_ROUTINE: '50', QUEUE_LIMIT_PER_SUBMITTER: '15', QUEUE_FULL_RETRY_AFTER_S: '5' };

async function main(): Promise<void> {
  const dir = mkdtempSync(join(os.tmpdir(), 'veer-overload-'));
  let local: LocalRedis | null = null;
  const redisUrl = process.env.REDIS_URL ?? (local = await startLocalRedis(join(dir, 'redis'))).url;
  const prefix = `ovl${Date.now().toString(36)}`;
  const logger = pino({ level: 'silent' });
  const tokenStore = await openTokenStore({ dataDir: dir });
  const tokens = await Promise.all(Array.from({ length: SUBMITTERS }, (_, i) => tokenStore.add(`load-${i + 1}`, ['submitter'])));
  const config = loadApiConfig({
    REDIS_URL: redisUrl, QUEUE_PREFIX: prefix, HOST: '127.0.0.1', PORT: '0', DATA_DIR: dir, PLAN_SINK: 'archive',
    RATE_LIMIT_MAX: '1000000', LOG_LEVEL: 'silent', ...LIMITS,
  });
  const api = await startApiServer(config, logger, { tokens: tokenStore });
  await api.deps.events.ready();
  const worker = await startRetargetWorker({
    redisUrl, prefix, logger, sink: new ArchivePlanSink(api.deps.archive!, false), concurrency: 1, name: 'overload-worker',
  });
  const body = JSON.stringify({ problem: reachableProblem({ samples: 0, name: 'LOADSAT' }), reason: 'overload benchmark submission' });
  const statuses = new Map<number, number>();
  const accepted: string[] = [];
  let deepest = 0;
  const sampler = setInterval(() => {
    void api.deps.queue.counts().then((c) => { deepest = Math.max(deepest, c.waiting); }, () => {});
  }, 50);

  const t0 = performance.now();
  await Promise.all(tokens.map(async ({ token }) => {
    let next = 0;
    await Promise.all(Array.from({ length: CONCURRENCY_PER_SUBMITTER }, async () => {
      while (next < PER_SUBMITTER) {
        next += 1;
        const res = await fetch(`${api.url}/v1/jobs`, { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' }, body });
        const answer = await res.json() as { jobId?: string };
        statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
        if (res.status === 202 && answer.jobId) accepted.push(answer.jobId);
      }
    }));
  }));
  const submitS = (performance.now() - t0) / 1000;
  // Every accepted job must complete.
  const outcome = { completed: 0, failed: 0, other: 0 };
  const deadline = Date.now() + 600_000;
  for (const id of accepted) {
    for (;;) {
      const s = await api.deps.queue.status(id);
      if (s?.state === 'completed') { outcome.completed += 1; break; }
      if (s?.state === 'failed' || s?.state === 'cancelled') { outcome.failed += 1; break; }
      if (Date.now() > deadline) { outcome.other += 1; break; }
      await new Promise((r) => setTimeout(r, 100));
    }
  }
  const totalS = (performance.now() - t0) / 1000;
  clearInterval(sampler);

  const count = (code: number): number => statuses.get(code) ?? 0;
  const fivexx = [...statuses].filter(([code]) => code >= 500 && code !== 503).reduce((n, [, k]) => n + k, 0);
  const lines = [
    '# Service under overload: queue-depth limits',
    '',
    `Measured on ${machineLine()}; code ${codeVersion()}.`,
    `API and one worker (concurrency 1) in one process, SQLite archive, local Redis. Limits: ${Object.entries(LIMITS).map(([k, v]) => `${k}=${v}`).join(', ')}.`,
    `${SUBMITTERS} submitters × ${PER_SUBMITTER} routine submissions, ${CONCURRENCY_PER_SUBMITTER} in flight per submitter (a two-body problem, no Monte Carlo).`,
    '',
    '| measured | value |',
    '|---|---|',
    `| submissions sent | ${SUBMITTERS * PER_SUBMITTER} in ${submitS.toFixed(1)} s |`,
    `| accepted (202) | ${count(202)} |`,
    `| refused 429 SUBMITTER_QUEUE_FULL | ${count(429)} |`,
    `| refused 503 QUEUE_FULL | ${count(503)} |`,
    `| other 5xx | ${fivexx} |`,
    `| other statuses | ${[...statuses].filter(([c]) => ![202, 429, 503].includes(c) && c < 500).map(([c, n]) => `${c}: ${n}`).join(', ') || 'none'} |`,
    `| accepted jobs completed / failed / not finished in 10 min | ${outcome.completed} / ${outcome.failed} / ${outcome.other} |`,
    `| deepest waiting queue seen (50 ms samples) | ${deepest} (limit ${LIMITS.QUEUE_LIMIT_ROUTINE}; checks are not atomic with the add, so submissions in flight together can overshoot) |`,
    `| time until every accepted job finished | ${totalS.toFixed(1)} s |`,
    '',
    `Result: ${fivexx === 0 && outcome.completed === count(202) ? 'every accepted job completed, every refusal was 429 or 503, no other 5xx' : 'FAILED: see the table'}.`,
  ];
  writeFileSync(join(ROOT, 'bench/results/service-overload.md'), `${lines.join('\n')}\n`);
  process.stdout.write(`${lines.join('\n')}\n`);
  await worker.close();
  await api.close();
  await tokenStore.close();
  await local?.stop();
  rmSync(dir, { recursive: true, force: true });
  if (fivexx > 0 || outcome.completed !== count(202)) process.exitCode = 1;
}

void main();
