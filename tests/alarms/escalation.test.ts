import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { applyAction } from '../../api/src/modules/alarms/lifecycle.ts';
import { defaultBackoffMs } from '../../api/src/modules/notify/outbox.ts';
import type { MailCatcher } from '../../simulators/mail-catcher.ts';
import { freePort, mailFor, notifierFor, outboxOf, PUBLIC_URL, raiseP1, startCatcher, testRoster } from './escalation-helpers.ts';
import { createAlarmTestApi, MIN, testClock, withoutTimerDefinitions, type AlarmTestApi } from './helpers.ts';

/** End to end with the real SMTP catcher (smtp-server in this process) and the demo policy: P1 → on call after 5 min, supervisor + backup after 15. */
let t: AlarmTestApi;
let catcher: MailCatcher;
const T0 = Date.parse('2026-12-01T10:00:00Z');

beforeAll(async () => {
  t = await createAlarmTestApi();
  await withoutTimerDefinitions(t.sequelize);
  await testRoster(t, T0);
  catcher = await startCatcher(t);
});
afterAll(async () => {
  await catcher?.close();
  await t?.close();
});

describe('e-mail escalation', () => {
  it('when a P1 alarm stays unacknowledged 5 min, then the on-call engineer gets one mail with the facts and an acknowledge link, not before', async () => {
    const clock = testClock(T0);
    const id = await raiseP1(t, clock, 'A1');
    const n = notifierFor(t, clock, catcher.port);
    clock.advance(4 * MIN + 59_000);
    expect(await n.runOnce()).toMatchObject({ queued: 0, sent: 0 });
    clock.advance(1000);
    expect(await n.runOnce()).toMatchObject({ queued: 1, sent: 1 });
    expect(await n.runOnce()).toMatchObject({ queued: 0, sent: 0 });
    const [mail] = await mailFor(t, id);
    expect(mail.envelope.to).toEqual(['t-engineer@test.example']);
    expect(mail.subject).toBe('P1 A1: Fe³⁺/Fe²⁺ ratio below band, unacknowledged (step 1)');
    expect(mail.text).toContain('A1 · Bioleach 1 (A)');
    expect(mail.text).toContain('5.0 at activation; band 8.0–25');
    expect(mail.text).toMatch(/Since:\s+2026-12-01 18:00 Australia\/Perth \(10:00 UTC\); unacknowledged for 5 min/);
    expect(mail.text).toContain('Test engineer (First call), this step');
    expect(mail.text).toContain(`Tank page: ${PUBLIC_URL}/tanks/${t.tanks.A1.id}`);
    expect(mail.text).toContain(`The alarm: ${PUBLIC_URL}/alarm-desk?alarm=${id}`);
    expect(mail.text).toMatch(new RegExp(`Acknowledge as Test engineer: ${PUBLIC_URL}/ack/[\\w-]+\\.[\\w-]+\\.[\\w-]+`));
    expect(mail.html).toContain('Acknowledge as Test engineer</a>');
    n.close();
  });

  it('when the alarm is still unacknowledged at 15 min, then supervisor and backup get step 2, which names who was told before', async () => {
    const clock = testClock(T0);
    const id = await raiseP1(t, clock, 'A2');
    const n = notifierFor(t, clock, catcher.port);
    clock.advance(15 * MIN);
    await n.runOnce();
    expect((await outboxOf(t, id)).map((o) => [o.step, o.status])).toEqual([[1, 'sent'], [2, 'sent']]);
    const mails = await mailFor(t, id);
    // One mail per person: step 1 to the engineer, step 2 to the supervisor and the backup separately.
    expect(mails.map((m) => m.subject.slice(-8))).toEqual(['(step 1)', '(step 2)', '(step 2)']);
    expect(mails.slice(1).map((m) => m.envelope.to).sort()).toEqual([['okoro.bright@kestrel.example'], ['t-supervisor@test.example']]);
    expect(mails[1].text).toMatch(/Test engineer \(First call\), step 1/);
    const notes = await t.sequelize.query<{ comment: string }>("SELECT comment FROM alarm_events WHERE instance_id = ? AND kind = 'escalated' ORDER BY id", { replacements: [id], type: QueryTypes.SELECT });
    expect(notes.map((e) => e.comment)).toEqual([
      'Escalation step 1: e-mail to Test engineer (First call)',
      'Escalation step 2: e-mail to Test supervisor (Shift supervisor), Okoro Bright (Backup)',
    ]);
    n.close();
  });

  it('when the alarm is acknowledged after step 1, then no later step is sent', async () => {
    const clock = testClock(T0);
    const id = await raiseP1(t, clock, 'A3');
    const n = notifierFor(t, clock, catcher.port);
    clock.advance(6 * MIN);
    await n.runOnce();
    await applyAction(t.sequelize, { instanceId: id, action: 'acknowledge', at: clock.now(), actor: { userId: t.users.supervisor, name: 'Test supervisor', how: 'screen' } });
    clock.advance(30 * MIN);
    expect(await n.runOnce()).toMatchObject({ queued: 0, sent: 0 });
    expect((await outboxOf(t, id)).map((o) => o.step)).toEqual([1]);
    expect(await mailFor(t, id)).toHaveLength(1);
    n.close();
  });

  it('when SMTP is down for a while and then comes back, then the mail is sent exactly once, within a minute of recovery', async () => {
    const clock = testClock(T0);
    const id = await raiseP1(t, clock, 'A4');
    const port = await freePort();
    const n = notifierFor(t, clock, port);
    clock.advance(5 * MIN);
    expect(await n.runOnce()).toMatchObject({ queued: 1, failed: 1 });
    // Five minutes of outage, trying whenever the outbox says so.
    for (let s = 0; s < 300; s += 10) {
      clock.advance(10_000);
      await n.runOnce();
    }
    const [row] = await outboxOf(t, id);
    expect(row.status).toBe('pending');
    expect(row.attempts).toBeGreaterThan(3);
    expect(new Date(row.next_attempt_at).getTime() - clock.ms()).toBeLessThanOrEqual(defaultBackoffMs(row.attempts));
    expect(defaultBackoffMs(100)).toBeLessThanOrEqual(60_000);
    const back = await startCatcher(t, port);
    try {
      let sentAfterMs = -1;
      for (let s = 0; s <= 120 && sentAfterMs < 0; s += 5) {
        if ((await n.runOnce()).sent === 1) sentAfterMs = s * 1000;
        clock.advance(5000);
      }
      expect(sentAfterMs).toBeGreaterThanOrEqual(0);
      expect(sentAfterMs).toBeLessThanOrEqual(60_000);
      clock.advance(10 * MIN);
      await n.runOnce();
      expect((await mailFor(t, id)).map((m) => m.subject.slice(-8))).toEqual(['(step 1)', '(step 2)', '(step 2)']);
      expect((await outboxOf(t, id)).map((o) => o.status)).toEqual(['sent', 'sent']);
    } finally {
      n.close();
      await back.close();
    }
  });

  it('when the notifier restarts during an escalation, or two run at once, then no step is sent twice and none is lost', async () => {
    const clock = testClock(T0);
    const id = await raiseP1(t, clock, 'A5');
    clock.advance(5 * MIN);
    const first = notifierFor(t, clock, catcher.port);
    const second = notifierFor(t, clock, catcher.port);
    await Promise.all([first.runOnce(), second.runOnce(), first.runOnce()]);
    first.close();
    // A worker dies mid-send of step 2: the row is left claimed ('sending').
    clock.advance(10 * MIN);
    const dying = notifierFor(t, clock, await freePort());
    await dying.runOnce();
    dying.close();
    await t.sequelize.query("UPDATE mail_outbox SET status = 'sending', claimed_until = ? WHERE instance_id = ? AND step = 2", { replacements: [new Date(clock.ms() + 2 * MIN), id] });
    const restarted = notifierFor(t, clock, catcher.port);
    expect((await restarted.runOnce()).sent).toBe(0);
    clock.advance(2 * MIN + 1000);
    expect((await restarted.runOnce()).sent).toBe(1);
    clock.advance(30 * MIN);
    await Promise.all([restarted.runOnce(), second.runOnce()]);
    restarted.close();
    second.close();
    expect((await mailFor(t, id)).map((m) => m.subject.slice(-8))).toEqual(['(step 1)', '(step 2)', '(step 2)']);
  });

  it('when nobody is on call for a step, then the outbox and the alarm history say so and nothing is sent', async () => {
    const clock = testClock(T0 + 10 * 86_400_000);
    const id = await raiseP1(t, clock, 'A6');
    const n = notifierFor(t, clock, catcher.port);
    clock.advance(5 * MIN);
    expect(await n.runOnce()).toMatchObject({ queued: 1, sent: 0 });
    expect((await outboxOf(t, id))[0].status).toBe('no-recipient');
    n.close();
  });

  it('when the admin opens caught mail, then the escalation messages are listed; other roles are refused', async () => {
    const res = await request(t.app).get('/api/admin/mail').set('Cookie', t.cookies.admin);
    expect(res.status).toBe(200);
    expect(res.body.mail.length).toBeGreaterThanOrEqual(5);
    expect(res.body.mail[0]).toMatchObject({ subject: expect.stringMatching(/^P1 /), envelope: { to: expect.any(Array) } });
    expect((await request(t.app).get('/api/admin/mail').set('Cookie', t.cookies.supervisor)).status).toBe(403);
  });
});
