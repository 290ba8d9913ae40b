import { describe, expect, it } from 'vitest';
import { SampleWindows } from '../../api/src/modules/alarms/engine-windows.ts';

describe('SampleWindows', () => {
  it('when a probe reports every second for an hour with a 2-minute window, then only the last 2 minutes are kept', () => {
    const w = new SampleWindows(async () => []);
    const keepMs = 120_000;
    for (let t = 0; t <= 3_600_000; t += 1000) w.push(7, { tMs: t, orpMv: 500 }, keepMs);
    const kept = w.samples(7);
    expect(kept[0].tMs).toBe(3_600_000 - keepMs);
    expect(kept).toHaveLength(keepMs / 1000 + 1);
  });

  it('when samples come closer than a second or out of order, then they are dropped', () => {
    const w = new SampleWindows(async () => []);
    for (const t of [0, 400, 1000, 900, 2500]) w.push(1, { tMs: t, orpMv: 500 }, 60_000);
    expect(w.samples(1).map((s) => s.tMs)).toEqual([0, 1000, 2500]);
  });
});
