/**
 * Reads never trust the plan table alone. With `archive_plans` edited to "approved" (no review entry), every
 * read and export of that plan answers 409 ARCHIVE_INCONSISTENT, listings show it as its entries say and
 * flag it, and `veer review` refuses to show it. Real Redis and SQLite archive (test/harness/service.ts);
 * PostgreSQL is covered at the store level by the archive conformance suite.
 */
import Database from 'better-sqlite3';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runVeer } from '../harness/run-cli.ts';
import { startService, type TestService } from '../harness/service.ts';
import { makePlan, PROBLEM } from '../archive/fixtures.ts';

let svc: TestService;
let planId: string;
let untouched: string;

beforeAll(async () => {
  svc = await startService();
  const archive = svc.archive!;
  for (const n of [1, 2]) {
    await archive.recordJobSubmitted({ jobId: `j${n}`, actor: 'alice', problem: { ...PROBLEM, n } });
    const { planId: id } = await archive.recordPlanProposed({ jobId: `j${n}`, actor: 'w', submittedBy: 'alice', plan: makePlan({ targetSetKey: `k${n}` }) });
    if (n === 1) planId = id; else untouched = id;
  }
  const db = new Database(join(svc.dataDir, 'archive.sqlite'));
  try {
    db.prepare("UPDATE archive_plans SET state = 'approved', decided_by = 'mallory', decided_at = '2031-01-01T00:00:00Z' WHERE plan_id = ?").run(planId);
  } finally {
    db.close();
  }
});
afterAll(async () => { await svc?.close(); });

describe('plan reads against an edited plan table', () => {
  describe('when a plan row was set to approved without a review entry', () => {
    it.each([
      ['the plan', () => `/v1/plans/${planId}`],
      ['its history', () => `/v1/plans/${planId}/history`],
      ['its bundle export', () => `/v1/plans/${planId}/export`],
      ['its CCSDS OPM export', () => `/v1/plans/${planId}/ccsds/opm`],
    ])('should answer 409 ARCHIVE_INCONSISTENT for %s', async (_what, path) => {
      const res = await svc.request('GET', path(), { token: svc.tokens.auditor });
      expect(res.status, res.text).toBe(409);
      expect(res.body.error.code).toBe('ARCHIVE_INCONSISTENT');
      expect(res.body.error.message).toContain(planId);
    });

    it('should list it as its entries say (proposed), flagged, even under ?state=approved', async () => {
      const res = await svc.request('GET', '/v1/plans?state=approved', { token: svc.tokens.reviewer });
      expect(res.status).toBe(200);
      const row = res.body.plans.find((p: { planId: string }) => p.planId === planId);
      expect(row).toMatchObject({ planId, state: 'proposed' });
      expect(row.inconsistency).toMatch(/disagrees with the archive entries/);
      const other = await svc.request('GET', `/v1/plans/${untouched}`, { token: svc.tokens.reviewer });
      expect([other.status, other.body.summary.inconsistency]).toEqual([200, undefined]);
    });

    it('should make veer review refuse to show it', async () => {
      const run = await runVeer(['review', planId, '--url', svc.url, '--token', svc.tokens.reviewer]);
      expect(run.code).toBe(2);
      expect(run.out).not.toMatch(/approved/i);
      expect(run.err).toMatch(/disagrees with the archive entries/);
    });
  });
});
