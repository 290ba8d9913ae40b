import { useEffect, useRef, useSyncExternalStore } from 'react';
import { io, type Socket } from 'socket.io-client';
import type { z } from 'zod';
import {
  serverEventSchemas, type ClientToServerEvents, type LiveWatch, type ServerEventName, type ServerToClientEvents, type SocketAuth,
} from '@shared/schemas/socket-events';

type EventName = ServerEventName;
type Payload<E extends EventName> = Parameters<ServerToClientEvents[E]>;

/** connecting: first attempt; reconnecting: lost and retrying; offline: given up for now (still retrying in the background). */
export type ConnectionState = 'connecting' | 'connected' | 'reconnecting' | 'offline';

const FAILURES_BEFORE_OFFLINE = 3;

/** Newest alarm event id this page has; sent on every (re)connect so the server replays what was missed. */
let alarmResumeId: number | null = null;
export function noteAlarmEventId(id: number): void {
  if (alarmResumeId === null || id > alarmResumeId) alarmResumeId = id;
}
/** Asks for every alarm event after an id (used once the alarm list has loaded). */
export function requestAlarmsSince(id: number): void {
  noteAlarmEventId(id);
  socket?.emit('alarm:since', id);
}

let socket: Socket<ServerToClientEvents, ClientToServerEvents> | null = null;
let state: ConnectionState = 'offline';
let failures = 0;
const stateListeners = new Set<() => void>();
const eventListeners = new Map<EventName, Set<(...args: never[]) => void>>();

function setState(next: ConnectionState) {
  if (next === state) return;
  state = next;
  for (const l of stateListeners) l();
}

function emitLocal<E extends EventName>(event: E, ...args: Payload<E>) {
  for (const l of eventListeners.get(event) ?? []) (l as (...a: Payload<E>) => void)(...args);
}

function check<T>(event: EventName, schema: z.ZodType<T>, raw: unknown, deliver: (value: T) => void): void {
  const parsed = schema.safeParse(raw);
  if (parsed.success) deliver(parsed.data);
  else console.warn(`ignored ${event}: payload does not fit the contract`, parsed.error.message);
}

function onBrowserOnline() {
  if (socket && !socket.connected) socket.connect();
}
function onBrowserOffline() {
  setState('offline');
}

/** The sites whose live values this page shows; told to the server on every (re)connect. */
let liveSites: LiveWatch['sites'] = 'all';
/** Asks for live values of these sites only ('all': every site). The Floor of one site narrows it. */
export function watchLiveSites(sites: LiveWatch['sites']): void {
  liveSites = sites;
  if (socket?.connected) socket.emit('live:watch', { sites });
}

/** Opens the live connection (idempotent). Called once the user is signed in. */
export function connectSocket(): void {
  if (socket) return;
  failures = 0;
  setState('connecting');
  const s: Socket<ServerToClientEvents, ClientToServerEvents> = io({
    path: '/socket.io', withCredentials: true, transports: ['websocket', 'polling'],
    // Called on every attempt, so a reconnect carries the newest id seen.
    auth: (cb) => {
      const auth: SocketAuth = alarmResumeId === null ? {} : { lastAlarmEventId: alarmResumeId };
      cb(auth);
    },
  });
  socket = s;
  s.on('connect', () => {
    failures = 0;
    if (liveSites !== 'all') s.emit('live:watch', { sites: liveSites });
    setState('connected');
  });
  s.on('disconnect', (reason) => {
    if (reason === 'io client disconnect') return setState('offline');
    // The server only drops us on purpose when the session ended.
    if (reason === 'io server disconnect') {
      setState('offline');
      return emitLocal('session:expired');
    }
    setState('reconnecting');
  });
  s.on('connect_error', (err) => {
    // A refusal by the server's auth middleware is final: socket.io does not retry it.
    if (err.message === 'unauthorized') {
      setState('offline');
      return emitLocal('session:expired');
    }
    failures += 1;
    setState(failures >= FAILURES_BEFORE_OFFLINE ? 'offline' : state === 'connecting' ? 'connecting' : 'reconnecting');
  });
  // Parsed, not trusted: a payload that does not fit the contract is dropped with a console note.
  const sch = serverEventSchemas;
  s.on('tank:latest', (raw: unknown) => check('tank:latest', sch['tank:latest'], raw, (v) => emitLocal('tank:latest', v)));
  s.on('probe:freshness', (raw: unknown) => check('probe:freshness', sch['probe:freshness'], raw, (v) => emitLocal('probe:freshness', v)));
  s.on('alarm:event', (raw: unknown) => check('alarm:event', sch['alarm:event'], raw, (v) => emitLocal('alarm:event', v)));
  s.on('alarm:resync', (raw: unknown) => check('alarm:resync', sch['alarm:resync'], raw, (v) => emitLocal('alarm:resync', v)));
  s.on('session:expired', () => emitLocal('session:expired'));
  window.addEventListener('online', onBrowserOnline);
  window.addEventListener('offline', onBrowserOffline);
}

/** Closes the live connection (sign-out, expired session). */
export function disconnectSocket(): void {
  window.removeEventListener('online', onBrowserOnline);
  window.removeEventListener('offline', onBrowserOffline);
  socket?.removeAllListeners();
  socket?.disconnect();
  socket = null;
  alarmResumeId = null;
  setState('offline');
}

function subscribeState(listener: () => void) {
  stateListeners.add(listener);
  return () => stateListeners.delete(listener);
}

export function useConnectionState(): ConnectionState {
  return useSyncExternalStore(subscribeState, () => state);
}

/** Live updates are pushed; polling is only the fallback while the socket is down. */
export function useIsLive(): boolean {
  return useConnectionState() === 'connected';
}

/** Subscribes to a server event for the lifetime of the component; the handler may change between renders. */
export function useSocketEvent<E extends EventName>(event: E, handler: ServerToClientEvents[E]): void {
  const ref = useRef(handler);
  useEffect(() => {
    ref.current = handler;
  });
  useEffect(() => {
    const fn = (...args: Payload<E>) => (ref.current as (...a: Payload<E>) => void)(...args);
    const set = eventListeners.get(event) ?? new Set();
    set.add(fn as (...args: never[]) => void);
    eventListeners.set(event, set);
    return () => {
      set.delete(fn as (...args: never[]) => void);
    };
  }, [event]);
}

/** How often to poll while the socket is down. */
export const FALLBACK_POLL_MS = 10_000;
