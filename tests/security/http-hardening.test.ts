/**
 * ASVS 3.4, 3.5, 4.4: helmet headers, CORS closed by default (no
 * Access-Control-Allow-Origin, preflights refused), no state change on GET (every GET route in
 * app.locals.routes, for every role, leaves every table's checksum unchanged), and CSRF: every
 * state-changing route without the X-Ferrisight-Csrf header is refused and changes nothing.
 */
import { createHash } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/src/app.ts';
import type { RouteInfo } from '../../api/src/lib/route-list.ts';
import { ROLES } from '../../shared/schemas/auth.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';

let t: TestApi;
let routes: RouteInfo[];

beforeAll(async () => {
  t = await createTestApi();
  routes = t.app.locals.routes as RouteInfo[];
});
afterAll(async () => t?.close());

/** A fingerprint per table: any INSERT, UPDATE or DELETE anywhere changes the map. */
async function checksums(): Promise<Record<string, string>> {
  // By content (row count and an order-free hash of every column), not CHECKSUM TABLE: MariaDB's
  // CHECKSUM TABLE of a table with a generated column changed after a plain SELECT of it.
  const cols = await t.sequelize.query<{ t: string; c: string }>(
    `SELECT c.table_name AS t, c.column_name AS c FROM information_schema.columns c
       JOIN information_schema.tables x ON x.table_schema = c.table_schema AND x.table_name = c.table_name
      WHERE c.table_schema = DATABASE() AND x.table_type = 'BASE TABLE' ORDER BY c.table_name, c.ordinal_position`, { type: QueryTypes.SELECT });
  const byTable = new Map<string, string[]>();
  for (const { t: table, c } of cols) byTable.set(table, [...(byTable.get(table) ?? []), c]);
  const sums: Record<string, string> = {};
  for (const [table, columns] of byTable) {
    const row = columns.map((c) => `COALESCE(HEX(\`${c}\`), '-')`).join(', ');
    const [r] = await t.sequelize.query<{ n: number; x: string }>(
      `SELECT COUNT(*) AS n, COALESCE(BIT_XOR(CRC32(CONCAT_WS('|', ${row}))), 0) AS x FROM \`${table}\``, { type: QueryTypes.SELECT });
    sums[table] = `${r!.n}:${r!.x}`;
  }
  return sums;
}

const concrete = (path: string) => path.replace(/:[A-Za-z]+/g, '1');

describe('security headers (helmet)', () => {
  it('when any API response goes out over plain http, then the hardening headers are there, without HSTS or upgrade-insecure-requests, and no inline styles are allowed', async () => {
    const res = await request(t.app).get('/api/plant').set('Cookie', t.cookies.operator);
    const csp = String(res.headers['content-security-policy']);
    expect(csp).toMatch(/default-src 'self'/);
    expect(csp).toMatch(/frame-ancestors 'none'|frame-ancestors 'self'/);
    expect(csp).toMatch(/object-src 'none'/);
    expect(csp).toMatch(/style-src 'self';/);
    expect(csp).not.toMatch(/unsafe-inline/);
    // Over http a LAN host name would otherwise be sent to https for every asset (a blank page).
    expect(csp).not.toMatch(/upgrade-insecure-requests/);
    expect(res.headers['strict-transport-security']).toBeUndefined();
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-frame-options']).toMatch(/SAMEORIGIN|DENY/);
    expect(res.headers['referrer-policy']).toBe('no-referrer');
    expect(res.headers['cross-origin-opener-policy']).toBe('same-origin');
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  it('when PUBLIC_URL is https, then HSTS of at least a year (ASVS 5.0 3.4.1) and upgrade-insecure-requests are sent', async () => {
    const app = createApp({ auth: t.auth, ttlS: 3600, https: true });
    const res = await request(app).get('/api/plant').set('Cookie', t.cookies.operator);
    expect(String(res.headers['content-security-policy'])).toMatch(/upgrade-insecure-requests/);
    expect(Number(/max-age=(\d+)/.exec(res.headers['strict-transport-security'])![1])).toBeGreaterThanOrEqual(31_536_000);
  });

  it('when the acknowledge page goes out, then its one style block is allowed by hash and nothing else inline is', async () => {
    const res = await request(t.app).get('/ack/not-a-token');
    const csp = String(res.headers['content-security-policy']);
    const style = /<style>([\s\S]*?)<\/style>/.exec(res.text)![1]!;
    expect(csp).toContain(`style-src 'sha256-${createHash('sha256').update(style).digest('base64')}'`);
    expect(csp).toMatch(/default-src 'none'/);
    expect(csp).not.toMatch(/unsafe-inline|script-src/);
  });
});

describe('socket.io accepts only the app\'s own pages (ASVS 5.0 4.4.2, Origin check)', () => {
  it('when a page from another origin connects with a valid session cookie, then it is refused; from the app\'s own origin it connects', async () => {
    const http = await import('node:http');
    const { io } = await import('socket.io-client');
    const { attachRealtime } = await import('../../api/src/realtime/socket.ts');
    const server = http.createServer(t.app);
    const rt = attachRealtime(server, t.auth);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
    const { port } = server.address() as { port: number };
    const tryConnect = (origin: string, transport: 'websocket' | 'polling') => new Promise<'connected' | string>((resolve) => {
      const s = io(`http://127.0.0.1:${port}`, { transports: [transport], reconnection: false, extraHeaders: { origin, cookie: t.cookies.operator }, timeout: 5000 });
      s.on('connect', () => (s.close(), resolve('connected')));
      s.on('connect_error', (err) => (s.close(), resolve(err.message)));
    });
    try {
      for (const transport of ['websocket', 'polling'] as const) {
        expect(await tryConnect('https://evil.example', transport), transport).not.toBe('connected');
        expect(await tryConnect(`http://127.0.0.1:${port + 1}`, transport), transport).not.toBe('connected');
        expect(await tryConnect('null', transport), transport).not.toBe('connected');
        expect(await tryConnect(`http://127.0.0.1:${port}`, transport), transport).toBe('connected');
      }
    } finally {
      await rt.close();
      await new Promise((r) => server.close(r));
    }
  });
});

describe('CORS closed by default', () => {
  it('when another origin reads the API, then no Access-Control-Allow-Origin comes back', async () => {
    const res = await request(t.app).get('/api/plant').set('Origin', 'https://evil.example').set('Cookie', t.cookies.admin);
    expect(res.headers['access-control-allow-origin']).toBeUndefined();
    expect(res.headers['access-control-allow-credentials']).toBeUndefined();
  });

  it('when another origin sends a preflight for any state-changing route, then it is not granted', async () => {
    for (const r of routes.filter((x) => x.method !== 'GET')) {
      const res = await request(t.app).options(concrete(r.path)).set('Origin', 'https://evil.example')
        .set('Access-Control-Request-Method', r.method).set('Access-Control-Request-Headers', 'x-ferrisight-csrf, content-type');
      expect(res.headers['access-control-allow-origin'], `${r.method} ${r.path}`).toBeUndefined();
      expect(res.headers['access-control-allow-methods'], `${r.method} ${r.path}`).toBeUndefined();
      expect(res.headers['access-control-allow-headers'], `${r.method} ${r.path}`).toBeUndefined();
    }
  });

  it('when another origin polls socket.io, then no Access-Control-Allow-Origin comes back either', async () => {
    // attachRealtime sets cors: { origin: false }; checked here through the engine's polling path.
    const http = await import('node:http');
    const { attachRealtime } = await import('../../api/src/realtime/socket.ts');
    const server = http.createServer(t.app);
    const rt = attachRealtime(server, t.auth);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
    try {
      const res = await request(server).get('/socket.io/?EIO=4&transport=polling').set('Origin', 'https://evil.example');
      expect(res.headers['access-control-allow-origin']).toBeUndefined();
    } finally {
      await rt.close();
      await new Promise((r) => server.close(r));
    }
  });
});

describe('no state change on GET (ASVS 3.5.3)', () => {
  it('when every GET route is called by every role, then no table changes', async () => {
    const gets = routes.filter((r) => r.method === 'GET');
    expect(gets.length).toBeGreaterThan(10);
    const before = await checksums();
    const statuses: string[] = [];
    for (const r of gets) {
      for (const role of ROLES) {
        const res = await request(t.app).get(concrete(r.path)).set('Cookie', t.cookies[role]);
        statuses.push(`${role} ${r.path} ${res.status}`);
        expect(res.status, `${role} GET ${r.path}`).not.toBe(500);
      }
    }
    const after = await checksums();
    const changed = Object.keys(before).filter((k) => before[k] !== after[k]);
    console.log(`${gets.length} GET routes × ${ROLES.length} roles: tables changed ${JSON.stringify(changed)}`);
    expect(changed).toEqual([]);
  }, 120_000);
});

describe('CSRF (ASVS 3.5.1–3.5.2)', () => {
  it('when any state-changing route is called without the X-Ferrisight-Csrf header, then it is refused with 403 and nothing changes', async () => {
    // /ack/:token (escalation mail) is outside the session: the signed single-use token in the URL is
    // the credential, so a cross-site request cannot forge it. Anything else outside /api must be looked at.
    const outside = routes.filter((r) => r.method !== 'GET' && !r.path.startsWith('/api/'));
    expect(outside.map((r) => `${r.method} ${r.path}`)).toEqual(['POST /ack/:token']);
    const writes = routes.filter((r) => r.method !== 'GET' && r.path.startsWith('/api/'));
    expect(writes.length).toBeGreaterThan(10);
    const before = await checksums();
    for (const r of writes) {
      for (const header of [undefined, '0', 'true']) {
        let req = request(t.app)[r.method.toLowerCase() as 'post'](concrete(r.path)).set('Cookie', t.cookies.admin);
        if (header !== undefined) req = req.set('X-Ferrisight-Csrf', header);
        const res = await req.send({});
        expect(res.status, `${r.method} ${r.path} with header ${header}`).toBe(403);
        expect(res.body.title, `${r.method} ${r.path}`).toBe('csrf');
      }
    }
    const after = await checksums();
    expect(Object.keys(before).filter((k) => before[k] !== after[k])).toEqual([]);
    console.log(`CSRF: ${writes.length} state-changing routes refused without the header`);
  }, 60_000);

  it('when a form-encoded cross-site POST arrives (what an HTML form can send), then it is refused', async () => {
    const res = await request(t.app).post('/api/users').set('Cookie', t.cookies.admin).type('form')
      .send('email=evil@x.example&name=Evil&role=admin&password=evil-password-123');
    expect(res.status).toBe(403);
  });
});
