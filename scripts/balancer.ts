/**
 * A tiny round-robin load balancer for `npm run start:cluster`: one address (PORT) in front
 * of the API nodes, built on http-proxy. On a site, use the balancer you already run (nginx,
 * HAProxy, a cloud LB); the only requirement is that it passes websocket upgrades.
 * No sticky sessions: in cluster mode socket.io accepts websocket only, so a live connection
 * is one TCP connection to one node (api/src/cluster/socket-cluster.ts).
 *   BALANCER_PORT=8470  BALANCER_TARGETS=http://127.0.0.1:8480,http://127.0.0.1:8481
 *   node --import tsx scripts/balancer.ts
 */
import http from 'node:http';
import type { Duplex } from 'node:stream';
import httpProxy from 'http-proxy';
import { createLogger } from '../api/src/lib/logger.ts';

const log = createLogger('lb');
const port = Number(process.env.BALANCER_PORT ?? 8470);
const targets = (process.env.BALANCER_TARGETS ?? '').split(',').map((t) => t.trim()).filter(Boolean);
if (targets.length === 0 || !Number.isInteger(port)) {
  log.fatal('BALANCER_TARGETS (comma-separated URLs) and BALANCER_PORT are required');
  process.exit(1);
}

/** A node that refused a connection is skipped for this long, so a restarting node costs one error, not one in N. */
const DOWN_MS = 2_000;
const downUntil = new Map<string, number>();
let next = 0;

function pick(exclude?: string): string {
  const now = Date.now();
  for (let i = 0; i < targets.length; i += 1) {
    const t = targets[next++ % targets.length]!;
    if (t !== exclude && (downUntil.get(t) ?? 0) <= now) return t;
  }
  return targets[next++ % targets.length]!;
}

// xfwd: the API nodes trust X-Forwarded-For from loopback (TRUST_PROXY=loopback, set by start:cluster), so sign-in limits and logs see the real client.
const proxy = httpProxy.createProxyServer({ xfwd: true, proxyTimeout: 60_000 });
type Tagged = { target?: string; retried?: boolean };

const server = http.createServer((req, res) => {
  const target = pick();
  (req as Tagged).target = target;
  proxy.web(req, res, { target });
});

proxy.on('error', (err, req, resOrSocket) => {
  const r = req as http.IncomingMessage & Tagged;
  const code = (err as NodeJS.ErrnoException).code;
  // A node starting or restarting refuses many requests in a row: one log line per down spell.
  const known = r.target !== undefined && (downUntil.get(r.target) ?? 0) > Date.now();
  if (r.target && (code === 'ECONNREFUSED' || code === 'ECONNRESET')) downUntil.set(r.target, Date.now() + DOWN_MS);
  // A request without a body that never reached a node is safe to send to the next one.
  const res = resOrSocket as http.ServerResponse;
  if (typeof res.writeHead === 'function' && !res.headersSent && !r.retried && (r.method === 'GET' || r.method === 'HEAD') && code === 'ECONNREFUSED') {
    r.retried = true;
    r.target = pick(r.target);
    return proxy.web(r, res, { target: r.target });
  }
  if (!known) log.warn({ target: r.target, err: err.message, url: r.url?.split('?')[0] }, 'proxy error');
  if (typeof res.writeHead === 'function') {
    if (!res.headersSent) res.writeHead(502, { 'content-type': 'application/json' });
    res.end(JSON.stringify({ error: { code: 'bad_gateway', message: 'No API node answered' } }));
  } else {
    (resOrSocket as Duplex).destroy();
  }
});

server.on('upgrade', (req, socket, head) => {
  const target = pick();
  (req as Tagged).target = target;
  socket.on('error', () => socket.destroy());
  proxy.ws(req, socket, head, { target });
});

server.on('error', (err: NodeJS.ErrnoException) => {
  log.fatal(err.code === 'EADDRINUSE' ? `Port ${port} is taken: set PORT to a free port` : err.message);
  process.exit(1);
});
server.listen(port, '127.0.0.1', () => log.info({ port, targets }, 'balancer listening'));

const stop = () => {
  server.close();
  proxy.close();
  setTimeout(() => process.exit(0), 500).unref();
};
process.once('SIGTERM', stop);
process.once('SIGINT', stop);
