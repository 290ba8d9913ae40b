/**
 * The generated plant of `npm run bench:fanout` and the 500-tank Floor benchmark: several sites,
 * each with circuits of tanks in train order, one probe per tank reporting every second, one
 * gateway account per site, and a signed-in user per role. Everything is invented.
 */
import bcrypt from 'bcryptjs';
import mqtt, { type MqttClient } from 'mqtt';
import type { Pool } from '../../api/src/db/pool.ts';
import { issueToken } from '../../api/src/modules/auth/tokens.ts';
import type { Role } from '../../shared/schemas/auth.ts';
import { batchTopic } from '../../shared/schemas/readings.ts';

const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

export type FanoutSite = { id: number; tag: string; device: string; password: string; probes: { id: number; tag: string; tankId: number }[] };
export type FanoutPlant = { sites: FanoutSite[]; tanks: number };

const NOW = '2026-01-01 00:00:00.000';
const DEVICE_PASSWORD = 'fanout-gateway-password';
const ROLES: Role[] = ['operator', 'supervisor', 'metallurgist', 'engineer', 'admin'];

/** sites × circuits × tanks, each tank with a probe (interval 1 s) and a first calibration. */
export async function seedFanoutPlant(pool: Pool, shape: { sites: number; circuits: number; tanksPerCircuit: number }): Promise<FanoutPlant> {
  const hash = await bcrypt.hash(DEVICE_PASSWORD, 4);
  const sites: FanoutSite[] = [];
  for (let s = 1; s <= shape.sites; s += 1) {
    const tag = `fan-${s}`;
    const site = await pool.query('INSERT INTO sites (tag, name, time_zone, created_at, updated_at) VALUES (?, ?, ?, ?, ?)', [tag, `Generated site ${s}`, 'UTC', NOW, NOW]);
    const device = `fanout-gw-${s}`;
    await pool.query('INSERT INTO devices (site_id, username, password_hash, enabled, created_at, updated_at) VALUES (?, ?, ?, 1, ?, ?)', [site.insertId, device, hash, NOW, NOW]);
    const out: FanoutSite = { id: Number(site.insertId), tag, device, password: DEVICE_PASSWORD, probes: [] };
    for (let c = 1; c <= shape.circuits; c += 1) {
      const circuit = await pool.query('INSERT INTO circuits (site_id, tag, name, position, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?)', [site.insertId, `C${c}`, `Train ${String.fromCharCode(64 + c)}`, c, NOW, NOW]);
      for (let t = 1; t <= shape.tanksPerCircuit; t += 1) {
        const tankTag = `F${s}-${c}-${String(t).padStart(2, '0')}`;
        const tank = await pool.query(
          'INSERT INTO tanks (circuit_id, tag, name, position, volume_m3, band_low, band_high, created_at, updated_at) VALUES (?, ?, ?, ?, 200, 0.5, 2, ?, ?)',
          [circuit.insertId, tankTag, `Tank ${tankTag}`, t, NOW, NOW]);
        const probeTag = `${tankTag}-ORP`;
        const probe = await pool.query(
          `INSERT INTO probes (tank_id, tag, reference_id, reference_e25_v, reference_coeff_v_per_k, tolerance_mv, interval_s, installed_at, active, created_at, updated_at)
           VALUES (?, ?, 'agcl-sat', 0.199, -0.001, 10, 1, ?, 1, ?, ?)`, [tank.insertId, probeTag, NOW, NOW, NOW]);
        await pool.query(
          "INSERT INTO calibrations (tank_id, version, formal_potential_v, formal_coeff_v_per_k, valid_from, reason, created_at) VALUES (?, 1, 0.675, 0, ?, 'generated', ?)",
          [tank.insertId, NOW, NOW]);
        out.probes.push({ id: Number(probe.insertId), tag: probeTag, tankId: Number(tank.insertId) });
      }
    }
    sites.push(out);
  }
  return { sites, tanks: sites.reduce((n, s) => n + s.probes.length, 0) };
}

/** One user per role, with a session token each (signed with the cluster's secret). */
export async function roleTokens(pool: Pool, secret: string): Promise<{ role: Role; token: string }[]> {
  const out: { role: Role; token: string }[] = [];
  for (const role of ROLES) {
    const email = `fanout-${role}@test.example`;
    await pool.query(
      `INSERT INTO users (email, name, role, password_hash, disabled, tokens_valid_after, created_at, updated_at)
       VALUES (?, ?, ?, 'x', 0, '1970-01-01 00:00:01', ?, ?)`, [email, `Generated ${role}`, role, NOW, NOW]);
    const [row] = (await pool.query('SELECT id FROM users WHERE email = ?', [email])) as { id: number }[];
    out.push({ role, token: issueToken({ id: row!.id, role }, secret, 3600) });
  }
  return out;
}

/** Every site's gateway publishes its tanks' readings once a second, one batch message per site. */
export async function startGateways(mqttPort: number, sites: FanoutSite[]): Promise<{ stop(): Promise<void> }> {
  const clients: MqttClient[] = [];
  for (const s of sites) {
    clients.push(await mqtt.connectAsync(`mqtt://127.0.0.1:${mqttPort}`, { username: s.device, password: s.password, clientId: `${s.device}-bench`, protocolVersion: 4, reconnectPeriod: 500 }));
  }
  let seq = 0;
  let running = true;
  const loop = (async () => {
    while (running) {
      const tick = Date.now();
      seq += 1;
      await Promise.all(sites.map((s, i) => {
        const ts = new Date().toISOString();
        const readings = s.probes.map((p, k) => ({ probe: p.tag, ts, orpMv: 440 + ((seq + k) % 20), tempC: 45, seq }));
        return clients[i]!.publishAsync(batchTopic(s.tag), JSON.stringify({ readings }), { qos: 1 });
      }));
      await sleep(Math.max(0, 1000 - (Date.now() - tick)));
    }
  })();
  return {
    async stop() {
      running = false;
      await loop;
      await Promise.all(clients.map((c) => c.endAsync(true)));
    },
  };
}
