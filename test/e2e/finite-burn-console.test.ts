/**
 * A finite-burn plan in the console (real headless Chromium): the demo flyby retargeted with a 1 N engine
 * and a finite TCM-1 shows the burn's command row (ignition, duration, direction, masses, loss) under the
 * burn table and its thrust arc on the trajectory plot. Expected values come from the plan the API returns.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, waitForJob, type TestService } from '../harness/service.ts';
import { submission } from '../queue/fixtures.ts';
import { launchChromium, type TestBrowser } from './browser.ts';
import { buildConsole } from './build-console.ts';

const ROOT = resolve(import.meta.dirname, '../..');
let svc: TestService;
let browser: TestBrowser;
let page: Page;
let planId = '';
let finite: { durationS: number; finiteBurnLossMS: number; start: { tdb: string } };

beforeAll(async () => {
  buildConsole();
  svc = await startService();
  await svc.startWorkerInProcess({ concurrency: 1 });
  const demo = JSON.parse(readFileSync(resolve(ROOT, 'examples/flyby-demo.json'), 'utf8'));
  demo.dispersion.samples = 0;
  demo.spacecraft.engine.thrustN = 1;
  demo.burns[0].model = 'finite';
  const submitted = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(demo) });
  const done = await waitForJob(svc, submitted.body.jobId, (s) => s.state === 'completed' || s.state === 'failed', 240_000);
  expect(done.state).toBe('completed');
  planId = done.result.planId;
  const plan = (await svc.request('GET', `/v1/plans/${planId}`, { token: svc.tokens.reviewer })).body.plan;
  finite = plan.burns[0].finite;
  browser = await launchChromium();
  page = await browser.context.newPage();
  await page.goto(`${svc.url}/console/`);
  await page.getByLabel('Access token').fill(svc.tokens.reviewer);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/#\/jobs$/);
}, 300_000);

afterAll(async () => {
  await browser?.close();
  await svc?.close();
});

describe('the console on a finite-burn plan', () => {
  describe('when the plan review opens', () => {
    it('should show the finite burn row with the plan JSON numbers and its arc on the plot', async () => {
      await page.goto(`${svc.url}/console/#/plans/${planId}`);
      const row = page.getByTestId('finite-burn-row');
      await row.waitFor();
      // The console groups digits with a thin space (3 528.281); compare without the grouping.
      const text = (await row.innerText()).replace(/(\d)\s(?=\d)/gu, '$1');
      expect(text).toContain(`duration ${finite.durationS.toFixed(3)} s`);
      const loss = /finite-burn loss (-?[\d.]+) m\/s/u.exec(text);
      expect(Math.abs(Number(loss?.[1]) - finite.finiteBurnLossMS)).toBeLessThan(5e-5); // printed to 0.1 mm/s
      expect(text).toContain(finite.start.tdb.replace(' TDB', ''));
      await expect(page.getByTestId('burn-arc').count()).resolves.toBeGreaterThan(0);
    });
  });
});
