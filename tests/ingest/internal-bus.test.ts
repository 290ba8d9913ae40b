/**
 * The API's broker link parses every internal payload where it arrives: a message that does not
 * fit its schema is dropped and the link carries on (the database stays the record).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { MqttClient } from 'mqtt';
import { Bus } from '../../api/src/realtime/bus.ts';
import { toTankLive } from '../../ingest/live.ts';
import { INGEST_HEALTH_TOPIC, SIM_STATE_TOPIC, latestTopic, offlineTopic, type ProbesOffline } from '../../shared/schemas/internal-topics.ts';
import type { TankLive } from '../../shared/schemas/readings.ts';
import { SERVICE_PASSWORD, connect, useBrokerRig, waitFor } from './support.ts';

const rig = useBrokerRig();
let bus: Bus;
let pub: MqttClient;
const received: TankLive[][] = [];
const offline: ProbesOffline[] = [];

beforeAll(async () => {
  bus = new Bus(`mqtt://127.0.0.1:${rig.broker.port}`, 'ferrisight-service', SERVICE_PASSWORD, 'ferrisight-api-bus-test');
  bus.on('latest', (readings) => received.push(readings));
  bus.on('offline', (o) => offline.push(o));
  await waitFor(async () => bus.connected);
  pub = await connect(rig.broker.port, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: 'ferrisight-bus-test-pub' });
});
afterAll(async () => {
  await pub?.endAsync();
  await bus?.close();
});

const live = toTankLive({
  probeId: 7, tankId: 3, probeTag: 'A1-ORP', siteTag: 'kestrel', tsMs: Date.UTC(2026, 11, 1, 8), seq: 1,
  orpMv: 412.6, tempC: 42.1, ehV: 0.62, ratio: 0.35, ferricFraction: 0.26, flag: 'ok', calibrationVersion: 2, receivedAtMs: 0,
});

describe('internal bus', () => {
  it('when a latest-values message does not fit its schema, then it is dropped and the next good one still arrives', async () => {
    // Give the subscription a moment to be in place: QoS 0 messages before it are gone.
    await waitFor(async () => {
      await pub.publishAsync(latestTopic('kestrel'), JSON.stringify({ readings: [] }), { qos: 0 });
      return received.length > 0;
    });
    await pub.publishAsync(latestTopic('kestrel'), JSON.stringify({ readings: [{ ...live, tankId: 'three' }] }), { qos: 0 });
    await pub.publishAsync(latestTopic('kestrel'), 'not json', { qos: 0 });
    await pub.publishAsync(latestTopic('kestrel'), JSON.stringify({ readings: [live] }), { qos: 0 });
    // Empty lists are the priming messages above.
    const withReadings = () => received.filter((r) => r.length > 0);
    await waitFor(async () => withReadings().length > 0);
    expect(withReadings()).toEqual([[live]]);
  });

  it('when a health or simulator snapshot does not fit, then the last good one is kept', async () => {
    const good = {
      at: '2026-12-01T08:00:00.000Z', startedAt: '2026-12-01T07:00:00.000Z', messages: 5, readingsStored: 5, duplicates: 0, conflicts: 0,
      deadLetters: 0, flushes: 1, flushErrors: 0, queued: 0, flushP50Ms: 3, flushP99Ms: 4, ackP99Ms: 5, lagS: 1, dbUp: true, mqttConnected: true,
    };
    await pub.publishAsync(INGEST_HEALTH_TOPIC, JSON.stringify(good), { qos: 1 });
    await waitFor(async () => bus.ingestHealth?.messages === 5);
    // Each check waits for a later good message on another topic: one connection delivers in order.
    await pub.publishAsync(INGEST_HEALTH_TOPIC, JSON.stringify({ ...good, messages: -1 }), { qos: 1 });
    await pub.publishAsync(SIM_STATE_TOPIC, JSON.stringify({ faults: [{ fault: 'noisy', probeTag: 'A1-ORP', since: good.at }], at: good.at }), { qos: 1 });
    await waitFor(async () => bus.simState.length === 1);
    expect(bus.ingestHealth?.messages).toBe(5);
    await pub.publishAsync(SIM_STATE_TOPIC, JSON.stringify({ faults: 'none' }), { qos: 1 });
    await pub.publishAsync(INGEST_HEALTH_TOPIC, JSON.stringify({ ...good, messages: 6 }), { qos: 1 });
    await waitFor(async () => bus.ingestHealth?.messages === 6);
    expect(bus.simState).toEqual([{ fault: 'noisy', probeTag: 'A1-ORP', since: good.at }]);
  });

  it('when a probes-offline message does not fit its schema, then it is dropped and the next good one still arrives', async () => {
    const atMs = Date.UTC(2026, 11, 1, 8);
    // One connection delivers in order (QoS 1), so the good message after the bad ones is the only one passed on.
    await pub.publishAsync(offlineTopic('kestrel'), JSON.stringify({ probeIds: ['A1-ORP'], atMs }), { qos: 1 });
    await pub.publishAsync(offlineTopic('kestrel'), JSON.stringify({ probeIds: [7] }), { qos: 1 });
    await pub.publishAsync(offlineTopic('kestrel'), JSON.stringify({ probeIds: [7, 8], atMs }), { qos: 1 });
    await waitFor(async () => offline.length > 0);
    expect(offline).toEqual([{ probeIds: [7, 8], atMs }]);
  });
});
