/**
 * CcsdsExportThreads: the export computed in a worker thread gives the same text as in this thread, keeps
 * the export's error kinds, reuses its thread and that thread's ephemeris cache for the next export, and
 * stops the thread on abort and at the time limit.
 */
import { describe, expect, it } from 'vitest';
import { CcsdsExportThreads, exportPlanAsCcsds, ExportTimeLimitError, type ThreadExportOptions } from '../../ccsds/index.ts';
import { CancelledError, InvalidInputError } from '../../propagator/index.ts';
import { plan, problem } from './plan-fixture.ts';

const OEM: ThreadExportOptions = { kind: 'oem', creationDateUtc: '2029-12-01T10:00:00', stepS: 60 };
// 65 min every 0.02 s: about 195,000 lines, seconds of work — long enough to be stopped midway.
const LARGE: ThreadExportOptions = { ...OEM, stepS: 0.02 };

describe('CCSDS export threads', () => {
  describe('when an export runs in a thread', () => {
    it('should give exactly the text of the same export in this thread', async () => {
      const threads = new CcsdsExportThreads();
      const [inThread, here] = await Promise.all([threads.run(problem, plan('converged'), OEM), exportPlanAsCcsds(problem, plan('converged'), OEM)]);
      expect(inThread).toBe(here);
      expect(threads.active).toBe(0);
    });

    it('should reject with the export\'s own error kind, naming the field', async () => {
      const refused = new CcsdsExportThreads().run(problem, plan('converged', false), OEM);
      await expect(refused).rejects.toThrow(InvalidInputError);
      await expect(refused).rejects.toMatchObject({ field: 'plan.crossCheck', message: expect.stringMatching(/^plan\.crossCheck: .*cross-check did not pass/) });
    });

    it('should run no more than maxThreads at once, the others waiting their turn', async () => {
      const threads = new CcsdsExportThreads({ maxThreads: 1 });
      const both = Promise.all([threads.run(problem, plan('converged'), OEM), threads.run(problem, plan('converged'), OEM)]);
      expect(threads.active).toBe(1);
      const [a, b] = await both;
      expect(a).toBe(b);
      expect(threads.active).toBe(0);
    });
  });

  describe('when a second export follows in the same runner', () => {
    it('should run it in the same thread, from the ephemeris blocks the first one fitted', async () => {
      const threads = new CcsdsExportThreads({ maxThreads: 1 });
      // With the Moon and the Sun perturbing, body positions come from the thread's ephemeris cache.
      const perturbed = { ...problem, forceModel: { ...problem.forceModel, perturbingBodies: ['moon', 'sun'] } } as typeof problem;
      try {
        const first = await threads.runWithStats(perturbed, plan('converged'), OEM);
        const second = await threads.runWithStats(perturbed, plan('converged'), OEM);
        expect(first.threadReused).toBe(false);
        expect(first.blocksFitted).toBeGreaterThan(0);
        expect(second.threadReused).toBe(true);
        expect(second.blocksFitted).toBe(0);
        expect(second.blocksReused).toBeGreaterThan(0);
        expect(second.text).toBe(first.text);
      } finally {
        await threads.close();
      }
    });
  });

  describe('when an export is stopped', () => {
    it('should reject with ExportTimeLimitError at the time limit and free its place', async () => {
      const threads = new CcsdsExportThreads({ timeLimitMs: 300 });
      await expect(threads.run(problem, plan('converged'), LARGE)).rejects.toThrow(ExportTimeLimitError);
      expect(threads.active).toBe(0);
    });

    it('should reject with CancelledError when its signal fires and free its place', async () => {
      const threads = new CcsdsExportThreads({ maxThreads: 1 });
      const controller = new AbortController();
      const running = threads.run(problem, plan('converged'), LARGE, controller.signal);
      setTimeout(() => controller.abort(), 200);
      await expect(running).rejects.toThrow(CancelledError);
      expect(threads.active).toBe(0);
      // The place is free again: the next export runs.
      await expect(threads.run(problem, plan('converged'), OEM)).resolves.toMatch(/^CCSDS_OEM_VERS *= 2\.0/m);
    });
  });
});
