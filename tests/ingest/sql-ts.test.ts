import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fromSqlTs, toSqlTs } from '../../ingest/db.ts';

// Reference: the ECMAScript Date's own ISO 8601 rendering (toISOString), cut to MariaDB's DATETIME(3) text form.
const viaDate = (ms: number) => new Date(ms).toISOString().slice(0, 23).replace('T', ' ');

describe('toSqlTs (reuses the last second on the hot path)', () => {
  it('when any time from year 0 to 9999 is formatted, in any order, then it equals the Date rendering', () => {
    fc.assert(fc.property(fc.array(fc.double({ min: -62_167_219_200_000, max: 253_402_300_799_999, noNaN: true }), { minLength: 1, maxLength: 50 }), (times) => {
      for (const t of times) expect(toSqlTs(t)).toBe(viaDate(t));
    }), { numRuns: 500 });
  });

  it('when readings fall in the same second and the next, then each keeps its own milliseconds and round-trips', () => {
    const base = Date.UTC(2026, 11, 31, 23, 59, 59, 0);
    for (const t of [base + 1, base + 999, base + 1000, base + 7, base - 1]) {
      expect(toSqlTs(t)).toBe(viaDate(t));
      expect(fromSqlTs(toSqlTs(t))).toBe(t);
    }
    expect(toSqlTs(base + 1000)).toBe('2027-01-01 00:00:00.000');
  });
});
