import { placeholders, toSqlTs, type PoolConnection } from '../../db/pool.ts';

/** One refused message or batch element, kept for people to inspect and replay. */
export type DeadLetter = { topic: string; payload: Buffer; reason: string; receivedAtMs: number };

/** Stored payload size cap, bytes (text) — the full size is kept in payload_bytes. */
export const DEAD_LETTER_PAYLOAD_BYTES = 4096;

const utf8 = new TextDecoder('utf-8', { fatal: true });

/**
 * Payload as storable text: UTF-8 cut to 4 KB on a character boundary, or — when those bytes
 * are not UTF-8 — 'hex:' plus the hex of the first bytes, so nothing binary reaches a TEXT column.
 * Only the part that is kept is decoded: a hostile 250 KB payload costs no more than a 4 KB one.
 */
export function renderPayload(payload: Buffer): string {
  let end = payload.length;
  if (end > DEAD_LETTER_PAYLOAD_BYTES) {
    end = DEAD_LETTER_PAYLOAD_BYTES;
    // Step back over UTF-8 continuation bytes (10xxxxxx) so no character is split.
    while (end > 0 && (payload[end] & 0xc0) === 0x80) end -= 1;
  }
  try {
    return utf8.decode(payload.subarray(0, end));
  } catch {
    return `hex:${payload.subarray(0, (DEAD_LETTER_PAYLOAD_BYTES - 4) / 2).toString('hex')}`;
  }
}

const clip = (s: string, max: number) => (s.length > max ? `${s.slice(0, max - 1)}…` : s);

/** Inserts dead letters in one statement (inside the caller's transaction). */
export async function insertDeadLetters(conn: PoolConnection, letters: DeadLetter[]): Promise<void> {
  if (letters.length === 0) return;
  const params: (string | number)[] = [];
  for (const l of letters) {
    params.push(clip(l.topic, 300), renderPayload(l.payload), l.payload.length, clip(l.reason, 1000), toSqlTs(l.receivedAtMs));
  }
  await conn.execute(
    `INSERT INTO dead_letters (topic, payload, payload_bytes, reason, received_at) VALUES ${placeholders(letters.length, 5)}`,
    params,
  );
}
