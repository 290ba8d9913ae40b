import fs from 'node:fs';
import path from 'node:path';
import cookieParser from 'cookie-parser';
import express, { type Express, type Router } from 'express';
import helmet from 'helmet';
import { csrfGuard, sessionMiddleware } from './middleware/auth.ts';
import { listRoutes } from './lib/route-list.ts';
import { errorHandler, notFoundHandler } from './middleware/errors.ts';
import { adminRouter } from './modules/admin/admin.router.ts';
import type { AuthService } from './modules/auth/auth.service.ts';
import { authRouter } from './modules/auth/auth.router.ts';
import { plantRouter } from './modules/plant/plant.router.ts';
import { usersRouter } from './modules/users/users.router.ts';
import type { Bus } from './realtime/bus.ts';

export type AppDeps = {
  auth: AuthService;
  ttlS: number;
  secureCookie?: boolean;
  /** Built web app to serve; omitted in API tests. */
  webDist?: string;
  bus?: Bus;
};

/** Builds the Express app without listening, so tests drive it with supertest. */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(helmet({
    contentSecurityPolicy: { directives: { 'img-src': ["'self'", 'data:'], 'connect-src': ["'self'"] } },
    strictTransportSecurity: { maxAge: 31_536_000 },
  }));
  app.use('/api', express.json({ limit: '1mb' }), cookieParser(), csrfGuard, sessionMiddleware(deps.auth));

  app.get('/api/health', (_req, res) => {
    res.json({ ok: true });
  });
  const mounts: Array<[string, Router]> = [
    ['/api/auth', authRouter(deps.auth, { secureCookie: deps.secureCookie ?? false, ttlS: deps.ttlS })],
    ['/api/users', usersRouter()],
    ['/api', plantRouter()],
    ['/api/admin', adminRouter(deps.bus)],
  ];
  for (const [prefix, router] of mounts) app.use(prefix, router);
  app.locals.routes = listRoutes(mounts);
  app.use('/api', notFoundHandler);

  if (deps.webDist && fs.existsSync(path.join(deps.webDist, 'index.html'))) {
    const dist = path.resolve(deps.webDist);
    app.use(express.static(dist, { index: false, maxAge: '1h' }));
    // Client-side routes: every other GET gets the app shell.
    app.get('/{*splat}', (_req, res) => res.sendFile(path.join(dist, 'index.html')));
  }
  app.use(notFoundHandler);
  app.use(errorHandler);
  return app;
}
