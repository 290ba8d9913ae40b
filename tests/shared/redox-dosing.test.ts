import { describe, it, expect } from 'vitest';
import { IRON_MOLAR_MASS_G_PER_MOL, OXIDANTS, oxidantDemand } from '../../shared/redox';

const base = { volumeM3: 500, totalFeGPerL: 20, ratioNow: 1, ratioTarget: 3, oxidant: 'h2o2' as const, utilisation: 0.8 };

describe('oxidantDemand', () => {
  it('when 500 m³ at 20 g/L total Fe goes from ratio 1 to 3 with H2O2 at 80 % utilisation, then 44.767 kmol Fe2+ and 951.71 kg H2O2', () => {
    // Hand-worked from the balanced half-reactions in acid and IUPAC molar masses:
    //   f_now = 1/2 = 0.5, f_target = 3/4 = 0.75, Δf = 0.25
    //   Fe in tank = 20 g/L × 500 m³ = 10 000 kg; Fe2+ to oxidise = 0.25 × 10 000 = 2 500 kg
    //   2 500 kg / 55.845 g/mol = 44.7668 kmol Fe2+
    //   H2O2: 0.5 mol/mol → 22.3834 kmol × 34.0147 g/mol = 761.364 kg; / 0.8 = 951.705 kg
    const result = oxidantDemand(base);
    expect(result.fe2ToOxidiseKmol).toBeCloseTo(44.7668, 4);
    expect(result.oxidantKg).toBeCloseTo(951.705, 3);
  });

  it('when the oxidant is O2 or MnO2, then the stoichiometry 0.25 and 0.5 mol per mol Fe2+ applies', () => {
    // balanced half-reactions: O2 0.25 mol, MnO2 0.5 mol per mol Fe2+
    const kmol = 2500 / 55.845;
    expect(oxidantDemand({ ...base, oxidant: 'o2', utilisation: 1 }).oxidantKg).toBeCloseTo(kmol * 0.25 * 31.998, 6);
    expect(oxidantDemand({ ...base, oxidant: 'mno2', utilisation: 1 }).oxidantKg).toBeCloseTo(kmol * 0.5 * 86.9368, 6);
  });

  it.each([
    ['equal to', 1],
    ['below', 0.5],
  ])('when the target is %s the present ratio, then no oxidant is needed', (_label, ratioTarget) => {
    expect(oxidantDemand({ ...base, ratioTarget })).toEqual({ fe2ToOxidiseKmol: 0, oxidantKg: 0 });
  });

  it('when the oxidant metadata is read, then the UI gets molar mass, stoichiometry and source for each', () => {
    expect(IRON_MOLAR_MASS_G_PER_MOL).toBe(55.845); // IUPAC standard atomic weight of Fe
    expect(OXIDANTS.map((o) => [o.id, o.molPerMolFe2, o.molarMassGPerMol])).toEqual([
      ['h2o2', 0.5, 34.0147],
      ['mno2', 0.5, 86.9368],
      ['o2', 0.25, 31.998],
    ]);
    for (const o of OXIDANTS) expect(o.source.length).toBeGreaterThan(10);
  });

  it('when the tank is empty or holds no iron, then the demand is zero', () => {
    expect(oxidantDemand({ ...base, volumeM3: 0 }).oxidantKg).toBe(0);
    expect(oxidantDemand({ ...base, totalFeGPerL: 0 }).oxidantKg).toBe(0);
  });
});
