/**
 * Browser test of the Alarm desk's definitions view against the whole running app behind
 * E2E_BASE_URL (skipped when unset; the demo users' password in E2E_PASSWORD): a
 * metallurgist edits one alarm definition with a reason and sees the new setting in the list.
 * Screenshots land in test-results/.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { appUrl, BASE_URL, launchBrowser, SHOTS, signIn } from '../helpers/browser.ts';

describe.skipIf(!BASE_URL)('Alarm definitions in a browser', () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launchBrowser();
  });
  afterAll(async () => browser?.close());

  it('when a metallurgist changes a limit without a reason, then the form asks for one and keeps the value; with a reason, then the list shows the new limit', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1440, height: 1000 } })).newPage();
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(e.message));
    try {
      await signIn(page, 'metallurgist');
      await page.goto(appUrl('/alarm-desk?view=definitions'));
      const row = page.locator('[data-testid="definition"][data-kind="orp-high"]');
      await row.waitFor({ timeout: 15_000 });

      // A limit unlike the current one, so each run makes a real change.
      const current = Number((await row.getByTestId('definition-limit').innerText()).match(/-?\d+(\.\d+)?/)![0]);
      const next = current === 690 ? 685 : 690;
      await row.getByRole('button', { name: 'Change ORP high' }).click();
      const form = page.getByTestId('definition-form');
      await form.getByLabel('Limit').fill(String(next));
      await form.getByRole('button', { name: 'Save changes' }).click();
      await form.getByText('Give a reason (at least 3 characters)').waitFor({ timeout: 5_000 });
      expect(await form.getByLabel('Limit').inputValue()).toBe(String(next));

      await form.getByLabel('Reason for the change').fill('E2E: limit moved for the browser test');
      await form.getByRole('button', { name: 'Save changes' }).click();
      await page.getByText(/Saved “ORP high” on \w+/).waitFor({ timeout: 15_000 });
      await expect.poll(() => row.getByTestId('definition-limit').innerText(), { timeout: 10_000 }).toBe(`above ${next} mV`);
      expect(await page.getByTestId('definition-form').count()).toBe(0);
      await page.screenshot({ path: path.join(SHOTS, 'alarm-definitions-saved.png'), fullPage: true });
      expect(errors).toEqual([]);
    } finally {
      await page.context().close();
    }
  }, 60_000);
});
