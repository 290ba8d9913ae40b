/**
 * Scale-out acceptance (README "Scaling out"): 2 ingest workers on site slices,
 * 2 API nodes sharing socket.io through Redis, 2 notifiers under one lease, all on loopback
 * as real processes. Runs in CI (CI=true) and with FERRISIGHT_SCALE=1; see vite.config.ts.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { io } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sliceOf } from '../../ingest/slices.ts';
import { createIngestPool, type Pool } from '../../api/src/db/pool.ts';
import { listCaughtMail } from '../../api/src/modules/notify/mail-store.ts';
import { startMailCatcher, type MailCatcher } from '../../simulators/mail-catcher.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';
import { compareStored, formatComparison, waitForCount } from '../reliability/lib/compare.ts';
import { drive } from '../reliability/lib/rig.ts';
import { NumberedStream } from '../reliability/lib/stream.ts';
import { startCluster, type Cluster } from './lib/cluster.ts';
import { addAlarmTanks, connectDevice, leaseHolder, raiseAlarms, sitesOnSlices, waitFor, type AlarmTank, type ScaleSite } from './lib/plant.ts';
import { closeWatchers, connectWatchers, missing, watcherToken, type Watcher } from './lib/watchers.ts';

let db: TestDatabase;
let pool: Pool;
let catcher: MailCatcher;
let mailDir: string;
let cluster: Cluster;
let sites: ScaleSite[];
let alarmTanks: AlarmTank[];
let watchers: Watcher[] = [];
let token: string;

beforeAll(async () => {
  db = await createTestDatabase();
  pool = createIngestPool(db.databaseUrl, 4);
  sites = await sitesOnSlices(pool, 2, 10);
  expect(sites.map((s) => sliceOf(s.tag, 2))).toEqual([1, 2]);
  alarmTanks = await addAlarmTanks(pool, db.databaseUrl, sites, 4);
  mailDir = mkdtempSync(path.join(os.tmpdir(), 'fs-scale-mail-'));
  catcher = await startMailCatcher({ port: 0, dir: mailDir });
  cluster = await startCluster({ databaseUrl: db.databaseUrl, apiNodes: 2, workers: 2, notifiers: 2, smtpPort: catcher.port, sliceBy: 'site', leaseTtlS: 3 });
  for (const s of sites) await s.waitLive(cluster.mqttPort);
  token = await watcherToken(pool);
  watchers = await connectWatchers(cluster.apiPorts, 3, token);
}, 300_000);

afterAll(async () => {
  closeWatchers(watchers);
  await cluster?.close();
  await catcher?.close();
  await pool?.end();
  await db?.drop();
  if (mailDir) rmSync(mailDir, { recursive: true, force: true });
});

describe('two ingest workers, two API nodes, Redis, on loopback', () => {
  it('when both sites stream numbered readings and the worker of slice 1 is killed and restarted, then every reading is stored exactly once', async () => {
    const streams = sites.map((s) => new NumberedStream({ siteTag: s.tag, probes: s.probes }));
    const devices = await Promise.all(sites.map((s) => connectDevice(cluster.mqttPort, s, `scale-stream-${s.tag}`)));
    let killed = false;
    let restarted = false;
    const runs = await Promise.all(streams.map((stream, i) => drive(devices[i]!, stream, {
      readingsPerS: 800, batch: 20, durationMs: 10_000,
      during: async (ms) => {
        if (i !== 0) return;
        if (!killed && ms > 3_000) {
          killed = true;
          await cluster.kill(cluster.workers[0]!);
        } else if (killed && !restarted && ms > 6_000) {
          restarted = true;
          cluster.startWorker(0);
        }
      },
    })));
    await Promise.all(runs.map((r) => r.acked));
    expect(restarted).toBe(true);
    for (const [i, stream] of streams.entries()) {
      await waitForCount(pool, stream.sent.snapshot(), 60_000);
      const c = await compareStored(pool, stream.sent.snapshot());
      expect(c.ok, formatComparison(sites[i]!.tag, c)).toBe(true);
      expect(c.lost).toBe(0);
      expect(c.duplicated).toBe(0);
    }
    await Promise.all(devices.map((d) => d.endAsync(true)));
  }, 120_000);

  it('when alarms are raised by both workers, then every socket.io client on either node receives every alarm event', async () => {
    const ids = await raiseAlarms(pool, cluster.mqttPort, alarmTanks.slice(0, 3));
    await waitFor(() => missing(watchers, ids).length === 0, 15_000).catch(() => undefined);
    expect(missing(watchers, ids)).toEqual([]);
    // One copy per client, not one per node: only the lease holder broadcasts.
    expect(watchers.reduce((n, w) => n + w.repeats, 0)).toBe(0);
  }, 60_000);

  it('when the notifier holding the lease is killed, then the other takes over and each alarm is mailed exactly once', async () => {
    const firstIds = alarmTanks.slice(0, 3).map((t) => t.definitionId);
    const mailsFor = async () => (await listCaughtMail(mailDir, 1000)).map((m) => Number(m.headers['x-ferrisight-alarm']));
    const instances = async (defs: number[]) => ((await pool.query(`SELECT id FROM alarm_instances WHERE definition_id IN (${defs.join(',')})`)) as { id: number }[]).map((r) => r.id);
    const first = await instances(firstIds);
    await waitFor(async () => {
      const mailed = await mailsFor();
      return first.every((id) => mailed.includes(id));
    }, 30_000);

    const holder = await leaseHolder(pool, 'notifier');
    const victim = cluster.notifiers.findIndex((n) => n?.pid === holder);
    expect(victim).toBeGreaterThanOrEqual(0);
    await cluster.kill(cluster.notifiers[victim]!);
    const ids = await raiseAlarms(pool, cluster.mqttPort, alarmTanks.slice(3, 6));
    await waitFor(() => missing(watchers, ids).length === 0, 15_000).catch(() => undefined);
    expect(missing(watchers, ids)).toEqual([]);

    const all = await instances(alarmTanks.slice(0, 6).map((t) => t.definitionId));
    await waitFor(async () => new Set(await mailsFor()).size >= all.length, 45_000).catch(() => undefined);
    const mailed = await mailsFor();
    expect([...new Set(mailed)].sort()).toEqual([...all].sort());
    expect(mailed.length, 'one mail per (alarm, step)').toBe(all.length);
    expect(await leaseHolder(pool, 'notifier')).toBe(cluster.notifiers[1 - victim]!.pid);
  }, 120_000);

  it('when a dashboard loses its connection and comes back on the other node, then connection-state recovery hands it the alarm it missed', async () => {
    const [w] = await connectWatchers([cluster.apiPorts[0]!], 1, token);
    // Recovery needs one packet received first (socket.io docs): a first alarm while connected.
    const seen = await raiseAlarms(pool, cluster.mqttPort, [alarmTanks[6]!]);
    await waitFor(() => missing([w!], seen).length === 0, 15_000);
    // socket.io-client keeps its session id and stream offset in these fields; a balancer would move it for us.
    const session = w!.socket as unknown as { _pid: string; _lastOffset: string };
    const { _pid: pid, _lastOffset: offset } = session;
    w!.socket.io.reconnection(false);
    w!.socket.io.engine.close(); // a dropped transport, not a sign-out: the server keeps the session
    const missed = await raiseAlarms(pool, cluster.mqttPort, [alarmTanks[7]!]);
    // Broadcast (the other dashboards have it) while this one was away: only recovery can bring it now.
    await waitFor(() => missing(watchers, missed).length === 0, 15_000);
    const again = io(`http://127.0.0.1:${cluster.apiPorts[1]}`, { transports: ['websocket'], auth: { token }, autoConnect: false });
    Object.assign(again, { _pid: pid, _lastOffset: offset });
    const got: number[] = [];
    again.on('alarm:event', (e: { id: number }) => got.push(e.id));
    await new Promise<void>((resolve, reject) => {
      again.once('connect', () => resolve());
      again.once('connect_error', reject);
      again.connect();
    });
    try {
      expect(again.recovered).toBe(true);
      await waitFor(() => missed.every((id) => got.includes(id)), 10_000).catch(() => undefined);
      expect(got).toEqual(expect.arrayContaining(missed));
    } finally {
      again.close();
      w!.socket.close();
    }
  }, 60_000);
});
