import type { GatewayLive } from '../../shared/schemas/ingest-health.ts';
import type { Identity } from './identity.ts';

/** What the tracker needs of an aedes client. */
type Conn = { id: string; closed?: boolean };

export type ConnectionLimits = {
  /** The broker's overall cap (MQTT_MAX_CONNECTIONS). */
  maxConnections: number;
  /** Part of maxConnections only Ferrisight's own services may use. */
  reservedForServices: number;
  /** Connections one gateway login may hold at once. */
  perGateway: number;
};

const MINUTE_MS = 60_000;

/**
 * Who is connected as which gateway: enforces the per-gateway connection limit, keeps room
 * for the services, binds each client id to the gateway that first used it since the broker
 * started (so one device cannot take over another's id or persistent session), and counts
 * connections, last activity and messages per minute for Plant setup.
 */
export class GatewayConnections {
  private readonly open = new Map<string, Set<Conn>>();
  private readonly owners = new Map<string, string>();
  private readonly lastSeen = new Map<string, number>();
  /** username → 60 per-minute counters, indexed by minute number modulo 60, with the minute each holds. */
  private readonly perMinute = new Map<string, { minute: number[]; count: number[] }>();

  constructor(private readonly limits: ConnectionLimits) {}

  /** Devices may not use the room kept for the services. Returns a refusal or null. */
  capacityRefusal(connectedClients: number, isServiceUser: boolean): string | null {
    if (connectedClients >= this.limits.maxConnections) return 'connection cap reached';
    if (!isServiceUser && connectedClients >= this.limits.maxConnections - this.limits.reservedForServices) {
      return 'connections for devices are full (the rest are kept for Ferrisight services)';
    }
    return null;
  }

  /** After authentication: the per-gateway limit and client id binding. Returns a refusal or null. */
  admit(identity: Identity, client: Conn, nowMs = Date.now()): string | null {
    if (identity.kind !== 'device') return null;
    const owner = this.owners.get(client.id);
    if (owner !== undefined && owner !== identity.username) return `client id '${client.id}' belongs to another gateway`;
    // A reconnect with the same client id replaces its old connection, so that one is not counted.
    const live = this.live(identity.username).filter((c) => c.id !== client.id);
    if (live.length >= this.limits.perGateway) return `gateway '${identity.username}' already has ${live.length} connections (limit ${this.limits.perGateway})`;
    if (this.owners.size > 100_000) this.owners.clear(); // bounded memory; bindings of live clients are re-made below
    this.owners.set(client.id, identity.username);
    const set = this.open.get(identity.username) ?? new Set<Conn>();
    set.add(client);
    this.open.set(identity.username, set);
    this.lastSeen.set(identity.username, nowMs);
    return null;
  }

  /** A device's message arrived (counts toward "messages in the last hour"). */
  message(username: string, nowMs = Date.now()): void {
    this.lastSeen.set(username, nowMs);
    const m = Math.floor(nowMs / MINUTE_MS);
    let ring = this.perMinute.get(username);
    if (!ring) {
      ring = { minute: new Array(60).fill(-1), count: new Array(60).fill(0) };
      this.perMinute.set(username, ring);
    }
    const i = m % 60;
    if (ring.minute[i] !== m) {
      ring.minute[i] = m;
      ring.count[i] = 0;
    }
    ring.count[i] += 1;
  }

  /** Connected or disconnected: last seen now. */
  touch(username: string, nowMs = Date.now()): void {
    this.lastSeen.set(username, nowMs);
    this.live(username);
  }

  /** Per gateway that has connected since the broker started. */
  snapshot(nowMs = Date.now()): GatewayLive[] {
    const m = Math.floor(nowMs / MINUTE_MS);
    return [...this.lastSeen.keys()].sort().map((username) => {
      const ring = this.perMinute.get(username);
      let messagesLastHour = 0;
      if (ring) for (let i = 0; i < 60; i++) if (ring.minute[i] > m - 60) messagesLastHour += ring.count[i];
      return { username, connections: this.live(username).length, lastSeenAt: new Date(this.lastSeen.get(username)!).toISOString(), messagesLastHour };
    });
  }

  private live(username: string): Conn[] {
    const set = this.open.get(username);
    if (!set) return [];
    for (const c of set) if (c.closed) set.delete(c);
    return [...set];
  }
}
