/**
 * Commissioning a real site, from an empty database with demo data and the simulator off:
 * the first admin comes from the one-time link `npm start` printed, the plant is entered in
 * Plant setup, and a device that knows only the README's contract (plain mqtt, not the
 * simulator) publishes; the tank must be live on the Floor within 2 s of its first reading.
 * Needs E2E_SITE_URL, E2E_SITE_FIRST_RUN and E2E_SITE_MQTT_PORT (scripts/run-e2e.ts starts
 * such a site beside the demo app); skipped without them.
 */
import path from 'node:path';
import mqtt from 'mqtt';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, SHOTS } from '../helpers/browser.ts';

const SITE_URL = process.env.E2E_SITE_URL;
const FIRST_RUN = process.env.E2E_SITE_FIRST_RUN;
const MQTT_PORT = Number(process.env.E2E_SITE_MQTT_PORT);

let browser: Browser;
beforeAll(async () => {
  if (SITE_URL) browser = await launchBrowser();
});
afterAll(async () => browser?.close());

/** Fills the open Plant setup form's fields by label and submits it with its Add button. */
async function addPart(page: Page, button: string, fields: Record<string, string>): Promise<void> {
  await page.getByRole('button', { name: button, exact: true }).first().click();
  const form = page.getByRole('form', { name: new RegExp(`^${button}`) });
  await form.waitFor();
  for (const [label, value] of Object.entries(fields)) {
    const field = form.getByLabel(label, { exact: true });
    if ((await field.evaluate((el) => el.tagName)) === 'SELECT') await field.selectOption(value);
    else await field.fill(value);
  }
  await form.getByRole('button', { name: 'Add', exact: true }).click();
  await form.waitFor({ state: 'detached', timeout: 15_000 });
}

describe.skipIf(!SITE_URL || !FIRST_RUN)('commissioning a site from an empty database', () => {
  it('when the first admin enters a site, circuit, tank, probe and gateway and a device publishes by the README contract, then the tank is live on the Floor within 2 s', async () => {
    const context = await browser.newContext({ viewport: { width: 1600, height: 1000 } });
    const page = await context.newPage();
    const pageErrors: string[] = [];
    page.on('pageerror', (e) => pageErrors.push(e.message));
    let device: mqtt.MqttClient | undefined;
    try {
      // No demo sign-in exists on this site.
      await page.goto(new URL('/sign-in', SITE_URL).href);
      await page.getByLabel('E-mail').fill('admin@kestrel.example');
      await page.getByLabel('Password').fill('kestrel-demo');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByRole('alert').waitFor();
      expect(page.url()).toContain('/sign-in');

      await page.goto(FIRST_RUN!);
      await page.getByLabel('Your name').fill('Ada Commissioning');
      await page.getByLabel('E-mail').fill('ada@heron.example');
      await page.getByLabel('Password').fill('a long commissioning passphrase');
      await page.getByRole('button', { name: 'Create admin and sign in' }).click();
      await page.waitForURL((url) => url.pathname === '/plant-setup', { timeout: 15_000 });

      await addPart(page, 'Add site', { 'Site tag': 'heron', Name: 'Heron Downs', 'Time zone': 'Australia/Perth' });
      await addPart(page, 'Add circuit', { 'Circuit tag': 'L', Name: 'Leach train', Process: 'ferric-leach' });
      await addPart(page, 'Add tank', { 'Tank tag': 'H1', Name: 'Leach 1', 'Working volume': '450', 'Ratio band low': '2', 'Ratio band high': '30' });
      await addPart(page, 'Add probe', { 'Probe tag': 'H1-ORP', 'Reporting interval': '1' });
      await addPart(page, 'Add gateway', { Username: 'heron-gw-1' });
      const password = (await page.getByTestId('gateway-password').textContent())!.trim();
      expect(password.length).toBeGreaterThanOrEqual(24);
      await page.screenshot({ path: path.join(SHOTS, 'commissioning-plant-setup.png'), fullPage: true });

      await page.goto(new URL('/', SITE_URL).href);
      const tile = page.locator('[data-testid="tank-tile"][data-tag="H1"]');
      await tile.waitFor({ timeout: 15_000 });
      await page.waitForSelector('[data-testid="connection-state"][data-state="connected"]', { timeout: 15_000 });
      expect(await tile.getAttribute('data-ts')).toBe('');

      // The device: README "Connecting probes" — MQTT 3.1.1, the gateway's login, QoS 1, one reading per message.
      device = await mqtt.connectAsync(`mqtt://127.0.0.1:${MQTT_PORT}`, {
        username: 'heron-gw-1', password, clientId: 'heron-gw-1-main', protocolVersion: 4, reconnectPeriod: 0, connectTimeout: 5_000,
      });
      const sentAt = Date.now();
      const ts = new Date(sentAt - 200).toISOString();
      await device.publishAsync('ferrisight/v1/heron/H1-ORP/reading', JSON.stringify({ ts, orpMv: 476, tempC: 25, seq: 1 }), { qos: 1 });
      await page.waitForFunction((expected) => document.querySelector('[data-testid="tank-tile"][data-tag="H1"]')?.getAttribute('data-ts') === expected, ts, { timeout: 10_000 });
      const liveAfterMs = Date.now() - sentAt;
      console.log(`commissioning: first reading on the Floor ${liveAfterMs} ms after it was published`);
      await page.screenshot({ path: path.join(SHOTS, 'commissioning-floor.png') });
      expect(liveAfterMs).toBeLessThanOrEqual(2_000);
      expect(pageErrors).toEqual([]);
    } finally {
      await device?.endAsync().catch(() => undefined);
      await context.close();
    }
  }, 120_000);
});
