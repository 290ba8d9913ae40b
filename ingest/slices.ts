import type { MqttClient } from 'mqtt';
import type { Logger } from 'pino';
import { ALL_DEVICES_FILTER, batchTopic, readingTopic, siteTopicFilter } from '../shared/schemas/readings.ts';
import type { Pool } from '../api/src/db/pool.ts';
import { lookupsRepository } from '../api/src/modules/readings/lookups.repository.ts';

/**
 * Ingest slices: N workers share the device stream without processing a message twice.
 * aedes has no shared subscriptions (aedes#228), so each worker subscribes to a disjoint set
 * of topic filters, and each slice keeps its own clean: false session (client id per slice),
 * so a killed worker's slice waits at the broker until the worker is back (README "Scaling out").
 *   by 'site'  — ferrisight/v1/<site>/# for the sites whose tag hashes to this slice;
 *   by 'probe' — one big site: ferrisight/v1/<site>/<probe>/reading per probe whose tag hashes
 *                here, and ferrisight/v1/<site>/batch by the site's hash (a batch holds many probes).
 * With INGEST_SHARED_GROUP the broker balances instead ($share/<group>/<filter>, MQTT 5 brokers
 * such as mosquitto 2); the slice number then only names the worker's session.
 */
export type SliceBy = 'site' | 'probe';
export type SlicePlan = { index: number; count: number; by: SliceBy; sharedGroup?: string };
export type Tag = { siteTag: string; probeTag: string | null };

/** 'i/n' (1-based) → plan; undefined or '' → null (one worker takes everything). */
export function parseSlice(value: string | undefined, by: SliceBy = 'site', sharedGroup?: string): SlicePlan | null {
  if (!value) {
    if (sharedGroup) throw new Error('INGEST_SHARED_GROUP needs INGEST_SLICE=i/n too: it names each worker\'s persistent session');
    return null;
  }
  const m = /^(\d+)\/(\d+)$/.exec(value.trim());
  if (!m || Number(m[1]) < 1 || Number(m[1]) > Number(m[2])) throw new Error(`INGEST_SLICE=${value} must be i/n with 1 ≤ i ≤ n, e.g. 1/2`);
  return { index: Number(m[1]), count: Number(m[2]), by, sharedGroup: sharedGroup || undefined };
}

/** The stable MQTT client id of a slice: its persistent session belongs to the slice, not the process. */
export const sliceClientId = (base: string, plan: SlicePlan | null): string => (plan ? `${base}-slice-${plan.index}` : base);

/** 1-based slice of a tag: FNV-1a, stable across processes, Node versions and restarts. */
export function sliceOf(key: string, count: number): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < key.length; i += 1) h = Math.imul(h ^ key.charCodeAt(i), 0x01000193) >>> 0;
  return (h % count) + 1;
}

/**
 * This slice's filters, and every other filter the plan could have given it: unsubscribing
 * those on each sync also clears what an earlier plan (another N) left in the same session.
 */
export function sliceFilters(plan: SlicePlan, tags: Tag[], baseFilter = ALL_DEVICES_FILTER): { mine: string[]; others: string[] } {
  if (plan.sharedGroup) return { mine: [`$share/${plan.sharedGroup}/${baseFilter}`], others: [] };
  const mine = new Set<string>();
  // Every filter either mode could have subscribed: switching mode or N leaves nothing behind.
  const others = new Set<string>([baseFilter]);
  for (const { siteTag, probeTag } of tags) {
    const site = sliceOf(siteTag, plan.count);
    const siteAll = siteTopicFilter(siteTag);
    const batch = batchTopic(siteTag);
    const reading = probeTag ? readingTopic(siteTag, probeTag) : null;
    [siteAll, batch, reading].forEach((f) => f && others.add(f));
    if (plan.by === 'site' && site === plan.index) mine.add(siteAll);
    if (plan.by === 'probe' && site === plan.index) mine.add(batch);
    if (plan.by === 'probe' && reading && sliceOf(probeTag!, plan.count) === plan.index) mine.add(reading);
  }
  for (const f of mine) others.delete(f);
  return { mine: [...mine].sort(), others: [...others].sort() };
}

/** Every site with its probes, for building the topic filters. */
export const loadTags = (pool: Pool): Promise<Tag[]> => lookupsRepository.topicTags(pool);

/**
 * Keeps one slice's subscriptions in step with the plant: on every (re)connect and whenever
 * sync() is called (the worker's probe-cache refresh). A site or probe added later is picked
 * up at the next sync (≤ the refresh period, at once when the API announces the change).
 */
export class SliceSubscriptions {
  private current = '';
  private syncing: Promise<void> | null = null;
  private markSynced: () => void = () => undefined;
  /** Resolves once the slice's filters are in place for the first time. */
  readonly firstSync = new Promise<void>((resolve) => { this.markSynced = resolve; });

  constructor(
    private readonly client: MqttClient,
    private readonly plan: SlicePlan,
    private readonly tags: () => Promise<Tag[]>,
    private readonly log: Logger,
    private readonly baseFilter = ALL_DEVICES_FILTER,
  ) {
    // A fresh connection may carry an older plan's session: always resend the full set.
    client.on('connect', () => {
      this.current = '';
      void this.sync();
    });
  }

  /** Subscribes before it unsubscribes, so a filter moving between plans is never uncovered. */
  sync(): Promise<void> {
    this.syncing ??= (async () => {
      try {
        const { mine, others } = sliceFilters(this.plan, await this.tags(), this.baseFilter);
        const key = mine.join('\n');
        if (!this.client.connected) return;
        if (key === this.current) return this.markSynced();
        if (mine.length) await this.client.subscribeAsync(Object.fromEntries(mine.map((f) => [f, { qos: 1 as const }])));
        if (others.length) await this.client.unsubscribeAsync(others);
        this.current = key;
        this.markSynced();
        this.log.info({ slice: `${this.plan.index}/${this.plan.count}`, by: this.plan.by, filters: mine.length }, 'slice subscriptions in place');
      } catch (err) {
        this.log.warn({ err: (err as Error).message }, 'slice subscription sync failed; retrying at the next refresh');
      } finally {
        this.syncing = null;
      }
    })();
    return this.syncing;
  }
}
