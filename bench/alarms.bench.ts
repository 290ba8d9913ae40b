/**
 * npm run bench:alarms — alarm latency: with 2,000 readings/s of background load (the
 * simulator's load mode), p50/p99 from publishing an out-of-band reading to (1) the alarm event
 * at a socket.io client of the API process and (2) its escalation row in mail_outbox, with the
 * first escalation step due at once. Everything runs as on a plant: broker, ingest worker (which
 * evaluates alarms after each commit), API and notifier as child processes, private MariaDB.
 * Settings: BENCH_ALARMS (default 30 samples).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import mqtt from 'mqtt';
import { io as connectClient } from 'socket.io-client';
import { createSequelize } from '../api/src/db/sequelize.ts';
import { issueToken } from '../api/src/modules/auth/tokens.ts';
import { applyAction } from '../api/src/modules/alarms/lifecycle.ts';
import { createIngestPool, toSqlTs } from '../api/src/db/pool.ts';
import { findFreePort } from '../scripts/lib/ports.ts';
import { seedDemo } from '../scripts/seed.ts';
import { readingTopic } from '../shared/schemas/readings.ts';
import type { AlarmEventView } from '../shared/schemas/alarms.ts';
import { runLoad } from '../simulators/plant/load.ts';
import { ensureLoadProbes } from '../simulators/plant/load-probes.ts';
import { SERVICE_PASSWORD, killAll, sleep, spawnPart, startBrokerProcess, startWorkerProcess, waitForPort } from '../tests/reliability/lib/procs.ts';
import { quantile, startBenchDb } from './lib/bench-db.ts';

const SAMPLES = Number(process.env.BENCH_ALARMS ?? 30);
const SECRET = 'bench-alarms-jwt-secret-0123456789-abcdefgh';
const SIM_PW = 'bench-sim-device-password';
const out = (s: string) => process.stdout.write(s + '\n');
const db = await startBenchDb();
const pool = createIngestPool(db.databaseUrl, 2);
const sequelize = createSequelize(db.databaseUrl, 2);
const dataDir = mkdtempSync(path.join(os.tmpdir(), 'fs-bench-alarms-'));
try {
  await seedDemo(db.databaseUrl, SIM_PW);
  await ensureLoadProbes(db.databaseUrl, 'kestrel', 200);
  // Only 'ORP high' stays, immediate (no on/off delay), and its first escalation step is due at once:
  // the bench times the machinery, not the rationalised delays.
  await pool.query("DELETE FROM alarm_definitions WHERE kind <> 'orp-high'");
  await pool.query("UPDATE alarm_definitions SET on_delay_s = 0, off_delay_s = 0, priority = 2");
  await pool.query('UPDATE escalation_steps SET after_min = 0 WHERE priority = 2 AND step = 1');
  const defs: { id: number; tank_id: number; threshold: number; probe: string }[] = await pool.query(
    "SELECT d.id, d.tank_id, d.threshold, p.tag AS probe FROM alarm_definitions d JOIN probes p ON p.tank_id = d.tank_id ORDER BY d.id");
  const [user] = await pool.query("SELECT id FROM users WHERE role = 'operator' LIMIT 1");

  const [mqttPort, apiPort, smtpPort] = [await findFreePort(), await findFreePort(), await findFreePort()];
  const common = { DATABASE_URL: db.databaseUrl, MQTT_URL: `mqtt://127.0.0.1:${mqttPort}`, SERVICE_MQTT_PASSWORD: SERVICE_PASSWORD, JWT_SECRET: SECRET };
  await startBrokerProcess({ port: mqttPort, dataDir, databaseUrl: db.databaseUrl });
  startWorkerProcess({ mqttPort, databaseUrl: db.databaseUrl, clientId: 'ferrisight-ingest-bench' });
  spawnPart('simulators/mail-catcher.ts', { SMTP_PORT: String(smtpPort), FERRISIGHT_DATA_DIR: dataDir });
  spawnPart('api/src/server.ts', { ...common, PORT: String(apiPort), HOST: '127.0.0.1', WEB_DIST: '/nonexistent', FERRISIGHT_DATA_DIR: dataDir, FERRISIGHT_PROC: 'api' });
  spawnPart('api/src/workers/notifier.ts', { ...common, PORT: String(apiPort), SMTP_URL: `smtp://127.0.0.1:${smtpPort}`, FERRISIGHT_PROC: 'notifier' });
  await Promise.all([waitForPort(apiPort), waitForPort(smtpPort)]);

  const socket = connectClient(`http://127.0.0.1:${apiPort}`, { transports: ['websocket'], auth: { token: issueToken({ id: user.id, role: 'operator' }, SECRET, 3600) } });
  await new Promise<void>((resolve, reject) => { socket.once('connect', () => resolve()); socket.once('connect_error', reject); });
  const activated = new Map<number, number>();
  socket.on('alarm:event', (e: AlarmEventView) => { if (e.kind === 'activated') activated.set(e.instanceId, Date.now()); });
  const device = await mqtt.connectAsync(`mqtt://127.0.0.1:${mqttPort}`, { username: 'sim-kestrel', password: SIM_PW, clientId: 'bench-alarm-device', protocolVersion: 4 });

  // 2,000 readings/s (200 msg/s × 10) on the load probes for the whole run.
  const background = runLoad({ mqttUrl: common.MQTT_URL, username: 'sim-kestrel', password: SIM_PW, siteTag: 'kestrel', tanks: 200, hz: 10, batch: 10, durationS: SAMPLES * 3 + 20 });
  await sleep(3_000);
  const toClient: number[] = [];
  const toOutbox: number[] = [];
  let seq = 1;
  const send = (probe: string, orpMv: number) => device.publishAsync(readingTopic('kestrel', probe), JSON.stringify({ ts: new Date().toISOString(), orpMv, tempC: 42, seq: seq++ }), { qos: 1 });
  for (let i = 0; i < SAMPLES; i += 1) {
    const d = defs[i % defs.length];
    const t0 = Date.now();
    await send(d.probe, d.threshold + 40);
    let instanceId: number | undefined;
    let outboxAt: number | undefined;
    for (const until = Date.now() + 15_000; Date.now() < until && (!instanceId || !activated.has(instanceId) || !outboxAt);) {
      const [row] = await pool.query(
        'SELECT i.id, o.created_at FROM alarm_instances i LEFT JOIN mail_outbox o ON o.instance_id = i.id WHERE i.definition_id = ? AND i.open_definition_id IS NOT NULL', [d.id]);
      instanceId = row?.id;
      if (row?.created_at) outboxAt = Date.parse(`${String(row.created_at).replace(' ', 'T')}Z`);
      await sleep(20);
    }
    if (instanceId && activated.has(instanceId)) toClient.push(activated.get(instanceId)! - t0);
    if (outboxAt) toOutbox.push(outboxAt - t0);
    // Back to normal: an in-band reading clears, an acknowledgement closes (next sample opens a new instance).
    await send(d.probe, d.threshold - 150);
    await sleep(300);
    if (instanceId) await applyAction(sequelize, { instanceId, action: 'acknowledge', at: new Date(), actor: { userId: user.id, name: 'bench', how: 'screen' } });
  }
  await background;
  const f = (xs: number[]) => (xs.length ? `p50 ${quantile(xs, 0.5).toFixed(0)} ms, p99 ${quantile(xs, 0.99).toFixed(0)} ms (n=${xs.length})` : 'no samples');
  out(`alarms benchmark, 2,000 readings/s background, ${SAMPLES} out-of-band readings, ${os.cpus().length} cores`);
  out(`publish → alarm at socket.io client: ${f(toClient)} (target p99 < 1,000 ms)`);
  out(`publish → escalation row in mail_outbox (step due at once): ${f(toOutbox)}`);
  const s = (xs: number[]) => ({ n: xs.length, p50: xs.length ? quantile(xs, 0.5) : null, p99: xs.length ? quantile(xs, 0.99) : null });
  out(`RESULT ${JSON.stringify({ bench: 'alarms', samples: SAMPLES, toClient: s(toClient), toOutbox: s(toOutbox), at: toSqlTs(Date.now()) })}`);
  socket.disconnect();
  await device.endAsync();
} finally {
  await killAll();
  await sequelize.close();
  await pool.end();
  await db.stop();
  rmSync(dataDir, { recursive: true, force: true });
}
