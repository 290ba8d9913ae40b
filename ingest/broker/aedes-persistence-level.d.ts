// aedes-persistence-level 9.x ships no types; these are the calls we use (aedes-persistence's interface).
declare module 'aedes-persistence-level' {
  import type { PublishPacket } from 'mqtt-packet';

  export type StoredSubscription = { clientId: string; topic: string; qos: number };
  /** A packet as aedes keeps it for a session: the broker id and counter make its key. */
  export type SessionPacket = PublishPacket & { brokerId: string; brokerCounter: number };

  export interface SessionStore {
    /** Persistent subscriptions (QoS > 0) matching a topic. */
    subscriptionsByTopic(topic: string): Promise<StoredSubscription[]>;
    /** Puts the packet into each subscription's outgoing queue on disk. */
    outgoingEnqueueCombi(subs: StoredSubscription[], packet: SessionPacket): Promise<unknown>;
  }

  /** Wraps a level database (level ≥ 9, e.g. `new Level(dir)`) as an aedes persistence. */
  export default function aedesPersistenceLevel(db: unknown): SessionStore;
}
