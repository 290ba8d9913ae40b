import { originAllowed } from './origin.ts';
import type { Server as HttpServer } from 'node:http';
import { Server, type ServerOptions } from 'socket.io';
import type { ProbesOffline } from '../../../shared/schemas/internal-topics.ts';
import { liveWatchSchema, socketAuthSchema } from '../../../shared/schemas/socket-events.ts';
import type { Lease } from '../cluster/lease.ts';
import { logger } from '../lib/logger.ts';
import { sessionEvents } from '../lib/session-events.ts';
import type { AuthService } from '../modules/auth/auth.service.ts';
import { SESSION_COOKIE } from '../modules/auth/tokens.ts';
import { plantRepository } from '../modules/plant/plant.repository.ts';
import type { TankLive } from '../../../shared/schemas/readings.ts';
import { attachAlarmFeed, PLANT_ALARM_ROOM } from './alarm-feed.ts';
import { LiveFeed } from './live-feed.ts';
import type { RealtimeServer } from './realtime-types.ts';

function cookieValue(header: string | undefined, name: string): string | undefined {
  for (const part of (header ?? '').split(';')) {
    const [k, ...v] = part.trim().split('=');
    if (k === name) return decodeURIComponent(v.join('='));
  }
  return undefined;
}

/**
 * socket.io on the API server: the same session as HTTP (cookie, or `auth.token` for scripts),
 * rooms per user, per site for alarms (`site:<tag>`, every site) and per site for live values
 * (`live:<tag>`, the sites the screen watches), disconnected when the token expires or the user
 * is disabled.
 */
/**
 * Least time between two pushes of one tank: a little under a second, so a tank reporting every
 * second is never held back to the next tick after a full second, yet a fast probe is thinned.
 */
const LIVE_MIN_GAP_MS = 800;
/** Screens watching every site, including sites added after they connected. */
const LIVE_ALL = 'live:*';

export type ClusterRealtime = { serverOptions: Partial<ServerOptions>; alarmLease: Lease };

/** `cluster`: several API nodes (api/src/cluster/socket-cluster.ts, README "Scaling out"). */
/**
 * Where converted readings and offline announcements (a Sparkplug NDEATH/DDEATH) come from: the
 * broker link (Bus) in the server, anything with the same events in tests.
 */
export type LiveSource = {
  on(event: 'latest', listener: (readings: TankLive[]) => void): unknown;
  on(event: 'offline', listener: (offline: ProbesOffline) => void): unknown;
};

export function attachRealtime(httpServer: HttpServer, auth: AuthService, bus?: LiveSource, cluster?: ClusterRealtime, publicUrl?: string) {
  const io: RealtimeServer = new Server(httpServer, {
    serveClient: false, cors: { origin: false }, ...cluster?.serverOptions,
    allowRequest: (req, cb) => {
      const ok = originAllowed(req.headers, publicUrl);
      if (!ok) logger.warn({ ip: req.socket.remoteAddress, origin: req.headers.origin }, 'socket refused: page from another origin');
      cb(ok ? null : 'origin not allowed', ok);
    },
  });
  // Every node gets every live value from the broker itself: each serves its own sockets, else a client would get one copy per node.
  const live = cluster ? io.local : io;
  const feed = new LiveFeed();

  io.use(async (socket, next) => {
    const handshake = socketAuthSchema.parse(socket.handshake.auth);
    const token = handshake.token ?? cookieValue(socket.handshake.headers.cookie, SESSION_COOKIE);
    const user = await auth.authenticate(token).catch(() => null);
    if (!user) {
      // ASVS 16.3.1: a presented but refused credential is an authentication failure worth a log line.
      if (token) logger.warn({ ip: socket.handshake.address, origin: socket.handshake.headers.origin }, 'socket handshake refused: invalid or revoked session');
      return next(new Error('unauthorized'));
    }
    socket.data = { user, lastAlarmEventId: handshake.lastAlarmEventId };
    next();
  });

  const knownSites = async () => new Set((await plantRepository.probeIntervals()).map((p) => p.siteTag));

  io.on('connection', async (socket) => {
    const { user } = socket.data;
    socket.join(`user:${user.id}`);
    socket.join(PLANT_ALARM_ROOM);
    // Registered first: a screen may say what it watches before the site list below has loaded.
    let watching: Promise<void> = Promise.resolve();
    let told = false;
    socket.on('live:watch', (watch) => {
      const parsed = liveWatchSchema.safeParse(watch);
      if (!parsed.success) return;
      told = true;
      watching = watching.then(async () => {
        const sites = await knownSites();
        const wanted = new Set(parsed.data.sites === 'all' ? [LIVE_ALL] : parsed.data.sites.filter((s) => sites.has(s)).map((s) => `live:${s}`));
        for (const room of socket.rooms) if (room.startsWith('live:') && !wanted.has(room)) socket.leave(room);
        for (const room of wanted) socket.join(room);
      }).catch((err) => logger.warn({ err: (err as Error).message }, 'live:watch failed'));
    });
    const sites = await knownSites();
    for (const s of sites) socket.join(`site:${s}`);
    // Until the screen says otherwise it watches every site, as before live:watch existed.
    if (!told) socket.join(LIVE_ALL);
    const timer = setTimeout(() => {
      socket.emit('session:expired');
      socket.disconnect(true);
    }, Math.max(0, user.expMs - Date.now()));
    socket.on('disconnect', () => clearTimeout(timer));
  });

  const refreshProbes = async () => {
    try {
      feed.setProbes(await plantRepository.probeIntervals());
    } catch (err) {
      logger.warn({ err: (err as Error).message }, 'probe list refresh failed');
    }
  };
  void refreshProbes();
  const probeTimer = setInterval(refreshProbes, 60_000);
  bus?.on('latest', (readings) => feed.push(readings));
  bus?.on('offline', (o) => feed.markOffline(o.probeIds, o.atMs));
  let lastRefreshMs = 0;
  const flushTimer = setInterval(() => {
    if (feed.unknownProbe && Date.now() - lastRefreshMs >= 1000) {
      feed.unknownProbe = false;
      lastRefreshMs = Date.now();
      void refreshProbes();
    }
    // Not volatile: a screen watching several sites gets one emit per site in the same tick, and a
    // volatile emit would drop all but the first. A paused screen's backlog waits in its own
    // buffer (nobody else waits for it) until the heartbeat gives up on it.
    for (const [site, readings] of feed.drain(Date.now(), LIVE_MIN_GAP_MS)) live.to([`live:${site}`, LIVE_ALL]).emit('tank:latest', readings);
    for (const f of feed.freshnessChanges(Date.now())) {
      const { siteTag, ...payload } = f;
      live.to([`live:${siteTag}`, LIVE_ALL]).emit('probe:freshness', payload);
    }
  }, 100);

  // Through the adapter, so the user's sockets on every node are told (the revocation happened on this one).
  const onRevoked = (userId: number) => {
    io.to(`user:${userId}`).emit('session:expired');
    io.in(`user:${userId}`).disconnectSockets(true);
  };
  sessionEvents.on('revoked', onRevoked);
  const alarmFeed = attachAlarmFeed(io, { lease: cluster?.alarmLease });

  return {
    io,
    feed,
    async close() {
      sessionEvents.off('revoked', onRevoked);
      alarmFeed.close();
      clearInterval(probeTimer);
      clearInterval(flushTimer);
      await io.close();
    },
  };
}
