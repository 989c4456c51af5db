/**
 * Shared steps of the console tests that review one plan of the demo flyby: submit the demo (edited by the
 * caller), wait for its plan through the service, open Chromium and sign in as the reviewer.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { expect } from 'vitest';
import { waitForJob, type TestService } from '../harness/service.ts';
import { submission } from '../queue/fixtures.ts';
import { launchChromium, type TestBrowser } from './browser.ts';

const ROOT = resolve(import.meta.dirname, '../..');

/** Plans examples/flyby-demo.json after `edit` through the running service; returns the plan id and the plan. */
export async function planDemo<P>(svc: TestService, edit: (demo: Record<string, any>) => void): Promise<{ planId: string; plan: P }> {
  const demo = JSON.parse(readFileSync(resolve(ROOT, 'examples/flyby-demo.json'), 'utf8')) as Record<string, any>;
  edit(demo);
  const submitted = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(demo) });
  const done = await waitForJob(svc, submitted.body.jobId, (s) => s.state === 'completed' || s.state === 'failed', 240_000);
  expect(done.state).toBe('completed');
  const planId = done.result.planId as string;
  const plan = (await svc.request('GET', `/v1/plans/${planId}`, { token: svc.tokens.reviewer })).body.plan as P;
  return { planId, plan };
}

/** Chromium with one page signed in to the console as the reviewer (on the jobs screen). */
export async function reviewerPage(svc: TestService): Promise<{ browser: TestBrowser; page: Page }> {
  const browser = await launchChromium();
  const page = await browser.context.newPage();
  await page.goto(`${svc.url}/console/`);
  await page.getByLabel('Access token').fill(svc.tokens.reviewer);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/#\/jobs$/);
  return { browser, page };
}
