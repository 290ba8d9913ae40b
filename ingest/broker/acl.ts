import { MAX_PAYLOAD_BYTES, TOPIC_PREFIX } from '../../shared/schemas/readings.ts';
import { isInternalTopic } from '../../shared/schemas/internal-topics.ts';
import type { Identity } from './identity.ts';

/** Client ids starting with this belong to Ferrisight's own services (ingest, API, simulator control). */
export const SERVICE_CLIENT_ID_PREFIX = 'ferrisight-';

/**
 * Why a device may not use this client id, or null. A device taking over the ingest worker's
 * id would kick it off and be handed its persistent session — the unacknowledged readings.
 */
export function clientIdRefusal(identity: Identity, clientId: string): string | null {
  if (identity.kind === 'device' && clientId.startsWith(SERVICE_CLIENT_ID_PREFIX)) {
    return `client id prefix '${SERVICE_CLIENT_ID_PREFIX}' is reserved for services`;
  }
  return null;
}

/** Why this publish is refused, or null when it is allowed. */
export function publishRefusal(identity: Identity | undefined, topic: string, payloadBytes: number): string | null {
  if (!identity) return 'not authenticated';
  if (topic.startsWith('$')) return 'publishing to $ topics is not allowed';
  if (payloadBytes > MAX_PAYLOAD_BYTES) return `payload of ${payloadBytes} bytes exceeds ${MAX_PAYLOAD_BYTES}`;
  if (identity.kind === 'service') return null;
  if (isInternalTopic(topic)) return 'internal topics are for the service account only';
  if (!topic.startsWith(`${TOPIC_PREFIX}/${identity.siteTag}/`)) {
    return `device '${identity.username}' may publish only under ${TOPIC_PREFIX}/${identity.siteTag}/`;
  }
  return null;
}

/** Why this subscription is refused, or null: devices only publish; the service account may read anything. */
export function subscribeRefusal(identity: Identity | undefined): string | null {
  if (!identity) return 'not authenticated';
  if (identity.kind === 'device') return 'devices may not subscribe';
  return null;
}
