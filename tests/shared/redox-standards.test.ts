import { describe, it, expect } from 'vitest';
import { LIGHT_SOLUTION, ZOBELL_TABLE, probeCheck, referenceById, standardPotentialV, type ReferenceElectrode } from '../../shared/redox';

const agclSat = referenceById('agcl-sat');
// A probe whose maker quotes 0.2135 V with no temperature drift (worked check against Table 2580:I)
const ref02135: ReferenceElectrode = { id: 'custom', label: 'Custom 0.2135 V', e25V: 0.2135, coeffVPerK: 0, source: 'test' };

describe("probeCheck with ZoBell's solution", () => {
  it.each([
    [1, 0.481],
    [5, 0.472],
    [10, 0.461],
    [15, 0.45],
    [20, 0.439],
    [25, 0.428],
    [30, 0.417],
  ])('when the solution is at %s °C, then the expected reading is the tabulated %s V minus the reference at T', (tempC, ehV) => {
    // Standard Methods 2580, Table 2580:I; Ag/AgCl sat. 0.199 V, -1.0 mV/K (Skoog table)
    const expectedMv = (ehV - (0.199 - 0.001 * (tempC - 25))) * 1000;
    const result = probeCheck({ standard: 'zobell', tempC, reference: agclSat, readingMv: expectedMv, toleranceMv: 10 });
    expect(result.expectedMv).toBeCloseTo(expectedMv, 9);
    expect(result.errorMv).toBeCloseTo(0, 9);
    expect(result.pass).toBe(true);
  });

  it('when read at 10 °C against a 0.2135 V reference, then +247.5 mV is expected and +236 mV fails ±10 mV but passes ±15 mV', () => {
    // worked check against Table 2580:I; ±15 mV from a probe maker's manual, ±10 mV common practice
    const base = { standard: 'zobell' as const, tempC: 10, reference: ref02135, readingMv: 236 };
    const strict = probeCheck({ ...base, toleranceMv: 10 });
    expect(strict.expectedMv).toBeCloseTo(247.5, 9);
    expect(strict.errorMv).toBeCloseTo(-11.5, 9);
    expect(strict.pass).toBe(false);
    expect(probeCheck({ ...base, toleranceMv: 15 }).pass).toBe(true);
  });

  it('when the temperature falls between table rows, then the value is interpolated linearly', () => {
    // midpoint of 0.461 (10 °C) and 0.450 (15 °C), Standard Methods 2580 Table 2580:I
    expect(standardPotentialV('zobell', 12.5)).toBeCloseTo(0.4555, 12);
  });

  it('when compared across 1–30 °C, then the table agrees with Eh ≈ 0.428 − 0.0022·(t − 25) within 2 mV', () => {
    // Nordstrom 1977, Geochim. Cosmochim. Acta 41:1835
    for (let t = 1; t <= 30; t += 0.5) {
      expect(Math.abs(standardPotentialV('zobell', t) - (0.428 - 0.0022 * (t - 25)))).toBeLessThan(0.002);
    }
  });

  it('when the table is read, then it has the seven Standard Methods rows', () => {
    expect(ZOBELL_TABLE.map((r) => r.tempC)).toEqual([1, 5, 10, 15, 20, 25, 30]);
  });

  it.each([0.5, 31, -10, 150])('when the temperature is %s °C, outside the table, then a RangeError names tempC and 1–30', (tempC) => {
    const run = () => probeCheck({ standard: 'zobell', tempC, reference: agclSat, readingMv: 250, toleranceMv: 10 });
    expect(run).toThrow(RangeError);
    expect(run).toThrow(/tempC must be a finite number in \[1, 30\]/);
  });
});

describe("probeCheck with Light's solution", () => {
  it('when read at 25 °C against Ag/AgCl (sat. KCl), then +476 mV is expected and passes', () => {
    // Light's solution 0.675 V vs SHE at 25 °C (Standard Methods 2580; ASTM D1498); reference 0.199 V (Skoog)
    const result = probeCheck({ standard: 'light', tempC: 25, reference: agclSat, readingMv: 476, toleranceMv: 10 });
    expect(result.expectedMv).toBeCloseTo(476, 9);
    expect(result.pass).toBe(true);
    expect(LIGHT_SOLUTION.ehV).toBe(0.675);
  });

  it.each([19.9, 30.1])('when the solution is at %s °C, outside 20–30 °C, then a RangeError names tempC', (tempC) => {
    const run = () => probeCheck({ standard: 'light', tempC, reference: agclSat, readingMv: 476, toleranceMv: 10 });
    expect(run).toThrow(RangeError);
    expect(run).toThrow(/tempC must be a finite number in \[20, 30\]/);
  });

  it('when the reading is exactly on the tolerance, then it passes', () => {
    const result = probeCheck({ standard: 'light', tempC: 25, reference: agclSat, readingMv: 486, toleranceMv: 10 });
    expect(result.pass).toBe(true);
  });
});
