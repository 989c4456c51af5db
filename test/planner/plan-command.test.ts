import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runVeer } from '../harness/run-cli.ts';
import { formatPlanReport } from '../../cli/report/plan-report.ts';
import type { ManeuverPlan } from '../../planner/index.ts';
import { twoBodyProblem } from './two-body-fixture.ts';

const dir = mkdtempSync(join(tmpdir(), 'veer-plan-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  const r = await runVeer(args);
  return { code: r.code, stdout: r.out, stderr: r.err };
}

function file(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, JSON.stringify(content));
  return path;
}

describe('veer plan', () => {
  describe('when the problem converges and passes its cross-check', () => {
    it('should exit 0, print the report with caveats first and last, and write the JSON plan', async () => {
      const out = join(dir, 'plan.json');
      const r = await run(['plan', file('ok.json', twoBodyProblem({ dispersion: { samples: 4, seed: 1 } })), '--out', out]);
      expect(r.code).toBe(0);
      const lines = r.stdout.trim().split('\n');
      expect(lines[1]).toContain('PROPOSED MANEUVER PLAN');
      expect(lines.slice(0, 3).join('\n')).toContain('PROPOSAL_REQUIRES_REVIEW');
      expect(lines.slice(-4).join('\n')).toContain('PROPOSAL_REQUIRES_REVIEW');
      expect(r.stdout).toContain('Proposed burns');
      expect(r.stdout).toContain('Cross-check: PASSED');
      expect(r.stderr).toContain('done');
      const plan = JSON.parse(readFileSync(out, 'utf8')) as { status: string; burns: unknown[] };
      expect(plan.status).toBe('converged');
      expect(plan.burns).toHaveLength(1);
    });
  });

  describe('when --json is given', () => {
    it('should print the plan as JSON on stdout', async () => {
      const r = await run(['plan', file('json.json', twoBodyProblem({ dispersion: { samples: 0, seed: 1 } })), '--json']);
      expect((JSON.parse(r.stdout) as { planFormatVersion: number }).planFormatVersion).toBe(1);
    });
  });

  describe('when a converged plan failed its independent cross-check', () => {
    it('should not call it a proposed plan in the report', async () => {
      const r = await run(['plan', file('xc.json', twoBodyProblem({ dispersion: { samples: 0, seed: 1 } })), '--json']);
      const plan = JSON.parse(r.stdout) as ManeuverPlan;
      expect(plan.crossCheck.passed).toBe(true);
      const failed: ManeuverPlan = { ...plan, crossCheck: { ...plan.crossCheck, passed: false } };
      const lines = formatPlanReport(failed).split('\n');
      expect(lines[1]).toContain('UNCHECKED RESULT — NOT A PLAN');
      expect(lines.join('\n')).not.toContain('PROPOSED MANEUVER PLAN');
      expect(lines.join('\n')).not.toContain('Proposed burns');
      expect(lines.join('\n')).toContain('FAILED the cross-check');
      expect(lines.slice(-6).join('\n')).toContain('CROSS-CHECK FAILED');
    });
  });

  describe('when the problem does not converge', () => {
    it('should exit 3, say so prominently and show no burn table', async () => {
      const r = await run(['plan', file('nc.json', twoBodyProblem({ corrector: { maxIterations: 1, maxStepKmS: 0.001, maxEpochStepS: 60 } }))]);
      expect(r.code).toBe(3);
      expect(r.stdout).toContain('NOT CONVERGED');
      expect(r.stdout).not.toContain('Proposed burns');
      expect(r.stdout).not.toContain('PROPOSED MANEUVER PLAN');
      expect(r.stdout.split('\n')[1]).toContain('NOT CONVERGED — NO PLAN');
      expect(r.stderr).toContain('NOT CONVERGED');
    });
  });

  describe('when the input is bad', () => {
    it('should exit 2 and name the field', async () => {
      const p = twoBodyProblem();
      const r = await run(['plan', file('bad.json', { ...p, spacecraft: { ...p.spacecraft, massKg: -3 } })]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('spacecraft.massKg');
    });
    it('should exit 2 for a file that is not JSON', async () => {
      const path = join(dir, 'broken.json');
      writeFileSync(path, '{ not json');
      const r = await run(['plan', path]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('not valid JSON');
    });
    it('should exit 2 naming --out before planning when the output folder does not exist', async () => {
      const missing = join(dir, 'no-such-folder', 'plan.json');
      const r = await run(['plan', file('out-missing.json', twoBodyProblem({ dispersion: { samples: 0, seed: 1 } })), '--out', missing]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('--out');
      expect(r.stderr).toContain('does not exist');
      expect(r.stderr).not.toContain('ENOENT');
      // Refused before any computation: no progress line, no report.
      expect(r.stderr).not.toContain('correcting');
      expect(r.stdout).toBe('');
    });
    it('should exit 2 naming --out when the output path is a directory', async () => {
      const r = await run(['plan', file('out-dir.json', twoBodyProblem({ dispersion: { samples: 0, seed: 1 } })), '--out', dir]);
      expect(r.code).toBe(2);
      expect(r.stderr).toContain('--out');
      expect(r.stderr).toContain('is a directory');
      expect(r.stdout).toBe('');
    });
    it('should exit 2 without a problem file', async () => {
      expect((await run(['plan'])).code).toBe(2);
    });
  });
});
