import type { Aedes, PublishPacket } from 'aedes';
import { INTERNAL_PREFIX } from '../../shared/schemas/internal-topics.ts';

/** Where a device's QoS 1 message goes once stored: nobody subscribes, so it costs one lookup. */
export const STORED_TOPIC = `${INTERNAL_PREFIX}/edge/stored`;

/**
 * aedes 1.2 writes a QoS 1 PUBACK before it stores the message in the persistent sessions
 * (lib/handlers/publish.js), so a broker killed in between loses a message the device was
 * told is safe. From authorizePublish (a public hook, which runs before the PUBACK) this
 * publishes the message through broker.publish(), which writes it into every matching
 * clean: false session on disk and delivers it, and only then lets aedes go on: the PUBACK
 * then follows, and aedes's own publish goes to a topic nobody reads. QoS 2 needs none of
 * this: aedes stores it before its PUBREC.
 */
/**
 * Gives the stored topic one listener that answers on the next turn. With no listener at all
 * its messages would finish synchronously inside mqemitter's queue, one nested call per queued
 * message, and a long queue under load overflowed the stack (found by npm run bench:ack).
 */
export function drainStoredTopic(broker: Aedes): void {
  broker.subscribe(STORED_TOPIC, (_packet, cb) => setImmediate(cb), () => undefined);
}

export function storeBeforeAck(broker: Aedes, packet: PublishPacket, done: (err?: Error | null) => void): void {
  if (packet.qos !== 1) return done();
  broker.publish({ cmd: 'publish', topic: packet.topic, payload: packet.payload, qos: 1, retain: false, dup: false }, (err) => {
    if (err) return done(err);
    packet.topic = STORED_TOPIC;
    done();
  });
}
