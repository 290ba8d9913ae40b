import { QueryTypes, type Sequelize } from 'sequelize';
import type { Activation, Annunciation, OpenAlarm } from '../../../../shared/alarms/figures.ts';
import { KIND_INFO, type AlarmKind, type Priority } from '../../../../shared/alarms/kinds.ts';
import type { ActiveQuery, AlarmEventView, AlarmView, HistoryQuery } from '../../../../shared/schemas/alarms.ts';
import { Site } from '../../db/models.ts';
import { toAlarmView, toEventView, type EventRow, type InstanceRow } from './views.ts';

/** Read side of alarms for the API (the write side is lifecycle.repository.ts). Raw SQL, plain objects out. */

/** An alarm instance with its definition, tank, circuit and site (rows: InstanceRow); a plant-wide alarm has none. */
export const INSTANCE_SELECT = `SELECT i.*, d.kind, d.cause, d.consequence, d.action, d.response_min,
    t.tag AS tank_tag, t.name AS tank_name, c.id AS circuit_id, c.tag AS circuit_tag, s.tag AS site_tag
  FROM alarm_instances i
  JOIN alarm_definitions d ON d.id = i.definition_id
  LEFT JOIN tanks t ON t.id = i.tank_id
  LEFT JOIN circuits c ON c.id = t.circuit_id
  LEFT JOIN sites s ON s.id = c.site_id`;

/** An alarm event with its alarm's kind, priority, tank and site (rows: EventRow). */
export const EVENT_SELECT = `SELECT e.*, d.kind AS alarm_kind, i.priority, t.tag AS tank_tag, s.tag AS site_tag
  FROM alarm_events e
  JOIN alarm_instances i ON i.id = e.instance_id
  JOIN alarm_definitions d ON d.id = e.definition_id
  LEFT JOIN tanks t ON t.id = e.tank_id
  LEFT JOIN circuits c ON c.id = t.circuit_id
  LEFT JOIN sites s ON s.id = c.site_id`;

const db = (): Sequelize => Site.sequelize!;
const select = <T extends object>(sql: string, replacements: Record<string, unknown> | unknown[] = {}) =>
  db().query<T>(sql, { replacements, type: QueryTypes.SELECT });

function filters(q: { site?: string; circuit?: number; tank?: number; priority?: number; state?: string }) {
  const where: string[] = [];
  // A plant-wide alarm concerns every site.
  if (q.site) where.push('(s.tag = :site OR i.tank_id IS NULL)');
  if (q.circuit) where.push('c.id = :circuit');
  if (q.tank) where.push('t.id = :tank');
  if (q.priority) where.push('i.priority = :priority');
  if (q.state) where.push('i.state = :state');
  return where;
}

const label = (tankTag: string, kind: AlarmKind) => `${tankTag} · ${KIND_INFO[kind].label}`;

export const alarmsRepository = {
  /** Every site's tag (the live feed's rooms). */
  async siteTags(): Promise<string[]> {
    return (await select<{ tag: string }>('SELECT tag FROM sites')).map((r) => r.tag);
  },

  async lastEventId(): Promise<number> {
    const [row] = await select<{ id: number | null }>('SELECT MAX(id) AS id FROM alarm_events');
    return row?.id ?? 0;
  },

  /** Open alarms, highest priority first, newest first within a priority. */
  async active(q: ActiveQuery): Promise<AlarmView[]> {
    const where = ['i.open_definition_id IS NOT NULL', ...filters(q)];
    const rows = await select<InstanceRow>(`${INSTANCE_SELECT} WHERE ${where.join(' AND ')}
      ORDER BY i.priority ASC, COALESCE(i.activated_at, i.opened_at) DESC, i.id DESC`, q);
    return rows.map(toAlarmView);
  },

  async instance(id: number): Promise<AlarmView | null> {
    const [row] = await select<InstanceRow>(`${INSTANCE_SELECT} WHERE i.id = :id`, { id });
    return row ? toAlarmView(row) : null;
  },

  async timeline(instanceId: number): Promise<AlarmEventView[]> {
    return (await select<EventRow>(`${EVENT_SELECT} WHERE e.instance_id = :instanceId ORDER BY e.id`, { instanceId })).map(toEventView);
  },

  async eventsAfter(after: number, limit: number): Promise<AlarmEventView[]> {
    return (await select<EventRow>(`${EVENT_SELECT} WHERE e.id > :after ORDER BY e.id LIMIT :limit`, { after, limit })).map(toEventView);
  },

  /** Open instances of a tank that are waiting for acknowledgement. */
  async unacknowledgedOfTank(tankId: number): Promise<number[]> {
    const rows = await select<{ id: number }>(
      "SELECT id FROM alarm_instances WHERE tank_id = :tankId AND open_definition_id IS NOT NULL AND state IN ('unacknowledged', 'rtn-unacknowledged') ORDER BY id",
      { tankId });
    return rows.map((r) => r.id);
  },

  async countsByPriorityAndState(): Promise<Array<{ priority: Priority; state: string; n: number }>> {
    return select('SELECT priority, state, COUNT(*) AS n FROM alarm_instances WHERE open_definition_id IS NOT NULL GROUP BY priority, state');
  },

  /** Alarm episodes opened in the window, newest first. */
  async history(q: HistoryQuery): Promise<{ alarms: AlarmView[]; total: number }> {
    const where = ['i.opened_at >= :from', 'i.opened_at < :to', ...filters(q)];
    if (q.kind) where.push('d.kind = :kind');
    if (q.q) {
      where.push(`(t.tag LIKE :like OR t.name LIKE :like OR i.acked_by LIKE :like OR i.shelved_reason LIKE :like OR i.oos_reason LIKE :like
        OR EXISTS (SELECT 1 FROM alarm_events x WHERE x.instance_id = i.id AND x.comment LIKE :like))`);
    }
    const params = { ...q, from: new Date(q.from), to: new Date(q.to), like: `%${(q.q ?? '').replace(/[\\%_]/g, (m) => `\\${m}`)}%` };
    const [count] = await select<{ n: number }>(`SELECT COUNT(*) AS n FROM (${INSTANCE_SELECT} WHERE ${where.join(' AND ')}) x`, params);
    const rows = await select<InstanceRow>(`${INSTANCE_SELECT} WHERE ${where.join(' AND ')} ORDER BY i.opened_at DESC, i.id DESC LIMIT :limit OFFSET :offset`, params);
    return { alarms: rows.map(toAlarmView), total: count?.n ?? 0 };
  },

  /** Inputs of the alarm-rate figures for one window (see shared/alarms/figures.ts). */
  async figureInputs(fromMs: number, toMs: number, site?: string): Promise<{ annunciations: Annunciation[]; activations: Activation[]; open: OpenAlarm[] }> {
    const siteJoin = 'JOIN tanks t ON t.id = e.tank_id JOIN circuits c ON c.id = t.circuit_id JOIN sites s ON s.id = c.site_id';
    const siteWhere = site ? 'AND s.tag = :site' : '';
    const p = { from: new Date(fromMs), to: new Date(toMs), site };
    const ann = await select<{ at: Date; definition_id: number; priority: Priority; kind: AlarmKind; tag: string; acked_at: Date | null }>(
      `SELECT e.at, e.definition_id, i.priority, d.kind, t.tag,
         (SELECT MIN(a.at) FROM alarm_events a WHERE a.instance_id = e.instance_id AND a.kind = 'acknowledged' AND a.id > e.id) AS acked_at
       FROM alarm_events e JOIN alarm_instances i ON i.id = e.instance_id JOIN alarm_definitions d ON d.id = e.definition_id ${siteJoin}
       WHERE e.kind = 'activated' AND e.to_state = 'unacknowledged' AND e.at >= :from AND e.at < :to ${siteWhere}`, p);
    const acts = await select<{ at: Date; definition_id: number; kind: AlarmKind; tag: string }>(
      `SELECT e.at, e.definition_id, d.kind, t.tag FROM alarm_events e JOIN alarm_definitions d ON d.id = e.definition_id ${siteJoin}
       WHERE e.kind = 'activated' AND e.at >= :from AND e.at < :to ${siteWhere}`, p);
    const open = await select<{ definition_id: number; priority: Priority; kind: AlarmKind; tag: string; since: Date }>(
      `SELECT i.definition_id, i.priority, d.kind, t.tag, COALESCE(i.activated_at, i.opened_at) AS since
       FROM alarm_instances i JOIN alarm_definitions d ON d.id = i.definition_id JOIN tanks t ON t.id = i.tank_id
       JOIN circuits c ON c.id = t.circuit_id JOIN sites s ON s.id = c.site_id
       WHERE i.open_definition_id IS NOT NULL AND i.condition_active = 1 ${siteWhere}`, p);
    const ms = (d: Date) => new Date(d).getTime();
    return {
      annunciations: ann.map((r) => ({ atMs: ms(r.at), definitionId: r.definition_id, priority: r.priority, label: label(r.tag, r.kind), ackedAtMs: r.acked_at ? ms(r.acked_at) : null })),
      activations: acts.map((r) => ({ atMs: ms(r.at), definitionId: r.definition_id, label: label(r.tag, r.kind) })),
      open: open.map((r) => ({ definitionId: r.definition_id, priority: r.priority, label: label(r.tag, r.kind), activatedAtMs: ms(r.since) })),
    };
  },
};
