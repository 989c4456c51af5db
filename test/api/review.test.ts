/**
 * Review rules over HTTP (fetch against a real server on a free port), on both stores: two-person rule,
 * caveat acknowledgement, unapprovable plans, final decisions, supersession, concurrent reviews, export
 * bundles, verification after tampering, and a restart. Rules are the project's own (issue 6); the hash
 * checks use SHA-256 from node:crypto (FIPS 180-4).
 */
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { checkPlanBundle, type PlanBundle } from '../../archive/index.ts';
import { makePlan, PROBLEM, type PlanOptions } from '../archive/fixtures.ts';
import { postgresLocation, sqliteLocation, startTestApi, type StoreLocation, type TestApi } from '../archive/http-app.ts';
import { startPostgres, type TestPostgres } from '../harness/postgres.ts';
import Database from 'better-sqlite3';
import pg from 'pg';
import { join } from 'node:path';

const CODES = ['PROPOSAL_REQUIRES_REVIEW', 'DISPERSION_LINEAR_ONLY'];
let server: TestPostgres;
beforeAll(async () => { server = await startPostgres(); });
afterAll(async () => { await server?.stop(); });

const stores: Array<[string, () => Promise<StoreLocation>]> = [
  ['SQLite', async () => sqliteLocation()],
  ['PostgreSQL', () => postgresLocation(server)],
];

async function rawSql(location: StoreLocation, statement: string): Promise<void> {
  if (location.databaseUrl) {
    const client = new pg.Client({ connectionString: location.databaseUrl });
    await client.connect();
    try { await client.query(statement); } finally { await client.end(); }
  } else {
    const db = new Database(join(location.dataDir!, 'archive.sqlite'));
    try { db.exec(statement); } finally { db.close(); }
  }
}

describe.each(stores)('plan review over HTTP on %s', (_name, makeLocation) => {
  let location: StoreLocation;
  let api: TestApi;
  let ann: string; // submitter and reviewer
  let bob: string; // reviewer
  let cy: string; // reviewer
  let audrey: string; // auditor
  let jobCounter = 0;

  beforeEach(async () => {
    location = await makeLocation();
    api = await startTestApi(location);
    ann = await api.token('ann', ['submitter', 'reviewer']);
    bob = await api.token('bob', ['reviewer']);
    cy = await api.token('cy', ['reviewer']);
    audrey = await api.token('audrey', ['auditor']);
  });
  afterEach(async () => {
    await api.close();
    await location.dispose();
  });

  /** What the API and the worker record for a job: its submission by ann, then its proposed plan. */
  async function propose(options: PlanOptions = {}): Promise<string> {
    const jobId = `job-${(jobCounter += 1)}`;
    await api.archive.recordJobSubmitted({ jobId, actor: 'ann', problem: PROBLEM });
    return (await api.archive.recordPlanProposed({ jobId, actor: 'worker-1', submittedBy: 'ann', plan: makePlan(options) })).planId;
  }
  const review = (planId: string, token: string, body: unknown) => api.call('POST', `/v1/plans/${planId}/reviews`, token, body);
  const approve = { decision: 'approve', acknowledgedCaveatCodes: CODES };

  describe('when the submitter tries to approve their own job\'s plan', () => {
    it('should refuse with 403 and let another reviewer approve', async () => {
      const planId = await propose();
      const own = await review(planId, ann, approve);
      expect(own.status).toBe(403);
      expect(own.body.error.code).toBe('TWO_PERSON_RULE');
      const other = await review(planId, bob, { ...approve, comment: 'aim point and dispersion checked' });
      expect(other.status).toBe(201);
      expect(other.body.plan).toMatchObject({ state: 'approved', decidedBy: 'bob' });
      expect(other.body.entry).toMatchObject({ kind: 'review', actor: 'bob', payload: { decision: 'approve', acknowledgedCaveatCodes: CODES } });
      expect(other.body.notice).toMatch(/PROPOSAL ONLY/);
    });

    it('should let the submitter reject it (the rule guards approval only)', async () => {
      const planId = await propose();
      expect((await review(planId, ann, { decision: 'reject', comment: 'submitted with the wrong arrival epoch' })).status).toBe(201);
    });
  });

  describe('when caveats are acknowledged', () => {
    it('should list the missing codes', async () => {
      const planId = await propose();
      const res = await review(planId, bob, { decision: 'approve', acknowledgedCaveatCodes: ['PROPOSAL_REQUIRES_REVIEW'] });
      expect(res.status).toBe(422);
      expect(res.body.error).toMatchObject({ code: 'CAVEATS_NOT_ACKNOWLEDGED', missing: ['DISPERSION_LINEAR_ONLY'], unknown: [] });
      expect(res.body.error.issues[0].path).toBe('body.acknowledgedCaveatCodes');
    });

    it('should list unknown codes', async () => {
      const planId = await propose();
      const res = await review(planId, bob, { decision: 'approve', acknowledgedCaveatCodes: [...CODES, 'NOT_A_CAVEAT'] });
      expect(res.status).toBe(422);
      expect(res.body.error).toMatchObject({ missing: [], unknown: ['NOT_A_CAVEAT'] });
    });

    it('should approve with exactly the plan\'s codes, in any order', async () => {
      const planId = await propose();
      expect((await review(planId, bob, { decision: 'approve', acknowledgedCaveatCodes: [...CODES].reverse() })).status).toBe(201);
    });
  });

  describe('when a plan can never be approved', () => {
    it('should refuse a plan that did not converge', async () => {
      const planId = await propose({ status: 'not-converged' });
      const res = await review(planId, bob, approve);
      expect(res.status).toBe(422);
      expect(res.body.error.code).toBe('PLAN_NOT_APPROVABLE');
      expect((await review(planId, bob, { decision: 'reject', comment: 'did not converge' })).status).toBe(201);
    });

    it('should refuse a plan whose cross-check failed', async () => {
      const planId = await propose({ crossCheckPassed: false });
      const res = await review(planId, bob, approve);
      expect(res.status).toBe(422);
      expect(res.body.error.message).toMatch(/cross-check/);
    });
  });

  describe('when the body is invalid', () => {
    it('should need a comment to reject, naming the field', async () => {
      const planId = await propose();
      const res = await review(planId, bob, { decision: 'reject' });
      expect(res.status).toBe(400);
      expect(res.body.error.issues).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'body.comment' })]));
    });

    it('should name every bad field', async () => {
      const planId = await propose();
      const res = await review(planId, bob, { decision: 'maybe', acknowledgedCaveatCodes: ['lower case'], extra: 1 });
      expect(res.status).toBe(400);
      const paths = res.body.error.issues.map((i: { path: string }) => i.path);
      expect(paths).toEqual(expect.arrayContaining(['body.decision', 'body.acknowledgedCaveatCodes[0]']));
    });

    it('should answer 404 for an unknown plan', async () => {
      expect((await review('plan-unknown', bob, approve)).status).toBe(404);
    });
  });

  describe('when a decision has been made', () => {
    it('should be final (409)', async () => {
      const planId = await propose();
      expect((await review(planId, bob, approve)).status).toBe(201);
      const again = await review(planId, cy, { decision: 'reject', comment: 'second thoughts' });
      expect(again.status).toBe(409);
      expect(again.body.error.currentState).toBe('approved');
    });

    it('should let exactly one of two concurrent reviews win; the other gets 409', async () => {
      for (let round = 0; round < 3; round += 1) {
        const planId = await propose({ targetSetKey: `race-${round}` });
        const answers = await Promise.all([review(planId, bob, approve), review(planId, cy, { decision: 'reject', comment: 'race' })]);
        expect(answers.map((a) => a.status).sort()).toEqual([201, 409]);
        const history = await api.call('GET', `/v1/plans/${planId}/history`, audrey);
        expect(history.body.entries.filter((e: { kind: string }) => e.kind === 'review')).toHaveLength(1);
      }
    });
  });

  describe('when a newer plan for the same spacecraft and target set arrives', () => {
    it('should supersede the older one, which can no longer be reviewed', async () => {
      const older = await propose();
      const newer = await propose();
      const history = await api.call('GET', `/v1/plans/${older}/history`, bob);
      expect(history.status).toBe(200);
      expect(history.body.plan).toMatchObject({ state: 'superseded', supersededBy: newer });
      expect(history.body.entries.map((e: { kind: string }) => e.kind)).toEqual(['job-submitted', 'plan-proposed', 'plan-superseded']);
      expect(history.body.entries.every((e: { hashMatches: boolean }) => e.hashMatches)).toBe(true);
      expect((await review(older, bob, approve)).status).toBe(409);
      const listed = await api.call('GET', '/v1/plans?state=superseded', bob);
      expect(listed.body.plans.map((p: { planId: string }) => p.planId)).toEqual([older]);
    });
  });

  describe('when a plan is exported', () => {
    it('should give a bundle that checks offline, and name an entry changed in it', async () => {
      const planId = await propose();
      await propose({ targetSetKey: 'other' });
      await review(planId, bob, approve);
      const res = await api.call('GET', `/v1/plans/${planId}/export?toHead=true`, audrey);
      expect(res.status).toBe(200);
      expect(res.headers.get('content-disposition')).toContain(`${planId}-bundle.json`);
      const bundle = res.body as PlanBundle;
      expect(bundle.entries.map((e) => e.kind)).toEqual(['job-submitted', 'plan-proposed', 'review']);
      expect(bundle.chain.map((h) => h.sequence)).toEqual([1, 2, 3, 4, 5]);
      expect(checkPlanBundle(bundle)).toMatchObject({ ok: true, entriesChecked: 3, reachesHead: true });
      const forged = structuredClone(bundle);
      (forged.entries[2].payload as { decision: string }).decision = 'reject';
      expect(checkPlanBundle(forged).firstFailure).toMatchObject({ sequence: 5, reason: 'hash-mismatch' });
    });
  });

  describe('when an auditor verifies the archive', () => {
    it('should report a sound chain, then name the entry changed directly in the database', async () => {
      const planId = await propose();
      await review(planId, bob, approve);
      const sound = await api.call('GET', '/v1/archive/verify', audrey);
      expect(sound.status).toBe(200);
      expect(sound.body).toMatchObject({ ok: true, entriesChecked: 3, firstFailure: null, verifiedBy: 'audrey' });
      const drop = location.databaseUrl ? 'DROP TRIGGER archive_entries_no_change ON archive_entries' : 'DROP TRIGGER archive_entries_no_update';
      await rawSql(location, drop);
      await rawSql(location, "UPDATE archive_entries SET actor = 'mallory' WHERE sequence = 3");
      const broken = await api.call('GET', '/v1/archive/verify', audrey);
      expect(broken.body.ok).toBe(false);
      expect(broken.body.firstFailure).toMatchObject({ sequence: 3, reason: 'hash-mismatch' });
    });
  });

  describe('when the API restarts', () => {
    it('should keep plans, decisions, tokens and a sound chain', async () => {
      const planId = await propose();
      await review(planId, bob, approve);
      await api.close();
      api = await startTestApi(location);
      const history = await api.call('GET', `/v1/plans/${planId}/history`, bob);
      expect(history.body.plan.state).toBe('approved');
      expect((await api.call('GET', '/v1/archive/verify', audrey)).body.ok).toBe(true);
    });
  });
});
