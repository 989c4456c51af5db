/** `veer budget`: the report (caveats first and last, both paths, agreement), --json/--out, --ephemeris (an
 * OEM, CCSDS 502.0-B-3, tabulating Mars: test/reference/mars-oem.ts), bad input naming the field, Ctrl-C
 * stopping the run. */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { runVeer } from '../harness/run-cli.ts';
import type { BudgetResult } from '../../planner/index.ts';
import { parseEpoch } from '../../propagator/index.ts';
import { marsOemText } from '../reference/mars-oem.ts';

const dir = mkdtempSync(join(tmpdir(), 'veer-budget-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const demo = JSON.parse(readFileSync(new URL('../../examples/flyby-budget-demo.json', import.meta.url), 'utf8')) as Record<string, unknown>;

function file(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, JSON.stringify(content));
  return path;
}

describe('veer budget', () => {
  describe('when the request is valid', () => {
    it('should print the study with its caveats first and last, write the JSON, and exit 0', async () => {
      const out = join(dir, 'budget.json');
      const r = await runVeer(['budget', file('ok.json', { ...demo, linearSamples: 500, nonlinearSamples: 6 }), '--out', out]);
      expect(r.code).toBe(0);
      const lines = r.out.trim().split('\n');
      expect(lines[1]).toContain('Δv BUDGET STUDY — not a plan');
      expect(lines.slice(0, 4).join('\n')).toContain('PROPOSAL_REQUIRES_REVIEW');
      expect(lines.slice(-6).join('\n')).toContain('PROPOSAL_REQUIRES_REVIEW');
      expect(r.out).toContain('Linear path (STM gains): 500 samples');
      expect(r.out).toContain('Non-linear path (every re-plan a corrector run): 6 samples');
      expect(r.out).toContain('Linear vs non-linear: AGREE');
      expect(r.err).toContain('done');
      const saved = JSON.parse(readFileSync(out, 'utf8')) as BudgetResult;
      expect(saved.kind).toBe('delta-v-budget');
      expect(saved.linear?.burns.map((b) => b.label)).toEqual(['TCM-1', 'TCM-2']);
    });
  });

  describe('when Mars comes from an OEM file', () => {
    it('should run the budget on the file, record its SHA-256 in the study and the report, and refuse a short file', async () => {
      const t0 = parseEpoch('2031-08-12T12:00:00 TDB'); // the budget demo's initial epoch
      const oem = join(dir, 'mars.oem');
      writeFileSync(oem, marsOemText('MARS', t0 - 4 * 86400, t0 + 66 * 86400, [0, 0, 0]));
      const request = file('eph.json', { ...demo, linearSamples: 200, nonlinearSamples: 0 });
      const r = await runVeer(['budget', request, '--json', '--ephemeris', oem]);
      expect(r.code).toBe(0);
      const study = JSON.parse(r.out) as BudgetResult;
      const mars = study.ephemerisSources?.find((s) => s.body === 'mars');
      expect(mars).toMatchObject({ source: 'oem', file: 'mars.oem' });
      const report = await runVeer(['budget', request, '--ephemeris', oem]);
      expect(report.out).toContain(`ephemeris mars: OEM mars.oem sha256 ${mars?.source === 'oem' ? mars.sha256 : '?'}`);
      const short = join(dir, 'mars-short.oem');
      writeFileSync(short, marsOemText('MARS', t0 - 4 * 86400, t0 + 30 * 86400, [0, 0, 0]));
      const refused = await runVeer(['budget', request, '--ephemeris', short]);
      expect(refused.code).toBe(2);
      expect(refused.err).toContain('mars-short.oem');
    });
  });

  describe('when the request is invalid', () => {
    it('should exit 2 and name the field', async () => {
      const r = await runVeer(['budget', file('bad.json', { ...demo, knowledge: [] })]);
      expect(r.code).toBe(2);
      expect(r.err).toContain('knowledge');
    });
  });

  describe('when Ctrl-C arrives during the run', () => {
    it('should stop with CancelledError and exit 1', async () => {
      let sent = false;
      const r = await runVeer(['budget', file('long.json', { ...demo, linearSamples: 10, nonlinearSamples: 500 })], (text) => {
        if (!sent && text.includes('nonlinear')) {
          sent = true;
          process.emit('SIGINT');
        }
      });
      expect(sent).toBe(true);
      expect(r.code).toBe(1);
      expect(r.err).toContain('CancelledError');
    });
  });
});
