/**
 * Browser test of the Floor and the Tank page against the whole running app
 * (API, ingest, simulator and the built web app behind E2E_BASE_URL).
 * Skipped when E2E_BASE_URL is not set; the demo users' password comes from E2E_PASSWORD.
 * npm test's last stage (scripts/run-e2e.ts, or `npm run test:e2e`) starts such an app and sets both.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { BASE_URL, launchBrowser, SHOTS, signIn } from '../helpers/browser.ts';

const ROLES = ['operator', 'supervisor', 'metallurgist', 'engineer', 'admin'] as const;

/** Newest reading time of every tile, by tank tag. */
async function tileTimestamps(page: Page): Promise<Record<string, string>> {
  return page.$$eval('[data-testid="tank-tile"]', (tiles) =>
    Object.fromEntries(tiles.map((t) => [t.getAttribute('data-tag') ?? '', t.getAttribute('data-ts') ?? ''])),
  );
}

/** Counts canvas pixels that are not fully transparent: uPlot has drawn axes and series. */
async function paintedPixels(page: Page): Promise<number> {
  return page.$$eval('[data-testid="trend-charts"] canvas', (canvases) =>
    canvases.reduce((sum, c) => {
      const canvas = c as HTMLCanvasElement;
      const ctx = canvas.getContext('2d');
      if (!ctx || canvas.width === 0 || canvas.height === 0) return sum;
      const data = ctx.getImageData(0, 0, canvas.width, canvas.height).data;
      let n = 0;
      for (let i = 3; i < data.length; i += 4) if (data[i] !== 0) n++;
      return sum + n;
    }, 0),
  );
}

describe.skipIf(!BASE_URL)('Floor and Tank page in a browser', () => {
  let browser: Browser;

  beforeAll(async () => {
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
  });

  for (const role of ROLES) {
    it(`when the ${role} signs in, then the Floor shows live tiles and a tank's trend draws`, async () => {
      const context = await browser.newContext({ viewport: { width: 1920, height: 1080 } });
      const page = await context.newPage();
      const pageErrors: string[] = [];
      page.on('pageerror', (e) => pageErrors.push(e.message));
      // The web parses every socket payload and drops, with a console note, what does not fit.
      page.on('console', (m) => {
        if (m.text().includes('does not fit the contract')) pageErrors.push(m.text());
      });
      try {
        await signIn(page, role);

        // The Floor: both demo circuits, ten tiles, the live connection up.
        await page.waitForSelector('[data-testid="tank-tile"]', { timeout: 15_000 });
        expect(await page.locator('[data-testid="tank-tile"]').count()).toBe(10);
        await page.waitForSelector('[data-testid="connection-state"][data-state="connected"]', { timeout: 15_000 });
        expect(await page.getByRole('link', { name: 'Plant setup' }).count()).toBe(role === 'admin' || role === 'engineer' ? 1 : 0);
        await page.screenshot({ path: path.join(SHOTS, `floor-${role}.png`) });

        // A value changes live: some tile gets a newer reading without a reload.
        const before = await tileTimestamps(page);
        await page.waitForFunction(
          (initial: Record<string, string>) =>
            [...document.querySelectorAll('[data-testid="tank-tile"]')].some((t) => {
              const tag = t.getAttribute('data-tag') ?? '';
              const ts = t.getAttribute('data-ts') ?? '';
              return ts !== '' && ts > (initial[tag] ?? '');
            }),
          before,
          { timeout: 20_000 },
        );
        await page.screenshot({ path: path.join(SHOTS, `floor-${role}-live.png`) });

        // The whole demo plant fits the wall screen without scrolling.
        const overflow = await page.evaluate(() => ({
          x: document.documentElement.scrollWidth - window.innerWidth,
          y: document.documentElement.scrollHeight - window.innerHeight,
        }));
        expect(overflow).toEqual({ x: 0, y: 0 });

        // The Tank page: the first tile opens it and the charts are drawn.
        await page.locator('[data-testid="tank-tile"]').first().click();
        await page.waitForURL(/\/tanks\/\d+/, { timeout: 10_000 });
        await page.waitForSelector('[data-testid="trend-charts"] canvas', { timeout: 15_000 });
        await page.waitForFunction(() => document.querySelectorAll('[data-testid="trend-charts"] canvas').length >= 3, undefined, { timeout: 15_000 });
        // uPlot draws once the trend data has arrived: wait for the paint, not for a fixed time.
        await expect.poll(() => paintedPixels(page), { timeout: 15_000 }).toBeGreaterThan(1_000);
        expect(await page.getByText('No readings in this range.').count()).toBe(0);
        await expect(page.getByText('ORP in real slurries is a mixed potential', { exact: false }).count()).resolves.toBe(1);
        await page.screenshot({ path: path.join(SHOTS, `tank-${role}.png`) });

        expect(pageErrors).toEqual([]);
      } finally {
        await context.close();
      }
    }, 90_000);
  }
});
