import { EventEmitter } from 'node:events';

/** Raised when a user's sessions end (sign-out, disabled, role or password change), so live sockets close too. */
export const sessionEvents = new EventEmitter<{ revoked: [userId: number] }>();
