import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { signAckToken } from '../../api/src/modules/notify/ack-links.ts';
import type { MailCatcher } from '../../simulators/mail-catcher.ts';
import { TEST_SECRET } from '../helpers/api.ts';
import { ackLinkIn, mailFor, notifierFor, raiseP1, startCatcher, testRoster } from './escalation-helpers.ts';
import { createAlarmTestApi, eventsOf, instancesOf, MIN, testClock, withoutTimerDefinitions, type AlarmTestApi } from './helpers.ts';

/** Acknowledge links from real escalation mail: the clock is the real one here, since the link pages use it. */
let t: AlarmTestApi;
let catcher: MailCatcher;

beforeAll(async () => {
  t = await createAlarmTestApi();
  await withoutTimerDefinitions(t.sequelize);
  await testRoster(t, Date.now());
  catcher = await startCatcher(t);
});
afterAll(async () => {
  await catcher?.close();
  await t?.close();
});

/** Raises a P1 alarm 5 min in the past, runs the notifier and returns the alarm and the engineer's link path. */
async function alarmWithLink(tag: string): Promise<{ id: number; def: number; path: string }> {
  const clock = testClock(Date.now() - 5 * MIN);
  const id = await raiseP1(t, clock, tag);
  clock.set(Date.now());
  const n = notifierFor(t, clock, catcher.port);
  await n.runOnce();
  n.close();
  const [mail] = await mailFor(t, id);
  const [row] = await t.sequelize.query<{ definition_id: number }>('SELECT definition_id FROM alarm_instances WHERE id = ?', { replacements: [id], type: QueryTypes.SELECT });
  return { id, def: row.definition_id, path: new URL(ackLinkIn(mail, 'Test engineer')).pathname };
}

const page = (path: string) => request(t.app).get(path);
const confirm = (path: string, comment?: string) => request(t.app).post(path).type('form').send(comment ? { comment } : {});

describe('acknowledge links', () => {
  it('when a valid link is opened, then a confirmation page is shown and nothing changes yet; confirming acknowledges as that engineer via e-mail', async () => {
    const { id, def, path } = await alarmWithLink('A1');
    const look = await page(path);
    expect(look.status).toBe(200);
    expect(look.headers['content-type']).toMatch(/html/);
    expect(look.text).toContain('Acknowledge this alarm?');
    expect(look.text).toContain('Test engineer');
    expect(look.text).toContain('<form method="post"');
    expect(look.text).toContain(`href="/alarm-desk?alarm=${id}"`);
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('unacknowledged');
    const done = await confirm(path, 'On my way to the blower house');
    expect(done.status).toBe(200);
    expect(done.text).toContain('Alarm acknowledged');
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('acknowledged');
    expect((await eventsOf(t.sequelize, def)).at(-1)).toMatchObject({
      kind: 'acknowledged', how: 'email', by_user_id: t.users.engineer, by_name: 'Test engineer', comment: 'On my way to the blower house',
    });
  });

  it('when the same link is used again, then a clear page says so and nothing changes', async () => {
    const { def, path } = await alarmWithLink('A2');
    expect((await confirm(path)).status).toBe(200);
    const before = await eventsOf(t.sequelize, def);
    const again = await confirm(path);
    expect(again.status).toBe(410);
    expect(again.text).toContain('This link has already been used');
    expect((await page(path)).text).toContain('This link has already been used');
    expect(await eventsOf(t.sequelize, def)).toEqual(before);
  });

  it('when a link has been tampered with, then a clear page says so and nothing changes', async () => {
    const { def, path } = await alarmWithLink('A3');
    const [h, p, sig] = path.slice('/ack/'.length).split('.');
    const claims = JSON.parse(Buffer.from(p, 'base64url').toString());
    const forgedPayload = Buffer.from(JSON.stringify({ ...claims, em: 't-admin@test.example' })).toString('base64url');
    for (const bad of [`/ack/${h}.${forgedPayload}.${sig}`, `/ack/${h}.${p}.${sig.slice(0, -2)}xx`, '/ack/not-a-token']) {
      const res = await confirm(bad);
      expect(res.status).toBe(400);
      expect(res.text).toContain('This link is not valid');
    }
    const other = signAckToken('another-secret-that-is-long-enough-0123456789', { jti: claims.jti, instanceId: claims.iid, email: claims.em }, Date.now());
    expect((await confirm(`/ack/${other}`)).status).toBe(400);
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('unacknowledged');
  });

  it('when a link has expired, then a clear page says so and nothing changes', async () => {
    const { id, def, path } = await alarmWithLink('A4');
    const claims = JSON.parse(Buffer.from(path.split('.')[1], 'base64url').toString());
    const expired = signAckToken(TEST_SECRET, { jti: claims.jti, instanceId: id, email: claims.em }, Date.now() - 13 * 3_600_000, 12 * 3600);
    const res = await confirm(`/ack/${expired}`);
    expect(res.status).toBe(410);
    expect(res.text).toContain('This link has expired');
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('unacknowledged');
  });

  it('when the alarm was already acknowledged on the screen, then the link changes nothing and says who did it', async () => {
    const { id, def, path } = await alarmWithLink('A5');
    await request(t.app).post(`/api/alarms/instances/${id}/acknowledge`).set('Cookie', t.cookies.supervisor).set('X-Ferrisight-Csrf', '1').send({});
    const before = await eventsOf(t.sequelize, def);
    const res = await confirm(path);
    expect(res.status).toBe(409);
    expect(res.text).toContain('Nothing to acknowledge');
    expect(res.text).toContain('acknowledged by Test supervisor');
    expect(await eventsOf(t.sequelize, def)).toEqual(before);
  });

  it('when an escalation step goes to two people, then each gets a mail of their own with only their own link, and each link acknowledges only as its recipient', async () => {
    const clock = testClock(Date.now() - 15 * MIN);
    const id = await raiseP1(t, clock, 'A6');
    clock.set(Date.now());
    const n = notifierFor(t, clock, catcher.port);
    await n.runOnce();
    n.close();
    const step2 = (await mailFor(t, id)).filter((m) => m.subject.endsWith('(step 2)'));
    expect(step2).toHaveLength(2);
    const byPerson = new Map(step2.map((m) => [m.envelope.to.join(','), m]));
    const supervisorMail = byPerson.get('t-supervisor@test.example')!;
    const backupMail = byPerson.get('okoro.bright@kestrel.example')!;
    for (const [mail, own, other] of [[supervisorMail, 'Test supervisor', 'Okoro Bright'], [backupMail, 'Okoro Bright', 'Test supervisor']] as const) {
      expect(mail.text.match(/\/ack\//g)).toHaveLength(1);
      expect((mail.html ?? '').match(/\/ack\//g)).toHaveLength(1);
      expect(mail.text).toContain(`Acknowledge as ${own}:`);
      expect(mail.text).not.toContain(`Acknowledge as ${other}`);
    }
    const [row] = await t.sequelize.query<{ definition_id: number }>('SELECT definition_id FROM alarm_instances WHERE id = ?', { replacements: [id], type: QueryTypes.SELECT });
    expect((await confirm(new URL(ackLinkIn(backupMail, 'Okoro Bright')).pathname)).status).toBe(200);
    expect((await eventsOf(t.sequelize, row.definition_id)).filter((e) => e.kind === 'acknowledged')).toEqual([
      expect.objectContaining({ how: 'email', by_name: 'Okoro Bright', by_user_id: null }),
    ]);
    // The supervisor's own link cannot act again, nor in the backup's name.
    const late = await confirm(new URL(ackLinkIn(supervisorMail, 'Test supervisor')).pathname);
    expect(late.status).toBe(409);
    expect(late.text).toContain('acknowledged by Okoro Bright');
  });
});
