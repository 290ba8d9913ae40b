/** Escalation arrangements: a roster of test people around the test clock, a catcher, a notifier on it. */
import net from 'node:net';
import { QueryTypes } from 'sequelize';
import { createNotifier, type NotifierOptions } from '../../api/src/modules/notify/notifier.ts';
import { listCaughtMail, type CaughtMail } from '../../api/src/modules/notify/mail-store.ts';
import { rosterRepository } from '../../api/src/modules/roster/roster.repository.ts';
import { startMailCatcher, type MailCatcher } from '../../simulators/mail-catcher.ts';
import { TEST_SECRET } from '../helpers/api.ts';
import { onlyDefinition, reading, type AlarmTestApi, type Clock } from './helpers.ts';

export const PUBLIC_URL = 'http://127.0.0.1:8470';

/** A port nobody listens on (yet): SMTP "down" until a catcher starts there. */
export async function freePort(): Promise<number> {
  const s = net.createServer();
  await new Promise<void>((r) => s.listen(0, '127.0.0.1', () => r()));
  const { port } = s.address() as net.AddressInfo;
  await new Promise<void>((r) => s.close(() => r()));
  return port;
}

export const startCatcher = (t: AlarmTestApi, port = 0): Promise<MailCatcher> => startMailCatcher({ port, dir: t.mailDir });

/** Replaces the roster: the test engineer on call, a backup and the test supervisor, for days around `aroundMs`. */
export async function testRoster(t: AlarmTestApi, aroundMs: number): Promise<void> {
  await t.sequelize.query('DELETE FROM roster_shifts');
  const startsAt = new Date(aroundMs - 86_400_000).toISOString();
  const endsAt = new Date(aroundMs + 2 * 86_400_000).toISOString();
  for (const [personName, email, roleOnCall] of [
    ['Test engineer', 't-engineer@test.example', 'primary'],
    ['Okoro Bright', 'okoro.bright@kestrel.example', 'backup'],
    ['Test supervisor', 't-supervisor@test.example', 'supervisor'],
  ] as const) {
    await rosterRepository.insert(t.sequelize, { personName, email, roleOnCall, startsAt, endsAt }, null);
  }
}

export function notifierFor(t: AlarmTestApi, clock: Clock, smtpPort: number, over: Partial<NotifierOptions> = {}) {
  return createNotifier({
    sequelize: t.sequelize, smtpUrl: `smtp://127.0.0.1:${smtpPort}`, mailFrom: 'Ferrisight <ferrisight@kestrel.example>',
    publicUrl: PUBLIC_URL, ackSecret: TEST_SECRET, now: clock.now, ...over,
  });
}

/** Raises a P1 ratio-below-band alarm on a tank at the clock's time; returns the instance id. */
export async function raiseP1(t: AlarmTestApi, clock: Clock, tag: string): Promise<number> {
  const def = await onlyDefinition(t.sequelize, t.tanks[tag].id, 'ratio-below-band', { on_delay_s: 0, priority: 1 });
  await t.engine(clock).onReadings([reading(t, tag, clock.ms(), { ratio: 5 })]);
  const [row] = await t.sequelize.query<{ id: number }>('SELECT id FROM alarm_instances WHERE open_definition_id = ?', { replacements: [def], type: QueryTypes.SELECT });
  return row.id;
}

/** Caught mail about one alarm, oldest first. */
export async function mailFor(t: AlarmTestApi, instanceId: number): Promise<CaughtMail[]> {
  return (await listCaughtMail(t.mailDir, 500)).filter((m) => m.headers['x-ferrisight-alarm'] === String(instanceId)).reverse();
}

export async function outboxOf(t: AlarmTestApi, instanceId: number) {
  return t.sequelize.query<{ step: number; status: string; attempts: number; next_attempt_at: Date }>(
    'SELECT step, status, attempts, next_attempt_at FROM mail_outbox WHERE instance_id = ? ORDER BY step', { replacements: [instanceId], type: QueryTypes.SELECT });
}

/** The acknowledge link for one person out of a caught mail's text. */
export function ackLinkIn(mail: CaughtMail, personName: string): string {
  const line = mail.text.split('\n').find((l) => l.startsWith(`Acknowledge as ${personName}:`));
  if (!line) throw new Error(`no link for ${personName} in:\n${mail.text}`);
  return line.slice(line.indexOf('http'));
}
