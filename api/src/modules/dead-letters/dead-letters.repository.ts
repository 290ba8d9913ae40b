import type { Readable } from 'node:stream';
import { QueryTypes } from 'sequelize';
import type { ConflictRow, DeadLetterFilters, DeadLetterKind, DeadLetterQuery, DeadLetterRow } from '../../../../shared/schemas/dead-letters.ts';
import { rawPool } from '../../db/database.ts';
import { Site } from '../../db/models.ts';
import type { PoolConnection } from '../../db/pool.ts';

const sqlTs = (iso: string) => new Date(iso).toISOString().replace('T', ' ').replace('Z', '');

/** WHERE clauses of one filter, for dead letters (d) or conflicts (c joined to probes p and sites s). */
function where(q: DeadLetterFilters, table: 'd' | 'c'): { sql: string; replacements: Record<string, string> } {
  const parts: string[] = [];
  const replacements: Record<string, string> = {};
  const add = (clause: string, key: string, value: string | undefined) => {
    if (value === undefined) return;
    parts.push(clause);
    replacements[key] = value;
  };
  if (table === 'd') {
    add('d.site_tag = :site', 'site', q.site);
    add('d.gateway = :gateway', 'gateway', q.gateway);
    add('d.probe_tag = :probe', 'probe', q.probe);
    add('d.reason_kind = :kind', 'kind', q.kind);
  } else {
    add('s.tag = :site', 'site', q.site);
    add('p.tag = :probe', 'probe', q.probe);
    // Conflicts are exact-instant disagreements: they have no gateway or reason kind.
    if (q.gateway !== undefined || q.kind !== undefined) parts.push('1 = 0');
  }
  add(`${table}.received_at >= :from`, 'from', q.from && sqlTs(q.from));
  add(`${table}.received_at < :to`, 'to', q.to && sqlTs(q.to));
  return { sql: parts.length ? `WHERE ${parts.join(' AND ')}` : '', replacements };
}

const CONFLICT_FROM = `FROM reading_conflicts c LEFT JOIN probes p ON p.id = c.probe_id LEFT JOIN tanks t ON t.id = p.tank_id
  LEFT JOIN circuits ci ON ci.id = t.circuit_id LEFT JOIN sites s ON s.id = ci.site_id`;

const iso = (d: Date) => new Date(d).toISOString();

export const deadLettersRepository = {
  async list(q: DeadLetterQuery): Promise<DeadLetterRow[]> {
    const w = where(q, 'd');
    const rows = await Site.sequelize!.query<{
      id: number; received_at: Date; topic: string; payload: string; payload_bytes: number; reason: string; reason_kind: DeadLetterKind;
      gateway: string | null; site_tag: string | null; probe_tag: string | null;
    }>(`SELECT id, received_at, topic, payload, payload_bytes, reason, reason_kind, gateway, site_tag, probe_tag
          FROM dead_letters d ${w.sql} ORDER BY received_at DESC, id DESC LIMIT ${q.limit}`, { replacements: w.replacements, type: QueryTypes.SELECT });
    return rows.map((r) => ({
      id: Number(r.id), receivedAt: iso(r.received_at), topic: r.topic, payload: r.payload, payloadBytes: r.payload_bytes, reason: r.reason,
      kind: r.reason_kind, gateway: r.gateway, siteTag: r.site_tag, probeTag: r.probe_tag,
    }));
  },

  async conflicts(q: DeadLetterQuery): Promise<ConflictRow[]> {
    const w = where(q, 'c');
    const rows = await Site.sequelize!.query<{
      id: number; received_at: Date; probe_tag: string | null; site_tag: string | null; ts: Date; stored_orp_mv: number; stored_temp_c: number;
      incoming_orp_mv: number; incoming_temp_c: number; incoming_seq: number | null; source: string;
    }>(`SELECT c.id, c.received_at, p.tag AS probe_tag, s.tag AS site_tag, c.ts, c.stored_orp_mv, c.stored_temp_c, c.incoming_orp_mv,
               c.incoming_temp_c, c.incoming_seq, c.source ${CONFLICT_FROM} ${w.sql} ORDER BY c.received_at DESC, c.id DESC LIMIT ${q.limit}`,
    { replacements: w.replacements, type: QueryTypes.SELECT });
    return rows.map((r) => ({
      id: Number(r.id), receivedAt: iso(r.received_at), probeTag: r.probe_tag, siteTag: r.site_tag, ts: iso(r.ts),
      storedOrpMv: r.stored_orp_mv, storedTempC: r.stored_temp_c, incomingOrpMv: r.incoming_orp_mv, incomingTempC: r.incoming_temp_c,
      incomingSeq: r.incoming_seq === null ? null : Number(r.incoming_seq), source: r.source,
    }));
  },

  /** Counts over the whole filter, from the tables themselves. */
  async counts(q: DeadLetterQuery): Promise<{ deadLetters: number; conflicts: number; byKind: Partial<Record<DeadLetterKind, number>> }> {
    const d = where(q, 'd');
    const c = where(q, 'c');
    const [kinds, [conf]] = await Promise.all([
      Site.sequelize!.query<{ reason_kind: DeadLetterKind; n: number }>(
        `SELECT reason_kind, COUNT(*) AS n FROM dead_letters d ${d.sql} GROUP BY reason_kind`, { replacements: d.replacements, type: QueryTypes.SELECT }),
      Site.sequelize!.query<{ n: number }>(`SELECT COUNT(*) AS n ${CONFLICT_FROM} ${c.sql}`, { replacements: c.replacements, type: QueryTypes.SELECT }),
    ]);
    const byKind: Partial<Record<DeadLetterKind, number>> = {};
    for (const k of kinds) byKind[k.reason_kind] = Number(k.n);
    return { deadLetters: Object.values(byKind).reduce((a, b) => a + b, 0), conflicts: Number(conf.n), byKind };
  },

  /**
   * Every dead letter (or conflict) of the filter, newest first, as arrays in the order of
   * DEAD_LETTER_EXPORT_COLUMNS (CONFLICT_EXPORT_COLUMNS), streamed on a dedicated connection the caller releases.
   */
  async openExport(q: DeadLetterFilters, table: 'dead-letters' | 'conflicts'): Promise<{ conn: PoolConnection; rows: Readable }> {
    const w = where(q, table === 'conflicts' ? 'c' : 'd');
    const sql = table === 'conflicts'
      ? `SELECT c.id, c.received_at, s.tag, p.tag, c.ts, c.stored_orp_mv, c.stored_temp_c, c.incoming_orp_mv, c.incoming_temp_c, c.incoming_seq, c.source
           ${CONFLICT_FROM} ${w.sql} ORDER BY c.received_at DESC, c.id DESC`
      : `SELECT id, received_at, gateway, site_tag, probe_tag, topic, reason_kind, reason, payload_bytes, payload
           FROM dead_letters d ${w.sql} ORDER BY received_at DESC, id DESC`;
    const conn = await rawPool(Site.sequelize!).getConnection();
    return { conn, rows: conn.queryStream({ sql, namedPlaceholders: true, rowsAsArray: true }, w.replacements) };
  },
};
