/**
 * Every screen at the sizes people use: a phone (390×844, what the on-call engineer carries), a
 * tablet (768), laptops (1280, 1600) and the control-room wall (1920). Against the whole running
 * app behind E2E_BASE_URL (skipped when unset; demo password in E2E_PASSWORD). Writes a
 * screenshot of each screen at 390 and 1600 px into test-results/ for review.
 * npm test's last stage (scripts/run-e2e.ts, or `npm run test:e2e`) starts such an app and sets both.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { navFor } from '../../web/src/app/screens.ts';
import { ROLES } from '../../shared/schemas/auth.ts';
import { appUrl, BASE_URL, launchBrowser, overflowX, screenReady, SHOTS, signedInPage } from '../helpers/browser.ts';

const WIDTHS = [390, 768, 1280, 1600, 1920] as const;
const PHONE = { width: 390, height: 844 };
const HEADER_NAV = 'header nav[aria-label="Screens"]:visible';

/** Every screen the admin can open (the admin sees them all), with the first tank's page. */
async function adminScreens(page: Page): Promise<Array<{ name: string; path: string }>> {
  const plant = (await (await page.request.get(appUrl('/api/plant'))).json()) as { sites: Array<{ circuits: Array<{ tanks: Array<{ id: number }> }> }> };
  const tankId = plant.sites[0].circuits[0].tanks[0].id;
  return [...navFor('admin').map((s) => ({ name: s.name, path: s.path })), { name: 'Tank page', path: `/tanks/${tankId}` }, { name: 'Readings', path: '/readings' }];
}

const slug = (name: string) => name.toLowerCase().replace(/[^a-z0-9]+/g, '-');

describe.skipIf(!BASE_URL)('Every screen from a phone to the wall', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => browser?.close());

  it('when a phone (390×844) opens the Floor, the Tank page, the Shift log and Plant setup, then nothing scrolls sideways and each main action is in reach', async () => {
    const { context, page, errors } = await signedInPage(browser, 'admin', PHONE);
    try {
      // Floor: compact tank cards, worst first; a card opens its Tank page.
      await page.goto(appUrl('/'));
      await page.locator('[data-testid="tank-card"]').first().waitFor({ timeout: 20_000 });
      expect(await page.locator('[data-testid="tank-card"]').count()).toBe(10);
      expect(await overflowX(page)).toBe(0);
      // The screens menu holds every screen of the role.
      await page.getByRole('button', { name: 'Screens menu' }).click();
      const menu = page.locator('#screens-menu');
      await menu.waitFor();
      expect(await menu.getByRole('link').allTextContents()).toEqual(navFor('admin').map((s) => expect.stringContaining(s.name)));
      await page.keyboard.press('Escape');
      await page.locator('[data-testid="tank-card"]').first().click();
      await page.waitForURL(/\/tanks\/\d+/);

      // Tank page: sections stacked, charts full width, the range buttons at hand.
      await page.locator('[data-testid="trend-charts"] canvas').first().waitFor({ timeout: 20_000 });
      expect(await overflowX(page)).toBe(0);
      const chart = await page.locator('[data-testid="trend-charts"]').boundingBox();
      const facts = await page.getByRole('complementary', { name: 'Facts' }).boundingBox();
      expect(chart!.width).toBeGreaterThan(PHONE.width - 60);
      expect(facts!.y).toBeGreaterThanOrEqual(chart!.y + chart!.height);
      await expect(page.getByRole('button', { name: '24 h' }).isVisible()).resolves.toBe(true);

      // Shift log: the entry form's button; Plant setup: adding a user.
      await page.goto(appUrl('/shift-log'));
      await screenReady(page);
      expect(await overflowX(page)).toBe(0);
      const addEntry = page.locator('main form button[type="submit"]').first();
      await addEntry.scrollIntoViewIfNeeded();
      await expect(addEntry.isVisible()).resolves.toBe(true);
      await page.goto(appUrl('/plant-setup'));
      await screenReady(page);
      expect(await overflowX(page)).toBe(0);
      // People are on Plant setup's admin tab.
      await page.goto(appUrl('/plant-setup?tab=people'));
      await screenReady(page);
      expect(await overflowX(page)).toBe(0);
      await page.getByRole('button', { name: 'Add user…' }).click();
      await expect(page.getByLabel('E-mail').isVisible()).resolves.toBe(true);
      expect(await overflowX(page)).toBe(0);

      // Installable: the page names a web app manifest whose icons are served.
      const href = await page.locator('link[rel="manifest"]').getAttribute('href');
      const manifest = (await (await page.request.get(appUrl(href!))).json()) as { name: string; display: string; icons: Array<{ src: string }> };
      expect(manifest).toMatchObject({ name: 'Ferrisight', display: 'standalone' });
      for (const icon of manifest.icons) expect((await page.request.get(appUrl(icon.src))).status()).toBe(200);
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  }, 120_000);

  it('when each role signs in at 1280×800 (and 1600, 1920), then its whole navigation is visible once, no entry cut off', async () => {
    for (const role of ROLES) {
      const { context, page } = await signedInPage(browser, role, { width: 1280, height: 800 });
      try {
        await page.goto(appUrl('/'));
        for (const width of [1280, 1600, 1920]) {
          await page.setViewportSize({ width, height: width === 1280 ? 800 : 1000 });
          const nav = page.locator(HEADER_NAV);
          await nav.first().waitFor({ timeout: 20_000 });
          expect(await nav.count()).toBe(1);
          const items = await nav.locator(':scope > a, :scope > button').evaluateAll((els) =>
            els.map((el) => {
              const r = el.getBoundingClientRect();
              return { text: el.textContent?.replace('▾', '').trim(), inView: r.left >= 0 && r.right <= window.innerWidth, clipped: el.scrollWidth > el.clientWidth };
            }),
          );
          // A group of two or more screens is one menu entry (Workbench); a lone member is shown by name.
          const screens = navFor(role);
          const expected = [...new Set(screens.map((s) => (s.group && screens.filter((x) => x.group === s.group).length > 1 ? 'Workbench' : s.name)))];
          expect(items.map((i) => i.text)).toEqual(expected);
          expect(items.filter((i) => !i.inView || i.clipped)).toEqual([]);
          expect(await nav.evaluate((el) => el.scrollWidth <= el.clientWidth)).toBe(true);
          if (width === 1280) await page.screenshot({ path: path.join(SHOTS, `nav-${role}-1280.png`) });
        }
      } finally {
        await context.close();
      }
    }
  }, 150_000);

  it('when every screen opens at 390, 768, 1280, 1600 and 1920 px, then none scrolls sideways; the 390 and 1600 px views are saved for review', async () => {
    const { context, page, errors } = await signedInPage(browser, 'admin', PHONE);
    try {
      const screens = await adminScreens(page);
      const overflow: string[] = [];
      for (const width of WIDTHS) {
        await page.setViewportSize({ width, height: width < 800 ? 844 : 900 });
        for (const s of screens) {
          await page.goto(appUrl(s.path));
          await screenReady(page);
          const x = await overflowX(page);
          if (x > 0) overflow.push(`${s.name} at ${width} px: ${x} px`);
          if (width === 390 || width === 1600) await page.screenshot({ path: path.join(SHOTS, `screen-${slug(s.name)}-${width}.png`), fullPage: width === 390 });
        }
      }
      expect(overflow).toEqual([]);
      expect(errors).toEqual([]);
    } finally {
      await context.close();
    }
  }, 400_000);

  it('when a tank stops reporting, then its Tank page says stale and never "Live"', async () => {
    const { context, page } = await signedInPage(browser, 'admin', { width: 1600, height: 900 });
    const headers = { 'X-Ferrisight-Csrf': '1' };
    const fault = { fault: 'comms-loss', probeTag: 'B4-ORP' };
    const plant = (await (await page.request.get(appUrl('/api/plant'))).json()) as { sites: Array<{ circuits: Array<{ tanks: Array<{ id: number; tag: string }> }> }> };
    const b4 = plant.sites.flatMap((s) => s.circuits.flatMap((c) => c.tanks)).find((t) => t.tag === 'B4')!;
    expect((await page.request.post(appUrl('/api/admin/simulator'), { headers, data: { ...fault, action: 'start' } })).status()).toBe(202);
    try {
      await page.goto(appUrl(`/tanks/${b4.id}`));
      // Stale after three 5 s intervals without a reading; allow for a busy machine.
      await page.locator('[data-testid="trend-live-state"][data-state="stale"]').waitFor({ timeout: 90_000 });
      expect(await page.locator('main').innerText()).not.toMatch(/\bLive\b/);
      await expect(page.locator('[data-testid="tank-latest"] .line-through').count()).resolves.toBeGreaterThan(0);
      await page.screenshot({ path: path.join(SHOTS, 'tank-stale-1600.png') });
    } finally {
      await page.request.post(appUrl('/api/admin/simulator'), { headers, data: { ...fault, action: 'clear' } });
      await context.close();
    }
  }, 150_000);
});
