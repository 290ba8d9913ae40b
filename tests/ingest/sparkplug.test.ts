/**
 * The Sparkplug B 3.0 host in the ingest worker, driven by an edge node we did not write:
 * Eclipse Tahu's `sparkplug-client` from npm (its own MQTT client and its own protobuf
 * encoder), against the embedded broker with a site's device credentials.
 */
import type { MqttClient } from 'mqtt';
import { newClient, type UPayload } from 'sparkplug-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { publishRefusal, subscribeRefusal } from '../../ingest/broker/acl.ts';
import { startWorker, type RunningWorker } from '../../ingest/start-worker.ts';
import { decodePayload } from '../../ingest/sparkplug/payload.ts';
import { toSqlTs, type Pool } from '../../api/src/db/pool.ts';
import { offlineTopic, parseInternal, probesOfflineSchema, type ProbesOffline } from '../../shared/schemas/internal-topics.ts';
import { sparkplugStateTopic } from '../../shared/schemas/sparkplug.ts';
import { SERVICE_PASSWORD, addDevice, connect, seedPlant, useBrokerRig, waitFor } from './support.ts';

const GROUP = 'kestrel-leach';
const HOST = 'ferrisight-test';
const EDGE_PASSWORD = 'edge-password-kestrel-1';
let ids: Map<string, number>;

async function seed(pool: Pool): Promise<void> {
  ids = await seedPlant(pool, 'kestrel', [{ tag: 'SPA' }, { tag: 'SPB' }, { tag: 'SPC' }]);
  await seedPlant(pool, 'osprey', [{ tag: 'OSP' }]);
  await addDevice(pool, 'kestrel', 'edge-kestrel', EDGE_PASSWORD);
  const g = await pool.query("INSERT INTO sparkplug_groups (site_id, group_id) SELECT id, ? FROM sites WHERE tag = 'kestrel'", [GROUP]);
  const map = (node: string, device: string, name: string, role: string, probe: string) => pool.query(
    'INSERT INTO sparkplug_metrics (group_ref, edge_node_id, device_id, metric_name, role, probe_id) VALUES (?, ?, ?, ?, ?, ?)',
    [g.insertId, node, device, name, role, ids.get(probe)]);
  await map('gw-1', 'orp-a', 'Leach/ORP', 'orp', 'SPA');
  await map('gw-1', 'orp-a', 'Leach/Temperature', 'temp', 'SPA');
  await map('gw-1', 'orp-b', 'Leach/ORP', 'orp', 'SPB');
  await map('gw-1', 'orp-b', 'Leach/Temperature', 'temp', 'SPB');
  await map('gw-2', '', 'ORP', 'orp', 'SPC');
  await map('gw-2', '', 'Temperature', 'temp', 'SPC');
}

const rig = useBrokerRig(seed);
let worker: RunningWorker;
let service: MqttClient;
type Edge = ReturnType<typeof newClient>;
const edges: Edge[] = [];

function edgeNode(node: string): Promise<Edge> {
  const c = newClient({
    serverUrl: `mqtt://127.0.0.1:${rig.broker.port}`, username: 'edge-kestrel', password: EDGE_PASSWORD,
    groupId: GROUP, edgeNode: node, clientId: `edge-${node}-${Date.now()}`, version: 'spBv1.0', publishDeath: true,
  });
  edges.push(c);
  return new Promise((resolve, reject) => {
    c.once('birth', () => resolve(c));
    c.once('error', reject);
  });
}

const unit = (u: string) => ({ engUnit: { type: 'String', value: u } });
/** The device's births: aliases 1 and 2 (ORP, temperature) for orp-a, 3 and 4 for orp-b; units as a gateway sends them. */
function births(edge: Edge, t: number, orpA: number, orpB: number): void {
  edge.publishNodeBirth({ timestamp: t, metrics: [{ name: 'Node Control/Rebirth', type: 'Boolean', value: false }] } as UPayload);
  edge.publishDeviceBirth('orp-a', { timestamp: t, metrics: [
    { name: 'Leach/ORP', alias: 1, type: 'Float', value: orpA, timestamp: t, properties: unit('mV') },
    { name: 'Leach/Temperature', alias: 2, type: 'Float', value: 25, timestamp: t, properties: unit('°C') },
  ] } as UPayload);
  edge.publishDeviceBirth('orp-b', { timestamp: t, metrics: [
    { name: 'Leach/ORP', alias: 3, type: 'Double', value: orpB, timestamp: t, properties: unit('mV') },
    { name: 'Leach/Temperature', alias: 4, type: 'Double', value: 25, timestamp: t, properties: unit('degC') },
  ] } as UPayload);
}

async function reading(probe: string, tsMs: number): Promise<{ orp_mv: number; temp_c: number; eh_v: number; ratio: number } | undefined> {
  const [row] = await rig.pool.query('SELECT orp_mv, temp_c, eh_v, ratio FROM readings WHERE probe_id = ? AND ts = ?', [ids.get(probe), toSqlTs(tsMs)]);
  return row;
}

async function deadLetters(pattern: string): Promise<{ topic: string; reason: string; payload: string }[]> {
  return rig.pool.query('SELECT topic, reason, payload FROM dead_letters WHERE reason LIKE ? ORDER BY id', [pattern]);
}

beforeAll(async () => {
  worker = await startWorker({
    databaseUrl: rig.db.databaseUrl, mqttUrl: `mqtt://127.0.0.1:${rig.broker.port}`, username: 'ferrisight-service',
    password: SERVICE_PASSWORD, clientId: 'ferrisight-ingest-spb', sparkplugHostId: HOST,
  });
  await Promise.all([worker.subscribed, worker.sparkplugReady]);
  service = await connect(rig.broker.port, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: 'ferrisight-spb-observer' });
});

afterAll(async () => {
  for (const e of edges) e.stop();
  await service?.endAsync(true);
  await worker?.stop();
});

describe('Sparkplug B host', () => {
  it('when the host is up, then its STATE is retained as online with a timestamp (Sparkplug 3.0 host STATE)', async () => {
    const state = new Promise<string>((resolve) => service.on('message', (t, p) => { if (t === sparkplugStateTopic(HOST)) resolve(p.toString()); }));
    await service.subscribeAsync(sparkplugStateTopic(HOST), { qos: 1 });
    const s = JSON.parse(await state);
    expect(s.online).toBe(true);
    expect(Number.isInteger(s.timestamp)).toBe(true);
  });

  it('when an edge node births two devices and sends data by alias, then both probes\' readings are stored and converted', async () => {
    const edge = await edgeNode('gw-1');
    const t0 = Date.now() - 60_000;
    births(edge, t0, 476, 451);
    const t1 = t0 + 1_000;
    // Data carries aliases only, as the spec intends: the names come from the births.
    edge.publishDeviceData('orp-a', { timestamp: t1, metrics: [{ alias: 1, type: 'Float', value: 476, timestamp: t1 }] } as UPayload);
    edge.publishDeviceData('orp-b', { timestamp: t1, metrics: [{ alias: 3, type: 'Double', value: 451, timestamp: t1 }, { alias: 4, type: 'Double', value: 25, timestamp: t1 }] } as UPayload);

    const a = await waitFor(() => reading('SPA', t1));
    const b = await waitFor(() => reading('SPB', t1));
    // Light's solution: +476 mV against Ag/AgCl (sat. KCl, 0.199 V) at 25 °C is Eh 0.675 V, E°′ 0.675 V → ratio 1
    // (Standard Methods 2580 / ASTM D1498).
    expect(a.eh_v).toBeCloseTo(0.675, 9);
    expect(a.ratio).toBeCloseTo(1.0, 9);
    // 25 mV below E°′ at 25 °C: ratio = exp(−0.025 / (RT/F)), RT/F = 0.0256926 V at 298.15 K (CODATA R and F).
    expect(b.eh_v).toBeCloseTo(0.650, 9);
    expect(b.ratio).toBeCloseTo(Math.exp(-0.025 / 0.0256926), 4);
    // The birth's own values are current values, stored too.
    expect(await waitFor(() => reading('SPA', t0))).toMatchObject({ orp_mv: 476, temp_c: 25 });
  });

  it('when a sequence number is dropped, then the node receives NCMD Node Control/Rebirth and the request is recorded', async () => {
    const edge = edges[0]!;
    const cmd = new Promise<UPayload>((resolve) => edge.once('ncmd', resolve));
    // Skip one seq, as if a message were lost between the node and the broker.
    (edge as unknown as { seq: number }).seq += 1;
    const t = Date.now() - 30_000;
    edge.publishDeviceData('orp-a', { timestamp: t, metrics: [{ alias: 1, type: 'Float', value: 470, timestamp: t }] } as UPayload);
    const payload = await cmd;
    expect(payload.metrics).toContainEqual(expect.objectContaining({ name: 'Node Control/Rebirth', value: true }));
    const events = await waitFor(async () => {
      const rows = await rig.pool.query("SELECT detail FROM sparkplug_events WHERE kind = 'rebirth-requested' AND edge_node_id = 'gw-1'");
      return rows.length ? rows : undefined;
    });
    expect(events[0].detail).toMatch(/^seq gap: expected \d+, got \d+ \(DDATA\)$/);
  });

  it('when a node sends data before any birth, then it is asked to rebirth and nothing is stored for it', async () => {
    const edge = await edgeNode('gw-2');
    const cmd = new Promise<UPayload>((resolve) => edge.once('ncmd', resolve));
    const t = Date.now() - 20_000;
    edge.publishNodeData({ timestamp: t, metrics: [{ name: 'ORP', type: 'Float', value: 480 }, { name: 'Temperature', type: 'Float', value: 30 }] } as UPayload);
    expect((await cmd).metrics).toContainEqual(expect.objectContaining({ name: 'Node Control/Rebirth', value: true }));
    const [{ n }] = await rig.pool.query('SELECT COUNT(*) AS n FROM readings WHERE probe_id = ?', [ids.get('SPC')]);
    expect(Number(n)).toBe(0);
    const rows = await waitFor(async () => {
      const r = await rig.pool.query("SELECT detail FROM sparkplug_events WHERE kind = 'rebirth-requested' AND edge_node_id = 'gw-2'");
      return r.length ? r : undefined;
    });
    expect(rows[0].detail).toBe('NDATA before the node\'s birth');
  });

  it('when a mapped metric has the wrong data type or unit, then it is dead-lettered with the reason and the rest is stored', async () => {
    const edge = edges[0]!;
    const t = Date.now() - 10_000;
    births(edge, t, 476, 451); // a fresh birth after the rebirth request
    edge.publishDeviceData('orp-a', { timestamp: t + 1, metrics: [{ alias: 1, type: 'String', value: '476 mV', timestamp: t + 1 }] } as UPayload);
    edge.publishDeviceBirth('orp-b', { timestamp: t + 2, metrics: [
      { name: 'Leach/ORP', alias: 3, type: 'Double', value: 0.451, timestamp: t + 2, properties: unit('V') },
      { name: 'Leach/Temperature', alias: 4, type: 'Double', value: 25, timestamp: t + 2, properties: unit('°C') },
    ] } as UPayload);
    const [type] = await waitFor(async () => { const r = await deadLetters('%data type String, expected a number'); return r.length ? r : undefined; });
    expect(type.topic).toBe(`spBv1.0/${GROUP}/DDATA/gw-1/orp-a`);
    expect(type.reason).toBe(`${GROUP}/gw-1/orp-a metric "Leach/ORP" (probe SPA, ORP in mV): data type String, expected a number`);
    expect(JSON.parse(type.payload)).toMatchObject({ metric: `${GROUP}/gw-1/orp-a/Leach/ORP`, datatype: 'String', value: '476 mV' });
    const [wrongUnit] = await waitFor(async () => { const r = await deadLetters('%unit "V", expected mV'); return r.length ? r : undefined; });
    expect(wrongUnit.topic).toBe(`spBv1.0/${GROUP}/DBIRTH/gw-1/orp-b`);
    // The good birth values of the same round were stored.
    expect(await waitFor(() => reading('SPA', t))).toMatchObject({ orp_mv: 476 });
  });

  it('when the node dies (NDEATH), then the worker announces its probes offline at once', async () => {
    const edge = edges[0]!;
    // Parsed with the contract the API's bus reads it with.
    const offline = new Promise<ProbesOffline>((resolve) => service.on('message', (t, p) => {
      if (t === offlineTopic('kestrel')) resolve(parseInternal(probesOfflineSchema, t, p));
    }));
    await service.subscribeAsync(offlineTopic('kestrel'), { qos: 1 });
    const sentAt = Date.now();
    edge.stop(); // publishes NDEATH with the session's bdSeq
    const o = await offline;
    expect(o.probeIds).toEqual([ids.get('SPA'), ids.get('SPB')].sort((x, y) => x! - y!));
    expect(Date.now() - sentAt).toBeLessThan(1_000);
    const rows = await waitFor(async () => {
      const r = await rig.pool.query("SELECT detail FROM sparkplug_events WHERE kind = 'death' AND edge_node_id = 'gw-1'");
      return r.length ? r : undefined;
    });
    expect(rows[0].detail).toMatch(/^node death \(bdSeq \d+\)/);
  });
});

describe('Sparkplug topic rights of a device account', () => {
  const device = { kind: 'device' as const, username: 'edge-kestrel', siteTag: 'kestrel', sparkplugGroups: [GROUP] };

  it('when a device publishes births, data and deaths in its site\'s group, then they are allowed; other groups, commands and STATE are refused', () => {
    expect(publishRefusal(device, `spBv1.0/${GROUP}/NBIRTH/gw-1`, 10)).toBeNull();
    expect(publishRefusal(device, `spBv1.0/${GROUP}/DDATA/gw-1/orp-a`, 10)).toBeNull();
    expect(publishRefusal(device, 'spBv1.0/osprey-leach/NBIRTH/gw-1', 10)).toMatch(/may not publish in Sparkplug group 'osprey-leach'/);
    expect(publishRefusal(device, `spBv1.0/${GROUP}/NCMD/gw-1`, 10)).toMatch(/may publish only NBIRTH/);
    expect(publishRefusal(device, `spBv1.0/STATE/${HOST}`, 10)).toMatch(/may publish only NBIRTH/);
  });

  it('when a device subscribes, then only its own group\'s commands and host STATE are allowed', () => {
    expect(subscribeRefusal(device, `spBv1.0/${GROUP}/NCMD/gw-1/#`)).toBeNull();
    expect(subscribeRefusal(device, `spBv1.0/STATE/${HOST}`)).toBeNull();
    expect(subscribeRefusal(device, `spBv1.0/${GROUP}/#`)).not.toBeNull();
    expect(subscribeRefusal(device, 'spBv1.0/osprey-leach/NCMD/gw-1/#')).not.toBeNull();
    expect(subscribeRefusal(device, 'ferrisight/v1/#')).not.toBeNull();
  });
});

describe('Sparkplug payload codec', () => {
  it('when Tahu\'s encoder writes signed and unsigned metrics, then ours reads the same values (spec 3.0 §6.4.16 two\'s complement)', async () => {
    const { encodePayload } = await import('sparkplug-payload/lib/sparkplugbpayload.js');
    const bytes = encodePayload({ timestamp: 1_700_000_000_000, seq: 7, metrics: [
      { name: 'i8', type: 'Int8', value: -5 }, { name: 'i32', type: 'Int32', value: -123456 }, { name: 'u64', type: 'UInt64', value: 2 ** 40 },
      { name: 'f', type: 'Float', value: 1.5 }, { name: 's', type: 'String', value: 'x' }, { name: 'b', type: 'Boolean', value: true },
    ] } as UPayload);
    const p = decodePayload(bytes);
    expect(p).toMatchObject({ timestamp: 1_700_000_000_000, seq: 7 });
    expect(p.metrics.map((m) => [m.name, m.value])).toEqual([['i8', -5], ['i32', -123456], ['u64', 2 ** 40], ['f', 1.5], ['s', 'x'], ['b', true]]);
  });

  it('when bytes are not a Sparkplug payload, then decoding throws (the host dead-letters the message)', () => {
    expect(() => decodePayload(Buffer.from([0x0a, 0xff, 0xff, 0xff]))).toThrow();
  });
});
