/**
 * The numbered stream behind every fault-injection run:
 * each probe gets its own sequence 1, 2, 3…; ts and orpMv are pure functions of (probe, seq),
 * so a reading sent twice is byte-identical and the generator can state, without looking at
 * the database, what COUNT, seq range and BIT_XOR(CRC32(…)) the readings table must show.
 */
import { createHash } from 'node:crypto';
import { crc32 } from 'node:zlib';
import { toSqlTs } from '../../../api/src/db/timestamps.ts';
import { batchTopic } from '../../../shared/schemas/readings.ts';

export type StreamProbe = { tag: string; id: number };
export type StreamReading = { probe: string; probeId: number; seq: number; ts: string; orpMv: number; tempC: number };
export type StreamMessage = { topic: string; payload: string; readings: StreamReading[] };

/** What the generator expects to find for one set of readings. */
export type Expected = {
  count: number;
  /** probe id → { count, min seq, max seq } */
  perProbe: Map<number, { count: number; lo: number; hi: number }>;
  /** XOR of CRC32('probeId,seq,YYYY-MM-DD HH:MM:SS.mmm,orpMv'), unsigned 32-bit. */
  checksum: number;
  /**
   * XOR of the first 32 bits of MD5 of the same text. CRC32 is affine over GF(2), so XORs of
   * CRCs of structured rows can cancel (a 36,000-reading stream summed to 00000000); MD5 cannot.
   */
  checksumMd5: number;
  /** Only rows with seq above this belong to the stream (earlier streams on the same probes sit below). */
  seqAbove: number;
};


/**
 * The text MariaDB's CONCAT_WS(',', probe_id, seq, ts, orp_mv) produces for a stored row.
 * orpMv is kept to whole or half millivolts so JS and MariaDB print the double the same way.
 */
export function rowText(r: Pick<StreamReading, 'probeId' | 'seq' | 'ts' | 'orpMv'>): string {
  return `${r.probeId},${r.seq},${toSqlTs(Date.parse(r.ts))},${r.orpMv}`;
}

/** Running Expected: readings are added one by one, so a long soak keeps no per-reading state. */
export class Tally {
  constructor(readonly seqAbove = 0) {}
  count = 0;
  checksum = 0;
  checksumMd5 = 0;
  readonly perProbe = new Map<number, { count: number; lo: number; hi: number }>();

  add(r: StreamReading): void {
    this.count += 1;
    const text = rowText(r);
    this.checksum = (this.checksum ^ crc32(text)) >>> 0;
    this.checksumMd5 = (this.checksumMd5 ^ parseInt(createHash('md5').update(text).digest('hex').slice(0, 8), 16)) >>> 0;
    const p = this.perProbe.get(r.probeId);
    if (!p) this.perProbe.set(r.probeId, { count: 1, lo: r.seq, hi: r.seq });
    else {
      p.count += 1;
      p.lo = Math.min(p.lo, r.seq);
      p.hi = Math.max(p.hi, r.seq);
    }
  }

  snapshot(): Expected {
    return { count: this.count, checksum: this.checksum, checksumMd5: this.checksumMd5, seqAbove: this.seqAbove, perProbe: new Map([...this.perProbe].map(([k, v]) => [k, { ...v }])) };
  }
}

export function expectedOf(readings: Iterable<StreamReading>, seqAbove = 0): Expected {
  const t = new Tally(seqAbove);
  for (const r of readings) t.add(r);
  return t.snapshot();
}

export type StreamOptions = {
  siteTag: string;
  probes: StreamProbe[];
  /**
   * ts of the first seq. Default: 80 days ago plus one day per SEQ_SPAN of seqStart, so streams
   * on the same probes never share a (probe, ts) and all stay inside the 90-day retention window.
   */
  originMs?: number;
  /** ts step per seq, ms; 1 ms lets a stream run for hours without reaching "now". */
  stepMs?: number;
  /** Last seq already used per probe (a second stream on the same probes starts above it). */
  seqStart?: number;
};

/**
 * Generates batch messages round-robin over the probes. `sent` tallies every reading handed
 * out, `acked` those whose message the broker acknowledged (the caller marks them).
 */
export class NumberedStream {
  readonly sent: Tally;
  readonly acked: Tally;
  private readonly seqs = new Map<string, number>();
  private readonly originMs: number;
  private readonly stepMs: number;
  private cursor = 0;

  constructor(private readonly o: StreamOptions) {
    this.sent = new Tally(o.seqStart ?? 0);
    this.acked = new Tally(o.seqStart ?? 0);
    const day = 86_400_000;
    this.originMs = o.originMs ?? Math.floor(Date.now() / 60_000) * 60_000 - 80 * day + Math.floor((o.seqStart ?? 0) / 1_000_000) * day;
    this.stepMs = o.stepMs ?? 1;
  }

  reading(probe: StreamProbe, seq: number): StreamReading {
    const h = (seq * 7 + probe.id * 13) % 400;
    return {
      probe: probe.tag, probeId: probe.id, seq, ts: new Date(this.originMs + (seq - (this.o.seqStart ?? 0)) * this.stepMs).toISOString(),
      orpMv: 300 + h + (seq % 2 ? 0.5 : 0), tempC: 40 + (seq % 5),
    };
  }

  /** The next `size` readings as one batch message. */
  next(size: number): StreamMessage {
    const readings: StreamReading[] = [];
    for (let i = 0; i < size; i += 1) {
      const probe = this.o.probes[this.cursor++ % this.o.probes.length];
      const seq = (this.seqs.get(probe.tag) ?? this.o.seqStart ?? 0) + 1;
      this.seqs.set(probe.tag, seq);
      const r = this.reading(probe, seq);
      readings.push(r);
      this.sent.add(r);
    }
    const body = readings.map(({ probe, ts, orpMv, tempC, seq }) => ({ probe, ts, orpMv, tempC, seq }));
    return { topic: batchTopic(this.o.siteTag), payload: JSON.stringify({ readings: body }), readings };
  }

  markAcked(readings: StreamReading[]): void {
    for (const r of readings) this.acked.add(r);
  }

  get probeIds(): number[] {
    return this.o.probes.map((p) => p.id);
  }
}
