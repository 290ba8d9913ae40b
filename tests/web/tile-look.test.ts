import { describe, expect, it } from 'vitest';
import { tileLook, worstFirst } from '../../web/src/features/floor/components/tile-look.ts';
import type { TankStatus } from '../../web/src/features/floor/components/tank-status.ts';

/** Only the fields the look reads; invented tanks. Priority 1 is the highest (ISA-18.2 numbering, common practice). */
const status = (over: Partial<TankStatus> = {}): TankStatus =>
  ({ kind: 'live', position: 'in', decadesOut: 0, freshness: { ageS: 1, stale: false }, factor: null, bandMv: null, outsideRange: false, ...over }) as TankStatus;
const badge = (priority: 1 | 2 | 3, unacknowledged = 1) => ({ priority, count: 1, unacknowledged, label: 'Ratio below band' });
const held = { shelved: 1, outOfService: 0, suppressed: 0, shelvedUntil: '2026-12-04T12:00:00.000Z' };

describe('tile look (Floor)', () => {
  it('when a tank has a sounding P1, then its frame takes the P1 colour and the thickest line, whatever the band says', () => {
    const look = tileLook(status({ position: 'below', decadesOut: 0.3 }), badge(1), undefined);
    expect(look.priority).toBe(1);
    expect(look.frame).toContain('border-attention-1');
    expect(look.frame).not.toContain('attention-2');
  });

  it('when a tank is out of band with no alarm yet, then its frame is neutral, not an alarm colour', () => {
    expect(tileLook(status({ position: 'below' }), undefined, undefined).frame).not.toMatch(/attention/);
  });

  it('when a tank only has a shelved alarm, then it has no alarm colour but carries the shelved mark', () => {
    const look = tileLook(status(), undefined, held);
    expect(look).toMatchObject({ priority: null, marks: ['shelved'] });
  });

  it('when tanks are stacked on a phone, then the one with a P1 waiting comes first, then P2, then the furthest out of band', () => {
    const tanks = [
      { tag: 'far-out', status: status({ position: 'below', decadesOut: 1 }) },
      { tag: 'p2', status: status(), alarm: badge(2) },
      { tag: 'p1-acked', status: status(), alarm: badge(1, 0) },
      { tag: 'p1-waiting', status: status(), alarm: badge(1, 1) },
    ];
    expect([...tanks].sort(worstFirst).map((t) => t.tag)).toEqual(['p1-waiting', 'p1-acked', 'p2', 'far-out']);
  });
});
