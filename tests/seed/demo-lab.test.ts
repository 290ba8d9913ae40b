import { describe, expect, it } from 'vitest';
import type { DemoContext } from '../../scripts/seed/demo-context.ts';
import { plannedSamples } from '../../scripts/seed/demo-lab.ts';
import { DEMO_SITE } from '../../scripts/seed/demo-plant.ts';
import { demoStory } from '../../scripts/seed/demo-story.ts';

describe('demo lab samples', () => {
  it('when the demo is seeded at any minute of the day, then no tank has two samples at one time and both grab samples are there', () => {
    // A seed at 02:04 site time once put B2's check sample on the minute of its routine 07:46 sample,
    // and the assays' unique key (tank, sampled at) refused the second: the seed, and so npm start, failed.
    const day = Date.UTC(2026, 11, 4);
    const clashes: string[] = [];
    for (let m = 0; m < 1440; m += 1) {
      const ctx = { story: demoStory(day + m * 60_000), timeZone: DEMO_SITE.timeZone } as DemoContext;
      const samples = plannedSamples(ctx);
      const keys = samples.map((s) => `${s.tankTag}@${s.atMs}`);
      if (new Set(keys).size !== keys.length) clashes.push(new Date(day + m * 60_000).toISOString());
      expect(samples.filter((s) => s.source === 'form').map((s) => s.tankTag)).toEqual(['A3', 'B2']);
    }
    expect(clashes).toEqual([]);
  });
});
