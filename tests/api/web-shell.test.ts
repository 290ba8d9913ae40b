import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/src/app.ts';
import { createAuthService } from '../../api/src/modules/auth/auth.service.ts';
import { TEST_SECRET } from '../helpers/api.ts';

describe('the built web app', () => {
  // npm test's browser stage builds it into .data/test-e2e/web: a folder below a dot folder.
  const root = mkdtempSync(path.join(os.tmpdir(), 'fs-web-'));
  const dist = path.join(root, '.data', 'web');
  mkdirSync(path.join(dist, 'assets'), { recursive: true });
  writeFileSync(path.join(dist, 'index.html'), '<!doctype html><title>Ferrisight shell</title>');
  writeFileSync(path.join(dist, 'assets', 'app.js'), 'export {};');
  const app = createApp({ auth: createAuthService({ jwtSecret: TEST_SECRET, ttlS: 3600 }), ttlS: 3600, webDist: dist });
  afterAll(() => rmSync(root, { recursive: true, force: true }));

  it('when it sits below a dot folder, then client routes get the app shell and assets are served', async () => {
    for (const route of ['/', '/sign-in', '/tanks/3']) {
      const res = await request(app).get(route);
      expect(res.status, route).toBe(200);
      expect(res.text, route).toContain('<title>Ferrisight shell</title>');
    }
    expect((await request(app).get('/assets/app.js')).status).toBe(200);
  });

  it('when an API path is asked for without a session, then the answer is a problem, not the app shell', async () => {
    const res = await request(app).get('/api/no-such-thing');
    expect(res.status).toBe(401);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
  });
});
