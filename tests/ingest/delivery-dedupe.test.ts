import net from 'node:net';
import { Aedes, type Client, type PublishPacket } from 'aedes';
import mqtt from 'mqtt';
import { afterEach, describe, expect, it } from 'vitest';
import { disableDeliveryDedupe } from '../../ingest/broker/delivery-dedupe.ts';

// A packet relayed from another broker keeps that broker's id and counter; aedes delivers one only
// when its counter is above the last one that client saw from the same broker (aedes lib/client.js).
const relayed = (counter: number) =>
  ({ cmd: 'publish', topic: 'dedupe/t', payload: Buffer.from(String(counter)), qos: 0, retain: false, dup: false, brokerId: 'peer', brokerCounter: counter }) as PublishPacket;

const closers: (() => Promise<void>)[] = [];
afterEach(async () => {
  while (closers.length) await closers.pop()!();
});

async function receivedOutOfOrder(disable: boolean): Promise<string[]> {
  const broker = await Aedes.createBroker({
    preConnect: (client: Client, _packet, done) => {
      if (disable) disableDeliveryDedupe(client);
      done(null, true);
    },
  });
  const server = net.createServer(broker.handle);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  const port = (server.address() as net.AddressInfo).port;
  closers.push(() => new Promise<void>((r) => broker.close(() => server.close(() => r()))));
  const sub = await mqtt.connectAsync(`mqtt://127.0.0.1:${port}`, { protocolVersion: 4, reconnectPeriod: 0 });
  closers.push(() => sub.endAsync());
  const got: string[] = [];
  sub.on('message', (_t, p) => got.push(p.toString()));
  await sub.subscribeAsync('dedupe/t', { qos: 0 });
  for (const counter of [5, 3, 4]) await new Promise<void>((r) => broker.publish(relayed(counter), () => r()));
  const until = Date.now() + 2000;
  while (got.length < (disable ? 3 : 1) && Date.now() < until) await new Promise((r) => setTimeout(r, 20));
  await new Promise((r) => setTimeout(r, 100)); // a late extra delivery would show here
  return got;
}

describe('aedes delivery dedupe', () => {
  it('when this aedes gets packets out of counter order, then it drops the late ones unless dedupe is off', async () => {
    expect(await receivedOutOfOrder(false)).toEqual(['5']);
    expect(await receivedOutOfOrder(true)).toEqual(['5', '3', '4']);
  });

  it('when a client object lacks the dedupe map (a changed aedes), then switching it off fails loudly', () => {
    expect(() => disableDeliveryDedupe({} as Client)).toThrow(/duplicates map/);
  });
});
