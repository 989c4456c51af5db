/**
 * `veer export --ccsds opm|oem --plan FILE --problem FILE`: the CCSDS export without a server, from the plan
 * `veer plan --out` wrote (a real planning run of the invented two-body demo, in this process).
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readOem, readOpm, REVIEW_COMMENTS } from '../../ccsds/index.ts';
import { runVeer, type CliRun } from '../harness/run-cli.ts';
import { parseEpoch } from '../../propagator/index.ts';

const PROBLEM = fileURLToPath(new URL('../../examples/two-body-demo.json', import.meta.url));
let dir: string;
let planPath: string;
let plan: { burns: { epoch: { tdbS: number } }[]; crossCheck: Record<string, unknown> } & Record<string, unknown>;

/** Runs `veer ...args` in-process; captures stdout and stderr. */
const veer = (...args: string[]): Promise<CliRun> => runVeer(args);

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'veer-ccsds-offline-'));
  planPath = join(dir, 'plan.json');
  const planned = await veer('plan', PROBLEM, '--out', planPath);
  expect(planned.code).toBe(0);
  plan = JSON.parse(readFileSync(planPath, 'utf8'));
}, 60_000);
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

describe('veer export from plan files', () => {
  describe('when the plan and its problem are given', () => {
    it('should write the OPM: the problem initial state and one maneuver per burn, with the review statement', async () => {
      const r = await veer('export', '--ccsds', 'opm', '--plan', planPath, '--problem', PROBLEM, '--stdout');
      expect(r.code).toBe(0);
      const opm = readOpm(r.out);
      const problem = JSON.parse(readFileSync(PROBLEM, 'utf8'));
      expect(opm.state.positionKm).toEqual(problem.initialState.positionKm);
      expect(opm.state.epochTdbS).toBe(parseEpoch(problem.initialState.epoch));
      expect(opm.maneuvers.map((m) => m.epochIgnitionTdbS)).toEqual(plan.burns.map((b) => b.epoch.tdbS));
      expect(opm.header.comments.slice(0, 3)).toEqual([...REVIEW_COMMENTS]);
    });

    it('should write the OEM to a file, one segment per arc, and say it is a proposal', async () => {
      const out = join(dir, 'trajectory.xml');
      const r = await veer('export', '--ccsds', 'oem', '--plan', planPath, '--problem', PROBLEM, '--step', '120', '--xml', '--out', out);
      expect(r.code).toBe(0);
      expect(r.out).toMatch(/wrote .*trajectory\.xml/);
      expect(r.out).toMatch(/review/i);
      const oem = readOem(readFileSync(out, 'utf8'));
      expect(oem.segments).toHaveLength(plan.burns.length + 1);
      expect(oem.segments[1].states[0].epochTdbS).toBe(plan.burns[0].epoch.tdbS);
    });
  });

  describe('when the files do not belong together or the plan must not leave', () => {
    it('should refuse a problem other than the plan\'s own, naming --problem', async () => {
      const other = JSON.parse(readFileSync(PROBLEM, 'utf8'));
      other.endEpoch = other.endEpoch.replace(/:00 TDB$/, ':30 TDB');
      const otherPath = join(dir, 'other-problem.json');
      writeFileSync(otherPath, JSON.stringify(other));
      const r = await veer('export', '--ccsds', 'opm', '--plan', planPath, '--problem', otherPath, '--stdout');
      expect(r.code).toBe(2);
      expect(r.out).toBe('');
      expect(r.err).toMatch(/--problem: the plan in .* was made from another problem/);
    });

    it('should refuse a plan whose cross-check failed, saying why', async () => {
      // Project safety rule: an unchecked result is never presented as a plan.
      const failed = join(dir, 'failed-check.json');
      writeFileSync(failed, JSON.stringify({ ...plan, crossCheck: { ...plan.crossCheck, passed: false } }));
      const r = await veer('export', '--ccsds', 'oem', '--plan', failed, '--problem', PROBLEM, '--step', '60', '--stdout');
      expect(r.code).toBe(2);
      expect(r.out).toBe('');
      expect(r.err).toMatch(/plan\.crossCheck: the plan converged but its independent cross-check did not pass/);
    });

    it('should exit 2 naming --step, --plan or --ccsds when they are missing or wrong', async () => {
      expect((await veer('export', '--ccsds', 'oem', '--plan', planPath, '--problem', PROBLEM, '--stdout')).err).toMatch(/--step/);
      const noPlan = await veer('export', '--ccsds', 'opm', '--problem', PROBLEM, '--stdout');
      expect([noPlan.code, /--plan/.test(noPlan.err)]).toEqual([2, true]);
      const json = await veer('export', '--format', 'json', '--plan', planPath, '--problem', PROBLEM, '--stdout');
      expect([json.code, /--ccsds: an export from files is CCSDS only/.test(json.err)]).toEqual([2, true]);
      const notPlan = await veer('export', '--ccsds', 'opm', '--plan', PROBLEM, '--problem', PROBLEM, '--stdout');
      expect([notPlan.code, /--plan: .* is not a plan written by veer plan --out/.test(notPlan.err)]).toEqual([2, true]);
    });
  });
});
