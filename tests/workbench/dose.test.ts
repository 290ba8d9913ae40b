import { describe, expect, it } from 'vitest';
import { adviseDose } from '../../web/src/features/dose/utils/dose-steps.ts';

/**
 * Hand-worked example. Stoichiometry from the balanced half-reactions in acid: H₂O₂ 0.5 mol, MnO₂ 0.5 mol and O₂ 0.25 mol per mol Fe²⁺; molar masses from standard
 * atomic weights (H₂O₂ 34.0147, MnO₂ 86.9368, O₂ 31.998, Fe 55.845 g/mol).
 *
 * Tank 400 m³, total Fe 10 g/L, ratio 3 → 9:
 *   f_now = 3/4 = 0.75; f_target = 9/10 = 0.90; Δf = 0.15
 *   Fe²⁺ to oxidise = 0.15 × 10 kg/m³ × 400 m³ = 600 kg = 600 / 55.845 = 10.74402 kmol
 *   H₂O₂ = 10.74402 × 0.5 × 34.0147 = 182.727 kg at 100 %; ÷ 0.80 utilisation = 228.409 kg
 *   MnO₂ = 10.74402 × 0.5 × 86.9368 = 467.026 kg
 *   O₂   = 10.74402 × 0.25 × 31.998 = 85.947 kg
 * Holding against 50 m³/h of feed at ratio 1 (f = 0.5):
 *   (0.90 − 0.50) × 10 × 50 = 200 kg Fe/h = 3.58134 kmol/h → H₂O₂ 60.909 kg/h ÷ 0.80 = 76.136 kg/h
 */
const base = { ratioNow: 3, ratioTarget: 9, volumeM3: 400, totalFeGPerL: 10, utilisation: 0.8 } as const;

describe('dose advisor arithmetic', () => {
  it('when a 400 m³ tank at ratio 3 is taken to 9 with peroxide at 80 % use, then 228.41 kg, as worked by hand', () => {
    const a = adviseDose({ ...base, oxidant: 'h2o2' });
    expect(a.fNow).toBeCloseTo(0.75, 12);
    expect(a.fTarget).toBeCloseTo(0.9, 12);
    expect(a.fe2ToOxidiseKmol).toBeCloseTo(10.74402, 5);
    expect(a.oxidantKg).toBeCloseTo(228.409, 2);
    expect(a.steps.map((s) => s.result)).toEqual(['75.00 %', '90.00 %', '10.74 kmol', '182.7 kg at 100 % use', '228.4 kg']);
  });

  it('when the oxidant is MnO₂ or O₂, then the masses follow their stoichiometry', () => {
    expect(adviseDose({ ...base, utilisation: 1, oxidant: 'mno2' }).oxidantKg).toBeCloseTo(467.026, 2);
    expect(adviseDose({ ...base, utilisation: 1, oxidant: 'o2' }).oxidantKg).toBeCloseTo(85.947, 2);
  });

  it('when a feed of 50 m³/h at ratio 1 must be held at 9, then 76.14 kg/h of peroxide', () => {
    const a = adviseDose({ ...base, oxidant: 'h2o2', feedFlowM3PerH: 50, feedRatio: 1 });
    expect(a.holdKgPerH).toBeCloseTo(76.136, 2);
    expect(a.holdSteps.at(-1)!.result).toBe('76.14 kg/h');
  });

  it('when the tank is already above the target, then nothing is dosed', () => {
    const a = adviseDose({ ...base, ratioNow: 12, oxidant: 'h2o2' });
    expect(a.nothingToDose).toBe(true);
    expect(a.oxidantKg).toBe(0);
    expect(a.holdKgPerH).toBeNull();
  });
});
