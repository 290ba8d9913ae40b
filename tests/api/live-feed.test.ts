import { describe, expect, it } from 'vitest';
import { LiveFeed } from '../../api/src/realtime/live-feed.ts';
import type { TankLive } from '../../shared/schemas/readings.ts';

const reading = (tankId: number, ts: string): TankLive => ({
  tankId, probeId: tankId, probeTag: `P${tankId}`, ts, orpMv: 400, tempC: 40, ehV: 0.6, ratio: 10, ferricFraction: 0.9, flag: 'ok', calibrationVersion: 1,
});

describe('live feed', () => {
  it('when readings pour in, then each tank goes out at most once per second, newest value first, and a quiet tank goes out at once', () => {
    const feed = new LiveFeed();
    feed.setProbes([{ probeId: 1, tankId: 1, siteTag: 's', intervalS: 5 }, { probeId: 2, tankId: 2, siteTag: 's', intervalS: 5 }]);
    feed.push([reading(1, '2026-12-01T00:00:00.000Z'), reading(1, '2026-12-01T00:00:00.500Z')]);
    expect(feed.drain(10_000).get('s')?.map((r) => r.ts)).toEqual(['2026-12-01T00:00:00.500Z']);
    feed.push([reading(1, '2026-12-01T00:00:01.000Z'), reading(2, '2026-12-01T00:00:01.000Z')]);
    // Tank 1 was sent 100 ms ago and waits; tank 2 has been quiet and goes now.
    expect(feed.drain(10_100).get('s')?.map((r) => r.tankId)).toEqual([2]);
    expect(feed.drain(10_999).size).toBe(0);
    expect(feed.drain(11_000).get('s')?.map((r) => r.tankId)).toEqual([1]);
  });

  it('when a probe stays silent for three intervals, then it turns stale once, and fresh again on its next reading', () => {
    const feed = new LiveFeed();
    feed.setProbes([{ probeId: 1, tankId: 1, siteTag: 's', intervalS: 5 }]);
    feed.push([reading(1, new Date(1000).toISOString())]);
    expect(feed.freshnessChanges(2000).map((f) => f.stale)).toEqual([false]);
    expect(feed.freshnessChanges(15_000)).toEqual([]);
    expect(feed.freshnessChanges(16_500).map((f) => f.stale)).toEqual([true]);
    feed.push([reading(1, new Date(17_000).toISOString())]);
    expect(feed.freshnessChanges(17_100).map((f) => f.stale)).toEqual([false]);
  });

  it('when a reading comes for a probe added since the list was loaded, then it is kept and flagged, and goes out once the list knows it', () => {
    const feed = new LiveFeed();
    feed.setProbes([{ probeId: 1, tankId: 1, siteTag: 's', intervalS: 5 }]);
    feed.push([reading(7, '2026-12-01T00:00:00.000Z')]);
    expect(feed.drain(10_000).size).toBe(0);
    expect(feed.unknownProbe).toBe(true);
    feed.setProbes([{ probeId: 1, tankId: 1, siteTag: 's', intervalS: 5 }, { probeId: 7, tankId: 7, siteTag: 'new', intervalS: 5 }]);
    expect(feed.drain(10_100).get('new')?.map((r) => r.tankId)).toEqual([7]);
  });

  it('when a probe\'s source announces its death, then it is stale on the next tick, and fresh again only with a newer reading', () => {
    const feed = new LiveFeed();
    feed.setProbes([{ probeId: 1, tankId: 1, siteTag: 's', intervalS: 5 }, { probeId: 2, tankId: 2, siteTag: 's', intervalS: 5 }]);
    feed.push([reading(1, new Date(1000).toISOString()), reading(2, new Date(1000).toISOString())]);
    expect(feed.freshnessChanges(2000).map((f) => f.stale)).toEqual([false, false]);
    feed.markOffline([1], 2500);
    // Well inside three intervals: only the death makes probe 1 stale; probe 2 is untouched.
    expect(feed.freshnessChanges(2600).map((f) => [f.probeId, f.stale])).toEqual([[1, true]]);
    feed.push([reading(1, new Date(2400).toISOString())]); // older than the death: still stale
    expect(feed.freshnessChanges(2700)).toEqual([]);
    feed.push([reading(1, new Date(3000).toISOString())]);
    expect(feed.freshnessChanges(3100).map((f) => [f.probeId, f.stale])).toEqual([[1, false]]);
  });
});
