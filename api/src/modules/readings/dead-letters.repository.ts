import { createHash } from 'node:crypto';
import type { DeadLetterKind } from '../../../../shared/schemas/dead-letters.ts';
import { parseTopic } from '../../../../shared/schemas/readings.ts';
import { placeholders, toSqlTs, type PoolConnection } from '../../db/pool.ts';

/**
 * One refused message or batch element, kept for people to inspect and replay. gateway is
 * the sending device's username when the broker knows it (the worker only sees the topic).
 */
export type DeadLetter = { topic: string; payload: Buffer; reason: string; receivedAtMs: number; gateway?: string | null };

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

const KIND_RULES: Array<[RegExp, DeadLetterKind]> = [
  [/payload (too large|of \d+ bytes exceeds)/, 'too-large'],
  [/internal topics|may publish only under|\$ topics/, 'forbidden-topic'],
  [/unknown topic/, 'unknown-topic'],
  [/not UTF-8/, 'not-utf8'],
  [/invalid JSON/, 'bad-json'],
  [/unknown site/, 'unknown-site'],
  [/unknown probe/, 'unknown-probe'],
  [/does not belong to site/, 'wrong-site'],
  [/in the future|older than the raw retention/, 'clock'],
  [/no calibration/, 'no-calibration'],
  [/conversion failed/, 'conversion'],
  // Last: an element's reason starts with its index whatever went wrong.
  [/invalid (reading|batch)|^readings\[\d+\]: /, 'bad-fields'],
];

/** The short kind of a reason, for filters and counts; the full reason is kept beside it. */
export function reasonKind(reason: string): DeadLetterKind {
  return KIND_RULES.find(([re]) => re.test(reason))?.[1] ?? 'other';
}

/** Same topic, bytes and reason → same fingerprint: the unique key that keeps a re-sent message to one row. */
export function fingerprint(topic: string, payload: Buffer, reason: string): Buffer {
  return createHash('sha256').update(topic).update('\0').update(payload).update('\0').update(reason).digest();
}

/** Site and probe a letter was aimed at, from its topic and (for a batch element) its payload. */
function aimedAt(topic: string, payload: Buffer): { siteTag: string | null; probeTag: string | null } {
  const t = parseTopic(topic);
  if (!t) return { siteTag: null, probeTag: null };
  if (t.kind === 'reading') return { siteTag: t.siteTag, probeTag: t.probeTag };
  let probeTag: string | null = null;
  if (payload.length < 512) {
    try {
      const p = (JSON.parse(payload.toString('utf8')) as { probe?: unknown }).probe;
      if (typeof p === 'string') probeTag = p.slice(0, 40);
    } catch {
      // Not a single batch element: no probe to name.
    }
  }
  return { siteTag: t.siteTag, probeTag };
}

const DUPLICATE_KEY = 1062;

/**
 * Inserts dead letters in one statement (inside the caller's transaction), skipping any whose
 * fingerprint is already stored: a device re-sending a refused message adds nothing. The
 * table is insert-only for the app, so this reads the fingerprints first rather than updating;
 * when the broker and the worker race on the same fingerprint the statement is retried once.
 */
export async function insertDeadLetters(conn: PoolConnection, letters: DeadLetter[], retry = true): Promise<void> {
  if (letters.length === 0) return;
  const byPrint = new Map<string, { l: DeadLetter; fp: Buffer }>();
  for (const l of letters) {
    const fp = fingerprint(l.topic, l.payload, l.reason);
    byPrint.set(fp.toString('hex'), { l, fp });
  }
  const known: { fp: string }[] = await conn.query(
    `SELECT HEX(fingerprint) AS fp FROM dead_letters WHERE fingerprint IN (${[...byPrint.keys()].map(() => 'UNHEX(?)').join(',')})`,
    [...byPrint.keys()]);
  for (const k of known) byPrint.delete(k.fp.toLowerCase());
  if (byPrint.size === 0) return;
  const params: (string | number | Buffer | null)[] = [];
  for (const { l, fp } of byPrint.values()) {
    const { siteTag, probeTag } = aimedAt(l.topic, l.payload);
    params.push(clip(l.topic, 300), renderPayload(l.payload), l.payload.length, clip(l.reason, 1000), toSqlTs(l.receivedAtMs),
      fp, l.gateway ? clip(l.gateway, 64) : null, siteTag, probeTag, reasonKind(l.reason));
  }
  try {
    await conn.execute(
      `INSERT INTO dead_letters (topic, payload, payload_bytes, reason, received_at, fingerprint, gateway, site_tag, probe_tag, reason_kind)
       VALUES ${placeholders(byPrint.size, 10)}`,
      params,
    );
  } catch (err) {
    if ((err as { errno?: number }).errno !== DUPLICATE_KEY || !retry) throw err;
    await insertDeadLetters(conn, letters, false);
  }
}
