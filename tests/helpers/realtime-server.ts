import http from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Express } from 'express';
import { attachRealtime } from '../../api/src/realtime/socket.ts';

type AuthService = Parameters<typeof attachRealtime>[1];
type LiveSource = Parameters<typeof attachRealtime>[2];

/** The test app on a free local port with socket.io attached; close() stops both. */
export type RealtimeServer = { url: string; server: http.Server; close: () => Promise<void> };

export async function startRealtimeServer(app: Express, auth: AuthService, source?: LiveSource): Promise<RealtimeServer> {
  const server = http.createServer(app);
  const realtime = attachRealtime(server, auth, source);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  return {
    url: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
    server,
    close: async () => {
      await realtime.close();
      await new Promise((r) => server.close(r));
    },
  };
}
