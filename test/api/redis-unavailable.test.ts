/**
 * Redis out of reach: the API listens at once, logs that it is not ready, answers the job routes and
 * /metrics 503 with Retry-After (never 500), and recovers by itself when Redis answers. A real redis-server
 * is started late on the port the API was given, then stopped.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Writable } from 'node:stream';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadApiConfig, startApiServer, type ApiServer } from '../../api/index.ts';
import { openTokenStore, type TokenStore } from '../../api/auth/index.ts';
import { freePort, startRedisProcess, type TestRedis } from '../harness/redis.ts';
import { schemaValidProblem, submission } from '../queue/fixtures.ts';

const logs: string[] = [];
const logger = pino({ level: 'info' }, new Writable({ write(chunk, _enc, done) { logs.push(String(chunk)); done(); } }));
let dataDir: string;
let tokens: TokenStore;
let token: string;
let port: number;
let api: ApiServer;
let startMs: number;
let redis: TestRedis | null = null;

beforeAll(async () => {
  dataDir = mkdtempSync(join(tmpdir(), 'veer-noredis-'));
  tokens = await openTokenStore({ dataDir });
  token = (await tokens.add('ops', ['submitter', 'auditor'])).token;
  port = await freePort();
  const config = loadApiConfig({
    REDIS_URL: `redis://127.0.0.1:${port}`, QUEUE_PREFIX: 'noredis', PORT: '0', HOST: '127.0.0.1', DATA_DIR: dataDir, PLAN_SINK: 'job-result',
  });
  const t0 = performance.now();
  api = await startApiServer(config, logger, { tokens });
  startMs = performance.now() - t0;
});
afterAll(async () => {
  await api?.close();
  await redis?.stop();
  await tokens?.close();
  rmSync(dataDir, { recursive: true, force: true });
});

const call = async (method: string, path: string, body?: unknown) => {
  const t0 = performance.now();
  const res = await fetch(`${api.url}${path}`, {
    method, headers: { authorization: `Bearer ${token}`, ...(body ? { 'content-type': 'application/json' } : {}) },
    ...(body ? { body: JSON.stringify(body) } : {}),
  });
  return { status: res.status, retryAfter: res.headers.get('retry-after'), body: await res.text(), ms: performance.now() - t0 };
};

async function until(check: () => Promise<boolean>, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`condition not met within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('Redis unavailable', () => {
  describe('when the API starts while nothing answers at REDIS_URL', () => {
    it('should listen at once and log that it is not ready', async () => {
      // Before the fix start-up waited for Redis (over 45 s); a few seconds covers a loaded 2-core machine.
      expect(startMs).toBeLessThan(5_000);
      expect((await call('GET', '/health')).status).toBe(200);
      expect(logs.some((l) => l.includes('Redis not answering yet'))).toBe(true);
    });

    it('should answer /ready, submissions, job reads and /metrics 503 with Retry-After', async () => {
      const answers = [
        await call('GET', '/ready'),
        await call('POST', '/v1/jobs', submission(schemaValidProblem())),
        await call('GET', '/v1/jobs/j-00000000-0000-4000-8000-000000000000'),
        await call('GET', '/v1/jobs'),
        await call('GET', '/metrics'),
      ];
      for (const a of answers) {
        expect(a.status, a.body).toBe(503);
        expect(Number(a.retryAfter)).toBeGreaterThan(0);
        // Refused at once, not after the client's retries (2 s before the fix).
        expect(a.ms).toBeLessThan(1_000);
      }
      expect(JSON.parse(answers[1]!.body).error.code).toBe('QUEUE_UNAVAILABLE');
    });
  });

  describe('when Redis comes up later and then goes away again', () => {
    it('should become ready by itself, accept jobs, then answer 503 again and log the loss', async () => {
      redis = await startRedisProcess(port);
      await until(async () => JSON.parse((await call('GET', '/ready')).body).redis.ok === true, 15_000);
      expect(logs.some((l) => l.includes('Redis answers: API ready'))).toBe(true);
      expect((await call('POST', '/v1/jobs', submission(schemaValidProblem()))).status).toBe(202);
      await redis.stop();
      redis = null;
      await until(async () => (await call('POST', '/v1/jobs', submission(schemaValidProblem()))).status === 503, 5_000);
      const again = await call('GET', '/v1/jobs');
      expect([again.status, again.retryAfter !== null]).toEqual([503, true]);
      expect(logs.some((l) => l.includes('Redis connection lost'))).toBe(true);
    });
  });
});
