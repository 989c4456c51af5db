/**
 * A finite-burn plan in the console (real headless Chromium): the demo flyby retargeted with a 1 N engine
 * and a finite TCM-1 shows the burn's command row (ignition, duration, direction, masses, loss) under the
 * burn table and its thrust arc on the trajectory plot. Expected values come from the plan the API returns.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, type TestService } from '../harness/service.ts';
import type { TestBrowser } from './browser.ts';
import { buildConsole } from './build-console.ts';
import { planDemo, reviewerPage } from './demo-plan.ts';

let svc: TestService;
let browser: TestBrowser;
let page: Page;
let planId = '';
let finite: { durationS: number; finiteBurnLossMS: number; start: { tdb: string } };

beforeAll(async () => {
  buildConsole();
  svc = await startService();
  await svc.startWorkerInProcess({ concurrency: 1 });
  let plan: { burns: { finite: typeof finite }[] };
  ({ planId, plan } = await planDemo<typeof plan>(svc, (demo) => {
    demo.dispersion.samples = 0;
    demo.spacecraft.engine.thrustN = 1;
    demo.burns[0].model = 'finite';
  }));
  finite = plan.burns[0].finite;
  ({ browser, page } = await reviewerPage(svc));
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
