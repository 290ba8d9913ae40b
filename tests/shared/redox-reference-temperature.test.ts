import { describe, it, expect } from 'vitest';
import { faraday, gasConstant } from 'mathjs';
import {
  agclStandardPotentialV, orpToRatio, referenceById, referencePotentialV, referenceRange, referenceStatus, type ReferenceElectrode,
} from '../../shared/redox';

const F = faraday.toNumber('C/mol');
const R = gasConstant.toNumber('J/(mol K)');

describe('Ag/AgCl standard potential against temperature (Bates & Bower 1954)', () => {
  it('when evaluated at 25 °C, then it is within 0.1 mV of the measured 0.22234 V', () => {
    // Bates & Bower, J. Res. NBS 53:283 (1954), doi:10.6028/jres.053.037: E° = 0.22234 V at 25 °C.
    expect(Math.abs(agclStandardPotentialV(25) - 0.22234)).toBeLessThan(0.0001);
  });

  it('when evaluated at 0 °C, then it is within 0.1 mV of 0.23655 V', () => {
    // 0.23655 V at 0 °C: from memory of the Bates & Bower table; the fit's constant term is 0.23659 V.
    expect(Math.abs(agclStandardPotentialV(0) - 0.23655)).toBeLessThan(0.0001);
  });

  it('when the slope at 25 °C is taken, then it is about -0.65 mV/K', () => {
    // dE°/dT = -0.645 mV/K at 25 °C follows from the published coefficients -4.8564e-4, -3.4205e-6 and
    // 5.869e-9 (as reproduced by Bard, Parsons & Jordan, Standard Potentials in Aqueous Solution, 1985).
    const slope = -4.8564e-4 - 2 * 3.4205e-6 * 25 + 3 * 5.869e-9 * 25 ** 2;
    expect((agclStandardPotentialV(25.5) - agclStandardPotentialV(24.5)) / 1).toBeCloseTo(slope, 7);
  });
});

describe('Ag/AgCl in 3 M KCl when hot', () => {
  const agcl3m = referenceById('agcl-3m');

  it.each([80, 85])('when at %s °C, then it equals E°(T) − (R·T/F)·ln a(Cl⁻) with the activity implied at 25 °C, within 2 mV', (tempC) => {
    // Written out here with mathjs constants: ln a = (E°(25) − E(25))·F/(R·298.15), E°(25) = 0.22234 V (Bates & Bower).
    const lnA = ((0.22234 - 0.21) * F) / (R * 298.15);
    const expected = agclStandardPotentialV(tempC) - ((R * (tempC + 273.15)) / F) * lnA;
    expect(Math.abs(referencePotentialV(agcl3m, tempC) - expected) * 1000).toBeLessThan(2);
    expect(referenceStatus(agcl3m, tempC)).toBe('ok');
  });

  it('when at 85 °C, then it sits 5–6.5 mV below the straight line of the 15–35 °C tables', () => {
    // An independent estimate puts Ag/AgCl 3 M KCl 5–6.5 mV below the linear extrapolation at 80–85 °C
    // (from memory inputs); -0.75 mV/K is the Skoog 3.5 M slope the old straight line used.
    const linear = 0.21 - 0.00075 * 60;
    const belowMv = (linear - referencePotentialV(agcl3m, 85)) * 1000;
    expect(belowMv).toBeGreaterThan(5);
    expect(belowMv).toBeLessThan(6.5);
  });

  it('when the range is asked for, then it is Bates & Bower\'s 0–95 °C with the source named', () => {
    const range = referenceRange('agcl-3m');
    expect(range).toMatchObject({ minC: 0, maxC: 95 });
    expect(range.source).toMatch(/Bates & Bower \(1954, J\. Res\. NBS 53:283\)/);
    expect(referenceStatus(agcl3m, 110)).toBe('extrapolated');
  });

  it('when a probe carries its own 25 °C value, then the curve is anchored there', () => {
    const own = { ...agcl3m, e25V: 0.207 };
    expect(referencePotentialV(own, 25)).toBeCloseTo(0.207, 9);
    expect(referencePotentialV(own, 85) - referencePotentialV(agcl3m, 85)).toBeCloseTo(-0.003 * (358.15 / 298.15), 9);
  });
});

describe('saturated electrodes and calomel outside their tables', () => {
  it('when saturated Ag/AgCl is at 80 or 85 °C, then the value is marked extrapolated (its table covers 15–35 °C)', () => {
    const sat = referenceById('agcl-sat');
    expect(referenceRange(sat)).toMatchObject({ minC: 15, maxC: 35 });
    expect(referenceStatus(sat, 80)).toBe('extrapolated');
    expect(referenceStatus(sat, 85)).toBe('extrapolated');
    expect(referenceStatus(sat, 30)).toBe('ok');
  });

  it('when calomel is asked for its range, then maxC is no higher than its usable 70 °C', () => {
    // Calomel is not used above about 70 °C (common practice).
    expect(referenceRange('sce').maxC).toBeLessThanOrEqual(70);
  });

  it('when calomel is at 85 °C, then the reading is marked unusable, not ok', () => {
    const sce = referenceById('sce');
    expect(referenceStatus(sce, 85)).toBe('unusable');
    const out = orpToRatio({ orpMv: 400, tempC: 85, reference: sce, formalPotentialV: 0.68, formalCoeffVPerK: 0.001 });
    expect(out.flag).toBe('reference-unusable');
    expect(orpToRatio({ orpMv: 400, tempC: 50, reference: sce, formalPotentialV: 0.68 }).flag).toBe('reference-extrapolated');
    expect(orpToRatio({ orpMv: 400, tempC: 25, reference: sce, formalPotentialV: 0.68 }).flag).toBe('ok');
  });
});

describe('a probe maker\'s table', () => {
  // An invented data sheet, as a metallurgist would type it in.
  const sheet: ReferenceElectrode = {
    id: 'maker', label: 'Maker gel electrode', e25V: 0.2, coeffVPerK: -0.0007, source: 'data sheet',
    table: [{ tempC: 20, eV: 0.204 }, { tempC: 50, eV: 0.182 }, { tempC: 80, eV: 0.158 }],
  };

  it('when a temperature falls between rows, then it is interpolated linearly', () => {
    expect(referencePotentialV(sheet, 35)).toBeCloseTo(0.193, 9);
    expect(referencePotentialV(sheet, 65)).toBeCloseTo(0.17, 9);
    expect(referenceRange(sheet)).toMatchObject({ minC: 20, maxC: 80 });
    expect(referenceStatus(sheet, 65)).toBe('ok');
  });

  it('when a temperature lies beyond the table, then the end segment is extended and the value marked extrapolated', () => {
    expect(referencePotentialV(sheet, 90)).toBeCloseTo(0.158 - 0.008, 9);
    expect(referenceStatus(sheet, 90)).toBe('extrapolated');
  });

  it('when the table is out of order, then a RangeError names it', () => {
    const bad = { ...sheet, table: [{ tempC: 50, eV: 0.18 }, { tempC: 20, eV: 0.2 }] };
    expect(() => referencePotentialV(bad, 30)).toThrow(/table temperatures must rise/);
  });
});

describe('a probe with its own coefficient', () => {
  it('when a 3 M KCl probe carries a hand-entered coefficient, then it is a straight line, marked extrapolated away from 25 °C', () => {
    const own = { ...referenceById('agcl-3m'), e25V: 0.2135, coeffVPerK: 0 };
    expect(referencePotentialV(own, 10)).toBe(0.2135);
    expect(referenceStatus(own, 10)).toBe('extrapolated');
  });

  it('when a 3 M KCl probe was stored with the earlier -0.75 mV/K default, then it still follows Bates & Bower', () => {
    const stored = { ...referenceById('agcl-3m'), coeffVPerK: -0.00075 };
    expect(referencePotentialV(stored, 85)).toBeCloseTo(referencePotentialV(referenceById('agcl-3m'), 85), 12);
  });
});
