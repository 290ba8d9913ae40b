import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { inv, multiply, transpose } from 'mathjs';
import { fitFormalPotential, nernstSlopeV, type AssaySample } from '../../shared/redox';
import { F, R, linearRef as ref, seeded, synthAssay, synthAssays } from '../helpers/synth-assays';

/**
 * Ordinary least squares done independently with mathjs 15.2.0 matrices:
 * β = (XᵀX)⁻¹Xᵀy, s² = Σr²/(n − p), Cov(β) = s²(XᵀX)⁻¹ (the textbook normal equations,
 * e.g. Draper & Smith, Applied Regression Analysis, ch. 5).
 */
function mathjsOls(X: number[][], y: number[]) {
  const Xt = transpose(X) as number[][];
  const XtXinv = inv(multiply(Xt, X) as number[][]) as number[][];
  const beta = multiply(XtXinv, multiply(Xt, y) as number[]) as number[];
  const fitted = multiply(X, beta) as number[];
  const r = y.map((v, i) => v - fitted[i]);
  const n = X.length;
  const p = X[0].length;
  const s = Math.sqrt(r.reduce((a, b) => a + b * b, 0) / (n - p));
  return { beta, s, cov: XtXinv.map((row) => row.map((v) => v * s * s)), r };
}

/** E°′ of each assay at its own temperature, written out from the Nernst equation with mathjs constants. */
function e0Of(a: AssaySample) {
  const eRef = ref.e25V + ref.coeffVPerK * (a.tempC - 25);
  const ratio = (a.feTotal - a.fe2) / a.fe2;
  return a.orpMv / 1000 + eRef - ((R * (a.tempC + 273.15)) / F) * Math.log(ratio);
}

describe('fitFormalPotential statistics against an independent OLS (mathjs)', () => {
  const samples = synthAssays({ e0V: 0.671, kVPerK: 0.0011 }, [62, 70, 78, 86], [0.4, 0.9, 1.7, 3], 1.5, 21);

  it('when k is fitted, then E°′25, k, their standard errors, the residual standard error and E°′ at the mean temperature equal mathjs OLS', () => {
    const fit = fitFormalPotential(samples, { reference: ref, fitTempCoeff: true });
    const X = samples.map((a) => [1, a.tempC - 25]);
    const y = samples.map(e0Of);
    const m = mathjsOls(X, y);
    expect(fit.fittedTempCoeff).toBe(true);
    expect(fit.formalPotentialV).toBeCloseTo(m.beta[0], 10);
    expect(fit.formalCoeffVPerK).toBeCloseTo(m.beta[1], 12);
    expect(fit.standardErrors.formalPotentialV).toBeCloseTo(Math.sqrt(m.cov[0][0]), 10);
    expect(fit.standardErrors.formalCoeffVPerK!).toBeCloseTo(Math.sqrt(m.cov[1][1]), 12);
    expect(fit.p).toBe(2);
    expect(fit.rmsMv).toBeCloseTo(m.s * 1000, 8);
    fit.residualsMv.forEach((r, i) => expect(r).toBeCloseTo(m.r[i] * 1000, 7));
    const meanDt = X.reduce((a, row) => a + row[1], 0) / X.length;
    const varMean = m.cov[0][0] + 2 * meanDt * m.cov[0][1] + meanDt * meanDt * m.cov[1][1];
    expect(fit.atMeanTemp.tempC).toBeCloseTo(25 + meanDt, 10);
    expect(fit.atMeanTemp.formalPotentialV).toBeCloseTo(m.beta[0] + m.beta[1] * meanDt, 10);
    expect(fit.atMeanTemp.standardErrorV).toBeCloseTo(Math.sqrt(varMean), 10);
    // At the centroid the variance of a straight line's prediction is s²/n.
    expect(fit.atMeanTemp.standardErrorV).toBeCloseTo(m.s / Math.sqrt(samples.length), 10);
  });

  it('when k is held, then E°′ and its standard error equal mathjs OLS on E°′_i − k·(T − 25), with n − 1 degrees of freedom', () => {
    const held = 0.0011;
    const fit = fitFormalPotential(samples, { reference: ref, tempCoeffVPerK: held });
    const m = mathjsOls(samples.map(() => [1]), samples.map((a) => e0Of(a) - held * (a.tempC - 25)));
    expect(fit.tempCoeffBasis).toBe('held');
    expect(fit.formalCoeffVPerK).toBe(held);
    expect(fit.standardErrors.formalCoeffVPerK).toBeNull();
    expect(fit.formalPotentialV).toBeCloseTo(m.beta[0], 10);
    expect(fit.standardErrors.formalPotentialV).toBeCloseTo(Math.sqrt(m.cov[0][0]), 10);
    expect(fit.rmsMv).toBeCloseTo(m.s * 1000, 8);
    expect(fit.atMeanTemp.standardErrorV).toBeCloseTo(m.s / Math.sqrt(samples.length), 10);
  });

  it('when the slope efficiency is fitted jointly, then it and its standard error equal mathjs OLS on [1, (RT/F)·ln ratio, T − 25]', () => {
    const wide = synthAssays({ e0V: 0.68, kVPerK: 0.001, slopeEff: 0.93 }, [35, 55, 75], [0.05, 0.5, 5, 50], 1, 4);
    const fit = fitFormalPotential(wide, { reference: ref, fitTempCoeff: true });
    const X = wide.map((a) => [1, ((R * (a.tempC + 273.15)) / F) * Math.log((a.feTotal - a.fe2) / a.fe2), a.tempC - 25]);
    const y = wide.map((a) => a.orpMv / 1000 + ref.e25V + ref.coeffVPerK * (a.tempC - 25));
    const m = mathjsOls(X, y);
    expect(fit.slopeFit?.jointTempCoeff).toBe(true);
    expect(fit.slopeEfficiency!).toBeCloseTo(m.beta[1], 9);
    expect(fit.slopeFit!.standardError).toBeCloseTo(Math.sqrt(m.cov[1][1]), 9);
    expect(fit.slopeFit!.formalCoeffVPerK).toBeCloseTo(m.beta[2], 11);
  });
});

describe('fitFormalPotential recovers known values (property tests, fast-check)', () => {
  const e0 = fc.double({ min: 0.55, max: 0.8, noNaN: true });
  const k = fc.double({ min: -0.002, max: 0.003, noNaN: true });

  it('when noise-free assays span under 2 °C and k is held at its true value, then E°′ and k come back exactly', () => {
    fc.assert(
      fc.property(e0, k, fc.double({ min: 20, max: 90, noNaN: true }), fc.integer({ min: 2, max: 12 }), (e0V, kVPerK, t0, n) => {
        const samples = Array.from({ length: n }, (_, i) => synthAssay({ e0V, kVPerK }, t0 + (1.6 * i) / n, 0.3 + i, 0));
        const fit = fitFormalPotential(samples, { reference: ref, fitTempCoeff: true, tempCoeffVPerK: kVPerK });
        expect(fit.fittedTempCoeff).toBe(false);
        expect(fit.formalCoeffVPerK).toBe(kVPerK);
        expect(Math.abs(fit.formalPotentialV - e0V)).toBeLessThan(1e-9);
        expect(fit.rmsMv).toBeLessThan(1e-6);
        expect(fit.suspectSamples).toEqual([]);
      }),
      { numRuns: 200 },
    );
  });

  it('when noise-free assays span 20 °C or more, then E°′25 and k come back to 1e-9', () => {
    fc.assert(
      fc.property(e0, k, fc.double({ min: 20, max: 60, noNaN: true }), fc.double({ min: 20, max: 40, noNaN: true }), (e0V, kVPerK, t0, span) => {
        const samples = [0, 0.25, 0.5, 0.75, 1].map((f, i) => synthAssay({ e0V, kVPerK }, t0 + f * span, [0.5, 2, 8, 1, 4][i], 0));
        const fit = fitFormalPotential(samples, { reference: ref, fitTempCoeff: true });
        expect(fit.tempCoeffBasis).toBe('fitted');
        expect(Math.abs(fit.formalPotentialV - e0V)).toBeLessThan(1e-9);
        expect(Math.abs(fit.formalCoeffVPerK - kVPerK)).toBeLessThan(1e-10);
      }),
      { numRuns: 200 },
    );
  });

  it('when a probe has 80–100 % of the Nernst slope and the ratios rise with temperature, then the slope efficiency comes back within 0.5 %', () => {
    fc.assert(
      fc.property(e0, k, fc.double({ min: 0.8, max: 1, noNaN: true }), fc.integer({ min: 1, max: 1e6 }), (e0V, kVPerK, slopeEff, seed) => {
        const rand = seeded(seed);
        // The ratios climb about a hundredfold from 40 to 85 °C, the way a heating tank oxidises,
        // with a low and a high assay around each temperature; ±0.1 mV of reading noise.
        const samples = [40, 45, 50, 55, 60, 65, 70, 75, 80, 85].map((t, i) =>
          synthAssay({ e0V, kVPerK, slopeEff }, t, 0.3 * 10 ** (i / 4.5) * (i % 2 ? 4 : 0.25), 0.1, rand));
        const fit = fitFormalPotential(samples, { reference: ref, fitTempCoeff: true });
        expect(Math.abs(fit.slopeEfficiency! - slopeEff)).toBeLessThan(0.005);
      }),
      { numRuns: 100 },
    );
  });
});

describe('fitFormalPotential marks gross assay errors', () => {
  it('when one Fe²⁺ titre among 8 assays is 30 % low, then that assay alone is suspect', () => {
    // ±0.5 mV is a well-kept Pt probe's noise (common practice); a 30 % titre error is about 15–18 mV here.
    const rand = seeded(99);
    const samples = [80, 81, 82, 83, 84, 85, 84.5, 81.5].map((t, i) => synthAssay({ e0V: 0.671, kVPerK: 0.0011 }, t, [0.6, 0.9, 1.3, 1.8, 0.7, 1.1, 1.5, 2][i], 0.5, rand));
    samples[5] = { ...samples[5], fe2: samples[5].fe2 * 0.7 };
    const fit = fitFormalPotential(samples, { reference: ref, fitTempCoeff: true, tempCoeffVPerK: 0.0011 });
    expect(fit.suspectSamples).toEqual([5]);
    expect(Math.abs(fit.studentizedResiduals[5]!)).toBeGreaterThan(3);
  });

  it('when the same error sits among noise-free assays, then it is flagged alone and the others are not', () => {
    const samples = [60, 61, 62, 63, 64].map((t, i) => synthAssay({ e0V: 0.7, kVPerK: 0 }, t, [1, 2, 3, 4, 5][i], 0));
    samples[2] = { ...samples[2], fe2: samples[2].fe2 * 0.7 };
    expect(fitFormalPotential(samples, { reference: ref }).suspectSamples).toEqual([2]);
  });

  it('when there are fewer than 5 assays, then nothing is marked suspect (one bad assay hides in its own spread)', () => {
    const samples = [60, 61, 62, 63].map((t, i) => synthAssay({ e0V: 0.7, kVPerK: 0 }, t, [1, 2, 3, 4][i], 0));
    samples[2] = { ...samples[2], fe2: samples[2].fe2 * 0.7 };
    const fit = fitFormalPotential(samples, { reference: ref });
    expect(fit.suspectSamples).toEqual([]);
    expect(fit.studentizedResiduals.every((t) => t === null)).toBe(true);
  });
});

describe('fitFormalPotential keeps the coefficient in force over a narrow span', () => {
  it('when a ferric tank is recalibrated from assays spanning 1.6 °C, then k stays at the value in force and E°′ at 85 °C is right', () => {
    // 0.671 V and +1.1 mV/K: a ferric tank's calibration in force (an invented plant example).
    const samples = synthAssays({ e0V: 0.671, kVPerK: 0.0011 }, [83.4, 84.2, 85], [0.6, 1.2, 2], 0, 1);
    const fit = fitFormalPotential(samples, { reference: ref, fitTempCoeff: true, tempCoeffVPerK: 0.0011, minTempSpanC: 5 });
    expect(fit.tempCoeffBasis).toBe('held-narrow-span');
    expect(fit.formalPotentialV).toBeCloseTo(0.671, 9);
    expect(fit.formalPotentialV + fit.formalCoeffVPerK * 60).toBeCloseTo(0.671 + 0.066, 9);
  });

  it('when no coefficient is given, then k = 0 is stated as a default, not passed off as fitted', () => {
    const samples = synthAssays({ e0V: 0.671, kVPerK: 0 }, [84], [0.6, 1.2], 0, 1);
    const fit = fitFormalPotential(samples, { reference: ref });
    expect(fit.tempCoeffBasis).toBe('default-zero');
    expect(fit.fittedTempCoeff).toBe(false);
  });

  it('when a held slope efficiency is given, then E°′ is fitted with it', () => {
    const samples = synthAssays({ e0V: 0.69, kVPerK: 0, slopeEff: 0.9 }, [45], [0.1, 1, 10], 0, 1);
    expect(fitFormalPotential(samples, { reference: ref, slopeEfficiency: 0.9 }).formalPotentialV).toBeCloseTo(0.69, 9);
    expect(Math.abs(fitFormalPotential(samples, { reference: ref }).rmsMv)).toBeGreaterThan(1);
    expect(nernstSlopeV(25)).toBeCloseTo((R * 298.15) / F, 12);
  });
});
