/**
 * Ingest slices (ingest/slices.ts): every device topic of every known site and probe is
 * covered by exactly one slice, for any number of slices and either way of slicing, and each
 * slice unsubscribes whatever another plan could have left in its session.
 */
import { describe, expect, it } from 'vitest';
import { parseSlice, sliceClientId, sliceFilters, sliceOf, type SliceBy, type Tag } from '../../ingest/slices.ts';

const tags: Tag[] = [];
for (const site of ['kestrel', 'north-pit', 'south-pit', 'mill-3']) {
  tags.push({ siteTag: site, probeTag: null });
  for (let i = 1; i <= 40; i += 1) tags.push({ siteTag: site, probeTag: `${site}-P${i}` });
}

/** The slices whose filters match a topic (MQTT wildcard rules for the forms the plans use). */
function owners(topic: string, by: SliceBy, n: number): number[] {
  const out: number[] = [];
  for (let i = 1; i <= n; i += 1) {
    const { mine } = sliceFilters({ index: i, count: n, by }, tags);
    if (mine.some((f) => (f.endsWith('/#') ? topic.startsWith(f.slice(0, -1)) : f === topic))) out.push(i);
  }
  return out;
}

describe('ingest slices', () => {
  it.each([
    ['site', 1], ['site', 2], ['site', 3], ['probe', 2], ['probe', 5],
  ] as [SliceBy, number][])('when slicing by %s into %i, then each device topic belongs to exactly one slice', (by, n) => {
    for (const t of tags) {
      const topic = t.probeTag ? `ferrisight/v1/${t.siteTag}/${t.probeTag}/reading` : `ferrisight/v1/${t.siteTag}/batch`;
      expect(owners(topic, by, n), topic).toHaveLength(1);
    }
  });

  it('when slicing by probe into two, then both slices get a fair share of one big site', () => {
    const counts = [1, 2].map((i) => sliceFilters({ index: i, count: 2, by: 'probe' }, tags).mine.filter((f) => f.endsWith('/reading')).length);
    expect(Math.min(...counts)).toBeGreaterThan(60); // of 160 probes
  });

  it('when a slice syncs, then it unsubscribes the catch-all and every filter it does not own', () => {
    const { mine, others } = sliceFilters({ index: 1, count: 2, by: 'site' }, tags);
    expect(others).toContain('ferrisight/v1/#');
    expect(others.filter((f) => mine.includes(f))).toEqual([]);
    expect(others).toContain('ferrisight/v1/kestrel/kestrel-P1/reading');
  });

  it('when a shared group is set, then every worker subscribes the same $share filter', () => {
    expect(sliceFilters({ index: 2, count: 2, by: 'site', sharedGroup: 'ingest' }, tags).mine).toEqual(['$share/ingest/ferrisight/v1/#']);
  });

  it('parses i/n, refuses nonsense, and names the session after the slice', () => {
    expect(parseSlice('2/3')).toEqual({ index: 2, count: 3, by: 'site', sharedGroup: undefined });
    expect(parseSlice(undefined)).toBeNull();
    expect(() => parseSlice('4/3')).toThrow(/INGEST_SLICE/);
    expect(() => parseSlice('0/2')).toThrow(/INGEST_SLICE/);
    expect(sliceClientId('ferrisight-ingest', parseSlice('2/3'))).toBe('ferrisight-ingest-slice-2');
    expect(sliceOf('kestrel', 7)).toBe(sliceOf('kestrel', 7));
  });
});
