/**
 * The ops console end to end in real headless Chromium against the real API, an in-process worker (planner
 * threads) and a real Redis: sign in, check a problem in the browser, submit the demo flyby, follow its
 * progress to 100 %, review the plan (two-person rule, caveat checklist gating Approve), approve as a second
 * reviewer, and see the history verified. Screenshots go to test-artifacts/console/ (not committed).
 *
 * What the browser shows is checked against independent sources: the plan and history the API returns
 * (fetched here over HTTP), the planner's problemHash of examples/flyby-demo.json computed in this process,
 * and the archive's own hash check (`hashMatches`).
 */
import { mkdirSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseProblem, planLeapSeconds, problemHash } from '../../planner/index.ts';
import { BUILTIN_LEAP_SECONDS } from '../../propagator/index.ts';
import { startService, waitForJob, type TestService } from '../harness/service.ts';
import { reachableProblem, submission } from '../queue/fixtures.ts';
import { launchChromium, type TestBrowser } from './browser.ts';
import { buildConsole } from './build-console.ts';
import { contrastRatio, contrastSamples, horizontalOverflow, watchErrors } from './page-checks.ts';

const ROOT = resolve(import.meta.dirname, '../..');
const DEMO = resolve(ROOT, 'examples/flyby-demo.json');
const SHOTS = resolve(ROOT, 'test-artifacts/console');

let svc: TestService;
let browser: TestBrowser;
let submitterPage: Page;
let reviewerPage: Page;
let samToken: string;
let planId = '';
/** Script errors and console errors (CSP refusals included) from every page; failed-resource lines excluded. */
const pageErrors: string[] = [];

/** Saves a screenshot, after checking the screen does not scroll sideways at this viewport. */
async function shot(page: Page, name: string): Promise<void> {
  expect(await horizontalOverflow(page), `${name} scrolls sideways`).toBe(0);
  await page.screenshot({ path: resolve(SHOTS, `${name}.png`), fullPage: false });
}

async function signIn(page: Page, token: string): Promise<void> {
  await page.goto(`${svc.url}/console/`);
  await page.getByLabel('Access token').fill(token);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/#\/jobs$/);
}

beforeAll(async () => {
  mkdirSync(SHOTS, { recursive: true });
  buildConsole();
  svc = await startService();
  await svc.startWorkerInProcess({ concurrency: 1 });
  // A person who both submits and reviews: the two-person rule, not a missing role, must block their approval.
  samToken = (await svc.tokenStore.add('sam', ['submitter', 'reviewer'])).token;
  browser = await launchChromium();
  submitterPage = watchErrors(await browser.context.newPage(), pageErrors);
  reviewerPage = watchErrors(await browser.context.newPage(), pageErrors);
});

afterAll(async () => {
  await browser?.close();
  await svc?.close();
});

describe('ops console', () => {
  describe('when signing in', () => {
    it('should refuse an unknown token and accept a valid one, naming the identity and roles', async () => {
      const page = submitterPage;
      await page.goto(`${svc.url}/console/`);
      await expect.poll(() => page.getByTestId('proposal-notice').textContent()).toMatch(/qualified flight-dynamics staff/);
      await page.getByLabel('Access token').fill('veer_not-a-real-token');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await expect.poll(() => page.locator('#token-error').textContent()).toMatch(/unknown or has been revoked/);
      expect(await page.locator('#token').getAttribute('aria-invalid')).toBe('true');
      await shot(page, '01-sign-in');
      await signIn(page, samToken);
      expect(await page.getByTestId('identity').textContent()).toBe('sam');
      // Record every value the progress bar shows (the console is one document; hash routes keep it alive).
      await page.evaluate(() => {
        const seen: string[] = [];
        (window as unknown as { progressSeen: string[] }).progressSeen = seen;
        new MutationObserver((records) => {
          for (const r of records) if (r.attributeName === 'aria-valuenow') seen.push((r.target as Element).getAttribute('aria-valuenow') ?? '');
        }).observe(document.body, { attributes: true, subtree: true, attributeFilter: ['aria-valuenow'] });
      });
      expect(await page.locator('.who-roles').textContent()).toBe('submitter · reviewer');
    });
  });

  describe('when a problem is checked in the browser', () => {
    it('should list schema issues of a pasted file by field path', async () => {
      const page = submitterPage;
      await page.getByRole('link', { name: 'New job' }).click();
      const broken = JSON.parse(readFileSync(DEMO, 'utf8')) as { burns: Record<string, unknown>[] };
      delete broken.burns[0].epoch;
      await page.getByLabel('Problem (JSON text)').fill(JSON.stringify(broken));
      await page.getByLabel('Reason for this job').fill('console test: retarget after the latest orbit determination');
      await page.getByRole('button', { name: 'Check and submit' }).click();
      await expect.poll(() => page.locator('#problem-text-error').textContent()).toContain('burns[0].epoch');
      expect(await page.locator('#problem-text').getAttribute('aria-invalid')).toBe('true');
      await shot(page, '02-submit-file-errors');
    });

    it('should show a bad form value beside its field, and submit the corrected form as exactly the demo problem', async () => {
      const page = submitterPage;
      await page.locator('#problem-file').setInputFiles(DEMO);
      await expect.poll(() => page.locator('#problem-text').inputValue()).toContain('Saltmarsh');
      await page.getByRole('button', { name: 'Open this file in the form' }).click();
      expect(await page.getByTestId('kept-from-file').textContent()).toContain('initialState.covarianceKmKmS');
      const mass = page.getByLabel('Wet mass (kg)');
      expect(await mass.inputValue()).toBe('612');
      await mass.fill('-5');
      await page.getByRole('button', { name: 'Check and submit' }).click();
      await expect.poll(() => page.locator('#pf-spacecraft-massKg-error').textContent()).toMatch(/>0|positive|too small/i);
      expect(await mass.getAttribute('aria-invalid')).toBe('true');
      expect(await page.locator('.error-summary').textContent()).toContain('spacecraft.massKg');
      await shot(page, '03-submit-form-error');
      // A second burn appears with its own fields; its missing epoch is reported beside that field.
      await page.getByLabel('Number of burns').selectOption('2');
      await page.locator('#pf-burns-1-frame').selectOption('VNB');
      expect(await page.locator('#pf-burns-1-deltaVGuessKmS legend').textContent()).toBe('First guess of Δv (km/s)');
      expect(await page.locator('#pf-burns-1-deltaVGuessKmS label').allTextContents()).toEqual(['V', 'N', 'B']);
      await mass.fill('612');
      await page.getByRole('button', { name: 'Check and submit' }).click();
      await expect.poll(() => page.locator('#pf-burns-1-epoch-error').textContent()).not.toBe('');
      expect(await page.locator('#pf-burns-1-epoch').getAttribute('aria-invalid')).toBe('true');
      expect(await page.locator('#pf-spacecraft-massKg-error').textContent()).toBe('');
      await page.getByLabel('Number of burns').selectOption('1');
      expect(await page.locator('#pf-burns-0-label').inputValue()).toBe('TCM-1'); // redrawing kept what burn 1 says
      await page.getByRole('button', { name: 'Check and submit' }).click();
      await page.waitForURL(/#\/jobs\/[^/]+$/);
      const jobId = decodeURIComponent(page.url().split('#/jobs/')[1]);
      const status = await svc.request('GET', `/v1/jobs/${jobId}`, { token: svc.tokens.auditor });
      expect(status.body.submittedBy).toBe('sam');
      // The form kept what it does not show (covariance, solar pressure, limits): same canonical problem hash.
      const expected = problemHash(parseProblem(JSON.parse(readFileSync(DEMO, 'utf8'))), planLeapSeconds(BUILTIN_LEAP_SECONDS));
      expect(status.body.problemHash).toBe(expected);
    });
  });

  describe('when the job runs', () => {
    it('should follow the event stream to 100 % and offer the proposed plan', async () => {
      const page = submitterPage;
      const bar = page.getByTestId('job-progress');
      // Until the job ends (the machine may be busy; the demo takes ~10 s alone), then the bar must read 100 %.
      await expect.poll(() => page.getByTestId('job-state').textContent(), { timeout: 85_000, interval: 250 }).toMatch(/finished|failed|cancelled/);
      expect(await page.locator('.outcome').textContent()).not.toMatch(/failed|Error/);
      expect(await page.getByTestId('job-progress-text').textContent()).toBe('100 %');
      expect(await bar.getAttribute('aria-valuenow')).toBe('100');
      // Fed by the event stream: intermediate values were shown on the way, never going backwards.
      const seen = (await page.evaluate(() => (window as unknown as { progressSeen: string[] }).progressSeen)).map(Number);
      expect(seen.some((v) => v > 0 && v < 100)).toBe(true);
      expect(seen.every((v, i) => i === 0 || v >= seen[i - 1])).toBe(true);
      expect(await page.getByTestId('job-state').textContent()).toBe('finished');
      await expect.poll(() => page.getByTestId('job-outcome').textContent(), { timeout: 15_000 }).toContain('the cross-check passed');
      await shot(page, '04-jobs-complete');
      const link = page.getByTestId('open-plan');
      planId = decodeURIComponent(((await link.getAttribute('href')) ?? '').replace('#/plans/', ''));
      const plan = await svc.request('GET', `/v1/plans/${planId}`, { token: svc.tokens.auditor });
      expect(plan.status).toBe(200);
      expect(plan.body.plan.problemHash).toBe(problemHash(parseProblem(JSON.parse(readFileSync(DEMO, 'utf8'))), planLeapSeconds(BUILTIN_LEAP_SECONDS)));
      await link.click();
      await page.waitForURL(new RegExp(`#/plans/${planId}$`));
    });
  });

  describe('when the submitter opens the plan', () => {
    it('should show the plan data and plots, state the two-person rule, and keep Approve disabled even with every caveat ticked', async () => {
      const page = submitterPage;
      const api = (await svc.request('GET', `/v1/plans/${planId}`, { token: svc.tokens.auditor })).body.plan;
      await page.getByTestId('burn-table').waitFor();
      const burnText = await page.getByTestId('burn-table').textContent();
      expect(burnText).toContain(api.burns[0].label);
      expect(burnText).toContain(api.burns[0].magnitudeMS.toFixed(3));
      // UTC beside TDB (the demo's 2031 dates lie past the built-in leap-second table: UTC assumed, with the caveat).
      expect(burnText).toContain(`UTC ${api.burns[0].epoch.utc.replace('T', ' ')}`);
      expect(await page.locator('.plan-head').textContent()).toContain(`Leap secondsbuilt-in table, expires ${api.leapSeconds.expiresUtc}`);
      expect(await page.getByTestId('trajectory-plot').textContent()).toContain(`Start ${api.createdFrom.initialEpoch.utc.replace('T', ' ')} · `);
      expect(api.caveats.map((c: { code: string }) => c.code)).toContain('UTC_LEAP_SECONDS_ASSUMED');
      const targetText = await page.getByTestId('target-table').textContent();
      expect(targetText).toContain('B·T');
      expect(targetText).toContain('✓ met');
      const bPlane = page.getByTestId('b-plane-plot');
      expect(await bPlane.textContent()).toContain('reference plane: ecliptic');
      expect(await bPlane.locator('ellipse').count()).toBe(4); // 1σ and 3σ in each of the two panels
      expect(await bPlane.locator('.impact-circle').count()).toBe(2);
      expect(await page.getByTestId('trajectory-plot').locator('.mk-burn').count()).toBe(api.burns.length);
      expect(await page.getByTestId('scale-bar').textContent()).toMatch(/million km/);
      expect(await page.getByTestId('cross-check').textContent()).toContain(api.crossCheck.passed ? 'passed' : 'failed');
      expect(await page.getByTestId('two-person').textContent()).toContain('you submitted this job; another reviewer must approve');
      const boxes = page.getByTestId('caveat-check');
      expect(await boxes.count()).toBe(api.caveats.length);
      await shot(page, '05-plan-review-submitter');
      for (let i = 0; i < api.caveats.length; i += 1) await boxes.nth(i).check();
      expect(await page.getByTestId('approve').isDisabled()).toBe(true);
      expect(await page.getByTestId('approve-why').textContent()).toContain('another reviewer must approve');
      await page.getByTestId('b-plane-plot').scrollIntoViewIfNeeded();
      await shot(page, '06-plan-review-b-plane');
      await page.getByTestId('trajectory-plot').scrollIntoViewIfNeeded();
      await shot(page, '07-plan-review-trajectory');
    });
  });

  describe('when a second reviewer reviews the plan', () => {
    it('should enable Approve only after the last caveat is ticked, and record the approval', async () => {
      const page = reviewerPage;
      // Keyboard only: Tab to the token field, type, Enter.
      await page.goto(`${svc.url}/console/`);
      for (let i = 0; i < 6 && await page.evaluate(() => document.activeElement?.id) !== 'token'; i += 1) await page.keyboard.press('Tab');
      expect(await page.evaluate(() => document.activeElement?.id)).toBe('token');
      await page.keyboard.type(svc.tokens.reviewer);
      await page.keyboard.press('Enter');
      await page.waitForURL(/#\/jobs$/);
      await page.goto(`${svc.url}/console/#/plans/${planId}`);
      await page.getByTestId('approve').waitFor();
      expect(await page.getByTestId('two-person').count()).toBe(0);
      const boxes = page.getByTestId('caveat-check');
      const n = await boxes.count();
      expect(n).toBeGreaterThan(0);
      for (let i = 0; i < n; i += 1) {
        expect(await page.getByTestId('approve').isDisabled()).toBe(true);
        await boxes.nth(i).focus();
        await page.keyboard.press('Space');
        expect(await boxes.nth(i).isChecked()).toBe(true);
      }
      expect(await page.getByTestId('approve').isEnabled()).toBe(true);
      // Unticking one disables it again.
      await boxes.nth(n - 1).uncheck();
      expect(await page.getByTestId('approve').isDisabled()).toBe(true);
      await boxes.nth(n - 1).check();
      expect(await page.getByTestId('reject').isDisabled()).toBe(true); // a rejection needs a comment
      await page.getByLabel('Comment').fill('Burn and B-plane aim point checked against the mission team’s own solution.');
      // Text contrast of the main kinds of text on this screen: at least 4.5:1 (WCAG 2.2 SC 1.4.3, level AA).
      // A severity badge is sampled when the plan carries a caveat of that severity (a missing sample fails).
      const shown = (await svc.request('GET', `/v1/plans/${planId}`, { token: svc.tokens.auditor })).body.plan.caveats as { severity: string }[];
      const badges = ['critical', 'warning', 'info'].filter((s) => shown.some((c) => c.severity === s)).map((s) => `.badge.sev-${s}`);
      const samples = await contrastSamples(page, [
        '.notice', '.topbar nav a', '.who-roles', 'h1', '.help', 'table.data caption', 'table.data thead th', '.small', 'dl.meta dt',
        ...badges, '.badge.plan-proposed', 'button.primary', '.legend li', '.footer', '.ok',
      ]);
      for (const s of samples) expect(s.ratio, `${s.selector} “${s.text}” ${JSON.stringify(s)}`).toBeGreaterThanOrEqual(4.5);
      expect(contrastRatio([0, 0, 0], [255, 255, 255])).toBeCloseTo(21, 6); // the formula's end point (WCAG 2.2)
      expect(await page.getByTestId('reject').isEnabled()).toBe(true);
      await shot(page, '08-plan-review-reviewer-ready');
      await page.getByTestId('approve').click();
      await page.waitForURL(new RegExp(`#/plans/${planId}/history$`));
      const history = await svc.request('GET', `/v1/plans/${planId}/history`, { token: svc.tokens.auditor });
      expect(history.body.plan.state).toBe('approved');
      expect(history.body.plan.decidedBy).toBe('rita');
    });
  });

  describe('when the history is opened', () => {
    it('should show every entry matching its hash, say the whole chain was not checked, and download the export bundle', async () => {
      const page = reviewerPage;
      const history = (await svc.request('GET', `/v1/plans/${planId}/history`, { token: svc.tokens.auditor })).body;
      await page.getByTestId('history-verified').waitFor();
      const verified = await page.getByTestId('history-verified').textContent();
      expect(verified).toMatch(/^Entries match their hashes\./);
      expect(verified).toContain('The whole chain is not checked here — ask an auditor to verify the archive');
      expect(verified).not.toMatch(/\bVerified\b/);
      expect(verified).toContain(`this browser re-hashed ${history.entries.length} of ${history.entries.length} as matching`);
      expect(await page.getByTestId('history-table').locator('tbody tr').count()).toBe(history.entries.length);
      expect(await page.getByTestId('plan-state').first().textContent()).toBe('approved');
      const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export').click()]);
      const bundle = JSON.parse(readFileSync(await download.path(), 'utf8')) as Record<string, unknown>;
      expect(download.suggestedFilename()).toBe(`${planId}-bundle.json`);
      expect(JSON.stringify(bundle)).toContain(planId);
      await shot(page, '09-history');
    });

    it('should let an auditor verify the whole archive chain', async () => {
      const page = watchErrors(await browser.context.newPage(), pageErrors);
      await signIn(page, svc.tokens.auditor);
      await page.goto(`${svc.url}/console/#/plans/${planId}/history`);
      await page.getByRole('button', { name: 'Verify the whole archive chain' }).click();
      const report = (await svc.request('GET', '/v1/archive/verify', { token: svc.tokens.auditor })).body;
      expect(report.ok).toBe(true);
      await expect.poll(() => page.getByText(/Whole chain verified/).textContent()).toContain(`${report.entriesChecked} entries`);
      await page.close();
    });
  });

  describe('when a running job is cancelled from the console', () => {
    it('should stop it and show it cancelled, and list the plans', async () => {
      const page = submitterPage;
      // The demo with many more Monte Carlo samples: long enough to be caught running.
      const problem = JSON.parse(readFileSync(DEMO, 'utf8')) as { dispersion: { samples: number } };
      problem.dispersion.samples = 50_000;
      const res = await svc.request('POST', '/v1/jobs', { token: samToken, body: { problem, reason: 'console test: long run to cancel' } });
      expect(res.status).toBe(202);
      await page.goto(`${svc.url}/console/#/jobs/${res.body.jobId}`);
      await expect.poll(() => page.getByTestId('job-state').textContent(), { timeout: 30_000 }).toMatch(/queued|running/);
      page.once('dialog', (d) => { void d.accept(); });
      await page.getByRole('button', { name: 'Cancel this job' }).click();
      await expect.poll(() => page.getByTestId('job-state').textContent(), { timeout: 30_000 }).toBe('cancelled');
      expect((await svc.request('GET', `/v1/jobs/${res.body.jobId}`, { token: svc.tokens.auditor })).body.state).toBe('cancelled');
      expect(await page.getByRole('button', { name: 'Cancel this job' }).isHidden()).toBe(true);
      await shot(page, '10-jobs-cancelled');
      await page.getByRole('link', { name: 'Plans' }).click();
      await page.getByRole('link', { name: 'Saltmarsh' }).first().waitFor();
      // Poll: a 'Saltmarsh' link can be on screen before the plans table has rendered its rows.
      await expect.poll(() => page.locator('table.data tbody tr').count(), { timeout: 15_000 }).toBe(1); // the cancelled job made no plan
      expect(await page.getByTestId('plan-state').first().textContent()).toBe('approved');
      await shot(page, '11-plans');
    });
  });

  describe('when a plan did not converge', () => {
    it('should say so plainly and never offer Approve, whatever is ticked', async () => {
      // The service tests' fast Earth problem with an unreachable target and three iterations (test/api/plan-flow.test.ts).
      const problem = reachableProblem({ samples: 0, name: 'NOCONV-1' });
      problem.targets[0].positionKm = [-6000, 3600, 0];
      problem.corrector = { maxIterations: 3 };
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
      const done = await waitForJob(svc, res.body.jobId, (st) => st.state === 'completed', 60_000);
      expect(done.result.planStatus).toBe('not-converged');
      const page = reviewerPage;
      await page.goto(`${svc.url}/console/#/jobs/${encodeURIComponent(res.body.jobId)}`);
      await expect.poll(() => page.getByTestId('job-outcome').textContent(), { timeout: 15_000 })
        .toContain('No plan: the corrector did not converge; diagnostics only');
      expect(await page.locator('.outcome').textContent()).not.toMatch(/ready for review|proposed plan/i);
      await page.goto(`${svc.url}/console/#/plans/${done.result.planId}`);
      await page.getByTestId('approve').waitFor();
      expect(await page.getByRole('alert').filter({ hasText: 'did not converge' }).count()).toBe(1);
      const boxes = page.getByTestId('caveat-check');
      for (let i = 0; i < await boxes.count(); i += 1) await boxes.nth(i).check();
      expect(await page.getByTestId('approve').isDisabled()).toBe(true);
      expect(await page.getByTestId('approve-why').textContent()).toContain('can never be approved');
    });
  });

  describe('when the screen is 1920×1080', () => {
    it('should lay the plan review out beside the decision panel', async () => {
      const page = reviewerPage;
      await page.setViewportSize({ width: 1920, height: 1080 });
      await page.goto(`${svc.url}/console/#/plans/${planId}`);
      await page.getByTestId('decided').waitFor();
      const main = await page.locator('.review-main').boundingBox();
      const side = await page.locator('.review-side').boundingBox();
      expect(main && side && side.x > main.x + main.width - 1).toBe(true);
      await shot(page, '12-plan-review-1920');
    });
  });

  describe('when the whole session is over', () => {
    it('should have raised no script errors or content-security-policy refusals', () => {
      expect(pageErrors).toEqual([]);
    });
  });
});
