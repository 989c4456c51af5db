/**
 * Configuration from the environment: defaults, and one clear line per bad variable naming it, what it must
 * be and what was given. Also the PlanSink seam: the archive-backed sink stores a job's plan exactly once.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadApiConfig } from '../../api/index.ts';
import { openArchive } from '../../archive/index.ts';
import { parseProblem, planManeuvers } from '../../planner/index.ts';
import { ArchivePlanSink, ConfigError, loadWorkerConfig } from '../../queue/index.ts';
import { reachableProblem } from './fixtures.ts';

describe('worker configuration', () => {
  describe('when nothing is set', () => {
    it('should use the documented defaults', () => {
      const c = loadWorkerConfig({});
      expect(c).toEqual(expect.objectContaining({
        REDIS_URL: 'redis://127.0.0.1:6379', WORKER_CONCURRENCY: 1, JOB_TIME_LIMIT_S: 900, PLAN_SINK: 'archive', DATA_DIR: './data',
      }));
      expect(c.DATABASE_URL).toBeUndefined();
    });
  });

  describe('when several values are bad', () => {
    it('should throw one ConfigError naming every bad variable and its value', () => {
      let error: unknown;
      try {
        loadWorkerConfig({ REDIS_URL: 'localhost:6379', WORKER_CONCURRENCY: 'many', JOB_TIME_LIMIT_S: '0', DATABASE_URL: 'mysql://x', PLAN_SINK: 'disk' });
      } catch (e) { error = e; }
      expect(error).toBeInstanceOf(ConfigError);
      const problems = (error as ConfigError).problems;
      expect(problems).toHaveLength(5);
      expect(problems.find((p) => p.startsWith('REDIS_URL:'))).toMatch(/redis:\/\/.*\(got "localhost:6379"\)/);
      expect(problems.find((p) => p.startsWith('WORKER_CONCURRENCY:'))).toMatch(/whole number.*\(got "many"\)/);
      expect(problems.find((p) => p.startsWith('JOB_TIME_LIMIT_S:'))).toMatch(/at least 1 \(got "0"\)/);
      expect(problems.find((p) => p.startsWith('DATABASE_URL:'))).toMatch(/postgres/);
      expect(problems.find((p) => p.startsWith('PLAN_SINK:'))).toMatch(/archive or job-result/);
    });
  });

  describe('when a URL holding a password is bad', () => {
    it('should name the variable without echoing the password', () => {
      let error: unknown;
      try {
        loadWorkerConfig({ DATABASE_URL: 'mysql://veer:hunter2-secret@db:3306/veer', REDIS_URL: 'redis-tls://:redis-pw-77@cache:6380' });
      } catch (e) { error = e; }
      expect(error).toBeInstanceOf(ConfigError);
      const text = (error as ConfigError).message;
      expect(text).toMatch(/DATABASE_URL: .*\(got "mysql:\/\/\*\*\*@db:3306\/veer"\)/);
      expect(text).toMatch(/REDIS_URL: .*\(got "redis-tls:\/\/\*\*\*@cache:6380"\)/);
      expect(text).not.toMatch(/hunter2|redis-pw-77/);
    });
  });

  describe('when a *_URL without a scheme carries credentials', () => {
    it('should hide everything before the @', () => {
      expect(() => loadApiConfig({ DATABASE_URL: 'veer:hunter2@db/veer' })).toThrow(/DATABASE_URL: .*\(got "\*\*\*@db\/veer"\)/);
    });
  });

  describe('when a variable is set to the empty string', () => {
    it('should treat it as unset', () => {
      expect(loadWorkerConfig({ WORKER_CONCURRENCY: '', DATABASE_URL: '' }).WORKER_CONCURRENCY).toBe(1);
    });
  });
});

describe('API configuration', () => {
  describe('when the port and body limit are out of range', () => {
    it('should name both', () => {
      expect(() => loadApiConfig({ PORT: '70000', BODY_LIMIT_KB: '-1' })).toThrow(/PORT: must be at most 65535[\s\S]*BODY_LIMIT_KB: must be at least 1/);
    });
  });
});

describe('archive plan sink', () => {
  describe('when the same job stores its plan twice (a retry after a crash)', () => {
    it('should return the first plan id and write one plan-proposed entry', async () => {
      const dir = mkdtempSync(join(tmpdir(), 'veer-sink-'));
      const archive = await openArchive({ dataDir: dir });
      try {
        const sink = new ArchivePlanSink(archive, false);
        const plan = await planManeuvers(parseProblem(reachableProblem({ samples: 0, name: 'SINKSAT' })), { monteCarlo: 'skip' });
        const a = await sink.storeProposedPlan({ jobId: 'j-sink-1', actor: 'w1', submittedBy: 'alice', plan });
        const b = await sink.storeProposedPlan({ jobId: 'j-sink-1', actor: 'w2', submittedBy: 'alice', plan });
        expect(a.created).toBe(true);
        expect(b).toEqual({ planId: a.planId, created: false });
        const history = await archive.history(a.planId);
        expect(history.filter((e) => e.kind === 'plan-proposed')).toHaveLength(1);
      } finally {
        await archive.close();
        rmSync(dir, { recursive: true, force: true });
      }
    });
  });
});
