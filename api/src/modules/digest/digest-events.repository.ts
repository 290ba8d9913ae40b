import { QueryTypes } from 'sequelize';
import type { EffectiveBandChange } from '../../../../shared/digest/band-spans.ts';
import type { DigestEvent, Section } from '../../../../shared/schemas/digest.ts';
import { wallTimeOf } from '../../../../shared/time/site-time.ts';
import { Site } from '../../db/models.ts';
import { logger } from '../../lib/logger.ts';
import { toSqlTs } from '../../db/timestamps.ts';

type Range = { siteId: number; from: string; to: string; timeZone: string };
type EventRow = { at: Date; tankId: number | null; tankTag: string | null; by: string | null } & Record<string, unknown>;

const db = () => Site.sequelize!;
const fmt = (v: number, digits: number) => (Number.isFinite(v) ? v.toFixed(digits) : '—');
/** 'YYYY-MM-DD HH:MM' on the site clock, for times quoted inside a summary sentence. */
function siteTime(d: Date, timeZone: string): string {
  const w = wallTimeOf(new Date(d).getTime(), timeZone);
  const p = (n: number) => String(n).padStart(2, '0');
  return `${w.year}-${p(w.month)}-${p(w.day)} ${p(w.hour)}:${p(w.minute)}`;
}

/** Tables that exist now: bands, assays, probe checks and alarms belong to other components and may still be missing. */
export async function existingTables(): Promise<Set<string>> {
  const rows = await db().query<{ t: string }>('SELECT table_name AS t FROM information_schema.tables WHERE table_schema = DATABASE()', { type: QueryTypes.SELECT });
  return new Set(rows.map((r) => r.t));
}

/**
 * Runs a section's query only when its tables exist, and turns a schema mismatch (another
 * component renamed a column) into "not available" plus a warning instead of a failed digest.
 */
async function section(tables: Set<string>, needs: string[], name: string, sql: string, r: Range, summary: (row: EventRow) => string): Promise<Section<DigestEvent>> {
  if (!needs.every((t) => tables.has(t))) return { available: false, items: [] };
  try {
    const rows = await db().query<EventRow>(sql, { replacements: r, type: QueryTypes.SELECT });
    return { available: true, items: rows.map((row) => ({ at: row.at.toISOString(), tankId: row.tankId, tankTag: row.tankTag, by: row.by, summary: summary(row) })) };
  } catch (err) {
    logger.warn({ err: (err as Error).message, section: name }, 'digest section unavailable');
    return { available: false, items: [] };
  }
}

const SITE_TANKS = 'SELECT t2.id FROM tanks t2 JOIN circuits c2 ON c2.id = t2.circuit_id WHERE c2.site_id = :siteId';

export const digestEventsRepository = {
  range: (siteId: number, timeZone: string, fromMs: number, toMs: number): Range => ({ siteId, timeZone, from: toSqlTs(fromMs), to: toSqlTs(toMs) }),

  calibrations: (tables: Set<string>, r: Range) => section(tables, ['calibrations'], 'calibrations',
    `SELECT c.created_at AS at, c.tank_id AS tankId, t.tag AS tankTag, u.name AS \`by\`, c.version, c.formal_potential_v AS e0, c.valid_from AS validFrom, c.reason
       FROM calibrations c JOIN tanks t ON t.id = c.tank_id LEFT JOIN users u ON u.id = c.created_by
      WHERE c.tank_id IN (${SITE_TANKS}) AND ((c.created_at >= :from AND c.created_at < :to) OR (c.valid_from >= :from AND c.valid_from < :to))
      ORDER BY c.created_at`, r,
    (x) => `Version ${x.version}: formal potential ${fmt(Number(x.e0), 3)} V, valid from ${siteTime(x.validFrom as Date, r.timeZone)} — ${x.reason}`),

  assays: (tables: Set<string>, r: Range) => section(tables, ['assays'], 'assays',
    `SELECT a.sampled_at AS at, a.tank_id AS tankId, t.tag AS tankTag, u.name AS \`by\`, a.fe2_g_per_l AS fe2, a.fe_total_g_per_l AS feT, a.method
       FROM assays a JOIN tanks t ON t.id = a.tank_id LEFT JOIN users u ON u.id = a.created_by
      WHERE a.tank_id IN (${SITE_TANKS}) AND a.sampled_at >= :from AND a.sampled_at < :to AND a.retracted_at IS NULL ORDER BY a.sampled_at`, r,
    (x) => {
      const fe2 = Number(x.fe2);
      const feT = Number(x.feT);
      const ratio = fe2 > 0 ? (feT - fe2) / fe2 : NaN;
      return `Fe²⁺ ${fmt(fe2, 2)} g/L, Fe total ${fmt(feT, 2)} g/L, ratio ${fmt(ratio, 2)}${x.method ? ` (${x.method})` : ''}`;
    }),

  probeChecks: (tables: Set<string>, r: Range) => section(tables, ['probe_checks'], 'probe checks',
    `SELECT pc.checked_at AS at, p.tank_id AS tankId, t.tag AS tankTag, u.name AS \`by\`, p.tag AS probeTag, pc.standard,
            pc.reading_mv AS readingMv, pc.expected_mv AS expectedMv, pc.error_mv AS errorMv, pc.pass
       FROM probe_checks pc JOIN probes p ON p.id = pc.probe_id JOIN tanks t ON t.id = p.tank_id LEFT JOIN users u ON u.id = pc.checked_by
      WHERE p.tank_id IN (${SITE_TANKS}) AND pc.checked_at >= :from AND pc.checked_at < :to ORDER BY pc.checked_at`, r,
    (x) => `${x.probeTag} in ${x.standard} standard: read ${fmt(Number(x.readingMv), 0)} mV, expected ${fmt(Number(x.expectedMv), 0)} mV, error ${fmt(Number(x.errorMv), 1)} mV — ${x.pass ? 'pass' : 'FAIL'}`),

  /** Requests and decisions made in the range, whatever their outcome. */
  bandChanges: (tables: Set<string>, r: Range) => section(tables, ['band_changes', 'band_change_decisions'], 'band changes',
    `SELECT COALESCE(d.decided_at, b.requested_at) AS at, b.tank_id AS tankId, t.tag AS tankTag, COALESCE(du.name, u.name) AS \`by\`,
            b.old_low AS oldLow, b.old_high AS oldHigh, b.new_low AS newLow, b.new_high AS newHigh, b.reason, b.needs_approval AS needsApproval, d.decision
       FROM band_changes b JOIN tanks t ON t.id = b.tank_id JOIN users u ON u.id = b.requested_by
       LEFT JOIN band_change_decisions d ON d.change_id = b.id LEFT JOIN users du ON du.id = d.decided_by
      WHERE b.tank_id IN (${SITE_TANKS}) AND ((b.requested_at >= :from AND b.requested_at < :to) OR (d.decided_at >= :from AND d.decided_at < :to))
      ORDER BY at`, r,
    (x) => `${x.oldLow}–${x.oldHigh} → ${x.newLow}–${x.newHigh} · ${x.decision ?? (x.needsApproval ? 'pending approval' : 'applied')} — ${x.reason}`),

  /** Changes that took effect (applied at once, or approved), per tank, for the band in force. */
  async effectiveBandChanges(tables: Set<string>, tankIds: number[]): Promise<Map<number, EffectiveBandChange[]>> {
    const out = new Map<number, EffectiveBandChange[]>();
    if (!tables.has('band_changes') || !tables.has('band_change_decisions') || tankIds.length === 0) return out;
    try {
      const rows = await db().query<{ tankId: number; eff: Date; oldLow: number; oldHigh: number; newLow: number; newHigh: number }>(
        `SELECT b.tank_id AS tankId, IF(b.needs_approval = 0, b.requested_at, d.decided_at) AS eff,
                b.old_low AS oldLow, b.old_high AS oldHigh, b.new_low AS newLow, b.new_high AS newHigh
           FROM band_changes b LEFT JOIN band_change_decisions d ON d.change_id = b.id
          WHERE b.tank_id IN (:tankIds) AND (b.needs_approval = 0 OR d.decision = 'approved')`,
        { replacements: { tankIds }, type: QueryTypes.SELECT });
      for (const x of rows) {
        const list = out.get(x.tankId) ?? [];
        list.push({ effectiveMs: new Date(x.eff).getTime(), old: { low: x.oldLow, high: x.oldHigh }, next: { low: x.newLow, high: x.newHigh } });
        out.set(x.tankId, list);
      }
    } catch (err) {
      logger.warn({ err: (err as Error).message }, 'band history unavailable, current bands used');
    }
    return out;
  },
};
