import mqtt, { type IPublishPacket, type MqttClient } from 'mqtt';
import { writeToStream } from 'mqtt-packet';
import type { Logger } from 'pino';
import { CACHE_INVALIDATE_TOPIC, isInternalTopic } from '../shared/schemas/internal-topics.ts';
import { decodeMessage } from '../api/src/modules/readings/decode.ts';
import type { Flusher } from './flusher.ts';
import type { IngestMetrics } from './metrics.ts';

export type AckMode = 'pipelined' | 'serial';

export type IntakeOptions = {
  mqttUrl: string;
  username: string;
  password: string;
  clientId: string;
  /** null: the caller manages the device subscriptions (ingest/slices.ts); only control topics here. */
  topicFilter: string | null;
  ackMode: AckMode;
  flusher: Flusher;
  metrics: IngestMetrics;
  log: Logger;
  /** Internal control messages (cache invalidation), handled at once and never queued. */
  onInternal: (topic: string, payload: Buffer) => void;
};

/** Passed to mqtt.js's handleMessage callback to say "no PUBACK from you": it then skips the ack. */
const NO_AUTO_ACK = new Error('acknowledged after commit');

/**
 * The worker's MQTT session: clean: false and QoS 1, so whatever is not acknowledged stays
 * with the broker across a worker crash. mqtt.js hands packets to handleMessage one at a time
 * and writes the PUBACK only when its callback runs (handlers/publish.ts), so:
 * - 'serial': the callback runs after the commit — one message per commit per connection;
 * - 'pipelined': the callback runs at once with an error (mqtt.js then sends no PUBACK and moves
 *   on), and the flusher writes the PUBACK itself after the commit, in arrival order (MQTT-4.6.0-2),
 *   encoded by mqtt-packet (the codec mqtt.js itself uses) onto the client's public `stream`.
 *   mqtt.js has no public call for a PUBACK of its own; a PUBACK needs nothing from its store.
 * Either way a PUBACK is only ever written on the connection the message came in on: a stale
 * one could ack a different message after a reconnect.
 */
export type Intake = {
  client: MqttClient;
  subscribed: Promise<void>;
  stopTaking: () => void;
  /** Runs `send` (a flush's PUBACKs) with the socket corked, so they leave in one write. */
  corked: (send: () => void) => void;
};

export function startIntake(o: IntakeOptions): Intake {
  const client = mqtt.connect(o.mqttUrl, {
    clientId: o.clientId, username: o.username, password: o.password,
    protocolVersion: 4, clean: false, keepalive: 30, reconnectPeriod: 1_000, connectTimeout: 10_000,
    reconnectOnConnackError: true, resubscribe: false,
    // Live values are transient: never pile them up in memory while the broker is away.
    queueQoSZero: false,
  });
  let stopping = false;
  const mode = o.ackMode;

  let markSubscribed: () => void = () => undefined;
  const subscribed = new Promise<void>((resolve) => { markSubscribed = resolve; });
  client.on('connect', (connack) => {
    o.log.info({ sessionPresent: connack.sessionPresent, mode }, 'connected to broker');
    const filters = o.topicFilter ? { [o.topicFilter]: { qos: 1 as const }, [CACHE_INVALIDATE_TOPIC]: { qos: 0 as const } } : { [CACHE_INVALIDATE_TOPIC]: { qos: 0 as const } };
    client.subscribe(filters, (err) => {
      if (err) o.log.error({ err: err.message }, 'subscribe failed');
      else markSubscribed();
    });
  });
  client.on('close', () => o.log.debug('broker connection closed'));
  client.on('error', (err) => o.log.warn({ err: err.message }, 'mqtt error'));

  client.handleMessage = (packet: IPublishPacket, done) => {
    const payload = Buffer.isBuffer(packet.payload) ? packet.payload : Buffer.from(packet.payload);
    if (isInternalTopic(packet.topic)) {
      o.onInternal(packet.topic, payload);
      done();
      return;
    }
    const stream = client.stream;
    const isStale = () => !client.connected || client.stream !== stream;
    if (stopping || isStale()) {
      done(NO_AUTO_ACK); // not ours to finish: the broker redelivers it
      return;
    }
    o.metrics.messages += 1;
    const base = { topic: packet.topic, payload, receivedAtMs: Date.now(), decoded: decodeMessage(packet.topic, payload), isStale };
    if (mode === 'serial') {
      o.flusher.enqueue({ ...base, ack: () => done(isStale() ? NO_AUTO_ACK : undefined) });
      return;
    }
    const { messageId, qos } = packet;
    const ack = () => {
      if (qos > 0 && messageId !== undefined && !isStale()) writeToStream({ cmd: 'puback', messageId }, stream);
    };
    o.flusher.enqueue({ ...base, ack });
    // Backpressure: hold mqtt.js (and so the socket) while the queue is full.
    void o.flusher.waitForRoom().then(() => done(NO_AUTO_ACK));
  };

  const corked = (send: () => void) => {
    const stream = client.stream;
    if (!stream || typeof stream.cork !== 'function') return send();
    stream.cork();
    try {
      send();
    } finally {
      stream.uncork();
    }
  };

  return { client, subscribed, stopTaking: () => { stopping = true; }, corked };
}
