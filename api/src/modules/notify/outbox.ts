import type { Transporter } from 'nodemailer';
import type { Sequelize } from 'sequelize';
import { logger } from '../../lib/logger.ts';
import { outboxRepository as repo } from './outbox.repository.ts';
import { personalMail } from './mail-compose.ts';

/**
 * Sends queued mail. nodemailer neither retries nor persists (nodemailer#1425, #1446), so the outbox
 * row is the message: a failure leaves it pending with a later next_attempt_at, and a worker
 * that dies mid-send leaves a claim that expires, so the message is retried, never lost.
 * Each recipient gets a mail of their own carrying only their own acknowledge link; who has
 * been sent theirs is marked in the row, so a retry after a partial failure sends only the rest.
 * A crash between the relay's "250 OK" and that mark can repeat one message; the Message-ID is
 * stable per (alarm, step, recipient) so the receiving side can recognise the repeat.
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

export async function sendDueMail(s: OutboxSettings): Promise<SendResult> {
  const { sequelize, now } = s;
  const backoff = s.backoffMs ?? defaultBackoffMs;
  const result: SendResult = { sent: 0, failed: 0, cancelled: 0 };
  const rows = await repo.due(sequelize, now, s.batch ?? 20);
  for (const row of rows) {
    // Claim first: of two workers, only the one whose UPDATE matched sends.
    if (!(await repo.claim(sequelize, row.id, now, new Date(now.getTime() + CLAIM_MS)))) continue;
    // Acknowledged (or no longer abnormal) while the mail waited: the escalation has stopped.
    if (!row.alarmOpen || row.alarmState !== 'unacknowledged') {
      await repo.cancel(sequelize, row.id);
      result.cancelled += 1;
      continue;
    }
    try {
      for (const [i, r] of row.recipients.entries()) {
        if (r.sentAt) continue;
        const info = await s.transport.sendMail({
          from: s.from, to: { name: r.personName, address: r.email }, subject: row.subject, ...personalMail({ text: row.textBody, html: row.htmlBody }, r),
          messageId: row.messageId.replace(/@/, `-${i + 1}@`), headers: { 'X-Ferrisight-Alarm': String(row.instanceId) },
        });
        r.sentAt = now.toISOString();
        await repo.markRecipients(sequelize, row.id, row.recipients);
        logger.info({ outboxId: row.id, instanceId: row.instanceId, recipient: i + 1, response: info.response }, 'escalation mail sent');
      }
      await repo.markSent(sequelize, row.id, now);
      result.sent += 1;
    } catch (err) {
      const attempts = row.attempts + 1;
      const message = (err as Error).message.slice(0, 1000);
      await repo.markFailed(sequelize, row.id, attempts, new Date(now.getTime() + backoff(attempts)), message);
      logger.warn({ outboxId: row.id, attempts, err: message }, 'escalation mail not sent; will retry');
      result.failed += 1;
    }
  }
  return result;
}
