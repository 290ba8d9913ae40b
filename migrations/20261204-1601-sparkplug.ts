import type { QueryInterface } from 'sequelize';

/**
 * Sparkplug B edge nodes (README "Sparkplug B edge nodes"):
 * - sparkplug_groups: which Sparkplug group ids belong to which site (the host subscribes
 *   spBv1.0/<group>/#, and a site's device accounts may publish only in its groups);
 * - sparkplug_metrics: edge node, device ('' for the node itself) and metric name → probe, and
 *   whether the metric is the probe's ORP (mV) or its temperature (°C); aliases come from births;
 * - sparkplug_events: what the host did or saw that an engineer may ask about (rebirth
 *   requests and why, births, deaths).
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query(`CREATE TABLE sparkplug_groups (
    id INT AUTO_INCREMENT PRIMARY KEY,
    site_id INT NOT NULL,
    group_id VARCHAR(64) NOT NULL,
    created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    UNIQUE KEY sparkplug_groups_group (group_id),
    CONSTRAINT sparkplug_groups_site FOREIGN KEY (site_id) REFERENCES sites (id)
  ) ENGINE=InnoDB`);
  await qi.sequelize.query(`CREATE TABLE sparkplug_metrics (
    id INT AUTO_INCREMENT PRIMARY KEY,
    group_ref INT NOT NULL,
    edge_node_id VARCHAR(64) NOT NULL,
    device_id VARCHAR(64) NOT NULL DEFAULT '',
    metric_name VARCHAR(190) NOT NULL,
    role ENUM('orp', 'temp') NOT NULL,
    probe_id INT NOT NULL,
    created_at DATETIME(3) NOT NULL DEFAULT CURRENT_TIMESTAMP(3),
    UNIQUE KEY sparkplug_metrics_metric (group_ref, edge_node_id, device_id, metric_name),
    UNIQUE KEY sparkplug_metrics_probe_role (probe_id, role),
    CONSTRAINT sparkplug_metrics_group FOREIGN KEY (group_ref) REFERENCES sparkplug_groups (id) ON DELETE CASCADE,
    CONSTRAINT sparkplug_metrics_probe FOREIGN KEY (probe_id) REFERENCES probes (id) ON DELETE CASCADE
  ) ENGINE=InnoDB`);
  await qi.sequelize.query(`CREATE TABLE sparkplug_events (
    id BIGINT AUTO_INCREMENT PRIMARY KEY,
    at DATETIME(3) NOT NULL,
    group_id VARCHAR(64) NOT NULL,
    edge_node_id VARCHAR(64) NOT NULL,
    device_id VARCHAR(64) NOT NULL DEFAULT '',
    kind ENUM('birth', 'death', 'rebirth-requested', 'ignored') NOT NULL,
    detail VARCHAR(500) NOT NULL,
    KEY sparkplug_events_at (at)
  ) ENGINE=InnoDB`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const t of ['sparkplug_events', 'sparkplug_metrics', 'sparkplug_groups']) await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
}
