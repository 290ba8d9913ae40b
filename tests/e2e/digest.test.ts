/**
 * Browser test of the Shift log, the Shift digest on paper and the historical import, against
 * the whole running app behind E2E_BASE_URL (skipped when unset; demo users' password in
 * E2E_PASSWORD). Screenshots and PDFs land in test-results/.
 * npm test's last stage (scripts/run-e2e.ts, or `npm run test:e2e`) starts such an app and sets both.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { appUrl, BASE_URL, launchBrowser, SHOTS, signIn } from '../helpers/browser.ts';

/** Pages in a PDF: one "/Type /Page" object each (not /Pages). */
const pdfPages = (pdf: Buffer) => (pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length;

describe.skipIf(!BASE_URL)('Shift log, Shift digest and import in a browser', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => browser?.close());

  it('when the supervisor writes in the log and prints the digest, then the print layout hides the navigation and fits A4 and Letter', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1366, height: 900 } })).newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await signIn(page, 'supervisor');

    await page.goto(appUrl('/shift-log'));
    const text = `E2E check ${Date.now()}: A1 froth steady`;
    await page.getByRole('textbox', { name: 'Entry' }).fill(text);
    await page.getByRole('button', { name: 'Add entry' }).click();
    await page.locator('[data-testid="log-entry"]', { hasText: text }).waitFor({ timeout: 10_000 });
    await page.screenshot({ path: path.join(SHOTS, 'shift-log.png'), fullPage: true });

    const to = new Date();
    const from = new Date(to.getTime() - 2 * 86_400_000);
    await page.goto(appUrl(`/shift-digest?from=${from.toISOString()}&to=${to.toISOString()}`));
    await page.waitForSelector('[data-testid="tib-bar"]', { timeout: 20_000 });
    expect(await page.locator('[data-testid="tib-bar"]').count()).toBeGreaterThan(0);
    expect(await page.locator('[data-testid="shift-digest"]').getByText(text).count()).toBe(1);
    await page.screenshot({ path: path.join(SHOTS, 'digest-screen.png'), fullPage: true });

    await page.emulateMedia({ media: 'print' });
    // The header's nav and the screens menu's list are both named Screens: none may show on paper.
    expect(await page.locator('nav[aria-label="Screens"]:visible').count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false);
    expect(await page.locator('[data-testid="shift-digest"]').isVisible()).toBe(true);
    // Printable width at 96 dpi with 11 mm side margins: A4 188 mm ≈ 710 px, Letter 194 mm ≈ 733 px.
    for (const [paper, width] of [['a4', 710], ['letter', 733]] as const) {
      await page.setViewportSize({ width, height: 1000 });
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(width);
      // Nothing scrolls on paper: every table fits inside its section.
      const overflow = await page.$$eval('[data-print-root] table', (ts) => ts.filter((t) => t.scrollWidth > (t.parentElement?.clientWidth ?? 0) + 1).length);
      expect(overflow).toBe(0);
      await page.screenshot({ path: path.join(SHOTS, `digest-print-${paper}.png`), fullPage: true });
    }

    for (const paper of ['A4', 'letter'] as const) {
      await page.emulateMedia({ media: 'screen' });
      await page.selectOption('#digest-paper', paper);
      const pdf = await page.pdf({ preferCSSPageSize: true, printBackground: true });
      fs.writeFileSync(path.join(SHOTS, `digest-${paper}.pdf`), pdf);
      expect(pdfPages(pdf)).toBeGreaterThan(0);
    }
    expect(errors).toEqual([]);
  }, 90_000);

  it('when a metallurgist imports a small file, then the summary reports what was stored', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1366, height: 900 } })).newPage();
    await signIn(page, 'metallurgist');
    await page.goto(appUrl('/readings'));
    const t0 = Math.floor((Date.now() - 2 * 86_400_000) / 1000) * 1000;
    const lines = ['probe,time,orp_mv,temp_c', ...[0, 1, 2].map((i) => `A1-ORP,${new Date(t0 + i * 1000 + 37).toISOString()},455.5,42`), 'NOPE,2026-01-01T00:00:00Z,1,1'];
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'fs-e2e-')), 'e2e-import.csv');
    fs.writeFileSync(file, lines.join('\n'));
    await page.getByLabel('CSV file').setInputFiles(file);
    await page.getByRole('button', { name: 'Upload and import' }).click();
    const summary = page.locator('[data-testid="import-summary"]');
    await summary.waitFor({ timeout: 30_000 });
    fs.rmSync(path.dirname(file), { recursive: true, force: true });
    expect(await summary.textContent()).toMatch(/Rows read\s*4/);
    expect(await summary.textContent()).toMatch(/Rejected\s*1/);
    await page.screenshot({ path: path.join(SHOTS, 'readings-import.png'), fullPage: true });
  }, 60_000);
});
