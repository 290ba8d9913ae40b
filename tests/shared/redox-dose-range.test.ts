import { describe, it, expect } from 'vitest';
import { molarVolume } from 'mathjs';
import { MOLAR_VOLUME_NORMAL_M3_PER_KMOL, oxidantDemand, oxidantDemandRange, oxidantQuantity, ratioUncertainty } from '../../shared/redox';

describe('oxidantQuantity', () => {
  it('when the molar volume at 0 °C and 101.325 kPa is derived, then it equals the CODATA value carried by mathjs 15.2.0', () => {
    // CODATA 2018: 22.413 969 54… L/mol for an ideal gas at 273.15 K and 101.325 kPa (mathjs `molarVolume`).
    expect(MOLAR_VOLUME_NORMAL_M3_PER_KMOL).toBeCloseTo(molarVolume.toNumber('m^3/mol') * 1000, 9);
  });

  it('when 32 kg of O₂ is delivered as air, then it is one kmol of O₂ in 22.414/0.2095 Nm³ of air', () => {
    // M(O₂) = 31.998 g/mol (standard atomic weights); O₂ is 20.95 % by volume of dry air (U.S. Standard Atmosphere, 1976).
    const air = oxidantQuantity({ oxidantKg: 31.998, oxidant: 'o2', form: 'air' });
    expect(air.unit).toBe('Nm³');
    expect(air.amount).toBeCloseTo(22.41397 / 0.2095, 3);
    expect(oxidantQuantity({ oxidantKg: 31.998, oxidant: 'o2', form: 'o2' }).amount).toBeCloseTo(22.41397, 4);
  });

  it('when 100 kg of H₂O₂ is delivered as a 50 % w/w solution, then it is 200 kg of solution at its density', () => {
    // 1.196 kg/L at 20 °C for 50 % w/w H₂O₂: from memory of the CRC Handbook table; 200 kg / 1.196 kg/L = 167.2 L.
    const q = oxidantQuantity({ oxidantKg: 100, oxidant: 'h2o2', form: 'h2o2-50' });
    expect(q.unit).toBe('L');
    expect(q.amount).toBeCloseTo(200 / 1.196, 9);
  });

  it('when the form does not belong to the oxidant, then a RangeError lists the forms that do', () => {
    expect(() => oxidantQuantity({ oxidantKg: 1, oxidant: 'o2', form: 'h2o2-50' })).toThrow(/form must be one of 'air', 'o2' for o2/);
    expect(() => oxidantQuantity({ oxidantKg: 1, oxidant: 'mno2', form: 'air' })).toThrow(/form must be one of none/);
    expect(() => oxidantQuantity({ oxidantKg: -1, oxidant: 'o2', form: 'air' })).toThrow(/oxidantKg/);
  });
});

describe('oxidantDemandRange', () => {
  const base = { volumeM3: 360, totalFeGPerL: 14, ratioNow: 4, ratioTarget: 14, oxidant: 'h2o2' as const, utilisation: 0.9 };

  it('when the probe tolerance is ±10 mV at 25 °C, then the ratio may be off ×/÷ 1.48 and the dose spans the doses at those ratios', () => {
    // ±10 mV at 25 °C is a factor of about 1.48 on the ratio (Nernst slope 25.693 mV per ln unit; common practice).
    const factor = ratioUncertainty({ tempC: 25, toleranceMv: 10 }).factor;
    expect(factor).toBeCloseTo(1.476, 3);
    const r = oxidantDemandRange({ ...base, uncertaintyFactor: factor });
    expect(r.centralKg).toBeCloseTo(oxidantDemand(base).oxidantKg, 9);
    expect(r.lowKg).toBeCloseTo(oxidantDemand({ ...base, ratioNow: 4 * factor }).oxidantKg, 9);
    expect(r.highKg).toBeCloseTo(oxidantDemand({ ...base, ratioNow: 4 / factor }).oxidantKg, 9);
    expect(r.lowKg).toBeLessThan(r.centralKg);
    expect(r.highKg).toBeGreaterThan(r.centralKg);
  });

  it('when the tank is near its target, then the low end of the range is no dose at all', () => {
    const r = oxidantDemandRange({ ...base, ratioNow: 12, uncertaintyFactor: 1.48 });
    expect(r.lowKg).toBe(0);
    expect(r.highKg).toBeGreaterThan(0);
  });
});
