/**
 * Real headless Chromium for the console tests: Debian's /usr/bin/chromium (or CHROMIUM_PATH) driven by
 * playwright-core with a fresh profile folder; no browser is ever downloaded.
 */
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext } from 'playwright-core';
import { chromiumPath } from '../../scripts/setup.mjs';

export const CHROMIUM_PATH = chromiumPath();

export interface TestBrowser { context: BrowserContext; close(): Promise<void> }

export async function launchChromium(viewport = { width: 1280, height: 800 }): Promise<TestBrowser> {
  if (!existsSync(CHROMIUM_PATH)) throw new Error(`no Chromium at ${CHROMIUM_PATH}: install Debian's chromium package or set CHROMIUM_PATH`);
  const profile = mkdtempSync(join(tmpdir(), 'veer-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    viewport,
    acceptDownloads: true,
    args: [
      '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
      '--disable-component-update', '--disable-sync',
      // Every host name fails to resolve except the test server's loopback address: the browser can never reach outside.
      '--host-resolver-rules=MAP * ~NOTFOUND , EXCLUDE 127.0.0.1',
    ],
  });
  return {
    context,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}
