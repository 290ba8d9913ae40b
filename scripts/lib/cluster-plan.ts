import path from 'node:path';
import type { PartSpec } from './children.ts';
import { parsePort } from './ports.ts';
import { prepareRedis, waitForRedis } from './redis.ts';

/**
 * `npm run start:cluster` (scripts/run-plant.ts --cluster): which parts run how many times.
 * The supervisor's machinery (ports check, restarts, ordered stop) is unchanged; this only
 * turns one part spec into several, with the settings that make them a cluster
 * (README "Scaling out").
 */
export type ClusterSettings = { REDIS_PORT: number; API_NODE_PORT: number; API_NODES: number; INGEST_WORKERS: number };

function count(name: string, value: string | undefined, fallback: number): number {
  if (value === undefined || value === '') return fallback;
  const n = Number(value);
  if (!Number.isInteger(n) || n < 1 || n > 16) throw new Error(`${name}=${value} must be a whole number from 1 to 16`);
  return n;
}

export function clusterSettings(env: NodeJS.ProcessEnv): ClusterSettings {
  return {
    REDIS_PORT: parsePort('REDIS_PORT', env.REDIS_PORT, 8474),
    API_NODE_PORT: parsePort('API_NODE_PORT', env.API_NODE_PORT, 8480),
    API_NODES: count('API_NODES', env.API_NODES, 2),
    INGEST_WORKERS: count('INGEST_WORKERS', env.INGEST_WORKERS, 2),
  };
}

/** The extra ports the cluster binds, for the supervisor's "is it free" check. */
export function clusterPorts(s: ClusterSettings, privateRedis: boolean): [string, number][] {
  const out: [string, number][] = [];
  if (privateRedis) out.push(['REDIS_PORT', s.REDIS_PORT]);
  for (let k = 0; k < s.API_NODES; k += 1) out.push([k === 0 ? 'API_NODE_PORT' : `API_NODE_PORT (+${k})`, s.API_NODE_PORT + k]);
  return out;
}

/** The private redis-server as a supervised part, or the site's Redis (REDIS_URL) as is. */
export function clusterRedis(redisUrl: string | undefined, dir: string, port: number, root: string): { url: string; part?: PartSpec; ready: Promise<void> } {
  if (redisUrl) return { url: redisUrl, ready: Promise.resolve() };
  const { command, url } = prepareRedis(dir, port);
  return { url, part: { name: 'redis', command, cwd: root, env: { PATH: process.env.PATH } }, ready: waitForRedis(url) };
}

/**
 * One spec → the cluster's copies: API nodes on their own ports plus the balancer on PORT;
 * ingest workers with their slice (each slice its own MQTT session); notifiers, of which one
 * works at a time (database lease) and the others stand by. Everything else runs once.
 */
export function clusterParts(one: PartSpec, s: ClusterSettings & { PORT: number }, redisUrl: string): PartSpec[] {
  const copy = (name: string, extra: NodeJS.ProcessEnv): PartSpec => ({ ...one, name, env: { ...one.env, FERRISIGHT_PROC: name, ...extra } });
  const base = one.name;
  const range = (n: number) => Array.from({ length: n }, (_, k) => k + 1);
  if (base === 'api') {
    const nodes = range(s.API_NODES).map((k) => copy(`api${k}`, { PORT: String(s.API_NODE_PORT + k - 1), REDIS_URL: redisUrl, TRUST_PROXY: one.env.TRUST_PROXY ?? 'loopback' }));
    const targets = nodes.map((n) => `http://127.0.0.1:${n.env.PORT}`).join(',');
    const lb: PartSpec = {
      ...one, name: 'lb', command: [...one.command.slice(0, -1), path.join(one.cwd, 'scripts/balancer.ts')],
      env: { ...one.env, FERRISIGHT_PROC: 'lb', BALANCER_PORT: String(s.PORT), BALANCER_TARGETS: targets },
    };
    return [...nodes, lb];
  }
  if (base === 'ingest') {
    // The demo is one site, so slicing by probe is what spreads its load; a multi-plant site sets INGEST_SLICE_BY=site.
    const by = one.env.INGEST_SLICE_BY ?? 'probe';
    return range(s.INGEST_WORKERS).map((k) => copy(`ingest${k}`, { INGEST_SLICE: `${k}/${s.INGEST_WORKERS}`, INGEST_SLICE_BY: by }));
  }
  if (base === 'notifier') return range(2).map((k) => copy(`notify${k}`, {}));
  return [one];
}
