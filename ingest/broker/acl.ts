import { MAX_PAYLOAD_BYTES, TOPIC_PREFIX } from '../../shared/schemas/readings.ts';
import { isInternalTopic } from '../../shared/schemas/internal-topics.ts';
import { parseSparkplugTopic, SPARKPLUG_NAMESPACE } from '../../shared/schemas/sparkplug.ts';
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
  if (topic.startsWith(`${SPARKPLUG_NAMESPACE}/`)) {
    // An edge node publishes its births, data and deaths in its site's groups; commands and STATE are the host's.
    const t = parseSparkplugTopic(topic);
    if (!t || t.kind !== 'message' || t.type === 'NCMD' || t.type === 'DCMD') return 'devices may publish only NBIRTH, NDATA, NDEATH, DBIRTH, DDATA and DDEATH';
    if (!identity.sparkplugGroups.includes(t.groupId)) return `device '${identity.username}' may not publish in Sparkplug group '${t.groupId}'`;
    return null;
  }
  if (!topic.startsWith(`${TOPIC_PREFIX}/${identity.siteTag}/`)) {
    return `device '${identity.username}' may publish only under ${TOPIC_PREFIX}/${identity.siteTag}/`;
  }
  return null;
}

/**
 * Why this subscription is refused, or null. The service account may read anything; a device
 * only its own Sparkplug commands (NCMD/DCMD in its site's groups) and host STATE, which an
 * edge node of spec 3.0 watches before it publishes.
 */
export function subscribeRefusal(identity: Identity | undefined, filter = ''): string | null {
  if (!identity) return 'not authenticated';
  if (identity.kind === 'service') return null;
  const parts = filter.split('/');
  if (parts[0] === SPARKPLUG_NAMESPACE) {
    if (parts.length === 3 && parts[1] === 'STATE' && !parts[2]!.includes('#')) return null;
    const [, group, type] = parts;
    if (group && identity.sparkplugGroups.includes(group) && (type === 'NCMD' || type === 'DCMD') && parts.length >= 4) return null;
  }
  return 'devices may subscribe only to Sparkplug commands in their groups and host STATE';
}
