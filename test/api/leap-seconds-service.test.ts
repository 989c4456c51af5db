/**
 * The service and the leap-second table: /ready and /metrics report the table and its expiry; a UTC problem
 * dated after the built-in table's expiry (2026-06-28, the IERS list of Bulletin C 70) plans end to end with
 * the UTC_LEAP_SECONDS_ASSUMED caveat and UTC burn epochs; with VEER_LEAP_SECONDS naming a list with an
 * INVENTED extra leap second (test/fixtures/leap-seconds/README.md) the plan records the file's SHA-256 and its
 * epochs move by 1 s; a tampered list stops the start naming the variable and the line.
 */
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadServiceLeapSeconds, logLeapSecondsAtStart } from '../../queue/index.ts';
import { BUILTIN_LEAP_SECONDS, parseEpoch } from '../../propagator/index.ts';
import { loadApiConfig, startApiServer } from '../../api/index.ts';
import { twoBodyProblemInUtc } from '../planner/two-body-fixture.ts';
import { startRedis, type TestRedis } from '../harness/redis.ts';
import { startService, waitForJob, type TestService } from '../harness/service.ts';
import { submission } from '../queue/fixtures.ts';

const INVENTED = resolve('test/fixtures/leap-seconds/invented-2027.list');
const EXPIRY_2026_06_28_UNIX_S = Date.UTC(2026, 5, 28) / 1000;

let redis: TestRedis;
beforeAll(async () => { redis = await startRedis(); });
afterAll(async () => { await redis?.stop(); });

/** Submits, runs with an in-process worker, and returns the plan the service serves. */
async function planOverHttp(svc: TestService, problem: Record<string, unknown>): Promise<any> {
  const submitted = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
  expect(submitted.status).toBe(202);
  const status = await waitForJob(svc, submitted.body.jobId, (s) => s.state === 'completed' || s.state === 'failed');
  expect(status.state).toBe('completed');
  const fetched = await svc.request('GET', `/v1/plans/${status.result.planId}`, { token: svc.tokens.reviewer });
  expect(fetched.status).toBe(200);
  return fetched.body.plan;
}

describe('service with the built-in leap-second table', () => {
  let svc: TestService;
  beforeAll(async () => {
    svc = await startService({ redis, planSink: 'job-result' });
    await svc.startWorkerInProcess();
  });
  afterAll(async () => { await svc?.close(); });

  it('should report the table and its expiry in /ready (never unready for it) and as metrics', async () => {
    const ready = await svc.request('GET', '/ready');
    expect(ready.status).toBe(200);
    expect(ready.body.leapSeconds).toEqual({
      source: 'built-in', path: null, sha256: null, expiresUtc: '2026-06-28', expired: Date.now() >= EXPIRY_2026_06_28_UNIX_S * 1000,
    });
    const metrics = await svc.request('GET', '/metrics');
    expect(metrics.text).toMatch(new RegExp(`^veer_leap_seconds_expiry_timestamp_seconds\\{source="built-in"\\} ${EXPIRY_2026_06_28_UNIX_S}$`, 'm'));
    expect(metrics.text).toMatch(new RegExp(`^veer_leap_seconds_expired ${Date.now() >= EXPIRY_2026_06_28_UNIX_S * 1000 ? 1 : 0}$`, 'm'));
  });

  it('should plan a UTC problem dated 2027-08-11 with the caveat and UTC burn epochs', async () => {
    const plan = await planOverHttp(svc, twoBodyProblemInUtc('2027-08-11T00:00:00Z') as Record<string, unknown>);
    expect(plan.status).toBe('converged');
    expect(plan.burns[0].epoch.utc).toBe('2027-08-11T00:10:00.000 UTC');
    expect(plan.caveats.map((c: { code: string }) => c.code)).toContain('UTC_LEAP_SECONDS_ASSUMED');
    expect(plan.leapSeconds).toMatchObject({ source: 'built-in', expiresUtc: '2026-06-28' });
  });
});

describe('service with VEER_LEAP_SECONDS', () => {
  describe('when it names a list with an INVENTED leap second at the end of 2026', () => {
    let svc: TestService;
    beforeAll(async () => {
      svc = await startService({ redis, planSink: 'job-result', apiEnv: { VEER_LEAP_SECONDS: INVENTED } });
      await svc.startWorkerInProcess(); // the worker gets the API's table with each job
    });
    afterAll(async () => { await svc?.close(); });

    it('should report the file and its SHA-256, and plan with it', async () => {
      const sha256 = createHash('sha256').update(readFileSync(INVENTED)).digest('hex');
      const ready = await svc.request('GET', '/ready');
      expect(ready.body.leapSeconds).toMatchObject({ source: 'file', path: INVENTED, sha256, expiresUtc: '2027-12-28' });
      const plan = await planOverHttp(svc, twoBodyProblemInUtc('2027-08-11T00:00:00Z') as Record<string, unknown>);
      expect(plan.leapSeconds).toMatchObject({ source: 'file', path: INVENTED, sha256 });
      expect(plan.burns[0].epoch.utc).toBe('2027-08-11T00:10:00.000 UTC');
      expect(plan.caveats.map((c: { code: string }) => c.code)).not.toContain('UTC_LEAP_SECONDS_ASSUMED');
      // TAI − UTC = 38 s instead of the built-in 37 s: the same UTC reading is 1 s later in TDB.
      const builtinTdbS = parseEpoch('2027-08-11T00:10:00Z', undefined, 'epoch', BUILTIN_LEAP_SECONDS);
      expect(plan.burns[0].epoch.tdbS - builtinTdbS).toBeCloseTo(1, 6);
    });
  });

  describe('when it names a tampered list', () => {
    it('should refuse to start, naming the variable, the file and the #h line', async () => {
      const dir = mkdtempSync(join(tmpdir(), 'veer-leap-'));
      const path = join(dir, 'tampered.list');
      writeFileSync(path, readFileSync(INVENTED, 'utf8').replace('3692217600 37', '3692217600 38'));
      await expect(loadServiceLeapSeconds(path)).rejects.toMatchObject({ name: 'ConfigError' });
      const config = loadApiConfig({ REDIS_URL: redis.url, PORT: '0', HOST: '127.0.0.1', DATA_DIR: dir, VEER_LEAP_SECONDS: path });
      // Refused before anything is opened (Redis, archive, tokens): nothing to close.
      await expect(startApiServer(config, pino({ level: 'silent' }))).rejects.toThrow(/VEER_LEAP_SECONDS: .*tampered\.list: line \d+: '#h' SHA-1/);
    });
  });
});

describe('start-up log', () => {
  it('should warn when the table has expired and only inform before', () => {
    const lines: { level: number; msg: string }[] = [];
    const logger = pino({ level: 'info' }, { write: (s: string) => { lines.push(JSON.parse(s)); } });
    logLeapSecondsAtStart(BUILTIN_LEAP_SECONDS, logger, new Date('2026-06-27T23:59:59Z'));
    logLeapSecondsAtStart(BUILTIN_LEAP_SECONDS, logger, new Date('2026-06-28T00:00:00Z'));
    expect(lines.map((l) => l.level)).toEqual([30, 40]); // pino: 30 info, 40 warn
    expect(lines[1].msg).toContain('expired on 2026-06-28');
    expect(lines[1].msg).toContain('VEER_LEAP_SECONDS');
  });
});
