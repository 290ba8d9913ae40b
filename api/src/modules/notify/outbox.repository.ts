import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { Recipient } from './mail-compose.ts';

/** The mail outbox (one row per alarm and escalation step) and the acknowledge links sent with it. */
export type QueuedStep = { instanceId: number; step: number; recipients: Recipient[]; createdAt: Date };

export type NewMail = {
  instanceId: number; step: number; recipients: Recipient[]; subject: string; text: string; html: string; messageId: string;
  status: 'pending' | 'no-recipient'; now: Date;
  links: { jti: string; personName: string; email: string }[]; linkExpiresAt: Date;
};

export type DueMail = {
  id: number; instanceId: number; recipients: Recipient[]; subject: string; textBody: string; htmlBody: string; messageId: string;
  attempts: number;
  /** The alarm's state now, and whether it is still open (an acknowledged or cleared alarm's mail is cancelled). */
  alarmState: string | null; alarmOpen: boolean;
};

type DueRow = {
  id: number; instance_id: number; recipients: string | Recipient[]; subject: string; text_body: string; html_body: string; message_id: string;
  attempts: number; state: string | null; open_definition_id: number | null;
};

const parseRecipients = (v: string | Recipient[]): Recipient[] => (typeof v === 'string' ? JSON.parse(v) : v);
const DUE = `((o.status = 'pending' AND o.next_attempt_at <= :now) OR (o.status = 'sending' AND o.claimed_until <= :now))`;

export const outboxRepository = {
  /** Steps already queued for these alarms, in step order. */
  async queuedSteps(sequelize: Sequelize, instanceIds: number[]): Promise<QueuedStep[]> {
    if (instanceIds.length === 0) return [];
    const rows = await sequelize.query<{ instance_id: number; step: number; recipients: string | Recipient[]; created_at: Date }>(
      'SELECT instance_id, step, recipients, created_at FROM mail_outbox WHERE instance_id IN (:ids) ORDER BY step',
      { replacements: { ids: instanceIds }, type: QueryTypes.SELECT });
    return rows.map((r) => ({ instanceId: r.instance_id, step: r.step, recipients: parseRecipients(r.recipients), createdAt: new Date(r.created_at) }));
  },

  /** Whether a step of an alarm is queued already (inside the queueing transaction). */
  async isQueued(sequelize: Sequelize, t: Transaction, instanceId: number, step: number): Promise<boolean> {
    const [exists] = await sequelize.query('SELECT 1 AS x FROM mail_outbox WHERE instance_id = ? AND step = ?',
      { replacements: [instanceId, step], type: QueryTypes.SELECT, transaction: t });
    return !!exists;
  },

  /** Queues one step's mail and its acknowledge links; returns the outbox id. */
  async queue(sequelize: Sequelize, t: Transaction, m: NewMail): Promise<number> {
    const [outboxId] = await sequelize.query(
      `INSERT INTO mail_outbox (instance_id, step, recipients, subject, text_body, html_body, message_id, status, attempts, next_attempt_at, created_at)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, 0, ?, ?)`,
      { replacements: [m.instanceId, m.step, JSON.stringify(m.recipients), m.subject, m.text, m.html, m.messageId, m.status, m.now, m.now],
        type: QueryTypes.INSERT, transaction: t });
    for (const l of m.links) {
      await sequelize.query('INSERT INTO alarm_ack_links (jti, outbox_id, instance_id, person_name, email, expires_at) VALUES (?, ?, ?, ?, ?, ?)',
        { replacements: [l.jti, outboxId, m.instanceId, l.personName, l.email, m.linkExpiresAt], transaction: t });
    }
    return Number(outboxId);
  },

  /** Mail due now: pending past its next attempt, or claimed by a sender whose claim ran out. */
  async due(sequelize: Sequelize, now: Date, batch: number): Promise<DueMail[]> {
    const rows = await sequelize.query<DueRow>(
      `SELECT o.id, o.instance_id, o.recipients, o.subject, o.text_body, o.html_body, o.message_id, o.attempts, i.state, i.open_definition_id
         FROM mail_outbox o JOIN alarm_instances i ON i.id = o.instance_id WHERE ${DUE} ORDER BY o.id LIMIT :batch`,
      { replacements: { now, batch }, type: QueryTypes.SELECT });
    return rows.map((r) => ({
      id: r.id, instanceId: r.instance_id, recipients: parseRecipients(r.recipients), subject: r.subject, textBody: r.text_body,
      htmlBody: r.html_body, messageId: r.message_id, attempts: r.attempts, alarmState: r.state, alarmOpen: r.open_definition_id !== null,
    }));
  },

  /** Claims a due message until `until`; false when another sender claimed it first. */
  async claim(sequelize: Sequelize, id: number, now: Date, until: Date): Promise<boolean> {
    const [, claimed] = await sequelize.query(`UPDATE mail_outbox o SET o.status = 'sending', o.claimed_until = :until WHERE o.id = :id AND ${DUE}`,
      { replacements: { id, now, until }, type: QueryTypes.UPDATE });
    return claimed === 1;
  },

  async cancel(sequelize: Sequelize, id: number): Promise<void> {
    await sequelize.query("UPDATE mail_outbox SET status = 'cancelled', claimed_until = NULL WHERE id = ?", { replacements: [id] });
  },

  /** Records who has been sent their own copy, so a retry after a partial failure skips them. */
  async markRecipients(sequelize: Sequelize, id: number, recipients: Recipient[]): Promise<void> {
    await sequelize.query('UPDATE mail_outbox SET recipients = ? WHERE id = ?', { replacements: [JSON.stringify(recipients), id] });
  },

  async markSent(sequelize: Sequelize, id: number, at: Date): Promise<void> {
    await sequelize.query("UPDATE mail_outbox SET status = 'sent', sent_at = ?, attempts = attempts + 1, claimed_until = NULL, last_error = NULL WHERE id = ?",
      { replacements: [at, id] });
  },

  async markFailed(sequelize: Sequelize, id: number, attempts: number, nextAttemptAt: Date, error: string): Promise<void> {
    await sequelize.query("UPDATE mail_outbox SET status = 'pending', attempts = ?, next_attempt_at = ?, claimed_until = NULL, last_error = ? WHERE id = ?",
      { replacements: [attempts, nextAttemptAt, error, id] });
  },
};
