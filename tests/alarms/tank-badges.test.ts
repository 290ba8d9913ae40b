import { describe, expect, it } from 'vitest';
import type { AlarmView } from '../../shared/schemas/alarms.ts';
import { tankBadges, tankHeld, tankSilenced } from '../../web/src/features/alarms/hooks/use-tank-alarm-badges.ts';

/** Just the fields the badge logic reads; invented alarms of two tanks. */
const alarm = (tankId: number, priority: 1 | 2 | 3, state: AlarmView['state'], label = 'Ratio low') =>
  ({ tankId, priority, state, label }) as AlarmView;

describe('tank alarm badges (Floor tile, Tank page)', () => {
  it('when a tank has a sounding P2 and an unacknowledged P1, then its badge is the P1 with both counted', () => {
    const badges = tankBadges([alarm(1, 2, 'acknowledged'), alarm(1, 1, 'unacknowledged', 'ORP high')]);
    expect(badges.get(1)).toEqual({ priority: 1, count: 2, unacknowledged: 1, label: 'ORP high' });
  });

  it('when a tank\'s only open alarms are shelved or out of service, then it has no badge but counts them as silenced', () => {
    const alarms = [alarm(2, 1, 'shelved'), alarm(2, 3, 'out-of-service'), alarm(3, 2, 'unacknowledged')];
    expect(tankBadges(alarms).has(2)).toBe(false);
    expect(tankSilenced(alarms).get(2)).toBe(2);
    expect(tankSilenced(alarms).has(3)).toBe(false);
  });

  it('when a tank has shelved and out-of-service alarms, then its marks count each kind and give the earliest shelve end', () => {
    const shelved = (until: string) => ({ ...alarm(4, 2, 'shelved'), shelvedUntil: until }) as AlarmView;
    const held = tankHeld([shelved('2026-12-04T12:00:00.000Z'), shelved('2026-12-04T10:00:00.000Z'), alarm(4, 3, 'out-of-service'), alarm(5, 1, 'acknowledged')]);
    expect(held.get(4)).toEqual({ shelved: 2, outOfService: 1, suppressed: 0, shelvedUntil: '2026-12-04T10:00:00.000Z' });
    expect(held.has(5)).toBe(false);
  });
});
