import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { ALARM_ACTIONS, ALARM_STATES, canApply, transition, type AlarmAction, type AlarmState, type AlarmStatus } from '../../shared/alarms/states.ts';

/**
 * The lifecycle table of ISA-18.2 / IEC 62682 (states as the standards name them). Every (state, condition, action) not listed here must be refused.
 */
type Row = [from: AlarmState, active: boolean, action: AlarmAction, to: AlarmState, toActive: boolean];
const ALLOWED: Row[] = [
  ['normal', false, 'activate', 'unacknowledged', true],
  ['unacknowledged', true, 'acknowledge', 'acknowledged', true],
  ['acknowledged', true, 'clear', 'normal', false],
  ['unacknowledged', true, 'clear', 'rtn-unacknowledged', false],
  ['rtn-unacknowledged', false, 'acknowledge', 'normal', false],
  ['rtn-unacknowledged', false, 'activate', 'unacknowledged', true],
  // Shelve from any annunciated state (or normal); expiry or unshelve re-annunciates if still active.
  ...(['normal', 'unacknowledged', 'acknowledged', 'rtn-unacknowledged'] as const).map((s): Row => {
    const active = s === 'unacknowledged' || s === 'acknowledged';
    return [s, active, 'shelve', 'shelved', active];
  }),
  ['shelved', true, 'unshelve', 'unacknowledged', true],
  ['shelved', false, 'unshelve', 'normal', false],
  // Out of service from any state; return re-annunciates if still active.
  ...ALARM_STATES.filter((s) => s !== 'out-of-service').flatMap((s): Row[] => [
    [s, false, 'remove-from-service', 'out-of-service', false],
    [s, true, 'remove-from-service', 'out-of-service', true],
  ]),
  ['out-of-service', true, 'return-to-service', 'unacknowledged', true],
  ['out-of-service', false, 'return-to-service', 'normal', false],
  // Suppressed by design (tank offline); out of service outranks it.
  ...(['normal', 'unacknowledged', 'acknowledged', 'rtn-unacknowledged', 'shelved'] as const).flatMap((s): Row[] => [
    [s, false, 'suppress', 'suppressed', false],
    [s, true, 'suppress', 'suppressed', true],
  ]),
  ['suppressed', true, 'unsuppress', 'unacknowledged', true],
  ['suppressed', false, 'unsuppress', 'normal', false],
  // Hidden states keep tracking the condition.
  ...(['shelved', 'out-of-service', 'suppressed'] as const).flatMap((s): Row[] => [
    [s, false, 'activate', s, true],
    [s, true, 'clear', s, false],
  ]),
];

/** Combinations that can exist: annunciated states fix the condition; the others may have either. */
const REACHABLE: AlarmStatus[] = [
  { state: 'normal', conditionActive: false },
  { state: 'unacknowledged', conditionActive: true },
  { state: 'acknowledged', conditionActive: true },
  { state: 'rtn-unacknowledged', conditionActive: false },
  ...(['shelved', 'out-of-service', 'suppressed'] as const).flatMap((state) => [{ state, conditionActive: false }, { state, conditionActive: true }]),
];

const expected = (from: AlarmStatus, action: AlarmAction): AlarmStatus | null => {
  if (action === 'comment') return from;
  const row = ALLOWED.find(([s, a, act]) => s === from.state && a === from.conditionActive && act === action);
  return row ? { state: row[3], conditionActive: row[4] } : null;
};

describe('alarm lifecycle state machine', () => {
  for (const from of REACHABLE) {
    for (const action of ALARM_ACTIONS) {
      const want = expected(from, action);
      const name = `${from.state}${from.conditionActive ? ' (active)' : ''}`;
      it(`when ${action} is applied to ${name}, then it ${want ? `goes to ${want.state}` : 'is refused'}`, () => {
        const got = transition(from, action);
        if (want) expect(got).toEqual({ ok: true, to: want });
        else {
          expect(got.ok).toBe(false);
          expect(canApply(from, action)).toBe(false);
          if (!got.ok) expect(got.reason.length).toBeGreaterThan(3);
        }
      });
    }
  }

  it('when random action sequences run, then every state stays reachable, refusals change nothing and the condition is consistent', () => {
    fc.assert(fc.property(fc.array(fc.constantFrom(...ALARM_ACTIONS), { maxLength: 60 }), (actions) => {
      let s: AlarmStatus = { state: 'normal', conditionActive: false };
      for (const a of actions) {
        const r = transition(s, a);
        const want = expected(s, a);
        expect(r.ok).toBe(want !== null);
        if (r.ok) s = r.to;
        expect(REACHABLE).toContainEqual(s);
        // Annunciated states always agree with the condition they report.
        if (s.state === 'unacknowledged' || s.state === 'acknowledged') expect(s.conditionActive).toBe(true);
        if (s.state === 'rtn-unacknowledged' || s.state === 'normal') expect(s.conditionActive).toBe(false);
      }
    }), { numRuns: 500 });
  });
});
