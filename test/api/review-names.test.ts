/**
 * Identity names and the two-person rule (issue 6): token names are stored in lowercase, and the rule compares
 * names case-insensitively, so `Ann` cannot approve what `ann` submitted. Real SQLite token store in a temp folder.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { PlanRecord } from '../../archive/index.ts';
import { newTokenSchema, parseNewToken, SqliteTokenStore } from '../../api/auth/index.ts';
import { checkReviewRules, ReviewRuleError } from '../../api/review/review-rules.ts';

const PLAN: PlanRecord = {
  planId: 'plan-1', jobId: 'job-1', spacecraftName: 'Kestrel-7', targetSetKey: 'k', state: 'proposed', converged: true,
  crossCheckPassed: true, caveatCodes: ['PROPOSAL_REQUIRES_REVIEW'], submittedBy: 'ann', problemHash: 'a'.repeat(64),
  softwareVersion: 't', proposedAt: '2031-01-01T00:00:00.000Z', proposedSequence: 2, decidedAt: null, decidedBy: null,
  supersededBy: null, lastSequence: 2,
};

describe('identity names', () => {
  describe('when a token is created with capitals', () => {
    let dir: string;
    let store: SqliteTokenStore;
    beforeEach(() => {
      dir = mkdtempSync(join(tmpdir(), 'veer-names-'));
      store = new SqliteTokenStore(join(dir, 'tokens.sqlite'));
    });
    afterEach(async () => {
      await store.close();
      rmSync(dir, { recursive: true, force: true });
    });

    it('should store and identify it by its lowercase name', async () => {
      expect(parseNewToken({ name: 'Ann.Smith', roles: ['reviewer'] }).name).toBe('ann.smith');
      expect(newTokenSchema.parse({ name: 'BOB', roles: ['reviewer'] }).name).toBe('bob');
      const { token, record } = await store.add('Ann.Smith', ['reviewer']);
      expect(record.name).toBe('ann.smith');
      expect((await store.identify(token))?.name).toBe('ann.smith');
    });
  });

  describe('when the reviewer differs from the submitter only in case', () => {
    it('should refuse the approval under the two-person rule', () => {
      const approve = { planId: 'plan-1', decision: 'approve' as const, comment: '', acknowledgedCaveatCodes: ['PROPOSAL_REQUIRES_REVIEW'] };
      expect(() => checkReviewRules(PLAN, { ...approve, reviewer: 'ANN' })).toThrow(ReviewRuleError);
      expect(() => checkReviewRules({ ...PLAN, submittedBy: 'Ann' }, { ...approve, reviewer: 'ann' })).toThrow(/another reviewer must approve/);
      expect(() => checkReviewRules(PLAN, { ...approve, reviewer: 'bob' })).not.toThrow();
    });
  });
});
