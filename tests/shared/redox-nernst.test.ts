import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  REFERENCE_ELECTRODES,
  ferricFractionOf,
  formalPotentialAtV,
  ironSplit,
  log10Ratio,
  orpToRatio,
  ratioFromLog10,
  ratioToOrpMv,
  ratioUncertainty,
  referenceById,
} from '../../shared/redox';

const agclSat = referenceById('agcl-sat');

describe('orpToRatio', () => {
  it("when Light's solution reads +476 mV vs a 0.199 V reference at 25 °C with E°′ = 0.675 V, then Eh is 0.675 V and the ratio 1.000", () => {
    // Light's solution 0.675 V vs SHE at 25 °C (Standard Methods 2580; ASTM D1498)
    const result = orpToRatio({ orpMv: 476, tempC: 25, reference: agclSat, formalPotentialV: 0.675 });
    expect(result.ehV).toBeCloseTo(0.675, 9);
    expect(result.ratio).toBeCloseTo(1.0, 3);
    expect(result.ferricFraction).toBeCloseTo(0.5, 6);
    expect(result.flag).toBe('ok');
  });

  it('when the formal potential has a temperature coefficient, then E°′(T) = E°′25 + k·(T − 298.15 K) is used', () => {
    // Nernst with a linear formal-potential drift: E°′(T) = E°′(25 °C) + k·(T − 298.15 K)
    expect(formalPotentialAtV(0.68, 45, 0.001)).toBeCloseTo(0.7, 12);
    const she = referenceById('she');
    const atE0 = orpToRatio({ orpMv: 700, tempC: 45, reference: she, formalPotentialV: 0.68, formalCoeffVPerK: 0.001 });
    expect(atE0.ratio).toBeCloseTo(1, 12);
  });

  it('when the ratio is beyond 1:10 000 either way, then it is flagged outside-range', () => {
    const she = referenceById('she');
    // 4 decades at 25 °C is 4 × 59.159 mV = 236.6 mV (arithmetic from CODATA 2018)
    expect(orpToRatio({ orpMv: 680 + 230, tempC: 25, reference: she, formalPotentialV: 0.68 }).flag).toBe('ok');
    expect(orpToRatio({ orpMv: 680 + 240, tempC: 25, reference: she, formalPotentialV: 0.68 }).flag).toBe('outside-range');
    expect(orpToRatio({ orpMv: 680 - 240, tempC: 25, reference: she, formalPotentialV: 0.68 }).flag).toBe('outside-range');
  });

  it('when the reading would overflow or underflow the ratio, then it is clamped finite and > 0 and flagged', () => {
    const high = orpToRatio({ orpMv: 5000, tempC: -10, reference: agclSat, formalPotentialV: -5 });
    const low = orpToRatio({ orpMv: -5000, tempC: -10, reference: agclSat, formalPotentialV: 5 });
    for (const r of [high, low]) {
      expect(Number.isFinite(r.ratio)).toBe(true);
      expect(r.ratio).toBeGreaterThan(0);
      expect(Number.isFinite(r.ferricFraction)).toBe(true);
      expect(r.flag).toBe('outside-range');
    }
  });

  it('when any in-range inputs are given, then no output is NaN or Infinity', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...REFERENCE_ELECTRODES),
        fc.double({ min: -10, max: 150, noNaN: true }),
        fc.double({ min: -5000, max: 5000, noNaN: true }),
        fc.double({ min: -5, max: 5, noNaN: true }),
        fc.double({ min: -0.01, max: 0.01, noNaN: true }),
        (reference, tempC, orpMv, formalPotentialV, formalCoeffVPerK) => {
          const r = orpToRatio({ orpMv, tempC, reference, formalPotentialV, formalCoeffVPerK });
          return [r.ehV, r.ratio, r.ferricFraction].every(Number.isFinite) && r.ratio > 0;
        },
      ),
    );
  });
});

describe('ratioToOrpMv round trip', () => {
  it('when a reading is converted to a ratio and back, for every reference electrode and temperature, then the reading is recovered', () => {
    // inverse of the Nernst conversion: E_probe = E°′(T) + (R·T/F)·ln(ratio) − E_ref(T)
    fc.assert(
      fc.property(
        fc.constantFrom(...REFERENCE_ELECTRODES),
        fc.double({ min: -10, max: 150, noNaN: true }),
        fc.double({ min: -1000, max: 1500, noNaN: true }),
        fc.double({ min: 0.3, max: 1.0, noNaN: true }),
        fc.double({ min: -0.002, max: 0.002, noNaN: true }),
        (reference, tempC, orpMv, formalPotentialV, formalCoeffVPerK) => {
          const conditions = { tempC, reference, formalPotentialV, formalCoeffVPerK };
          const { ratio } = orpToRatio({ ...conditions, orpMv });
          expect(ratioToOrpMv({ ...conditions, ratio })).toBeCloseTo(orpMv, 8);
        },
      ),
    );
  });

  it('when a ratio is converted to a reading and back, then the ratio is recovered', () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...REFERENCE_ELECTRODES),
        fc.double({ min: -10, max: 150, noNaN: true }),
        fc.double({ min: -6, max: 6, noNaN: true }),
        (reference, tempC, log10) => {
          const ratio = 10 ** log10;
          const conditions = { tempC, reference, formalPotentialV: 0.68 };
          const back = orpToRatio({ ...conditions, orpMv: ratioToOrpMv({ ...conditions, ratio }) }).ratio;
          expect(Math.abs(back / ratio - 1)).toBeLessThan(1e-9);
        },
      ),
    );
  });
});

describe('ironSplit and ferric fraction', () => {
  it('when total Fe is 10 g/L at ratio 3, then Fe3+ is 7.5 g/L and Fe2+ 2.5 g/L', () => {
    // worked check, arithmetic from the Nernst equation
    const { fe3, fe2 } = ironSplit(3, 10);
    expect(fe3).toBeCloseTo(7.5, 12);
    expect(fe2).toBeCloseTo(2.5, 12);
  });

  it('when the ratio is extreme, then both parts stay finite and sum to the total', () => {
    for (const ratio of [1e-300, 1e300, Number.MAX_VALUE]) {
      const { fe3, fe2 } = ironSplit(ratio, 10);
      expect(Number.isFinite(fe3) && Number.isFinite(fe2)).toBe(true);
      expect(fe3 + fe2).toBeCloseTo(10, 9);
    }
    expect(ferricFractionOf(Number.MAX_VALUE)).toBe(1);
  });

  it('when log10 helpers are used, then they invert each other and clamp to finite', () => {
    expect(log10Ratio(1000)).toBeCloseTo(3, 12);
    expect(ratioFromLog10(-2)).toBeCloseTo(0.01, 14);
    expect(Number.isFinite(ratioFromLog10(1e6))).toBe(true);
    expect(ratioFromLog10(-1e6)).toBeGreaterThan(0);
  });
});

describe('ratioUncertainty', () => {
  it('when the probe tolerance is ±10 mV at 25 °C, then the ratio is uncertain by a factor of about 1.48', () => {
    // exp(0.010·F/(R·T)) at 25 °C: a ±10 mV probe tolerance is a factor of ≈1.48 either way
    expect(ratioUncertainty({ tempC: 25, toleranceMv: 10 }).factor).toBeCloseTo(1.48, 2);
  });

  it('when the tolerance is 1 mV at 25 °C, then ln(ratio) moves about 0.039 (3.9 %)', () => {
    // d(ln ratio) = dE·F/(R·T): at 25 °C, 1 mV ≈ 3.9 % in ratio
    expect(Math.log(ratioUncertainty({ tempC: 25, toleranceMv: 1 }).factor)).toBeCloseTo(0.039, 3);
  });

  it('when the solution is hotter, then the same tolerance means a smaller factor', () => {
    expect(ratioUncertainty({ tempC: 80, toleranceMv: 10 }).factor).toBeLessThan(ratioUncertainty({ tempC: 25, toleranceMv: 10 }).factor);
  });
});
