import { describe, it, expect } from 'vitest';
import { fitFormalPotential, ratioToOrpMv } from '../../shared/redox';
import { linearRef as agcl3m, synthAssays } from '../helpers/synth-assays';

describe('fitFormalPotential without a temperature coefficient', () => {
  it('when assays carry ±1 mV noise at one temperature, then E°′ is recovered within 1 mV and the rms is near the noise', () => {
    // 0.68 V: formal potential in 1 M H2SO4 (Skoog et al., table of formal potentials), used here only as a realistic truth
    const samples = synthAssays({ e0V: 0.68, kVPerK: 0 }, [42], [0.5, 1, 2, 4, 8, 15, 25, 40], 1, 7);
    const fit = fitFormalPotential(samples, { reference: agcl3m });
    expect(Math.abs(fit.formalPotentialV - 0.68) * 1000).toBeLessThan(1);
    expect(fit.formalCoeffVPerK).toBe(0);
    expect(fit.n).toBe(8);
    expect(fit.residualsMv).toHaveLength(8);
    // uniform ±1 mV noise has an rms of 1/√3 ≈ 0.58 mV
    expect(fit.rmsMv).toBeGreaterThan(0.3);
    expect(fit.rmsMv).toBeLessThan(0.9);
  });

  it('when assays are exact, then E°′ is recovered to 1e-9 V and residuals are zero', () => {
    const fit = fitFormalPotential(synthAssays({ e0V: 0.7, kVPerK: 0 }, [25, 60], [0.3, 3], 0, 1), { reference: agcl3m });
    expect(fit.formalPotentialV).toBeCloseTo(0.7, 9);
    expect(fit.rmsMv).toBeLessThan(1e-6);
  });

  it('when one reading is 5 mV high, then its residual (measured − predicted) is positive and matches ratioToOrpMv', () => {
    const samples = synthAssays({ e0V: 0.68, kVPerK: 0 }, [40], [1, 2, 4, 8], 0, 1);
    samples[2] = { ...samples[2], orpMv: samples[2].orpMv + 5 };
    const fit = fitFormalPotential(samples, { reference: agcl3m });
    expect(fit.residualsMv[2]).toBeGreaterThan(3);
    samples.forEach((s, i) => {
      const predicted = ratioToOrpMv({ ratio: (s.feTotal - s.fe2) / s.fe2, tempC: s.tempC, reference: agcl3m, formalPotentialV: fit.formalPotentialV });
      expect(fit.residualsMv[i]).toBeCloseTo(s.orpMv - predicted, 9);
    });
  });
});

describe('fitFormalPotential with a temperature coefficient', () => {
  it('when assays span 20–80 °C with ±1 mV noise, then E°′25 and k are recovered within 1 mV over the span', () => {
    // k = +1.2 mV/K: the order of the published dE°/dT for Fe3+/Fe2+ (Bratsch 1989, J. Phys. Chem. Ref. Data 18:1; from memory), used only as a realistic truth
    const truth = { e0V: 0.68, kVPerK: 0.0012 };
    const samples = synthAssays(truth, [20, 35, 50, 65, 80], [0.5, 2, 8, 20], 1, 42);
    const fit = fitFormalPotential(samples, { reference: agcl3m, fitTempCoeff: true });
    expect(Math.abs(fit.formalPotentialV - truth.e0V) * 1000).toBeLessThan(1);
    // error in k times the 60 K span stays under 1 mV
    expect(Math.abs(fit.formalCoeffVPerK - truth.kVPerK) * 60 * 1000).toBeLessThan(1);
    expect(fit.rmsMv).toBeLessThan(0.9);
  });

  it('when the temperature term is ignored on such data, then the rms is far larger', () => {
    const samples = synthAssays({ e0V: 0.68, kVPerK: 0.0012 }, [20, 50, 80], [1, 4], 0, 3);
    expect(fitFormalPotential(samples, { reference: agcl3m }).rmsMv).toBeGreaterThan(20);
  });
});

describe('slopeEfficiency', () => {
  it('when lab ratios span several decades on an ideal probe, then the slope efficiency is about 1', () => {
    const samples = synthAssays({ e0V: 0.68, kVPerK: 0 }, [40, 45], [0.05, 0.5, 5, 50], 1, 11);
    const fit = fitFormalPotential(samples, { reference: agcl3m });
    expect(fit.slopeEfficiency).not.toBeNull();
    expect(Math.abs((fit.slopeEfficiency as number) - 1)).toBeLessThan(0.02);
  });

  it('when the probe responds with 90 % of the Nernst slope, then the slope efficiency is about 0.9', () => {
    const samples = synthAssays({ e0V: 0.68, kVPerK: 0.001, slopeEff: 0.9 }, [30, 50, 70], [0.05, 0.5, 5, 50], 0.5, 5);
    const fit = fitFormalPotential(samples, { reference: agcl3m, fitTempCoeff: true });
    expect(Math.abs((fit.slopeEfficiency as number) - 0.9)).toBeLessThan(0.02);
  });

  it('when lab ratios span less than one decade, then the slope efficiency is null', () => {
    const samples = synthAssays({ e0V: 0.68, kVPerK: 0 }, [40], [2, 4, 8, 19.9], 1, 13);
    expect(fitFormalPotential(samples, { reference: agcl3m }).slopeEfficiency).toBeNull();
  });
});

describe('fitFormalPotential rejects unusable assays', () => {
  const good = synthAssays({ e0V: 0.68, kVPerK: 0 }, [40], [1, 3, 9], 0, 1);

  it('when fewer than 2 samples are given, then a RangeError names samples', () => {
    expect(() => fitFormalPotential(good.slice(0, 1), { reference: agcl3m })).toThrow(/samples must be an array of at least 2/);
  });

  it('when k is asked for but only 2 assays or one temperature are given, then k is held, not fitted', () => {
    const two = fitFormalPotential(good.slice(0, 2), { reference: agcl3m, fitTempCoeff: true, tempCoeffVPerK: 0.001 });
    expect(two.tempCoeffBasis).toBe('held-too-few-assays');
    expect(two.formalCoeffVPerK).toBe(0.001);
    const flat = fitFormalPotential(good, { reference: agcl3m, fitTempCoeff: true, tempCoeffVPerK: 0.001 });
    expect(flat.fittedTempCoeff).toBe(false);
    expect(flat.tempCoeffBasis).toBe('held-narrow-span');
  });

  it.each([
    ['Fe2+ = 0 (infinite ratio)', { fe2: 0 }, /samples\[1\]\.fe2 must be .*\(0, feTotal\)/],
    ['Fe2+ = total Fe (ratio 0)', { fe2: 12 }, /samples\[1\]\.fe2/],
    ['Fe2+ > total Fe', { fe2: 13 }, /samples\[1\]\.fe2/],
    ['Fe2+ < 0', { fe2: -1 }, /samples\[1\]\.fe2/],
    ['Fe2+ so small the ratio overflows', { fe2: 5e-324 }, /samples\[1\]\.fe2/],
    ['total Fe = 0', { feTotal: 0 }, /samples\[1\]\.feTotal/],
    ['a NaN reading', { orpMv: NaN }, /samples\[1\]\.orpMv/],
    ['a temperature of 200 °C', { tempC: 200 }, /samples\[1\]\.tempC must be a finite number in \[-10, 150\]/],
  ])('when a sample has %s, then a RangeError names that field', (_label, patch, message) => {
    const samples = good.map((s, i) => (i === 1 ? { ...s, ...patch } : s));
    expect(() => fitFormalPotential(samples, { reference: agcl3m })).toThrow(RangeError);
    expect(() => fitFormalPotential(samples, { reference: agcl3m })).toThrow(message);
  });
});
