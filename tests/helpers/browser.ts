/**
 * What every browser test (tests/e2e/) needs: the app's address and the demo password from the
 * environment, Debian's Chromium started headless, and a sign-in as one of the demo roles.
 */
import fs from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';

export const BASE_URL = process.env.E2E_BASE_URL;
export const PASSWORD = process.env.E2E_PASSWORD;
export const SHOTS = path.resolve('test-results');

const CHROMIUM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-sync'];

/** An address in the app under test. */
export const appUrl = (pathAndQuery: string) => new URL(pathAndQuery, BASE_URL).href;

/** Checks the password is set, makes the screenshot folder and starts Chromium. */
export async function launchBrowser(): Promise<Browser> {
  if (!PASSWORD) throw new Error("E2E_PASSWORD must be set to the demo users' password");
  fs.mkdirSync(SHOTS, { recursive: true });
  return chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
}

export async function signIn(page: Page, role: string): Promise<void> {
  await page.goto(appUrl('/sign-in'));
  await page.getByLabel('E-mail').fill(`${role}@kestrel.example`);
  await page.getByLabel('Password').fill(PASSWORD!);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'), { timeout: 15_000 });
}
