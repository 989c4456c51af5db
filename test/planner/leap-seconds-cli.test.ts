/**
 * `veer plan` and `veer propagate` with UTC epochs past the built-in leap-second table's expiry (2026-06-28,
 * the IERS list of Bulletin C 70), with --leap-seconds / VEER_LEAP_SECONDS naming a list with an INVENTED
 * extra leap second (test/fixtures/leap-seconds/README.md), and with a tampered copy of it.
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, afterEach, describe, expect, it } from 'vitest';
import { runVeer } from '../harness/run-cli.ts';
import { twoBodyProblemInUtc } from './two-body-fixture.ts';

const INVENTED = resolve('test/fixtures/leap-seconds/invented-2027.list');
const INVENTED_SHA256 = createHash('sha256').update(readFileSync(INVENTED)).digest('hex');
const dir = mkdtempSync(join(tmpdir(), 'veer-leap-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
afterEach(() => { delete process.env.VEER_LEAP_SECONDS; });

function file(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content));
  return path;
}
const problemPath = (): string => file('utc-2027.json', twoBodyProblemInUtc('2027-08-11T00:00:00Z'));

describe('veer plan with UTC epochs', () => {
  describe('when the problem is dated after the built-in table\'s expiry', () => {
    it('should plan (exit 0), print UTC burn epochs beside TDB and the caveat', async () => {
      const r = await runVeer(['plan', problemPath()]);
      expect(r.code).toBe(0);
      expect(r.out).toMatch(/TCM-1\s+2027-08-11T00:10:00\.000 UTC\s+2027-08-11T00:11:09\.\d{3} TDB/);
      expect(r.out).toContain('UTC_LEAP_SECONDS_ASSUMED');
      expect(r.out).toContain('Leap seconds: built-in table, expires 2026-06-28');
      expect(r.out).toContain('Initial state: 2027-08-11T00:00:00.000 UTC = ');
    });
  });
  describe('when --leap-seconds names a list with an invented leap second at the end of 2026', () => {
    it('should plan with it: the file and its SHA-256 in the report, TDB 1 s later, no caveat', async () => {
      const r = await runVeer(['plan', problemPath(), '--leap-seconds', INVENTED, '--json']);
      expect(r.code).toBe(0);
      const plan = JSON.parse(r.out);
      expect(plan.leapSeconds).toMatchObject({ source: 'file', path: INVENTED, sha256: INVENTED_SHA256, expiresUtc: '2027-12-28' });
      expect(plan.burns[0].epoch.utc).toBe('2027-08-11T00:10:00.000 UTC');
      expect(plan.burns[0].epoch.tdb).toMatch(/^2027-08-11T00:11:10\.\d{3} TDB$/);
      expect(plan.caveats.map((c: { code: string }) => c.code)).not.toContain('UTC_LEAP_SECONDS_ASSUMED');
    });
    it('should take the same list from VEER_LEAP_SECONDS and print its SHA-256', async () => {
      process.env.VEER_LEAP_SECONDS = INVENTED;
      const r = await runVeer(['plan', problemPath()]);
      expect(r.code).toBe(0);
      expect(r.out).toContain(`Leap seconds: ${INVENTED} (SHA-256 ${INVENTED_SHA256}), expires 2027-12-28`);
    });
  });
  describe('when the list is tampered', () => {
    it('should refuse it (exit 2) naming the file and the #h line, before planning', async () => {
      const tampered = file('tampered.list', readFileSync(INVENTED, 'utf8').replace('3692217600 37', '3692217600 38'));
      const r = await runVeer(['plan', problemPath(), '--leap-seconds', tampered]);
      expect(r.code).toBe(2);
      expect(r.err).toMatch(/tampered\.list: line \d+: '#h' SHA-1 [0-9a-f]{40} does not match/);
      expect(r.out).toBe('');
    });
    it('should name --leap-seconds when the file cannot be read', async () => {
      const r = await runVeer(['plan', problemPath(), '--leap-seconds', join(dir, 'missing.list')]);
      expect(r.code).toBe(2);
      expect(r.err).toContain('--leap-seconds: cannot read the leap-seconds list');
    });
  });
});

describe('veer budget with a leap-seconds list', () => {
  const demo = JSON.parse(readFileSync('examples/flyby-budget-demo.json', 'utf8')) as Record<string, unknown>;
  it('should refuse a tampered list before any work and name the list in the caveat of a study past its expiry', async () => {
    const tampered = file('tampered-budget.list', readFileSync(INVENTED, 'utf8').replace('3692217600 37', '3692217600 38'));
    const request = file('budget.json', { ...demo, linearSamples: 50, nonlinearSamples: 0 });
    const refused = await runVeer(['budget', request, '--leap-seconds', tampered]);
    expect(refused.code).toBe(2);
    expect(refused.err).toMatch(/tampered-budget\.list: line \d+: '#h' SHA-1/);
    const r = await runVeer(['budget', request, '--leap-seconds', INVENTED, '--json']);
    const text = JSON.parse(r.out).caveats.find((c: { code: string }) => c.code === 'UTC_LEAP_SECONDS_ASSUMED')?.text;
    // The demo is dated 2031, past the invented list's expiry 2027-12-28.
    expect(text).toContain(`expiry 2027-12-28 of the leap-second table (${INVENTED} (SHA-256 ${INVENTED_SHA256}))`);
    expect(text).toContain('TAI − UTC = 38 s is assumed');
    // The study's nominal burns show UTC (through the invented list) beside TDB.
    expect(JSON.parse(r.out).nominal.burns[0].epochUtc).toMatch(/^2031-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3} UTC$/);
  });
});

describe('veer propagate with UTC epochs', () => {
  const request = (): string => file('prop.json', {
    initial: { epoch: '2027-08-11T00:00:00Z', centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: [7000, 0, 1000], velocityKmS: [0, 7.6, 1] },
    durationS: 600, forces: { centralBody: 'earth', perturbingBodies: [] },
  });
  it('should print UTC beside TDB and warn that UTC past the expiry is assumed', async () => {
    const r = await runVeer(['propagate', request()]);
    expect(r.code).toBe(0);
    expect(r.out).toContain('start   2027-08-11T00:00:00.000 UTC = 2027-08-11T00:01:09.');
    expect(r.out).toContain('reached 2027-08-11T00:10:00.000 UTC = ');
    expect(r.out).toMatch(/warning: UTC past the leap-second table's expiry 2026-06-28 assumes TAI − UTC = 37 s/);
  });
  it('should read the same request 1 s later in TDB with the invented list, and say which list in the JSON', async () => {
    const builtin = JSON.parse((await runVeer(['propagate', request(), '--json'])).out);
    const withFile = JSON.parse((await runVeer(['propagate', request(), '--json', '--leap-seconds', INVENTED])).out);
    expect(withFile.final.epochTdbS - builtin.final.epochTdbS).toBeCloseTo(1, 6);
    expect(withFile.final.utc).toBe('2027-08-11T00:10:00.000000 UTC');
    expect(withFile.run.leapSeconds).toEqual({ source: 'file', path: INVENTED, sha256: INVENTED_SHA256, expiresUtc: '2027-12-28' });
  });
});
