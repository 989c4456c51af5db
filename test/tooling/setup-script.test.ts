/**
 * `npm run setup` (scripts/setup.mjs), run by `npm test` before vitest: finds what the tests need and names the
 * Debian packages still missing. Installing is not exercised here (it would change the machine); the decision of
 * what to install is, against folders and PATHs made up for the test, and so is the reading of apt-get's plan.
 */
import { spawnSync } from 'node:child_process';
import { chmodSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { describePlan, missingPackages, onPath, parseAptSimulation, postgresBinDir } from '../../scripts/setup.mjs';

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

    it('should still ask for redis-server and PostgreSQL when REDIS_URL and DATABASE_URL name servers', () => {
      // The Redis restart tests and the PostgreSQL harness tests start servers of their own.
      const empty = tempDir();
      expect(missingPackages({ PATH: empty, REDIS_URL: 'redis://h:6379', DATABASE_URL: 'postgres://h/db', CHROMIUM_PATH: join(empty, 'c') }, empty))
        .toEqual(['redis-server', 'postgresql', 'chromium']);
    });
  });

  describe('when apt-get simulates the install', () => {
    it('should list every package it brings, new ones and upgrades, and nothing else', () => {
      // Lines as apt 2.6 (Debian 12) printed them on this machine for `apt-get -s install redis-server` after
      // redis-server was removed; the Conf lines repeat the same packages and are not counted.
      const text = [
        'NOTE: This is only a simulation!',
        'Inst redis-tools [5:7.0.15-1~deb12u7] (5:7.0.15-1~deb12u10 Debian-Security:12/oldstable-security [amd64])',
        'Inst redis-server (5:7.0.15-1~deb12u10 Debian-Security:12/oldstable-security [amd64]) []',
        'Conf redis-tools (5:7.0.15-1~deb12u10 Debian-Security:12/oldstable-security [amd64])',
        'Conf redis-server (5:7.0.15-1~deb12u10 Debian-Security:12/oldstable-security [amd64])',
      ].join('\n');
      const plan = parseAptSimulation(text);
      expect(plan).toEqual([
        { name: 'redis-tools', from: '5:7.0.15-1~deb12u7', to: '5:7.0.15-1~deb12u10' },
        { name: 'redis-server', from: null, to: '5:7.0.15-1~deb12u10' },
      ]);
      expect(describePlan(plan)).toEqual([
        'redis-tools 5:7.0.15-1~deb12u7 → 5:7.0.15-1~deb12u10 (upgrade)',
        'redis-server 5:7.0.15-1~deb12u10 (new)',
      ]);
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
