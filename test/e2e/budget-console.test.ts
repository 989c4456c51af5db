/**
 * The Δv budget in the console, in real headless Chromium against the real API, an in-process worker and a
 * real Redis: submit a budget request from the form, follow it to the study, and see the study notice, the
 * caveats, one |Δv| histogram per burn and path, and the delivery ellipse. What the page shows is checked
 * against the study the API returns (fetched here over HTTP).
 */
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, type TestService } from '../harness/service.ts';
import { launchChromium, type TestBrowser } from './browser.ts';
import { buildConsole } from './build-console.ts';
import { watchErrors } from './page-checks.ts';

let svc: TestService;
let browser: TestBrowser;
let page: Page;
const pageErrors: string[] = [];
const demo = JSON.parse(readFileSync(new URL('../../examples/flyby-budget-demo.json', import.meta.url), 'utf8')) as Record<string, unknown>;

beforeAll(async () => {
  buildConsole();
  svc = await startService();
  await svc.startWorkerInProcess({ concurrency: 1, batchSize: 4 });
  browser = await launchChromium();
  page = watchErrors(await browser.context.newPage(), pageErrors);
});

afterAll(async () => {
  await browser?.close();
  await svc?.close();
});

describe('Δv budget in the console', () => {
  describe('when a submitter sends a budget request from the form', () => {
    it('should show the study with its notice, caveats, histograms per burn and delivery ellipse', async () => {
      await page.goto(`${svc.url}/console/`);
      await page.getByLabel('Access token').fill(svc.tokens.submitter);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL(/#\/jobs$/);
      await page.getByRole('link', { name: 'Δv budget' }).click();
      await page.getByLabel(/Budget request/).fill(JSON.stringify({ ...demo, linearSamples: 400, nonlinearSamples: 8 }));
      await page.getByLabel('Why this budget is needed').fill('console test: budget of the remaining correction burns');
      await page.getByRole('button', { name: 'Submit budget' }).click();
      await page.waitForURL(/#\/budgets\/[^/]+$/);
      const jobId = decodeURIComponent(page.url().split('#/budgets/')[1]);
      await page.getByTestId('budget-study').waitFor({ timeout: 240_000 });
      expect(await page.getByTestId('study-notice').textContent()).toMatch(/STUDY, never a plan.*qualified flight-dynamics staff/);
      const api = await svc.request('GET', `/v1/budgets/${jobId}/study`, { token: svc.tokens.submitter });
      const study = api.body.study as { caveats: { code: string }[]; linear: { burns: { label: string; deltaVMS: { p99: number } }[] } };
      const shown = await page.getByTestId('budget-study').textContent();
      for (const c of study.caveats) expect(shown).toContain(c.code);
      expect(await page.getByTestId('budget-histogram').count()).toBe(4); // 2 burns × 2 paths
      expect(await page.getByTestId('budget-delivery').count()).toBe(2);
      const tcm2 = study.linear.burns[1];
      expect(await page.getByTestId('budget-histogram').nth(1).textContent()).toContain(`Δv99 ${tcm2.deltaVMS.p99.toFixed(4)} m/s`);
      // The per-burn linear/non-linear check, as the study holds it.
      const agreement = (api.body.study as { agreement: { burns: { label: string; meanPValue: number }[] } }).agreement;
      const rows = page.getByTestId('budget-agreement').locator('tbody tr');
      expect(await rows.count()).toBe(2);
      for (const [i, b] of agreement.burns.entries()) {
        expect(await rows.nth(i).textContent()).toContain(`${b.label}Δv x, Δv y, Δv z8${b.meanPValue.toPrecision(3)}`);
      }
      expect(pageErrors).toEqual([]);
    }, 300_000);
  });

  describe('when the request misses a knowledge covariance', () => {
    it('should name the field before sending anything', async () => {
      await page.goto(`${svc.url}/console/#/budgets`);
      await page.getByLabel(/Budget request/).fill(JSON.stringify({ ...demo, knowledge: 'none' }));
      await page.getByLabel('Why this budget is needed').fill('console test: bad request');
      await page.getByRole('button', { name: 'Submit budget' }).click();
      await expect.poll(() => page.getByTestId('budget-issues').textContent()).toContain('request.knowledge');
    });
  });
});
