/**
 * Planning against a mission ephemeris given as a CCSDS OEM (CCSDS 502.0-B-3, the open standard; KVN layout
 * from the standard's annex examples, from memory). The file tabulates Mars relative to the Sun from
 * astronomy-engine (npm 2.1.19) moved by a known constant offset, so it differs from the built-in series by
 * exactly that offset. A plan made with the file must aim at the file's Mars: the independent re-flight
 * (test/reference/independent-flyby.ts: odex + astronomy-engine, on the same offset Mars) lands within 0.1 km
 * of the aim point, while a plan made without the file misses it by about the offset's component across the
 * approach. A plan made on the file is exported again on the same file (`veer export --ephemeris`); refusals:
 * an export or Monte Carlo samples without it or with another file, a problem naming a service set with no
 * files, a file that does not cover the problem, a body the propagator does not know, a corrupted file (line
 * and keyword named). Limits a few times above the measured (in brackets).
 */
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { planToOem, planToOpm } from '../../ccsds/index.ts';
import { loadEphemerisFiles } from '../../cli/ephemeris-option.ts';
import { formatPlanReport } from '../../cli/report/plan-report.ts';
import { parseProblem, planManeuvers, runDispersionSamples, type ManeuverPlan } from '../../planner/index.ts';
import { exportPlanFilesAsCcsds } from '../../cli/commands/ccsds-cli.ts';
import { parseEpoch } from '../../propagator/index.ts';
import { marsOemText } from './mars-oem.ts';
import { runVeer } from '../harness/run-cli.ts';
import { dot, reflyDemoPlan } from './independent-flyby.ts';

const DAY_S = 86400;
const OFFSET_KM = [600, -450, 250];
const marsOem = (name: string, startTdbS: number, endTdbS: number): string => marsOemText(name, startTdbS, endTdbS, OFFSET_KM);
const demo = JSON.parse(readFileSync('examples/flyby-demo.json', 'utf8')) as Record<string, unknown>;
const problem = parseProblem({ ...demo, dispersion: { samples: 0, seed: 1 } });
const dir = mkdtempSync(join(tmpdir(), 'veer-oem-ephemeris-'));

function writeOem(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

const t0 = parseEpoch('2031-08-12T12:00:00 TDB'); // the demo's initial epoch
const fullPath = writeOem('mars-offset.oem', marsOem('MARS', t0 - 4 * DAY_S, t0 + 66 * DAY_S));

describe('planning on an OEM ephemeris', () => {
  let withFile: ManeuverPlan;
  let builtin: ManeuverPlan;

  describe('when Mars comes from a file offset from the built-in series by a known amount', () => {
    it('should aim at the file\'s Mars: the independent re-flight on that Mars lands within 0.1 km (0.02 asserted)', async () => {
      const files = await loadEphemerisFiles([fullPath]);
      withFile = await planManeuvers(problem, { monteCarlo: 'skip', ephemerisFiles: files });
      expect(withFile.status).toBe('converged');
      expect(withFile.crossCheck.passed).toBe(true);
      const flown = reflyDemoPlan(problem, withFile, OFFSET_KM);
      const target = problem.targets.find((t) => t.kind === 'b-plane');
      if (target?.kind !== 'b-plane') throw new Error('demo targets changed');
      // [B·T 3.7e-3 km, B·R < 1e-4 km off the aim point]
      expect(Math.abs(flown.bDotTKm - target.bDotTKm)).toBeLessThan(0.02);
      expect(Math.abs(flown.bDotRKm - target.bDotRKm)).toBeLessThan(0.02);
    });

    it('should miss the file\'s Mars by about the offset across the approach when planned without the file', async () => {
      builtin = await planManeuvers(problem, { monteCarlo: 'skip' });
      const flown = reflyDemoPlan(problem, builtin, OFFSET_KM);
      const target = problem.targets.find((t) => t.kind === 'b-plane');
      if (target?.kind !== 'b-plane') throw new Error('demo targets changed');
      const miss = Math.hypot(flown.bDotTKm - target.bDotTKm, flown.bDotRKm - target.bDotRKm);
      const [, tHat, rHat] = flown.axes;
      const across = Math.hypot(dot(OFFSET_KM, tHat), dot(OFFSET_KM, rHat));
      // [misses by 664.8 km; the offset's component across the approach is 664.7 km]
      expect(Math.abs(miss - across)).toBeLessThan(0.02 * across);
    });

    it('should record each body\'s source, cover the file in the problem hash and name only built-in bodies in the caveat', () => {
      const mars = withFile.ephemerisSources?.find((s) => s.body === 'mars');
      expect(mars).toMatchObject({ source: 'oem', file: 'mars-offset.oem' });
      expect(mars?.source === 'oem' ? mars.sha256 : '').toMatch(/^[0-9a-f]{64}$/);
      expect(withFile.ephemerisSources?.find((s) => s.body === 'earth')).toMatchObject({ source: 'built-in' });
      expect(withFile.problemHash).not.toBe(builtin.problemHash);
      const caveat = withFile.caveats.find((c) => c.code === 'BUILTIN_EPHEMERIS_ACCURACY');
      expect(caveat?.text).toContain('earth, jupiter, saturn, venus');
      expect(caveat?.text).not.toContain('mars');
      expect(builtin.caveats.find((c) => c.code === 'BUILTIN_EPHEMERIS_ACCURACY')?.text).toContain('mars');
    });

    it('should carry the sources in the CCSDS export\'s COMMENT lines and refuse an OEM export without the file', async () => {
      const opm = planToOpm(problem, withFile, { creationDateUtc: '2031-08-12T00:00:00' });
      const sha = withFile.ephemerisSources?.find((s) => s.body === 'mars');
      expect(opm.header.comments.join('\n')).toContain(`ephemeris mars: OEM mars-offset.oem sha256 ${sha?.source === 'oem' ? sha.sha256 : '?'}`);
      expect(opm.header.comments.join('\n')).toMatch(/ephemeris earth, jupiter, saturn, sun, venus: built-in astronomy-engine/);
      expect(formatPlanReport(withFile)).toContain('ephemeris mars: OEM mars-offset.oem sha256 ');
      await expect(planToOem(problem, withFile, { creationDateUtc: '2031-08-12T00:00:00', stepS: 86400 }))
        .rejects.toThrow(expect.objectContaining({ field: 'ephemeris' }));
    });
  });

  describe('when a plan made on a file is used again', () => {
    it('should export OEM from plan files with the same file again, and refuse without it or with another file', async () => {
      const planPath = join(dir, 'plan.json');
      const problemPath = join(dir, 'problem.json');
      writeFileSync(planPath, JSON.stringify(withFile));
      writeFileSync(problemPath, JSON.stringify({ ...demo, dispersion: { samples: 0, seed: 1 } }));
      const sha = withFile.ephemerisSources?.find((s) => s.body === 'mars');
      const base = { kind: 'oem' as const, planPath, problemPath, stepS: 86400 };
      const { text } = await exportPlanFilesAsCcsds({ ...base, ephemerisPaths: [fullPath] });
      expect(text).toContain(`ephemeris mars: OEM mars-offset.oem sha256 ${sha?.source === 'oem' ? sha.sha256 : '?'}`);
      await expect(exportPlanFilesAsCcsds(base)).rejects.toThrow(/needs the same files .*veer export --ephemeris FILE/);
      // The same Mars moved 1 m more: another SHA-256, refused naming the body and both files.
      const other = writeOem('mars-other.oem', marsOemText('MARS', t0 - 4 * DAY_S, t0 + 66 * DAY_S, [601, -450, 250]));
      await expect(exportPlanFilesAsCcsds({ ...base, ephemerisPaths: [other] }))
        .rejects.toThrow(/not the ones the plan was made on: mars: the plan used mars-offset\.oem \(sha256 [0-9a-f]{12}…\), here mars-other\.oem/);
    });

    it('should refuse Monte Carlo samples without the plan\'s file, and a problem naming a service set without files', async () => {
      await expect(runDispersionSamples(problem, withFile, { seed: 1, firstIndex: 0, count: 1 }))
        .rejects.toThrow(expect.objectContaining({ field: 'ephemeris' }));
      const named = parseProblem({ ...demo, dispersion: { samples: 0, seed: 1 }, forceModel: { ...(demo.forceModel as object), ephemerisSet: 'mission-a' } });
      await expect(planManeuvers(named, { monteCarlo: 'skip' })).rejects.toThrow(expect.objectContaining({ field: 'forceModel.ephemerisSet' }));
    });
  });

  describe('when a file cannot serve the problem', () => {
    it('should refuse a span that does not cover the problem, naming file, body and the uncovered epochs', async () => {
      const short = writeOem('mars-short.oem', marsOem('MARS', t0 - 4 * DAY_S, t0 + 30 * DAY_S));
      const files = await loadEphemerisFiles([short]);
      await expect(planManeuvers(problem, { monteCarlo: 'skip', ephemerisFiles: files }))
        .rejects.toThrow(/mars-short\.oem: mars is tabulated from .* which does not cover 2031-09-1\d.* to 2031-10-13T12:00:00\.000 TDB/);
      const run = await runVeer(['plan', 'examples/flyby-demo.json', '--ephemeris', short]);
      expect(run.code).toBe(2);
      expect(run.err).toContain('mars-short.oem');
    });
    it('should refuse a body the propagator does not know, naming the file', async () => {
      const unknown = writeOem('comet.oem', marsOem('COMET X', t0, t0 + 2 * DAY_S));
      await expect(loadEphemerisFiles([unknown])).rejects.toThrow(/comet\.oem: .*COMET X.* not a body the propagator knows/);
    });
    it('should refuse a corrupted file naming the line and the keyword', async () => {
      const text = marsOem('MARS', t0, t0 + 2 * DAY_S).replace('REF_FRAME = EME2000', 'REF_FRAME = NOT A FRAME');
      const bad = writeOem('corrupted.oem', text);
      await expect(loadEphemerisFiles([bad])).rejects.toThrow(expect.objectContaining({ field: 'REF_FRAME', line: 9 }));
      await expect(loadEphemerisFiles([bad])).rejects.toThrow(/corrupted\.oem/);
    });
  });
});
