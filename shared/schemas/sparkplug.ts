import { z } from 'zod';

/**
 * Sparkplug B 3.0 (Eclipse Sparkplug specification): topic namespace and the Plant setup
 * mapping from edge-node metrics to probes. README "Sparkplug B edge nodes".
 */
export const SPARKPLUG_NAMESPACE = 'spBv1.0';
export const REBIRTH_METRIC = 'Node Control/Rebirth';
export const BDSEQ_METRIC = 'bdSeq';

export const SPARKPLUG_MESSAGE_TYPES = ['NBIRTH', 'NDEATH', 'DBIRTH', 'DDEATH', 'NDATA', 'DDATA', 'NCMD', 'DCMD'] as const;
export type SparkplugMessageType = (typeof SPARKPLUG_MESSAGE_TYPES)[number];

/** Sparkplug ids are UTF-8 strings without the MQTT wildcards and separator (spec §4.1.1). */
const idSchema = z.string().trim().min(1, 'required').max(64, 'at most 64 characters')
  .regex(/^[^/+#]+$/, 'may not contain / + or #');

export const sparkplugGroupCreateSchema = z.object({
  siteId: z.number().int().positive(),
  groupId: idSchema,
}).strict();
export type SparkplugGroupCreate = z.infer<typeof sparkplugGroupCreateSchema>;

export const SPARKPLUG_ROLES = ['orp', 'temp'] as const;
export type SparkplugRole = (typeof SPARKPLUG_ROLES)[number];
/** The unit each role must carry when the birth gives one (engineering-unit property, common practice). */
export const ROLE_UNITS: Record<SparkplugRole, { label: string; accepted: string[] }> = {
  orp: { label: 'ORP in mV', accepted: ['mv', 'millivolt', 'millivolts'] },
  temp: { label: 'temperature in °C', accepted: ['°c', 'degc', 'deg c', 'c', 'celsius', '℃'] },
};

export const sparkplugMappingCreateSchema = z.object({
  groupId: idSchema,
  edgeNodeId: idSchema,
  /** Empty or absent: a metric of the edge node itself (NBIRTH/NDATA). */
  deviceId: z.union([idSchema, z.literal('')]).optional().default(''),
  metricName: z.string().trim().min(1, 'required').max(190, 'at most 190 characters'),
  role: z.enum(SPARKPLUG_ROLES),
  probeId: z.number().int().positive(),
}).strict();
export type SparkplugMappingCreate = z.infer<typeof sparkplugMappingCreateSchema>;

export type SparkplugGroup = { id: number; siteId: number; siteTag: string; groupId: string };
export type SparkplugMapping = {
  id: number; groupId: string; edgeNodeId: string; deviceId: string; metricName: string;
  role: SparkplugRole; probeId: number; probeTag: string; siteTag: string;
};
export type SparkplugEvent = {
  id: number; at: string; groupId: string; edgeNodeId: string; deviceId: string;
  kind: 'birth' | 'death' | 'rebirth-requested' | 'ignored'; detail: string;
};
export type SparkplugSetup = { hostId: string; groups: SparkplugGroup[]; mappings: SparkplugMapping[]; events: SparkplugEvent[] };

export type SparkplugTopic =
  | { kind: 'message'; groupId: string; type: SparkplugMessageType; edgeNodeId: string; deviceId: string | null }
  | { kind: 'state'; hostId: string };

/** spBv1.0/<group>/<type>/<edge node>[/<device>] or spBv1.0/STATE/<host>; null when neither. */
export function parseSparkplugTopic(topic: string): SparkplugTopic | null {
  const parts = topic.split('/');
  if (parts[0] !== SPARKPLUG_NAMESPACE) return null;
  if (parts.length === 3 && parts[1] === 'STATE' && parts[2]) return { kind: 'state', hostId: parts[2] };
  if (parts.length !== 4 && parts.length !== 5) return null;
  const [, groupId, type, edgeNodeId, deviceId] = parts;
  if (!groupId || !edgeNodeId || !(SPARKPLUG_MESSAGE_TYPES as readonly string[]).includes(type!)) return null;
  const isDevice = type!.startsWith('D');
  if (isDevice !== (parts.length === 5) || (isDevice && !deviceId)) return null;
  return { kind: 'message', groupId, type: type as SparkplugMessageType, edgeNodeId, deviceId: isDevice ? deviceId! : null };
}

export const sparkplugTopic = (groupId: string, type: SparkplugMessageType, edgeNodeId: string, deviceId?: string | null) =>
  [SPARKPLUG_NAMESPACE, groupId, type, edgeNodeId, ...(deviceId ? [deviceId] : [])].join('/');
export const sparkplugStateTopic = (hostId: string) => `${SPARKPLUG_NAMESPACE}/STATE/${hostId}`;

/** The host's STATE payload (spec 3.0: JSON, retained, QoS 1; the Will says online: false with the same timestamp). */
export const sparkplugStateSchema = z.object({ online: z.boolean(), timestamp: z.number().int().nonnegative() });
export type SparkplugState = z.infer<typeof sparkplugStateSchema>;
