/**
 * The protocol's own limit on one MQTT packet, well above the device contract's 256 KiB so
 * an oversized payload still arrives whole and is judged (and dead-lettered) as content.
 * Past this the connection is closed: MQTT 3.1.1 has no way to refuse a packet and go on.
 */
export const MAX_PACKET_BYTES = 1024 * 1024;

type Parser = { packet: { length: number }; _parseLength: () => boolean; _emitError: (err: Error) => void };

/**
 * Makes an aedes client's packet parser (mqtt-packet) fail as soon as a packet header
 * announces more than maxBytes, before the body is buffered. mqtt-packet has no such option
 * for MQTT 3.1.1, so its length step is wrapped.
 */
export function limitPacketSize(client: unknown, maxBytes = MAX_PACKET_BYTES): void {
  const parser = (client as { _parser?: Parser })._parser;
  if (!parser || typeof parser._parseLength !== 'function') return;
  const parseLength = parser._parseLength.bind(parser);
  parser._parseLength = () => {
    const ok = parseLength();
    if (ok && parser.packet.length > maxBytes) {
      parser._emitError(new Error(`packet of ${parser.packet.length} bytes exceeds ${maxBytes}`));
      return false;
    }
    return ok;
  };
}
