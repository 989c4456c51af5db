/**
 * Conformance suite, part 2: tamper evidence and concurrency, against real databases and real processes.
 */
import { execFile } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ArchiveConflictError, ArchiveIntegrityError, canonicalJson, entryHash, type PlanArchive, type PlanRecord, type RecordReviewInput } from '../../archive/index.ts';
import { makePlan, PROBLEM, type PlanOptions } from './fixtures.ts';
import type { StoreFactory, StoreHandle } from './store-handles.ts';

const run = promisify(execFile);
const CHILD = fileURLToPath(new URL('./archive-child.ts', import.meta.url));

export function describeArchiveIntegrity(factory: StoreFactory): void {
  describe(`plan archive integrity on ${factory.name}`, () => {
    let handle: StoreHandle;
    let archive: PlanArchive;
    beforeEach(async () => {
      handle = await factory.create();
      archive = await handle.open();
    });
    afterEach(async () => {
      await archive.close();
      await handle.dispose();
    });

    /** Six entries: three jobs each submitted and proposed (different target sets, so nothing is superseded). */
    async function fill(): Promise<string[]> {
      const ids: string[] = [];
      for (let i = 1; i <= 3; i += 1) {
        await archive.recordJobSubmitted({ jobId: `j${i}`, actor: 'ann', problem: { ...PROBLEM, i } });
        ids.push((await archive.recordPlanProposed({ jobId: `j${i}`, actor: 'w', submittedBy: 'ann', plan: makePlan({ targetSetKey: `k${i}` }) })).planId);
      }
      return ids;
    }

    describe('when nobody has touched the database', () => {
      it('should verify the whole chain', async () => {
        await fill();
        const report = await archive.verify();
        expect(report).toMatchObject({ ok: true, entriesChecked: 6, firstFailure: null, projectionMismatches: [] });
        expect(await handle.verifyReadOnly()).toMatchObject({ ok: true, entriesChecked: 6, head: report.head });
        expect(report.head.sequence).toBe(6);
      });
    });

    describe('when a stored row is changed or removed through the application database', () => {
      it('should refuse UPDATE and DELETE on entries while the append-only guards are in place', async () => {
        await fill();
        await expect(handle.sql("UPDATE archive_entries SET actor = 'mallory' WHERE sequence = 2")).rejects.toThrow(/append-only/);
        await expect(handle.sql('DELETE FROM archive_entries WHERE sequence = 2')).rejects.toThrow(/append-only/);
        expect((await archive.verify()).ok).toBe(true);
      });
    });

    describe('when someone edits the database by hand', () => {
      it('should name the entry whose payload was changed', async () => {
        await fill();
        for (const s of handle.dropGuardsSql) await handle.sql(s);
        await handle.sql("UPDATE archive_entries SET payload = REPLACE(payload, '1.27', '0.27') WHERE sequence = 4");
        const report = await archive.verify();
        expect(report.ok).toBe(false);
        expect(report.firstFailure).toMatchObject({ sequence: 4, reason: 'hash-mismatch' });
        expect(report.lastGoodSequence).toBe(3);
        const readOnly = await handle.verifyReadOnly();
        expect(readOnly).toMatchObject({ ok: false, firstFailure: { sequence: 4, reason: 'hash-mismatch' }, lastGoodSequence: 3 });
      });

      it('should name an entry whose stored hash was overwritten with another value', async () => {
        await fill();
        for (const s of handle.dropGuardsSql) await handle.sql(s);
        await handle.sql("UPDATE archive_entries SET actor = 'mallory', hash = '" + 'f'.repeat(64) + "' WHERE sequence = 3");
        const report = await archive.verify();
        expect(report.firstFailure).toMatchObject({ sequence: 3, reason: 'hash-mismatch' });
      });

      it('should name an entry whose payload was changed and its hash correctly recomputed (its successor no longer points at it)', async () => {
        await fill();
        for (const s of handle.dropGuardsSql) await handle.sql(s);
        const [original] = await archive.entries(3, 1);
        const payload = { ...original.payload, problem: { ...(original.payload.problem as object), note: 'edited afterwards' } };
        const rehashed = entryHash({ ...original, payload });
        const quoted = canonicalJson(payload).replace(/'/g, "''");
        await handle.sql(`UPDATE archive_entries SET payload = '${quoted}', hash = '${rehashed}' WHERE sequence = 3`);
        const report = await archive.verify();
        expect(report.ok).toBe(false);
        expect(report.firstFailure).toMatchObject({ sequence: 4, reason: 'previous-hash-mismatch', likelyEditedSequence: 3 });
        expect(report.firstFailure?.message).toContain('entry 3 was most likely edited and its hash recomputed');
        expect(report.firstFailure?.message).toContain('the mismatch was seen at entry 4');
      });

      it('should name a deleted entry as missing', async () => {
        await fill();
        for (const s of handle.dropGuardsSql) await handle.sql(s);
        await handle.sql('DELETE FROM archive_entries WHERE sequence = 2');
        expect((await archive.verify()).firstFailure).toMatchObject({ sequence: 2, reason: 'missing-entry' });
      });

      it('should notice the newest entry removed (the head still names it)', async () => {
        await fill();
        for (const s of handle.dropGuardsSql) await handle.sql(s);
        await handle.sql('DELETE FROM archive_entries WHERE sequence = 6');
        expect((await archive.verify()).firstFailure).toMatchObject({ sequence: 6, reason: 'missing-entry' });
      });

      it('should fail a recorded head once the newest entries are cut and others appended (a cut alone too)', async () => {
        const [, , plan3] = await fill();
        const recorded = (await archive.verify()).head; // entry 6: job j3's plan
        const entry4 = (await archive.entries(4, 1))[0]!;
        for (const s of handle.dropGuardsSql) await handle.sql(s);
        // Cut entries 5 and 6 with every trace of them, so the store alone looks whole.
        await handle.sql('DELETE FROM archive_entries WHERE sequence >= 5');
        await handle.sql(`UPDATE archive_head SET sequence = 4, hash = '${entry4.hash}'`);
        await handle.sql(`DELETE FROM archive_plans WHERE plan_id = '${plan3}'`);
        await handle.sql("DELETE FROM archive_jobs WHERE job_id = 'j3'");
        const cut = await archive.verify({ expectHead: recorded });
        expect(cut).toMatchObject({ ok: false, firstFailure: null, projectionMismatches: [] });
        expect(cut.expectedHead).toEqual({ ...recorded, found: null, matches: false });
        await archive.recordJobSubmitted({ jobId: 'j9', actor: 'mallory', problem: { ...PROBLEM, i: 9 } });
        await archive.recordPlanProposed({ jobId: 'j9', actor: 'w', submittedBy: 'mallory', plan: makePlan({ targetSetKey: 'k9' }) });
        // Without the recorded head the chain is sound again; with it, entry 6 differs.
        expect((await archive.verify()).ok).toBe(true);
        for (const report of [await archive.verify({ expectHead: recorded }), await handle.verifyReadOnly({ expectHead: recorded })]) {
          expect(report.ok).toBe(false);
          expect(report.head.sequence).toBe(6);
          expect(report.expectedHead).toMatchObject({ ...recorded, matches: false });
          expect(report.expectedHead?.found).toMatch(/^[0-9a-f]{64}$/);
          expect(report.expectedHead?.found).not.toBe(recorded.hash);
        }
      });

      it('should pass a recorded head that is still in the chain, unchanged, after later appends', async () => {
        await fill();
        const recorded = (await archive.verify()).head;
        await archive.recordJobSubmitted({ jobId: 'j7', actor: 'ann', problem: { ...PROBLEM, i: 7 } });
        const report = await handle.verifyReadOnly({ expectHead: recorded });
        expect(report).toMatchObject({ ok: true, expectedHead: { ...recorded, found: recorded.hash, matches: true } });
      });

      it('should refuse to read a plan whose table row was edited, and flag it in listings as its entries say', async () => {
        const [planId] = await fill();
        await handle.sql(`UPDATE archive_plans SET state = 'approved', decided_by = 'mallory' WHERE plan_id = '${planId}'`);
        await expect(archive.getPlan(planId)).rejects.toMatchObject({ name: 'ArchiveIntegrityError', code: 'ARCHIVE_INCONSISTENT' });
        await expect(archive.history(planId)).rejects.toMatchObject({ name: 'ArchiveIntegrityError' });
        const listed = (await archive.listPlans({ state: 'approved' })).find((p) => p.planId === planId);
        expect(listed).toMatchObject({ planId, state: 'proposed', decidedBy: null });
        expect(listed?.inconsistency).toMatch(/state .*disagrees with the archive entries/);
        expect((await archive.listPlans({})).filter((p) => p.inconsistency)).toHaveLength(1);
      });

      it('should report a plan state changed in the projection table', async () => {
        const [planId] = await fill();
        await handle.sql(`UPDATE archive_plans SET state = 'approved', decided_by = 'mallory' WHERE plan_id = '${planId}'`);
        const report = await archive.verify();
        expect(report.ok).toBe(false);
        expect(report.firstFailure).toBeNull();
        expect(report.projectionMismatches).toEqual(expect.arrayContaining([
          { planId, field: 'state', derived: 'proposed', stored: 'approved' },
          { planId, field: 'decidedBy', derived: null, stored: 'mallory' },
        ]));
      });
    });

    describe('when the plan table is edited to get an approval through', () => {
      /** A guard like the review rules': refuses what the plan record says is unapprovable or self-approved. */
      const guard = (plan: PlanRecord, input: RecordReviewInput): void => {
        if (input.reviewer === plan.submittedBy || !plan.converged || !plan.crossCheckPassed) throw new Error('refused by the rules');
        if (plan.caveatCodes.some((c) => !input.acknowledgedCaveatCodes.includes(c))) throw new Error('caveats not acknowledged');
      };
      // Each edit alone would make the guard above pass for this reviewer with no caveats acknowledged.
      const cases: Array<[string, string, PlanOptions, string]> = [
        ['a not-converged plan marked converged', 'converged = 1, cross_check_passed = 1', { status: 'not-converged' }, 'bob'],
        ['a failed cross-check marked passed', 'cross_check_passed = 1', { crossCheckPassed: false }, 'bob'],
        ['the caveat codes emptied', `caveat_codes = '[]'`, {}, 'bob'],
        ['the submitter renamed (two-person rule)', `submitted_by = 'someone-else'`, {}, 'ann'],
      ];
      it.each(cases)('should refuse the review when %s, and append nothing', async (_label, assignment, options, reviewer) => {
        await archive.recordJobSubmitted({ jobId: 'jt', actor: 'ann', problem: PROBLEM });
        const { planId } = await archive.recordPlanProposed({ jobId: 'jt', actor: 'w', submittedBy: 'ann', plan: makePlan(options) });
        const sqlAssignment = handle.location.startsWith('sqlite:') ? assignment : assignment.replace(/= 1/g, '= true');
        await handle.sql(`UPDATE archive_plans SET ${sqlAssignment} WHERE plan_id = '${planId}'`);
        const before = await archive.head();
        await expect(archive.recordReview({ planId, reviewer, decision: 'approve', comment: '', acknowledgedCaveatCodes: [] }, guard))
          .rejects.toBeInstanceOf(ArchiveIntegrityError);
        expect(await archive.head()).toEqual(before);
        // The edited row stays unreadable until repaired: no read passes it off as approvable.
        await expect(archive.getPlan(planId)).rejects.toBeInstanceOf(ArchiveIntegrityError);
      });
    });

    describe('when four processes append at the same time', () => {
      it('should keep one unbroken chain with every entry', async () => {
        const perProcess = 12;
        const outputs = await Promise.all([0, 1, 2, 3].map((i) =>
          run(process.execPath, ['--import', 'tsx', CHILD, 'append', handle.location, String(i), String(perProcess)], { timeout: 60_000 })));
        const planIds = outputs.flatMap((o) => (JSON.parse(o.stdout.trim()) as { planIds: string[] }).planIds);
        expect(new Set(planIds).size).toBe(4 * perProcess);
        const report = await archive.verify();
        expect(report.firstFailure).toBeNull();
        expect(report.ok).toBe(true);
        const entries = await archive.entries(1, 1000);
        expect(entries.map((e) => e.sequence)).toEqual(Array.from({ length: entries.length }, (_, i) => i + 1));
        expect(entries.filter((e) => e.kind === 'plan-proposed')).toHaveLength(4 * perProcess);
        // Supersession raced too: exactly one proposed plan is left per target-set key.
        for (const key of ['key-0', 'key-1', 'key-2']) {
          const open = (await archive.listPlans({ state: 'proposed', limit: 1000 })).filter((p) => p.targetSetKey === key);
          expect(open, key).toHaveLength(1);
        }
      });
    });

    describe('when two reviewers decide the same plan at once', () => {
      it('should let exactly one win and refuse the other with a conflict', async () => {
        const [planId] = await fill();
        const second = await handle.open();
        try {
          const results = await Promise.allSettled([
            archive.recordReview({ planId, reviewer: 'bob', decision: 'approve', comment: '', acknowledgedCaveatCodes: [] }),
            second.recordReview({ planId, reviewer: 'cy', decision: 'reject', comment: 'no', acknowledgedCaveatCodes: [] }),
          ]);
          const won = results.filter((r) => r.status === 'fulfilled');
          const lost = results.filter((r): r is PromiseRejectedResult => r.status === 'rejected');
          expect(won).toHaveLength(1);
          expect(lost).toHaveLength(1);
          expect(lost[0].reason).toBeInstanceOf(ArchiveConflictError);
          expect((await archive.history(planId)).filter((e) => e.kind === 'review')).toHaveLength(1);
        } finally {
          await second.close();
        }
      });

      it('should let exactly one of several processes win', async () => {
        const [planId] = await fill();
        const startAt = String(Date.now() + 2500);
        const outputs = await Promise.all(['bob', 'cy', 'dee'].map((reviewer) =>
          run(process.execPath, ['--import', 'tsx', CHILD, 'review', handle.location, planId, reviewer, startAt], { timeout: 60_000 })));
        const answers = outputs.map((o) => JSON.parse(o.stdout.trim()) as { ok?: boolean; error?: string });
        expect(answers.filter((a) => a.ok)).toHaveLength(1);
        expect(answers.filter((a) => a.error === 'ArchiveConflictError')).toHaveLength(2);
        expect((await archive.history(planId)).filter((e) => e.kind === 'review')).toHaveLength(1);
        expect((await archive.verify()).ok).toBe(true);
      });
    });
  });
}
