/**
 * Browser test of a plant far larger than the demo: the site overview for several sites and a
 * 500-tank Floor. The plant is generated in the test from the real /api/plant answer (its first
 * tank copied with new ids), served to the page in place of the demo plant; everything else is
 * the running app. Skipped when E2E_BASE_URL is not set.
 */
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { PlantResponse, TankSummary } from '../../shared/schemas/plant.ts';
import { appUrl, BASE_URL, launchBrowser, SHOTS, signIn } from '../helpers/browser.ts';

/** sites × circuits × tanks copies of the demo's first tank; every seventh one below its band. */
function generatedPlant(real: PlantResponse, shape: { sites: number; circuits: number; tanks: number }): PlantResponse {
  const template = real.sites[0]!.circuits[0]!.tanks.find((t) => t.probe && t.latest)!;
  const now = new Date().toISOString();
  let id = 900_000;
  const sites = Array.from({ length: shape.sites }, (_, s) => ({
    ...real.sites[0]!,
    id: 90_000 + s,
    tag: `gen-${s + 1}`,
    name: `Generated site ${s + 1}`,
    circuits: Array.from({ length: shape.circuits }, (_, c) => ({
      ...real.sites[0]!.circuits[0]!,
      id: 90_000 + s * 100 + c,
      tag: `G${s + 1}${c + 1}`,
      name: `Generated train ${c + 1}`,
      position: c + 1,
      tanks: Array.from({ length: shape.tanks }, (_, k): TankSummary => {
        id += 1;
        const low = id % 7 === 0;
        return {
          ...template,
          id,
          tag: `G${s + 1}-${c + 1}-${k + 1}`,
          name: `Generated tank ${k + 1}`,
          position: k + 1,
          band: { low: 1, high: 4, target: null },
          // Reporting once an hour: the generated tanks stay live for the whole test.
          probe: { ...template.probe!, id, tag: `G${id}`, intervalS: 3600 },
          latest: { ...template.latest!, tankId: id, probeId: id, probeTag: `G${id}`, ts: now, ratio: low ? 0.2 : 2, flag: 'ok' },
        };
      }),
    })),
  }));
  return { ...real, sites };
}

async function servePlant(page: Page, shape: { sites: number; circuits: number; tanks: number }): Promise<void> {
  await page.route('**/api/plant', async (route) => {
    const res = await route.fetch();
    await route.fulfill({ response: res, json: generatedPlant((await res.json()) as PlantResponse, shape) });
  });
}

describe.skipIf(!BASE_URL)('many sites and many tanks', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it('when the plant has five sites, then / shows one card per site with its counts and each leads into that site’s Floor', async () => {
    const context = await browser.newContext({ viewport: { width: 1600, height: 1000 } });
    const page = await context.newPage();
    try {
      await signIn(page, 'operator');
      await servePlant(page, { sites: 5, circuits: 4, tanks: 25 });
      await page.goto(appUrl('/'));
      const cards = page.getByTestId('site-card');
      await expect.poll(() => cards.count(), { timeout: 20_000 }).toBe(5);
      // 100 tanks a site, every seventh below band: the in-band count says so on each card.
      const counts = await page.getByTestId('site-in-band').allInnerTexts();
      for (const c of counts) expect(c.replace(/\s+/g, ' ')).toMatch(/^(85|86) \/ 100$/);
      await page.screenshot({ path: path.join(SHOTS, 'site-overview-1600.png') });
      await cards.nth(1).click();
      await page.waitForURL(/\/sites\/gen-2$/);
      const tiles = page.locator('[data-testid="dense-circuit"] [data-testid="tank-tile"]');
      await expect.poll(() => tiles.count(), { timeout: 20_000 }).toBe(100);
      expect(await page.getByTestId('dense-circuit').count()).toBe(4);
      expect(await tiles.evaluateAll((els) => els.every((e) => e.getAttribute('data-tag')?.startsWith('G2-')))).toBe(true);
    } finally {
      await context.close();
    }
  });

  it('when one site has 500 tanks, then its Floor draws every tile and leads with the tanks below band', async () => {
    const context = await browser.newContext({ viewport: { width: 1920, height: 1080 } });
    const page = await context.newPage();
    try {
      await signIn(page, 'supervisor');
      await servePlant(page, { sites: 1, circuits: 20, tanks: 25 });
      await page.goto(appUrl('/'));
      const tiles = page.locator('[data-testid="dense-circuit"] [data-testid="tank-tile"]');
      await expect.poll(() => tiles.count(), { timeout: 30_000 }).toBe(500);
      const tags = new Set(await tiles.evaluateAll((els) => els.map((e) => e.getAttribute('data-tag'))));
      expect(tags.size).toBe(500);
      // The attention strip comes first on the page and holds only tanks below band.
      const attention = page.getByRole('region', { name: 'Tanks that need attention, worst first' });
      const first = await attention.getByTestId('tank-tile').evaluateAll((els) => els.map((e) => e.getAttribute('aria-label') ?? ''));
      expect(first.length).toBeGreaterThan(0);
      for (const label of first) expect(label).toContain('below band');
      await page.screenshot({ path: path.join(SHOTS, 'floor-500-tanks-1920.png') });
    } finally {
      await context.close();
    }
  });
});
