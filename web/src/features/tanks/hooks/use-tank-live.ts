import { useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import type { TrendResponse } from '@shared/schemas/plant';
import type { TankLive } from '@shared/schemas/readings';
import type { ProbeFreshness } from '@shared/schemas/socket-events';
import { useSocketEvent } from '../../../lib/socket';
import type { TankDetail } from '../api/get-tank';
import { PRESETS, type Preset } from '../api/get-trend';
import { tankKeys } from '../api/tank-keys';

/**
 * Appends a pushed reading to a trend that ends "now" and drops what slid out of the window.
 * Bucketed trends (1 min, 1 h) take a live point only once a bucket's width has passed,
 * so the tail keeps the density of the rest of the chart.
 */
export function appendReading(trend: TrendResponse, r: TankLive, windowS: number): TrendResponse {
  const t = Date.parse(r.ts) / 1000;
  const n = trend.t.length;
  const last = n > 0 ? trend.t[n - 1] : -Infinity;
  if (!(t > last)) return trend;
  if (trend.resolution !== 'raw' && n > 1) {
    const step = (trend.t[n - 1] - trend.t[0]) / (n - 1);
    if (t - last < step * 0.9) return trend;
  }
  const cutoff = t - windowS;
  let start = 0;
  while (start < n && trend.t[start] < cutoff) start++;
  const keep = <T>(col: T[], v: T) => [...col.slice(start), v];
  return {
    ...trend,
    to: r.ts,
    t: keep(trend.t, t),
    ratio: keep(trend.ratio, r.ratio),
    ratioMin: keep(trend.ratioMin, r.ratio),
    ratioMax: keep(trend.ratioMax, r.ratio),
    orpMv: keep(trend.orpMv, r.orpMv),
    tempC: keep(trend.tempC, r.tempC),
  };
}

/**
 * Keeps the tank page live: newest values into the tank detail, the live tail into every cached
 * preset trend of this tank. Returns the server's last freshness verdict for the tank's probe.
 */
export function useTankLive(tankId: number): ProbeFreshness | undefined {
  const qc = useQueryClient();
  const [serverFreshness, setServerFreshness] = useState<ProbeFreshness>();

  useSocketEvent('tank:latest', (readings) => {
    const r = readings.find((x) => x.tankId === tankId);
    if (!r) return;
    qc.setQueryData<TankDetail>(tankKeys.detail(tankId), (old) =>
      old && (!old.tank.latest || old.tank.latest.ts <= r.ts) ? { ...old, tank: { ...old.tank, latest: r } } : old,
    );
    for (const preset of Object.keys(PRESETS) as Preset[]) {
      qc.setQueryData<TrendResponse>(tankKeys.trend(tankId, preset), (old) => (old ? appendReading(old, r, PRESETS[preset]) : old));
    }
  });
  useSocketEvent('probe:freshness', (f) => {
    if (f.tankId === tankId) setServerFreshness(f);
  });
  return serverFreshness;
}
