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
const MATRIX: Array<{ method: string; path: string; allowed: Role[]; body?: unknown; type?: RegExp }> = [
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
  // Plant setup → Sparkplug edge nodes: admins only.
  { method: 'GET', path: '/api/admin/sparkplug', allowed: ['admin'] },
  { method: 'POST', path: '/api/admin/sparkplug/groups', allowed: ['admin'], body: {} },
  { method: 'DELETE', path: '/api/admin/sparkplug/groups/:id', allowed: ['admin'] },
  { method: 'POST', path: '/api/admin/sparkplug/mappings', allowed: ['admin'], body: {} },
  { method: 'DELETE', path: '/api/admin/sparkplug/mappings/:id', allowed: ['admin'] },
  // Metallurgist's workbench: everyone reads; metallurgists and admins change; supervisors and metallurgists decide.
  { method: 'GET', path: '/api/bands', allowed: ALL },
  { method: 'GET', path: '/api/bands/changes', allowed: ALL },
  { method: 'PUT', path: '/api/bands/:id', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'POST', path: '/api/bands/:id/copy', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'POST', path: '/api/bands/changes/:id/approve', allowed: ['supervisor', 'metallurgist'], body: {} },
  { method: 'POST', path: '/api/bands/changes/:id/reject', allowed: ['supervisor', 'metallurgist'], body: {} },
  { method: 'POST', path: '/api/bands/changes/:id/withdraw', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'GET', path: '/api/assays', allowed: ALL },
  { method: 'GET', path: '/api/assays/template.csv', allowed: ALL, type: /text\/csv/ },
  { method: 'POST', path: '/api/assays', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'POST', path: '/api/assays/:id/retract', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'POST', path: '/api/assays/csv/preview', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'POST', path: '/api/assays/csv/commit', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'GET', path: '/api/calibration/:id', allowed: ALL },
  { method: 'POST', path: '/api/calibration/:id/fit', allowed: ALL, body: {} },
  { method: 'POST', path: '/api/calibration/:id/apply', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'POST', path: '/api/calibration/:id/recompute', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'GET', path: '/api/probe-checks', allowed: ALL },
  { method: 'POST', path: '/api/probe-checks', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'GET', path: '/api/probe-checks/schedule', allowed: ALL },
  { method: 'PUT', path: '/api/probe-checks/schedule/:id', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'GET', path: '/api/probe-checks/replacements', allowed: ALL },
  { method: 'POST', path: '/api/probe-checks/replacements', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'GET', path: '/api/dose/:id', allowed: ALL },
  { method: 'GET', path: '/api/site-settings', allowed: ALL },
  { method: 'PUT', path: '/api/site-settings', allowed: ['admin'], body: {} },
  // Shift log, Shift digest and readings in/out: everyone writes the log and reads the digest; supervisors hand over.
  { method: 'GET', path: '/api/shifts/pattern', allowed: ALL },
  { method: 'PUT', path: '/api/shifts/pattern', allowed: ['admin'], body: {} },
  { method: 'GET', path: '/api/shifts', allowed: ALL },
  { method: 'POST', path: '/api/shifts/close', allowed: ['supervisor'], body: {} },
  { method: 'GET', path: '/api/shift-log', allowed: ALL },
  { method: 'POST', path: '/api/shift-log/entries', allowed: ALL, body: {} },
  { method: 'PATCH', path: '/api/shift-log/entries/:id', allowed: ALL, body: {} },
  { method: 'GET', path: '/api/digest', allowed: ALL },
  { method: 'GET', path: '/api/digest/export', allowed: ALL },
  { method: 'GET', path: '/api/readings/export', allowed: ALL },
  { method: 'POST', path: '/api/readings/imports', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'GET', path: '/api/readings/imports', allowed: ['metallurgist', 'admin'] },
  { method: 'GET', path: '/api/readings/imports/:id', allowed: ['metallurgist', 'admin'] },
  { method: 'GET', path: '/api/readings/imports/:id/rejections', allowed: ['metallurgist', 'admin'] },
  // Alarms, Call roster and caught mail: everyone sees and comments; supervisors, engineers and admins
  // acknowledge and shelve; metallurgists and admins own definitions and out of service; supervisors and admins the roster.
  { method: 'GET', path: '/api/alarms/active', allowed: ALL },
  { method: 'GET', path: '/api/alarms/summary', allowed: ALL },
  { method: 'GET', path: '/api/alarms/events', allowed: ALL },
  { method: 'GET', path: '/api/alarms/history', allowed: ALL },
  { method: 'GET', path: '/api/alarms/history/export', allowed: ALL },
  { method: 'GET', path: '/api/alarms/figures', allowed: ALL },
  { method: 'GET', path: '/api/alarms/instances/:id', allowed: ALL },
  // Operators acknowledge (first responders); whether they may shelve is a site setting the service applies past this gate.
  { method: 'POST', path: '/api/alarms/instances/:id/acknowledge', allowed: ['operator', 'supervisor', 'engineer', 'admin'], body: {} },
  { method: 'POST', path: '/api/alarms/instances/:id/shelve', allowed: ['operator', 'supervisor', 'engineer', 'admin'], body: {} },
  { method: 'POST', path: '/api/alarms/instances/:id/unshelve', allowed: ['operator', 'supervisor', 'engineer', 'admin'], body: {} },
  { method: 'POST', path: '/api/alarms/instances/:id/comment', allowed: ALL, body: {} },
  { method: 'POST', path: '/api/alarms/tanks/:id/acknowledge', allowed: ['operator', 'supervisor', 'engineer', 'admin'], body: {} },
  { method: 'POST', path: '/api/alarms/definitions/:id/out-of-service', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'POST', path: '/api/alarms/definitions/:id/return-to-service', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'GET', path: '/api/alarms/definitions', allowed: ALL },
  { method: 'POST', path: '/api/alarms/definitions', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'PATCH', path: '/api/alarms/definitions/:id', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'GET', path: '/api/alarms/templates', allowed: ALL },
  { method: 'POST', path: '/api/alarms/templates/apply', allowed: ['metallurgist', 'admin'], body: {} },
  { method: 'GET', path: '/api/roster/now', allowed: ALL },
  { method: 'GET', path: '/api/roster/shifts', allowed: ALL },
  { method: 'POST', path: '/api/roster/shifts', allowed: ['supervisor', 'admin'], body: {} },
  { method: 'PATCH', path: '/api/roster/shifts/:id', allowed: ['supervisor', 'admin'], body: {} },
  { method: 'DELETE', path: '/api/roster/shifts/:id', allowed: ['supervisor', 'admin'], body: {} },
  { method: 'POST', path: '/api/roster/rotation', allowed: ['supervisor', 'admin'], body: {} },
  { method: 'GET', path: '/api/roster/policy', allowed: ALL },
  { method: 'PUT', path: '/api/roster/policy', allowed: ['supervisor', 'admin'], body: {} },
  { method: 'GET', path: '/api/admin/mail', allowed: ['admin'] },
  // Plant setup and dead letters (issue 14): everyone reads the plant; admins change sites, circuits and tanks;
  // admins and engineers change probes and gateways and read dead letters.
  { method: 'GET', path: '/api/plant-setup', allowed: ALL },
  { method: 'POST', path: '/api/plant-setup/sites', allowed: ['admin'], body: {} },
  { method: 'PATCH', path: '/api/plant-setup/sites/:id', allowed: ['admin'], body: {} },
  { method: 'POST', path: '/api/plant-setup/sites/:id/retire', allowed: ['admin'], body: {} },
  { method: 'POST', path: '/api/plant-setup/circuits', allowed: ['admin'], body: {} },
  { method: 'PATCH', path: '/api/plant-setup/circuits/:id', allowed: ['admin'], body: {} },
  { method: 'POST', path: '/api/plant-setup/circuits/:id/retire', allowed: ['admin'], body: {} },
  { method: 'POST', path: '/api/plant-setup/tanks', allowed: ['admin'], body: {} },
  { method: 'PATCH', path: '/api/plant-setup/tanks/:id', allowed: ['admin'], body: {} },
  { method: 'POST', path: '/api/plant-setup/tanks/:id/retire', allowed: ['admin'], body: {} },
  { method: 'POST', path: '/api/plant-setup/probes', allowed: ['admin', 'engineer'], body: {} },
  { method: 'PATCH', path: '/api/plant-setup/probes/:id', allowed: ['admin', 'engineer'], body: {} },
  { method: 'POST', path: '/api/plant-setup/probes/:id/retire', allowed: ['admin', 'engineer'], body: {} },
  { method: 'POST', path: '/api/plant-setup/gateways', allowed: ['admin', 'engineer'], body: {} },
  { method: 'PATCH', path: '/api/plant-setup/gateways/:id', allowed: ['admin', 'engineer'], body: {} },
  { method: 'POST', path: '/api/plant-setup/gateways/:id/rotate', allowed: ['admin', 'engineer'], body: {} },
  { method: 'POST', path: '/api/plant-setup/gateways/:id/retire', allowed: ['admin', 'engineer'], body: {} },
  { method: 'GET', path: '/api/dead-letters', allowed: ['admin', 'engineer'] },
  { method: 'GET', path: '/api/dead-letters/export', allowed: ['admin', 'engineer'], type: /text\/csv/ },
  // The audit trail: admins read it (and nobody changes it).
  { method: 'GET', path: '/api/audit', allowed: ['admin'] },
  { method: 'GET', path: '/api/audit/export', allowed: ['admin'], type: /text\/csv/ },
  // Sign-out ends every session of the user, so it runs last.
  { method: 'POST', path: '/api/auth/sign-out', allowed: ALL },
];
// Routes that need no session by design.
// The first-run routes work only while the database has no users, with the one-time token.
const PUBLIC = ['GET /ack/:token', 'POST /ack/:token', 'POST /api/auth/sign-in', 'GET /api/first-run', 'POST /api/first-run'];

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
        if (res.status !== 204) expect(res.headers['content-type']).toMatch(res.status < 300 && route.type ? route.type : /json/);
      });
    }
  }
});

