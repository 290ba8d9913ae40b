import { mkdirSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { Aedes, type AuthenticateError, type Client } from 'aedes';
import aedesPersistenceLevel from 'aedes-persistence-level';
import { Level } from 'level';
import type { Logger } from 'pino';
import { logger as rootLogger } from '../../api/src/lib/logger.ts';
import { createIngestPool } from '../../api/src/db/pool.ts';
import { clientIdRefusal, publishRefusal, subscribeRefusal } from './acl.ts';
import { disableDeliveryDedupe } from './delivery-dedupe.ts';
import type { BrokerHealth } from '../../shared/schemas/ingest-health.ts';
import { EdgeDeadLetters, screenMessage } from './edge-screen.ts';
import { BROKER_HEALTH_TOPIC, SCREENED_TOPIC } from '../../shared/schemas/internal-topics.ts';
import { GatewayConnections } from './gateway-connections.ts';
import { StoreBeforeAck } from './store-before-ack.ts';
import { IdentityDirectory, type Identity } from './identity.ts';
import { limitPacketSize } from './packet-limit.ts';

export type BrokerOptions = {
  /** TCP port; 0 picks a free one (tests). */
  port: number;
  host?: string;
  databaseUrl: string;
  /** The level database lives in `${dataDir}/broker`. */
  dataDir: string;
  servicePassword: string;
  serviceUser?: string;
  maxConnections?: number;
  /** Connections one gateway login may hold (default 4). */
  maxConnectionsPerGateway?: number;
  /** Of maxConnections, kept for Ferrisight's own services (default 50, at most half). */
  reservedServiceConnections?: number;
  /**
   * Dead-letter device messages that break the device contract here, before they are stored in
   * the worker's session (default true). Off, the worker refuses them, as it does behind a
   * site's own broker (MQTT_URL).
   */
  screenAtEdge?: boolean;
  /** Store a device's QoS 1 and 2 messages in the persistent sessions before acknowledging them (store-before-ack.ts; default true). */
  storeBeforeAck?: boolean;
  log?: Logger;
};

export type RunningBroker = { port: number; broker: Aedes; close: () => Promise<void> };

const authError = (message: string, returnCode: 3 | 4 | 5): AuthenticateError => Object.assign(new Error(message), { returnCode });

/**
 * Embedded aedes broker with sessions on disk (aedes-persistence-level), so QoS 1 messages not
 * yet acknowledged by the ingest worker survive a broker restart. No anonymous clients;
 * topic rules in acl.ts.
 */
export async function startBroker(opts: BrokerOptions): Promise<RunningBroker> {
  const log = opts.log ?? rootLogger.child({ component: 'broker' });
  const maxConnections = opts.maxConnections ?? 2000;
  const pool = createIngestPool(opts.databaseUrl, 2);
  const directory = new IdentityDirectory(pool, { username: opts.serviceUser ?? 'ferrisight-service', password: opts.servicePassword });
  const gateways = new GatewayConnections({
    maxConnections,
    reservedForServices: Math.min(opts.reservedServiceConnections ?? 50, Math.floor(maxConnections / 2)),
    perGateway: opts.maxConnectionsPerGateway ?? 4,
  });
  const identities = new WeakMap<Client, Identity>();
  const levelDir = path.join(opts.dataDir, 'broker');
  mkdirSync(levelDir, { recursive: true });
  const db = new Level<string, Buffer>(levelDir);
  // Refused device publishes are always dead-lettered; screenAtEdge decides about the contract check.
  const edgeLetters = new EdgeDeadLetters(pool, log);
  const edge = opts.screenAtEdge === false ? null : edgeLetters;

  const persistence = aedesPersistenceLevel(db);
  // Set once the broker exists (its id names the stored keys); the hook runs only after that.
  let storeFirst: StoreBeforeAck | null = null;
  const broker = await Aedes.createBroker({
    persistence,
    // A frozen subscriber must not stall delivery to everyone (at most 10 s): after 5 s
    // without draining it is disconnected, and its session keeps the messages. The ingest worker
    // stops reading while its queue is full (a slow database), so it may be cut too; it reconnects
    // and its clean: false session resumes where it stopped.
    drainTimeout: 5_000,
    concurrency: 500,
    connectTimeout: 10_000,
    heartbeatInterval: 60_000,
    preConnect: (client, _packet, done) => {
      disableDeliveryDedupe(client);
      if (broker.connectedClients >= maxConnections) {
        log.warn({ maxConnections }, 'connection refused: cap reached');
        return done(null, false);
      }
      done(null, true);
    },
    authenticate: (client, username, password, done) => {
      directory.verify(username, password).then((identity) => {
        if (!identity) {
          log.warn({ clientId: client.id, username }, 'mqtt authentication failed');
          return done(authError('bad user name or password', 4), false);
        }
        const full = gateways.capacityRefusal(broker.connectedClients, identity.kind === 'service');
        if (full) {
          log.warn({ clientId: client.id, username, refusal: full }, 'mqtt connection refused');
          return done(authError(full, 3), false); // server unavailable
        }
        const refusal = clientIdRefusal(identity, client.id) ?? gateways.admit(identity, client);
        if (refusal) {
          log.warn({ clientId: client.id, username, refusal }, 'mqtt connection refused');
          return done(authError(refusal, 5), false);
        }
        identities.set(client, identity);
        done(null, true);
      }, (err: Error) => {
        log.error({ err: err.message, username }, 'device lookup failed');
        done(authError('server unavailable', 5), false);
      });
    },
    authorizePublish: (client, packet, done) => {
      if (!client) return done(); // the broker's own $SYS messages
      const identity = identities.get(client);
      const refusal = publishRefusal(identity, packet.topic, packet.payload.length);
      if (refusal && identity?.kind !== 'device') {
        log.warn({ clientId: client.id, topic: packet.topic.slice(0, 200), refusal }, 'mqtt publish refused');
        return done(new Error(refusal));
      }
      if (identity?.kind !== 'device') return done();
      gateways.message(identity.username);
      // Devices cannot leave retained messages: a reading is an event, not a state.
      packet.retain = false;
      // A message that breaks the device contract is dead-lettered here, with the reason the worker
      // would give, and its PUBACK waits for that commit; it then goes to a topic nobody reads, so
      // hostile traffic never fills the worker's session. Batches and plant checks stay with the worker.
      const payload = Buffer.isBuffer(packet.payload) ? packet.payload : Buffer.from(packet.payload);
      if (refusal) {
        log.warn({ clientId: client.id, username: identity.username, topic: packet.topic.slice(0, 200), refusal }, 'mqtt publish refused');
        // A correct device that once sends what it may not must not be cut off and loop on
        // re-sending it: the message is dead-lettered with its reason and acknowledged.
        edgeLetters.add({ topic: packet.topic, payload, reason: refusal, receivedAtMs: Date.now(), gateway: identity.username }, (stored) => {
          if (!stored) log.warn({ clientId: client.id, topic: packet.topic.slice(0, 200), refusal }, 'refused publish acknowledged without a dead letter (database unavailable)');
          packet.topic = SCREENED_TOPIC;
          done();
        });
        return;
      }
      const letter = edge ? screenMessage(packet.topic, payload, Date.now()) : null;
      // With storeBeforeAck, a sound message is on disk in every persistent session before its PUBACK or PUBREC.
      if (!letter) return storeFirst ? storeFirst.store(packet, done) : done();
      edge!.add({ ...letter, gateway: identity.username }, (stored) => {
        if (stored) packet.topic = SCREENED_TOPIC;
        done();
      });
    },
    authorizeSubscribe: (client, sub, done) => {
      const refusal = subscribeRefusal(identities.get(client), sub.topic);
      if (refusal) {
        log.warn({ clientId: client.id, topic: sub.topic.slice(0, 200), refusal }, 'mqtt subscribe refused');
        return done(null, null); // negated: SUBACK 0x80 and no subscription
      }
      done(null, sub);
    },
  });

  if (opts.storeBeforeAck !== false) storeFirst = new StoreBeforeAck(persistence, broker.id);
  // Health for Plant setup (retained, like the worker's), and a log line when something was refused.
  const startedAt = new Date().toISOString();
  let edgeLogged = 0;
  const report = () => {
    const snap: BrokerHealth = {
      at: new Date().toISOString(), startedAt, deadLetteredAtEdge: edgeLetters.stored, connectedClients: broker.connectedClients, gateways: gateways.snapshot(),
    };
    broker.publish({ cmd: 'publish', topic: BROKER_HEALTH_TOPIC, payload: Buffer.from(JSON.stringify(snap)), qos: 0, retain: true, dup: false }, () => undefined);
    if (snap.deadLetteredAtEdge === edgeLogged) return;
    log.info({ deadLettered: snap.deadLetteredAtEdge, sinceLast: snap.deadLetteredAtEdge - edgeLogged }, 'device messages dead-lettered at the broker');
    edgeLogged = snap.deadLetteredAtEdge;
  };
  const edgeReport = setInterval(report, 30_000);
  edgeReport.unref();
  report();
  broker.on('clientError', (client, err) => log.debug({ clientId: client.id, err: err.message }, 'client error'));
  // Gateway status in Plant setup follows connects and disconnects within a second.
  let reportSoon: NodeJS.Timeout | null = null;
  const onGatewayChange = (client: Client) => {
    const identity = identities.get(client);
    if (identity?.kind !== 'device') return;
    gateways.touch(identity.username);
    reportSoon ??= setTimeout(() => {
      reportSoon = null;
      report();
    }, 500);
  };
  broker.on('client', onGatewayChange);
  broker.on('clientDisconnect', onGatewayChange);
  const server = net.createServer((conn) => limitPacketSize(broker.handle(conn)));
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, opts.host ?? '127.0.0.1', () => resolve());
  });
  const port = (server.address() as net.AddressInfo).port;
  log.info({ port, levelDir, maxConnections }, 'mqtt broker listening');

  return {
    port,
    broker,
    async close() {
      // Stop accepting first; broker.close() then ends every client, which lets server.close finish.
      clearInterval(edgeReport);
      if (reportSoon) clearTimeout(reportSoon);
      const serverClosed = new Promise<void>((resolve) => server.close(() => resolve()));
      await new Promise<void>((resolve) => broker.close(() => resolve()));
      await serverClosed;
      await db.close().catch(() => undefined);
      await pool.end().catch(() => undefined);
    },
  };
}
