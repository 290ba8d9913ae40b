import { alarmSinceSchema } from '../../../shared/schemas/socket-events.ts';
import type { Lease } from '../cluster/lease.ts';
import { logger } from '../lib/logger.ts';
import { alarmsRepository } from '../modules/alarms/alarms.repository.ts';
import type { RealtimeServer, RealtimeSocket } from './realtime-types.ts';

/**
 * Alarm events to browsers. The table is the feed: every ~100 ms the API reads alarm_events
 * with id > last and emits `alarm:event` to the site's room; this works whichever process wrote
 * the event (ingest, notifier, another API node). Event ids commit in order (see the alarms
 * migration), so "id > last" never skips one.
 *
 * Catch-up: a client sends the last id it has in the handshake's `lastAlarmEventId` (or later
 * with `alarm:since`) and gets every event after it from the table; when more than REPLAY_MAX
 * are missing it gets `alarm:resync` and reloads the lists instead. Clients drop ids they have.
 *
 * Several API nodes (REDIS_URL): an emit goes through the adapter to every node's sockets, so
 * only the holder of `lease` polls and emits (one copy per client, not one per node), and a
 * successor resumes from the holder's saved position. Replays stay per node, from the table.
 */
export const REPLAY_MAX = 2000;
/** Every signed-in screen: plant-wide alarms (no tank, no site) go here. */
export const PLANT_ALARM_ROOM = 'alarms:plant';
const roomOf = (siteTag: string | null) => (siteTag === null ? PLANT_ALARM_ROOM : `site:${siteTag}`);
const POLL_MS = 100;
const REPLAY_INTERVAL_MS = 1000;

export function attachAlarmFeed(io: RealtimeServer, opts: { pollMs?: number; lease?: Lease } = {}) {
  let last: number | null = null;
  let busy = false;

  const poll = async () => {
    if (busy) return;
    if (opts.lease && !opts.lease.held) {
      last = null;
      return;
    }
    busy = true;
    try {
      if (last === null && opts.lease?.progress != null) last = opts.lease.progress;
      last ??= await alarmsRepository.lastEventId();
      const events = await alarmsRepository.eventsAfter(last, 500);
      for (const e of events) {
        io.to(roomOf(e.siteTag)).emit('alarm:event', e);
        last = e.id;
      }
      if (events.length && opts.lease) await opts.lease.saveProgress(last);
    } catch (err) {
      logger.warn({ err: (err as Error).message }, 'alarm feed poll failed');
    } finally {
      busy = false;
    }
  };
  void poll();
  const timer = setInterval(poll, opts.pollMs ?? POLL_MS);

  /** Joins the site rooms before reading, so nothing falls between the replay and the live feed. */
  const replay = async (socket: RealtimeSocket, after: number) => {
    const sites = await alarmsRepository.siteTags();
    await Promise.all([...sites.map((tag) => socket.join(`site:${tag}`)), socket.join(PLANT_ALARM_ROOM)]);
    const events = await alarmsRepository.eventsAfter(after, REPLAY_MAX + 1);
    if (events.length > REPLAY_MAX) return void socket.emit('alarm:resync', { lastEventId: events[events.length - 1].id });
    for (const e of events) socket.emit('alarm:event', e);
  };

  const onConnection = (socket: RealtimeSocket) => {
    const from = socket.data.lastAlarmEventId;
    if (from !== undefined) replay(socket, from).catch((err) => logger.warn({ err: (err as Error).message }, 'alarm replay failed'));
    // Every signed-in role sees every alarm, so the only check is the session the handshake already passed;
    // one replay per second per socket keeps a misbehaving client from loading the database.
    let lastReplayMs = 0;
    socket.on('alarm:since', (after) => {
      const parsed = alarmSinceSchema.safeParse(after);
      if (!parsed.success || Date.now() - lastReplayMs < REPLAY_INTERVAL_MS) return;
      const n = parsed.data;
      lastReplayMs = Date.now();
      replay(socket, n).catch((err) => logger.warn({ err: (err as Error).message }, 'alarm replay failed'));
    });
  };
  io.on('connection', onConnection);

  return {
    /** For tests: the id the feed has emitted up to. */
    get lastEmitted() {
      return last;
    },
    close() {
      clearInterval(timer);
      io.off('connection', onConnection);
    },
  };
}
