import type { IngestHealth } from '../shared/schemas/ingest-health.ts';

export type { IngestHealth };

/** p-th percentile (0–100) of a sample, nearest-rank; null when empty. */
export function percentile(sample: number[], p: number): number | null {
  if (sample.length === 0) return null;
  const sorted = [...sample].sort((a, b) => a - b);
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[rank];
}

/** Fixed-size ring of recent samples, so percentiles cost O(window) and memory stays flat. */
class Window {
  private values: number[] = [];
  private next = 0;
  constructor(private readonly size: number) {}
  add(v: number): void {
    if (this.values.length < this.size) this.values.push(v);
    else this.values[this.next] = v;
    this.next = (this.next + 1) % this.size;
  }
  all(): number[] {
    return this.values;
  }
}

/** Counters of one worker process. */
export class IngestMetrics {
  messages = 0;
  readingsStored = 0;
  duplicates = 0;
  conflicts = 0;
  deadLetters = 0;
  flushes = 0;
  flushErrors = 0;
  newestTsMs: number | null = null;
  dbUp = true;
  private readonly flushMs = new Window(1000);
  private readonly ackMs = new Window(5000);
  private readonly startedAtMs = Date.now();

  recordFlush(durationMs: number, receivedAtMs: number[], newestTsMs: number | null): void {
    this.flushes += 1;
    this.flushMs.add(durationMs);
    const now = Date.now();
    for (const t of receivedAtMs) this.ackMs.add(now - t);
    if (newestTsMs !== null && (this.newestTsMs === null || newestTsMs > this.newestTsMs)) this.newestTsMs = newestTsMs;
  }

  snapshot(extra: { queued: number; mqttConnected: boolean }): IngestHealth {
    const now = Date.now();
    const round = (v: number | null) => (v === null ? null : Math.round(v * 10) / 10);
    return {
      at: new Date(now).toISOString(),
      startedAt: new Date(this.startedAtMs).toISOString(),
      messages: this.messages,
      readingsStored: this.readingsStored,
      duplicates: this.duplicates,
      conflicts: this.conflicts,
      deadLetters: this.deadLetters,
      flushes: this.flushes,
      flushErrors: this.flushErrors,
      queued: extra.queued,
      flushP50Ms: round(percentile(this.flushMs.all(), 50)),
      flushP99Ms: round(percentile(this.flushMs.all(), 99)),
      ackP99Ms: round(percentile(this.ackMs.all(), 99)),
      lagS: this.newestTsMs === null ? null : round((now - this.newestTsMs) / 1000),
      dbUp: this.dbUp,
      mqttConnected: extra.mqttConnected,
    };
  }
}
