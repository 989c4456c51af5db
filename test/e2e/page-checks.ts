/**
 * Checks run inside the page: text contrast per WCAG 2.2 (success criterion 1.4.3, contrast ratio
 * (L1 + 0.05) / (L2 + 0.05) with the relative luminance of its definitions section) and horizontal overflow.
 */
import type { Page } from 'playwright-core';

/** WCAG 2.2 relative luminance of an sRGB colour given as 0–255 channels. */
export function relativeLuminance([r, g, b]: number[]): number {
  const lin = (c: number): number => { const s = c / 255; return s <= 0.04045 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4; };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

export function contrastRatio(a: number[], b: number[]): number {
  const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (hi + 0.05) / (lo + 0.05);
}

export interface ContrastSample { selector: string; text: string; color: number[]; background: number[]; ratio: number }

/** Text colour and the first opaque background behind the first visible element matching each selector. */
export async function contrastSamples(page: Page, selectors: string[]): Promise<ContrastSample[]> {
  const raw = await page.evaluate((sels) => {
    const rgb = (s: string): number[] => (s.match(/[\d.]+/g) ?? []).map(Number);
    return sels.map((selector) => {
      const el = Array.from(document.querySelectorAll(selector)).find((e) => (e as HTMLElement).offsetParent !== null || e.getClientRects().length > 0);
      if (!el) return { selector, text: '', color: [], background: [] };
      let bg: number[] = [255, 255, 255];
      for (let n: Element | null = el; n; n = n.parentElement) {
        const c = rgb(getComputedStyle(n).backgroundColor);
        if (c.length >= 3 && (c.length === 3 || c[3] === 1)) { bg = c.slice(0, 3); break; }
      }
      return { selector, text: (el.textContent ?? '').trim().slice(0, 40), color: rgb(getComputedStyle(el).color).slice(0, 3), background: bg };
    });
  }, selectors);
  return raw.map((s) => ({ ...s, ratio: s.color.length ? contrastRatio(s.color, s.background) : 0 }));
}

/** Width of content beyond the viewport (0 when nothing scrolls sideways). */
export async function horizontalOverflow(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
}

/** Collects `page`'s script errors and console errors (CSP refusals included; failed-resource lines excluded) into
 * `into`; returns the page. */
export function watchErrors(page: Page, into: string[]): Page {
  page.on('pageerror', (e) => into.push(`pageerror: ${e.message}`));
  page.on('console', (m) => { if (m.type() === 'error' && !/Failed to load resource/.test(m.text())) into.push(`console: ${m.text()}`); });
  return page;
}
