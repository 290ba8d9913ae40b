import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fromSqlTs, toSqlTs } from '../../../api/src/db/pool.ts';
import { parseIsoTs, toIsoTs } from '../../../api/src/db/timestamps.ts';

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

// Reference for both below: ECMAScript's Date (Date.parse and Date#toISOString, ECMA-262 §21.4.3.2 and §21.4.4.36).
const anyTime = fc.double({ min: -62_167_219_200_000, max: 253_402_300_799_999, noNaN: true });

describe('toIsoTs and parseIsoTs (reuse the last second on the hot path)', () => {
  it('when any time from year 0 to 9999 is formatted, in any order, then it equals toISOString', () => {
    fc.assert(fc.property(fc.array(anyTime, { minLength: 1, maxLength: 50 }), (times) => {
      for (const t of times) expect(toIsoTs(t)).toBe(new Date(t).toISOString());
    }), { numRuns: 500 });
  });

  it('when device timestamps of neighbouring instants are parsed, in any order, then each equals Date.parse', () => {
    const base = Date.UTC(2026, 11, 1, 8, 0, 0, 0);
    fc.assert(fc.property(fc.array(fc.integer({ min: -3_000, max: 3_000 }), { minLength: 1, maxLength: 50 }), (offsets) => {
      for (const o of offsets) {
        const ts = new Date(base + o).toISOString();
        expect(parseIsoTs(ts)).toBe(Date.parse(ts));
      }
    }), { numRuns: 300 });
  });

  it('when a string shares the cached second but is not plain UTC milliseconds, then it is still parsed as Date does', () => {
    parseIsoTs('2026-12-01T08:00:00.500Z');
    for (const ts of ['2026-12-01T08:00:00.5Z', '2026-12-01T08:00:00.5x0Z', '2026-12-01T08:00:00.500+01:00', '2026-12-01T08:00:00.12345Z', '2026-12-01T08:00:00.-12Z']) {
      expect(Object.is(parseIsoTs(ts), Date.parse(ts))).toBe(true);
    }
    fc.assert(fc.property(fc.string({ maxLength: 30 }), fc.string({ maxLength: 5 }), (tail, mid) => {
      const ts = `2026-12-01T08:00:00.${mid}${tail}`;
      expect(Object.is(parseIsoTs(ts), Date.parse(ts))).toBe(true);
    }), { numRuns: 500 });
  });
});
