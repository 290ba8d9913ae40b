/**
 * The SMTP relay (here the real mail catcher) is down while escalation
 * mail falls due → after it comes back, each due mail is sent exactly once, within 2 minutes.
 * Short form: 20 s outage; FERRISIGHT_LONG=1: 5 minutes. The notifier runs as the notifier
 * process does (createNotifier().runOnce() in a loop), with its default retry backoff.
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { applyAction } from '../../api/src/modules/alarms/lifecycle.ts';
import { createNotifier } from '../../api/src/modules/notify/notifier.ts';
import { findFreePort } from '../../scripts/lib/ports.ts';
import { startMailCatcher, type MailCatcher } from '../../simulators/mail-catcher.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';
import { sleep } from './lib/procs.ts';

const LONG = process.env.FERRISIGHT_LONG === '1';
const DOWN_MS = LONG ? 5 * 60_000 : 20_000;

let t: TestApi;
let catcher: MailCatcher | undefined;
const mailDir = mkdtempSync(path.join(os.tmpdir(), 'fs-mail-'));

beforeAll(async () => {
  t = await createTestApi();
});

afterAll(async () => {
  await catcher?.close();
  await t?.close();
  rmSync(mailDir, { recursive: true, force: true });
});

type Outbox = { id: number; status: string; message_id: string; sent_at: Date | null; attempts: number; recipients: number };

describe('escalation mail across an SMTP outage', () => {
  it(`when the SMTP catcher is down for ${DOWN_MS / 1000} s while mail falls due, then each due mail is sent once within 2 minutes of recovery`, async () => {
    const port = await findFreePort();
    const notifier = createNotifier({
      sequelize: t.sequelize, smtpUrl: `smtp://127.0.0.1:${port}`, mailFrom: 'Ferrisight <ferrisight@localhost>',
      publicUrl: 'http://127.0.0.1:8470', ackSecret: 'smtp-outage-test-secret-0123456789abcdef',
    });
    // Alarms that went off two hours ago and nobody acknowledged: every escalation step is due now.
    const defs = await t.sequelize.query<{ id: number }>('SELECT id FROM alarm_definitions ORDER BY id LIMIT 5', { type: QueryTypes.SELECT });
    for (const d of defs) {
      const r = await applyAction(t.sequelize, { definitionId: d.id, action: 'activate', at: new Date(Date.now() - 2 * 3_600_000), actor: { userId: null, name: null, how: 'automatic' }, value: 30 });
      expect(r.ok).toBe(true);
    }
    let stop = false;
    let passes = 0;
    const loop = (async () => {
      while (!stop) {
        await notifier.runOnce().catch(() => undefined);
        passes += 1;
        await sleep(1_000);
      }
    })();

    await sleep(DOWN_MS);
    const failedWhileDown = await t.sequelize.query<{ n: number }>("SELECT COUNT(*) AS n FROM mail_outbox WHERE status = 'pending' AND attempts > 0", { type: QueryTypes.SELECT });
    catcher = await startMailCatcher({ port, dir: mailDir });
    const recoveredAt = Date.now();
    const due = async () => t.sequelize.query<Outbox>("SELECT id, status, message_id, sent_at, attempts, JSON_LENGTH(recipients) AS recipients FROM mail_outbox WHERE status <> 'no-recipient' ORDER BY id", { type: QueryTypes.SELECT });
    let rows = await due();
    while (Date.now() - recoveredAt < 150_000 && (rows.length === 0 || rows.some((r) => r.status !== 'sent'))) {
      await sleep(500);
      rows = await due();
    }
    const lastSentMs = Math.max(...rows.map((r) => new Date(r.sent_at ?? 0).getTime())) - recoveredAt;
    stop = true;
    await loop;
    notifier.close();

    const caught = readdirSync(mailDir).filter((f) => f.endsWith('.json')).map((f) => JSON.parse(readFileSync(path.join(mailDir, f), 'utf8')) as { messageId: string | null });
    const perMessage = new Map<string, number>();
    for (const m of caught) perMessage.set(String(m.messageId), (perMessage.get(String(m.messageId)) ?? 0) + 1);
    console.log(`SMTP down ${DOWN_MS / 1000} s: ${rows.length} due outbox rows (${failedWhileDown[0].n} had failed attempts while down), `
      + `all sent ${(lastSentMs / 1000).toFixed(1)} s after recovery; ${caught.length} caught, repeats ${[...perMessage.values()].filter((n) => n > 1).length}; ${passes} notifier passes`);

    expect(rows.length).toBeGreaterThan(0);
    expect(Number(failedWhileDown[0].n)).toBeGreaterThan(0);
    expect(rows.every((r) => r.status === 'sent')).toBe(true);
    expect(lastSentMs).toBeLessThanOrEqual(120_000);
    // Each recipient gets a message of their own, numbered within its (alarm, step): each exactly once.
    const expectedIds = rows.flatMap((r) => Array.from({ length: Number(r.recipients) }, (_, i) => r.message_id.replace('@', `-${i + 1}@`)));
    expect(caught.length).toBe(expectedIds.length);
    expect([...perMessage.keys()].sort()).toEqual(expectedIds.sort());
  }, DOWN_MS + 200_000);
});
