import fs from 'node:fs';
import path from 'node:path';
import cookieParser from 'cookie-parser';
import express, { type Express, type Router } from 'express';
import helmet from 'helmet';
import { csrfGuard, sessionMiddleware } from './middleware/auth.ts';
import { listRoutes } from './lib/route-list.ts';
import { errorHandler, notFoundHandler } from './middleware/errors.ts';
import { adminRouter } from './modules/admin/admin.router.ts';
import { alarmsRouter } from './modules/alarms/alarms.router.ts';
import { assaysRouter } from './modules/assays/assays.router.ts';
import { auditTrailRouter } from './modules/audit-trail/audit-trail.router.ts';
import { bandsRouter } from './modules/bands/bands.router.ts';
import { calibrationRouter } from './modules/calibration/calibration.router.ts';
import { doseRouter } from './modules/dose/dose.router.ts';
import { probeChecksRouter } from './modules/probe-checks/probe-checks.router.ts';
import { siteSettingsRouter } from './modules/site-settings/site-settings.router.ts';
import type { AuthService } from './modules/auth/auth.service.ts';
import { authRouter } from './modules/auth/auth.router.ts';
import type { SignInLimitSettings } from './modules/auth/sign-in-limits.ts';
import { ackRouter } from './modules/notify/ack.router.ts';
import { mailRouter } from './modules/notify/mail.router.ts';
import { plantRouter } from './modules/plant/plant.router.ts';
import { plantSetupRouter } from './modules/plant-setup/plant-setup.router.ts';
import { deadLettersRouter } from './modules/dead-letters/dead-letters.router.ts';
import { firstRunRouter } from './modules/first-run/first-run.router.ts';
import { rosterRouter } from './modules/roster/roster.router.ts';
import { usersRouter } from './modules/users/users.router.ts';
import { digestRouter } from './modules/digest/digest.router.ts';
import { exportRouter } from './modules/readings-io/export.router.ts';
import { importRouter } from './modules/readings-io/import.router.ts';
import { shiftLogRouter, shiftsRouter } from './modules/shifts/shifts.router.ts';
import { sparkplugRouter } from './modules/sparkplug/sparkplug.router.ts';
import type { Bus } from './realtime/bus.ts';

export type AppDeps = {
  auth: AuthService;
  ttlS: number;
  /** PUBLIC_URL is https: Secure cookie, HSTS and upgrade-insecure-requests. Over plain http none of them. */
  https?: boolean;
  /** Built web app to serve; omitted in API tests. */
  webDist?: string;
  bus?: Bus;
  /** Uploads go to `${dataDir}/uploads` (historical import); default '.data'. */
  dataDir?: string;
  /** Imported readings older than this are refused, as live ones are; default 90. */
  rawRetentionDays?: number;
  /** JWT_SECRET: signs the acknowledge links in escalation mail (omitted: links show "not set up"). */
  ackSecret?: string;
  /** Dead letters and conflicts are kept this many days (shown on their screen); default 30. */
  deadLetterRetentionDays?: number;
  /** Where the local mail catcher stores what it receives (FERRISIGHT_DATA_DIR/mail). */
  mailDir?: string;
  /** Express 'trust proxy': which peers may name the client in X-Forwarded-For (TRUST_PROXY); default none. */
  trustProxy?: boolean | number | string[];
  signInLimits?: SignInLimitSettings;
  /** The ingest worker's Sparkplug host id, shown in Plant setup; default 'ferrisight'. */
  sparkplugHostId?: string;
};

/** Builds the Express app without listening, so tests drive it with supertest. */
export function createApp(deps: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  // Forwarding headers are believed only from the proxies a site names; otherwise anyone could pick their address.
  app.set('trust proxy', deps.trustProxy ?? false);
  const https = deps.https ?? false;
  app.use(helmet({
    contentSecurityPolicy: {
      directives: {
        'img-src': ["'self'", 'data:'],
        'connect-src': ["'self'"],
        'font-src': ["'self'"],
        // No inline styles: the built CSS is a file, and React and uPlot set styles through the CSSOM.
        'style-src': ["'self'"],
        // Over plain http on a LAN host name this would send every asset to https, which is not there.
        'upgrade-insecure-requests': https ? [] : null,
      },
    },
    strictTransportSecurity: https ? { maxAge: 31_536_000 } : false,
  }));
  app.use('/api', express.json({ limit: '1mb' }), cookieParser(), csrfGuard, sessionMiddleware(deps.auth));

  app.get('/api/health', (_req, res) => {
    res.json({ ok: true });
  });
  const mounts: Array<[string, Router]> = [
    ['/api/auth', authRouter(deps.auth, { secureCookie: https, ttlS: deps.ttlS, limits: deps.signInLimits })],
    ['/api/users', usersRouter()],
    ['/api/first-run', firstRunRouter()],
    ['/api/plant-setup', plantSetupRouter(deps.bus)],
    ['/api/dead-letters', deadLettersRouter({ retentionDays: deps.deadLetterRetentionDays ?? 30 })],
    ['/api/audit', auditTrailRouter()],
    ['/api', plantRouter()],
    ['/api/admin', adminRouter(deps.bus, deps.dataDir)],
    ['/api/admin/mail', mailRouter(deps.mailDir)],
    ['/api/admin/sparkplug', sparkplugRouter({ bus: deps.bus, hostId: deps.sparkplugHostId ?? 'ferrisight' })],
    ['/api/alarms', alarmsRouter()],
    ['/api/roster', rosterRouter()],
    ['/ack', ackRouter(deps.ackSecret, undefined, https)],
    ['/api/bands', bandsRouter(deps.bus)],
    ['/api/assays', assaysRouter()],
    ['/api/calibration', calibrationRouter(deps.bus)],
    ['/api/probe-checks', probeChecksRouter(deps.bus)],
    ['/api/dose', doseRouter()],
    ['/api/site-settings', siteSettingsRouter()],
    ['/api/shifts', shiftsRouter()],
    ['/api/shift-log', shiftLogRouter()],
    ['/api/digest', digestRouter()],
    ['/api/readings', exportRouter()],
    ['/api/readings', importRouter({ dataDir: deps.dataDir ?? '.data', retentionDays: deps.rawRetentionDays ?? 90 })],
  ];
  for (const [prefix, router] of mounts) app.use(prefix, router);
  app.locals.routes = listRoutes(mounts);
  app.use('/api', notFoundHandler);

  if (deps.webDist && fs.existsSync(path.join(deps.webDist, 'index.html'))) {
    const dist = path.resolve(deps.webDist);
    app.use(express.static(dist, { index: false, maxAge: '1h' }));
    // Client-side routes: every other GET gets the app shell. `root` keeps the dot-file check
    // inside dist, so a build under a dot folder (e.g. .data/test-e2e/web) is still served.
    app.get('/{*splat}', (_req, res) => res.sendFile('index.html', { root: dist }));
  }
  app.use(notFoundHandler);
  app.use(errorHandler);
  return app;
}
