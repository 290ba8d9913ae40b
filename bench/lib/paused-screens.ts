// Child of bench/lib/screens.ts pausedScreens(): connects its screens, says "ready", and is then stopped by its parent.
import { io } from 'socket.io-client';

const ports = process.env.PAUSED_PORTS!.split(',');
const sites = process.env.PAUSED_SITES!.split(',');
await Promise.all(Array.from({ length: Number(process.env.PAUSED_COUNT) }, (_, i) => new Promise<void>((resolve, reject) => {
  const socket = io(`http://127.0.0.1:${ports[i % ports.length]}`, { transports: ['websocket'], auth: { token: process.env.PAUSED_TOKEN }, reconnection: false });
  socket.once('connect', () => {
    socket.emit('live:watch', { sites });
    resolve();
  });
  socket.once('connect_error', reject);
})));
process.stdout.write('ready\n');
setInterval(() => {}, 60_000);
