/**
 * An audit does not freeze the API: while `GET /v1/archive/verify` walks a large archive (built by the bulk
 * writer: real hashes, real chain, one SQLite transaction), or a bundle export collects headers up to the head,
 * `/health` keeps answering. The verification runs in a thread of its own; the export hands the loop back between
 * pages. Before, /health waited for the whole walk (41.7 s at 37k entries in the probe).
 * The latency limit is a functional check (the loop is not held for the walk), set far above what this
 * machine shows. The speed figure (p99 at 150k entries) is npm run bench:verify-health (bench/results/).
 * Real Redis and SQLite store (test/harness/service.ts).
 */
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, type TestService } from '../harness/service.ts';
import { bulkAppendSqlite } from '../archive/bulk-writer.ts';
import { makePlan, PROBLEM } from '../archive/fixtures.ts';

const ENTRIES = 20_000;
let svc: TestService;
let head: { sequence: number; hash: string };
let planId: string;

beforeAll(async () => {
  svc = await startService();
  await svc.archive!.recordJobSubmitted({ jobId: 'j1', actor: 'alice', problem: PROBLEM });
  planId = (await svc.archive!.recordPlanProposed({ jobId: 'j1', actor: 'w', submittedBy: 'alice', plan: makePlan() })).planId;
  head = bulkAppendSqlite(join(svc.dataDir, 'archive.sqlite'), ENTRIES);
}, 120_000);

/** Probes /health every 20 ms until `work` settles; returns the probe latencies (ms) and the work's duration. */
async function probeHealthDuring<T>(work: Promise<T>): Promise<{ latencies: number[]; workMs: number; result: T }> {
  const started = performance.now();
  let finished = false;
  void work.finally(() => { finished = true; });
  const latencies: number[] = [];
  while (!finished) {
    const t0 = performance.now();
    const health = await svc.request('GET', '/health');
    latencies.push(performance.now() - t0);
    expect(health.status).toBe(200);
    await new Promise((r) => setTimeout(r, 20));
  }
  const result = await work;
  return { latencies, workMs: performance.now() - started, result };
}

/** A held loop makes the worst probe wait about the whole walk; a free one answers in milliseconds. The limit
 * (a quarter of the walk, at least 250 ms) leaves room for a loaded 2-core machine. */
function expectLoopFree(latencies: number[], workMs: number): void {
  expect(latencies.length).toBeGreaterThanOrEqual(5); // enough probes fell inside the walk to mean something
  const worst = Math.max(...latencies);
  expect(worst, `walk ${workMs.toFixed(0)} ms, probes ${latencies.length}, worst ${worst.toFixed(1)} ms`).toBeLessThan(Math.max(250, workMs / 4));
}
afterAll(async () => { await svc?.close(); });

describe('the event loop during a large verification', () => {
  describe(`when an auditor verifies ${ENTRIES} entries`, () => {
    it('should keep /health answering while the walk runs, and still verify the whole chain', async () => {
      const { latencies, workMs, result } = await probeHealthDuring(
        svc.request('GET', `/v1/archive/verify?expectHead=${head.sequence}:${head.hash}`, { token: svc.tokens.auditor }));
      expect(result.status).toBe(200);
      expect(result.body).toMatchObject({ ok: true, entriesChecked: head.sequence, expectedHead: { matches: true } });
      expectLoopFree(latencies, workMs);
    }, 120_000);
  });

  describe(`when a plan bundle is exported up to the head of ${ENTRIES} entries`, () => {
    it('should keep /health answering while the headers are collected, and carry every header', async () => {
      const { latencies, workMs, result } = await probeHealthDuring(
        svc.request('GET', `/v1/plans/${planId}/export?toHead=true`, { token: svc.tokens.auditor }));
      expect(result.status).toBe(200);
      expect(result.body.chain).toHaveLength(head.sequence);
      expect(result.body.head).toEqual(head);
      expectLoopFree(latencies, workMs);
    }, 120_000);
  });
});
