/**
 * Browser test: a Sparkplug B edge node (Eclipse Tahu's sparkplug-client from npm) feeds a
 * Train B tank through the whole running app; when the node's death certificate (NDEATH)
 * arrives, the Floor shows the tank "Not live" within 1 s instead of after three intervals.
 * Needs E2E_BASE_URL, E2E_PASSWORD and the broker and device account that scripts/run-e2e.ts
 * passes (E2E_MQTT_URL, E2E_DEVICE_USER, E2E_DEVICE_PASSWORD).
 */
import path from 'node:path';
import { newClient, type UPayload } from 'sparkplug-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { APIRequestContext, Browser, BrowserContext, Page } from 'playwright-core';
import { appUrl, BASE_URL, launchBrowser, SHOTS, signIn } from '../helpers/browser.ts';

const MQTT_URL = process.env.E2E_MQTT_URL;
const TANK = 'B4';
const PROBE = 'B4-ORP';
const GROUP = 'kestrel-e2e';
const NODE = 'e2e-gateway';
type Edge = ReturnType<typeof newClient>;

async function call(api: APIRequestContext, method: 'get' | 'post', url: string, data?: object): Promise<{ status: number; body: unknown }> {
  const res = await api[method](appUrl(url), { data, headers: { 'X-Ferrisight-Csrf': '1' } });
  return { status: res.status(), body: await res.json().catch(() => null) };
}

function connectEdge(): Promise<Edge> {
  const c = newClient({
    serverUrl: MQTT_URL!, username: process.env.E2E_DEVICE_USER!, password: process.env.E2E_DEVICE_PASSWORD!,
    groupId: GROUP, edgeNode: NODE, clientId: `e2e-edge-${Date.now()}`, version: 'spBv1.0', publishDeath: true,
  });
  return new Promise((resolve, reject) => {
    c.once('birth', () => resolve(c));
    c.once('error', reject);
  });
}

const tile = (page: Page) => page.locator(`[data-testid="tank-tile"][data-tag="${TANK}"]`);

describe.skipIf(!BASE_URL || !MQTT_URL)('Sparkplug edge node on the Floor', () => {
  let browser: Browser;
  let context: BrowserContext;
  let page: Page;
  let edge: Edge | null = null;

  beforeAll(async () => {
    browser = await launchBrowser();
    context = await browser.newContext({ viewport: { width: 1600, height: 1000 } });
    page = await context.newPage();
    await signIn(page, 'admin');
    const api = page.request;
    const plant = (await call(api, 'get', '/api/plant')).body as { sites: { id: number; circuits: { tanks: { tag: string; probe: { id: number } | null }[] }[] }[] };
    const site = plant.sites[0]!;
    const probeId = site.circuits.flatMap((c) => c.tanks).find((t) => t.tag === TANK)!.probe!.id;
    // 409 on a re-run against the same app: the group and mapping are already there.
    expect([201, 409]).toContain((await call(api, 'post', '/api/admin/sparkplug/groups', { siteId: site.id, groupId: GROUP })).status);
    for (const [metricName, role] of [['ORP', 'orp'], ['Temperature', 'temp']] as const) {
      expect([201, 409]).toContain((await call(api, 'post', '/api/admin/sparkplug/mappings', { groupId: GROUP, edgeNodeId: NODE, deviceId: PROBE, metricName, role, probeId })).status);
    }
    // The simulator stops sending this probe's JSON readings: from now on only the edge node feeds it.
    expect((await call(api, 'post', '/api/admin/simulator', { fault: 'comms-loss', probeTag: PROBE, action: 'start' })).status).toBe(202);
  }, 60_000);

  afterAll(async () => {
    edge?.stop();
    if (page) await call(page.request, 'post', '/api/admin/simulator', { fault: 'comms-loss', probeTag: PROBE, action: 'clear' }).catch(() => undefined);
    await context?.close();
    await browser?.close();
  });

  it('when the edge node sends NDEATH, then the Floor shows its tank not live within 1 s', async () => {
    await page.goto(appUrl('/'));
    await tile(page).waitFor({ timeout: 30_000 });
    // Births, then data every second until the tile shows a value the edge node sent (a site's
    // device account learns a newly added group on its next sign-in, so the node may have to reconnect).
    const deadline = Date.now() + 90_000;
    let sentAt = 0;
    while (Date.now() < deadline) {
      edge = await connectEdge();
      const t = Date.now();
      edge.publishNodeBirth({ timestamp: t, metrics: [{ name: 'Node Control/Rebirth', type: 'Boolean', value: false }] } as UPayload);
      edge.publishDeviceBirth(PROBE, { timestamp: t, metrics: [
        { name: 'ORP', alias: 1, type: 'Float', value: 430, timestamp: t, properties: { engUnit: { type: 'String', value: 'mV' } } },
        { name: 'Temperature', alias: 2, type: 'Float', value: 82, timestamp: t, properties: { engUnit: { type: 'String', value: '°C' } } },
      ] } as UPayload);
      sentAt = t;
      for (let i = 0; i < 5; i += 1) {
        await page.waitForTimeout(1_000);
        const ts = Date.parse((await tile(page).getAttribute('data-ts')) ?? '');
        if (ts >= sentAt) break;
        const now = Date.now();
        edge.publishDeviceData(PROBE, { timestamp: now, metrics: [{ alias: 1, type: 'Float', value: 430, timestamp: now }] } as UPayload);
      }
      if (Date.parse((await tile(page).getAttribute('data-ts')) ?? '') >= sentAt) break;
      edge.stop();
      edge = null;
    }
    expect(edge).not.toBeNull();
    await expect.poll(async () => tile(page).getByText('Not live').count(), { timeout: 5_000 }).toBe(0);

    const diedAt = Date.now();
    edge!.stop(); // NDEATH with the session's bdSeq
    edge = null;
    await tile(page).getByText('Not live').waitFor({ timeout: 5_000 });
    const ms = Date.now() - diedAt;
    await page.screenshot({ path: path.join(SHOTS, 'sparkplug-ndeath-floor.png') });
    console.log(`NDEATH → Floor "Not live": ${ms} ms`);
    expect(ms).toBeLessThanOrEqual(1_000);
  }, 150_000);
});
