import { QueryTypes, type Sequelize } from 'sequelize';
import type { EscalationStepView, OnCallRole } from '../../../../shared/schemas/roster.ts';
import { ON_CALL_LABEL } from '../../../../shared/schemas/roster.ts';
import { appendNote, withAlarmLock } from '../alarms/lifecycle.ts';
import { INSTANCE_SELECT, toAlarmView, type InstanceRow } from '../alarms/views.ts';
import { rosterRepository } from '../roster/roster.repository.ts';
import { newJti, signAckToken } from './ack-links.ts';
import { composeMail, type Recipient, type Told } from './mail-compose.ts';

export type EscalationSettings = { sequelize: Sequelize; now: Date; publicUrl: string; ackSecret: string; ackTtlS: number };

type OutboxRow = { instance_id: number; step: number; recipients: string | Recipient[]; created_at: Date };
type TankFacts = { site_name: string; time_zone: string; band_low: number; band_high: number };
type Latest = { ts: Date; ratio: number; orp_mv: number; temp_c: number };

const parseRecipients = (v: OutboxRow['recipients']): Recipient[] => (typeof v === 'string' ? JSON.parse(v) : v);

/**
 * Queues the escalation mail that has fallen due: for each alarm still active and
 * unacknowledged, each policy step whose delay has passed and that has no outbox row yet.
 * The outbox's (instance_id, step) key and the re-check under the alarm lock make this safe
 * to run from any number of processes and after any restart. Returns how many were queued.
 */
export async function queueDueEscalations(s: EscalationSettings): Promise<number> {
  const { sequelize, now } = s;
  const policy = await rosterRepository.policy(sequelize);
  if (policy.length === 0) return 0;
  const rows = await sequelize.query<InstanceRow>(
    `${INSTANCE_SELECT} WHERE i.open_definition_id IS NOT NULL AND i.state = 'unacknowledged' AND i.unack_since IS NOT NULL ORDER BY i.id`,
    { type: QueryTypes.SELECT });
  if (rows.length === 0) return 0;
  const sent = await sequelize.query<OutboxRow>('SELECT instance_id, step, recipients, created_at FROM mail_outbox WHERE instance_id IN (:ids) ORDER BY step',
    { replacements: { ids: rows.map((r) => r.id) }, type: QueryTypes.SELECT });
  let queued = 0;
  for (const row of rows) {
    const due = policy.filter((p) => p.priority === row.priority && new Date(row.unack_since!).getTime() + p.afterMin * 60_000 <= now.getTime());
    const done = sent.filter((o) => o.instance_id === row.id);
    for (const step of due) {
      if (done.some((o) => o.step === step.step)) continue;
      const added = await queueStep(s, row, step, done);
      // Steps due in the same pass (the notifier was down) still tell later steps who was told.
      if (added) {
        done.push(added);
        queued += 1;
      }
    }
  }
  return queued;
}

async function queueStep(s: EscalationSettings, row: InstanceRow, step: EscalationStepView, earlier: OutboxRow[]): Promise<OutboxRow | null> {
  const { sequelize, now } = s;
  const alarm = toAlarmView(row);
  const onCall = await rosterRepository.onCall(sequelize, now);
  const people = new Map<string, { personName: string; email: string; roleOnCall: OnCallRole }>();
  for (const role of step.notify) for (const p of onCall.filter((x) => x.roleOnCall === role)) if (!people.has(p.email)) people.set(p.email, p);
  const links = [...people.values()].map((p) => {
    const jti = newJti();
    const token = signAckToken(s.ackSecret, { jti, instanceId: row.id, email: p.email }, now.getTime(), s.ackTtlS);
    return { ...p, jti, ackUrl: `${s.publicUrl}/ack/${token}` };
  });
  const [facts] = await sequelize.query<TankFacts>(
    'SELECT s.name AS site_name, s.time_zone, t.band_low, t.band_high FROM tanks t JOIN circuits c ON c.id = t.circuit_id JOIN sites s ON s.id = c.site_id WHERE t.id = ?',
    { replacements: [row.tank_id], type: QueryTypes.SELECT });
  const [latest] = await sequelize.query<Latest>(
    'SELECT r.ts, r.ratio, r.orp_mv, r.temp_c FROM probes p JOIN readings r ON r.probe_id = p.id WHERE p.tank_id = ? AND p.active = 1 ORDER BY r.ts DESC LIMIT 1',
    { replacements: [row.tank_id], type: QueryTypes.SELECT });
  const told: Told[] = earlier.flatMap((o) => parseRecipients(o.recipients).map((r) => ({ personName: r.personName, roleOnCall: r.roleOnCall, step: o.step, at: new Date(o.created_at).toISOString() })));
  const expiresAt = new Date(now.getTime() + s.ackTtlS * 1000);
  const mail = composeMail({
    alarm, siteName: facts.site_name, band: { low: facts.band_low, high: facts.band_high }, step: step.step, afterMin: step.afterMin,
    latest: latest ? { ts: new Date(latest.ts).toISOString(), ratio: latest.ratio, orpMv: latest.orp_mv, tempC: latest.temp_c } : null,
    recipients: links, told, tankUrl: `${s.publicUrl}/tanks/${row.tank_id}`, timeZone: facts.time_zone, linkExpiresAt: expiresAt, now,
  });
  const recipients: Recipient[] = links.map(({ personName, email, roleOnCall, ackUrl }) => ({ personName, email, roleOnCall, ackUrl }));
  const host = new URL(s.publicUrl).hostname || 'ferrisight.local';

  return withAlarmLock(sequelize, async (t) => {
    // Re-checked under the lock: an acknowledgement or another notifier may have come first.
    const [current] = await sequelize.query<{ state: string; open_definition_id: number | null }>(
      'SELECT state, open_definition_id FROM alarm_instances WHERE id = ? FOR UPDATE', { replacements: [row.id], type: QueryTypes.SELECT, transaction: t });
    if (!current || current.open_definition_id === null || current.state !== 'unacknowledged') return null;
    const [exists] = await sequelize.query('SELECT 1 AS x FROM mail_outbox WHERE instance_id = ? AND step = ?', { replacements: [row.id, step.step], type: QueryTypes.SELECT, transaction: t });
    if (exists) return null;
    const [outboxId] = await sequelize.query(
      `INSERT INTO mail_outbox (instance_id, step, recipients, subject, text_body, html_body, message_id, status, attempts, next_attempt_at, created_at)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, 0, ?, ?)`,
      { replacements: [row.id, step.step, JSON.stringify(recipients), mail.subject, mail.text, mail.html, `<alarm-${row.id}-step-${step.step}@${host}>`,
        links.length ? 'pending' : 'no-recipient', now, now], type: QueryTypes.INSERT, transaction: t });
    for (const l of links) {
      await sequelize.query('INSERT INTO alarm_ack_links (jti, outbox_id, instance_id, person_name, email, expires_at) VALUES (?, ?, ?, ?, ?, ?)',
        { replacements: [l.jti, outboxId, row.id, l.personName, l.email, expiresAt], transaction: t });
    }
    const whom = links.length ? links.map((l) => `${l.personName} (${ON_CALL_LABEL[l.roleOnCall]})`).join(', ') : `nobody on call as ${step.notify.join(' or ')}`;
    await appendNote(sequelize, t, row.id, 'escalated', `Escalation step ${step.step}: e-mail to ${whom}`, now);
    return { instance_id: row.id, step: step.step, recipients, created_at: now };
  });
}
