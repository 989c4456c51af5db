/**
 * The `veer tokens|review|history|export|verify` commands against a real server (SQLite store) and the local
 * store: exit codes, what they print, the token shown once, bundles checked offline.
 */
import Database from 'better-sqlite3';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runVeer, type CliRun } from '../harness/run-cli.ts';
import { makePlan, PROBLEM } from '../archive/fixtures.ts';
import { sqliteLocation, startTestApi, type StoreLocation, type TestApi } from '../archive/http-app.ts';

const CODES = 'PROPOSAL_REQUIRES_REVIEW,DISPERSION_LINEAR_ONLY';

/** Runs `veer ...args` in-process; captures stdout and stderr. */
const veer = (...args: string[]): Promise<CliRun> => runVeer(args);

describe('veer review, history, export, verify and tokens', () => {
  let location: StoreLocation;
  let api: TestApi;
  let work: string;
  const secret: Record<string, string> = {};

  beforeAll(async () => {
    location = sqliteLocation();
    work = mkdtempSync(join(tmpdir(), 'veer-cli-'));
    for (const [name, roles] of [['ann', 'submitter,reviewer'], ['bob', 'reviewer'], ['audrey', 'auditor']] as const) {
      const added = await veer('tokens', 'add', name, '--role', roles, '--data-dir', location.dataDir!);
      expect(added.code).toBe(0);
      secret[name] = /(veer_[A-Za-z0-9_-]{43})/.exec(added.out)![1];
    }
    api = await startTestApi(location);
  });
  afterAll(async () => {
    await api.close();
    await location.dispose();
    rmSync(work, { recursive: true, force: true });
  });

  async function propose(jobId: string): Promise<string> {
    await api.archive.recordJobSubmitted({ jobId, actor: 'ann', problem: PROBLEM });
    return (await api.archive.recordPlanProposed({ jobId, actor: 'worker-1', submittedBy: 'ann', plan: makePlan({ targetSetKey: jobId }) })).planId;
  }
  const remote = (who: string): string[] => ['--url', api.url, '--token', secret[who]];

  describe('when tokens are managed locally', () => {
    it('should list names and roles but never the secrets, and revoke by id', async () => {
      const listed = await veer('tokens', 'list', '--data-dir', location.dataDir!, '--json');
      const records = JSON.parse(listed.out) as Array<{ id: string; name: string; roles: string[] }>;
      expect(records.map((r) => r.name)).toEqual(['ann', 'bob', 'audrey']);
      expect(listed.out).not.toContain('veer_');
      expect(JSON.parse(listed.out)[0].createdBy).toMatch(/^cli:.+@.+/);
      const extra = await veer('tokens', 'add', 'temp', '--role', 'auditor', '--data-dir', location.dataDir!, '--json');
      const { token, record } = JSON.parse(extra.out) as { token: string; record: { id: string } };
      expect((await veer('tokens', 'revoke', record.id, '--data-dir', location.dataDir!)).out).toContain('REVOKED');
      const refused = await veer('verify', '--url', api.url, '--token', token);
      expect(refused.code).toBe(2);
      expect(refused.err).toContain('401');
    });

    it('should refuse an unknown role with exit code 2', async () => {
      const bad = await veer('tokens', 'add', 'x', '--role', 'pilot', '--data-dir', location.dataDir!);
      expect(bad.code).toBe(2);
      expect(bad.err).toContain('roles.0');
    });
  });

  describe('when a plan is reviewed from the command line', () => {
    it('should show the caveats, refuse the submitter and missing codes, and record a second reviewer\'s approval', async () => {
      const planId = await propose('job-cli-1');
      const shown = await veer('review', planId, ...remote('bob'));
      expect(shown.code).toBe(0);
      expect(shown.out).toContain('DISPERSION_LINEAR_ONLY');
      expect(shown.out).toContain('PROPOSAL ONLY');
      const own = await veer('review', planId, '--approve', '--ack', CODES, ...remote('ann'));
      expect(own.code).toBe(2);
      expect(own.err).toContain('TWO_PERSON_RULE');
      const partial = await veer('review', planId, '--approve', '--ack', 'PROPOSAL_REQUIRES_REVIEW', ...remote('bob'));
      expect(partial.code).toBe(2);
      expect(partial.err).toContain('missing caveat codes: DISPERSION_LINEAR_ONLY');
      const approved = await veer('review', planId, '--approve', '--ack', CODES, '--comment', 'checked', ...remote('bob'));
      expect(approved.code).toBe(0);
      expect(approved.out).toContain('approved by bob');
      const history = await veer('history', planId, ...remote('audrey'));
      expect(history.code).toBe(0);
      expect(history.out).toMatch(/job-submitted[\s\S]*plan-proposed +hash ok {2}converged, cross-check passed; submitted by ann[\s\S]*review +hash ok {2}approve — "checked"/);
    });
  });

  describe('when a bundle is exported and checked offline', () => {
    it('should pass as written and fail, naming the entry, once edited', async () => {
      const planId = await propose('job-cli-2');
      const file = join(work, 'bundle.json');
      const exported = await veer('export', planId, '--out', file, '--to-head', ...remote('audrey'));
      expect(exported.code).toBe(0);
      expect((await veer('verify', '--bundle', file)).out).toContain('bundle sound');
      const bundle = JSON.parse(readFileSync(file, 'utf8')) as { entries: Array<{ sequence: number; actor: string }> };
      bundle.entries[0].actor = 'mallory';
      writeFileSync(file, JSON.stringify(bundle));
      const forged = await veer('verify', '--bundle', file);
      expect(forged.code).toBe(1);
      expect(forged.out).toContain(`BUNDLE CHECK FAILED at entry ${bundle.entries[0].sequence}`);
    });

    it('should refuse a bundle whose rejection was cut out and whose record says approved, and print the head to compare', async () => {
      const planId = await propose('job-cli-3');
      expect((await veer('review', planId, '--reject', '--comment', 'aim point off', ...remote('bob'))).code).toBe(0);
      const file = join(work, 'rejected.json');
      expect((await veer('export', planId, '--out', file, '--to-head', ...remote('audrey'))).code).toBe(0);
      const sound = await veer('verify', '--bundle', file);
      const bundle = JSON.parse(readFileSync(file, 'utf8')) as { head: { hash: string }; entries: Array<{ kind: string }>; planRecord: { state: string } };
      expect(sound.out).toContain(`head recorded in the bundle: entry`);
      expect(sound.out).toContain(bundle.head.hash);
      expect(sound.out).toContain('compare this head hash with the one a live `veer verify`');
      bundle.entries = bundle.entries.filter((e) => e.kind !== 'review');
      bundle.planRecord.state = 'approved';
      writeFileSync(file, JSON.stringify(bundle));
      const forged = await veer('verify', '--bundle', file);
      expect(forged.code).toBe(1);
      expect(forged.out).toMatch(/BUNDLE CHECK FAILED at entry \d+ \(missing-entry\)/);
    });

    it('should refuse an unknown format', async () => {
      expect((await veer('export', 'plan-x', '--format', 'nope', ...remote('audrey'))).code).toBe(2);
    });
  });

  describe('when the archive is verified', () => {
    it('should report it sound through the API and directly on the local store', async () => {
      const viaApi = await veer('verify', ...remote('audrey'));
      expect(viaApi.code).toBe(0);
      expect(viaApi.out).toContain('archive sound');
      const local = await veer('verify', '--data-dir', location.dataDir!, '--json');
      expect(local.code).toBe(0);
      expect(JSON.parse(local.out)).toMatchObject({ ok: true, firstFailure: null });
      expect((await veer('verify', ...remote('bob'))).code).toBe(2);
    });

    it('should refuse a data folder with no archive instead of creating one, and leave an empty file unmigrated', async () => {
      const typo = join(work, 'no-such-data');
      const missing = await veer('verify', '--data-dir', typo);
      expect(missing.code).toBe(2);
      expect(missing.err).toContain(`--data-dir ${typo}: no archive file`);
      expect(missing.out).not.toContain('archive sound');
      expect(existsSync(typo)).toBe(false);
      const emptyDir = join(work, 'empty-data');
      mkdirSync(emptyDir);
      new Database(join(emptyDir, 'archive.sqlite')).close();
      const empty = await veer('verify', '--data-dir', emptyDir);
      expect(empty.code).toBe(2);
      expect(empty.err).toContain('holds no archive tables');
      const db = new Database(join(emptyDir, 'archive.sqlite'), { readonly: true });
      try { expect(db.prepare("SELECT name FROM sqlite_master WHERE type = 'table'").all()).toEqual([]); } finally { db.close(); }
    });
  });
});
