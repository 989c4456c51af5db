/**
 * The service's named ephemeris sets (EPHEMERIS_DIR): listed by GET /v1/ephemerides (readers only), chosen by a
 * problem (forceModel.ephemerisSet), planned on by the worker end to end (API → Redis → worker → archive) with the
 * files' provenance in the plan and its history, sampled by fanned-out Monte Carlo child jobs on the same files,
 * exported as OEM on them; refused: an unknown set name (400 naming the field), a corrupt file (start-up stops,
 * naming file, line and keyword), a span that does not cover the problem (400 at submission naming file, body,
 * epochs; the planner refuses it too), a file changed after start-up (export refused). A Δv budget job on a set
 * is studied on its files (nominal and fanned-out re-plans) with the sources in the study, and refused as above.
 *
 * The set's file is a CCSDS OEM (CCSDS 502.0-B-3, KVN layout from the standard's annex examples, from memory)
 * tabulating Mars relative to the Sun from astronomy-engine (npm 2.1.19) moved by a known offset
 * (test/reference/mars-oem.ts). The problem is the fast Earth-orbit one of the queue tests with Mars as a
 * perturbing body, so the plan must name the file as Mars's source. The exact-equality check against an
 * in-process plan on the same file is the planner's own determinism contract (same problem, same plan).
 */
import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pino } from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadApiConfig, startApiServer } from '../../api/index.ts';
import { loadEphemerisFiles } from '../../ccsds/index.ts';
import { parseBudgetRequest, parseProblem, planManeuvers, runBudget } from '../../planner/index.ts';
import { BUILTIN_LEAP_SECONDS, parseEpoch } from '../../propagator/index.ts';
import { loadEphemerisSets, logEphemerisSetsAtStart } from '../../queue/index.ts';
import { startService, waitForJob, type TestService } from '../harness/service.ts';
import { reachableProblem, submission } from '../queue/fixtures.ts';
import { marsOemText } from '../reference/mars-oem.ts';

const DAY_S = 86400;
const OFFSET_KM = [600, -450, 250];
const t0 = parseEpoch('2031-03-01T00:00:00 TDB'); // reachableProblem's initial epoch
const root = mkdtempSync(join(tmpdir(), 'veer-ephemeris-sets-'));

function writeSet(dir: string, set: string, file: string, text: string): string {
  mkdirSync(join(dir, set), { recursive: true });
  const path = join(dir, set, file);
  writeFileSync(path, text);
  return path;
}

const setsDir = join(root, 'sets');
const marsPath = writeSet(setsDir, 'mission-a', 'mars.oem', marsOemText('MARS', t0 - 3 * DAY_S, t0 + 3 * DAY_S, OFFSET_KM));
// Mars tabulated only until the problem's start (00:00 TDB); it ends at 02:00 TDB.
writeSet(setsDir, 'too-short', 'mars-short.oem', marsOemText('MARS', t0 - 3 * DAY_S, t0, OFFSET_KM));
const marsSha256 = createHash('sha256').update(readFileSync(marsPath)).digest('hex');

/** The queue tests' fast Earth-orbit problem, with Mars perturbing and (when given) an ephemeris set. */
function problemOn(set: string | undefined, samples = 60): Record<string, any> {
  const p = reachableProblem({ samples, seed: 31, name: 'SETSAT' });
  p.forceModel = { centralBody: 'earth', perturbingBodies: ['mars'], ...(set ? { ephemerisSet: set } : {}) };
  return p;
}

let svc: TestService;
beforeAll(async () => {
  svc = await startService({ ephemerisDir: setsDir });
  // Runs of 40 samples or more fan out in batches of 30 child jobs.
  await svc.startWorkerInProcess({ fanOutMinSamples: 40, batchSize: 30 });
});
afterAll(async () => { await svc?.close(); });

describe('GET /v1/ephemerides', () => {
  it('should list each set with its files, SHA-256, bodies and spans in TDB and UTC', async () => {
    const res = await svc.request('GET', '/v1/ephemerides', { token: svc.tokens.submitter });
    expect(res.status).toBe(200);
    expect(res.body.default).toBe('built-in');
    expect(res.body.sets.map((s: { name: string }) => s.name)).toEqual(['mission-a', 'too-short']);
    expect(res.body.sets[0].files).toEqual([{
      file: 'mars.oem', sha256: marsSha256,
      bodies: [{
        body: 'mars', startTdb: '2031-02-26T00:00:00.000 TDB', endTdb: '2031-03-04T00:00:00.000 TDB',
        // TDB − UTC = 37 s + 32.184 s (TAI − UTC of the built-in table, TT − TAI; TDB − TT < 2 ms): common practice.
        startUtc: expect.stringMatching(/^2031-02-25T23:58:50\.8\d\d UTC$/), endUtc: expect.stringMatching(/^2031-03-03T23:58:50\.8\d\d UTC$/),
      }],
    }]);
  });

  it('should admit the reading roles only, as the other read routes do', async () => {
    expect((await svc.request('GET', '/v1/ephemerides')).status).toBe(401);
    expect((await svc.request('GET', '/v1/ephemerides', { token: svc.tokens.admin })).status).toBe(403);
    for (const role of ['reviewer', 'auditor'] as const) {
      expect((await svc.request('GET', '/v1/ephemerides', { token: svc.tokens[role] })).status).toBe(200);
    }
  });
});

describe('a problem choosing a set', () => {
  describe('when the set exists', () => {
    let planId: string;
    let plan: any;

    it('should be planned by the worker on the set\'s files, Monte Carlo fanned out on them too', async () => {
      const problem = problemOn('mission-a');
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
      expect(res.status).toBe(202);
      const end = await waitForJob(svc, res.body.jobId, (s) => s.state === 'completed' || s.state === 'failed', 180_000);
      expect(end.error).toBeNull();
      expect(end.state).toBe('completed');
      planId = end.result.planId;
      plan = (await svc.request('GET', `/v1/plans/${planId}`, { token: svc.tokens.reviewer })).body.plan;
      expect(plan.dispersion.monteCarlo.samples).toBe(60);
      // The same problem planned in this process on the same file, Monte Carlo in-process: the same plan.
      const local = await planManeuvers(parseProblem(problem), { monteCarlo: 'in-process', ephemerisFiles: await loadEphemerisFiles([marsPath]) });
      expect(plan).toEqual(JSON.parse(JSON.stringify(local)));
    }, 240_000);

    it('should record the file, its SHA-256 and span as Mars\'s source in the plan and its archive history', async () => {
      expect(plan.ephemerisSources.find((s: { body: string }) => s.body === 'mars')).toEqual({
        body: 'mars', source: 'oem', file: 'mars.oem', sha256: marsSha256,
        startTdb: '2031-02-26T00:00:00.000 TDB', endTdb: '2031-03-04T00:00:00.000 TDB',
      });
      expect(plan.ephemerisSources.find((s: { body: string }) => s.body === 'earth')).toMatchObject({ source: 'built-in' });
      const history = await svc.request('GET', `/v1/plans/${planId}/history`, { token: svc.tokens.auditor });
      expect(history.status).toBe(200);
      expect(JSON.stringify(history.body)).toContain(marsSha256);
      // The set's choice is part of the problem, and the file's identity part of its hash.
      const builtin = await planManeuvers(parseProblem(problemOn(undefined, 0)), { monteCarlo: 'skip' });
      expect(plan.problemHash).not.toBe(builtin.problemHash);
    });

    it('should export the plan as OEM on the set\'s files, and refuse once a file changed after start-up', async () => {
      const oem = await svc.request('GET', `/v1/plans/${planId}/ccsds/oem?stepS=600`, { token: svc.tokens.reviewer });
      expect(oem.status).toBe(200);
      expect(oem.text).toContain(`ephemeris mars: OEM mars.oem sha256 ${marsSha256}`);
      const original = readFileSync(marsPath, 'utf8');
      writeFileSync(marsPath, original.replace('ORIGINATOR = VEER-TEST', 'ORIGINATOR = VEER-TEST2'));
      try {
        const changed = await svc.request('GET', `/v1/plans/${planId}/ccsds/oem?stepS=600`, { token: svc.tokens.reviewer });
        expect(changed.status).toBe(400);
        expect(changed.body.error.message).toMatch(/mars\.oem changed since it was checked \(SHA-256 was [0-9a-f]{12}…, is now [0-9a-f]{12}…\)/);
      } finally {
        writeFileSync(marsPath, original); // the budget tests below plan on the file as checked at start-up
      }
    }, 120_000);
  });

  describe('when the set name is unknown', () => {
    it('should answer 400 naming body.problem.forceModel.ephemerisSet and the sets there are', async () => {
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problemOn('mission-b')) });
      expect(res.status).toBe(400);
      expect(res.body.error.issues).toEqual([{
        path: 'body.problem.forceModel.ephemerisSet',
        message: expect.stringMatching(/no ephemeris set 'mission-b' in this service \(sets: mission-a, too-short\)/),
      }]);
    });
  });

  describe('when the set\'s file does not cover the problem\'s span', () => {
    // Mars tabulated to 2031-03-01T00:00 TDB; the problem runs to 02:00 TDB. UTC = TDB − 69.184 s (37 s TAI − UTC
    // of the built-in table + 32.184 s TT − TAI; TDB − TT < 2 ms): common practice.
    const uncovered = 'mars-short\\.oem: mars is tabulated from 2031-02-26T00:00:00\\.000 TDB to 2031-03-01T00:00:00\\.000 TDB, '
      + 'which does not cover 2031-03-01T00:00:00\\.000 TDB to 2031-03-01T02:00:00\\.000 TDB '
      + '\\(2031-02-28T23:58:50\\.8\\d\\d UTC to 2031-03-01T01:58:50\\.8\\d\\d UTC\\).*never extrapolated';

    it('should answer 400 at submission naming the field, the file, the body and the uncovered epochs in TDB and UTC', async () => {
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problemOn('too-short', 0)) });
      expect(res.status).toBe(400);
      expect(res.body.error.issues).toEqual([{ path: 'body.problem.forceModel.ephemerisSet', message: expect.stringMatching(new RegExp(uncovered)) }]);
    });

    it('should accept the same set when the body it tabulates is not one the plan uses', async () => {
      const problem = problemOn('too-short', 0);
      problem.forceModel.perturbingBodies = [];
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
      expect(res.status).toBe(202);
      const end = await waitForJob(svc, res.body.jobId, (s) => s.state === 'completed' || s.state === 'failed', 120_000);
      expect(end.error).toBeNull();
      expect(end.state).toBe('completed');
    }, 150_000);

    it('should still be refused by the planner itself (the worker\'s second line), with the same words', async () => {
      const files = await loadEphemerisFiles([join(setsDir, 'too-short', 'mars-short.oem')]);
      await expect(planManeuvers(parseProblem(problemOn('too-short', 0)), { monteCarlo: 'skip', ephemerisFiles: files }))
        .rejects.toMatchObject({ name: 'OutOfSpanError', field: 'forceModel.ephemerisSet', message: expect.stringMatching(new RegExp(uncovered)) });
    });
  });
});

describe('a Δv budget whose problem chooses a set', () => {
  const diag = (p: number, v: number) => [0, 1, 2, 3, 4, 5].map((i) => [0, 1, 2, 3, 4, 5].map((k) => (i === k ? (i < 3 ? p : v) : 0)));
  /** One knowledge covariance for the one burn (1 km, 1 mm/s, 1σ): invented. */
  const budgetOn = (set: string) => ({
    problem: problemOn(set, 0), knowledge: [{ covarianceKmKmS: diag(1, 1e-12) }], linearSamples: 200, nonlinearSamples: 4, seed: 11,
  });
  const body = (request: Record<string, unknown>) => ({ request, reason: 'service test: Δv budget on the mission\'s ephemeris set' });

  it('should be studied by the workers on the set\'s files, recording them as Mars\'s source in the study', async () => {
    const request = budgetOn('mission-a');
    const res = await svc.request('POST', '/v1/budgets', { token: svc.tokens.submitter, body: body(request) });
    expect(res.status).toBe(202);
    const end = await waitForJob(svc, res.body.jobId, (s) => s.state === 'completed' || s.state === 'failed', 180_000, '/v1/budgets');
    expect(end.error).toBeNull();
    expect(end.state).toBe('completed');
    const study = (await svc.request('GET', `/v1/budgets/${res.body.jobId}/study`, { token: svc.tokens.reviewer })).body.study;
    expect(study.nonlinear.samples).toBe(4);
    expect(study.ephemerisSources.find((x: { body: string }) => x.body === 'mars')).toMatchObject({ source: 'oem', file: 'mars.oem', sha256: marsSha256 });
    // The same request studied in this process on the same file: the same study (sample i depends on (seed, i) only).
    const files = await loadEphemerisFiles([marsPath]);
    expect(files[0].sha256).toBe(marsSha256);
    const local = await runBudget(parseBudgetRequest(request), { ephemerisFiles: files });
    expect(study).toEqual(JSON.parse(JSON.stringify(local)));
    // On the built-in series the nominal plan's problem hashes differently: the file's identity is in the hash.
    const builtin = await planManeuvers(parseProblem(problemOn(undefined, 0)), { monteCarlo: 'skip' });
    expect(local.problemHash).not.toBe(builtin.problemHash);
  }, 240_000);

  it('should answer 400 at submission naming the field under body.request when the set does not cover the problem', async () => {
    const res = await svc.request('POST', '/v1/budgets', { token: svc.tokens.submitter, body: body(budgetOn('too-short')) });
    expect(res.status).toBe(400);
    expect(res.body.error.issues).toEqual([{
      path: 'body.request.problem.forceModel.ephemerisSet', message: expect.stringMatching(/mars-short\.oem: mars is tabulated from .* UTC\)/),
    }]);
  });
});

describe('start-up with a corrupt set', () => {
  it('should stop the API (and any worker) naming the variable, the set, the file, the line and the keyword', async () => {
    const dir = join(root, 'corrupt');
    const text = marsOemText('MARS', t0 - DAY_S, t0 + DAY_S, OFFSET_KM).replace('REF_FRAME = EME2000', 'REF_FRAME = NOT A FRAME');
    writeSet(dir, 'broken', 'mars.oem', text);
    const expected = /EPHEMERIS_DIR: set 'broken': REF_FRAME: line 9: .*broken\/mars\.oem: /;
    await expect(loadEphemerisSets(dir, BUILTIN_LEAP_SECONDS)).rejects.toThrow(expected);
    const config = loadApiConfig({ REDIS_URL: svc.redis.url, PORT: '0', HOST: '127.0.0.1', DATA_DIR: root, EPHEMERIS_DIR: dir });
    // Refused before anything is opened (Redis, archive, tokens): nothing to close.
    await expect(startApiServer(config, pino({ level: 'silent' }))).rejects.toThrow(expected);
    // A worker process (queue/worker-main.ts) with the same folder exits 2 with the same words.
    await expect(svc.startWorkerProcess({ EPHEMERIS_DIR: dir })).rejects.toThrow(/worker process exited \(2\)[\s\S]*EPHEMERIS_DIR: set 'broken': REF_FRAME: line 9: /);
  }, 120_000);

  it('should refuse a file that is not OEM by its name', async () => {
    const dir = join(root, 'stray');
    writeSet(dir, 'one', 'notes.md', 'not an ephemeris');
    await expect(loadEphemerisSets(dir, BUILTIN_LEAP_SECONDS)).rejects.toThrow(/set 'one' holds notes\.md, which is not a CCSDS OEM file/);
  });

  it('should log the sets it found with their files, SHA-256 and bodies', async () => {
    const lines: { msg: string; ephemerisSets: { name: string; files: { file: string; sha256: string; bodies: string[] }[] }[] }[] = [];
    const logger = pino({ level: 'info' }, { write: (line: string) => { lines.push(JSON.parse(line)); } });
    logEphemerisSetsAtStart(await loadEphemerisSets(setsDir, BUILTIN_LEAP_SECONDS), logger);
    logEphemerisSetsAtStart(await loadEphemerisSets(undefined, BUILTIN_LEAP_SECONDS), logger);
    expect(lines[0].msg).toBe('ephemeris sets: mission-a (mars); too-short (mars)');
    expect(lines[0].ephemerisSets[0].files[0]).toMatchObject({ file: 'mars.oem', bodies: ['mars'] });
    expect(lines[1].msg).toBe('ephemeris sets: none (built-in series only)');
  });
});
