import { describe, it, expect } from 'vitest';
import { faraday, gasConstant } from 'mathjs';
import {
  FARADAY_C_PER_MOL,
  GAS_CONSTANT_J_PER_MOL_K,
  TEMP_MAX_C,
  TEMP_MIN_C,
  mvPerDecade,
  nernstSlopeV,
  ratioToOrpMv,
  referenceById,
} from '../../shared/redox';

// mathjs 15.2.0 (pinned in package.json) carries the CODATA 2018 values; versions ≤ 5 carried CODATA 2010.
const F_MATHJS = faraday.toNumber('C/mol');
const R_MATHJS = gasConstant.toNumber('J/(mol K)');
const mathjsSlopeV = (tempC: number) => (R_MATHJS * (tempC + 273.15)) / F_MATHJS;
// mathjs derives F = e·N_A and R = k·N_A in floating point, which lands ~3e-11 relative
// from the exact decimal values, so comparisons with it use a relative tolerance.
const REL_TOL = 1e-9;
const relDiff = (a: number, b: number) => Math.abs(a / b - 1);

describe('physical constants', () => {
  it('when read, then F and R are the exact CODATA 2018 values', () => {
    expect(FARADAY_C_PER_MOL).toBe(96485.33212); // CODATA 2018, exact since the 2019 SI
    expect(GAS_CONSTANT_J_PER_MOL_K).toBe(8.314462618); // CODATA 2018, exact since the 2019 SI
  });

  it('when compared with mathjs 15.2.0, then F and R agree to 1e-9 relative', () => {
    // mathjs `faraday` and `gasConstant` Unit objects
    expect(relDiff(FARADAY_C_PER_MOL, F_MATHJS)).toBeLessThan(REL_TOL);
    expect(relDiff(GAS_CONSTANT_J_PER_MOL_K, R_MATHJS)).toBeLessThan(REL_TOL);
  });

  it('when the temperature limits are read, then they are -10 and 150 °C', () => {
    expect(TEMP_MIN_C).toBe(-10);
    expect(TEMP_MAX_C).toBe(150);
  });
});

describe('nernstSlopeV', () => {
  it.each([25, 40, 45, 80])('when T = %s °C, then R·T/F equals the slope computed from mathjs constants', (tempC) => {
    // mathjs 15.2.0 faraday / gasConstant
    expect(relDiff(nernstSlopeV(tempC), mathjsSlopeV(tempC))).toBeLessThan(REL_TOL);
  });

  it.each([
    [25, 25.693],
    [40, 26.985],
    [45, 27.416],
    [80, 30.432],
  ])('when T = %s °C, then R·T/F is %s mV to 3 decimals', (tempC, mv) => {
    // arithmetic from CODATA 2018
    expect(nernstSlopeV(tempC) * 1000).toBeCloseTo(mv, 3);
  });

  it.each([
    [25, 59.159],
    [40, 62.136],
    [45, 63.128],
    [80, 70.073],
  ])('when T = %s °C, then the slope per decade is %s mV', (tempC, mv) => {
    // (R·T/F)·ln 10 from CODATA 2018
    expect(mvPerDecade(tempC)).toBeCloseTo(mv, 3);
  });

  it('when T = 25 °C, then R·T/F rounds to the common-practice 0.0257 V', () => {
    // common practice, "R·T/F ≈ 0.0257 V at 25 °C"
    expect(nernstSlopeV(25)).toBeCloseTo(0.0257, 4);
  });

  it('when n = 2, then the slope is half the n = 1 slope', () => {
    // R·T/(n·F), the Nernst slope
    expect(relDiff(nernstSlopeV(25, 2), mathjsSlopeV(25) / 2)).toBeLessThan(REL_TOL);
  });

  it('when the ratio changes 100-fold at 25 °C, then the potential moves 118.32 mV', () => {
    // worked check, arithmetic from the CODATA 2018 constants
    const conditions = { tempC: 25, reference: referenceById('she'), formalPotentialV: 0.68 };
    const shift = ratioToOrpMv({ ...conditions, ratio: 100 }) - ratioToOrpMv({ ...conditions, ratio: 1 });
    expect(shift).toBeCloseTo(118.32, 2);
    expect(relDiff(shift, 2 * Math.LN10 * mathjsSlopeV(25) * 1000)).toBeLessThan(REL_TOL); // mathjs 15.2.0 constants
  });
});
