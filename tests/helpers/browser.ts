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

/** Checks the password is set, makes the screenshot folder and starts Chromium (with any extra switches). */
export async function launchBrowser(extraArgs: string[] = []): Promise<Browser> {
  if (!PASSWORD) throw new Error("E2E_PASSWORD must be set to the demo users' password");
  fs.mkdirSync(SHOTS, { recursive: true });
  return chromium.launch({ executablePath: '/usr/bin/chromium', args: [...CHROMIUM_ARGS, ...extraArgs] });
}

export async function signIn(page: Page, role: string): Promise<void> {
  await page.goto(appUrl('/sign-in'));
  await page.getByLabel('E-mail').fill(`${role}@kestrel.example`);
  await page.getByLabel('Password').fill(PASSWORD!);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'), { timeout: 15_000 });
}

/** A signed-in page of its own (own cookies) at a viewport size, collecting page errors. */
export async function signedInPage(browser: Browser, role: string, viewport: { width: number; height: number }) {
  const context = await browser.newContext({ viewport });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  await signIn(page, role);
  return { context, page, errors };
}

/** How far the page scrolls sideways (0 when nothing overflows: scrollWidth <= innerWidth). */
export async function overflowX(page: Page): Promise<number> {
  return page.evaluate(() => Math.max(0, document.documentElement.scrollWidth - window.innerWidth));
}

/** Waits until a screen has drawn its heading and no loading notice is left in the main area. */
export async function screenReady(page: Page): Promise<void> {
  await page.locator('main h1').first().waitFor({ state: 'attached', timeout: 20_000 });
  await page.waitForFunction(() => !document.querySelector('main [data-testid="loading"]'), undefined, { timeout: 20_000 });
}

/** The colour a CSS custom property resolves to in the page's theme, as the browser computes colours ("rgb(…)"). */
export async function themeColour(page: Page, variable: string): Promise<string> {
  return page.evaluate((v) => {
    const probe = document.createElement('span');
    probe.style.color = `var(${v})`;
    document.body.append(probe);
    const colour = getComputedStyle(probe).color;
    probe.remove();
    return colour;
  }, variable);
}
