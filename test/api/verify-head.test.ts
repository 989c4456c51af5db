/**
 * A recorded head, compared later: `veer verify --expect-head SEQ:HASH` and `GET /v1/archive/verify?expectHead=`.
 * The newest entries are cut and others appended (with the projection rows cleaned up, so the store alone looks
 * sound); only the comparison with the recorded head shows it. Text mode prints the head on success and on
 * failure. The SQLite archive and token files are created mode 0600 (owner only). Real Redis and SQLite store
 * through test/harness/service.ts.
 */
import Database from 'better-sqlite3';
import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runVeer } from '../harness/run-cli.ts';
import { startService, type TestService } from '../harness/service.ts';
import { makePlan, PROBLEM } from '../archive/fixtures.ts';

let svc: TestService;
beforeAll(async () => { svc = await startService(); });
afterAll(async () => { await svc?.close(); });

const HEAD_LINE = /head (\d+) ([0-9a-f]{64})/;
const verify = (...args: string[]) => runVeer(['verify', '--url', svc.url, '--token', svc.tokens.auditor, ...args]);

async function propose(n: number): Promise<string> {
  const archive = svc.archive!;
  await archive.recordJobSubmitted({ jobId: `j${n}`, actor: 'ann', problem: { ...PROBLEM, n } });
  return (await archive.recordPlanProposed({ jobId: `j${n}`, actor: 'w', submittedBy: 'ann', plan: makePlan({ targetSetKey: `k${n}` }) })).planId;
}

describe('veer verify with a recorded head', () => {
  describe('when the archive is untouched', () => {
    it('should print the head and confirm it later with --expect-head, through the API and on the local store', async () => {
      await propose(1);
      await propose(2);
      const first = await verify();
      expect(first.code, first.err).toBe(0);
      const [, seq, hash] = HEAD_LINE.exec(first.out)!;
      await propose(3);
      const later = await verify('--expect-head', `${seq}:${hash}`);
      expect(later.code, later.out).toBe(0);
      expect(later.out).toContain(`recorded head ${seq} ${hash}: still in the chain, unchanged`);
      const local = await runVeer(['verify', '--data-dir', svc.dataDir, '--expect-head', `${seq}:${hash}`, '--json']);
      expect(JSON.parse(local.out).expectedHead).toEqual({ sequence: Number(seq), hash, found: hash, matches: true });
    });

    it('should refuse a malformed head naming the option or the query field', async () => {
      const bad = await verify('--expect-head', '12:nothex');
      expect(bad.code).toBe(2);
      expect(bad.err).toContain('--expect-head');
      const res = await svc.request('GET', '/v1/archive/verify?expectHead=12:nothex', { token: svc.tokens.auditor });
      expect(res.status).toBe(400);
      expect(res.body.error.issues[0].path).toBe('query.expectHead');
    });
  });

  describe('when the newest entries are cut and others appended', () => {
    it('should still call the chain sound without a head, fail with it, and print the head in text mode', async () => {
      const recorded = (await svc.archive!.verify()).head;
      const planToCut = (await svc.archive!.entries(recorded.sequence, 1))[0]!.planId!;
      const keep = (await svc.archive!.entries(recorded.sequence - 2, 1))[0]!;
      const db = new Database(join(svc.dataDir, 'archive.sqlite'));
      try {
        db.exec('DROP TRIGGER archive_entries_no_update; DROP TRIGGER archive_entries_no_delete;');
        db.exec(`DELETE FROM archive_entries WHERE sequence > ${keep.sequence}`);
        db.prepare('UPDATE archive_head SET sequence = ?, hash = ?').run(keep.sequence, keep.hash);
        db.prepare('DELETE FROM archive_plans WHERE plan_id = ?').run(planToCut);
        db.prepare("DELETE FROM archive_jobs WHERE job_id = 'j3'").run();
      } finally {
        db.close();
      }
      await propose(4);
      const plain = await verify();
      expect(plain.code, plain.out).toBe(0); // what the issue found: the cut alone is invisible
      const checked = await verify('--expect-head', `${recorded.sequence}:${recorded.hash}`);
      expect(checked.code).toBe(1);
      expect(checked.out).toContain('ARCHIVE CHECK FAILED');
      expect(checked.out).toMatch(new RegExp(`RECORDED HEAD DIFFERS: entry ${recorded.sequence} now has hash [0-9a-f]{64}, recorded ${recorded.hash}`));
      expect(checked.out).toMatch(/head the store records: \d+ [0-9a-f]{64}/);
      const api = await svc.request('GET', `/v1/archive/verify?expectHead=${recorded.sequence}:${recorded.hash}`, { token: svc.tokens.auditor });
      expect(api.body).toMatchObject({ ok: false, expectedHead: { ...recorded, matches: false } });
    });
  });
});

describe('files of the SQLite store', () => {
  describe('when the service creates its archive and token files', () => {
    it('should create them readable and writable by the owner only (0600)', () => {
      for (const name of ['archive.sqlite', 'archive.sqlite-wal', 'tokens.sqlite', 'tokens.sqlite-wal']) {
        const file = join(svc.dataDir, name);
        if (!name.endsWith('-wal')) expect(existsSync(file), name).toBe(true);
        if (existsSync(file)) expect((statSync(file).mode & 0o777).toString(8), name).toBe('600');
      }
    });
  });
});
