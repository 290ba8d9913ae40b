import nodemailer, { type Transporter } from 'nodemailer';
import type { Sequelize } from 'sequelize';
import { ACK_LINK_TTL_S } from './ack-links.ts';
import { queueDueEscalations } from './escalation.ts';
import { sendDueMail, type SendResult } from './outbox.ts';

/** smtp(s)://[user:pass@]host:port → a transport that fails fast: the outbox retries, a hung send only delays others. */
export function smtpTransport(smtpUrl: string): Transporter {
  const u = new URL(smtpUrl);
  const secure = u.protocol === 'smtps:';
  return nodemailer.createTransport({
    host: u.hostname, port: Number(u.port || (secure ? 465 : 587)), secure,
    auth: u.username ? { user: decodeURIComponent(u.username), pass: decodeURIComponent(u.password) } : undefined,
    connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000,
  });
}

export type NotifierOptions = {
  sequelize: Sequelize;
  /** smtp://host:port of the relay or the local catcher (ignored when transport is given). */
  smtpUrl?: string;
  transport?: Transporter;
  mailFrom: string;
  /** Base of the links in the mail, e.g. http://127.0.0.1:8470. */
  publicUrl: string;
  /** JWT_SECRET: acknowledge links are signed with a key derived from it. */
  ackSecret: string;
  ackTtlS?: number;
  now?: () => Date;
  backoffMs?: (attempts: number) => number;
};

/**
 * Escalation: queue the steps that fell due, then send what is due in the outbox. One pass per
 * runOnce(); the notifier entry point calls it every couple of seconds, tests call it directly.
 */
export function createNotifier(o: NotifierOptions) {
  const now = o.now ?? (() => new Date());
  const transport = o.transport ?? smtpTransport(o.smtpUrl ?? 'smtp://127.0.0.1:8473');
  const publicUrl = o.publicUrl.replace(/\/+$/, '');
  return {
    transport,
    async runOnce(): Promise<SendResult & { queued: number }> {
      const queued = await queueDueEscalations({ sequelize: o.sequelize, now: now(), publicUrl, ackSecret: o.ackSecret, ackTtlS: o.ackTtlS ?? ACK_LINK_TTL_S });
      const sent = await sendDueMail({ sequelize: o.sequelize, transport, from: o.mailFrom, now: now(), backoffMs: o.backoffMs });
      return { queued, ...sent };
    },
    close(): void {
      transport.close();
    },
  };
}

export type Notifier = ReturnType<typeof createNotifier>;
