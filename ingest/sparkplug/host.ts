import { readingFieldsSchema } from '../../shared/schemas/readings.ts';
import {
  BDSEQ_METRIC, ROLE_UNITS, type SparkplugMapping, type SparkplugMessageType, type SparkplugRole,
} from '../../shared/schemas/sparkplug.ts';
import { describeIssues, type Decoded, type DecodedReading, type Rejection } from '../../api/src/modules/readings/decode.ts';
import { dataTypeName, isNumericType, type Metric, type Payload } from './payload.ts';

/**
 * The Sparkplug B 3.0 host's bookkeeping, without I/O (connection.ts does the MQTT side):
 * births define aliases, data types and units; data uses them; seq (0–255, wrapping) must
 * run without gaps per edge node; deaths mark probes offline at once. Mapped ORP and
 * temperature metrics become readings of the JSON contract's shape, so they take the same
 * validation, conversion, idempotent store and dead-letter path.
 */
export type HostEvent = { groupId: string; edgeNodeId: string; deviceId: string; kind: 'birth' | 'death' | 'rebirth-requested' | 'ignored'; detail: string };

export type HostResult = {
  decoded: Decoded;
  /** Ask this node for a rebirth (NCMD Node Control/Rebirth). */
  rebirth: { groupId: string; edgeNodeId: string } | null;
  /** Probes whose node or device just died: stale from now. */
  offline: { siteTag: string; probeIds: number[] }[];
  events: HostEvent[];
};

type Known = { name: string; deviceId: string; datatype?: number; unit?: string };
type NodeState = {
  bdSeq: number | null;
  seq: number | null;
  /** alias → metric, for the node and all its devices (aliases are unique per edge node). */
  aliases: Map<number, Known>;
  /** `${deviceId}\0${name}` → what its birth said. */
  metrics: Map<string, Known>;
  devices: Set<string>;
  lastRebirthAskMs: number;
};

const UNIT_KEYS = ['engUnit', 'engUnits', 'units', 'unit'];
/** A node that ignores a rebirth request is asked again after this long, not on every message. */
export const REBIRTH_RETRY_MS = 5_000;

const mkey = (deviceId: string, name: string) => `${deviceId}\0${name}`;

/** Plant setup's mapping, indexed for the host. */
export class SparkplugIndex {
  private byMetric = new Map<string, SparkplugMapping>();
  private byNode = new Map<string, SparkplugMapping[]>();
  groups: string[] = [];

  constructor(mappings: SparkplugMapping[] = [], groups: string[] = []) {
    this.set(mappings, groups);
  }

  set(mappings: SparkplugMapping[], groups: string[]): void {
    this.byMetric = new Map(mappings.map((m) => [[m.groupId, m.edgeNodeId, m.deviceId, m.metricName].join('\0'), m]));
    this.byNode = new Map();
    for (const m of mappings) {
      const k = `${m.groupId}\0${m.edgeNodeId}`;
      this.byNode.set(k, [...(this.byNode.get(k) ?? []), m]);
    }
    this.groups = [...new Set(groups)].sort();
  }

  metric(groupId: string, edgeNodeId: string, deviceId: string, name: string): SparkplugMapping | undefined {
    return this.byMetric.get([groupId, edgeNodeId, deviceId, name].join('\0'));
  }

  /** Mapped probes of a node (deviceId undefined: the node and all its devices). */
  probesOf(groupId: string, edgeNodeId: string, deviceId?: string): { siteTag: string; probeIds: number[] }[] {
    const list = (this.byNode.get(`${groupId}\0${edgeNodeId}`) ?? []).filter((m) => deviceId === undefined || m.deviceId === deviceId);
    const bySite = new Map<string, Set<number>>();
    for (const m of list) bySite.set(m.siteTag, (bySite.get(m.siteTag) ?? new Set()).add(m.probeId));
    return [...bySite].map(([siteTag, ids]) => ({ siteTag, probeIds: [...ids].sort((a, b) => a - b) }));
  }
}

export class SparkplugHost {
  private nodes = new Map<string, NodeState>();
  /** Last temperature per probe: an ORP value pairs with it when its message carries none. */
  private temps = new Map<number, number>();

  constructor(private readonly index: SparkplugIndex) {}

  handle(groupId: string, type: SparkplugMessageType, edgeNodeId: string, deviceId: string | null, p: Payload, receivedAtMs: number): HostResult {
    const out: HostResult = { decoded: { readings: [], rejections: [] }, rebirth: null, offline: [], events: [] };
    const key = `${groupId}\0${edgeNodeId}`;
    const dev = deviceId ?? '';
    const event = (kind: HostEvent['kind'], detail: string) => out.events.push({ groupId, edgeNodeId, deviceId: dev, kind, detail });
    let node = this.nodes.get(key);
    const askRebirth = (why: string) => {
      const n = node ?? this.fresh(key);
      if (receivedAtMs - n.lastRebirthAskMs < REBIRTH_RETRY_MS) return;
      n.lastRebirthAskMs = receivedAtMs;
      out.rebirth = { groupId, edgeNodeId };
      event('rebirth-requested', why);
    };

    if (type === 'NBIRTH') {
      const asked = node?.lastRebirthAskMs ?? 0;
      node = this.fresh(key);
      node.lastRebirthAskMs = asked;
      const bd = p.metrics.find((m) => m.name === BDSEQ_METRIC);
      node.bdSeq = typeof bd?.value === 'number' ? bd.value : null;
      node.seq = p.seq ?? null;
      this.learn(node, '', p.metrics);
      event('birth', `node birth, bdSeq ${node.bdSeq ?? 'none'}, ${p.metrics.length} metrics`);
      this.values(groupId, edgeNodeId, '', node, p, receivedAtMs, out);
      return out;
    }
    if (type === 'NDEATH') {
      const bd = p.metrics.find((m) => m.name === BDSEQ_METRIC);
      const bdSeq = typeof bd?.value === 'number' ? bd.value : null;
      // A death certificate from an older session must not take down the current one (spec 3.0 host duties).
      if (node && node.bdSeq !== null && bdSeq !== null && bdSeq !== node.bdSeq) {
        event('ignored', `node death with bdSeq ${bdSeq}, current session has bdSeq ${node.bdSeq}`);
        return out;
      }
      this.nodes.delete(key);
      out.offline = this.index.probesOf(groupId, edgeNodeId);
      event('death', `node death (bdSeq ${bdSeq ?? 'none'}): its probes and its devices' probes are stale`);
      return out;
    }
    if (type === 'NCMD' || type === 'DCMD') return out;

    // Every other message needs a born node, a born device (D…) and the next seq.
    if (!node) {
      askRebirth(`${type} before the node's birth`);
      return out;
    }
    if (p.seq !== undefined && node.seq !== null) {
      const expected = (node.seq + 1) % 256;
      if (p.seq !== expected) askRebirth(`seq gap: expected ${expected}, got ${p.seq} (${type})`);
    }
    if (p.seq !== undefined) node.seq = p.seq;

    if (type === 'DBIRTH') {
      node.devices.add(dev);
      this.learn(node, dev, p.metrics);
      event('birth', `device birth, ${p.metrics.length} metrics`);
      this.values(groupId, edgeNodeId, dev, node, p, receivedAtMs, out);
      return out;
    }
    if (type === 'DDEATH') {
      node.devices.delete(dev);
      out.offline = this.index.probesOf(groupId, edgeNodeId, dev);
      event('death', 'device death: its probes are stale');
      return out;
    }
    if (type === 'DDATA' && !node.devices.has(dev)) {
      askRebirth(`DDATA before the device's birth`);
      return out;
    }
    this.values(groupId, edgeNodeId, dev, node, p, receivedAtMs, out);
    return out;
  }

  /** Forget everything (the host reconnected: its view of the nodes is no longer current). */
  reset(): void {
    this.nodes.clear();
  }

  private fresh(key: string): NodeState {
    const n: NodeState = { bdSeq: null, seq: null, aliases: new Map(), metrics: new Map(), devices: new Set(), lastRebirthAskMs: -Infinity };
    this.nodes.set(key, n);
    return n;
  }

  private learn(node: NodeState, deviceId: string, metrics: Metric[]): void {
    for (const m of metrics) {
      if (!m.name) continue;
      const unitKey = UNIT_KEYS.find((k) => typeof m.properties?.[k] === 'string');
      const known: Known = { name: m.name, deviceId, datatype: m.datatype, unit: unitKey ? String(m.properties![unitKey]) : undefined };
      node.metrics.set(mkey(deviceId, m.name), known);
      if (m.alias !== undefined) node.aliases.set(m.alias, known);
    }
  }

  /** Mapped metrics of one message → readings or dead letters. Temperatures first, so an ORP value pairs with the temperature sent beside it. */
  private values(groupId: string, edgeNodeId: string, deviceId: string, node: NodeState, p: Payload, receivedAtMs: number, out: HostResult): void {
    const resolved: { m: Metric; known: Known | undefined; name: string; map: SparkplugMapping }[] = [];
    for (const m of p.metrics) {
      const byAlias = m.alias !== undefined ? node.aliases.get(m.alias) : undefined;
      const name = m.name ?? byAlias?.name;
      if (!name) continue;
      const known = node.metrics.get(mkey(deviceId, name)) ?? byAlias;
      const map = this.index.metric(groupId, edgeNodeId, deviceId, name);
      if (map) resolved.push({ m, known, name, map });
    }
    const order = (r: SparkplugRole) => (r === 'temp' ? 0 : 1);
    resolved.sort((a, b) => order(a.map.role) - order(b.map.role));
    const where = `${groupId}/${edgeNodeId}${deviceId ? `/${deviceId}` : ''}`;
    for (const { m, known, name, map } of resolved) {
      const reject = (why: string) => out.decoded.rejections.push(rejection(where, name, m, `${where} metric "${name}" (probe ${map.probeTag}, ${ROLE_UNITS[map.role].label}): ${why}`));
      if (m.isNull || m.value === null) continue;
      const datatype = m.datatype ?? known?.datatype;
      if (!isNumericType(datatype) || typeof m.value !== 'number') {
        reject(`data type ${dataTypeName(datatype)}, expected a number`);
        continue;
      }
      const unit = known?.unit;
      if (unit !== undefined && !ROLE_UNITS[map.role].accepted.includes(unit.trim().toLowerCase())) {
        reject(`unit "${unit}", expected ${map.role === 'orp' ? 'mV' : '°C'}`);
        continue;
      }
      if (map.role === 'temp') {
        this.temps.set(map.probeId, m.value);
        continue;
      }
      const tempC = this.temps.get(map.probeId);
      if (tempC === undefined) {
        reject('no temperature known for this probe yet: map its temperature metric (°C) and send it in the birth');
        continue;
      }
      const tsMs = m.timestamp ?? p.timestamp ?? receivedAtMs;
      // seq is the reading's own time in ms: unique per probe and stable when a node re-sends.
      const fields = { ts: new Date(tsMs).toISOString(), orpMv: m.value, tempC, seq: tsMs };
      const ok = readingFieldsSchema.safeParse(fields);
      if (!ok.success) {
        reject(describeIssues(ok.error));
        continue;
      }
      const reading: DecodedReading = { siteTag: map.siteTag, probeTag: map.probeTag, ts: fields.ts, orpMv: fields.orpMv, tempC, seq: tsMs, index: null };
      out.decoded.readings.push(reading);
    }
  }
}

function rejection(where: string, name: string, m: Metric, reason: string): Rejection {
  const value = Buffer.isBuffer(m.value) ? `hex:${m.value.toString('hex')}` : m.value;
  const body = { metric: `${where}/${name}`, alias: m.alias, datatype: dataTypeName(m.datatype), value, timestamp: m.timestamp };
  return { reason, payload: Buffer.from(JSON.stringify(body), 'utf8') };
}
