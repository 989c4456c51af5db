/**
 * The console's in-browser re-hash of archive entries (console/src/chain-check.ts, WebCrypto) against the
 * archive's own hashing (archive/chain.ts, node:crypto) — two digests over the one canonical JSON rule
 * (contract/canonical-json.ts, RFC 8785-style). Node 20 provides the same WebCrypto API as the browser.
 */
import { describe, expect, it } from 'vitest';
import { entryHash } from '../../archive/index.ts';
import { checkEntries } from '../../console/src/chain-check.ts';
import { canonicalJson } from '../../contract/index.ts';
import type { HistoryEntry } from '../../console/src/plan-types.ts';

function chain(): HistoryEntry[] {
  const entries: HistoryEntry[] = [];
  let previousHash = '0'.repeat(64);
  const payloads: Record<string, unknown>[] = [
    { reason: 'retarget after OD 42', problemHash: 'ab'.repeat(32), nested: { z: 1, a: [1.5, -0, 1e21, 'é'] } },
    { plan: { burns: [{ magnitudeMS: 5.772744162999, label: 'TCM-1' }] }, caveatCodes: ['PROPOSAL_REQUIRES_REVIEW'] },
    { decision: 'approve', comment: 'checked “twice”', acknowledgedCaveatCodes: ['PROPOSAL_REQUIRES_REVIEW'] },
  ];
  payloads.forEach((payload, i) => {
    const base = { sequence: i + 1, at: `2031-01-0${i + 1}T00:00:00.000Z`, actor: i === 2 ? 'rita' : 'sam', kind: ['job-submitted', 'plan-proposed', 'review'][i] as 'review', planId: i === 0 ? null : 'plan-1', jobId: 'j-1', payload, previousHash };
    const hash = entryHash(base);
    entries.push({ ...base, hash, hashMatches: true });
    previousHash = hash;
  });
  return entries;
}

describe('console chain check', () => {
  describe('when the entries are as the archive wrote them', () => {
    it('should recompute every hash the archive computed and find every adjacent link', async () => {
      const result = await checkEntries(chain());
      expect(result).toEqual([
        { sequence: 1, hashOk: true, linkOk: null },
        { sequence: 2, hashOk: true, linkOk: true },
        { sequence: 3, hashOk: true, linkOk: true },
      ]);
    });

    it('should sort keys and drop undefined members like the archive (RFC 8785 key order)', () => {
      expect(canonicalJson({ b: 1, a: { d: undefined, c: [true, null] }, A: 'x' })).toBe('{"A":"x","a":{"c":[true,null]},"b":1}');
    });
  });

  describe('when an entry was altered', () => {
    it('should flag a changed payload and a broken link', async () => {
      const entries = chain();
      entries[1] = { ...entries[1], payload: { ...entries[1].payload, caveatCodes: [] } };
      entries[2] = { ...entries[2], previousHash: 'f'.repeat(64) };
      const result = await checkEntries(entries);
      expect(result?.map((c) => c.hashOk)).toEqual([true, false, false]);
      expect(result?.[2].linkOk).toBe(false);
    });
  });
});
