import protobuf from 'protobufjs/light.js';

/**
 * The Sparkplug B payload (Eclipse Sparkplug 3.0, chapter 6 "Payloads", schema
 * org.eclipse.tahu.protobuf.Payload), transcribed field by field into a protobufjs
 * descriptor and decoded with protobufjs 8. The Eclipse Tahu npm codec pins protobufjs 6,
 * which carries published advisories; README "Sparkplug B edge nodes" says why this route.
 * DataSet, Template and extension values are not described: a decoder skips unknown
 * fields, and a metric holding one arrives with no value (dead-lettered if it is mapped).
 */
const descriptor = {
  nested: {
    Payload: {
      fields: {
        timestamp: { type: 'uint64', id: 1 },
        metrics: { rule: 'repeated', type: 'Metric', id: 2 },
        seq: { type: 'uint64', id: 3 },
        uuid: { type: 'string', id: 4 },
        body: { type: 'bytes', id: 5 },
      },
      nested: {
        Metric: {
          oneofs: { value: { oneof: ['intValue', 'longValue', 'floatValue', 'doubleValue', 'booleanValue', 'stringValue', 'bytesValue'] } },
          fields: {
            name: { type: 'string', id: 1 },
            alias: { type: 'uint64', id: 2 },
            timestamp: { type: 'uint64', id: 3 },
            datatype: { type: 'uint32', id: 4 },
            isHistorical: { type: 'bool', id: 5 },
            isTransient: { type: 'bool', id: 6 },
            isNull: { type: 'bool', id: 7 },
            properties: { type: 'PropertySet', id: 9 },
            intValue: { type: 'uint32', id: 10 },
            longValue: { type: 'uint64', id: 11 },
            floatValue: { type: 'float', id: 12 },
            doubleValue: { type: 'double', id: 13 },
            booleanValue: { type: 'bool', id: 14 },
            stringValue: { type: 'string', id: 15 },
            bytesValue: { type: 'bytes', id: 16 },
          },
        },
        PropertySet: {
          fields: {
            keys: { rule: 'repeated', type: 'string', id: 1 },
            values: { rule: 'repeated', type: 'PropertyValue', id: 2 },
          },
        },
        PropertyValue: {
          oneofs: { value: { oneof: ['intValue', 'longValue', 'floatValue', 'doubleValue', 'booleanValue', 'stringValue'] } },
          fields: {
            type: { type: 'uint32', id: 1 },
            isNull: { type: 'bool', id: 2 },
            intValue: { type: 'uint32', id: 3 },
            longValue: { type: 'uint64', id: 4 },
            floatValue: { type: 'float', id: 5 },
            doubleValue: { type: 'double', id: 6 },
            booleanValue: { type: 'bool', id: 7 },
            stringValue: { type: 'string', id: 8 },
          },
        },
      },
    },
  },
};

const PayloadType = protobuf.Root.fromJSON(descriptor).lookupType('Payload');

/** Sparkplug B data types (spec 3.0 §6.4.16). */
export const DataType = {
  Int8: 1, Int16: 2, Int32: 3, Int64: 4, UInt8: 5, UInt16: 6, UInt32: 7, UInt64: 8,
  Float: 9, Double: 10, Boolean: 11, String: 12, DateTime: 13, Text: 14,
} as const;
const TYPE_NAMES = new Map<number, string>(Object.entries(DataType).map(([k, v]) => [v, k]));
export const dataTypeName = (t: number | undefined): string => (t === undefined ? 'none' : TYPE_NAMES.get(t) ?? `type ${t}`);
const NUMERIC = new Set<number>([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
export const isNumericType = (t: number | undefined): boolean => t !== undefined && NUMERIC.has(t);

export type MetricValue = number | boolean | string | Buffer | null;
export type Metric = {
  name?: string;
  alias?: number;
  timestamp?: number;
  datatype?: number;
  isHistorical?: boolean;
  isNull?: boolean;
  properties?: Record<string, MetricValue>;
  value: MetricValue;
};
export type Payload = { timestamp?: number; seq?: number; uuid?: string; metrics: Metric[] };

type RawValue = {
  intValue?: number; longValue?: number; floatValue?: number; doubleValue?: number;
  booleanValue?: boolean; stringValue?: string; bytesValue?: Buffer;
};
type RawMetric = RawValue & {
  name?: string; alias?: number; timestamp?: number; datatype?: number; isHistorical?: boolean; isNull?: boolean;
  properties?: { keys?: string[]; values?: (RawValue & { isNull?: boolean; type?: number })[] };
};

/**
 * Signed types travel as two's complement in the unsigned wire fields (spec 3.0 §6.4.16):
 * an Int8 of −1 arrives as intValue 255 (or 4294967295 from some encoders).
 */
function toSigned(v: number, datatype: number | undefined): number {
  const bits = datatype === DataType.Int8 ? 8 : datatype === DataType.Int16 ? 16 : datatype === DataType.Int32 ? 32 : 0;
  if (!bits) return v;
  const low = v % 2 ** bits;
  return low >= 2 ** (bits - 1) ? low - 2 ** bits : low;
}

function valueOf(m: RawValue & { isNull?: boolean }, datatype: number | undefined): MetricValue {
  if (m.isNull) return null;
  if (m.intValue !== undefined) return toSigned(m.intValue, datatype);
  if (m.longValue !== undefined) return datatype === DataType.Int64 ? Number(BigInt.asIntN(64, BigInt(m.longValue))) : m.longValue;
  if (m.floatValue !== undefined) return m.floatValue;
  if (m.doubleValue !== undefined) return m.doubleValue;
  if (m.booleanValue !== undefined) return m.booleanValue;
  if (m.stringValue !== undefined) return m.stringValue;
  if (m.bytesValue !== undefined) return m.bytesValue;
  return null;
}

/** Bytes → payload; throws on bytes that are not a Sparkplug B payload. */
export function decodePayload(bytes: Uint8Array): Payload {
  const msg = PayloadType.decode(bytes);
  const o = PayloadType.toObject(msg, { longs: Number, bytes: Buffer, oneofs: false, defaults: false }) as {
    timestamp?: number; seq?: number; uuid?: string; metrics?: RawMetric[];
  };
  return {
    timestamp: o.timestamp, seq: o.seq, uuid: o.uuid,
    metrics: (o.metrics ?? []).map((m) => {
      const props = m.properties?.keys?.length
        ? Object.fromEntries(m.properties.keys.map((k, i) => [k, valueOf(m.properties!.values?.[i] ?? {}, m.properties!.values?.[i]?.type)]))
        : undefined;
      return {
        name: m.name, alias: m.alias, timestamp: m.timestamp, datatype: m.datatype,
        isHistorical: m.isHistorical, isNull: m.isNull, properties: props, value: valueOf(m, m.datatype),
      };
    }),
  };
}

/** The host's one command: NCMD "Node Control/Rebirth" = true (spec 3.0 §6.4.22, host duties). */
export function encodeRebirth(nowMs: number): Uint8Array {
  return PayloadType.encode(PayloadType.fromObject({
    timestamp: nowMs,
    metrics: [{ name: 'Node Control/Rebirth', timestamp: nowMs, datatype: DataType.Boolean, booleanValue: true }],
  })).finish();
}
