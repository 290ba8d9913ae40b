import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { RouteInfo } from '../../api/src/lib/route-list.ts';
import { ROLES, type Role } from '../../shared/schemas/auth.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';

type Who = Role | 'anonymous';
const ALL: Role[] = [...ROLES];

/**
 * Every API route with the roles allowed to use it. A route added to the app but missing here
 * fails the coverage test below, so the matrix cannot silently fall behind.
 */
const MATRIX: Array<{ method: string; path: string; allowed: Role[]; body?: unknown }> = [
  { method: 'GET', path: '/api/auth/me', allowed: ALL },
  { method: 'POST', path: '/api/auth/password', allowed: ALL, body: {} },
  { method: 'GET', path: '/api/users', allowed: ['admin'] },
  { method: 'POST', path: '/api/users', allowed: ['admin'], body: {} },
  { method: 'PATCH', path: '/api/users/:id', allowed: ['admin'], body: {} },
  { method: 'GET', path: '/api/plant', allowed: ALL },
  { method: 'GET', path: '/api/tanks/:id', allowed: ALL },
  { method: 'GET', path: '/api/tanks/:id/trend', allowed: ALL },
  { method: 'GET', path: '/api/admin/simulator', allowed: ['admin'] },
  { method: 'POST', path: '/api/admin/simulator', allowed: ['admin'], body: {} },
  { method: 'GET', path: '/api/admin/ingest-health', allowed: ['admin'] },
  // Sign-out ends every session of the user, so it runs last.
  { method: 'POST', path: '/api/auth/sign-out', allowed: ALL },
];
// Routes that need no session by design.
const PUBLIC = ['POST /api/auth/sign-in'];

let t: TestApi;
beforeAll(async () => {
  t = await createTestApi();
});
afterAll(async () => t?.close());

describe('role matrix', () => {
  it('when the app lists its routes, then every one is in the matrix or public', () => {
    const routes = (t.app.locals.routes as RouteInfo[]).map((r) => `${r.method} ${r.path}`);
    const covered = [...MATRIX.map((m) => `${m.method} ${m.path}`), ...PUBLIC];
    expect(routes.filter((r) => !covered.includes(r))).toEqual([]);
    expect(covered.filter((c) => !routes.includes(c))).toEqual([]);
  });

  for (const route of MATRIX) {
    for (const who of ['anonymous', ...ROLES] as Who[]) {
      const allowed = who !== 'anonymous' && route.allowed.includes(who);
      it(`when ${who} calls ${route.method} ${route.path}, then it is ${allowed ? 'allowed' : 'refused'}`, async () => {
        const path = route.path.replace(':id', '1');
        const cookie = who === 'anonymous' ? undefined : t.cookies[who];
        let req = request(t.app)[route.method.toLowerCase() as 'get'](path).set('X-Ferrisight-Csrf', '1');
        if (cookie) req = req.set('Cookie', cookie);
        if (route.body !== undefined) req = req.send(route.body as object);
        const res = await req;
        if (who === 'anonymous') expect(res.status).toBe(401);
        else if (!allowed) expect(res.status).toBe(403);
        else expect([200, 201, 202, 204, 400, 404, 503]).toContain(res.status);
        expect(res.status).not.toBe(500);
        if (res.status !== 204) expect(res.headers['content-type']).toMatch(/json/);
      });
    }
  }
});

