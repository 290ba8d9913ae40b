import { QueryTypes } from 'sequelize';
import type {
  SparkplugEvent, SparkplugGroup, SparkplugGroupCreate, SparkplugMapping, SparkplugMappingCreate,
} from '../../../../shared/schemas/sparkplug.ts';
import { Site } from '../../db/models.ts';
import { MAPPINGS_SQL } from './sparkplug-host.repository.ts';

const db = () => Site.sequelize!;

/** Plant setup's side of the Sparkplug mapping (the ingest host reads it through sparkplug-host.repository.ts). */
export const sparkplugRepository = {
  async groups(): Promise<SparkplugGroup[]> {
    return db().query<SparkplugGroup>(
      `SELECT g.id, g.site_id AS siteId, s.tag AS siteTag, g.group_id AS groupId
         FROM sparkplug_groups g JOIN sites s ON s.id = g.site_id ORDER BY g.group_id`,
      { type: QueryTypes.SELECT },
    );
  },

  async mappings(): Promise<SparkplugMapping[]> {
    return db().query<SparkplugMapping>(
      `${MAPPINGS_SQL} ORDER BY g.group_id, m.edge_node_id, m.device_id, m.metric_name`,
      { type: QueryTypes.SELECT },
    );
  },

  async events(limit: number): Promise<SparkplugEvent[]> {
    const rows = await db().query<Omit<SparkplugEvent, 'at'> & { at: Date }>(
      `SELECT id, at, group_id AS groupId, edge_node_id AS edgeNodeId, device_id AS deviceId, kind, detail
         FROM sparkplug_events ORDER BY id DESC LIMIT :limit`,
      { type: QueryTypes.SELECT, replacements: { limit } },
    );
    return rows.map((r) => ({ ...r, id: Number(r.id), at: r.at.toISOString() }));
  },

  async siteExists(siteId: number): Promise<boolean> {
    return (await Site.count({ where: { id: siteId } })) > 0;
  },

  async groupByName(groupId: string): Promise<{ id: number; siteId: number } | null> {
    const [row] = await db().query<{ id: number; siteId: number }>(
      'SELECT id, site_id AS siteId FROM sparkplug_groups WHERE group_id = :groupId', { type: QueryTypes.SELECT, replacements: { groupId } },
    );
    return row ?? null;
  },

  async siteOfProbe(probeId: number): Promise<number | null> {
    const [row] = await db().query<{ siteId: number }>(
      `SELECT c.site_id AS siteId FROM probes p JOIN tanks t ON t.id = p.tank_id JOIN circuits c ON c.id = t.circuit_id WHERE p.id = :probeId`,
      { type: QueryTypes.SELECT, replacements: { probeId } },
    );
    return row?.siteId ?? null;
  },

  async createGroup(g: SparkplugGroupCreate): Promise<number> {
    const [id] = await db().query('INSERT INTO sparkplug_groups (site_id, group_id) VALUES (:siteId, :groupId)', { type: QueryTypes.INSERT, replacements: g });
    return Number(id);
  },

  async deleteGroup(id: number): Promise<boolean> {
    const affected = await db().query('DELETE FROM sparkplug_groups WHERE id = :id', { type: QueryTypes.BULKDELETE, replacements: { id } });
    return Number(affected) === 1;
  },

  /** null when the metric or the probe's role is already mapped. */
  async createMapping(groupRef: number, m: SparkplugMappingCreate): Promise<number | null> {
    const [dup] = await db().query<{ n: number }>(
      `SELECT COUNT(*) AS n FROM sparkplug_metrics
        WHERE (group_ref = :groupRef AND edge_node_id = :edgeNodeId AND device_id = :deviceId AND metric_name = :metricName)
           OR (probe_id = :probeId AND role = :role)`,
      { type: QueryTypes.SELECT, replacements: { groupRef, ...m } },
    );
    if (Number(dup!.n) > 0) return null;
    const [id] = await db().query(
      `INSERT INTO sparkplug_metrics (group_ref, edge_node_id, device_id, metric_name, role, probe_id)
       VALUES (:groupRef, :edgeNodeId, :deviceId, :metricName, :role, :probeId)`,
      { type: QueryTypes.INSERT, replacements: { groupRef, ...m } },
    );
    return Number(id);
  },

  async deleteMapping(id: number): Promise<boolean> {
    const affected = await db().query('DELETE FROM sparkplug_metrics WHERE id = :id', { type: QueryTypes.BULKDELETE, replacements: { id } });
    return Number(affected) === 1;
  },
};
