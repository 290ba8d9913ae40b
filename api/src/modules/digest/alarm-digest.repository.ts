import { QueryTypes } from 'sequelize';
import { ackTimes } from '../../../../shared/digest/ack-times.ts';
import type { AlarmFigures, AlarmSpan } from '../../../../shared/schemas/digest.ts';
import { Site } from '../../db/models.ts';
import { logger } from '../../lib/logger.ts';
import { toSqlTs } from '../../db/timestamps.ts';

const EMPTY: AlarmFigures = {
  available: false, raised: 0, acknowledged: 0, shelved: 0, escalationsSent: 0, waiting: 0, ackMeanS: null, ackMaxS: null, timeline: [],
};
const TIMELINE_MAX = 500;
const SITE_TANKS = 'SELECT t2.id FROM tanks t2 JOIN circuits c2 ON c2.id = t2.circuit_id WHERE c2.site_id = :siteId';

const db = () => Site.sequelize!;
const select = <T extends object>(sql: string, r: Record<string, unknown>) => db().query<T>(sql, { replacements: r, type: QueryTypes.SELECT });
const iso = (d: Date | null) => (d ? new Date(d).toISOString() : null);

/**
 * Alarm figures from the Alarm desk's tables (alarm_events is the record). "Raised" counts
 * annunciations, as the Alarm desk's own rate figures do; time to acknowledge runs from an
 * annunciation in the range to the first acknowledgement after it, even if that came later.
 * Escalations sent are roster e-mails actually handed to the mail relay (mail_outbox).
 */
export const alarmDigestRepository = {
  async figures(tables: Set<string>, siteId: number, fromMs: number, toMs: number): Promise<AlarmFigures> {
    if (!tables.has('alarm_instances') || !tables.has('alarm_events')) return EMPTY;
    const r = { siteId, from: toSqlTs(fromMs), to: toSqlTs(toMs), limit: TIMELINE_MAX };
    try {
      const [raised, counts, timeline, escalations] = await Promise.all([
        select<{ at: Date; ackedAt: Date | null }>(
          `SELECT e.at, (SELECT MIN(a.at) FROM alarm_events a WHERE a.instance_id = e.instance_id AND a.kind = 'acknowledged' AND a.id > e.id) AS ackedAt
             FROM alarm_events e WHERE e.tank_id IN (${SITE_TANKS}) AND e.kind = 'activated' AND e.to_state = 'unacknowledged'
              AND e.at >= :from AND e.at < :to`, r),
        select<{ kind: string; n: number }>(
          `SELECT e.kind, COUNT(*) AS n FROM alarm_events e
            WHERE e.tank_id IN (${SITE_TANKS}) AND e.kind IN ('acknowledged', 'shelved', 'escalated') AND e.at >= :from AND e.at < :to GROUP BY e.kind`, r),
        select<{ id: number; tankId: number; tankTag: string; priority: number; kind: string | null; raisedAt: Date; ackedAt: Date | null; closedAt: Date | null; shelvedAt: Date | null }>(
          `SELECT i.id, i.tank_id AS tankId, t.tag AS tankTag, i.priority, d.kind, COALESCE(i.activated_at, i.opened_at) AS raisedAt, i.closed_at AS closedAt,
                  (SELECT MIN(a.at) FROM alarm_events a WHERE a.instance_id = i.id AND a.kind = 'acknowledged') AS ackedAt,
                  (SELECT MIN(a.at) FROM alarm_events a WHERE a.instance_id = i.id AND a.kind = 'shelved') AS shelvedAt
             FROM alarm_instances i JOIN tanks t ON t.id = i.tank_id LEFT JOIN alarm_definitions d ON d.id = i.definition_id
            WHERE i.tank_id IN (${SITE_TANKS}) AND COALESCE(i.activated_at, i.opened_at) < :to AND (i.closed_at IS NULL OR i.closed_at >= :from)
            ORDER BY raisedAt LIMIT :limit`, r),
        tables.has('mail_outbox')
          ? select<{ n: number }>(
            `SELECT COUNT(*) AS n FROM mail_outbox m JOIN alarm_instances i ON i.id = m.instance_id
              WHERE i.tank_id IN (${SITE_TANKS}) AND m.status = 'sent' AND m.sent_at >= :from AND m.sent_at < :to`, r)
          : Promise.resolve(null),
      ]);
      const count = (kind: string) => Number(counts.find((c) => c.kind === kind)?.n ?? 0);
      const ack = ackTimes(raised.map((x) => ({ atMs: new Date(x.at).getTime(), ackedAtMs: x.ackedAt ? new Date(x.ackedAt).getTime() : null })));
      return {
        available: true, raised: raised.length, acknowledged: count('acknowledged'), shelved: count('shelved'),
        escalationsSent: escalations ? Number(escalations[0]?.n ?? 0) : count('escalated'),
        waiting: ack.waiting, ackMeanS: ack.meanS, ackMaxS: ack.maxS,
        timeline: timeline.map((x): AlarmSpan => ({
          id: Number(x.id), tankId: x.tankId, tankTag: x.tankTag, priority: x.priority, kind: x.kind,
          raisedAt: iso(x.raisedAt)!, acknowledgedAt: iso(x.ackedAt), clearedAt: iso(x.closedAt), shelvedAt: iso(x.shelvedAt),
        })),
      };
    } catch (err) {
      logger.warn({ err: (err as Error).message }, 'digest alarm figures unavailable');
      return EMPTY;
    }
  },
};
