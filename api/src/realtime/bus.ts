import { EventEmitter } from 'node:events';
import mqtt, { type MqttClient } from 'mqtt';
import { brokerHealthSchema, ingestHealthSchema, type BrokerHealth, type IngestHealth } from '../../../shared/schemas/ingest-health.ts';
import {
  BROKER_HEALTH_TOPIC, CACHE_INVALIDATE_TOPIC, INGEST_HEALTH_TOPIC, LATEST_FILTER, OFFLINE_FILTER, SIM_COMMAND_TOPIC, SIM_STATE_TOPIC,
  latestMessageSchema, latestTopic, parseInternal, probesOfflineSchema, type ProbesOffline,
} from '../../../shared/schemas/internal-topics.ts';
import type { TankLive } from '../../../shared/schemas/readings.ts';
import { simStateSchema, type ActiveFault, type SimCommand } from '../../../shared/schemas/simulator.ts';
import { logger } from '../lib/logger.ts';

type BusEvents = { latest: [readings: TankLive[]]; offline: [offline: ProbesOffline]; status: [connected: boolean] };

/**
 * The API's link to the broker: the ingest worker publishes converted readings on internal
 * topics after each commit; the database stays the record, so QoS 0 is enough here.
 * Every payload is parsed on arrival; one that does not fit its schema is logged and dropped.
 */
export class Bus extends EventEmitter<BusEvents> {
  simState: ActiveFault[] = [];
  ingestHealth: IngestHealth | null = null;
  brokerHealth: BrokerHealth | null = null;
  private client: MqttClient;

  constructor(url: string, username: string, password: string, clientId = `ferrisight-api-${process.pid}`) {
    super();
    this.client = mqtt.connect(url, { username, password, clientId, protocolVersion: 4, clean: true, reconnectPeriod: 2000 });
    this.client.on('connect', () => {
      this.client.subscribe([LATEST_FILTER, OFFLINE_FILTER, SIM_STATE_TOPIC, INGEST_HEALTH_TOPIC, BROKER_HEALTH_TOPIC], { qos: 0 });
      this.emit('status', true);
    });
    this.client.on('close', () => this.emit('status', false));
    this.client.on('error', (err) => logger.warn({ err: err.message }, 'bus error'));
    this.client.on('message', (topic, payload) => this.onMessage(topic, payload));
  }

  private onMessage(topic: string, payload: Buffer): void {
    try {
      if (topic === SIM_STATE_TOPIC) this.simState = parseInternal(simStateSchema, topic, payload).faults;
      else if (topic === INGEST_HEALTH_TOPIC) this.ingestHealth = parseInternal(ingestHealthSchema, topic, payload);
      else if (topic === BROKER_HEALTH_TOPIC) this.brokerHealth = parseInternal(brokerHealthSchema, topic, payload);
      else if (topic.endsWith('/offline')) this.emit('offline', parseInternal(probesOfflineSchema, topic, payload));
      else this.emit('latest', parseInternal(latestMessageSchema, topic, payload).readings);
    } catch (err) {
      logger.warn({ topic, err: (err as Error).message }, 'unreadable internal message');
    }
  }

  async simCommand(cmd: SimCommand): Promise<void> {
    await this.client.publishAsync(SIM_COMMAND_TOPIC, JSON.stringify(cmd), { qos: 1 });
  }

  /** Pushes readings to every API node's screens, as the ingest worker does after a commit. */
  async publishLatest(siteTag: string, readings: TankLive[]): Promise<void> {
    await this.client.publishAsync(latestTopic(siteTag), JSON.stringify({ readings }), { qos: 0 });
  }

  async invalidateProbeCache(): Promise<void> {
    await this.client.publishAsync(CACHE_INVALIDATE_TOPIC, '{}', { qos: 1 });
  }

  get connected(): boolean {
    return this.client.connected;
  }

  async close(): Promise<void> {
    await this.client.endAsync();
  }
}
