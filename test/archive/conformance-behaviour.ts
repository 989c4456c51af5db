/**
 * Conformance suite, part 1: what every archive store must do (run against SQLite and PostgreSQL).
 * Expected hashes are recomputed independently with node:crypto over the documented canonical form.
 */
import { createHash } from 'node:crypto';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ArchiveConflictError, ArchiveNotFoundError, GENESIS_HASH, type PlanArchive } from '../../archive/index.ts';
import { makePlan, PROBLEM } from './fixtures.ts';
import type { StoreFactory, StoreHandle } from './store-handles.ts';

const CODES = ['PROPOSAL_REQUIRES_REVIEW', 'DISPERSION_LINEAR_ONLY'];

export function describeArchiveBehaviour(factory: StoreFactory): void {
  describe(`plan archive on ${factory.name}`, () => {
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

    async function propose(jobId: string, options: Parameters<typeof makePlan>[0] = {}, submittedBy = 'ann'): Promise<string> {
      await archive.recordJobSubmitted({ jobId, actor: submittedBy, problem: PROBLEM });
      return (await archive.recordPlanProposed({ jobId, actor: 'worker-1', submittedBy, plan: makePlan(options) })).planId;
    }

    describe('when a job records a study', () => {
      const study = { kind: 'delta-v-budget', problemHash: 'f'.repeat(64), softwareVersion: 'veer test', spacecraftName: 'Kestrel-7',
        caveats: [{ code: 'PROPOSAL_REQUIRES_REVIEW', severity: 'critical', text: 'review' }], totals: { p99MS: 7.3 } };
      it('should record it once, with no plan, and give it back whole', async () => {
        await archive.recordJobSubmitted({ jobId: 's1', actor: 'ann', problem: PROBLEM });
        const first = await archive.recordStudy({ jobId: 's1', actor: 'worker-1', submittedBy: 'ann', study });
        expect(first.created).toBe(true);
        expect(first.entries[0].kind).toBe('study-recorded');
        expect(first.entries[0].planId).toBeNull();
        const again = await archive.recordStudy({ jobId: 's1', actor: 'worker-2', submittedBy: 'ann', study });
        expect(again.created).toBe(false);
        expect(again.entries[0].sequence).toBe(first.entries[0].sequence);
        const stored = await archive.getStudyByJob('s1');
        expect(stored?.study).toEqual(study);
        expect(stored?.studyHash).toBe(createHash('sha256').update(JSON.stringify({
          caveats: study.caveats, kind: study.kind, problemHash: study.problemHash, softwareVersion: study.softwareVersion,
          spacecraftName: study.spacecraftName, totals: study.totals,
        })).digest('hex'));
        expect(await archive.getPlanByJob('s1')).toBeUndefined();
        expect((await archive.verify()).ok).toBe(true);
      });

      it('should refuse a study for a job that already failed', async () => {
        await archive.recordJobSubmitted({ jobId: 's2', actor: 'ann', problem: PROBLEM });
        await archive.recordJobFailed({ jobId: 's2', actor: 'worker-1', errorName: 'Error', message: 'x' });
        await expect(archive.recordStudy({ jobId: 's2', actor: 'worker-1', submittedBy: 'ann', study })).rejects.toBeInstanceOf(ArchiveConflictError);
        expect(await archive.getStudyByJob('s2')).toBeUndefined();
      });
    });

    describe('when entries are appended', () => {
      it('should chain them from the genesis hash with hashes over the canonical form', async () => {
        const first = (await archive.recordJobSubmitted({ jobId: 'j1', actor: 'ann', problem: { b: 2, a: [1.5, 'x'] } })).entries[0];
        expect(first.sequence).toBe(1);
        expect(first.previousHash).toBe(GENESIS_HASH);
        expect(first.at).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
        // Independent computation: keys sorted, no whitespace, SHA-256 over UTF-8 (contract/canonical-json.ts).
        const problemHash = createHash('sha256').update('{"a":[1.5,"x"],"b":2}').digest('hex');
        expect(first.payload.problemHash).toBe(problemHash);
        const payloadHash = createHash('sha256').update(`{"problem":{"a":[1.5,"x"],"b":2},"problemHash":"${problemHash}"}`).digest('hex');
        const canonical = `{"actor":"ann","at":"${first.at}","jobId":"j1","kind":"job-submitted","payloadHash":"${payloadHash}",`
          + `"planId":null,"previousHash":"${GENESIS_HASH}","sequence":1}`;
        expect(first.hash).toBe(createHash('sha256').update(canonical).digest('hex'));
        const second = (await archive.recordJobSubmitted({ jobId: 'j2', actor: 'ann', problem: PROBLEM })).entries[0];
        expect(second.sequence).toBe(2);
        expect(second.previousHash).toBe(first.hash);
        expect(await archive.head()).toEqual({ sequence: 2, hash: second.hash });
      });

      it('should keep the whole plan document, byte for byte as canonical JSON', async () => {
        const planId = await propose('j1');
        expect(await archive.getPlanDocument(planId)).toEqual(makePlan());
        const record = await archive.getPlan(planId);
        expect(record).toMatchObject({ state: 'proposed', converged: true, crossCheckPassed: true, caveatCodes: CODES, submittedBy: 'ann', jobId: 'j1' });
      });

      it('should refuse values JSON cannot carry faithfully, naming the path', async () => {
        await expect(archive.recordJobSubmitted({ jobId: 'j1', actor: 'ann', problem: { x: [1, Number.NaN] } }))
          .rejects.toThrow(/x\[1\]: non-finite number NaN/);
        expect((await archive.head()).sequence).toBe(0);
      });
    });

    describe('when a plan lacks what the review rules need', () => {
      it('should refuse it, naming the field, and append nothing', async () => {
        const bad = (patch: Record<string, unknown>) => archive.recordPlanProposed({ jobId: 'j1', actor: 'w', submittedBy: 'ann',
          plan: { ...makePlan(), ...patch } as ReturnType<typeof makePlan> });
        await expect(bad({ caveats: [] })).rejects.toThrow(/^plan\.caveats:/);
        await expect(bad({ status: 'done' })).rejects.toThrow(/^plan\.status:/);
        await expect(bad({ crossCheck: {} })).rejects.toThrow(/^plan\.crossCheck\.passed:/);
        await expect(bad({ caveats: [{ code: '', severity: 'info', text: 'x' }] })).rejects.toThrow(/^plan\.caveats\[0\]\.code:/);
        expect((await archive.head()).sequence).toBe(0);
      });
    });

    describe('when the same job is recorded twice', () => {
      it('should store its plan exactly once and return the first plan id', async () => {
        const planId = await propose('j1');
        const again = await archive.recordPlanProposed({ jobId: 'j1', actor: 'worker-2', submittedBy: 'ann', plan: makePlan() });
        expect(again).toMatchObject({ created: false, planId });
        expect((await archive.recordJobSubmitted({ jobId: 'j1', actor: 'ann', problem: PROBLEM })).created).toBe(false);
        const kinds = (await archive.entries()).map((e) => e.kind);
        expect(kinds).toEqual(['job-submitted', 'plan-proposed']);
      });

      it('should record at most one terminal entry per job', async () => {
        await archive.recordJobSubmitted({ jobId: 'j9', actor: 'ann', problem: PROBLEM });
        expect((await archive.recordJobFailed({ jobId: 'j9', actor: 'worker-1', errorName: 'InvalidInputError', message: 'targets.0: bad' })).created).toBe(true);
        expect((await archive.recordJobFailed({ jobId: 'j9', actor: 'worker-2', errorName: 'InvalidInputError', message: 'again' })).created).toBe(false);
        expect((await archive.recordJobCancelled({ jobId: 'j9', actor: 'bob' })).created).toBe(false);
        expect((await archive.getJob('j9'))?.state).toBe('failed');
        expect((await archive.entries()).map((e) => e.kind)).toEqual(['job-submitted', 'job-failed']);
      });
    });

    describe('when a plan arrives for a job that already ended', () => {
      it.each([['cancelled', 'job-cancelled'], ['failed', 'job-failed']] as const)('should refuse it for a %s job and append nothing', async (state, kind) => {
        await archive.recordJobSubmitted({ jobId: 'j-end', actor: 'ann', problem: PROBLEM });
        if (kind === 'job-cancelled') await archive.recordJobCancelled({ jobId: 'j-end', actor: 'ann', reason: 'no longer needed' });
        else await archive.recordJobFailed({ jobId: 'j-end', actor: 'worker-1', errorName: 'OutOfSpanError', message: 'endEpoch: outside' });
        const late = archive.recordPlanProposed({ jobId: 'j-end', actor: 'worker-1', submittedBy: 'ann', plan: makePlan() });
        await expect(late).rejects.toBeInstanceOf(ArchiveConflictError);
        await expect(late).rejects.toThrow(`job j-end was ${state}`);
        expect((await archive.entries()).map((e) => e.kind)).toEqual(['job-submitted', kind]);
        expect(await archive.getPlanByJob('j-end')).toBeUndefined();
        expect((await archive.getJob('j-end'))?.state).toBe(state);
      });
    });

    describe('when a newer plan arrives for the same spacecraft and target set', () => {
      it('should supersede the older proposed plan with its own entry', async () => {
        const older = await propose('j1');
        const newer = await archive.recordPlanProposed({ jobId: 'j2', actor: 'worker-1', submittedBy: 'ann', plan: makePlan() });
        expect(newer.superseded).toEqual([older]);
        expect(await archive.getPlan(older)).toMatchObject({ state: 'superseded', supersededBy: newer.planId });
        const entry = (await archive.history(older)).at(-1);
        expect(entry).toMatchObject({ kind: 'plan-superseded', planId: older, payload: { supersededBy: newer.planId } });
      });

      it('should leave decided plans, other target sets and other spacecraft alone', async () => {
        const decided = await propose('j1');
        await archive.recordReview({ planId: decided, reviewer: 'bob', decision: 'reject', comment: 'aim point too close', acknowledgedCaveatCodes: [] });
        const otherKey = await propose('j2', { targetSetKey: 'Kestrel-7|other' });
        const otherCraft = await propose('j3', { spacecraftName: 'Heron-2' });
        const newest = await archive.recordPlanProposed({ jobId: 'j4', actor: 'w', submittedBy: 'ann', plan: makePlan() });
        expect(newest.superseded).toEqual([]);
        expect((await archive.getPlan(decided))?.state).toBe('rejected');
        expect((await archive.getPlan(otherKey))?.state).toBe('proposed');
        expect((await archive.getPlan(otherCraft))?.state).toBe('proposed');
      });

      it('should not let a plan that can never be approved supersede a usable one', async () => {
        const usable = await propose('j1');
        const unconverged = await archive.recordPlanProposed({ jobId: 'j2', actor: 'w', submittedBy: 'ann', plan: makePlan({ status: 'not-converged' }) });
        expect(unconverged.superseded).toEqual([]);
        expect((await archive.getPlan(usable))?.state).toBe('proposed');
        expect(await archive.getPlan(unconverged.planId)).toMatchObject({ state: 'proposed', converged: false });
      });
    });

    describe('when a review is recorded', () => {
      it('should make the decision final', async () => {
        const planId = await propose('j1');
        const { plan } = await archive.recordReview({ planId, reviewer: 'bob', decision: 'approve', comment: '', acknowledgedCaveatCodes: CODES });
        expect(plan).toMatchObject({ state: 'approved', decidedBy: 'bob' });
        await expect(archive.recordReview({ planId, reviewer: 'cy', decision: 'reject', comment: 'late objection', acknowledgedCaveatCodes: [] }))
          .rejects.toBeInstanceOf(ArchiveConflictError);
        expect((await archive.getPlan(planId))?.state).toBe('approved');
      });

      it('should append nothing when the guard refuses', async () => {
        const planId = await propose('j1');
        const before = await archive.head();
        await expect(archive.recordReview({ planId, reviewer: 'bob', decision: 'approve', comment: '', acknowledgedCaveatCodes: [] },
          () => { throw new Error('refused by rule'); })).rejects.toThrow('refused by rule');
        expect(await archive.head()).toEqual(before);
        expect((await archive.getPlan(planId))?.state).toBe('proposed');
      });

      it('should answer not found for an unknown plan', async () => {
        await expect(archive.recordReview({ planId: 'plan-nope', reviewer: 'bob', decision: 'approve', comment: '', acknowledgedCaveatCodes: [] }))
          .rejects.toBeInstanceOf(ArchiveNotFoundError);
      });
    });

    describe('when plans are listed', () => {
      it('should filter by state, spacecraft, convergence and proposal time', async () => {
        let clock = Date.parse('2031-01-01T00:00:00Z');
        await archive.close();
        archive = await handle.open(() => new Date((clock += 3_600_000)));
        const a = await propose('j1', { spacecraftName: 'Heron-2', targetSetKey: 'h' });
        const b = await propose('j2', { targetSetKey: 'k1' });
        const c = await propose('j3', { targetSetKey: 'k2', status: 'not-converged' });
        await archive.recordReview({ planId: b, reviewer: 'bob', decision: 'approve', comment: '', acknowledgedCaveatCodes: CODES });
        const ids = async (f: Parameters<PlanArchive['listPlans']>[0]): Promise<string[]> => (await archive.listPlans(f)).map((p) => p.planId);
        expect(await ids({})).toEqual([c, b, a]);
        expect(await ids({ state: 'approved' })).toEqual([b]);
        expect(await ids({ spacecraftName: 'Heron-2' })).toEqual([a]);
        expect(await ids({ converged: false })).toEqual([c]);
        const bAt = (await archive.getPlan(b))!.proposedAt;
        expect(await ids({ from: bAt })).toEqual([c, b]);
        expect(await ids({ to: bAt })).toEqual([a]);
        expect(await ids({ limit: 1, offset: 1 })).toEqual([b]);
      });
    });

    describe('when the store is closed and opened again', () => {
      it('should keep every entry and plan, and verify', async () => {
        const planId = await propose('j1');
        const head = await archive.head();
        await archive.close();
        archive = await handle.open();
        expect(await archive.head()).toEqual(head);
        expect((await archive.getPlan(planId))?.state).toBe('proposed');
        expect((await archive.verify()).ok).toBe(true);
      });
    });
  });
}
