import type { Server, Socket } from 'socket.io';
import type { SessionUser } from '../../../shared/schemas/auth.ts';
import type { ClientToServerEvents, ServerToClientEvents } from '../../../shared/schemas/socket-events.ts';

/** What the handshake leaves on each socket: the signed-in user and the alarm event id to replay after. */
export type SocketData = { user: SessionUser & { expMs: number }; lastAlarmEventId?: number };
/** No events between API nodes beyond what the adapter itself carries. */
type InterServerEvents = Record<string, never>;
export type RealtimeServer = Server<ClientToServerEvents, ServerToClientEvents, InterServerEvents, SocketData>;
export type RealtimeSocket = Socket<ClientToServerEvents, ServerToClientEvents, InterServerEvents, SocketData>;
