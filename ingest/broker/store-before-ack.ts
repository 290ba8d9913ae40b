import type { PublishPacket } from 'aedes';
import type { SessionStore } from 'aedes-persistence-level';

/**
 * aedes 1.2 writes a QoS 1 PUBACK before it stores the message for the persistent sessions
 * (lib/handlers/publish.js: PUBACK, then broker.publish → enqueueOffline), so a broker killed in
 * between loses a message the device was told is safe.
 *
 * From authorizePublish (a public hook that runs before the PUBACK) this writes the message into
 * every matching persistent session through the persistence's own interface
 * (subscriptionsByTopic + outgoingEnqueueCombi, the calls aedes's enqueueOffline makes), under a
 * broker id and counter it gives the packet. aedes then answers and publishes as usual: its
 * Packet keeps that id and counter, so its own enqueue rewrites the same key with the same bytes
 * and the live delivery updates that entry. The hook waits for one store write and nothing else.
 *
 * An earlier version published through broker.publish() from the hook. That call returns only
 * once every online subscriber's socket has taken the message, so a device's PUBACK waited for
 * the ingest worker to read, and each message passed the emitter twice; the likely cause of the
 * stalls it showed after broker restarts (the worker's session backlog filling its socket while
 * device messages held the emitter's slots, until the drain timeout cut the worker).
 *
 * QoS 2: aedes stores the packet in the sender's incoming store, then publishes, then sends
 * PUBREC. A kill between the first two leaves it marked as received but in no session, and the
 * device's re-send is then answered as a duplicate without being published. Storing for the
 * sessions here first closes that too; a re-sent QoS 2 message may then reach the worker twice,
 * and the readings store ignores exact repeats.
 */
export class StoreBeforeAck {
  private counter = 0;
  /** Distinct from aedes's own broker id, so these keys never meet the counter aedes keeps. */
  private readonly brokerId: string;

  constructor(private readonly sessions: SessionStore, brokerId: string) {
    this.brokerId = `${brokerId}.device`;
  }

  /** Stores a QoS 1 or 2 packet for every persistent session it matches, then calls done (with the error, if the write failed: no acknowledgement then). */
  store(packet: PublishPacket, done: (err?: Error | null) => void): void {
    if (packet.qos === 0) return done();
    const stamped = Object.assign(packet, { brokerId: this.brokerId, brokerCounter: ++this.counter });
    this.sessions.subscriptionsByTopic(packet.topic)
      .then((subs) => this.sessions.outgoingEnqueueCombi(subs, stamped))
      .then(() => done(), (err: Error) => done(err));
  }
}
