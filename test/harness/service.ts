/**
 * Starts the service for tests: a real Redis (harness/redis.ts), the API in this process on a free port,
 * and workers either in this process or as separate `queue/worker-main.ts` processes (so a test can SIGKILL
 * one). Plans go to a real SQLite archive in a temp folder unless `planSink: 'job-result'`.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pino } from 'pino';
import { openArchive, type PlanArchive } from '../../archive/index.ts';
import { loadApiConfig, startApiServer, type ApiServer } from '../../api/index.ts';
import { openTokenStore, type TokenStore } from '../../api/auth/index.ts';
import { ArchivePlanSink, JobResultSink, loadEphemerisSets, startRetargetWorker, type RetargetWorker } from '../../queue/index.ts';
import { BUILTIN_LEAP_SECONDS } from '../../propagator/index.ts';
import { startRedis, type TestRedis } from './redis.ts';

const ROOT = resolve(import.meta.dirname, '../..');

export interface ServiceOptions {
  planSink?: 'archive' | 'job-result';
  /** Extra API environment (e.g. RATE_LIMIT_MAX). */
  apiEnv?: Record<string, string>;
  /** Reuse a Redis (several services per file). */
  redis?: TestRedis;
  /** EPHEMERIS_DIR of the API and of the workers (in-process and processes alike). */
  ephemerisDir?: string;
}

export interface WorkerProcess {
  child: ChildProcess;
  /** Lines the worker logged (pino JSON). */
  logs: string[];
  stop(): Promise<void>;
  kill(signal: NodeJS.Signals): Promise<void>;
}

export interface HttpResult { status: number; body: any; headers: Headers; text: string }

export interface TestService {
  redis: TestRedis;
  api: ApiServer;
  url: string;
  prefix: string;
  dataDir: string;
  archive: PlanArchive | null;
  tokenStore: TokenStore;
  /** Bearer tokens by role name: submitter, submitter2, reviewer, auditor, admin, none (a token without useful roles). */
  tokens: Record<'submitter' | 'submitter2' | 'reviewer' | 'auditor' | 'admin', string>;
  /** Worker environment for this service (Redis, prefix, data folder). */
  workerEnv: Record<string, string>;
  request(method: string, path: string, opts?: { token?: string; body?: unknown; rawBody?: string; headers?: Record<string, string> }): Promise<HttpResult>;
  startWorkerInProcess(opts?: { concurrency?: number; jobTimeLimitS?: number; fanOutMinSamples?: number; batchSize?: number; stalledIntervalMs?: number; lockDurationMs?: number }): Promise<RetargetWorker>;
  startWorkerProcess(env?: Record<string, string>): Promise<WorkerProcess>;
  close(): Promise<void>;
}

const quietLogger = pino({ level: process.env.VEER_TEST_LOG ?? 'silent' });

export async function startService(opts: ServiceOptions = {}): Promise<TestService> {
  const redis = opts.redis ?? await startRedis();
  const ownsRedis = !opts.redis;
  const dataDir = mkdtempSync(join(tmpdir(), 'veer-service-'));
  const prefix = `t${randomUUID().slice(0, 8)}`;
  const planSink = opts.planSink ?? 'archive';
  const archive = planSink === 'archive' ? await openArchive({ dataDir }) : null;
  const tokenStore = await openTokenStore({ dataDir });
  const tokens = {
    submitter: (await tokenStore.add('alice', ['submitter'])).token,
    submitter2: (await tokenStore.add('bob', ['submitter'])).token,
    reviewer: (await tokenStore.add('rita', ['reviewer'])).token,
    auditor: (await tokenStore.add('audrey', ['auditor'])).token,
    admin: (await tokenStore.add('root', ['admin'])).token,
  };
  const config = loadApiConfig({
    REDIS_URL: redis.url, QUEUE_PREFIX: prefix, PORT: '0', HOST: '127.0.0.1', DATA_DIR: dataDir, PLAN_SINK: planSink,
    JOB_ATTEMPTS: '3', ...(opts.ephemerisDir ? { EPHEMERIS_DIR: opts.ephemerisDir } : {}), ...opts.apiEnv,
  });
  const api = await startApiServer(config, quietLogger, { tokens: tokenStore, archive });
  await api.deps.events.ready(); // the API listens before Redis answers; tests want its event listener connected
  const workers: RetargetWorker[] = [];
  const processes: WorkerProcess[] = [];
  const workerEnv: Record<string, string> = {
    REDIS_URL: redis.url, QUEUE_PREFIX: prefix, DATA_DIR: dataDir, PLAN_SINK: planSink, LOG_LEVEL: 'info',
    ...(opts.ephemerisDir ? { EPHEMERIS_DIR: opts.ephemerisDir } : {}),
  };

  const service: TestService = {
    redis, api, url: api.url, prefix, dataDir, archive, tokenStore, tokens, workerEnv,
    async request(method, path, o = {}) {
      const headers: Record<string, string> = { ...(o.headers ?? {}) };
      if (o.token) headers.authorization = `Bearer ${o.token}`;
      let body: string | undefined;
      if (o.rawBody !== undefined) { body = o.rawBody; headers['content-type'] ??= 'application/json'; }
      else if (o.body !== undefined) { body = JSON.stringify(o.body); headers['content-type'] = 'application/json'; }
      const res = await fetch(`${api.url}${path}`, { method, headers, ...(body !== undefined ? { body } : {}) });
      const text = await res.text();
      let parsed: unknown = null;
      try { parsed = text ? JSON.parse(text) : null; } catch { parsed = null; }
      return { status: res.status, body: parsed, headers: res.headers, text };
    },
    async startWorkerInProcess(w = {}) {
      const worker = await startRetargetWorker({
        redisUrl: redis.url, prefix, logger: quietLogger,
        sink: archive ? new ArchivePlanSink(archive, false) : new JobResultSink(),
        concurrency: w.concurrency ?? 1, jobTimeLimitS: w.jobTimeLimitS ?? 120,
        fanOutMinSamples: w.fanOutMinSamples ?? 1_000_000, batchSize: w.batchSize ?? 250,
        stalledIntervalMs: w.stalledIntervalMs ?? 30_000, lockDurationMs: w.lockDurationMs ?? 30_000,
        name: `test-worker-${workers.length + 1}`,
        ephemerisSets: await loadEphemerisSets(opts.ephemerisDir, BUILTIN_LEAP_SECONDS),
      });
      workers.push(worker);
      return worker;
    },
    async startWorkerProcess(env = {}) {
      const child = spawn(process.execPath, ['--import', 'tsx', join(ROOT, 'queue/worker-main.ts')], {
        cwd: ROOT, env: { ...process.env, ...workerEnv, ...env }, stdio: ['ignore', 'pipe', 'pipe'],
      });
      const logs: string[] = [];
      let buffer = '';
      const ready = new Promise<void>((res, rej) => {
        const timer = setTimeout(() => rej(new Error(`worker process not ready after 90 s:\n${logs.join('\n')}`)), 90_000);
        child.stdout?.on('data', (chunk: Buffer) => {
          buffer += chunk.toString();
          const lines = buffer.split('\n');
          buffer = lines.pop() ?? '';
          for (const line of lines) {
            logs.push(line);
            if (line.includes('"worker ready"')) { clearTimeout(timer); res(); }
          }
        });
        child.stderr?.on('data', (chunk: Buffer) => logs.push(chunk.toString()));
        child.once('exit', (code) => { clearTimeout(timer); rej(new Error(`worker process exited (${code}):\n${logs.join('\n')}`)); });
      });
      const exited = new Promise<void>((r) => child.once('exit', () => r()));
      const handle: WorkerProcess = {
        child, logs,
        async kill(signal) { if (child.exitCode === null && child.signalCode === null) { child.kill(signal); await exited; } },
        async stop() { await handle.kill('SIGTERM'); },
      };
      processes.push(handle);
      await ready;
      return handle;
    },
    async close() {
      await Promise.all(processes.map((p) => p.kill('SIGKILL')));
      await Promise.all(workers.map((w) => w.close(true)));
      await api.close();
      await tokenStore.close();
      await archive?.close();
      if (ownsRedis) await redis.stop();
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
  return service;
}

export interface SseEvent { event: string; data: any }

/** Reads a server-sent event stream until it closes (or `timeoutMs`); returns every event in order. */
export async function readEventStream(url: string, token: string, timeoutMs = 60_000, onEvent?: (e: SseEvent) => void): Promise<{ status: number; contentType: string | null; events: SseEvent[] }> {
  const controller = new AbortController();
  const timer = setTimeout(() => controller.abort(), timeoutMs);
  const res = await fetch(url, { headers: { authorization: `Bearer ${token}`, accept: 'text/event-stream' }, signal: controller.signal });
  const events: SseEvent[] = [];
  if (!res.body) return { status: res.status, contentType: res.headers.get('content-type'), events };
  const decoder = new TextDecoder();
  let buffer = '';
  try {
    for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
      buffer += decoder.decode(chunk, { stream: true });
      let cut: number;
      while ((cut = buffer.indexOf('\n\n')) >= 0) {
        const block = buffer.slice(0, cut);
        buffer = buffer.slice(cut + 2);
        const event = /^event: (.*)$/m.exec(block)?.[1];
        const data = /^data: (.*)$/m.exec(block)?.[1];
        if (event && data) {
          const e = { event, data: JSON.parse(data) };
          events.push(e);
          onEvent?.(e);
        }
      }
    }
  } catch (e) {
    if (!controller.signal.aborted) throw e;
  } finally {
    clearTimeout(timer);
  }
  return { status: res.status, contentType: res.headers.get('content-type'), events };
}

/** Polls the job's status until `predicate` holds (or throws after `timeoutMs`). */
export async function waitForJob(svc: TestService, jobId: string, predicate: (s: any) => boolean, timeoutMs = 60_000, statusPath = '/v1/jobs'): Promise<any> {
  const deadline = Date.now() + timeoutMs;
  let last: any = null;
  while (Date.now() < deadline) {
    last = (await svc.request('GET', `${statusPath}/${jobId}`, { token: svc.tokens.auditor })).body;
    if (last && predicate(last)) return last;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`job ${jobId} did not reach the expected state in ${timeoutMs} ms; last status: ${JSON.stringify(last)}`);
}
