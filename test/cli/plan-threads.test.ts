/**
 * `veer plan --threads N` (cli/sample-threads.ts): real worker threads (started from the sources through the
 * tsx entry) take batches of the Monte Carlo samples. The plan must be byte-identical to the one-thread plan
 * (the reference is the same command with --threads 1: sample i depends on the seed and i only), progress must
 * still reach stderr, a failure inside a thread must arrive as data naming its field, and cancelling must end
 * the thread.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runVeer } from '../harness/run-cli.ts';
import { planLeapSeconds, parseProblem, planManeuvers, type ManeuverPlan } from '../../planner/index.ts';
import { BUILTIN_LEAP_SECONDS, CancelledError, parseEpoch } from '../../propagator/index.ts';
import { MAX_THREADS, planThreadCount, SampleThread } from '../../cli/sample-threads.ts';
import { twoBodyProblem } from '../planner/two-body-fixture.ts';
import { marsOemText } from '../reference/mars-oem.ts';

const dir = mkdtempSync(join(tmpdir(), 'veer-plan-threads-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const input = twoBodyProblem({ dispersion: { samples: 40, seed: 5 } });
const problemFile = join(dir, 'problem.json');
writeFileSync(problemFile, JSON.stringify(input));

describe('veer plan --threads', () => {
  describe('when the samples run on two threads', () => {
    it('should print the same plan as on one thread and still report the samples\' progress', async () => {
      const one = await runVeer(['plan', problemFile, '--json', '--threads', '1']);
      const two = await runVeer(['plan', problemFile, '--json', '--threads', '2']);
      expect(one.code).toBe(0);
      expect(two.code).toBe(0);
      const plan = JSON.parse(two.out) as ManeuverPlan;
      expect(plan.dispersion.monteCarlo?.samples).toBe(40);
      expect(two.out).toBe(one.out);
      expect(two.err).toContain('dispersion');
      expect(two.err).toContain('done');
    }, 60_000);
  });

  describe('when the plan is made on an ephemeris file', () => {
    it('should have the threads read the same file and print the same plan as on one thread', async () => {
      const demo = JSON.parse(readFileSync('examples/flyby-demo.json', 'utf8')) as Record<string, unknown>;
      const demoFile = join(dir, 'demo.json');
      writeFileSync(demoFile, JSON.stringify({ ...demo, dispersion: { samples: 12, seed: 3 } }));
      const t0 = parseEpoch('2031-08-12T12:00:00 TDB'); // the demo's initial epoch
      const oem = join(dir, 'mars.oem');
      writeFileSync(oem, marsOemText('MARS', t0 - 4 * 86400, t0 + 66 * 86400, [600, -450, 250]));
      const one = await runVeer(['plan', demoFile, '--json', '--ephemeris', oem, '--threads', '1']);
      const two = await runVeer(['plan', demoFile, '--json', '--ephemeris', oem, '--threads', '2']);
      expect(one.code).toBe(0);
      const plan = JSON.parse(two.out) as ManeuverPlan;
      expect(plan.ephemerisSources?.some((e) => e.source === 'oem' && e.body === 'mars')).toBe(true);
      expect(plan.dispersion.monteCarlo?.samples).toBe(12);
      expect(two.out).toBe(one.out);
    }, 120_000);
  });

  describe('when --threads is not a whole number in range', () => {
    it('should exit 2 naming --threads', async () => {
      const r = await runVeer(['plan', problemFile, '--threads', '0']);
      expect(r.code).toBe(2);
      expect(r.err).toContain('--threads');
    });
  });
});

describe('planThreadCount', () => {
  it('should take --threads as given, default to one, and refuse anything else', () => {
    expect(planThreadCount('3')).toBe(3);
    expect(planThreadCount(undefined)).toBe(1);
    expect(() => planThreadCount(String(MAX_THREADS + 1))).toThrow(/--threads/);
    expect(() => planThreadCount('1.5')).toThrow(/--threads/);
  });
});

describe('SampleThread', () => {
  const problem = parseProblem(input);
  const prepare = { problem, leapSeconds: planLeapSeconds(BUILTIN_LEAP_SECONDS), ephemerisFiles: [] };

  describe('when the planner fails inside the thread', () => {
    it('should reject with the failure as data (name and field), not a partial result', async () => {
      const plan = await planManeuvers(problem, { monteCarlo: 'skip' });
      const thread = new SampleThread();
      try {
        thread.prepare(prepare);
        const notConverged: ManeuverPlan = { ...plan, status: 'not-converged' };
        await expect(thread.run(notConverged, { firstIndex: 0, count: 4 })).rejects.toMatchObject({ name: 'InvalidInputError', field: 'plan.status' });
      } finally {
        await thread.close();
      }
    }, 60_000);
  });

  describe('when the run is cancelled', () => {
    it('should reject with CancelledError and end the thread', async () => {
      const plan = await planManeuvers(problem, { monteCarlo: 'skip' });
      const thread = new SampleThread();
      thread.prepare(prepare);
      const controller = new AbortController();
      const run = thread.run(plan, { firstIndex: 0, count: 40 }, { signal: controller.signal, onSample: () => controller.abort() });
      await expect(run).rejects.toBeInstanceOf(CancelledError);
      await expect(thread.exited).resolves.toBeTypeOf('number');
      await expect(thread.run(plan, { firstIndex: 0, count: 1 })).rejects.toBeInstanceOf(CancelledError);
    }, 60_000);
  });
});
