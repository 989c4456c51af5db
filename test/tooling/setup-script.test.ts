/**
 * `npm run setup` (scripts/setup.mjs), run by `npm test` before vitest: finds what the tests need and names the
 * Debian packages still missing. Installing is not exercised here (it would change the machine); the decision of
 * what to install is, against folders and PATHs made up for the test.
 */
import { spawnSync } from 'node:child_process';
import { chmodSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { missingPackages, onPath, postgresBinDir } from '../../scripts/setup.mjs';

const ROOT = resolve(import.meta.dirname, '../..');
const dirs: string[] = [];
function tempDir(): string {
  const d = mkdtempSync(join(tmpdir(), 'veer-setup-'));
  dirs.push(d);
  return d;
}
function executable(path: string): void {
  writeFileSync(path, '#!/bin/sh\n');
  chmodSync(path, 0o755);
}

afterEach(() => { for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true }); });

describe('setup script', () => {
  describe('when nothing is installed', () => {
    it('should name all three Debian packages', () => {
      const empty = tempDir();
      expect(missingPackages({ PATH: empty, CHROMIUM_PATH: join(empty, 'chromium') }, join(empty, 'pg'))).toEqual(['redis-server', 'postgresql', 'chromium']);
    });
  });

  describe('when the parts are present or given by URL', () => {
    it('should find redis-server on PATH, the newest PostgreSQL folder with initdb and pg_ctl, and Chromium', () => {
      const d = tempDir();
      mkdirSync(join(d, 'bin'));
      executable(join(d, 'bin', 'redis-server'));
      executable(join(d, 'chromium'));
      for (const v of ['13', '15']) {
        mkdirSync(join(d, 'pg', v, 'bin'), { recursive: true });
        executable(join(d, 'pg', v, 'bin', 'initdb'));
        executable(join(d, 'pg', v, 'bin', 'pg_ctl'));
      }
      mkdirSync(join(d, 'pg', '16', 'bin'), { recursive: true }); // initdb only: an incomplete install is not used
      executable(join(d, 'pg', '16', 'bin', 'initdb'));
      expect(onPath('redis-server', `/nonexistent:${join(d, 'bin')}`)).toBe(true);
      expect(postgresBinDir({}, join(d, 'pg'))).toBe(join(d, 'pg', '15', 'bin'));
      expect(missingPackages({ PATH: join(d, 'bin'), CHROMIUM_PATH: join(d, 'chromium') }, join(d, 'pg'))).toEqual([]);
    });

    it('should not ask for Redis or PostgreSQL when REDIS_URL and DATABASE_URL name servers', () => {
      const empty = tempDir();
      expect(missingPackages({ PATH: empty, REDIS_URL: 'redis://h:6379', DATABASE_URL: 'postgres://h/db', CHROMIUM_PATH: join(empty, 'c') }, empty))
        .toEqual(['chromium']);
    });
  });

  describe('when run as `npm test` runs it on this machine', () => {
    it('should exit 0 with nothing left to install', () => {
      const run = spawnSync(process.execPath, ['scripts/setup.mjs', '--check'], { cwd: ROOT, encoding: 'utf8' });
      expect(run.stdout).toBe('');
      expect(run.status).toBe(0);
    });
  });
});
