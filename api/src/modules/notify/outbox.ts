import type { Transporter } from 'nodemailer';
import { QueryTypes, type Sequelize } from 'sequelize';
import { logger } from '../../lib/logger.ts';
import type { Recipient } from './mail-compose.ts';

/**
 * Sends queued mail. nodemailer neither retries nor persists (nodemailer#1425, #1446), so the outbox
 * row is the message: a failure leaves it pending with a later next_attempt_at, and a worker
 * that dies mid-send leaves a claim that expires, so the message is retried, never lost.
 * A crash between the relay's "250 OK" and the status update can repeat one message; the
 * Message-ID is stable per (alarm, step) so the receiving side can recognise the repeat.
 */
export type OutboxSettings = {
  sequelize: Sequelize;
  transport: Transporter;
  from: string;
  now: Date;
  /** Delay before the next attempt after this many failures. */
  backoffMs?: (attempts: number) => number;
  batch?: number;
};

export type SendResult = { sent: number; failed: number; cancelled: number };

/** 5 s, 10 s, 20 s, 40 s, then every 60 s: a relay that comes back is used within about a minute. */
export const defaultBackoffMs = (attempts: number) => Math.min(60_000, 5_000 * 2 ** Math.max(0, attempts - 1));
const CLAIM_MS = 120_000;

type Row = { id: number; instance_id: number; recipients: string | Recipient[]; subject: string; text_body: string; html_body: string; message_id: string; attempts: number; state: string | null; open_definition_id: number | null };

export async function sendDueMail(s: OutboxSettings): Promise<SendResult> {
  const { sequelize, now } = s;
  const backoff = s.backoffMs ?? defaultBackoffMs;
  const result: SendResult = { sent: 0, failed: 0, cancelled: 0 };
  const due = `((o.status = 'pending' AND o.next_attempt_at <= :now) OR (o.status = 'sending' AND o.claimed_until <= :now))`;
  const rows = await sequelize.query<Row>(
    `SELECT o.id, o.instance_id, o.recipients, o.subject, o.text_body, o.html_body, o.message_id, o.attempts, i.state, i.open_definition_id
       FROM mail_outbox o JOIN alarm_instances i ON i.id = o.instance_id WHERE ${due} ORDER BY o.id LIMIT :batch`,
    { replacements: { now, batch: s.batch ?? 20 }, type: QueryTypes.SELECT });
  for (const row of rows) {
    // Claim first: of two workers, only the one whose UPDATE matched sends.
    const [, claimed] = await sequelize.query(`UPDATE mail_outbox o SET o.status = 'sending', o.claimed_until = :until WHERE o.id = :id AND ${due}`,
      { replacements: { id: row.id, now, until: new Date(now.getTime() + CLAIM_MS) }, type: QueryTypes.UPDATE });
    if (claimed !== 1) continue;
    // Acknowledged (or no longer abnormal) while the mail waited: the escalation has stopped.
    if (row.open_definition_id === null || row.state !== 'unacknowledged') {
      await sequelize.query("UPDATE mail_outbox SET status = 'cancelled', claimed_until = NULL WHERE id = ?", { replacements: [row.id] });
      result.cancelled += 1;
      continue;
    }
    const to = (typeof row.recipients === 'string' ? JSON.parse(row.recipients) : row.recipients) as Recipient[];
    try {
      const info = await s.transport.sendMail({
        from: s.from, to: to.map((r) => ({ name: r.personName, address: r.email })), subject: row.subject,
        text: row.text_body, html: row.html_body, messageId: row.message_id,
        headers: { 'X-Ferrisight-Alarm': String(row.instance_id) },
      });
      await sequelize.query("UPDATE mail_outbox SET status = 'sent', sent_at = ?, attempts = attempts + 1, claimed_until = NULL, last_error = NULL WHERE id = ?",
        { replacements: [now, row.id] });
      logger.info({ outboxId: row.id, instanceId: row.instance_id, response: info.response }, 'escalation mail sent');
      result.sent += 1;
    } catch (err) {
      const attempts = row.attempts + 1;
      const message = (err as Error).message.slice(0, 1000);
      await sequelize.query("UPDATE mail_outbox SET status = 'pending', attempts = ?, next_attempt_at = ?, claimed_until = NULL, last_error = ? WHERE id = ?",
        { replacements: [attempts, new Date(now.getTime() + backoff(attempts)), message, row.id] });
      logger.warn({ outboxId: row.id, attempts, err: message }, 'escalation mail not sent; will retry');
      result.failed += 1;
    }
  }
  return result;
}
