import net from 'node:net';

/** True when nothing listens on host:port (we could bind it ourselves). */
export function isPortFree(port: number, host = '127.0.0.1'): Promise<boolean> {
  return new Promise((resolve) => {
    const srv = net.createServer();
    srv.unref();
    srv.once('error', () => resolve(false));
    srv.listen({ port, host, exclusive: true }, () => srv.close(() => resolve(true)));
  });
}

/** A port the kernel considers free right now. */
export function findFreePort(host = '127.0.0.1'): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.unref();
    srv.once('error', reject);
    srv.listen({ port: 0, host, exclusive: true }, () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** A free port near `port` (port+10, +20, …) for the hint in a "port is taken" message. */
export async function suggestPort(port: number, avoid: number[] = []): Promise<number> {
  for (let p = port + 10; p < port + 200 && p <= 65535; p += 10) {
    if (!avoid.includes(p) && (await isPortFree(p))) return p;
  }
  return findFreePort();
}

/** Parses a port setting; throws a one-line message for bad values. */
export function parsePort(name: string, value: string | undefined, fallback: number): number {
  if (value === undefined || value === '') return fallback;
  const n = Number(value);
  if (!Number.isInteger(n) || n < 1 || n > 65535) throw new Error(`${name}=${value} is not a port number (1-65535)`);
  return n;
}
