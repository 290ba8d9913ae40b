/**
 * The app over plain http at a LAN host name, as a control room reaches it: Chromium resolves
 * an invented name to the test app (--host-resolver-rules), so no page, asset or socket may
 * depend on 127.0.0.1 or on https. The policy must not upgrade requests to https (there is no
 * TLS here), and no inline style may be refused by it.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { BASE_URL, launchBrowser, PASSWORD, SHOTS } from '../helpers/browser.ts';

const LAN_HOST = 'hmi-control-room.kestrel-flats.lan';

describe.skipIf(!BASE_URL)('the app at a LAN host name over http', () => {
  let browser: Browser;
  const port = BASE_URL ? new URL(BASE_URL).port : '';
  const lanUrl = (p: string) => `http://${LAN_HOST}:${port}${p}`;

  beforeAll(async () => {
    browser = await launchBrowser([`--host-resolver-rules=MAP ${LAN_HOST} 127.0.0.1`]);
  });
  afterAll(async () => browser?.close());

  it('when the operator signs in at the host name, then the Floor loads with live tiles, nothing goes to https and the policy refuses nothing', async () => {
    const page = await (await browser.newContext({ viewport: { width: 1920, height: 1080 } })).newPage();
    const problems: string[] = [];
    const https: string[] = [];
    page.on('pageerror', (e) => problems.push(e.message));
    page.on('console', (m) => {
      if (m.type() === 'error') problems.push(m.text());
    });
    page.on('request', (r) => {
      if (r.url().startsWith('https:')) https.push(r.url());
    });
    page.on('requestfailed', (r) => problems.push(`${r.url()}: ${r.failure()?.errorText}`));

    await page.goto(lanUrl('/sign-in'));
    await page.getByLabel('E-mail').fill('operator@kestrel.example');
    await page.getByLabel('Password').fill(PASSWORD!);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'), { timeout: 15_000 });
    await page.waitForSelector('[data-testid="tank-tile"]', { timeout: 15_000 });
    // socket.io from this origin is the app's own: the live connection comes up.
    await page.waitForSelector('[data-testid="connection-state"][data-state="connected"]', { timeout: 15_000 });
    expect(new URL(page.url()).host).toBe(`${LAN_HOST}:${port}`);
    await page.screenshot({ path: path.join(SHOTS, 'floor-lan-host.png') });
    expect(https).toEqual([]);
    // What is left in the console is expected over http: the 401 of the session check before sign-in,
    // and Chromium's note that it ignores Cross-Origin-Opener-Policy on an origin without TLS.
    const expected = /status of 401|Cross-Origin-Opener-Policy header has been ignored/;
    expect(problems.filter((p) => !expected.test(p))).toEqual([]);
  }, 60_000);

  it('when a page of another origin opens a socket to the app with the operator signed in, then the connection is refused', async () => {
    const context = await browser.newContext();
    const page = await context.newPage();
    await page.goto(lanUrl('/sign-in'));
    await page.getByLabel('E-mail').fill('operator@kestrel.example');
    await page.getByLabel('Password').fill(PASSWORD!);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'), { timeout: 15_000 });
    // The same app under another name is another origin: its pages may not ride on the session.
    const other = await context.newPage();
    await other.goto(`http://127.0.0.1:${port}/sign-in`);
    const outcome = await other.evaluate(
      (url) => new Promise<string>((resolve) => {
        const ws = new WebSocket(url);
        ws.onopen = () => resolve('open');
        ws.onerror = () => resolve('refused');
        setTimeout(() => resolve('timeout'), 10_000);
      }),
      `ws://${LAN_HOST}:${port}/socket.io/?EIO=4&transport=websocket`,
    );
    expect(outcome).toBe('refused');
  }, 60_000);
});
