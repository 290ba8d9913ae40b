/**
 * A Ferrisight cluster on loopback for the scale test and `npm run bench:scale`: Redis, the
 * broker, N ingest workers on their slices, M API nodes sharing socket.io through Redis, and
 * K notifiers under one lease — each a real child process (tests/reliability/lib/procs.ts),
 * so SIGKILL means what it means on a plant.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { startMosquitto } from '../../../scripts/lib/mosquitto.ts';
import { startRedis } from '../../../scripts/lib/redis.ts';
import { findFreePort } from '../../../scripts/lib/ports.ts';
import { kill9, SERVICE_PASSWORD, spawnPart, startBrokerProcess, waitForPort, type Child } from '../../reliability/lib/procs.ts';

export const JWT_SECRET = 'scale-test-secret-that-is-long-enough-0123456789';

export type ClusterOptions = {
  databaseUrl: string;
  apiNodes: number;
  workers: number;
  notifiers?: number;
  sliceBy?: 'site' | 'probe';
  /** SMTP port of a mail catcher; notifiers only start with one. */
  smtpPort?: number;
  leaseTtlS?: number;
  /** No Redis with one API node unless asked: the single-node setup has none. */
  redis?: boolean;
  extraEnv?: NodeJS.ProcessEnv;
  /** 'mosquitto': Debian's mosquitto 2 stands in for a site's broker and the workers share one subscription. */
  broker?: 'embedded' | 'mosquitto';
  /** mosquitto only: device accounts (password DEVICE_PASSWORD of the scale plant), each allowed its site's topics. */
  devices?: { username: string; password: string; siteTag: string }[];
  /** false: the workers wait for startWorker(i) (a benchmark measures the bare broker first). */
  startWorkers?: boolean;
};

export type Cluster = {
  mqttPort: number;
  apiPorts: number[];
  /** Process ids of the API nodes, in apiPorts order (CPU and memory figures). */
  apiPids: number[];
  redisUrl?: string;
  workers: (Child | null)[];
  notifiers: (Child | null)[];
  startWorker(i: number): Child;
  startNotifier(i: number): Child;
  kill(child: Child | null): Promise<void>;
  close(): Promise<void>;
};

export async function startCluster(o: ClusterOptions): Promise<Cluster> {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'fs-scale-'));
  const useRedis = o.redis ?? o.apiNodes > 1;
  const redis = useRedis ? await startRedis(path.join(dir, 'redis'), await findFreePort()) : undefined;
  const mqttPort = await findFreePort();
  const mosquitto = o.broker === 'mosquitto'
    ? await startMosquitto(path.join(dir, 'mosquitto'), mqttPort, [
      { username: 'ferrisight-service', password: SERVICE_PASSWORD, write: ['#'], read: ['#'] },
      ...(o.devices ?? []).map((d) => ({ username: d.username, password: d.password, write: [`ferrisight/v1/${d.siteTag}/#`], read: [] })),
    ])
    : null;
  const broker = mosquitto ? null : await startBrokerProcess({ port: mqttPort, dataDir: dir, databaseUrl: o.databaseUrl });
  const common: NodeJS.ProcessEnv = {
    DATABASE_URL: o.databaseUrl, MQTT_URL: `mqtt://127.0.0.1:${mqttPort}`, SERVICE_MQTT_PASSWORD: SERVICE_PASSWORD,
    JWT_SECRET, FERRISIGHT_DATA_DIR: dir, LEASE_TTL_S: String(o.leaseTtlS ?? 3), WEB_DIST: path.join(dir, 'no-web'), ...o.extraEnv,
  };
  if (redis) common.REDIS_URL = redis.url;

  const apiPorts: number[] = [];
  const apis: Child[] = [];
  for (let k = 0; k < o.apiNodes; k += 1) {
    const port = await findFreePort();
    apiPorts.push(port);
    apis.push(spawnPart('api/src/server.ts', { ...common, PORT: String(port), FERRISIGHT_PROC: `api${k + 1}` }));
  }

  const cluster: Cluster = {
    mqttPort, apiPorts, apiPids: apis.map((a) => a.pid), redisUrl: redis?.url, workers: [], notifiers: [],
    startWorker(i) {
      const slice = o.workers > 1 ? { INGEST_SLICE: `${i + 1}/${o.workers}`, INGEST_SLICE_BY: o.sliceBy ?? 'site' } : {};
      if (mosquitto && o.workers > 1) Object.assign(slice, { INGEST_SHARED_GROUP: 'ferrisight-ingest' });
      const child = spawnPart('ingest/worker.ts', { ...common, INGEST_CLIENT_ID: 'ferrisight-ingest-scale', FERRISIGHT_PROC: `ingest${i + 1}`, ...slice });
      cluster.workers[i] = child;
      return child;
    },
    startNotifier(i) {
      const child = spawnPart('api/src/workers/notifier.ts', { ...common, SMTP_URL: `smtp://127.0.0.1:${o.smtpPort}`, FERRISIGHT_PROC: `notify${i + 1}` });
      cluster.notifiers[i] = child;
      return child;
    },
    async kill(child) {
      if (child) await kill9(child);
    },
    async close() {
      const all = [...cluster.notifiers, ...cluster.workers, ...apis, broker].filter((c): c is Child => c != null);
      await Promise.all(all.map((c) => kill9(c)));
      await redis?.stop();
      await mosquitto?.stop();
      rmSync(dir, { recursive: true, force: true });
    },
  };
  if (o.startWorkers !== false) for (let i = 0; i < o.workers; i += 1) cluster.startWorker(i);
  if (o.smtpPort) for (let i = 0; i < (o.notifiers ?? 0); i += 1) cluster.startNotifier(i);
  try {
    await Promise.all(apiPorts.map((port, k) => Promise.race([
      // Generous: under a loaded CI box tsx compiles the API cold in each process.
      waitForPort(port, 120_000),
      apis[k]!.exited.then((code) => { throw new Error(`API node ${k + 1} exited (${code}):\n${apis[k]!.lines.join('\n')}`); }),
    ])));
  } catch (err) {
    await cluster.close();
    throw err;
  }
  return cluster;
}
