import type { ReferenceTablePoint } from '../../../../shared/redox/index.ts';
import { fromSqlTs, type Pool } from '../../db/pool.ts';

/**
 * What the readings path looks up about the plant on the raw pool (the ingest worker, the broker
 * and the historical import share it): probes with their latest calibration, site tags, every
 * calibration over time, topic tags for the worker's slices, and device credentials.
 */
export type ProbeRow = {
  probe_id: number; probe_tag: string; tank_id: number; site_tag: string; reference_id: string;
  reference_e25_v: number; reference_coeff_v_per_k: number;
  version: number | null; formal_potential_v: number | null; formal_coeff_v_per_k: number | null;
  slope_efficiency?: number | null; reference_table?: string | ReferenceTablePoint[] | null; suspect?: number | null;
};

const PROBES_SQL = `
  SELECT p.id AS probe_id, p.tag AS probe_tag, p.tank_id, s.tag AS site_tag, p.reference_id,
         p.reference_e25_v, p.reference_coeff_v_per_k, p.reference_table, c.version, c.formal_potential_v,
         c.formal_coeff_v_per_k, c.slope_efficiency,
         (SELECT pc.pass = 0 AND NOT EXISTS (SELECT 1 FROM probe_replacements pr WHERE pr.probe_id = p.id AND pr.replaced_at >= pc.checked_at)
            FROM probe_checks pc WHERE pc.probe_id = p.id ORDER BY pc.checked_at DESC, pc.id DESC LIMIT 1) AS suspect
    FROM probes p
    JOIN tanks t ON t.id = p.tank_id
    JOIN circuits ci ON ci.id = t.circuit_id
    JOIN sites s ON s.id = ci.site_id
    LEFT JOIN calibrations c ON c.tank_id = t.id
     AND c.version = (SELECT MAX(c2.version) FROM calibrations c2 WHERE c2.tank_id = t.id)
   WHERE p.retired_at IS NULL`;

const TAGS_SQL = `
  SELECT s.tag AS site_tag, p.tag AS probe_tag
    FROM sites s
    LEFT JOIN circuits ci ON ci.site_id = s.id
    LEFT JOIN tanks t ON t.circuit_id = ci.id
    LEFT JOIN probes p ON p.tank_id = t.id`;

export type CalibrationRow = {
  tankId: number; version: number; formalPotentialV: number; formalCoeffVPerK: number; slopeEfficiency?: number; validFromMs: number;
};
/** sparkplug_groups: the site's Sparkplug group ids joined by '/' (never part of a group id), or null. */
export type DeviceRow = { username: string; password_hash: string; enabled: number; site_tag: string; sparkplug_groups: string | null };

export const lookupsRepository = {
  /** Every probe with its tank, site, reference electrode and the tank's highest calibration version. */
  probes: (pool: Pool): Promise<ProbeRow[]> => pool.query(PROBES_SQL),

  async siteTags(pool: Pool): Promise<string[]> {
    const rows: { tag: string }[] = await pool.query('SELECT tag FROM sites WHERE retired_at IS NULL');
    return rows.map((r) => r.tag);
  },

  /** Every calibration of every tank (valid_from read as the pool's date text). */
  async calibrations(pool: Pool): Promise<CalibrationRow[]> {
    const rows: { tank_id: number; version: number; formal_potential_v: number; formal_coeff_v_per_k: number; slope_efficiency: number; valid_from: string }[] =
      await pool.query('SELECT tank_id, version, formal_potential_v, formal_coeff_v_per_k, slope_efficiency, valid_from FROM calibrations');
    return rows.map((r) => ({
      tankId: r.tank_id, version: r.version, formalPotentialV: r.formal_potential_v,
      formalCoeffVPerK: r.formal_coeff_v_per_k ?? 0, slopeEfficiency: r.slope_efficiency ?? 1, validFromMs: fromSqlTs(r.valid_from),
    }));
  },

  /** Each site with each of its probes (a site without probes once, with a null probe). */
  async topicTags(pool: Pool): Promise<{ siteTag: string; probeTag: string | null }[]> {
    const rows: { site_tag: string; probe_tag: string | null }[] = await pool.query(TAGS_SQL);
    return rows.map((r) => ({ siteTag: r.site_tag, probeTag: r.probe_tag }));
  },

  /** A device's stored credentials, site and its site's Sparkplug groups, or null when the username is unknown or retired. */
  async device(pool: Pool, username: string): Promise<DeviceRow | null> {
    const rows: DeviceRow[] = await pool.query(
      `SELECT d.username, d.password_hash, d.enabled, s.tag AS site_tag,
              (SELECT GROUP_CONCAT(g.group_id SEPARATOR '/') FROM sparkplug_groups g WHERE g.site_id = d.site_id) AS sparkplug_groups
         FROM devices d JOIN sites s ON s.id = d.site_id WHERE d.username = ? AND d.retired_at IS NULL`, [username]);
    // The column's collation ignores case and trailing spaces; a login must match exactly.
    return rows.find((r) => r.username === username) ?? null;
  },
};
