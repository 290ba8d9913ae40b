import { csvText } from '../../lib/csv.ts';
import { alarmFigures } from '../../../../shared/alarms/figures.ts';
import { MAX_SHELVE_MIN } from '../../../../shared/alarms/states.ts';
import { ALARM_TARGETS } from '../../../../shared/alarms/targets.ts';
import { mayShelve, PLANT_SHELVE_RULE } from '../../../../shared/alarms/roles.ts';
import type { ActiveQuery, AlarmSummary, AlarmView, HistoryQuery, OosInput, ShelveInput } from '../../../../shared/schemas/alarms.ts';
import type { SessionUser } from '../../../../shared/schemas/auth.ts';
import { AppError } from '../../lib/app-error.ts';
import { siteSettingsRepository } from '../site-settings/site-settings.repository.ts';
import { alarmsRepository as repo } from './alarms.repository.ts';
import { definitionsRepository } from './definitions.repository.ts';
import { applyAction, type ApplyInput } from './lifecycle.ts';

/** Rows per query when the alarm history is exported whole. */
const HISTORY_PAGE = 5000;

type Who = Pick<SessionUser, 'id' | 'name'>;
const onScreen = (u: Who) => ({ userId: u.id, name: u.name, how: 'screen' as const });

/** Applies one action for a person at the screen; refusals become 404 or 409 with the reason. */
async function act(input: Omit<ApplyInput, 'at' | 'actor'>, who: Who, now: Date): Promise<{ alarm: AlarmView; eventId: number }> {
  const result = await applyAction(definitionsRepository.db(), { ...input, at: now, actor: onScreen(who) });
  if (!result.ok) throw result.notFound ? AppError.notFound('Alarm') : AppError.conflict(result.reason);
  return { alarm: (await repo.instance(result.instanceId))!, eventId: result.eventId };
}

export const alarmsService = {
  async active(q: ActiveQuery) {
    // lastEventId first: a client replays from it, so anything newer than the list is never lost.
    const lastEventId = await repo.lastEventId();
    return { alarms: await repo.active(q), lastEventId, serverTime: new Date().toISOString() };
  },

  async summary(): Promise<AlarmSummary> {
    const lastEventId = await repo.lastEventId();
    const out: AlarmSummary = { byPriority: { 1: { total: 0, unacknowledged: 0 }, 2: { total: 0, unacknowledged: 0 }, 3: { total: 0, unacknowledged: 0 } }, shelved: 0, outOfService: 0, suppressed: 0, lastEventId };
    for (const { priority, state, n } of await repo.countsByPriorityAndState()) {
      if (state === 'shelved') out.shelved += n;
      else if (state === 'out-of-service') out.outOfService += n;
      else if (state === 'suppressed') out.suppressed += n;
      else {
        out.byPriority[priority].total += n;
        if (state !== 'acknowledged') out.byPriority[priority].unacknowledged += n;
      }
    }
    return out;
  },

  async instance(id: number) {
    const alarm = await repo.instance(id);
    if (!alarm) throw AppError.notFound('Alarm');
    return { alarm, timeline: await repo.timeline(id) };
  },

  history: (q: HistoryQuery) => repo.history(q),

  async historyCsv(q: HistoryQuery): Promise<string> {
    // Every alarm of the filter, a page at a time; an alarm opened meanwhile shifts the pages, so ids are kept once.
    const byId = new Map<number, AlarmView>();
    for (let offset = 0; ; offset += HISTORY_PAGE) {
      const page = (await repo.history({ ...q, limit: HISTORY_PAGE, offset })).alarms;
      for (const a of page) if (!byId.has(a.id)) byId.set(a.id, a);
      if (page.length < HISTORY_PAGE) break;
    }
    const alarms = [...byId.values()];
    const ackS = (a: AlarmView) => (a.ackedAt && a.activatedAt ? Math.round((Date.parse(a.ackedAt) - Date.parse(a.activatedAt)) / 1000) : '');
    return csvText([
      ['id', 'site', 'circuit', 'tank', 'alarm', 'priority', 'opened_at_utc', 'activated_at_utc', 'acknowledged_at_utc', 'acknowledged_by', 'seconds_to_acknowledge', 'closed_at_utc', 'state', 'value_at_activation', 'limit', 'unit'],
      ...alarms.map((a) => [a.id, a.siteTag, a.circuitTag, a.tankTag, a.label, `P${a.priority}`, a.openedAt, a.activatedAt ?? '', a.ackedAt ?? '', a.ackedBy ?? '', ackS(a), a.closedAt ?? '', a.state, a.firstValue ?? '', a.limitValue ?? '', a.unit]),
    ]);
  },

  eventsAfter: async (after: number, limit: number) => ({ events: await repo.eventsAfter(after, limit) }),

  async figures(fromIso: string, toIso: string, site?: string) {
    const fromMs = Date.parse(fromIso);
    const toMs = Math.min(Date.parse(toIso), Date.now());
    const inputs = await repo.figureInputs(fromMs, toMs, site);
    return { figures: alarmFigures({ fromMs, toMs, nowMs: Date.now(), ...inputs }), targets: ALARM_TARGETS };
  },

  acknowledge: (id: number, who: Who, comment?: string) => act({ instanceId: id, action: 'acknowledge', comment }, who, new Date()),

  /** Acknowledges every alarm of a tank that waits for it; one event per alarm. */
  async acknowledgeTank(tankId: number, who: Who, comment?: string) {
    const acknowledged: number[] = [];
    for (const id of await repo.unacknowledgedOfTank(tankId)) {
      const r = await applyAction(definitionsRepository.db(), { instanceId: id, action: 'acknowledge', comment, at: new Date(), actor: onScreen(who) });
      if (r.ok) acknowledged.push(id);
    }
    return { acknowledged };
  },

  /** Who may shelve and for how long is the site's setting, under the 12 h ceiling. */
  async shelve(id: number, who: Who & Pick<SessionUser, 'role'>, input: ShelveInput) {
    const alarm = await repo.instance(id);
    if (!alarm) throw AppError.notFound('Alarm');
    const rule = alarm.tankId === null ? PLANT_SHELVE_RULE : await siteSettingsRepository.forTank(alarm.tankId);
    if (!mayShelve(who.role, rule)) throw AppError.forbidden('At this site, shelving is for supervisors, engineers and admins');
    const maxMin = Math.min(MAX_SHELVE_MIN, rule.maxShelveHours * 60);
    const now = new Date();
    const until = input.until ? new Date(input.until) : new Date(now.getTime() + input.durationMin! * 60_000);
    if (until.getTime() <= now.getTime()) throw AppError.badRequest('The shelve must end in the future', { errors: [{ path: 'until', message: 'Must be in the future' }] });
    if (until.getTime() - now.getTime() > maxMin * 60_000 + 1000) {
      const limit = `${Number((maxMin / 60).toFixed(2))} h`;
      throw AppError.badRequest(`A shelve lasts at most ${limit} at this site`, { errors: [{ path: input.until ? 'until' : 'durationMin', message: `At most ${limit}` }] });
    }
    return act({ instanceId: id, action: 'shelve', reason: input.reason, shelvedUntil: until }, who, now);
  },

  unshelve: (id: number, who: Who, comment?: string) => act({ instanceId: id, action: 'unshelve', comment }, who, new Date()),
  comment: (id: number, who: Who, text: string) => act({ instanceId: id, action: 'comment', comment: text }, who, new Date()),

  async removeFromService(definitionId: number, who: Who, input: OosInput) {
    if (!(await definitionsRepository.get(definitionsRepository.db(), definitionId))) throw AppError.notFound('Alarm definition');
    const now = new Date();
    const oosUntil = new Date(now.getTime() + Math.round(input.durationH * 3_600_000));
    return act({ definitionId, action: 'remove-from-service', reason: input.reason, comment: input.reason, oosUntil }, who, now);
  },

  async returnToService(definitionId: number, who: Who, comment: string) {
    if (!(await definitionsRepository.get(definitionsRepository.db(), definitionId))) throw AppError.notFound('Alarm definition');
    return act({ definitionId, action: 'return-to-service', comment }, who, new Date());
  },
};
