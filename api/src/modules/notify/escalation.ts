import type { Sequelize } from 'sequelize';
import type { AlarmView } from '../../../../shared/schemas/alarms.ts';
import type { EscalationStepView, OnCallRole } from '../../../../shared/schemas/roster.ts';
import { ON_CALL_LABEL } from '../../../../shared/schemas/roster.ts';
import { lifecycleRepository, withAlarmLock } from '../alarms/lifecycle.repository.ts';
import { rosterRepository } from '../roster/roster.repository.ts';
import { newJti, signAckToken } from './ack-links.ts';
import { escalationRepository } from './escalation.repository.ts';
import { composeMail, type Recipient, type Told } from './mail-compose.ts';
import { outboxRepository, type QueuedStep } from './outbox.repository.ts';

export type EscalationSettings = { sequelize: Sequelize; now: Date; publicUrl: string; ackSecret: string; ackTtlS: number };

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
  const alarms = await escalationRepository.unacknowledged(sequelize);
  if (alarms.length === 0) return 0;
  const sent = await outboxRepository.queuedSteps(sequelize, alarms.map((a) => a.id));
  let queued = 0;
  for (const alarm of alarms) {
    const due = policy.filter((p) => p.priority === alarm.priority && new Date(alarm.unackSince!).getTime() + p.afterMin * 60_000 <= now.getTime());
    const done = sent.filter((o) => o.instanceId === alarm.id);
    for (const step of due) {
      if (done.some((o) => o.step === step.step)) continue;
      const added = await queueStep(s, alarm, step, done);
      // Steps due in the same pass (the notifier was down) still tell later steps who was told.
      if (added) {
        done.push(added);
        queued += 1;
      }
    }
  }
  return queued;
}

async function queueStep(s: EscalationSettings, alarm: AlarmView, step: EscalationStepView, earlier: QueuedStep[]): Promise<QueuedStep | null> {
  const { sequelize, now } = s;
  const onCall = await rosterRepository.onCall(sequelize, now);
  const people = new Map<string, { personName: string; email: string; roleOnCall: OnCallRole }>();
  for (const role of step.notify) for (const p of onCall.filter((x) => x.roleOnCall === role)) if (!people.has(p.email)) people.set(p.email, p);
  const links = [...people.values()].map((p) => {
    const jti = newJti();
    const token = signAckToken(s.ackSecret, { jti, instanceId: alarm.id, email: p.email }, now.getTime(), s.ackTtlS);
    return { ...p, jti, ackUrl: `${s.publicUrl}/ack/${token}` };
  });
  const tankId = alarm.tankId;
  const facts = tankId === null ? { ...(await escalationRepository.plantFacts(sequelize)), band: null } : await escalationRepository.tankFacts(sequelize, tankId);
  const latest = tankId === null ? null : await escalationRepository.latestReading(sequelize, tankId);
  const told: Told[] = earlier.flatMap((o) => o.recipients.map((r) => ({ personName: r.personName, roleOnCall: r.roleOnCall, step: o.step, at: o.createdAt.toISOString() })));
  const expiresAt = new Date(now.getTime() + s.ackTtlS * 1000);
  const mail = composeMail({
    alarm, siteName: facts.siteName, band: facts.band, step: step.step, afterMin: step.afterMin, latest,
    recipients: links, told, tankUrl: tankId === null ? null : `${s.publicUrl}/tanks/${tankId}`, alarmUrl: `${s.publicUrl}/alarm-desk?alarm=${alarm.id}`, timeZone: facts.timeZone, linkExpiresAt: expiresAt, now,
  });
  const recipients: Recipient[] = links.map(({ personName, email, roleOnCall, ackUrl }) => ({ personName, email, roleOnCall, ackUrl }));
  const host = new URL(s.publicUrl).hostname || 'ferrisight.local';

  return withAlarmLock(sequelize, async (t) => {
    // Re-checked under the lock: an acknowledgement or another notifier may have come first.
    if (!(await escalationRepository.stillUnacknowledged(sequelize, t, alarm.id))) return null;
    if (await outboxRepository.isQueued(sequelize, t, alarm.id, step.step)) return null;
    await outboxRepository.queue(sequelize, t, {
      instanceId: alarm.id, step: step.step, recipients, subject: mail.subject, text: mail.text, html: mail.html,
      messageId: `<alarm-${alarm.id}-step-${step.step}@${host}>`, status: links.length ? 'pending' : 'no-recipient', now,
      links: links.map((l) => ({ jti: l.jti, personName: l.personName, email: l.email })), linkExpiresAt: expiresAt,
    });
    const whom = links.length ? links.map((l) => `${l.personName} (${ON_CALL_LABEL[l.roleOnCall]})`).join(', ') : `nobody on call as ${step.notify.join(' or ')}`;
    await lifecycleRepository.appendNote(sequelize, t, alarm.id, 'escalated', `Escalation step ${step.step}: e-mail to ${whom}`, now);
    return { instanceId: alarm.id, step: step.step, recipients, createdAt: now };
  });
}
