/**
 * The plant of the scale test and benchmark: sites whose tags fall on chosen ingest slices,
 * numbered probes and a device per site, tanks with a P1 "ratio below band" definition, an
 * on-call engineer and a one-step escalation policy (mail at once), so a low reading raised by
 * either worker becomes an alarm event and one escalation mail.
 */
import mqtt, { type MqttClient } from 'mqtt';
import { definitionsRepository } from '../../../api/src/modules/alarms/definitions.repository.ts';
import { createSequelize } from '../../../api/src/db/sequelize.ts';
import type { Pool } from '../../../api/src/db/pool.ts';
import { sliceOf } from '../../../ingest/slices.ts';
import { CIRCUIT_TEMPLATES } from '../../../shared/alarms/templates.ts';
import { readingTopic } from '../../../shared/schemas/readings.ts';
import { addDevice, seedPlant } from '../../ingest/support.ts';
import type { StreamProbe } from '../../reliability/lib/stream.ts';

export const DEVICE_PASSWORD = 'scale-device-password';
const NOW = '2026-01-01 00:00:00.000';

export type ScaleSite = { tag: string; probes: StreamProbe[]; device: string; waitLive(mqttPort: number): Promise<void> };
export type AlarmTank = { site: ScaleSite; probeTag: string; definitionId: number };

export const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

export async function waitFor(check: () => boolean | Promise<boolean>, timeoutMs: number): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > until) throw new Error(`condition not met within ${timeoutMs} ms`);
    await sleep(100);
  }
}

export function connectDevice(mqttPort: number, site: ScaleSite, clientId: string): Promise<MqttClient> {
  return mqtt.connectAsync(`mqtt://127.0.0.1:${mqttPort}`, {
    username: site.device, password: DEVICE_PASSWORD, clientId, protocolVersion: 4, reconnectPeriod: 500, connectTimeout: 5_000,
  });
}

/** One site per slice (1…n): tags are tried in turn until each slice has one. */
export async function sitesOnSlices(pool: Pool, n: number, probesPerSite: number): Promise<ScaleSite[]> {
  const out: ScaleSite[] = [];
  for (let slice = 1; slice <= n; slice += 1) {
    let k = 0;
    while (sliceOf(`scale-${slice}-${k}`, n) !== slice) k += 1;
    const tag = `scale-${slice}-${k}`;
    const tags = Array.from({ length: probesPerSite }, (_, i) => `S${slice}P${String(i + 1).padStart(3, '0')}`);
    const ids = await seedPlant(pool, tag, [...tags, `S${slice}WARM`].map((t) => ({ tag: t })));
    const device = `scale-device-${slice}`;
    await addDevice(pool, tag, device, DEVICE_PASSWORD);
    const site: ScaleSite = {
      tag, device, probes: tags.map((t) => ({ tag: t, id: ids.get(t)! })),
      async waitLive(mqttPort) {
        // Re-sent until stored: the first may arrive before the slice's subscriptions are in place.
        const c = await connectDevice(mqttPort, site, `scale-warm-${slice}`);
        try {
          for (let seq = 1; seq < 600; seq += 1) {
            await c.publishAsync(readingTopic(tag, `S${slice}WARM`), JSON.stringify({ ts: new Date(Date.now() - 1000).toISOString(), orpMv: 480, tempC: 25, seq }), { qos: 1 });
            await sleep(100);
            const [row] = (await pool.query('SELECT 1 AS ok FROM readings WHERE probe_id = ? LIMIT 1', [ids.get(`S${slice}WARM`)])) as unknown[];
            if (row) return;
          }
          throw new Error(`site ${tag}: nothing stored within 60 s`);
        } finally {
          await c.endAsync(true);
        }
      },
    };
    out.push(site);
  }
  return out;
}

/** perSite tanks per site with a P1 below-band definition (no delay), an on-call engineer, and a mail-at-once policy. */
export async function addAlarmTanks(pool: Pool, databaseUrl: string, sites: ScaleSite[], perSite: number): Promise<AlarmTank[]> {
  const sequelize = createSequelize(databaseUrl, 2);
  const template = CIRCUIT_TEMPLATES[0]!.definitions.find((d) => d.kind === 'ratio-below-band')!;
  const out: AlarmTank[] = [];
  try {
    const circuits: number[] = [];
    for (const site of sites) circuits.push(((await pool.query('SELECT c.id FROM circuits c JOIN sites s ON s.id = c.site_id WHERE s.tag = ?', [site.tag])) as { id: number }[])[0]!.id);
    // Interleaved (site 1, site 2, site 1, …), so any run of tanks spans every site and so every slice.
    for (let i = 1; i <= perSite; i += 1) {
      for (const [s, site] of sites.entries()) {
        const tag = `S${s + 1}ALARM${i}`;
        const tank = await pool.query(
          'INSERT INTO tanks (circuit_id, tag, name, position, volume_m3, band_low, band_high, created_at, updated_at) VALUES (?, ?, ?, ?, 100, 0.5, 2, ?, ?)',
          [circuits[s], `T-${tag}`, `Tank ${tag}`, i, NOW, NOW]);
        await pool.query(
          `INSERT INTO probes (tank_id, tag, reference_id, reference_e25_v, reference_coeff_v_per_k, tolerance_mv, interval_s, installed_at, active, created_at, updated_at)
           VALUES (?, ?, 'agcl-sat', 0.199, -0.001, 10, 5, ?, 1, ?, ?)`, [tank.insertId, tag, NOW, NOW, NOW]);
        await pool.query(
          "INSERT INTO calibrations (tank_id, version, formal_potential_v, formal_coeff_v_per_k, valid_from, reason, created_at) VALUES (?, 1, 0.675, 0, ?, 'test', ?)",
          [tank.insertId, NOW, NOW]);
        const definitionId = (await definitionsRepository.insert(sequelize, Number(tank.insertId), template, new Date()))!;
        await pool.query('UPDATE alarm_definitions SET priority = 1, on_delay_s = 0 WHERE id = ?', [definitionId]);
        out.push({ site, probeTag: tag, definitionId });
      }
    }
  } finally {
    await sequelize.close();
  }
  const day = 86_400_000;
  await pool.query(
    `INSERT INTO roster_shifts (person_name, email, role_on_call, starts_at, ends_at, note, created_by, created_at, updated_at)
     VALUES ('Scale engineer', 'scale-engineer@test.example', 'primary', ?, ?, NULL, NULL, ?, ?)`,
    [new Date(Date.now() - day), new Date(Date.now() + day), new Date(), new Date()]);
  await pool.query("INSERT INTO escalation_steps (priority, step, after_min, notify) VALUES (1, 1, 0, 'primary')");
  // The probes were added behind the workers' backs: the API would announce it; the cache refresh (10 s) also finds them.
  return out;
}

/**
 * Sends one well-below-band reading per tank through the broker (so the slice's worker raises
 * the alarm) and resolves with the ids of the alarm events that followed.
 */
export async function raiseAlarms(pool: Pool, mqttPort: number, tanks: AlarmTank[]): Promise<number[]> {
  const clients = new Map<string, MqttClient>();
  try {
    for (const t of tanks) {
      if (!clients.has(t.site.tag)) clients.set(t.site.tag, await connectDevice(mqttPort, t.site, `scale-alarm-${t.site.tag}`));
      const body = { ts: new Date().toISOString(), orpMv: 420, tempC: 25, seq: Date.now() };
      await clients.get(t.site.tag)!.publishAsync(readingTopic(t.site.tag, t.probeTag), JSON.stringify(body), { qos: 1 });
    }
  } finally {
    await Promise.all([...clients.values()].map((c) => c.endAsync(true)));
  }
  const defs = tanks.map((t) => t.definitionId).join(',');
  let ids: number[] = [];
  await waitFor(async () => {
    const rows = (await pool.query(`SELECT id, definition_id FROM alarm_events WHERE definition_id IN (${defs}) ORDER BY id`)) as { id: number; definition_id: number }[];
    ids = rows.map((r) => r.id);
    return new Set(rows.map((r) => r.definition_id)).size === tanks.length;
  }, 30_000);
  return ids;
}

/** The pid of the process holding a lease now (owner is host:pid:random), or null. */
export async function leaseHolder(pool: Pool, name: string): Promise<number | null> {
  const [row] = (await pool.query('SELECT owner FROM leases WHERE name = ? AND expires_at > NOW(3)', [name])) as { owner: string }[];
  return row ? Number(row.owner.split(':')[1]) : null;
}
