import { placeholders, toSqlTs, type PoolConnection } from './db.ts';

/** One refused message or batch element, kept for people to inspect and replay. */
export type DeadLetter = { topic: string; payload: Buffer; reason: string; receivedAtMs: number };

/** Stored payload size cap, bytes (text) — the full size is kept in payload_bytes. */
export const DEAD_LETTER_PAYLOAD_BYTES = 4096;

const utf8 = new TextDecoder('utf-8', { fatal: true });

/**
 * Payload as storable text: UTF-8 cut to 4 KB on a character boundary, or — when the bytes
 * are not UTF-8 — 'hex:' plus the hex of the first bytes, so nothing binary reaches a TEXT column.
 */
export function renderPayload(payload: Buffer): string {
  try {
    utf8.decode(payload);
  } catch {
    return `hex:${payload.subarray(0, (DEAD_LETTER_PAYLOAD_BYTES - 4) / 2).toString('hex')}`;
  }
  if (payload.length <= DEAD_LETTER_PAYLOAD_BYTES) return payload.toString('utf8');
  let end = DEAD_LETTER_PAYLOAD_BYTES;
  // Step back over UTF-8 continuation bytes (10xxxxxx) so no character is split.
  while (end > 0 && (payload[end] & 0xc0) === 0x80) end -= 1;
  return payload.subarray(0, end).toString('utf8');
}

const clip = (s: string, max: number) => (s.length > max ? `${s.slice(0, max - 1)}…` : s);

/** Inserts dead letters in one statement (inside the caller's transaction). */
export async function insertDeadLetters(conn: PoolConnection, letters: DeadLetter[]): Promise<void> {
  if (letters.length === 0) return;
  const params: (string | number)[] = [];
  for (const l of letters) {
    params.push(clip(l.topic, 300), renderPayload(l.payload), l.payload.length, clip(l.reason, 1000), toSqlTs(l.receivedAtMs));
  }
  await conn.query(
    `INSERT INTO dead_letters (topic, payload, payload_bytes, reason, received_at) VALUES ${placeholders(letters.length, 5)}`,
    params,
  );
}
