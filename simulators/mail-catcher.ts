/**
 * Local SMTP catcher for the demo and the tests: accepts every message on loopback, stores it
 * as JSON under FERRISIGHT_DATA_DIR/mail/ (shown on the admin page), never relays anything.
 *   node --import tsx simulators/mail-catcher.ts     (SMTP_PORT=8473, FERRISIGHT_DATA_DIR=.data)
 * Set SMTP_URL to a real relay instead and `npm start` does not run this.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { z } from 'zod';
import { logger } from '../api/src/lib/logger.ts';
import { saveCaughtMail } from '../api/src/modules/notify/mail-store.ts';

export type MailCatcher = { port: number; dir: string; close(): Promise<void> };

const isLoopback = (ip: string) => ip === '127.0.0.1' || ip === '::1' || ip === '::ffff:127.0.0.1';
const addressText = (a: AddressObject | AddressObject[] | undefined) => (Array.isArray(a) ? a.map((x) => x.text).join(', ') : a?.text ?? '');

export async function startMailCatcher(opts: { port: number; dir: string; host?: string }): Promise<MailCatcher> {
  const server = new SMTPServer({
    // Loopback only and no TLS: nodemailer would otherwise try STARTTLS against a self-signed cert.
    disabledCommands: ['STARTTLS', 'AUTH'],
    authOptional: true,
    banner: 'Ferrisight mail catcher (nothing is relayed)',
    size: 10 * 1024 * 1024,
    logger: false,
    onConnect(session, cb) {
      if (!isLoopback(session.remoteAddress)) return cb(new Error('Loopback connections only'));
      cb();
    },
    onData(stream, session, cb) {
      simpleParser(stream)
        .then(async (m) => {
          const saved = await saveCaughtMail(opts.dir, {
            receivedAt: new Date().toISOString(),
            envelope: { from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null, to: session.envelope.rcptTo.map((r) => r.address) },
            messageId: m.messageId ?? null, from: addressText(m.from), to: addressText(m.to), subject: m.subject ?? '',
            text: m.text ?? '', html: typeof m.html === 'string' ? m.html : null,
            headers: Object.fromEntries([...m.headers].filter(([, v]) => typeof v === 'string').map(([k, v]) => [k, v as string])),
          });
          logger.info({ id: saved.id, to: saved.envelope.to, subject: saved.subject }, 'mail caught');
          cb();
        })
        .catch((err: Error) => cb(err));
    },
  });
  const host = opts.host ?? '127.0.0.1';
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, host, () => resolve());
  });
  server.on('error', (err) => logger.warn({ err: err.message }, 'mail catcher error'));
  const address = server.server.address();
  const port = typeof address === 'object' && address ? address.port : opts.port;
  return { port, dir: opts.dir, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const env = z.object({
    SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(8473),
    FERRISIGHT_DATA_DIR: z.string().default('.data'),
  }).safeParse(process.env);
  if (!env.success) {
    logger.fatal({ issues: env.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`) }, 'invalid configuration');
    process.exit(1);
  }
  const dir = path.resolve(env.data.FERRISIGHT_DATA_DIR, 'mail');
  try {
    const catcher = await startMailCatcher({ port: env.data.SMTP_PORT, dir });
    logger.info(`Mail catcher on smtp://127.0.0.1:${catcher.port}, storing in ${dir}`);
    const stop = async () => {
      await catcher.close();
      process.exit(0);
    };
    process.once('SIGTERM', stop);
    process.once('SIGINT', stop);
  } catch (err) {
    const e = err as NodeJS.ErrnoException;
    logger.fatal(e.code === 'EADDRINUSE' ? `Port ${env.data.SMTP_PORT} is taken: set SMTP_PORT to a free port` : e.message);
    process.exit(1);
  }
}
