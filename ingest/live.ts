import type { MqttClient } from 'mqtt';
import type { ConvertedReading, TankLive } from '../shared/schemas/readings.ts';
import { latestTopic, type LatestMessage } from '../shared/schemas/internal-topics.ts';
import { toIsoTs } from '../api/src/db/timestamps.ts';

/** Converted reading → the shape screens show. */
export function toTankLive(r: ConvertedReading): TankLive {
  return {
    tankId: r.tankId, probeId: r.probeId, probeTag: r.probeTag, ts: toIsoTs(r.tsMs),
    orpMv: r.orpMv, tempC: r.tempC, ehV: r.ehV, ratio: r.ratio, ferricFraction: r.ferricFraction,
    flag: r.flag, calibrationVersion: r.calibrationVersion,
  };
}

/**
 * After each commit, pushes the newest new reading per probe to latestTopic(site), QoS 0
 * (the database stays the record). A backfilled reading older than what was already pushed
 * for that probe is not "latest" and is left out.
 */
export class LivePublisher {
  private readonly lastTsMs = new Map<number, number>();

  constructor(private readonly client: MqttClient) {}

  publish(inserted: ConvertedReading[]): void {
    const newest = new Map<number, ConvertedReading>();
    for (const r of inserted) {
      const seen = newest.get(r.probeId);
      if ((!seen || r.tsMs > seen.tsMs) && r.tsMs > (this.lastTsMs.get(r.probeId) ?? -Infinity)) newest.set(r.probeId, r);
    }
    const bySite = new Map<string, TankLive[]>();
    for (const r of newest.values()) {
      this.lastTsMs.set(r.probeId, r.tsMs);
      const list = bySite.get(r.siteTag) ?? [];
      list.push(toTankLive(r));
      bySite.set(r.siteTag, list);
    }
    if (!this.client.connected) return;
    for (const [site, readings] of bySite) {
      const message: LatestMessage = { readings };
      this.client.publish(latestTopic(site), JSON.stringify(message), { qos: 0 });
    }
  }
}
