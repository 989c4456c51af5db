/**
 * Ephemeris sets in the console (real headless Chromium, the service with EPHEMERIS_DIR): the submit screen
 * offers the service's sets (GET /v1/ephemerides) beside the built-in default, and the review screen of a plan
 * made on a set names the source of each body — the set's file with its SHA-256 for Mars, the built-in series
 * for the rest. The set's file is the offset-Mars CCSDS OEM of the reference tests (test/reference/mars-oem.ts:
 * CCSDS 502.0-B-3 KVN layout, from memory; astronomy-engine npm 2.1.19 positions). Expected values come from the
 * plan the API returns.
 */
import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseEpoch } from '../../propagator/index.ts';
import { startService, type TestService } from '../harness/service.ts';
import { marsOemText } from '../reference/mars-oem.ts';
import type { TestBrowser } from './browser.ts';
import { buildConsole } from './build-console.ts';
import { planDemo, reviewerPage } from './demo-plan.ts';

const DAY_S = 86400;
const t0 = parseEpoch('2031-08-12T12:00:00 TDB'); // the demo's initial epoch
const setsDir = mkdtempSync(join(tmpdir(), 'veer-console-sets-'));
mkdirSync(join(setsDir, 'mission-a'));
const marsPath = join(setsDir, 'mission-a', 'mars.oem');
writeFileSync(marsPath, marsOemText('MARS', t0 - 4 * DAY_S, t0 + 66 * DAY_S, [600, -450, 250]));
const marsSha256 = createHash('sha256').update(readFileSync(marsPath)).digest('hex');

let svc: TestService;
let browser: TestBrowser;
let page: Page;
let planId = '';

beforeAll(async () => {
  buildConsole();
  svc = await startService({ ephemerisDir: setsDir });
  await svc.startWorkerInProcess({ concurrency: 1 });
  ({ planId } = await planDemo(svc, (demo) => {
    demo.dispersion.samples = 0;
    demo.forceModel.ephemerisSet = 'mission-a';
  }));
  ({ browser, page } = await reviewerPage(svc));
}, 300_000);

afterAll(async () => {
  await browser?.close();
  await svc?.close();
});

describe('the console and ephemeris sets', () => {
  describe('when a plan made on a set is reviewed', () => {
    it('should name the set\'s file and its SHA-256 as Mars\'s source and the built-in series for the other bodies', async () => {
      await page.goto(`${svc.url}/console/#/plans/${planId}`);
      const sources = page.getByTestId('ephemeris-sources');
      await sources.waitFor();
      const text = await sources.innerText();
      expect(text).toContain(`mars: OEM mars.oem sha256 ${marsSha256}`);
      expect(text).toMatch(/earth, .*sun.*: built-in astronomy-engine/);
    });
  });

  describe('when a submitter opens the submit screen', () => {
    it('should offer the built-in series by default and each set of the service with its bodies', async () => {
      await page.goto(`${svc.url}/console/`);
      await page.evaluate(() => sessionStorage.clear());
      await page.goto(`${svc.url}/console/`);
      await page.getByLabel('Access token').fill(svc.tokens.submitter);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL(/#\/jobs$/);
      await page.goto(`${svc.url}/console/#/submit`);
      const select = page.getByLabel('Ephemeris');
      await page.getByText('A set\'s OEM files serve the bodies they tabulate').waitFor();
      const options = await select.locator('option').allInnerTexts();
      expect(options[0]).toMatch(/^built-in series/);
      expect(options[1]).toBe('mission-a: mars 2031-08-08 to 2031-10-17');
      await expect(select.inputValue()).resolves.toBe('');
    });
  });
});
