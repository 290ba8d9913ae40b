import { EventEmitter } from 'node:events';
import mqtt, { type MqttClient } from 'mqtt';
import type { BrokerHealth, IngestHealth } from '../../../shared/schemas/ingest-health.ts';
import { INTERNAL_PREFIX, type TankLive } from '../../../shared/schemas/readings.ts';
import { logger } from '../lib/logger.ts';

export type SimFault = { fault: string; probeTag: string };
export type SimCommand = SimFault & { action: 'start' | 'clear' };

/**
 * The API's link to the broker: the ingest worker publishes converted readings on internal
 * topics after each commit; the database stays the record, so QoS 0 is enough here.
 */
export class Bus extends EventEmitter {
  simState: SimFault[] = [];
  ingestHealth: IngestHealth | null = null;
  brokerHealth: BrokerHealth | null = null;
  private client: MqttClient;

  constructor(url: string, username: string, password: string, clientId = `ferrisight-api-${process.pid}`) {
    super();
    this.client = mqtt.connect(url, { username, password, clientId, protocolVersion: 4, clean: true, reconnectPeriod: 2000 });
    this.client.on('connect', () => {
      this.client.subscribe([`${INTERNAL_PREFIX}/+/latest`, `${INTERNAL_PREFIX}/sim/state`, `${INTERNAL_PREFIX}/ingest/health`, `${INTERNAL_PREFIX}/broker/health`], { qos: 0 });
      this.emit('status', true);
    });
    this.client.on('close', () => this.emit('status', false));
    this.client.on('error', (err) => logger.warn({ err: err.message }, 'bus error'));
    this.client.on('message', (topic, payload) => this.onMessage(topic, payload));
  }

  private onMessage(topic: string, payload: Buffer): void {
    try {
      const data = JSON.parse(payload.toString('utf8'));
      if (topic.endsWith('/latest')) this.emit('latest', data.readings as TankLive[]);
      else if (topic.endsWith('/sim/state')) this.simState = data.faults ?? [];
      else if (topic.endsWith('/ingest/health')) this.ingestHealth = data;
      else if (topic.endsWith('/broker/health')) this.brokerHealth = data;
    } catch (err) {
      logger.warn({ topic, err: (err as Error).message }, 'unreadable internal message');
    }
  }

  async simCommand(cmd: SimCommand): Promise<void> {
    await this.client.publishAsync(`${INTERNAL_PREFIX}/sim/command`, JSON.stringify(cmd), { qos: 1 });
  }

  async invalidateProbeCache(): Promise<void> {
    await this.client.publishAsync(`${INTERNAL_PREFIX}/cache/invalidate`, '{}', { qos: 1 });
  }

  get connected(): boolean {
    return this.client.connected;
  }

  async close(): Promise<void> {
    await this.client.endAsync();
  }
}
