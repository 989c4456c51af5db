/**
 * Layout of the console in real headless Chromium, checked on layout boxes (getBoundingClientRect), not pixels:
 * every data table stays inside its panel (scrolling sideways inside it when wider) at 1280 px and on a narrow
 * 600 px window; the trajectory figure of the demo flyby is framed on the spacecraft's path, marks the Sun at the
 * frame's edge in the Sun's direction when outside, and marks Mars where the spacecraft passes it.
 * The expected geometry comes from the plan the API returns (fetched here), not from the console's code.
 */
import { mkdirSync } from 'node:fs';
import { resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, type TestService } from '../harness/service.ts';
import type { TestBrowser } from './browser.ts';
import { buildConsole } from './build-console.ts';
import { planDemo, reviewerPage } from './demo-plan.ts';

const ROOT = resolve(import.meta.dirname, '../..');
const SHOTS = resolve(ROOT, 'test-artifacts/console');
type Box = { left: number; right: number; top: number; bottom: number; width: number; height: number };
type Vec3 = [number, number, number];
interface PlanGeometry {
  trajectory: { positionKm: Vec3 }[];
  approaches: { body: string; epoch: { tdbS: number } }[];
  bodyPositions: { body: string; at: string; epoch: { tdbS: number }; positionKm: Vec3 }[];
}

let svc: TestService;
let browser: TestBrowser;
let page: Page;
let planId = '';
let plan: PlanGeometry;

beforeAll(async () => {
  buildConsole();
  svc = await startService();
  await svc.startWorkerInProcess({ concurrency: 1 });
  // The layout does not depend on the sample count; fewer keep the test short.
  ({ planId, plan } = await planDemo<PlanGeometry>(svc, (demo) => { demo.dispersion.samples = 20; }));
  ({ browser, page } = await reviewerPage(svc));
}, 300_000);

afterAll(async () => {
  await browser?.close();
  await svc?.close();
});

/** Boxes of every data table, the scrolling region around it and its panel (card), plus the window width. */
async function tableBoxes(): Promise<{ innerWidth: number; tables: { name: string; table: Box; region: Box | null; card: Box; overflowX: string }[] }> {
  return page.evaluate(() => {
    const box = (e: Element): Box => { const r = e.getBoundingClientRect(); return { left: r.left, right: r.right, top: r.top, bottom: r.bottom, width: r.width, height: r.height }; };
    return {
      innerWidth: window.innerWidth,
      tables: Array.from(document.querySelectorAll('table.data')).map((t) => {
        const region = t.closest('.table-scroll');
        return {
          name: t.querySelector('caption')?.textContent ?? t.getAttribute('data-testid') ?? 'table',
          table: box(t), region: region ? box(region) : null, card: box(t.closest('.card')!),
          overflowX: region ? getComputedStyle(region).overflowX : 'none',
        };
      }),
    };
  });
}

describe('console layout', () => {
  describe('when tables are shown at 1280 px and on a narrow window', () => {
    it('should keep every table inside its panel, scrolling inside the panel when wider', async () => {
      const screens = ['#/jobs', '#/plans', `#/plans/${planId}`, `#/plans/${planId}/history`];
      for (const width of [1280, 600]) {
        await page.setViewportSize({ width, height: 800 });
        for (const hash of screens) {
          await page.goto(`${svc.url}/console/${hash}`);
          await page.locator('table.data tbody tr').first().waitFor();
          const { innerWidth, tables } = await tableBoxes();
          expect(tables.length, `${hash} at ${width}`).toBeGreaterThan(0);
          for (const t of tables) {
            const where = `${t.name} on ${hash} at ${width} px`;
            expect(t.region, where).not.toBeNull();
            expect(t.region!.left, where).toBeGreaterThanOrEqual(t.card.left - 0.5);
            expect(t.region!.right, where).toBeLessThanOrEqual(t.card.right + 0.5);
            expect(t.card.right, where).toBeLessThanOrEqual(innerWidth + 0.5);
            // A table wider than its region must be reachable by scrolling inside the region.
            if (t.table.width > t.region!.width + 0.5) expect(t.overflowX, where).toBe('auto');
          }
        }
      }
    }, 120_000);
  });

  describe('when the trajectory of the demo flyby is shown', () => {
    it('should frame the path, mark Mars at closest approach and the Sun at the edge toward the Sun', async () => {
      await page.setViewportSize({ width: 1280, height: 800 });
      await page.goto(`${svc.url}/console/#/plans/${planId}`);
      const figure = page.getByTestId('trajectory-plot');
      await figure.waitFor();
      mkdirSync(SHOTS, { recursive: true });
      await figure.screenshot({ path: resolve(SHOTS, 'layout-trajectory.png') }); // for people to look at; not compared
      const boxes = await figure.evaluate((f) => {
        const box = (sel: string): Box | null => { const e = f.querySelector(sel); if (!e) return null; const r = e.getBoundingClientRect(); return { left: r.left, right: r.right, top: r.top, bottom: r.bottom, width: r.width, height: r.height }; };
        return {
          area: box('[data-testid="plot-area"]')!, path: box('[data-testid="trajectory-path"]')!,
          approach: box('.mk-approach path'),
          sun: box('[data-testid="body-sun"] circle'), sunArrow: box('[data-testid="body-sun"] .edge-arrow'),
          sunPlacement: f.querySelector('[data-testid="body-sun"]')?.getAttribute('data-placement'),
          mars: box('[data-testid="body-mars"] circle'), marsPlacement: f.querySelector('[data-testid="body-mars"]')?.getAttribute('data-placement'),
        };
      });
      const centre = (b: Box): [number, number] => [(b.left + b.right) / 2, (b.top + b.bottom) / 2];
      // The path lies inside the plot area and fills it along its limiting direction (frame margin 10 %).
      expect(boxes.path.left).toBeGreaterThanOrEqual(boxes.area.left - 1);
      expect(boxes.path.right).toBeLessThanOrEqual(boxes.area.right + 1);
      expect(boxes.path.top).toBeGreaterThanOrEqual(boxes.area.top - 1);
      expect(boxes.path.bottom).toBeLessThanOrEqual(boxes.area.bottom + 1);
      expect(Math.max(boxes.path.width / boxes.area.width, boxes.path.height / boxes.area.height)).toBeGreaterThan(0.8);

      // Mars: its plan position is at the closest-approach epoch, and it is drawn where the spacecraft passes it.
      const mars = plan.bodyPositions.find((b) => b.body === 'mars')!;
      expect(mars.at).toBe('closest-approach');
      expect(mars.epoch.tdbS).toBe(plan.approaches.find((a) => a.body === 'mars')!.epoch.tdbS);
      expect(boxes.marsPlacement).toBe('inside');
      const [mx, my] = centre(boxes.mars!); const [ax, ay] = centre(boxes.approach!);
      expect(Math.hypot(mx - ax, my - ay)).toBeLessThan(6);

      // The Sun (origin of the ecliptic X–Y projection) lies outside the path's box: marked at the edge, toward it.
      const pts = plan.trajectory.map((p) => p.positionKm).concat(plan.bodyPositions.filter((b) => b.at === 'closest-approach').map((b) => b.positionKm));
      const [minX, maxX] = [Math.min(...pts.map((p) => p[0])), Math.max(...pts.map((p) => p[0]))];
      const [minY, maxY] = [Math.min(...pts.map((p) => p[1])), Math.max(...pts.map((p) => p[1]))];
      expect(minX > 0 || maxX < 0 || minY > 0 || maxY < 0).toBe(true);
      expect(boxes.sunPlacement).toBe('edge');
      const [sx, sy] = centre(boxes.sun!); const [cx, cy] = centre(boxes.area);
      expect(sx).toBeGreaterThan(boxes.area.left); expect(sx).toBeLessThan(boxes.area.right);
      expect(sy).toBeGreaterThan(boxes.area.top); expect(sy).toBeLessThan(boxes.area.bottom);
      expect(Math.min(sx - boxes.area.left, boxes.area.right - sx, sy - boxes.area.top, boxes.area.bottom - sy)).toBeLessThan(30);
      // Direction on screen (y down) against the direction from the frame's centre to the Sun in the data (y up).
      const wanted = Math.atan2(-(0 - (minY + maxY) / 2), 0 - (minX + maxX) / 2);
      const shown = Math.atan2(sy - cy, sx - cx);
      expect(Math.abs(Math.atan2(Math.sin(shown - wanted), Math.cos(shown - wanted))) * 180 / Math.PI).toBeLessThan(3);
      const [tx, ty] = centre(boxes.sunArrow!);
      expect(Math.hypot(tx - cx, ty - cy)).toBeGreaterThan(Math.hypot(sx - cx, sy - cy)); // the arrow points outward
    }, 60_000);
  });
});
