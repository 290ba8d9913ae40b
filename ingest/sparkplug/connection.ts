import mqtt, { type MqttClient } from 'mqtt';
import type { Logger } from 'pino';
import { offlineTopic, type ProbesOffline } from '../../shared/schemas/internal-topics.ts';
import {
  parseSparkplugTopic, sparkplugStateTopic, sparkplugTopic, type SparkplugState,
} from '../../shared/schemas/sparkplug.ts';
import type { Pool } from '../../api/src/db/pool.ts';
import { sparkplugHostRepository, type HostEventRow } from '../../api/src/modules/sparkplug/sparkplug-host.repository.ts';
import type { Flusher } from '../flusher.ts';
import type { IngestMetrics } from '../metrics.ts';
import { SparkplugHost, SparkplugIndex, type HostEvent } from './host.ts';
import { decodePayload, encodeRebirth } from './payload.ts';

export type SparkplugHostOptions = {
  mqttUrl: string;
  username: string;
  password: string;
  /** The Sparkplug host id: STATE topic and MQTT client id. */
  hostId: string;
  pool: Pool;
  flusher: Flusher;
  metrics: IngestMetrics;
  log: Logger;
};

export type RunningSparkplugHost = {
  client: MqttClient;
  /** Resolves once STATE is published and the groups' subscriptions are in place (first connection). */
  ready: Promise<void>;
  /** Re-reads Plant setup's groups and mapping (the worker's refresh, or the API's announcement). */
  reload: () => Promise<void>;
  stop: () => Promise<void>;
};

const noop = () => undefined;

/**
 * The Sparkplug B 3.0 host application inside the ingest worker. Its own MQTT connection,
 * because the spec's host rules differ from the JSON contract's worker session: clean
 * session, a retained STATE birth (online: true) and the same STATE with online: false as
 * its Will, both with the connect timestamp. NBIRTH/NDATA/DBIRTH/DDATA are QoS 0 by the
 * spec, so there is no acknowledgement to hold back; the readings still go through the
 * worker's flusher: same validation, conversion, idempotent store and dead letters.
 */
export function startSparkplugHost(o: SparkplugHostOptions): RunningSparkplugHost {
  const index = new SparkplugIndex();
  const host = new SparkplugHost(index);
  const stateTopic = sparkplugStateTopic(o.hostId);
  let connectedAtMs = Date.now();
  const state = (online: boolean): string => JSON.stringify({ online, timestamp: connectedAtMs } satisfies SparkplugState);
  const client = mqtt.connect(o.mqttUrl, {
    clientId: `ferrisight-sparkplug-${o.hostId}`, username: o.username, password: o.password,
    protocolVersion: 4, clean: true, keepalive: 30, reconnectPeriod: 1_000, connectTimeout: 10_000, resubscribe: false,
    will: { topic: stateTopic, payload: Buffer.from(state(false)), qos: 1, retain: true },
  });
  // Each reconnect is a new host session: a new timestamp in the next CONNECT's Will and in its birth.
  client.on('close', () => {
    connectedAtMs = Date.now();
    if (client.options.will) client.options.will.payload = Buffer.from(state(false));
  });

  let subscribed: string[] = [];
  let markReady: () => void = noop;
  const ready = new Promise<void>((resolve) => { markReady = resolve; });

  const syncSubscriptions = async () => {
    if (!client.connected) return;
    const want = index.groups.map((g) => `spBv1.0/${g}/#`);
    const add = want.filter((f) => !subscribed.includes(f));
    const drop = subscribed.filter((f) => !want.includes(f));
    if (add.length) await client.subscribeAsync(Object.fromEntries(add.map((f) => [f, { qos: 1 as const }])));
    if (drop.length) await client.unsubscribeAsync(drop);
    subscribed = want;
  };
  const reload = async () => {
    try {
      const { groups, mappings } = await sparkplugHostRepository.load(o.pool);
      index.set(mappings, groups);
      await syncSubscriptions();
    } catch (err) {
      o.log.warn({ err: (err as Error).message }, 'Sparkplug mapping not loaded; retrying at the next refresh');
    }
  };

  client.on('connect', () => {
    // A new session: every node must be born again before its data counts (spec 3.0 host duties).
    host.reset();
    subscribed = [];
    void (async () => {
      await client.publishAsync(stateTopic, state(true), { qos: 1, retain: true });
      await reload();
      o.log.info({ hostId: o.hostId, groups: index.groups }, 'Sparkplug host online');
      markReady();
    })().catch((err: Error) => o.log.warn({ err: err.message }, 'Sparkplug host start failed'));
  });
  client.on('error', (err) => o.log.warn({ err: err.message }, 'Sparkplug mqtt error'));

  const events: HostEventRow[] = [];
  let writing = false;
  const writeEvents = async () => {
    if (writing || events.length === 0) return;
    writing = true;
    const batch = events.splice(0, 500);
    await sparkplugHostRepository.insertEvents(o.pool, batch).catch((err: Error) => o.log.warn({ err: err.message, lost: batch.length }, 'Sparkplug events not recorded'));
    writing = false;
  };
  const eventTimer = setInterval(() => void writeEvents(), 500);

  client.on('message', (topic, payload) => {
    const t = parseSparkplugTopic(topic);
    if (!t || t.kind !== 'message') return;
    const receivedAtMs = Date.now();
    let decoded;
    try {
      decoded = decodePayload(payload);
    } catch (err) {
      o.metrics.messages += 1;
      o.flusher.enqueue({
        topic, payload, receivedAtMs, ack: noop, isStale: () => false,
        decoded: { readings: [], rejections: [{ reason: `not a Sparkplug B payload: ${(err as Error).message}`, payload }] },
      });
      return;
    }
    const r = host.handle(t.groupId, t.type, t.edgeNodeId, t.deviceId, decoded, receivedAtMs);
    for (const e of r.events) record(e, receivedAtMs);
    if (r.rebirth) {
      client.publish(sparkplugTopic(r.rebirth.groupId, 'NCMD', r.rebirth.edgeNodeId), Buffer.from(encodeRebirth(receivedAtMs)), { qos: 0 });
    }
    for (const off of r.offline) {
      if (off.probeIds.length) client.publish(offlineTopic(off.siteTag), JSON.stringify({ probeIds: off.probeIds, atMs: receivedAtMs } satisfies ProbesOffline), { qos: 1 });
    }
    if (r.decoded.readings.length || r.decoded.rejections.length) {
      o.metrics.messages += 1;
      o.flusher.enqueue({ topic, payload, receivedAtMs, decoded: r.decoded, ack: noop, isStale: () => false });
    }
  });

  function record(e: HostEvent, atMs: number) {
    if (e.kind !== 'birth') o.log.info(e, 'Sparkplug host event');
    events.push({ atMs, ...e });
    if (events.length > 10_000) events.splice(0, events.length - 10_000);
  }

  return {
    client, ready, reload,
    async stop() {
      clearInterval(eventTimer);
      await writeEvents();
      // A clean stop says offline itself (the Will only fires on a lost connection).
      if (client.connected) await client.publishAsync(stateTopic, state(false), { qos: 1, retain: true }).catch(noop);
      await client.endAsync(true).catch(noop);
    },
  };
}
