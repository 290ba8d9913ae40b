/**
 * Browser test of the metallurgist's workbench against the whole running app behind
 * E2E_BASE_URL (skipped when unset; the demo users' password in E2E_PASSWORD). The simulator
 * must be running, so tank A1 has probe readings around the sampling times used below.
 * Screenshots land in test-results/.
 * npm test's last stage (scripts/run-e2e.ts, or `npm run test:e2e`) starts such an app and sets both.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { appUrl, BASE_URL, launchBrowser, SHOTS, signIn } from '../helpers/browser.ts';

/** Three A1 assays a few minutes old (seconds make each run unique); row 4 optionally wrong. */
function labFile(badRow: boolean): Buffer {
  const at = (minAgo: number) => new Date(Math.floor(Date.now() / 1000) * 1000 - minAgo * 60_000).toISOString();
  const rows = [
    'tank,sampled_at,fe2,fe_total,unit,method,analyst,lab_ref,note',
    `A1,${at(4)},1.10,14.3,g/L,dichromate titration,E2E,E2E-1,`,
    `A1,${at(8)},1.00,14.0,g/L,dichromate titration,E2E,E2E-2,`,
    `A1,${at(12)},${badRow ? '15.0' : '1.20'},14.4,g/L,dichromate titration,E2E,E2E-3,`,
  ];
  return Buffer.from(rows.join('\n'), 'utf8');
}

describe.skipIf(!BASE_URL)('Assays and Calibration in a browser', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => browser?.close());

  it('when a metallurgist uploads a lab file with one bad row, then sees the row error, fixes and stores it, then fits and applies a calibration', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1440, height: 1000 } })).newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    await signIn(page, 'metallurgist');

    await page.goto(appUrl('/assays'));
    const fileInput = page.getByLabel('CSV file');
    await fileInput.setInputFiles({ name: 'lab-e2e.csv', mimeType: 'text/csv', buffer: labFile(true) });
    const rowError = page.getByTestId('csv-error');
    await rowError.first().waitFor({ timeout: 15_000 });
    expect(await rowError.count()).toBe(1);
    const errorText = await rowError.first().innerText();
    expect(errorText).toMatch(/^4\s+fe2\s+15\.0\s+/);
    expect(errorText).toMatch(/above total Fe/);
    expect(await page.getByRole('button', { name: 'Store rows' }).isDisabled()).toBe(true);
    await page.screenshot({ path: path.join(SHOTS, 'workbench-csv-error.png'), fullPage: true });

    await fileInput.setInputFiles({ name: 'lab-e2e.csv', mimeType: 'text/csv', buffer: labFile(false) });
    await expect.poll(() => page.getByTestId('csv-summary').innerText(), { timeout: 15_000 }).toMatch(/3 valid, 0 problems/);
    await page.getByRole('button', { name: 'Store all 3 rows' }).click();
    await page.getByText('3 assays stored from lab-e2e.csv').waitFor({ timeout: 15_000 });

    await page.goto(appUrl('/calibration'));
    await page.getByRole('combobox', { name: 'Tank' }).selectOption({ label: 'A1 · Bioleach 1' });
    const fit = page.getByRole('button', { name: 'Fit E°′' });
    await expect.poll(() => fit.isEnabled(), { timeout: 15_000 }).toBe(true);
    await fit.click();
    await page.getByTestId('fit-result').waitFor({ timeout: 15_000 });
    expect(await page.getByTestId('fit-result').innerText()).toMatch(/E°′ at 25 °C/);
    await page.getByLabel('Reason for the new calibration').fill('E2E: assays of this run');
    await page.getByRole('button', { name: /^Apply as version \d+$/ }).click();
    await page.getByText(/Version \d+ applied/).waitFor({ timeout: 15_000 });
    await page.screenshot({ path: path.join(SHOTS, 'workbench-calibration-applied.png'), fullPage: true });
    expect(errors).toEqual([]);
  }, 90_000);
});
