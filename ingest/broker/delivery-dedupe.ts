import type { Client } from 'aedes';

/**
 * Switches off aedes's per-client delivery dedupe, the one place the broker touches an aedes
 * internal: aedes 1.x offers no option or hook for it.
 *
 * aedes drops a QoS 1 packet whose brokerCounter is below the last one it delivered to that
 * client (a guard meant for broker clusters). With level persistence, concurrent publishes finish
 * enqueueing out of order, so live packets were silently skipped (about 1 % at 200 msg/s; a
 * persistent subscriber got them only at its next reconnect; moscajs/aedes#955, #994). One broker
 * never sees a packet twice through its emitter, and the store ignores repeats anyway.
 *
 * aedes keeps the counters in `client.duplicates` (lib/client.js, `dedupe`): a map that never
 * remembers a counter lets every packet through. Throws if a new aedes has moved the field, so an
 * upgrade fails loudly in tests instead of bringing the silent skips back.
 */
export function disableDeliveryDedupe(client: Client): void {
  const internals = client as unknown as { duplicates?: unknown };
  if (typeof internals.duplicates !== 'object' || internals.duplicates === null) {
    throw new Error('aedes client has no duplicates map: check disableDeliveryDedupe against this aedes version');
  }
  internals.duplicates = new Proxy({}, { get: () => undefined, set: () => true });
}
