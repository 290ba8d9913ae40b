import type { SparkplugMapping } from '../../../../shared/schemas/sparkplug.ts';
import { placeholders, type Pool } from '../../db/pool.ts';
import { toSqlTs } from '../../db/timestamps.ts';

/** What the ingest worker's Sparkplug host reads and writes (raw pool, like the rest of the hot path). */
export type HostEventRow = { atMs: number; groupId: string; edgeNodeId: string; deviceId: string; kind: string; detail: string };

/** Every mapped metric with its group, probe and site (Plant setup lists the same rows). */
export const MAPPINGS_SQL = `
  SELECT m.id, g.group_id AS groupId, m.edge_node_id AS edgeNodeId, m.device_id AS deviceId, m.metric_name AS metricName,
         m.role, m.probe_id AS probeId, p.tag AS probeTag, s.tag AS siteTag
    FROM sparkplug_metrics m
    JOIN sparkplug_groups g ON g.id = m.group_ref
    JOIN probes p ON p.id = m.probe_id
    JOIN tanks t ON t.id = p.tank_id
    JOIN circuits c ON c.id = t.circuit_id
    JOIN sites s ON s.id = c.site_id`;

export const sparkplugHostRepository = {
  async load(pool: Pool): Promise<{ groups: string[]; mappings: SparkplugMapping[] }> {
    const groups = (await pool.query('SELECT group_id FROM sparkplug_groups ORDER BY group_id')) as { group_id: string }[];
    const mappings = (await pool.query(MAPPINGS_SQL)) as SparkplugMapping[];
    return { groups: groups.map((g) => g.group_id), mappings: mappings.map((m) => ({ ...m, id: Number(m.id), probeId: Number(m.probeId) })) };
  },

  async insertEvents(pool: Pool, events: HostEventRow[]): Promise<void> {
    if (events.length === 0) return;
    const params = events.flatMap((e) => [toSqlTs(e.atMs), e.groupId, e.edgeNodeId, e.deviceId, e.kind, e.detail.slice(0, 500)]);
    await pool.query(`INSERT INTO sparkplug_events (at, group_id, edge_node_id, device_id, kind, detail) VALUES ${placeholders(events.length, 6)}`, params);
  },
};
