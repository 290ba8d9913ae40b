/**
 * Browser test of the CSV download links on the screens that gained them (dead letters, audit
 * trail, Shift digest), against the whole running app behind E2E_BASE_URL (skipped when unset).
 * Each link is clicked as a person would; the file saved must be the server's CSV of what the
 * screen shows.
 */
import fs from 'node:fs';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, BASE_URL, launchBrowser, overflowX, screenReady, SHOTS, signedInPage } from '../helpers/browser.ts';

/** Clicks a link, waits for the download and returns its file name and parsed rows (header first). */
async function download(page: Page, link: ReturnType<Page['getByRole']>): Promise<{ name: string; rows: string[][] }> {
  const [file] = await Promise.all([page.waitForEvent('download', { timeout: 20_000 }), link.click()]);
  const saved = await file.path();
  return { name: file.suggestedFilename(), rows: parse(fs.readFileSync(saved!, 'utf8'), { bom: true }) as string[][] };
}

describe.skipIf(!BASE_URL)('CSV downloads in a browser', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => browser?.close());

  it('when the admin exports the dead letters and the audit trail, then each file has its columns and the audit file its entries', async () => {
    const { page, errors, context } = await signedInPage(browser, 'admin', { width: 1366, height: 900 });
    await page.goto(appUrl('/plant-setup?tab=dead-letters'));
    await screenReady(page);
    const letters = await download(page, page.getByRole('link', { name: 'Download dead letters as CSV' }));
    expect(letters.name).toMatch(/^ferrisight-dead-letters-\d{8}\.csv$/);
    expect(letters.rows[0]).toEqual(['id', 'received_at_utc', 'gateway', 'site', 'probe', 'topic', 'kind', 'reason', 'payload_bytes', 'payload']);
    const conflicts = await download(page, page.getByRole('link', { name: 'Download conflicts as CSV' }));
    expect(conflicts.name).toMatch(/^ferrisight-conflicts-\d{8}\.csv$/);
    expect(conflicts.rows[0]!.slice(0, 5)).toEqual(['id', 'received_at_utc', 'site', 'probe', 'reading_time_utc']);

    await page.goto(appUrl('/plant-setup?tab=audit'));
    await screenReady(page);
    await page.getByTestId('audit-count').waitFor({ timeout: 20_000 });
    const shown = Number((await page.getByTestId('audit-count').locator('strong').innerText()).replace(/\D/g, ''));
    const audit = await download(page, page.getByRole('link', { name: 'Export CSV' }));
    expect(audit.name).toMatch(/^ferrisight-audit-trail-\d{8}\.csv$/);
    expect(audit.rows[0]!.slice(0, 3)).toEqual(['id', 'at_utc', 'user_id']);
    // The demo's setup and the earlier browser tests leave entries; the file holds every one counted.
    expect(audit.rows.length - 1).toBeGreaterThanOrEqual(shown);
    await page.screenshot({ path: path.join(SHOTS, 'plant-setup-audit.png') });
    expect(errors).toEqual([]);
    await context.close();
  });

  it('when the supervisor downloads the digest\'s tank table, then it lists the tanks the screen shows', async () => {
    const { page, errors, context } = await signedInPage(browser, 'supervisor', { width: 1366, height: 900 });
    const to = new Date();
    const from = new Date(to.getTime() - 86_400_000);
    await page.goto(appUrl(`/shift-digest?from=${from.toISOString()}&to=${to.toISOString()}`));
    await page.waitForSelector('[data-testid="tib-bar"]', { timeout: 20_000 });
    const tanks = await download(page, page.getByRole('link', { name: 'Download Tanks: time in band as CSV' }));
    expect(tanks.name).toMatch(/^shift-digest-.+-tanks\.csv$/);
    expect(tanks.rows[0]!.slice(0, 4)).toEqual(['tank', 'tank_name', 'circuit', 'band_fe3_fe2']);
    expect(tanks.rows.length - 1).toBe(await page.locator('[data-testid="tib-bar"]').count());
    expect(errors).toEqual([]);
    await context.close();
  });

  it('when the audit trail and dead letters open on a 390 px phone, then nothing scrolls sideways and the export link shows', async () => {
    const { page, errors, context } = await signedInPage(browser, 'admin', { width: 390, height: 844 });
    for (const [tab, link] of [['audit', 'Export CSV'], ['dead-letters', 'Download dead letters as CSV']]) {
      await page.goto(appUrl(`/plant-setup?tab=${tab}`));
      await screenReady(page);
      await page.getByRole('link', { name: link }).waitFor({ timeout: 20_000 });
      expect(await overflowX(page)).toBe(0);
      await page.screenshot({ path: path.join(SHOTS, `plant-setup-${tab}-390.png`), fullPage: true });
    }
    expect(errors).toEqual([]);
    await context.close();
  });
});
