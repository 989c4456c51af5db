/**
 * Offline bundle checks (archive/bundle.ts) against a real SQLite archive: a bundle as exported checks out; a
 * bundle edited to hide a rejection (entry removed, planRecord.state changed) does not. The hashes are SHA-256
 * from node:crypto (FIPS 180-4); the rules (every entry about the plan present, state re-derived) are ours (issue 6).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { buildPlanBundle, checkPlanBundle, SqliteArchive, type PlanBundle } from '../../archive/index.ts';
import { makePlan, PROBLEM } from './fixtures.ts';

describe('plan bundle check', () => {
  let dir: string;
  let archive: SqliteArchive;
  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), 'veer-bundle-'));
    archive = new SqliteArchive({ file: join(dir, 'archive.sqlite') });
  });
  afterEach(async () => {
    await archive.close();
    rmSync(dir, { recursive: true, force: true });
  });

  /** A rejected plan (entries 1..3), then another job's entries (4..5), exported up to the head. */
  async function rejectedBundle(): Promise<PlanBundle> {
    await archive.recordJobSubmitted({ jobId: 'j1', actor: 'ann', problem: PROBLEM });
    const { planId } = await archive.recordPlanProposed({ jobId: 'j1', actor: 'w', submittedBy: 'ann', plan: makePlan() });
    await archive.recordReview({ planId, reviewer: 'bob', decision: 'reject', comment: 'aim point off', acknowledgedCaveatCodes: [] });
    await archive.recordJobSubmitted({ jobId: 'j2', actor: 'ann', problem: { ...PROBLEM, n: 2 } });
    await archive.recordPlanProposed({ jobId: 'j2', actor: 'w', submittedBy: 'ann', plan: makePlan({ targetSetKey: 'other' }) });
    return buildPlanBundle(archive, planId, { notice: 'proposal only', exportedBy: 'audrey', toHead: true });
  }

  describe('when the bundle is as exported', () => {
    it('should check out and report the head it claims', async () => {
      const bundle = await rejectedBundle();
      const check = checkPlanBundle(bundle);
      expect(check).toMatchObject({ ok: true, entriesChecked: 3, headersChecked: 5, reachesHead: true, firstFailure: null });
      expect(check.head).toEqual(await archive.head());
    });
  });

  describe('when a rejection is cut out and the record turned into an approval', () => {
    it('should name the missing review entry', async () => {
      const forged = structuredClone(await rejectedBundle());
      forged.entries = forged.entries.filter((e) => e.kind !== 'review');
      forged.planRecord = { ...forged.planRecord, state: 'approved', decidedBy: 'bob' };
      expect(checkPlanBundle(forged)).toMatchObject({ ok: false, firstFailure: { sequence: 3, reason: 'missing-entry' } });
    });

    it('should refuse a plan record whose state the entries do not support', async () => {
      const forged = structuredClone(await rejectedBundle());
      forged.planRecord = { ...forged.planRecord, state: 'approved' };
      const check = checkPlanBundle(forged);
      expect(check.ok).toBe(false);
      expect(check.firstFailure).toMatchObject({ reason: 'plan-record-mismatch' });
      expect(check.firstFailure?.message).toContain('planRecord.state is "approved" but the entries say "rejected"');
    });

    it('should refuse a bundle that carries an entry about another plan', async () => {
      const bundle = await rejectedBundle();
      const forged = structuredClone(bundle);
      forged.entries.push((await archive.entries(5, 1))[0]);
      expect(checkPlanBundle(forged).firstFailure).toMatchObject({ sequence: 5, reason: 'foreign-entry' });
    });
  });

  describe('when the chain headers and the review entry are cut off together', () => {
    it('should still pass offline (undetectable without the live head) but show a different head than the archive', async () => {
      const bundle = await rejectedBundle();
      const truncated = structuredClone(bundle);
      truncated.entries = truncated.entries.filter((e) => e.kind !== 'review');
      truncated.chain = truncated.chain.filter((h) => h.sequence < 3);
      truncated.head = { sequence: 2, hash: truncated.chain[1].hash };
      truncated.planRecord = { ...truncated.planRecord, state: 'proposed', decidedBy: null, decidedAt: null, lastSequence: 2 };
      const check = checkPlanBundle(truncated);
      expect(check.ok).toBe(true);
      expect(check.head?.hash).not.toBe((await archive.head()).hash);
    });
  });
});
