import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { PartState } from '../../shared/schemas/ingest-health.ts';
import { judgeIngest, type IngestWatchInput } from '../../api/src/modules/system-alarms/ingest-watch.ts';
import { createIngestWatch } from '../../api/src/modules/system-alarms/ingest-watch.service.ts';
import { systemAlarmsRepository as beats } from '../../api/src/modules/system-alarms/system-alarms.repository.ts';
import type { MailCatcher } from '../../simulators/mail-catcher.ts';
import { ackLinkIn, mailFor, notifierFor, startCatcher, testRoster } from './escalation-helpers.ts';
import { createAlarmTestApi, MIN, testClock, type AlarmTestApi } from './helpers.ts';

/**
 * The plant-wide "ingest stopped" alarm: raised from the workers' own heartbeats and the
 * supervisor's record of their exits, never from readings arriving, and carried by the same
 * lifecycle and escalation as a tank's alarm (ISA-18.2 states: activated → acknowledged → cleared).
 */
const T = 20_000;
const NOW = Date.parse('2026-12-04T10:00:00Z');
const ago = (ms: number) => new Date(NOW - ms).toISOString();
const part = (over: Partial<PartState> = {}): PartState => ({
  name: 'ingest', state: 'running', pid: 1234, restarts: 0, restartsLastHour: 0, lastExit: null, exitsInRow: 0, nextStartAt: null, since: ago(3_600_000), ...over,
});
const judge = (over: Partial<IngestWatchInput>) => judgeIngest({ beats: [], parts: null, nowMs: NOW, watchingMs: 3_600_000, thresholdMs: T, ...over });
const beat = (beatAgeMs: number, upMs = 3_600_000, worker = 'ferrisight-ingest-1') => ({ worker, beatAgeMs, upMs, stopped: false });

describe('judging the ingest workers', () => {
  it('when a worker beats on a site where no device sends anything, then nothing is wrong', () => {
    expect(judge({ beats: [beat(3_000)], parts: [part()] })).toMatchObject({ trouble: false, healthy: true });
  });

  it('when a heartbeat is older than the threshold, then it is trouble; just inside it, not', () => {
    expect(judge({ beats: [beat(T + 1000)] })).toMatchObject({ trouble: true, why: 'no heartbeat from ferrisight-ingest-1 for 21 s' });
    expect(judge({ beats: [beat(T - 1000)] }).trouble).toBe(false);
    // In a cluster one silent worker is enough: its slice's readings are not stored.
    expect(judge({ beats: [beat(1000, T, 'w-slice-1'), beat(T + 5000, T, 'w-slice-2')] }).why).toMatch(/w-slice-2/);
  });

  it('when the supervisor saw the worker exit twice in a row within the threshold, then it is trouble; one crash alone is not, nor healthy yet', () => {
    const exit = { at: ago(2_000), how: 'signal SIGKILL' };
    expect(judge({ beats: [beat(1000, 1000)], parts: [part({ exitsInRow: 2, lastExit: exit })] })).toMatchObject({ trouble: true, why: 'ingest exited 2 times in a row, last signal SIGKILL' });
    expect(judge({ beats: [beat(1000, 1000)], parts: [part({ exitsInRow: 1, lastExit: exit })] })).toMatchObject({ trouble: false, healthy: false });
  });

  it('when the kills stop, then it clears only once the worker has run the threshold with no exit in it', () => {
    const lastExit = { at: ago(T + 1000), how: 'signal SIGKILL' };
    expect(judge({ beats: [beat(1000, T - 1000)], parts: [part({ exitsInRow: 20, lastExit, since: ago(T - 1000) })] })).toMatchObject({ trouble: false, healthy: false });
    expect(judge({ beats: [beat(1000, T + 1000)], parts: [part({ exitsInRow: 20, lastExit, since: ago(T + 1000) })] })).toMatchObject({ trouble: false, healthy: true });
  });

  it('when the worker waits longer than the threshold for its next start (long back-off), then it is trouble', () => {
    const waiting = part({ state: 'restarting', exitsInRow: 25, lastExit: { at: ago(25_000), how: 'code 1' }, since: ago(25_000), nextStartAt: ago(-5_000) });
    expect(judge({ beats: [], parts: [waiting] }).why).toMatch(/waiting to restart/);
  });

  it('when a worker was stopped on purpose or the plant is stopping, then its silence is not trouble', () => {
    expect(judge({ beats: [{ ...beat(600_000), stopped: true }] }).trouble).toBe(false);
    expect(judge({ beats: [{ ...beat(600_000), stopped: true }], parts: [part({ state: 'stopped' })] }).trouble).toBe(false);
  });

  it('when the supervisor runs a worker that has never beaten, then it is trouble once a fresh watcher has waited the threshold', () => {
    expect(judge({ beats: [], parts: [part({ since: ago(60_000) })], watchingMs: 60_000 }).why).toMatch(/no heartbeat from any ingest worker/);
    expect(judge({ beats: [], parts: [part({ since: ago(60_000) })], watchingMs: 5_000 }).trouble).toBe(false);
    // No supervisor and no worker ever seen: nothing to judge (a site running its parts its own way).
    expect(judge({ beats: [], parts: null })).toMatchObject({ trouble: false, healthy: true });
  });
});

describe('the ingest-stopped alarm end to end (database, Alarm desk API, escalation mail)', () => {
  let t: AlarmTestApi;
  let catcher: MailCatcher;
  const WORKER = 'test-ingest';
  const setBeat = (column: 'beat_at' | 'started_at', agoS: number) =>
    t.sequelize.query(`UPDATE ingest_heartbeats SET ${column} = NOW(3) - INTERVAL ? SECOND WHERE worker = ?`, { replacements: [agoS, WORKER] });
  const openIngestAlarms = async () =>
    (await request(t.app).get('/api/alarms/active').set('Cookie', t.cookies.operator)).body.alarms.filter((a: { kind: string }) => a.kind === 'ingest-stopped');

  beforeAll(async () => {
    t = await createAlarmTestApi();
    await testRoster(t, NOW);
    catcher = await startCatcher(t);
  });
  afterAll(async () => {
    await catcher?.close();
    await t?.close();
  });

  it('when the worker beats, then no alarm; when it falls silent, the P1 is raised, reaches the Alarm desk, is mailed to the engineer on call and acknowledged by an operator; back and settled, it clears', async () => {
    const clock = testClock(NOW);
    const watch = createIngestWatch({ sequelize: t.sequelize, thresholdS: T / 1000, parts: async () => null });
    await beats.beat(t.sequelize, WORKER, true);
    await setBeat('started_at', 3600);
    expect((await watch.check(clock.ms())).changed).toBeNull();
    expect(await openIngestAlarms()).toEqual([]);

    await setBeat('beat_at', 30);
    const raised = await watch.check(clock.ms());
    expect(raised).toMatchObject({ changed: 'raised', verdict: { why: `no heartbeat from ${WORKER} for 30 s` } });
    expect((await watch.check(clock.ms())).changed).toBeNull();
    const [alarm] = await openIngestAlarms();
    expect(alarm).toMatchObject({ priority: 1, state: 'unacknowledged', tankId: null, tankTag: null, siteTag: null, label: 'Ingest stopped: readings are not being stored', firstValue: 30, limitValue: 20 });

    // The demo policy (common practice for a P1): the engineer on call after 5 min unacknowledged.
    const notifier = notifierFor(t, clock, catcher.port);
    clock.advance(5 * MIN);
    expect(await notifier.runOnce()).toMatchObject({ queued: 1, sent: 1 });
    notifier.close();
    const [mail] = await mailFor(t, alarm.id);
    expect(mail.envelope.to).toEqual(['t-engineer@test.example']);
    expect(mail.subject).toBe('P1 Plant: Ingest stopped: readings are not being stored, unacknowledged (step 1)');
    expect(mail.text).toMatch(/Where:\s+The whole plant: Ferrisight itself, not a tank/);
    expect(mail.text).not.toContain('Tank page');
    expect(ackLinkIn(mail, 'Test engineer')).toMatch(/\/ack\//);

    const ack = await request(t.app).post(`/api/alarms/instances/${alarm.id}/acknowledge`).set('Cookie', t.cookies.operator).set('X-Ferrisight-Csrf', '1').send({});
    expect(ack.status).toBe(200);
    expect(ack.body.alarm).toMatchObject({ state: 'acknowledged', tankTag: null });

    // Back, but just restarted: not cleared until it has run the threshold.
    await beats.beat(t.sequelize, WORKER, true);
    expect((await watch.check(clock.ms())).changed).toBeNull();
    await setBeat('started_at', T / 1000 + 1);
    expect((await watch.check(clock.ms())).changed).toBe('cleared');
    expect(await openIngestAlarms()).toEqual([]);
    const timeline = await t.sequelize.query<{ kind: string; how: string }>('SELECT kind, how FROM alarm_events WHERE instance_id = ? ORDER BY id', { replacements: [alarm.id], type: QueryTypes.SELECT });
    expect(timeline.map((e) => e.kind)).toEqual(['activated', 'escalated', 'acknowledged', 'cleared']);
  });

  it('when a worker stops cleanly, then it is no longer watched', async () => {
    const watch = createIngestWatch({ sequelize: t.sequelize, thresholdS: T / 1000, parts: async () => null });
    await beats.stopped(t.sequelize, WORKER);
    await setBeat('beat_at', 600);
    expect((await watch.check()).verdict.trouble).toBe(false);
    expect(await openIngestAlarms()).toEqual([]);
  });
});
