import type { TankLive } from '../../../shared/schemas/readings.ts';
import type { ProbeFreshness } from '../../../shared/schemas/socket-events.ts';

type ProbeMeta = { probeId: number; tankId: number; siteTag: string; intervalS: number };

/**
 * Coalesces readings to at most one per tank per flush and tracks freshness: a probe is stale
 * after three expected intervals without a reading.
 */
export class LiveFeed {
  private pending = new Map<number, TankLive>();
  private lastSent = new Map<number, number>();
  private lastSeen = new Map<number, number>();
  private stale = new Map<number, boolean>();
  private probes = new Map<number, ProbeMeta>();
  /** A reading came for a probe not in the list (added in Plant setup since the last refresh). */
  unknownProbe = false;
  /** Probe → when its source announced it went offline; stale until a newer reading arrives. */
  private offlineAt = new Map<number, number>();

  setProbes(list: ProbeMeta[]): void {
    this.probes = new Map(list.map((p) => [p.probeId, p]));
  }

  push(readings: TankLive[]): void {
    for (const r of readings) {
      const prev = this.pending.get(r.tankId);
      if (!prev || prev.ts <= r.ts) this.pending.set(r.tankId, r);
      const t = Date.parse(r.ts);
      if (t > (this.lastSeen.get(r.probeId) ?? 0)) this.lastSeen.set(r.probeId, t);
    }
  }

  /**
   * Latest value per tank, grouped by site tag, for tanks not sent within the last
   * `minGapMs`: a leading-edge throttle, so a tank updates at most once per second yet a
   * reading after a quiet spell goes out on the next tick instead of waiting a full second.
   */
  drain(nowMs = Date.now(), minGapMs = 1000): Map<string, TankLive[]> {
    const bySite = new Map<string, TankLive[]>();
    for (const [tankId, r] of this.pending) {
      if (nowMs - (this.lastSent.get(tankId) ?? 0) < minGapMs) continue;
      const site = this.probes.get(r.probeId)?.siteTag;
      if (!site) {
        // Kept (one per tank) until the probe list knows it, so a new tank's first reading still goes out.
        this.unknownProbe = true;
        continue;
      }
      this.pending.delete(tankId);
      this.lastSent.set(tankId, nowMs);
      const list = bySite.get(site);
      if (list) list.push(r);
      else bySite.set(site, [r]);
    }
    return bySite;
  }

  /** Freshness changes since the last call. */
  freshnessChanges(nowMs: number): Array<ProbeFreshness & { siteTag: string }> {
    const out: Array<ProbeFreshness & { siteTag: string }> = [];
    for (const p of this.probes.values()) {
      const last = this.lastSeen.get(p.probeId);
      const offline = this.offlineAt.get(p.probeId);
      const isStale = last === undefined || nowMs - last > 3 * p.intervalS * 1000 || (offline !== undefined && last <= offline);
      if (this.stale.get(p.probeId) !== isStale) {
        this.stale.set(p.probeId, isStale);
        out.push({ probeId: p.probeId, tankId: p.tankId, siteTag: p.siteTag, stale: isStale, lastTs: last ? new Date(last).toISOString() : null });
      }
    }
    return out;
  }

  /** A death certificate: these probes are stale now, not after three intervals (until a newer reading). */
  markOffline(probeIds: number[], atMs: number): void {
    for (const id of probeIds) this.offlineAt.set(id, atMs);
  }

  seed(probeId: number, lastTs: number): void {
    this.lastSeen.set(probeId, lastTs);
  }
}
